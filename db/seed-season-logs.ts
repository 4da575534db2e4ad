/**
 * A demo farm's season as the app would have seen it: season logs written from the invented
 * scenario and sent through the upload, check and commit of lib/data/season-logs.ts (what
 * POST /api/season-logs and its commit route call), as the farm's manager, and the last fortnight's
 * flushes picked and typed into the phone form (recordHarvest) on their days. Each returns the
 * moments it made (db/seed-times.ts), for the seed to move to the working hours they stand for.
 */
import { sql } from "drizzle-orm";
import type { Moment } from "./seed-times";
import { inTheValley } from "./seed-times";
import { toCsv } from "@/lib/csv";
import { recordHarvest } from "@/lib/data/blocks";
import type { Member } from "@/lib/data/members";
import { commitUpload, createUpload, getImportSetup } from "@/lib/data/season-logs";
import { createSeasonLogParser } from "@/lib/import";
import type { Random } from "@/lib/random";
import { parserOptions } from "@/lib/season-logs/report";
import { recordHarvestSchema } from "@/lib/season-logs/quick-harvest";

/** A mass as the farm wrote it ("2.51 lb") and its grams. */
export interface Written {
  grams: number;
  text: string;
  unit: "g" | "kg" | "lb";
}

interface LogHarvest {
  flush: number;
  harvestedOn: string;
  fresh: Written;
}

/** One block of the scenario, with everything that will have happened to it by the last day. */
export interface LogBlock {
  code: string;
  strainCode: string;
  substrateCode: string;
  fruitingMethodCode: string;
  trial: { code: string; arm: string } | null;
  inoculatedOn: string;
  wet: Written;
  moisture: number;
  contaminatedOn: string | null;
  /** Weighed when the block was pulled, on `spentOn`. */
  spent: Written | null;
  spentOn: string | null;
  harvests: LogHarvest[];
}

/** A mistake the farm made in one file and put right in the next. */
interface Slip {
  blockCode: string;
  flush?: number;
  /** A harvest's weight as mistyped; without flush, the block's strain code as mistyped. */
  text: string;
}

const columns = [
  "block_id",
  "strain",
  "substrate",
  "trial",
  "arm",
  "inoculated_on",
  "block_wet_weight",
  "substrate_moisture (%)",
  "fruiting_method",
  "flush",
  "harvested_on",
  "fresh_weight",
  "contaminated",
  "contaminated_on",
  "spent_weight",
].map((name) => ({ key: name, header: name }));

/** The farm's season log as it stood at the end of `asOf`: one row per flush picked by then, one for a block not yet fruiting. */
function seasonLogText(blocks: readonly LogBlock[], asOf: string, slips: readonly Slip[] = []): string {
  const rows: Record<string, string>[] = [];
  for (const block of blocks) {
    if (block.inoculatedOn > asOf) continue;
    const contaminated = block.contaminatedOn !== null && block.contaminatedOn <= asOf;
    const spent = block.spent && block.spentOn && block.spentOn <= asOf ? block.spent.text : "";
    const strainSlip = slips.find((slip) => slip.blockCode === block.code && slip.flush === undefined);
    const cells = {
      block_id: block.code,
      strain: strainSlip?.text ?? block.strainCode,
      substrate: block.substrateCode,
      trial: block.trial?.code ?? "",
      arm: block.trial?.arm ?? "",
      inoculated_on: block.inoculatedOn,
      block_wet_weight: block.wet.text,
      "substrate_moisture (%)": String(Number((block.moisture * 100).toFixed(1))),
      fruiting_method: block.fruitingMethodCode,
      contaminated: contaminated ? "yes" : "no",
      contaminated_on: contaminated ? block.contaminatedOn! : "",
      spent_weight: spent,
    };
    const picked = block.harvests.filter((harvest) => harvest.harvestedOn <= asOf);
    if (picked.length === 0) rows.push(cells);
    for (const harvest of picked) {
      const slip = slips.find((candidate) => candidate.blockCode === block.code && candidate.flush === harvest.flush);
      rows.push({
        ...cells,
        flush: String(harvest.flush),
        harvested_on: harvest.harvestedOn,
        fresh_weight: slip?.text ?? harvest.fresh.text,
      });
    }
  }
  return `${toCsv(rows, columns)}\r\n`;
}

