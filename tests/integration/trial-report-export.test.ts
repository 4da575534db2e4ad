import Papa from "papaparse";
import type { Pool } from "pg";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { LabelSheet } from "@/app/(app)/trials/_components/label-sheet";
import { renderTrialReportPdf } from "@/components/pdf/trial-report-pdf";
import { closeDatabase } from "@/db/client";
import { toCsv } from "@/lib/csv";
import { loadMember, type Member } from "@/lib/data/members";
import { getCloseReview, getPublishedReport, listOwnAssignments, moveTrial } from "@/lib/data/trials";
import { harvestFormUrl, labelsFor } from "@/lib/trials/labels";
import { pdfSafeText, trialReportColumns, trialReportDocument, trialReportRows } from "@/lib/trials/report-document";
import { pdfPageTexts } from "../support/pdf-text";
import { CoopFixture } from "./adversarial/support/co-op-fixtures";
import { superuserPool } from "./support/database";

// The published trial report taken away as a PDF and as CSV, read as each kind of member: what
// the routes under app/api/trials/[trialId]/report send (getPublishedReport, then the document).
// Every farm's real name is one that must never appear; the reader's own farm is marked only
// as "your farm", under the trial's pseudonym.

let inspector: Pool;
let fixture: CoopFixture;
let coordinator: Member;
let observer: Member;
let farms: { id: string; manager: Member }[];
let outsider: { id: string; manager: Member };
let farmNames: string[];
let trialId: string;
let armIds: string[];
const strainNames = ["Grey oyster export", "Pearl oyster export"];

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = $1", [email]);
  return (await loadMember(rows[0].id))!;
}

async function pdfOf(member: Member) {
  const trial = await getPublishedReport(member, trialId);
  return { trial, pages: pdfPageTexts(new Uint8Array(await renderTrialReportPdf(trialReportDocument(trial)))) };
}

beforeAll(async () => {
  inspector = superuserPool();
  fixture = new CoopFixture(inspector);
  coordinator = await memberByEmail("coordinator@aldervalley.example");
  observer = await memberByEmail("observer@extension.example");
  await inspector.query("update cooperative_settings set show_per_farm_estimates = true");
  const species = await fixture.species("Export oyster", strainNames);
  farms = await Promise.all(["Birchmoss", "Cedar Hollow", "Elmbank", "Rowan Ridge"].map((name) => fixture.farm(`${name} Mushrooms`)));
  outsider = await fixture.farm("Outside Lane Mushrooms");
  const { rows } = await inspector.query<{ name: string }>("select name from farms where id = any($1)", [
    [...farms, outsider].map((farm) => farm.id),
  ]);
  farmNames = rows.map((row) => row.name);
  const trial = await fixture.runningTrial(
    species.id,
    [
      { label: "A", strainId: species.strainIds[0], reference: true },
      { label: "B", strainId: species.strainIds[1] },
    ],
    farms.map((farm) => farm.id),
  );
  trialId = trial.id;
  armIds = trial.armIds;
  for (const [index, farm] of farms.entries()) {
    // BE over flushes 1–2 of about 80 in arm A and 80 + 3·(index + 1) in arm B (1 000 g dry substrate per block).
    const blocks = (armId: string, be: number) =>
      [-2.3, -0.7, 0.9, 2.6].map((offset) => ({ trialArmId: armId, flushes: [(be + offset) * 7, (be + offset) * 3] }));
    await fixture.blocks(farm.id, species.strainIds[0], blocks(trial.armIds[0], 80));
    await fixture.blocks(farm.id, species.strainIds[1], [
      ...blocks(trial.armIds[1], 83 + 3 * index),
      { trialArmId: trial.armIds[1], contaminated: true },
    ]);
  }
  await moveTrial(coordinator, trialId, "collecting", { reviewed: (await getCloseReview(coordinator, trialId)).fingerprint });
});

afterAll(async () => {
  await inspector.query("update cooperative_settings set show_per_farm_estimates = false");
  await fixture.dispose();
  await inspector.end();
  await closeDatabase();
});

