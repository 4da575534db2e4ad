import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { seasonLogColumns, seasonLogSchemaVersion } from "@/lib/import";

export const metadata: Metadata = { title: "The shared season-log columns" };

// One answer per column to "must I fill it in?", so no hint reads "Required: may stay blank".
const requiredWords = { always: "Yes, on every row", harvest: "Yes, on every harvest row", no: "No, it may stay blank" } as const;

export default async function SeasonLogColumnsPage() {
  await requirePage("registry:read");
  return (
    <>
      <PageHeader
        title="The shared season-log columns"
        lead={`Version ${seasonLogSchemaVersion}. One row per harvest; the block's columns repeat on each of its rows. A block with no harvest yet gets one row with the flush and weight left blank. Your own header names usually work: we recognise common other names and ask you when we are not sure.`}
      >
        {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a file download from a route handler, not a page */}
        <a
          href="/api/season-logs/template"
          className="inline-flex min-h-11 items-center rounded-lg bg-moss-600 px-4 text-sm font-semibold text-white"
        >
          Download the template (CSV)
        </a>
        {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a file download from a route handler, not a page */}
        <a
          href="/api/season-logs/template?format=xlsx"
          className="inline-flex min-h-11 items-center rounded-lg bg-moss-600 px-4 text-sm font-semibold text-white"
        >
          Download the template (.xlsx)
        </a>
      </PageHeader>
      <div className="space-y-4">
        <Card title="Weights, dates and other ways of writing">
          <ul className="list-disc space-y-1 pl-5 text-sm">
            <li>Weights in g, kg, lb or oz, also “4 lb 3 oz”; a unit in the header, like “Fresh (g)”, applies to the whole column.</li>
            <li>Decimal comma or point (“2,5 kg” or “2.5 kg”), with or without thousands separators.</li>
            <li>
              Dates as 2026-03-21, 21.03.2026, 21/03/2026 or 03/21/2026, also with a time (“03/21/26 08:30 AM”); if every date could be read
              both ways we ask you which.
            </li>
            <li>
              A number that reads two ways (“2.720” is 2.72 or 2 720) is read as the file’s other numbers show; if none do, we ask you which
              decimal mark the column uses. We never guess.
            </li>
            <li>
              Yes and no in your language: yes/no, ja/nein, oui/non, sí/no, and the TRUE/FALSE (WAHR/FALSCH, VRAI/FAUX …) a spreadsheet
              writes.
            </li>
            <li>
              Spreadsheet files (.xlsx from Excel or LibreOffice, .ods) up to 20 MB are read with their cells’ types: dates, numbers and
              yes/no as the spreadsheet holds them, formulas by their last calculated value. With several sheets we ask which one.
            </li>
            <li>
              Commas, semicolons or tabs between columns; UTF-8 or Windows text; one column per flush (“Flush 1”, “Flush 2 (oz)”) also
              works.
            </li>
          </ul>
        </Card>
        {seasonLogColumns.map((column) => (
          <Card key={column.name}>
            <h2 className="text-lg font-semibold text-moss-800">
              {column.title} <code className="ml-2 rounded bg-oat-200 px-1.5 py-0.5 text-sm font-normal">{column.name}</code>
            </h2>
            <p className="mt-1">{column.meaning}</p>
            <dl className="mt-2 grid gap-1 text-sm sm:grid-cols-[10rem_1fr]">
              <dt className="text-ink-soft">Must be filled in</dt>
              <dd>{requiredWords[column.required]}</dd>
              <dt className="text-ink-soft">Examples</dt>
              <dd>
                {column.examples
                  .filter((example) => example !== "")
                  .map((example) => `“${example}”`)
                  .join(", ") || "blank"}
              </dd>
              {column.synonyms.length > 0 ? (
                <>
                  <dt className="text-ink-soft">Also recognised</dt>
                  <dd>{column.synonyms.join(", ")}</dd>
                </>
              ) : null}
            </dl>
          </Card>
        ))}
      </div>
    </>
  );
}
