// Fivefold's service worker: after one visit the app works with the network off. Cache-first
// for the app's own files; the cache's name carries the build's hash (written by
// web/tools/stamp.mjs), so a new build replaces the old cache as a whole.

const BUILD = '__BUILD__';
const CACHE = `fivefold-${BUILD}`;
const FILES = ['./'];

self.addEventListener('install', (event) => {
  event.waitUntil(caches.open(CACHE).then((c) => c.addAll(FILES)).then(() => self.skipWaiting()));
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
    const hit = (await cache.match(req, { ignoreSearch: true })) ??
      (req.mode === 'navigate' ? await cache.match('./') : undefined);
    return hit ?? fetch(req);
  })());
});
