// Minifies the served build in web/dist (or the folder given) in place, with esbuild: every ES
// module script (the app's modules, the worker, the wasm-bindgen glue) and the style sheet.
// Each file stays the module it was (same imports and exports, nothing bundled); names local
// to a module are shortened, comments and spaces dropped. The service worker is left alone
// (tools/stamp.mjs writes into it afterwards). The page loses its comments and the indents
// of its lines (tools/lean-html.mjs).
//   node web/tools/minify.mjs [dist]
// Set FIVEFOLD_NO_MINIFY=1 to keep the files readable while debugging.

import { readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { transformSync } from 'esbuild';
import { leanHtml } from './lean-html.mjs';

const DIST = process.argv[2] ?? fileURLToPath(new URL('../dist/', import.meta.url));

// The folders whose scripts are ES modules: the page's, and the glue of each wasm module.
const MODULE_DIRS = ['.', 'pkg', 'workshop', 'scan'];
const LEAVE = new Set(['sw.js']);

if (process.env.FIVEFOLD_NO_MINIFY === '1') {
  console.log('    minify.mjs: FIVEFOLD_NO_MINIFY=1, files left as they are');
  process.exit(0);
}

let before = 0;
let after = 0;
for (const dir of MODULE_DIRS) {
  for (const name of readdirSync(join(DIST, dir))) {
    const loader = name.endsWith('.js') ? 'js' : name.endsWith('.css') ? 'css' : null;
    if (!loader || (dir === '.' && LEAVE.has(name))) continue;
    const path = join(DIST, dir, name);
    const source = readFileSync(path, 'utf8');
    const { code } = transformSync(source, {
      loader,
      minify: true,
      format: loader === 'js' ? 'esm' : undefined,
      legalComments: 'none',
      sourcefile: join(dir, name),
    });
    writeFileSync(path, code);
    before += source.length;
    after += code.length;
  }
}
const page = join(DIST, 'index.html');
const html = readFileSync(page, 'utf8');
const lean = leanHtml(html);
writeFileSync(page, lean);
before += html.length;
after += lean.length;
console.log(`    minified the scripts, the style sheet and the page: ${before} -> ${after} bytes`);
