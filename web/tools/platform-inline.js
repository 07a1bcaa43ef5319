// How the single-file build (web/dist/fivefold.html) starts its engine and workers: it takes
// the place of web/platform.js there. The workshop wasm module sits gzipped and base64-encoded
// in a data block of the page, and the worker's source (the glue plus web/worker.js, as a
// classic script) in another; the worker runs from a blob: URL, which works from file:// where module workers and
// separate files do not. `__wbg_init` is the glue's initialiser, pasted into the same script.

let inlineModule = null;
let inlineWorkerUrl = null;

// The module is gzipped, then base64 (tools/single.mjs).
async function inlineWasmBytes() {
  const text = document.getElementById('fivefold-wasm').textContent.trim();
  const raw = atob(text);
  const packed = new Uint8Array(raw.length);
  for (let i = 0; i < raw.length; i++) packed[i] = raw.charCodeAt(i);
  if (typeof DecompressionStream !== 'function') {
    throw new Error('this browser cannot unpack the single-file copy; open Fivefold from its web address');
  }
  const stream = new Blob([packed]).stream().pipeThrough(new DecompressionStream('gzip'));
  return new Uint8Array(await new Response(stream).arrayBuffer());
}

export async function startEngine() {
  inlineModule = await WebAssembly.compile(await inlineWasmBytes());
  await __wbg_init({ module_or_path: inlineModule });
}

/** The workshop's functions: here they are the page's own, from the one module of the file. */
export async function loadWorkshop() {
  return WORKSHOP;
}

export function workshopNow() {
  return WORKSHOP;
}

export function makeWorker() {
  if (!inlineWorkerUrl) {
    const source = document.getElementById('fivefold-worker').textContent;
    inlineWorkerUrl = URL.createObjectURL(new Blob([source], { type: 'text/javascript' }));
  }
  const w = new Worker(inlineWorkerUrl, { name: 'fivefold' });
  w.postMessage({ type: 'init', module: inlineModule });
  return w;
}

export const SERVED = false;

// The library's sets are in the file's one module (the workshop's), not files of their own.
let inlineLibrary = null;
export async function loadLibraryFile(file) {
  if (!inlineLibrary) {
    const files = JSON.parse(WORKSHOP.libraryIndex()).map((e) => e.file);
    inlineLibrary = new Map(JSON.parse(WORKSHOP.librarySets()).map((set, i) => [files[i], JSON.stringify(set)]));
  }
  const text = inlineLibrary.get(file);
  if (text === undefined) throw new Error('no such set in the library');
  return text;
}

// Coach, My games, Revisit and Progress are pasted into the file like every other module.
export async function loadScreen(kind) {
  return { Coach, Games, Revisit, Progress }[kind];
}

// The single file cannot load the scanner's separate files from file://; it says so instead.
export async function loadScanner() {
  throw new Error('Scanning codes with the camera needs Fivefold opened from its web address, ' +
    'not from this single-file copy. Paste the codes instead.');
}
