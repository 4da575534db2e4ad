import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { getBlock, type BlockDetail } from "@/lib/data/blocks";
import { getSeasonStart } from "@/lib/data/seasons";
import { seasonLabel } from "@/lib/seasons";
import { isAppError } from "@/lib/errors";
import { seasonLogColumns } from "@/lib/import/schema";
import { formatMass } from "@/lib/units";
import { BlockCorrectionForm, HarvestCorrectionForm } from "./_components/correction-forms";
import { formatDate, formatDateTime } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { ScrollFrame } from "@/components/ui/scroll-frame";
import { ActionForm } from "@/components/forms/action-form";
import { getBlockRooms, listRoomChoices } from "@/lib/data/rooms";
import { calendarDateIn } from "@/lib/time/display";
import { moveBlockAction } from "./actions";
import { FlushChart } from "@/components/blocks/flush-chart";

export const metadata: Metadata = { title: "Block" };

const fieldTitles = new Map<string, string>(seasonLogColumns.map((column) => [column.name, column.title]));
const massFields = new Set(seasonLogColumns.filter((column) => column.kind === "mass").map((column) => column.name as string));

const noHarvestYet = "no harvest yet";

/** A stored mass as a correction form starts from it: as written, with its unit when the file had it in the header. */
function written(asWritten: string | null, unit: string | null, grams: number | null): string {
  if (asWritten !== null && asWritten !== "") return /[a-z]/i.test(asWritten) || !unit ? asWritten : `${asWritten} ${unit}`;
  return grams === null ? "" : `${grams} g`;
}

function percent(value: number | null): string {
  return value === null ? "not known yet" : `${value.toFixed(1)} %`;
}

