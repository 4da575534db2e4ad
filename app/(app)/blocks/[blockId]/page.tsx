import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";
import { farmContextOf, requirePage } from "@/lib/auth/guard";
import { getBlock, type BlockDetail } from "@/lib/data/blocks";
import { isAppError } from "@/lib/errors";
import { seasonLogColumns } from "@/lib/import/schema";
import { formatMass } from "@/lib/units";

export const metadata: Metadata = { title: "Block" };

const fieldTitles = new Map<string, string>(seasonLogColumns.map((column) => [column.name, column.title]));
const massFields = new Set(seasonLogColumns.filter((column) => column.kind === "mass").map((column) => column.name as string));

const noHarvestYet = "no harvest yet";

function percent(value: number | null): string {
  return value === null ? "not known yet" : `${value.toFixed(1)} %`;
}

export default async function BlockPage({ params }: { params: Promise<{ blockId: string }> }) {
  const member = await requirePage("farm-data:read");
  const { blockId } = await params;
  let block: BlockDetail;
  try {
    block = await getBlock(farmContextOf(member), blockId);
  } catch (error) {
    if (isAppError(error) && error.code === "not_found") notFound();
    throw error;
  }
  const display = member.displayUnits;
  const mass = (grams: number | null) => (grams === null ? "not weighed" : formatMass(grams, display));
  // History keeps masses in grams as text; show them in the reader's units like every other mass.
  const shownValue = (field: string, value: string | null) =>
    value === null ? "(blank)" : massFields.has(field) && Number.isFinite(Number(value)) ? formatMass(Number(value), display) : value;
  const facts = [
    ["Strain", block.strainCode],
    ["Substrate recipe", block.recipeCode ?? "not given"],
    ["Inoculated", block.inoculatedOn ?? "not given"],
    ["Wet block", mass(block.wetMassG)],
    ["Moisture", block.moisture === null ? "not given" : `${(block.moisture * 100).toFixed(1)} %`],
    ["Total fresh", block.flushes === 0 ? noHarvestYet : formatMass(block.totalFreshG, display)],
    ["Biological efficiency", block.flushes === 0 ? noHarvestYet : percent(block.biologicalEfficiency)],
    ["Spent block", mass(block.spentMassG)],
    ["Mass loss", percent(block.massLoss)],
    ["Contaminated", block.contaminated ? `yes${block.contaminatedOn ? `, found ${block.contaminatedOn}` : ""}` : "no"],
    ["Trial", block.trial ?? "not in a trial"],
  ];
  return (
    <>
      <PageHeader title={`Block ${block.code}`} lead={block.notes || undefined}>
        <ButtonLink href="/blocks" variant="secondary">
          All blocks
        </ButtonLink>
        <ButtonLink href={`/blocks/harvest?block=${encodeURIComponent(block.code)}`}>Record a harvest</ButtonLink>
      </PageHeader>
      <div className="space-y-6">
        {block.contaminated ? <Caution which="spores" /> : null}
        <Card title="The block">
          <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[12rem_1fr]">
            {facts.map(([label, value]) => (
              <div key={label} className="contents">
                <dt className="text-ink-soft">{label}</dt>
                <dd className="font-medium">{value}</dd>
              </div>
            ))}
          </dl>
        </Card>
        <Card title="Flushes">
          {block.harvests.length === 0 ? (
            <p className="text-ink-soft">No harvest yet.</p>
          ) : (
            <div className="overflow-x-auto">
              <table className="min-w-full text-sm">
                <caption className="sr-only">Flushes of block {block.code}</caption>
                <thead className="bg-oat-200 text-left">
                  <tr>
                    <th scope="col" className="px-3 py-2">
                      Flush
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Harvested
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Fresh
                    </th>
                    <th scope="col" className="px-3 py-2">
                      As written
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Dry
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Saved despite
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {block.harvests.map((harvest) => (
                    <tr key={harvest.flush} className="border-t border-oat-200">
                      <td className="px-3 py-2">{harvest.flush}</td>
                      <td className="px-3 py-2">{harvest.harvestedOn ?? "date not given"}</td>
                      <td className="px-3 py-2">{formatMass(harvest.freshMassG, display)}</td>
                      <td className="px-3 py-2">{harvest.freshMassAsWritten ?? ""}</td>
                      <td className="px-3 py-2">{harvest.dryMassG === null ? "" : formatMass(harvest.dryMassG, display)}</td>
                      <td className="px-3 py-2" data-testid={`accepted-warnings-${harvest.flush}`}>
                        {harvest.acceptedWarnings === null ? (
                          ""
                        ) : (
                          <ul className="space-y-1 text-caution-ink">
                            {harvest.acceptedWarnings.split("\n").map((warning) => (
                              <li key={warning}>{warning}</li>
                            ))}
                          </ul>
                        )}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Card>
        <Card title="History of changed values">
          {block.history.length === 0 ? (
            <p className="text-ink-soft">No value of this block has been replaced since it was first recorded.</p>
          ) : (
            <ul className="space-y-2 text-sm" data-testid="block-history">
              {block.history.map((change) => (
                <li key={change.id} className="rounded-lg bg-oat-50 p-3">
                  <span className="font-semibold">{fieldTitles.get(change.field) ?? change.field}</span>
                  {change.flush !== null ? ` of flush ${change.flush}` : ""}: {shownValue(change.field, change.oldValue)} →{" "}
                  {shownValue(change.field, change.newValue)}
                  <span className="block text-ink-soft">
                    {change.changedAt.slice(0, 16).replace("T", " ")} UTC{change.changedBy ? ` by ${change.changedBy}` : ""}
                    {change.fileName ? `, from ${change.fileName}` : ""}
                  </span>
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>
    </>
  );
}
