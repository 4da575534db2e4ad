import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { auditActions } from "./actions";
import { foldRepeats } from "./fold";
import { describeAuditEvent } from "./sentences";

const root = path.resolve(import.meta.dirname, "../..");

function sourceFiles(dir: string): string[] {
  return readdirSync(path.join(root, dir), { withFileTypes: true, recursive: true })
    .filter((entry) => entry.isFile() && /\.tsx?$/.test(entry.name) && !/\.test\.tsx?$/.test(entry.name))
    .map((entry) => path.join(entry.parentPath, entry.name));
}

/** Every file that writes the activity log: through recordAudit, or straight into audit_events (the demo seed). */
const writers = ["lib", "db", "app", "scripts"]
  .flatMap(sourceFiles)
  .filter((file) => !file.includes(`${path.sep}lib${path.sep}audit${path.sep}`))
  .map((file) => ({ file, source: readFileSync(file, "utf8") }))
  .filter(({ source }) => /recordAudit\(|auditEvents\)\.values/.test(source));

// The namespaces of the log's action names; a quoted word of this shape in a writer is an action it records.
const actionLiteral =
  /["'](sign-in(?:\.[a-z_-]+)?|(?:sessions|password|preferences|member|farm|cooperative-settings|registry|pooled-release|harvest|block|room|season-log|climate-log|trial)\.[a-z_-]+)["']/g;
const recorded = new Set(writers.flatMap(({ source }) => [...source.matchAll(actionLiteral)].map((match) => match[1])));

describe("every recorded action has a sentence", () => {
  it("finds the files that write the log, and the actions they record", () => {
    // Common practice: a test that scans the source first shows it found what it scans.
    expect(writers.length).toBeGreaterThanOrEqual(10);
    expect(recorded).toContain("season-log.committed");
    expect(recorded).toContain("farm.suspended");
  });

  it("lists every action the code records, and records every action it lists", () => {
    expect([...recorded].filter((action) => !(auditActions as readonly string[]).includes(action))).toEqual([]);
    expect(auditActions.filter((action) => !recorded.has(action))).toEqual([]);
  });

  it("builds no action name at run time, so the scan above sees them all", () => {
    const built = writers.filter(({ source }) => /action:\s*`/.test(source)).map(({ file }) => path.relative(root, file));
    expect(built).toEqual([]);
  });

  it.each(auditActions)("says %s in words, without the internal name or raw JSON", (action) => {
    const described = describeAuditEvent({ action, subject: "B-014 flush 2", actorLabel: "Tomas Reyes", details: {} });
    expect(described.sentence).toMatch(/^[A-Z'].*\.$/);
    expect(described.sentence).not.toContain(action);
    expect(described.sentence).not.toMatch(/[{}[\]]|undefined|NaN|null/);
    for (const detail of described.details) expect(`${detail.label} ${detail.value}`).not.toMatch(/[{}]|undefined|NaN/);
  });

  it("reads an action no longer recorded as a plain sentence, not its name", () => {
    const described = describeAuditEvent({ action: "block.renamed", subject: "B-014", actorLabel: "Ana", details: { x: 1 } });
    expect(described.sentence).toBe("Ana made a change: B-014.");
    expect(described.sentence).not.toContain("block.renamed");
  });
});

describe("climate logs", () => {
  it("says how many readings were stored and how many an earlier log already covered", () => {
    const described = describeAuditEvent({
      action: "climate-log.uploaded",
      subject: "tub-may.csv",
      actorLabel: "Tomas",
      details: { roomId: "r1", roomName: "Tub 1", readings: 288, skippedReadings: 12, shape: "comma-separated", timeZone: "Europe/Berlin" },
    });
    expect(described.sentence).toBe(
      "Tomas uploaded the climate log 'tub-may.csv' for the room 'Tub 1': 288 readings, leaving out 12 readings in times the room's earlier logs already cover.",
    );
    expect(described.link).toEqual({ href: "/rooms/r1/climate", label: "The room's climate" });
  });
});

describe("season logs", () => {
  const uploadId = "7d0f3c1e-2b4a-4c55-9a0e-1f2e3d4c5b6a";

  it("says what a commit changed, leaving out what it did not", () => {
    const described = describeAuditEvent({
      action: "season-log.committed",
      subject: "spring.csv",
      actorLabel: "Tomas",
      details: {
        uploadId,
        newBlocks: 40,
        changedBlocks: 0,
        untouchedBlocks: 5,
        newHarvests: 0,
        changedHarvests: 3,
        untouchedHarvests: 2,
        changedValues: 4,
        removedHarvests: 0,
      },
    });
    expect(described.sentence).toBe("Tomas committed the season log 'spring.csv': 40 new blocks and 3 changed harvests.");
    expect(described.details).toContainEqual({ label: "Values replaced", value: "4" });
    expect(described.link).toEqual({ href: `/api/season-logs/${uploadId}/file`, label: "Download spring.csv" });
  });

  it("says one block, one harvest removed, and a commit that changed nothing", () => {
    expect(
      describeAuditEvent({
        action: "season-log.committed",
        subject: "a.csv",
        actorLabel: "Tomas",
        details: { uploadId, newBlocks: 1, changedBlocks: 1, newHarvests: 1, changedHarvests: 0, removedHarvests: 1 },
      }).sentence,
    ).toBe("Tomas committed the season log 'a.csv': 1 new block, 1 changed block, 1 new harvest and 1 harvest removed.");
    expect(
      describeAuditEvent({ action: "season-log.committed", subject: "a.csv", actorLabel: "Tomas", details: { uploadId } }).sentence,
    ).toBe("Tomas committed the season log 'a.csv': nothing new or changed.");
  });

  it("says what an upload's check found, and when the same file came again", () => {
    expect(
      describeAuditEvent({
        action: "season-log.uploaded",
        subject: "spring.xlsx",
        actorLabel: "Noor",
        details: { uploadId, rows: 120, errors: 1, warnings: 3, alreadyImported: false },
      }).sentence,
    ).toBe("Noor uploaded the season log 'spring.xlsx': 120 rows, 1 error and 3 warnings.");
    expect(
      describeAuditEvent({
        action: "season-log.uploaded",
        subject: "spring.xlsx",
        actorLabel: "Noor",
        details: { uploadId, rows: 1, alreadyImported: true },
      }).sentence,
    ).toBe("Noor uploaded the season log 'spring.xlsx' again: the same file was committed before, so it changes nothing.");
  });

  it("says what an undo removed and put back, with the reason", () => {
    const described = describeAuditEvent({
      action: "season-log.undone",
      subject: "spring.csv",
      actorLabel: "Noor",
      details: {
        uploadId,
        fileName: "spring.csv",
        removedBlocks: 2,
        removedHarvests: 1,
        restoredRows: 0,
        reason: "Wrong farm's file",
        removedBlockCodes: ["B-1", "B-2"],
        valuesPutBack: 0,
      },
    });
    expect(described.sentence).toBe(
      "Noor undid the commit of 'spring.csv': 2 blocks and 1 harvest removed and 0 rows put back as they were.",
    );
    expect(described.details).toContainEqual({ label: "Reason", value: "Wrong farm's file" });
    expect(described.details).toContainEqual({ label: "Blocks removed", value: "B-1, B-2" });
  });
});

describe("harvests and blocks", () => {
  const blockId = "0b6c9a40-5d7e-4f1a-8c2b-3e4d5f6a7b8c";

  it("names the phone form's harvest, its block and the warning saved anyway", () => {
    const described = describeAuditEvent({
      action: "harvest.recorded",
      subject: "B-014 flush 2",
      actorLabel: "Eli Marsh",
      details: { blockId, flush: 2, freshGrams: 1250, savedAnyway: ["flush_heavier_than_block"] },
    });
    expect(described.sentence).toBe("Eli Marsh recorded flush 2 of block B-014 on the phone form: 1250 g fresh.");
    expect(described.details).toEqual([{ label: "Saved despite a warning about", value: "a flush heavier than the block" }]);
    expect(described.link).toEqual({ href: `/blocks/${blockId}`, label: "Block B-014" });
  });

  it("shows each corrected value old → new in the column's own title, with the reason", () => {
    const described = describeAuditEvent({
      action: "harvest.corrected",
      subject: "B-014 flush 2",
      actorLabel: "Noor",
      details: {
        blockId,
        flush: 2,
        reason: "Scale read twice",
        changes: [
          { flush: 2, field: "fresh_weight", oldValue: "2500", newValue: "1250" },
          { flush: 2, field: "harvested_on", oldValue: "2026-04-11", newValue: "2026-04-12" },
        ],
        savedAnyway: [],
      },
    });
    expect(described.sentence).toBe("Noor corrected flush 2 of block B-014: 2 values changed.");
    expect(described.details).toEqual([
      { label: "Fresh weight of flush 2", value: "2500 g → 1250 g" },
      { label: "Harvested on of flush 2", value: "2026-04-11 → 2026-04-12" },
      { label: "Reason", value: "Scale read twice" },
    ]);
  });

  it("says one value for a block edit with one change, and blank for an emptied value", () => {
    const described = describeAuditEvent({
      action: "block.corrected",
      subject: "B-014",
      actorLabel: "Noor",
      details: {
        blockId,
        reason: "typo",
        changes: [{ flush: null, field: "notes", oldValue: "shelf 3", newValue: null }],
        savedAnyway: [],
      },
    });
    expect(described.sentence).toBe("Noor corrected block B-014: 1 value changed.");
    expect(described.details[0]).toEqual({ label: "Notes", value: "shelf 3 → (blank)" });
    expect(described.link?.href).toBe(`/blocks/${blockId}`);
  });
});

describe("people, farms and settings", () => {
  it("names the role in words", () => {
    expect(
      describeAuditEvent({
        action: "member.invited",
        subject: "eli@example.test",
        actorLabel: "Noor",
        details: { role: "grower", expiresAt: "2026-12-10T08:00:00.000Z" },
      }),
    ).toEqual({
      sentence: "Noor invited eli@example.test to join as a grower.",
      details: [{ label: "The link expires on", value: "2026-12-10" }],
      link: { href: "/members", label: "Members" },
    });
    expect(
      describeAuditEvent({
        action: "member.invited",
        subject: "eli@example.test",
        actorLabel: "Noor",
        details: { role: "grower" },
        onFarmLog: true,
      }).link,
    ).toEqual({ href: "/farm-people", label: "Farm people" });
    expect(
      describeAuditEvent({
        action: "member.role-changed",
        subject: "noor@example.test",
        actorLabel: "Ana",
        details: { oldRole: "grower", newRole: "farm_manager" },
      }).sentence,
    ).toBe("Ana changed noor@example.test's role from grower to farm manager.");
    expect(
      describeAuditEvent({ action: "member.joined", subject: "o@example.test", actorLabel: "Oli", details: { role: "observer" } }).sentence,
    ).toBe("Oli accepted the invitation and joined as an observer.");
  });

  it("says nobody was signed in when a sign-in fails", () => {
    const described = describeAuditEvent({ action: "sign-in.failed", subject: "x@example.test", actorLabel: "", details: {} });
    expect(described.sentence).toMatch(/^A sign-in as x@example.test was refused/);
    expect(
      describeAuditEvent({ action: "sign-in.rate-limited", subject: "x@example.test", actorLabel: "", details: { waitSeconds: 1 } })
        .details,
    ).toEqual([{ label: "Next try allowed after", value: "1 second" }]);
  });

  it("counts what an export held and a withdrawal deleted", () => {
    expect(
      describeAuditEvent({
        action: "farm.data-exported",
        subject: "Alder Farm",
        actorLabel: "Noor",
        details: { blocks: 1, harvests: 12, uploads: 0 },
      }).sentence,
    ).toBe("Noor downloaded all of Alder Farm's records: 1 block, 12 harvests and 0 uploads.");
    expect(
      describeAuditEvent({
        action: "farm.withdrew-data",
        subject: "Alder Farm",
        actorLabel: "Noor",
        details: { blocks: 3, harvests: 1, uploads: 1 },
      }).sentence,
    ).toBe("Noor withdrew Alder Farm's records from the co-op: 3 blocks, 1 harvest and 1 upload deleted.");
  });

  it("shows each changed co-op setting old → new, and only those", () => {
    const described = describeAuditEvent({
      action: "cooperative-settings.updated",
      subject: "Co-op settings",
      actorLabel: "Ana",
      details: {
        before: { minimumFarms: 3, showPerFarmEstimates: false, releaseSchedule: "daily", releaseHour: 2 },
        after: { minimumFarms: 4, showPerFarmEstimates: false, releaseSchedule: "weekly", releaseHour: 2 },
      },
    });
    expect(described.details).toEqual([
      { label: "Minimum farms for a pooled figure", value: "3 → 4" },
      { label: "When releases are published", value: "Every night → Every Monday" },
    ]);
    expect(described.sentence).toBe(
      "Ana changed the co-op settings: minimum farms for a pooled figure 3 → 4 and when releases are published Every night → Every Monday.",
    );
  });

  it("names the register an entry went into", () => {
    expect(
      describeAuditEvent({ action: "registry.retired", subject: "PO-01", actorLabel: "Ana", details: { registry: "strains", id: "x" } })
        .sentence,
    ).toBe("Ana retired PO-01 from the strain list: past records keep it, new ones cannot use it.");
    expect(
      describeAuditEvent({ action: "registry.imported", subject: "substrate_recipes", actorLabel: "Ana", details: { rows: 1 } }).sentence,
    ).toBe("Ana imported the substrate recipe list: 1 row.");
  });
});

describe("trials and releases", () => {
  const trialId = "5e6f7a8b-9c0d-4e1f-a2b3-c4d5e6f7a8b9";

  it("names the trial's states as the trial pages do, and links the trial", () => {
    const described = describeAuditEvent({
      action: "trial.status_changed",
      subject: "OY-2026",
      actorLabel: "Ana",
      details: { trialId, from: "running", to: "collecting", incomplete: { listed: 24, contaminated: 1, leftOut: { spent: 0 } } },
    });
    expect(described.sentence).toBe("Ana moved trial OY-2026 from Running to Collecting results.");
    expect(described.details).toEqual([
      { label: "Blocks on the farms' lists", value: "24" },
      { label: "Contaminated blocks", value: "1" },
    ]);
    expect(described.link).toEqual({ href: `/trials/${trialId}`, label: "Trial OY-2026" });
    expect(
      describeAuditEvent({
        action: "trial.status_changed",
        subject: "OY-2026",
        actorLabel: "Ana",
        details: { trialId, from: "collecting", to: "published", run: 1, version: 1 },
      }).sentence,
    ).toBe("Ana published the results of trial OY-2026 (run 1, version 1).");
  });

  it("splits the trial and farm out of the subject", () => {
    expect(
      describeAuditEvent({ action: "trial.farm_invited", subject: "OY-2026: Alder Farm", actorLabel: "Ana", details: { trialId } }),
    ).toEqual({
      sentence: "Ana invited Alder Farm to trial OY-2026.",
      details: [],
      link: { href: `/trials/${trialId}`, label: "Trial OY-2026" },
    });
    expect(
      describeAuditEvent({
        action: "trial.analysed",
        subject: "OY-2026: run 2",
        actorLabel: "Ana",
        details: { trialId, run: 2, inputs: { farms: 1, blocks: 30 } },
      }).sentence,
    ).toBe("Ana ran the analysis of trial OY-2026 (run 2) on 1 farm and 30 blocks.");
  });

  it("counts an enrolment's blocks", () => {
    expect(
      describeAuditEvent({
        action: "trial.enrolment_accepted",
        subject: "OY-2026",
        actorLabel: "Noor",
        details: { trialId, blocksPerArm: 1, blocks: 3, seed: "s" },
      }).sentence,
    ).toBe("Noor enrolled the farm in trial OY-2026: 1 block per arm, 3 blocks in all.");
    expect(
      describeAuditEvent({
        action: "trial.enrolment_accepted",
        subject: "OY-2026",
        actorLabel: "Noor",
        details: { trialId, blocksPerArm: 6, blocks: 12, rooms: 4, seed: "s" },
      }).sentence,
    ).toBe("Noor enrolled the farm in trial OY-2026: 4 fruiting rooms drawn to the arms, 12 blocks in all.");
  });

  it("says a release's figures", () => {
    expect(
      describeAuditEvent({
        action: "pooled-release.cut",
        subject: "Release 7",
        actorLabel: "Ana",
        details: { release: 7, figuresChanged: 1 },
      }).sentence,
    ).toBe("Ana published release 7 of the co-op results: 1 figure changed.");
  });
});

describe("repeats fold into one row", () => {
  const at = (minute: number) => new Date(Date.UTC(2026, 11, 3, 10, minute));
  const event = (minute: number, action = "pooled-release.checked", details: Record<string, unknown> = { outcome: "unchanged" }) => ({
    action,
    subject: "Co-op results",
    actorLabel: "Ana",
    details,
    occurredAt: at(minute),
  });

  it("folds neighbours that are the same change, newest first, and counts them", () => {
    const folded = foldRepeats([event(5), event(4), event(3), event(2, "sign-in"), event(1)]);
    expect(folded.map((row) => [row.times, row.latest.occurredAt, row.first.occurredAt])).toEqual([
      [3, at(5), at(3)],
      [1, at(2), at(2)],
      [1, at(1), at(1)],
    ]);
  });

  it("keeps events with different particulars apart", () => {
    expect(foldRepeats([event(2), event(1, "pooled-release.checked", { outcome: "waiting" })])).toHaveLength(2);
  });
});
