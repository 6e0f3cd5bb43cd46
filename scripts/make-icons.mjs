// Draws Coneline's app icons (a gutta-percha cone on its length line, on ink) as SVG and
// renders the PNG sizes the web manifest lists. Run: node scripts/make-icons.mjs
// sharp comes with Astro (its image service), so no extra package is needed.
import { mkdirSync, writeFileSync } from 'node:fs';
import sharp from 'sharp';

const INK = '#17212E';
const PAPER = '#F8F6F1';
const GUTTA = '#D9683B';

/** The mark on a 512 square; `inset` shrinks it into the maskable safe zone. */
function svg(inset) {
  const s = 512;
  const k = 1 - inset * 2;
  const t = (v) => s * inset + v * k;
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${s} ${s}" width="${s}" height="${s}">
  <rect width="${s}" height="${s}" rx="${inset > 0 ? 0 : 96}" fill="${INK}"/>
  <polygon points="${t(196)},${t(96)} ${t(316)},${t(96)} ${t(262)},${t(372)} ${t(250)},${t(372)}" fill="${GUTTA}"/>
  <rect x="${t(112)}" y="${t(388)}" width="${288 * k}" height="${28 * k}" rx="${8 * k}" fill="${PAPER}"/>
</svg>`;
}

mkdirSync('public/icons', { recursive: true });
const plain = Buffer.from(svg(0));
const maskable = Buffer.from(svg(0.12));
writeFileSync('public/icons/coneline.svg', plain);
await sharp(plain).resize(192, 192).png().toFile('public/icons/coneline-192.png');
await sharp(plain).resize(512, 512).png().toFile('public/icons/coneline-512.png');
await sharp(maskable).resize(512, 512).png().toFile('public/icons/coneline-maskable-512.png');
console.log('icons written to public/icons');
