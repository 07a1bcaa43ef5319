// Small DOM helpers. Text from outside (set titles, names, file contents, messages) only ever
// goes in as text nodes or textContent, never as markup.

export const $ = (id) => document.getElementById(id);

/** An element with attributes (strings; `class`, `data-*`, `aria-*` as named) and children
 * (nodes, or strings that become text nodes). */
export function el(tag, attrs = {}, ...children) {
  const node = document.createElement(tag);
  for (const [k, v] of Object.entries(attrs)) {
    if (v === false || v === null || v === undefined) continue;
    if (k === 'text') node.textContent = String(v);
    else if (k.startsWith('on') && typeof v === 'function') node.addEventListener(k.slice(2), v);
    else node.setAttribute(k, v === true ? '' : String(v));
  }
  for (const c of children.flat()) {
    if (c === null || c === undefined || c === false) continue;
    node.append(typeof c === 'string' ? document.createTextNode(c) : c);
  }
  return node;
}

/** Replaces a node's children. */
export function fill(node, ...children) {
  node.replaceChildren(...children.flat().filter((c) => c !== null && c !== undefined && c !== false)
    .map((c) => (typeof c === 'string' ? document.createTextNode(c) : c)));
}

const LIVE_KEEP = 6;

/** Speaks sentences through the page's polite live region (for screen readers). */
export function announce(...lines) {
  const live = $('live');
  if (!live) return;
  for (const line of lines.flat()) {
    if (!line) continue;
    live.append(el('p', { text: line }));
  }
  while (live.childElementCount > LIVE_KEEP) live.firstElementChild.remove();
}

// The characters that turn the direction of the text around them (UAX #9's formatting
// characters): a file's name or a title holding one would turn a message's own words round.
const BIDI = /[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;

// How long a banner stays, by kind, in milliseconds (an error stays until it is dismissed).
const BANNER_MS = { info: 10000, warn: 20000 };

/**
 * Shows a banner floating over the top of the page. `kind` is "info", "warn" or "error"; a
 * banner with an `id` replaces an earlier one with the same id. Information and warnings go
 * away by themselves (not while the pointer or the focus is on them); errors, and `sticky`
 * banners, stay until dismissed. Returns the banner element.
 */
export function banner(message, { kind = 'info', id = null, sticky = false, dismiss = true } = {}) {
  const box = $('banners');
  // The page keeps room for the messages below its content (style.css, --banners), so that
  // what they float over can be scrolled clear of them.
  if (!box.dataset.sized) {
    box.dataset.sized = 'true';
    new ResizeObserver(() => document.documentElement.style.setProperty('--banners', `${box.offsetHeight}px`)).observe(box);
  }
  if (id) box.querySelector(`[data-id="${id}"]`)?.remove();
  const b = el('div', { class: 'banner', 'data-kind': kind, 'data-id': id, 'data-sticky': sticky ? 'true' : null, role: kind === 'error' ? 'alert' : 'status' },
    el('p', { text: message.replace(BIDI, '') }),
    dismiss ? el('button', { type: 'button', class: 'quiet', 'aria-label': 'Dismiss this message', onclick: () => b.remove() }, 'OK') : null);
  box.append(b);
  // At most four at once: the oldest that is not sticky goes first.
  while (box.childElementCount > 4) {
    const oldest = [...box.children].find((x) => x !== b && !x.dataset.sticky);
    if (!oldest) break;
    oldest.remove();
  }
  const ms = sticky ? undefined : BANNER_MS[kind];
  if (ms) {
    let timer = 0;
    const start = () => {
      clearTimeout(timer);
      timer = setTimeout(() => b.remove(), ms);
    };
    const hold = () => clearTimeout(timer);
    b.addEventListener('pointerenter', hold);
    b.addEventListener('focusin', hold);
    b.addEventListener('pointerleave', start);
    b.addEventListener('focusout', start);
    start();
  }
  return b;
}

/** Whether an element is on show (not inside anything hidden). */
export const shown = (node) => !!node && node.isConnected && node.getClientRects().length > 0;

/**
 * When a change of view has hidden the element that had the focus (so that it fell to the
 * page), puts it on `target` instead, without scrolling.
 */
export function keepFocus(target) {
  const now = document.activeElement;
  if (now && now !== document.body && shown(now)) return;
  target?.focus({ preventScroll: true });
}

export function clearBanner(id) {
  $('banners')?.querySelector(`[data-id="${id}"]`)?.remove();
}

/**
 * When the board and the buttons under it (and `message`, a verdict under them, when given)
 * are not all in view (a phone, large text), scrolls the page so that as much of them is,
 * keeping the board's top in view.
 */
export function bringBoard(canvas, message = null) {
  const frame = canvas.closest('.board-frame');
  const actions = frame?.parentElement?.querySelector('.actions:not([hidden])');
  if (!shown(frame) || !shown(actions)) return;
  const rail = document.querySelector('.rail')?.getBoundingClientRect();
  const bottom = rail && rail.top > innerHeight / 2 ? rail.top : innerHeight;
  const top = frame.getBoundingClientRect().top;
  const below = shown(message) && message.textContent ? message.getBoundingClientRect().bottom : 0;
  const end = Math.max(actions.getBoundingClientRect().bottom, below);
  let by = end > bottom ? end - bottom + 8 : 0;
  if (top < 0) by = top - 4;
  else if (top - by < 0 && getComputedStyle(frame).position !== 'sticky') by = top - 4;
  if (by) window.scrollBy({ top: by, behavior: 'instant' });
}

/** Offers text as a file download. */
export function download(name, text, type = 'application/json') {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = el('a', { href: url, download: name });
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10000);
}

/** Random 53-bit seed from the platform's cryptographic generator. */
export function randomSeed() {
  const v = new Uint32Array(2);
  crypto.getRandomValues(v);
  return (v[0] & 0x1fffff) * 0x100000000 + v[1];
}

export const sleep = (ms) => new Promise((ok) => setTimeout(ok, ms));

/** A point's name, like `h8` (columns a to s, rows 1 to 19). */
export const POINT_NAME = /^[a-s](1[0-9]|[1-9])$/;

export const RULES = ['freestyle', 'standard', 'renju'];

export const isInt = (v, lo, hi) => Number.isInteger(v) && v >= lo && v <= hi;

/** `obj[key]` if `obj` has it as its own property (a puzzle id such as "constructor" or
 * "__proto__" must not reach a built-in). */
export const own = (obj, key) => (Object.hasOwn(obj, key) ? obj[key] : undefined);

/** Sets `obj[key] = value` as an own data property, whatever the key. */
export function put(obj, key, value) {
  Object.defineProperty(obj, key, { value, enumerable: true, writable: true, configurable: true });
}

/** Paints a QR code's modules (`m` from the engine's `qrMatrix`) on `canvas`, dark on white
 * with its quiet zone, `px` device pixels a module; returns the side in modules. */
export function paintQr(canvas, m, px) {
  const side = m.size + 2 * m.quiet;
  canvas.width = side * px;
  canvas.height = side * px;
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  ctx.fillStyle = '#000000';
  for (let y = 0; y < m.size; y++) {
    for (let x = 0; x < m.size; x++) {
      if (m.dark[y * m.size + x]) ctx.fillRect((x + m.quiet) * px, (y + m.quiet) * px, px, px);
    }
  }
  return side;
}