describe("the trial report for taking away", () => {
  it("is not given out before the trial is published, not even to the coordinator", async () => {
    for (const member of [coordinator, observer, farms[0].manager])
      await expect(getPublishedReport(member, trialId)).rejects.toMatchObject({ code: "not_found" });
  });

  it("as a PDF carries the trial code, the arms' strains, the answer and the caution, and no farm's name", async () => {
    await moveTrial(coordinator, trialId, "published");
    const { trial, pages } = await pdfOf(observer);
    expect(pages).toHaveLength(2);
    const text = pages.join(" ");
    expect(pages[0]).toContain(trial.code);
    for (const name of strainNames) expect(pages[0]).toContain(name);
    expect(trial.results.analysis.answer).toMatch(
      /^Pearl oyster export \(arm B\) gave more than the reference, Grey oyster export \(arm A\)/,
    );
    expect(pages[0]).toContain(pdfSafeText(trial.results.analysis.answer));
    expect(pages[1]).toContain("Moulds and spores");
    for (const name of farmNames) expect(text).not.toContain(name);
    expect(text).not.toMatch(/your farm/i);
    expect(text.match(/Farm [A-D] /g)?.length).toBeGreaterThanOrEqual(4);
  });

  it("marks a taking-part farm's own row as its farm, and shows it nothing else the observer does not see", async () => {
    const observerDocument = trialReportDocument(await getPublishedReport(observer, trialId));
    for (const farm of farms) {
      const { pages } = await pdfOf(farm.manager);
      const text = pages.join(" ");
      expect(text.match(/\(your farm\)/g)).toHaveLength(1);
      for (const name of farmNames) expect(text).not.toContain(name);
      const own = trialReportDocument(await getPublishedReport(farm.manager, trialId));
      expect(JSON.parse(JSON.stringify(own).replaceAll(" (your farm)", ""))).toEqual(observerDocument);
    }
  });

  it("gives a manager of a farm outside the trial and the coordinator exactly the published view", async () => {
    const observerDocument = trialReportDocument(await getPublishedReport(observer, trialId));
    for (const member of [outsider.manager, coordinator]) {
      expect(trialReportDocument(await getPublishedReport(member, trialId))).toEqual(observerDocument);
      const text = (await pdfOf(member)).pages.join(" ");
      expect(text).not.toMatch(/your farm/i);
      for (const name of farmNames) expect(text).not.toContain(name);
    }
  });

  it("as CSV has one row per figure with the arms by strain, the reader's farm marked and no farm's name", async () => {
    const csvFor = async (member: Member) =>
      Papa.parse<Record<string, string>>(toCsv(trialReportRows(await getPublishedReport(member, trialId)), trialReportColumns), {
        header: true,
        skipEmptyLines: true,
      });
    const observerCsv = await csvFor(observer);
    expect(observerCsv.meta.fields).toEqual(trialReportColumns.map((column) => column.header));
    const means = observerCsv.data.filter((row) => row.table === "adjusted mean BE (%)");
    const { arms } = await getPublishedReport(observer, trialId);
    expect(means.map((row) => row.arm)).toEqual(arms.map((arm, index) => `${arm.label}: ${arm.strainCode} ${strainNames[index]}`));
    expect(means.every((row) => /^\d+\.\d$/.test(row.estimate))).toBe(true);
    const farmRows = observerCsv.data.filter((row) => row.table === "farm by farm difference (BE points)");
    expect(farmRows.map((row) => row.farm).sort()).toEqual(["Farm A", "Farm B", "Farm C", "Farm D", "all farms pooled"]);
    const raw = JSON.stringify(observerCsv.data);
    for (const name of farmNames) expect(raw).not.toContain(name);

    const ownCsv = await csvFor(farms[2].manager);
    expect(ownCsv.data.filter((row) => row.farm.endsWith("(your farm)"))).toHaveLength(1);
    expect((await csvFor(outsider.manager)).data).toEqual(observerCsv.data);
  });
});

describe("the label sheet of a farm's list", () => {
  it("has one QR code per listed block, each for that block's harvest form, with the arm's strain, for that farm alone", async () => {
    const farm = farms[1];
    const codes = ["EX-CH-01", "EX-CH-02", "EX-CH-03", "EX-CH-04"];
    await inspector.query(
      `insert into trial_block_assignments (trial_id, farm_id, enrolment_id, arm_id, block_code, sequence, permuted_block)
       select $1, $2, e.id, (array[$3, $4]::uuid[])[1 + (n - 1) % 2], 'EX-CH-0' || n, n, 1 + (n - 1) / 2
       from trial_enrolments e, generate_series(1, 4) n where e.trial_id = $1 and e.farm_id = $2`,
      [trialId, farm.id, armIds[0], armIds[1]],
    );
    const list = await listOwnAssignments(farm.manager, trialId);
    expect(list.map((entry) => entry.blockCode)).toEqual(codes);
    const html = renderToStaticMarkup(
      createElement(LabelSheet, { labels: await labelsFor(list, "https://coop.example"), trialCode: "T-X" }),
    );
    expect(html.match(/<svg/g)).toHaveLength(4);
    expect([...html.matchAll(/data-harvest-url="([^"]+)"/g)].map((match) => match[1])).toEqual(
      codes.map((code) => harvestFormUrl("https://coop.example", code)),
    );
    expect(html.match(new RegExp(strainNames[0], "g"))).toHaveLength(2);
    expect(html.match(new RegExp(strainNames[1], "g"))).toHaveLength(2);
    for (const other of [farms[0].manager, outsider.manager, coordinator, observer])
      expect(await listOwnAssignments(other, trialId)).toEqual([]);
  });
});
