import { cautions, type CautionKey } from "@/lib/cautions";
import { Notice } from "./notice";

/** One of the trade's cautions, shown where the work it concerns is recorded. */
export function Caution({ which }: { which: CautionKey }) {
  const caution = cautions[which];
  return (
    <Notice tone="caution" title={caution.title}>
      <p>{caution.text}</p>
    </Notice>
  );
}
