import QRCode from "qrcode";

/** The phone harvest form for one block, its code filled in (app/(app)/blocks/harvest reads `block`). */
export function harvestFormUrl(appUrl: string, blockCode: string): string {
  return `${appUrl.replace(/\/+$/, "")}/blocks/harvest?${new URLSearchParams({ block: blockCode }).toString()}`;
}

/**
 * A QR code as SVG markup made on the server: paths and fill attributes only, no script and no
 * style, so the page's Content Security Policy needs nothing new. Error correction M (15 % of the
 * code may be smudged or torn) is qrcode's default; a quiet zone of 2 modules keeps it readable
 * beside the label's cut line.
 */
export function qrSvg(text: string): Promise<string> {
  return QRCode.toString(text, { type: "svg", errorCorrectionLevel: "M", margin: 2 });
}

export interface LabelEntry {
  blockCode: string;
  armLabel: string;
  strainCode: string;
  strainName: string;
  treatmentName: string | null;
  /** A room-level trial: the farm's own room the block goes in. */
  roomName?: string | null;
}

export interface Label extends LabelEntry {
  harvestUrl: string;
  qrSvg: string;
}

/** One label per block of the farm's list, each with the QR code of its harvest form. */
export function labelsFor(entries: readonly LabelEntry[], appUrl: string): Promise<Label[]> {
  return Promise.all(
    entries.map(async (entry) => {
      const harvestUrl = harvestFormUrl(appUrl, entry.blockCode);
      return { ...entry, harvestUrl, qrSvg: await qrSvg(harvestUrl) };
    }),
  );
}