/** A weight with two of its digits swapped, as a tired hand types it: "0.649 kg" as "0.694 kg". */
function swappedDigits(written: Written): string {
  const [number, unit] = written.text.split(" ");
  const digits = number.split("");
  const last = digits.length - 1;
  if (digits[last] !== digits[last - 1] && digits[last - 1] !== ".") [digits[last], digits[last - 1]] = [digits[last - 1], digits[last]];
  else digits[last] = String((Number(digits[last]) + 3) % 10);
  return `${digits.join("")} ${unit}`;
}

/**
 * Sends one file as the upload route does (the farm's remembered choices, its parse, the upload
 * kept with its report) and, when its checks find no error, commits it as the commit route does.
 */
async function sendSeasonLog(member: Member, fileName: string, text: string) {
  const setup = await getImportSetup(member);
  const parser = createSeasonLogParser(parserOptions(setup.remembered, setup.knownStrains));
  const content = Buffer.from(text, "utf8");
  parser.write(content);
  const view = await createUpload(member, { fileName, content, result: parser.end(), choices: setup.remembered });
  const receipt = view.canCommit ? await commitUpload(member, view.upload.id, setup.remembered) : null;
  return { uploadId: view.upload.id, committed: receipt !== null, errors: view.report.errorCount };
}

export interface FarmSeason {
  /** Used in the files' names: "hollowoak". */
  slug: string;
  manager: Member;
  /** Who picks and types flushes into the phone form: the farm's grower, or its manager. */
  picker: Member;
  blocks: readonly LogBlock[];
  /** The days the farm sent a season log, the last being the demo's last day. */
  logDays: readonly string[];
  /** The farm's first file had a mistyped strain code and was sent again, put right. */
  firstFileRejected: boolean;
  /** From this day on, flushes of stored blocks went in by phone as they were picked (null: none). */
  phoneFrom: string | null;
  /** For the minutes of the day each thing happened; apart from the scenario's own draws. */
  random: Random;
}

