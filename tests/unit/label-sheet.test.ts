import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { LabelSheet } from "@/app/(app)/trials/_components/label-sheet";
import { harvestFormUrl, labelsFor } from "@/lib/trials/labels";

describe("the label sheet", () => {
  it("carries one QR code per block, each for that block's harvest form, with the strain beside the code and blanks for date and wet mass", async () => {
    const entries = [
      { blockCode: "T-2026-03-FF-01", armLabel: "A", strainCode: "PO-7", strainName: "Grey oyster", treatmentName: null },
      { blockCode: "T-2026-03-FF-02", armLabel: "B", strainCode: "PO-9", strainName: "Pearl oyster", treatmentName: "Horizontal slits" },
    ];
    const html = renderToStaticMarkup(
      createElement(LabelSheet, { labels: await labelsFor(entries, "https://coop.example"), trialCode: "T-2026-03" }),
    );
    expect(html.match(/<svg/g)).toHaveLength(2);
    const urls = [...html.matchAll(/data-harvest-url="([^"]+)"/g)].map((match) => match[1].replaceAll("&amp;", "&"));
    expect(urls).toEqual(entries.map((entry) => harvestFormUrl("https://coop.example", entry.blockCode)));
    const labels = html.split('class="label ').slice(1);
    expect(labels).toHaveLength(2);
    expect(labels[0]).toContain("T-2026-03-FF-01");
    expect(labels[0]).toContain("Grey oyster");
    expect(labels[1]).toContain("Pearl oyster");
    expect(labels[1]).toContain("Horizontal slits");
    for (const label of labels) {
      expect(label).toContain("<dt>Date</dt>");
      expect(label).toContain("<dt>Wet mass</dt>");
    }
    expect(html).not.toMatch(/<script|style=/);
    expect(html).not.toContain("Room:");
  });

  it("says which room each block of a room-level trial goes in", async () => {
    const entries = [
      {
        blockCode: "T-2026-04-FF-01",
        armLabel: "A",
        strainCode: "PO-1",
        strainName: "Grey Morning",
        treatmentName: "Misted all day",
        roomName: "Back tent",
      },
      {
        blockCode: "T-2026-04-FF-02",
        armLabel: "B",
        strainCode: "PO-1",
        strainName: "Grey Morning",
        treatmentName: "Soaked once a day",
        roomName: "Tub 1",
      },
    ];
    const html = renderToStaticMarkup(
      createElement(LabelSheet, { labels: await labelsFor(entries, "https://coop.example"), trialCode: "T-2026-04" }),
    );
    const labels = html.split('class="label ').slice(1);
    expect(labels[0]).toContain("Room: Back tent");
    expect(labels[1]).toContain("Room: Tub 1");
  });
});
