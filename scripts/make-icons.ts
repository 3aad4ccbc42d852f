// Draws the app icons in public/icons from Seedplot's mark (components/layout/logo.tsx) with sharp, so
// nothing is downloaded. Run again after changing the mark: npx tsx scripts/make-icons.ts
import sharp from "sharp";
import path from "node:path";

const out = path.resolve(import.meta.dirname, "../public/icons");

// The mark on a husk tile; `inset` leaves the safe zone a maskable icon needs (launchers crop to a circle).
function svg(inset: number) {
  const scale = (32 - 2 * inset) / 32;
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 32 32">
  <rect width="32" height="32" fill="#fbf9f4"/>
  <g transform="translate(${inset} ${inset}) scale(${scale})">
    <rect x="2" y="18" width="28" height="12" rx="3" fill="#e8dfca"/>
    <path d="M9 18v12M16 18v12M23 18v12" stroke="#c2b08a" stroke-width="1.5"/>
    <path d="M16 20V10" stroke="#23743a" stroke-width="2.5" stroke-linecap="round"/>
    <path d="M16 12c-5 0-8-3-8-7 5 0 8 3 8 7zM16 14c4 0 7-2.5 7-6-4 0-7 2.5-7 6z" fill="#2f8a43"/>
  </g>
</svg>`;
}

for (const [name, size, inset] of [
  ["icon-192.png", 192, 2],
  ["icon-512.png", 512, 2],
  ["maskable-512.png", 512, 6],
  ["apple-touch-icon.png", 180, 3],
] as const) {
  await sharp(Buffer.from(svg(inset)), { density: (size / 32) * 72 }).resize(size, size).png({ compressionLevel: 9 }).toFile(path.join(out, name));
  console.log(`${name} ${size}x${size}`);
}
