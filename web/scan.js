// The camera scanner: reads result codes (or any QR code) one after another with the device's
// camera. Loaded only when scanning starts (`await import('./scan.js')`), so the page a student
// loads does not grow. It uses the browser's own QR detector (BarcodeDetector) where there is
// one; elsewhere it loads Fivefold's small QR reader (web/scan, WebAssembly, in dist/scan/) the
// first time it is needed and reads a few grey frames a second drawn from the video.
//
//   const scanner = await openScanner(host, (text) => ...);   // ... scanner.stop();

import { el } from './ui.js';

// Frames read a second, at most (each read waits for the one before).
const READ_EVERY_MS = 250;
// Frames are scaled down to this many pixels on their long side before the wasm reader sees
// them: enough for a code that fills a third of the picture, and quick on a phone.
const LONG_SIDE = 640;

const POINT = 'Point the camera at a result code.';

let wasmReader = null;

/** The wasm QR reader's `decode(width, height, luma)`, loaded once. */
function loadWasmReader() {
  wasmReader ??= import('./scan/fivefold_scan.js')
    .then(async (m) => {
      await m.default();
      return m.decode;
    })
    .catch((e) => {
      wasmReader = null;
      throw e;
    });
  return wasmReader;
}

/** The browser's own QR detector, or null where there is none. */
async function nativeDetector() {
  try {
    if (typeof globalThis.BarcodeDetector !== 'function') return null;
    const formats = await globalThis.BarcodeDetector.getSupportedFormats();
    return formats.includes('qr_code') ? new globalThis.BarcodeDetector({ formats: ['qr_code'] }) : null;
  } catch {
    return null;
  }
}

/** The grey values (one byte a pixel) of an ImageData's RGBA pixels. */
function luma({ data, width, height }) {
  const out = new Uint8Array(width * height);
  for (let i = 0, j = 0; j < out.length; i += 4, j++) {
    // ITU-R BT.601 weights, in integers (common practice).
    out[j] = (data[i] * 77 + data[i + 1] * 150 + data[i + 2] * 29) >> 8;
  }
  return out;
}

/** The text of a QR code in an ImageData (a picture or a canvas), read with the wasm reader,
 * or null when none reads. */
export async function decodeImage(image) {
  const decode = await loadWasmReader();
  return decode(image.width, image.height, luma(image)) ?? null;
}

/** What to tell the user when the camera cannot be opened. */
function cameraTrouble(e) {
  switch (e?.name) {
    case 'NotAllowedError':
    case 'SecurityError':
      return 'The camera was not allowed. Allow it for this page in the browser\'s settings and ' +
        'scan again, or paste the codes instead.';
    case 'NotFoundError':
    case 'OverconstrainedError':
      return 'No camera was found on this device. Paste the codes instead.';
    case 'NotReadableError':
    case 'AbortError':
      return 'The camera could not be started: another app may be using it. Close that app and ' +
        'scan again, or paste the codes instead.';
    default:
      return `The camera could not be started (${e?.message || e}). Paste the codes instead.`;
  }
}

/**
 * Opens the camera in a panel inside `host` and calls `onText(text)` once for every distinct
 * code it reads, until stopped. `onStop` is called when the panel's Stop button is pressed.
 * Resolves to `{ stop(), codes }` once the camera runs, or once it is clear that it cannot
 * (the panel then says why, and `error` holds the message). `stop()` releases the camera and
 * removes the panel.
 */
export async function openScanner(host, onText, { onStop } = {}) {
  const video = el('video', { class: 'scan-video', muted: true, playsinline: true, autoplay: true, 'aria-hidden': 'true' });
  video.muted = true;
  const status = el('p', { class: 'scan-status', role: 'status', text: 'Opening the camera…' });
  const stopButton = el('button', { type: 'button', class: 'secondary scan-stop' }, 'Stop scanning');
  const panel = el('div', { class: 'scanner', role: 'group', 'aria-label': 'Camera scanner', 'data-state': 'opening' },
    el('div', { class: 'scan-frame' }, video), status, stopButton);
  host.append(panel);

  const codes = [];
  const seen = new Set();
  let stream = null;
  let timer = 0;
  let stopped = false;
  const handle = {
    codes,
    error: null,
    stop() {
      if (stopped) return;
      stopped = true;
      clearTimeout(timer);
      for (const t of stream?.getTracks() ?? []) t.stop();
      video.srcObject = null;
      panel.dataset.state = 'stopped';
      panel.remove();
    },
  };
  stopButton.addEventListener('click', () => {
    handle.stop();
    onStop?.();
  });

  const say = (text) => {
    status.textContent = codes.length
      ? `${text} Codes read so far: ${codes.length}.`
      : text;
  };
  const fail = (message) => {
    handle.error = message;
    panel.dataset.state = 'error';
    status.textContent = message;
    stopButton.textContent = 'Close';
    for (const t of stream?.getTracks() ?? []) t.stop();
    return handle;
  };

  if (!navigator.mediaDevices?.getUserMedia) {
    return fail('This browser cannot use a camera here (a camera needs the app opened over https). ' +
      'Paste the codes instead.');
  }
  try {
    stream = await navigator.mediaDevices.getUserMedia({ video: { facingMode: 'environment' }, audio: false });
  } catch (e) {
    return fail(cameraTrouble(e));
  }
  if (stopped) {
    for (const t of stream.getTracks()) t.stop();
    return handle;
  }
  video.srcObject = stream;
  try {
    await video.play();
  } catch {
    // Autoplay of a muted video is allowed; if the browser still refuses, frames are read
    // once it plays.
  }

  let detector = await nativeDetector();
  let decode = null;
  if (!detector) {
    try {
      decode = await loadWasmReader();
    } catch (e) {
      return fail(`The code reader could not be loaded (${e?.message || e}). Paste the codes instead.`);
    }
  }
  if (stopped) return handle;
  panel.dataset.decoder = detector ? 'detector' : 'wasm';
  panel.dataset.state = 'scanning';
  say(POINT);

  const canvas = el('canvas');
  const ctx = canvas.getContext('2d', { willReadFrequently: true });

  const read = async () => {
    const w = video.videoWidth;
    const h = video.videoHeight;
    if (!w || !h || video.readyState < 2) return null;
    if (detector) {
      try {
        const found = await detector.detect(video);
        return found.find((b) => b.rawValue)?.rawValue ?? null;
      } catch {
        // The browser's detector failed on this device: the wasm reader takes over.
        detector = null;
        decode = await loadWasmReader();
        panel.dataset.decoder = 'wasm';
      }
    }
    const k = Math.min(1, LONG_SIDE / Math.max(w, h));
    canvas.width = Math.round(w * k);
    canvas.height = Math.round(h * k);
    ctx.drawImage(video, 0, 0, canvas.width, canvas.height);
    const image = ctx.getImageData(0, 0, canvas.width, canvas.height);
    return decode(image.width, image.height, luma(image)) ?? null;
  };

  const tick = async () => {
    if (stopped) return;
    let text = null;
    try {
      text = await read();
    } catch (e) {
      if (!stopped) say(`A frame could not be read (${e?.message || e}). ${POINT}`);
    }
    if (stopped) return;
    if (text && !seen.has(text)) {
      seen.add(text);
      codes.push(text);
      panel.dataset.read = String(codes.length);
      say('Read a code. Point the camera at the next one.');
      try {
        onText(text);
      } catch (e) {
        say(`A code was read but could not be used (${e?.message || e}).`);
      }
    }
    timer = setTimeout(tick, READ_EVERY_MS);
  };
  timer = setTimeout(tick, 0);
  return handle;
}
