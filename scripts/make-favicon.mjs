// Writes public/favicon.ico from public/icon.svg: 16, 32 and 48 px renderings, each stored as PNG inside
// the ICO container (ICONDIR + ICONDIRENTRY per image, then the images; PNG entries are what current
// browsers and Windows read). Run once after changing the icon and commit the result:
//   node scripts/make-favicon.mjs
// It renders with sharp, which next already installs (an optional dependency of next), so nothing new
// is added to package.json; without it the script says so and stops.
import { readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const SIZES = [16, 32, 48];

let sharp;
try {
  sharp = (await import("sharp")).default;
} catch {
  console.error("make-favicon: sharp is not installed (it comes with next as an optional dependency); run npm install first");
  process.exit(1);
}

const svg = readFileSync(path.join(root, "public/icon.svg"));
// density: the SVG is 64 px wide at 72 dpi; render sharp enough for 48 px and let resize take it down
const images = await Promise.all(SIZES.map((size) => sharp(svg, { density: 288 }).resize(size, size).png({ compressionLevel: 9 }).toBuffer()));

const header = Buffer.alloc(6);
header.writeUInt16LE(0, 0); // reserved
header.writeUInt16LE(1, 2); // 1 = icon
header.writeUInt16LE(images.length, 4);
const entries = [];
let offset = 6 + 16 * images.length;
images.forEach((png, i) => {
  const entry = Buffer.alloc(16);
  entry.writeUInt8(SIZES[i] % 256, 0); // width (0 means 256)
  entry.writeUInt8(SIZES[i] % 256, 1); // height
  entry.writeUInt8(0, 2); // no palette
  entry.writeUInt8(0, 3); // reserved
  entry.writeUInt16LE(1, 4); // colour planes
  entry.writeUInt16LE(32, 6); // bits per pixel
  entry.writeUInt32LE(png.length, 8);
  entry.writeUInt32LE(offset, 12);
  offset += png.length;
  entries.push(entry);
});
const ico = Buffer.concat([header, ...entries, ...images]);
writeFileSync(path.join(root, "public/favicon.ico"), ico);
console.log(`public/favicon.ico: ${SIZES.join(", ")} px, ${ico.length} bytes`);
