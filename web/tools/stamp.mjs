// Finishes the served build in web/dist (or the folder given): draws the PNG app icons (the
// same picture as web/icon.svg: five black stones on the sea-glass board), then writes the
// service worker's list of files and the build hash that names its cache.
//   node web/tools/stamp.mjs [dist]

import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { deflateSync } from 'node:zlib';
import { fileURLToPath } from 'node:url';

const DIST = process.argv[2] ?? fileURLToPath(new URL('../dist/', import.meta.url));

// ---- PNG icons ----

const CRC_TABLE = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});

function crc32(buf) {
  let c = 0xffffffff;
  for (const b of buf) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type, data) {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const td = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(td));
  return Buffer.concat([len, td, crc]);
}

function png(size, rgba) {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(size, 0);
  header.writeUInt32BE(size, 4);
  header[8] = 8; // bit depth
  header[9] = 6; // RGBA
  const rows = Buffer.alloc(size * (size * 4 + 1));
  for (let y = 0; y < size; y++) {
    rows[y * (size * 4 + 1)] = 0;
    rgba.copy(rows, y * (size * 4 + 1) + 1, y * size * 4, (y + 1) * size * 4);
  }
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', header),
    chunk('IDAT', deflateSync(rows, { level: 9 })),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

const BOARD = [0xa9, 0xc9, 0xbf];
const STONE = [0x11, 0x13, 0x12];
const STONES = [[12, 52], [22, 42], [32, 32], [42, 22], [52, 12]];

// The colour at (x, y) in the icon's 64-unit square, or null outside the rounded square.
function sample(x, y) {
  const r = 12;
  const cx = Math.min(Math.max(x, r), 64 - r);
  const cy = Math.min(Math.max(y, r), 64 - r);
  if ((x - cx) ** 2 + (y - cy) ** 2 > r * r) return null;
  for (const [sx, sy] of STONES) if ((x - sx) ** 2 + (y - sy) ** 2 <= 5.5 * 5.5) return STONE;
  return BOARD;
}

function icon(size) {
  const out = Buffer.alloc(size * size * 4);
  const n = 4; // samples per axis per pixel
  for (let py = 0; py < size; py++) {
    for (let px = 0; px < size; px++) {
      let r = 0;
      let g = 0;
      let b = 0;
      let a = 0;
      for (let j = 0; j < n; j++) {
        for (let i = 0; i < n; i++) {
          const c = sample(((px + (i + 0.5) / n) * 64) / size, ((py + (j + 0.5) / n) * 64) / size);
          if (!c) continue;
          r += c[0];
          g += c[1];
          b += c[2];
          a++;
        }
      }
      const o = (py * size + px) * 4;
      if (a) {
        out[o] = Math.round(r / a);
        out[o + 1] = Math.round(g / a);
        out[o + 2] = Math.round(b / a);
      }
      out[o + 3] = Math.round((255 * a) / (n * n));
    }
  }
  return png(size, out);
}

for (const size of [192, 512]) writeFileSync(join(DIST, `icon-${size}.png`), icon(size));

// ---- the service worker's file list and cache name ----

function walk(dir) {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? walk(p) : [p];
  });
}

const files = walk(DIST)
  .map((p) => relative(DIST, p).split('\\').join('/'))
  .filter((f) => f !== 'sw.js' && f !== 'fivefold.html')
  .sort();
const hash = createHash('sha256');
for (const f of files) {
  hash.update(f);
  hash.update(readFileSync(join(DIST, f)));
}
const build = hash.digest('hex').slice(0, 16);
const swPath = join(DIST, 'sw.js');
let sw = readFileSync(swPath, 'utf8');
if (!sw.includes("'__BUILD__'") || !sw.includes("const FILES = ['./'];")) {
  throw new Error('sw.js has no build placeholders (was it stamped already?)');
}
sw = sw.replace("'__BUILD__'", JSON.stringify(build))
  .replace("const FILES = ['./'];", `const FILES = ${JSON.stringify(['./', ...files], null, 2)};`);
writeFileSync(swPath, sw);
console.log(`    stamped sw.js: build ${build}, ${files.length + 1} files cached`);
