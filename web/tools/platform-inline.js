// How the single-file build (web/dist/fivefold.html) starts its engine and workers: it takes
// the place of web/platform.js there. The wasm module sits base64-encoded in a data block of
// the page, and the worker's source (the glue plus web/worker.js, as a classic script) in
// another; the worker runs from a blob: URL, which works from file:// where module workers and
// separate files do not. `__wbg_init` is the glue's initialiser, pasted into the same script.

let inlineModule = null;
let inlineWorkerUrl = null;

function inlineWasmBytes() {
  const text = document.getElementById('fivefold-wasm').textContent.trim();
  const raw = atob(text);
  const bytes = new Uint8Array(raw.length);
  for (let i = 0; i < raw.length; i++) bytes[i] = raw.charCodeAt(i);
  return bytes;
}

export async function startEngine() {
  inlineModule = await WebAssembly.compile(inlineWasmBytes());
  await __wbg_init({ module_or_path: inlineModule });
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

// The single file holds no scanner: its camera code is a separate file, loaded on demand.
export async function loadScanner() {
  throw new Error('the camera scanner is not part of the single-file app');
}
