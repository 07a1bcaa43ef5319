// Saved progress in localStorage: one document per concern ("settings", "tonight", "drill",
// "study"), each in a versioned envelope with a checksum.
//
// Writing is crash-safe: the new copy goes to the main key, is read back and checked, and only
// then is copied to the ".prev" key, so at every moment at least one of the two holds a whole,
// checked copy (and after a crash mid-write, ".prev" holds the save before). Loading checks the main copy and falls back to ".prev" with a message; a damaged copy that
// cannot be recovered is kept aside under ".damaged" and the app starts afresh, again with a
// message. A copy written by a newer version of the app is never overwritten by this one. A
// full quota never stops play: the save reports failure and the page shows a banner.

export const STORE_VERSION = 1;
const PREFIX = 'fivefold.';
const FORMAT = 'fivefold-store';

// FNV-1a, 32 bits, over the UTF-16 code units: enough to tell a damaged copy from a whole one.
export function checksum(text) {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}

function envelope(name, data) {
  const body = JSON.stringify(data);
  return `{"format":"${FORMAT}","version":${STORE_VERSION},"name":${JSON.stringify(name)},` +
    `"saved":${JSON.stringify(new Date().toISOString())},"sum":"${checksum(body)}","data":${body}}`;
}

// The data in a stored text, checked; throws a short reason when it cannot be used.
function open(name, text, validate) {
  let doc;
  try {
    doc = JSON.parse(text);
  } catch {
    throw new Error('it is not readable (cut short or overwritten)');
  }
  if (!doc || typeof doc !== 'object' || doc.format !== FORMAT) throw new Error('it is not Fivefold data');
  if (doc.version !== STORE_VERSION) throw new Error(`it has version ${doc.version}, not ${STORE_VERSION}`);
  if (doc.name !== name) throw new Error(`it holds "${doc.name}", not "${name}"`);
  if (doc.sum !== checksum(JSON.stringify(doc.data))) throw new Error('its checksum does not match');
  const why = validate(doc.data);
  if (why) throw new Error(why);
  return { data: doc.data, saved: doc.saved };
}

// Whether a stored text is a whole envelope (readable, checksum right), and its version; data
// checks are the loader's business.
function peek(text) {
  try {
    const doc = JSON.parse(text);
    const whole = doc?.format === FORMAT && doc.sum === checksum(JSON.stringify(doc.data));
    return { whole, version: doc?.version };
  } catch {
    return { whole: false, version: undefined };
  }
}

function isQuota(e) {
  return e instanceof DOMException &&
    (e.name === 'QuotaExceededError' || e.name === 'NS_ERROR_DOM_QUOTA_REACHED' || e.code === 22);
}

let quotaHandler = () => {};
let savedHandler = () => {};
let newerHandler = () => {};
// One page of the app saves at a time: the page that starts last claims saving by writing its
// name under OWNER before it reads the progress (`claimSaving`), and every save first checks
// that the name is still its own. Once another page has claimed it (or this page is told so,
// `handOver`), this page saves nothing, so that it cannot save its older copies over what the
// other saves; `onHandedOver` hears of every save refused so.
const OWNER = `${PREFIX}owner`;
let me = null;
let handedOver = false;
let handedOverHandler = () => {};

/** Claims saving for this page (called once, before the progress is read). */
export function claimSaving(name) {
  me = name;
  const ls = storage();
  if (!ls) return;
  try {
    ls.setItem(OWNER, name);
  } catch {
    // A full quota: with no owner written, no page is refused (as before there were owners).
    ls.removeItem(OWNER);
  }
}

/** Whether this page still saves: no other page has claimed saving since this one did. */
export function savingHere() {
  if (handedOver) return false;
  const owner = me === null ? null : storage()?.getItem(OWNER);
  if (owner && owner !== me) handedOver = true;
  return !handedOver;
}

/** Stops every save from this page (another page of the app saves from now on). */
export function handOver() {
  handedOver = true;
}

/**
 * `onFull(name)` is called when a save of `name` fails for lack of space, `onSaved(name)` after
 * a save of `name` succeeds, `onNewer(name)` when `name` was not saved because a newer
 * version of the app stored it (this one must not overwrite what it cannot read), and
 * `onHandedOver()` when a save was refused because another page saves now.
 */
export function onStorageEvents({ onFull, onSaved, onNewer, onHandedOver }) {
  quotaHandler = onFull ?? quotaHandler;
  savedHandler = onSaved ?? savedHandler;
  newerHandler = onNewer ?? newerHandler;
  handedOverHandler = onHandedOver ?? handedOverHandler;
}

function storage() {
  try {
    return window.localStorage;
  } catch {
    return null;
  }
}

/**
 * Saves `data` under `name`. Returns true when it is safely stored, false when it could not be
 * (full quota, storage switched off, or another tab or window has taken over saving); play
 * goes on either way.
 */
