import type { Metadata } from "next";
import Link from "next/link";
import { glossary } from "@/lib/pooled/glossary";

export const metadata: Metadata = { title: "Words used in the results" };

/** Public like the cautions: the words carry no farm's data, and a link to them works signed in or out. */
export default function GlossaryPage() {
  return (
    <main id="main" className="mx-auto max-w-3xl px-4 py-10">
      <h1 className="text-3xl font-semibold tracking-tight text-moss-800">Words used in the results</h1>
      <p className="mt-3 text-ink-soft">
        What the statistical words on the Co-op results and trial pages mean, in plain terms. Each page also explains the ones it uses,
        where it uses them.
      </p>
      <dl className="mt-8 space-y-6">
        {glossary.map((entry) => (
          <div key={entry.id} id={entry.id} className="scroll-mt-6">
            <dt className="font-semibold text-moss-800">{entry.term}</dt>
            <dd className="mt-1 text-ink">{entry.plain}</dd>
          </div>
        ))}
      </dl>
      <Link href="/" className="mt-8 inline-block underline">
        Back to Rhizomorph
      </Link>
    </main>
  );
}
