import type { Metadata } from "next";
import Link from "next/link";
import { Caution } from "@/components/ui/caution";
import { cautions, type CautionKey } from "@/lib/cautions";

export const metadata: Metadata = { title: "Safety cautions" };

export default function CautionsPage() {
  return (
    <main className="mx-auto max-w-3xl px-4 py-10">
      <h1 className="text-3xl font-semibold tracking-tight text-moss-800">Safety cautions</h1>
      <p className="mt-3 text-ink-soft">
        Growing mushrooms has hazards of its own. These reminders appear where they apply throughout Rhizomorph. They are not a substitute
        for your local codes, for licensed electricians and inspectors, or for occupational-health and food-safety advice where you farm.
      </p>
      <div className="mt-8 space-y-4">
        {(Object.keys(cautions) as CautionKey[]).map((key) => (
          <Caution key={key} which={key} />
        ))}
      </div>
      <Link href="/" className="mt-8 inline-block underline">
        Back to Rhizomorph
      </Link>
    </main>
  );
}
