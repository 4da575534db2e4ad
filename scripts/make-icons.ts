/**
 * Draws the app's icons (the mushroom of app/icon.svg: a cap and stem on moss green) as PNG files for
 * the web app manifest: `npx tsx scripts/make-icons.ts`. The PNGs are committed; run again after a change.
 * Each pixel is sampled 4×4 for smooth edges; the PNG is written with node:zlib (deflate and CRC-32).
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { crc32, deflateSync } from "node:zlib";

type Rgb = [number, number, number];
const moss: Rgb = [0x2e, 0x5e, 0x4e];
const oat: Rgb = [0xf6, 0xf4, 0xee];

/** Whether a point of the 32 × 32 drawing (app/icon.svg's grid) is on the cap or the stem. */
function onMushroom(x: number, y: number): boolean {
  // Cap: the upper half of an ellipse centred at (16, 13), 10 wide each side, 8 high.
  const cap = y <= 13 && ((x - 16) / 10) ** 2 + ((y - 13) / 8) ** 2 <= 1;
  const capBase = y > 13 && y <= 15 && x >= 6 && x <= 26;
  const stem = x >= 14 && x <= 18 && y >= 15 && y <= 26;
  return cap || capBase || stem;
}

/** `padding` shrinks the drawing into the middle (a maskable icon keeps it inside the safe circle). */
function draw(size: number, padding: number, rounded: boolean): Buffer {
  const rows: Buffer[] = [];
  const samples = 4;
  for (let py = 0; py < size; py++) {
    const row = Buffer.alloc(1 + size * 4);
    for (let px = 0; px < size; px++) {
      let hits = 0;
      let inside = 0;
      for (let sy = 0; sy < samples; sy++)
        for (let sx = 0; sx < samples; sx++) {
          const u = (px + (sx + 0.5) / samples) / size;
          const v = (py + (sy + 0.5) / samples) / size;
          // Rounded square background, corner radius 7 of 32 as in app/icon.svg.
          const r = 7 / 32;
          const cx = Math.min(Math.max(u, r), 1 - r);
          const cy = Math.min(Math.max(v, r), 1 - r);
          if (!rounded || (u - cx) ** 2 + (v - cy) ** 2 <= r * r) inside++;
          const x = ((u - padding) / (1 - 2 * padding)) * 32;
          const y = ((v - padding) / (1 - 2 * padding)) * 32;
          if (onMushroom(x, y)) hits++;
        }
      const share = hits / samples ** 2;
      const colour = moss.map((channel, i) => Math.round(channel * (1 - share) + oat[i] * share));
      row.set([...colour, Math.round((255 * inside) / samples ** 2)], 1 + px * 4);
    }
    rows.push(row);
  }
  return png(size, Buffer.concat(rows));
}

function chunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, "ascii"), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}

function png(size: number, scanlines: Buffer): Buffer {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(size, 0);
  header.writeUInt32BE(size, 4);
  header.set([8, 6, 0, 0, 0], 8); // 8 bits, RGBA, deflate, no filter, no interlace
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk("IHDR", header),
    chunk("IDAT", deflateSync(scanlines)),
    chunk("IEND", Buffer.alloc(0)),
  ]);
}

mkdirSync("public/icons", { recursive: true });
writeFileSync("public/icons/icon-192.png", draw(192, 0, true));
writeFileSync("public/icons/icon-512.png", draw(512, 0, true));
writeFileSync("public/icons/maskable-512.png", draw(512, 0.12, false));
// Next.js links app/apple-icon.png for phones that read no manifest icons.
writeFileSync("app/apple-icon.png", draw(180, 0.08, false));
console.log("Wrote public/icons/*.png and app/apple-icon.png");