export default async function BlockPage({
  params,
  searchParams,
}: {
  params: Promise<{ blockId: string }>;
  searchParams: Promise<{ correct?: string; deleted?: string }>;
}) {
  const member = await requirePage("farm-data:read");
  const { blockId } = await params;
  const { correct, deleted } = await searchParams;
  let block: BlockDetail;
  const seasonStart = await getSeasonStart(member);
  try {
    block = await getBlock(member, blockId);
  } catch (error) {
    if (isAppError(error) && error.code === "not_found") notFound();
    throw error;
  }
  const display = member.displayUnits;
  const times = await timeDisplayFor(member);
  const today = calendarDateIn(new Date(), times.timeZone);
  const [rooms, roomChoices] = await Promise.all([getBlockRooms(member, block.id, today), listRoomChoices(member)]);
  const canCorrect = can(member.role, "farm-data:correct");
  const defaultUnit = display === "imperial" ? "lb" : "g";
  // One correction form at a time: the block's values, or one harvest (its id in ?correct=).
  const correctedHarvest = canCorrect ? block.harvests.find((harvest) => harvest.id === correct) : undefined;
  const correctingBlock = canCorrect && correct === "block";
  const here = `/blocks/${block.id}`;
  const mass = (grams: number | null) => (grams === null ? "not weighed" : formatMass(grams, display));
  // History keeps masses in grams as text; show them in the reader's units like every other mass.
  const shownValue = (field: string, value: string | null) =>
    value === null ? "(blank)" : massFields.has(field) && Number.isFinite(Number(value)) ? formatMass(Number(value), display) : value;
  const facts = [
    ["Strain", `${block.strainCode} · ${block.strainName}`],
    ["Substrate recipe", block.recipeCode ?? "not given"],
    ["Inoculated", block.inoculatedOn ? formatDate(block.inoculatedOn, member.dateStyle) : "not given"],
    ["Season", block.season === null ? "none (no inoculation date or season given)" : seasonLabel(block.season, seasonStart)],
    ["Wet block", mass(block.wetMassG)],
    ["Moisture", block.moisture === null ? "not given" : `${(block.moisture * 100).toFixed(1)} %`],
    ["Total fresh", block.flushes === 0 ? noHarvestYet : formatMass(block.totalFreshG, display)],
    ["Biological efficiency", block.flushes === 0 ? noHarvestYet : percent(block.biologicalEfficiency)],
    ["Spent block", mass(block.spentMassG)],
    ["Mass loss", percent(block.massLoss)],
    [
      "Contaminated",
      block.contaminated ? `yes${block.contaminatedOn ? `, found ${formatDate(block.contaminatedOn, member.dateStyle)}` : ""}` : "no",
    ],
    ["Trial", block.trial ?? "not in a trial"],
  ];
  return (
    <>
      <PageHeader title={`Block ${block.code}`} lead={block.notes || undefined}>
        <ButtonLink href="/blocks" variant="secondary">
          All blocks
        </ButtonLink>
        {canCorrect ? (
          <ButtonLink href={`${here}?correct=block#correction`} variant="secondary">
            Correct the block&apos;s values
          </ButtonLink>
        ) : null}
        <ButtonLink href={`/blocks/harvest?block=${encodeURIComponent(block.code)}`}>Record a harvest</ButtonLink>
      </PageHeader>
      <div className="space-y-6">
        {deleted ? (
          <Notice title="Harvest deleted">
            <p role="status">The harvest was deleted; its values and your reason are kept in the history below.</p>
          </Notice>
        ) : null}
        {block.contaminated ? <Caution which="spores" /> : null}
        <Card title="The block">
          <dl className="grid grid-cols-1 gap-x-6 gap-y-2 text-sm sm:grid-cols-[12rem_1fr]">
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
            <ScrollFrame label={`Flushes of block ${block.code}`}>
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
                    {canCorrect ? (
                      <th scope="col" className="px-3 py-2">
                        <span className="sr-only">Correct</span>
                      </th>
                    ) : null}
                  </tr>
                </thead>
                <tbody>
                  {block.harvests.map((harvest) => (
                    <tr key={harvest.flush} className="border-t border-oat-200">
                      <td className="px-3 py-2">{harvest.flush}</td>
                      <td className="px-3 py-2">
                        {harvest.harvestedOn ? formatDate(harvest.harvestedOn, member.dateStyle) : "date not given"}
                      </td>
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
                      {canCorrect ? (
                        <td className="px-3 py-2">
                          <Link
                            className="inline-flex min-h-11 items-center font-semibold text-moss-700 underline"
                            href={`${here}?correct=${harvest.id}#correction`}
                          >
                            Correct or delete<span className="sr-only"> flush {harvest.flush}</span>
                          </Link>
                        </td>
                      ) : null}
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollFrame>
          )}
        </Card>
        <Card title="Rooms">
          {rooms.moves.length === 0 ? (
            <p className="text-ink-soft">No room recorded for this block yet.</p>
          ) : (
            <ol className="space-y-1 text-sm" data-testid="block-rooms">
              {rooms.moves.map((move) => (
                <li key={move.id}>
                  <span className="font-semibold">
                    {move.movedOn ? `From ${formatDate(move.movedOn, member.dateStyle)}` : "From the start of fruiting"}:
                  </span>{" "}
                  <Link href={`/rooms/${move.roomId}`} className="underline">
                    {move.roomName}
                  </Link>
                  {move.id === rooms.now?.id ? " (where it is today)" : ""}
                  <span className="text-ink-soft">
                    {move.fromSeasonLog ? ", from a season log" : move.recordedBy ? `, recorded by ${move.recordedBy}` : ""}
                  </span>
                </li>
              ))}
            </ol>
          )}
          {can(member.role, "rooms:record") ? (
            roomChoices.length === 0 ? (
              <p className="mt-3 text-sm text-ink-soft">
                Add your rooms on{" "}
                <Link href="/rooms" className="underline">
                  Rooms
                </Link>{" "}
                to record where this block fruits.
              </p>
            ) : (
              <div className="mt-4 max-w-lg">
                <ActionForm
                  action={moveBlockAction}
                  testId="move-block"
                  hidden={{ blockId: block.id }}
                  fields={[
                    {
                      name: "roomId",
                      label: "Moved to room",
                      options: roomChoices.map((room) => ({ value: room.id, label: room.name })),
                      defaultValue: rooms.now?.roomId,
                    },
                    {
                      name: "movedOn",
                      label: "on",
                      type: "date",
                      defaultValue: today,
                      hint: "Leave it blank if the block has been there from the start of fruiting.",
                    },
                  ]}
                  submitLabel="Save the move"
                  variant="secondary"
                />
              </div>
            )
          ) : null}
        </Card>
        <FlushChart block={block} display={display} />
        {correctingBlock || correctedHarvest ? (
          <div id="correction">
            <Card title={correctedHarvest ? `Correct flush ${correctedHarvest.flush}` : "Correct the block's values"}>
              <p className="mb-4 text-sm text-ink-soft">
                The same rules as a season log apply. Every change is kept in the history with your name, the time and your reason, and the
                co-op&apos;s figures follow.{" "}
                <Link href={here} className="underline">
                  Cancel
                </Link>
              </p>
              {correctedHarvest ? (
                <HarvestCorrectionForm
                  key={correctedHarvest.id}
                  defaultUnit={defaultUnit}
                  harvest={{
                    id: correctedHarvest.id,
                    flush: correctedHarvest.flush,
                    weight: written(correctedHarvest.freshMassAsWritten, correctedHarvest.freshMassUnit, correctedHarvest.freshMassG),
                    harvestedOn: correctedHarvest.harvestedOn ?? "",
                  }}
                />
              ) : (
                <BlockCorrectionForm
                  defaultUnit={defaultUnit}
                  values={{
                    blockId: block.id,
                    wetMass: written(block.recorded.wetMassAsWritten, block.recorded.wetMassUnit, block.wetMassG),
                    moisture: block.moisture === null ? "" : `${Math.round(block.moisture * 100000) / 1000} %`,
                    inoculatedOn: block.inoculatedOn ?? "",
                    contaminated: block.contaminated,
                    contaminatedOn: block.contaminatedOn ?? "",
                    spentMass: written(block.recorded.spentMassAsWritten, block.recorded.spentMassUnit, block.spentMassG),
                    notes: block.notes,
                  }}
                />
              )}
            </Card>
          </div>
        ) : null}
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
                    {formatDateTime(change.changedAt, times)}
                    {change.changedBy ? ` by ${change.changedBy}` : ""}
                    {change.fileName ? `, from ${change.fileName}` : ""}
                  </span>
                  {change.reason ? <span className="block">Why: {change.reason}</span> : null}
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>
    </>
  );
}