export function save(name, data) {
  const ls = storage();
  if (!ls) return false;
  if (!savingHere()) {
    handedOverHandler();
    return false;
  }
  const key = PREFIX + name;
  const text = envelope(name, data);
  try {
    const old = ls.getItem(key);
    if (old !== null) {
      const { whole, version } = peek(old);
      if (whole && typeof version === 'number' && version > STORE_VERSION) {
        newerHandler(name);
        return false;
      }
    }
    ls.setItem(key, text);
    if (ls.getItem(key) !== text) throw new Error('read back differs');
    try {
      ls.setItem(`${key}.prev`, text);
    } catch {
      // The new copy is stored and checked; ".prev" still holds the save before, which is
      // whole too. Storing it is retried with the next save.
    }
  } catch (e) {
    if (isQuota(e)) quotaHandler(name);
    return false;
  }
  savedHandler(name);
  return true;
}

/**
 * Loads the document `name`. `validate(data)` returns a reason string when the data is not
 * usable, or nothing. Returns { data, note }: `data` is null when there is nothing usable
 * (start afresh), `note` a sentence for the player when something had to be recovered.
 */
export function load(name, validate, what = name) {
  const ls = storage();
  if (!ls) return { data: null, note: null };
  const key = PREFIX + name;
  const main = ls.getItem(key);
  const prev = ls.getItem(`${key}.prev`);
  if (main === null && prev === null) return { data: null, note: null };
  let mainWhy = null;
  if (main !== null) {
    try {
      return { data: open(name, main, validate).data, note: null };
    } catch (e) {
      mainWhy = e.message;
    }
  }
  if (prev !== null) {
    try {
      const got = open(name, prev, validate);
      try {
        ls.setItem(key, prev);
      } catch {
        // The recovered copy is in memory and will be written with the next save.
      }
      const when = got.saved ? new Date(got.saved).toLocaleString() : 'earlier';
      const note = mainWhy
        ? `Your saved ${what} was damaged (${mainWhy}); the last good copy, from ${when}, was restored.`
        : null;
      return { data: got.data, note };
    } catch {
      // Both copies are unusable: fall through.
    }
  }
  try {
    // Both unusable copies are kept aside (the main one under ".damaged", the other under
    // ".damaged.prev"), so that nothing is lost even if a later save overwrites the keys.
    if (main !== null) ls.setItem(`${key}.damaged`, main);
    if (prev !== null && prev !== main) ls.setItem(`${key}.damaged.prev`, prev);
  } catch {
    // Keeping the damaged copy is a courtesy only.
  }
  return {
    data: null,
    note: `Your saved ${what} was damaged (${mainWhy ?? 'unreadable'}) and no good copy was left; ` +
      'it starts afresh (the damaged copy is kept aside).',
  };
}

/**
 * Checks a whole backup file's text; returns { parts, exported } (the documents it holds, and
 * when it was made, an ISO date or null) or throws with a reason.
 */
export function readBackup(text, validators) {
  let doc;
  try {
    doc = JSON.parse(text);
  } catch {
    throw new Error('the file is not JSON (it may be cut short)');
  }
  if (!doc || typeof doc !== 'object' || doc.format !== 'fivefold-backup') {
    throw new Error('the file is not a Fivefold backup');
  }
  if (doc.version !== STORE_VERSION) {
    throw new Error(`the backup has version ${doc.version}; this app reads version ${STORE_VERSION}`);
  }
  if (!doc.data || typeof doc.data !== 'object') throw new Error('the backup holds no data');
  if (doc.sum !== checksum(JSON.stringify(doc.data))) {
    throw new Error('the backup\'s checksum does not match (it was changed or damaged)');
  }
  const parts = {};
  for (const [name, validate] of Object.entries(validators)) {
    const part = doc.data[name];
    if (part === undefined || part === null) continue;
    const why = validate(part);
    if (why) throw new Error(`its ${name} part is not usable: ${why}`);
    parts[name] = part;
  }
  return { parts, exported: typeof doc.exported === 'string' ? doc.exported : null };
}

/** Whether anything is saved under any of these document names. */
export function hasSaved(names) {
  const ls = storage();
  return !!ls && names.some((n) => ls.getItem(PREFIX + n) !== null);
}

/**
 * Keeps the saved copies of these documents aside under ".before-import" (replacing an older
 * such copy), so that restoring a backup never destroys what was there. Returns whether all
 * were kept.
 */
export function keepAside(names) {
  const ls = storage();
  if (!ls || !savingHere()) return false;
  let ok = true;
  for (const n of names) {
    const v = ls.getItem(PREFIX + n);
    if (v === null) continue;
    try {
      ls.setItem(`${PREFIX}${n}.before-import`, v);
    } catch {
      ok = false;
    }
  }
  return ok;
}

/** A backup file's text holding the given parts. */
export function makeBackup(parts) {
  const body = JSON.stringify(parts);
  return `{"format":"fivefold-backup","version":${STORE_VERSION},` +
    `"exported":${JSON.stringify(new Date().toISOString())},"sum":"${checksum(body)}","data":${body}}\n`;
}
