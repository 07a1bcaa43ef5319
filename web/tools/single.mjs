// Builds the second output of the app: one self-contained HTML file, web/dist/fivefold.html,
// that runs when opened from the file system (for copying onto phones at a venue).
//   node web/tools/single.mjs [dist [module]]
//
// From the served build in dist it takes the page, the style sheet, the app's modules and the
// worker, and from `module` (a wasm-bindgen output folder; dist/workshop when not given) the
// glue and the wasm module, which must be a build of the workshop (it holds all the page's
// module does). build_app (tools/common.sh) hands it the workshop built for size. It writes
// one file in which
//   - the wasm module is gzipped (by zopfli, which packs the same gzip format about 6 %
//     tighter than zlib's best) and base64 in a <script type="application/octet-stream"> data
//     block, for the page and the worker;
//   - the glue and every app module are pasted into one <script type="module">, in dependency
//     order, with their import lines removed and `export` dropped from their declarations
//     (web/platform.js is replaced by web/tools/platform-inline.js);
//   - the worker is the glue plus web/worker.js as a classic script, in a <script
//     type="text/plain"> data block, started from a blob: URL (module workers from blob: and
//     separate files both fail from file://);
//   - the style sheet and the icon are inline, and the Content-Security-Policy allows exactly
//     the inline script and style by their SHA-256 hashes, WebAssembly, and blob: workers.
// Top-level names of all the pasted modules share one scope; the result is checked with
// `node --check`, which refuses a name declared twice, and then minified with esbuild.

import { createHash } from 'node:crypto';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { gunzipSync } from 'node:zlib';
import { tmpdir } from 'node:os';
import { dirname, join, normalize } from 'node:path';
import { fileURLToPath } from 'node:url';
import { leanHtml } from './lean-html.mjs';
import { transformSync } from 'esbuild';
import zopfli from '@gfx/zopfli';

const DIST = process.argv[2] ?? fileURLToPath(new URL('../dist/', import.meta.url));
const INLINE_PLATFORM = fileURLToPath(new URL('./platform-inline.js', import.meta.url));
// A workshop module serves the page and the worker here: it holds everything the page's
// module does, and one module in the file is smaller than two.
const MODULE = process.argv[3] ?? join(DIST, 'workshop');
const GLUE = join(MODULE, 'fivefold_web.js');
const WASM = join(MODULE, 'fivefold_web_bg.wasm');

const read = (p) => readFileSync(p, 'utf8');
const fail = (m) => {
  console.error(`single.mjs: ${m}`);
  process.exit(1);
};

const IMPORT = /^import\s+(?:[\w$*{}\s,]+?\s+from\s+)?['"]([^'"]+)['"];?[ \t]*\r?\n/gm;

function imports(source) {
  return [...source.matchAll(IMPORT)].map((m) => m[1]);
}