/** Sends the farm's season logs in turn and types its last flushes into the phone form; returns the moments made. */
export async function seedFarmSeasonLogs(season: FarmSeason): Promise<{ moments: Moment[]; summary: string }> {
  const { manager, picker, blocks, logDays, random } = season;
  const moments: Moment[] = [];
  const uploadMoments = (uploadId: string, uploadedAt: Date, committedAt: Date | null) => {
    moments.push({ original: sql`select uploaded_at from uploads where id = ${uploadId}::uuid`, at: uploadedAt });
    if (committedAt) moments.push({ original: sql`select committed_at from uploads where id = ${uploadId}::uuid`, at: committedAt });
  };
  const lastDay = logDays[logDays.length - 1];
  // The slip in each file before the last, put right in the next: its latest flush's weight, mistyped.
  const slips = logDays.slice(0, -1).map((day) => {
    const first = blocks
      .flatMap((block) => block.harvests.filter((harvest) => harvest.harvestedOn <= day).map((harvest) => ({ block, harvest })))
      .sort((a, b) => b.harvest.harvestedOn.localeCompare(a.harvest.harvestedOn))[0];
    return first ? { blockCode: first.block.code, flush: first.harvest.flush, text: swappedDigits(first.harvest.fresh) } : null;
  });
  const stored = new Set<string>();
  let uploads = 0;
  let phoned = 0;
  for (const [index, day] of logDays.entries()) {
    const last = index === logDays.length - 1;
    if (last && season.phoneFrom) phoned += await phoneFlushes(season.phoneFrom);
    const fileName = `${season.slug}-season-log-${day}.csv`;
    const slip = slips[index];
    // Sent at the end of the day's work, checked and committed a few minutes later.
    const sentAt = inTheValley(day, 15 * 60 + random.integer(0, 150) + random.next());
    if (index === 0 && season.firstFileRejected) {
      const typo = blocks.find((block) => block.inoculatedOn <= day && block.strainCode.startsWith("PO"));
      const rejected = await sendSeasonLog(
        manager,
        fileName,
        seasonLogText(blocks, day, [
          ...(slip ? [slip] : []),
          ...(typo ? [{ blockCode: typo.code, text: typo.strainCode.replace("O", "0") }] : []),
        ]),
      );
      if (rejected.committed) throw new Error(`The demo's rejected file for ${season.slug} was committed`);
      uploadMoments(rejected.uploadId, new Date(sentAt.getTime() - (random.integer(18, 30) + random.next()) * 60_000), null);
      uploads++;
    }
    const sent = await sendSeasonLog(manager, fileName, seasonLogText(blocks, day, slip ? [slip] : []));
    if (!sent.committed) throw new Error(`The demo's season log ${fileName} has ${sent.errors} errors`);
    uploadMoments(sent.uploadId, sentAt, new Date(sentAt.getTime() + (random.integer(3, 12) + random.next()) * 60_000));
    uploads++;
    for (const block of blocks)
      for (const harvest of block.harvests) if (harvest.harvestedOn <= day) stored.add(`${block.code}/${harvest.flush}`);
  }
  return { moments, summary: `${uploads} season logs, ${phoned} flushes by phone` };

  /** Flushes of blocks already stored, picked in the last days: typed into the phone form at picking time. */
  async function phoneFlushes(phoneFrom: string): Promise<number> {
    const storedBlocks = new Set([...stored].map((key) => key.split("/")[0]));
    const picked = blocks
      .filter((block) => storedBlocks.has(block.code))
      .flatMap((block) => block.harvests.map((harvest) => ({ block, harvest })))
      .filter(({ harvest }) => harvest.harvestedOn >= phoneFrom && harvest.harvestedOn <= lastDay)
      .sort((a, b) => a.harvest.harvestedOn.localeCompare(b.harvest.harvestedOn) || a.harvest.flush - b.harvest.flush);
    let count = 0;
    let clock = { day: "", minutes: 0 };
    for (const { block, harvest } of picked) {
      // Only a flush whose earlier one is stored: the grower types what the block's bag shows next.
      if (harvest.flush > 1 && !stored.has(`${block.code}/${harvest.flush - 1}`)) continue;
      const entry = recordHarvestSchema.parse({
        blockCode: block.code,
        flush: harvest.flush,
        weight: harvest.fresh.text,
        unit: harvest.fresh.unit,
        harvestedOn: harvest.harvestedOn,
      });
      let result = await recordHarvest(picker, entry, harvest.harvestedOn);
      // The grower read the warnings (a light flush, say) and saved it anyway, as the form offers.
      if (result.status === "warnings")
        result = await recordHarvest(
          picker,
          { ...entry, acceptWarnings: result.warnings.map((warning) => warning.code) },
          harvest.harvestedOn,
        );
      if (result.status !== "saved") throw new Error(`The demo's phone harvest ${block.code} flush ${harvest.flush} was not saved`);
      stored.add(`${block.code}/${harvest.flush}`);
      // Picked in the morning, typed in as each block is weighed.
      clock =
        clock.day === harvest.harvestedOn
          ? { ...clock, minutes: clock.minutes + random.integer(2, 9) }
          : { day: harvest.harvestedOn, minutes: 7 * 60 + random.integer(0, 60) };
      moments.push({
        original: sql`select created_at from harvests where block_id = ${result.blockId}::uuid and flush = ${harvest.flush}`,
        at: inTheValley(harvest.harvestedOn, clock.minutes + random.next()),
      });
      count++;
    }
    return count;
  }
}
