import Link from "next/link";
import { Notice } from "./notice";
import type { OwnLeftOutNote } from "@/lib/pooled";

/**
 * Where the viewer's own records keep their blocks out of the figures shown, and where to fix them.
 * Shared by Co-op results and My farm; only the viewer's own counts, never another farm's.
 */
export function OwnDataNotice({ notes }: { notes: readonly OwnLeftOutNote[] }) {
  if (notes.length === 0) return null;
  return (
    <Notice tone="caution" title="Some of your blocks are not in these figures">
      <ul className="space-y-2" data-testid="own-data-notice">
        {notes.map((note) => (
          <li key={note.text}>
            {note.text}{" "}
            <Link href={note.fix.href} className="font-semibold underline">
              {note.fix.label}
            </Link>
          </li>
        ))}
      </ul>
    </Notice>
  );
}