// Drops import lines and the `export` keyword of declarations; refuses other export forms.
function unmodule(source, name) {
  let out = source.replace(IMPORT, '');
  out = out.replace(/^export\s+(?=(?:async\s+)?function\b|class\b|const\b|let\b)/gm, '');
  if (/^export\b/m.test(out)) fail(`${name}: an export form this build cannot paste (${/^export.*$/m.exec(out)[0]})`);
  if (/\bimport\s*\(/.test(out)) fail(`${name}: dynamic import() cannot work in one file`);
  return out;
}

function glueText() {
  let g = read(GLUE);
  const tail = 'export { initSync, __wbg_init as default };';
  if (!g.includes(tail)) fail(`${GLUE}: the glue's export line changed; update single.mjs`);
  g = g.replace(tail, '');
  // What platform-inline.js's loadWorkshop() hands out: every function and class of the glue.
  const names = [...g.matchAll(/^export (?:async )?(?:function|class) ([\w$]+)/gm)].map((m) => m[1]);
  return `${unmodule(g, GLUE)}\nconst WORKSHOP = Object.freeze({ ${names.join(', ')} });\n`;
}

// The app's modules in dependency order, starting from app.js.
function appModules() {
  const order = [];
  const seen = new Set();
  const visit = (rel, from) => {
    const path = normalize(join(dirname(from), rel));
    if (rel.endsWith('fivefold_web.js')) return;
    if (seen.has(path)) return;
    seen.add(path);
    const file = path.endsWith(`${normalize('/platform.js')}`) ? INLINE_PLATFORM : path;
    const source = read(file);
    for (const dep of imports(source)) visit(dep, path);
    order.push({ name: rel, source });
  };
  visit('./app.js', join(DIST, 'index.html'));
  // The screens the served page imports on first use (platform.js, loadScreen).
  for (const later of ['./coach.js', './games.js', './revisit.js', './progress.js']) visit(later, join(DIST, 'index.html'));
  return order;
}

function check(text, ext) {
  const dir = mkdtempSync(join(tmpdir(), 'fivefold-single-'));
  const file = join(dir, `check.${ext}`);
  writeFileSync(file, text);
  const r = spawnSync(process.execPath, ['--check', file], { encoding: 'utf8' });
  rmSync(dir, { recursive: true, force: true });
  if (r.status !== 0) fail(`the pasted ${ext === 'mjs' ? 'page script' : 'worker'} does not parse:\n${r.stderr}`);
}

function safeInScript(text, what) {
  if (/<\/script/i.test(text) || /<!--/.test(text)) fail(`${what} contains "</script" or "<!--" and cannot be inlined`);
  return text;
}

const sha256 = (text) => `'sha256-${createHash('sha256').update(text, 'utf8').digest('base64')}'`;

const glue = glueText();
const modules = appModules();
// Checked as pasted (a name declared twice is refused here), then minified whole with esbuild
// (the page as a module, the worker wrapped in a function so that its names are its own).
const minify = (text, options) => (process.env.FIVEFOLD_NO_MINIFY === '1'
  ? text
  : transformSync(text, { minify: true, legalComments: 'none', ...options }).code);

const pasted = `${glue}\n${modules.map((m) => `// ---- ${m.name} ----\n${unmodule(m.source, m.name)}`).join('\n')}`;
check(pasted, 'mjs');
const page = safeInScript(minify(pasted, { loader: 'js', format: 'esm', treeShaking: true }), 'the page script');

const workerSource = read(join(DIST, 'worker.js'));
const pastedWorker = `${glue.replaceAll('import.meta.url', 'self.location.href')}\nconst init = __wbg_init;\n${unmodule(workerSource, 'worker.js')}`;
check(pastedWorker, 'cjs');
const worker = safeInScript(minify(pastedWorker, { loader: 'js', format: 'iife' }), 'the worker');

const style = safeInScript(minify(read(join(DIST, 'style.css')), { loader: 'css' }), 'style.css');
// Gzipped, then base64: the file is a third smaller than with base64 alone, compressed or not;
// the page unpacks it with DecompressionStream. Fifteen zopfli iterations (its default): five
// gave a file 155 bytes larger, for about 2 s less.
const wasmBytes = readFileSync(WASM);
const packed = Buffer.from(await zopfli.gzipAsync(wasmBytes, { numiterations: 15 }));
if (!gunzipSync(packed).equals(wasmBytes)) fail('the gzipped wasm module does not unpack to itself');
const wasm = packed.toString('base64');
const icon = `data:image/svg+xml;base64,${readFileSync(join(DIST, 'icon.svg')).toString('base64')}`;

const csp = [
  "default-src 'none'",
  `script-src ${sha256(page)} 'wasm-unsafe-eval'`,
  `style-src ${sha256(style)}`,
  'img-src data:',
  'worker-src blob:',
  "connect-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
].join('; ');

let html = leanHtml(read(join(DIST, 'index.html')));
const swap = (from, to) => {
  if (!html.includes(from)) fail(`index.html no longer has ${from}`);
  html = html.replace(from, () => to);
};
swap(/<meta http-equiv="Content-Security-Policy" content="[^"]*">/.exec(html)?.[0] ?? '<meta http-equiv="Content-Security-Policy"',
  `<meta http-equiv="Content-Security-Policy" content="${csp}">`);
swap('<link rel="manifest" href="manifest.webmanifest">\n', '');
swap('<link rel="icon" href="icon.svg" type="image/svg+xml">', `<link rel="icon" href="${icon}" type="image/svg+xml">`);
swap('<link rel="stylesheet" href="style.css">', `<style>${style}</style>`);
swap('<script type="module" src="app.js"></script>', `<script type="module">${page}</script>`);
swap('</body>', `<script type="application/octet-stream" id="fivefold-wasm">${wasm}</script>\n` +
  `<script type="text/plain" id="fivefold-worker">${worker}</script>\n</body>`);

const out = join(DIST, 'fivefold.html');
writeFileSync(out, html);
console.log(`    wrote ${out}: ${html.length} bytes (${modules.length} modules, wasm ${wasm.length} base64 chars)`);
