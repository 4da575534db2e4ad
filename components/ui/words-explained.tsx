import Link from "next/link";
import { glossaryTerms, type GlossaryId } from "@/lib/pooled/glossary";

/** A folded list of the statistical words a card uses, explained where they appear, with a link to the whole glossary. */
export function WordsExplained({ terms }: { terms: readonly GlossaryId[] }) {
  return (
    <details className="mt-3 rounded-lg border border-oat-300 bg-oat-50 px-3 py-2 text-sm">
      <summary className="min-h-8 cursor-pointer font-semibold text-moss-800">What these words mean</summary>
      <dl className="mt-2 space-y-2">
        {glossaryTerms(terms).map((entry) => (
          <div key={entry.id}>
            <dt className="font-semibold">{entry.term}</dt>
            <dd className="text-ink-soft">{entry.plain}</dd>
          </div>
        ))}
      </dl>
      <Link href="/glossary" className="mt-2 inline-block underline">
        All the words, on one page
      </Link>
    </details>
  );
}
