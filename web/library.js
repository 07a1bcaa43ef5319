// The starter library on the page. Its index (titles, counts, ratings, keys, how each set was
// made) comes with the page's module; a set's puzzles are a file of their own,
// library/<file>.json, fetched when the set is first needed (the single-file build holds them
// in its module), so a first visit loads only the set it opens.

import { libraryIndex } from './pkg/fivefold_web.js';
import { loadLibraryFile } from './platform.js';

let index = null;
const sets = new Map();

/** The index: `[{file, title, count, rating, key, generator}]`, easiest first (by the
 * median rating of a set's puzzles). */
export function library() {
  index ??= JSON.parse(libraryIndex());
  return index;
}

/** Whether a set with this key is one of the library's (however it arrived). */
export function isLibraryKey(key) {
  return library().some((e) => e.key === key);
}

/** The set-file text of the library's set `file`, fetched once; a failed fetch is tried again
 * on the next call. */
export function librarySet(file) {
  if (!sets.has(file)) {
    const got = loadLibraryFile(file).catch((e) => {
      sets.delete(file);
      throw new Error(`the library set "${file}" could not be loaded (${e?.message ?? e}); ` +
        'check the connection and try again');
    });
    sets.set(file, got);
  }
  return sets.get(file);
}

/** Every set of the library, as parsed set-file objects, each with its index entry's `file`
 * in `entry` (not enumerable). */
export async function allLibrarySets() {
  const texts = await Promise.all(library().map((e) => librarySet(e.file)));
  return texts.map((text, i) => {
    const set = JSON.parse(text);
    Object.defineProperty(set, 'entry', { value: library()[i] });
    return set;
  });
}
