// Fivefold's service worker: after one visit the app works with the network off. Cache-first
// for the app's own files; the cache's name carries the build's hash (written by
// web/tools/stamp.mjs), so a new build replaces the old cache as a whole.
//
// A new build's worker waits until no page of the old build is open (no skipWaiting): a page
// keeps the files it started with, and the old cache is deleted only once nothing uses it.

const BUILD = '__BUILD__';
const CACHE = `fivefold-${BUILD}`;
const FILES = ['./'];

self.addEventListener('install', (event) => {
  // `cache: 'reload'` fetches every file from the network, never from the browser's HTTP
  // cache, so that a build's cache cannot mix in an older build's file.
  event.waitUntil(caches.open(CACHE).then((c) => c.addAll(FILES.map((f) => new Request(f, { cache: 'reload' })))));
});

self.addEventListener('activate', (event) => {
  event.waitUntil((async () => {
    for (const key of await caches.keys()) {
      if (key.startsWith('fivefold-') && key !== CACHE) await caches.delete(key);
    }
    await self.clients.claim();
  })());
});

self.addEventListener('fetch', (event) => {
  const req = event.request;
  if (req.method !== 'GET' || new URL(req.url).origin !== self.location.origin) return;
  event.respondWith((async () => {
    const cache = await caches.open(CACHE);
    const hit = await cache.match(req, { ignoreSearch: true });
    if (hit) return hit;
    try {
      return await fetch(req);
    } catch (e) {
      // Offline: a page of the app that is not cached under its own name (the start page
      // opened with another path, say) is the start page.
      const start = req.mode === 'navigate' ? await cache.match('./') : undefined;
      if (start) return start;
      throw e;
    }
  })());
});
