import { describe, expect, it } from "vitest";
import { harvestFormUrl, labelsFor, qrSvg } from "./labels";

describe("the harvest form a label's QR code opens", () => {
  it("is the quick harvest form with the block's code in its `block` parameter", () => {
    const url = new URL(harvestFormUrl("https://coop.example", "T-2026-03-FF-07"));
    expect(url.origin).toBe("https://coop.example");
    expect(url.pathname).toBe("/blocks/harvest");
    expect(url.searchParams.get("block")).toBe("T-2026-03-FF-07");
    expect(harvestFormUrl("https://coop.example", "T-2026-03-FF-07")).toBe("https://coop.example/blocks/harvest?block=T-2026-03-FF-07");
  });

  it("keeps a code with spaces or & whole, and takes one slash from the app's address", () => {
    const address = harvestFormUrl("http://127.0.0.1:3000/", "B 12&x");
    expect(address).toBe("http://127.0.0.1:3000/blocks/harvest?block=B+12%26x");
    expect(new URL(address).searchParams.get("block")).toBe("B 12&x");
  });
});

describe("a label's QR code", () => {
  it("is one SVG of paths, with nothing the page's Content Security Policy would refuse", async () => {
    const svg = await qrSvg("http://127.0.0.1:3000/blocks/harvest?block=T-1");
    expect(svg.trim().startsWith("<svg")).toBe(true);
    expect(svg.match(/<svg/g)).toHaveLength(1);
    expect(svg).toMatch(/<path /);
    expect(svg).not.toMatch(/<script|<style|style=|on\w+=|href=/i);
  });

  it("differs from block to block, one per block of the list", async () => {
    const entries = ["T-1-AA-01", "T-1-AA-02", "T-1-AA-03"].map((blockCode) => ({
      blockCode,
      armLabel: "A",
      strainCode: "PO-7",
      strainName: "Grey oyster",
      treatmentName: null,
    }));
    const labels = await labelsFor(entries, "https://coop.example");
    expect(labels.map((label) => label.harvestUrl)).toEqual(
      entries.map((entry) => harvestFormUrl("https://coop.example", entry.blockCode)),
    );
    expect(new Set(labels.map((label) => label.qrSvg)).size).toBe(3);
  });
});
