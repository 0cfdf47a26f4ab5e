// Offline cache for Phasewell. On install it caches every file of the build, listed with a version hash in
// precache-manifest.json (written at build time). Pages: network first, cache when offline. Hashed assets:
// cache first. Only same-origin GET requests are handled; nothing goes to another origin.
const MANIFEST = 'precache-manifest.json';
const PREFIX = 'phasewell-';

self.addEventListener('install', (event) => {
  event.waitUntil(
    (async () => {
      const res = await fetch(MANIFEST, { cache: 'no-store' });
      const m = await res.json();
      const cache = await caches.open(PREFIX + m.version);
      await cache.addAll(['./', ...m.files]);
      await self.skipWaiting();
    })(),
  );
});

self.addEventListener('activate', (event) => {
  event.waitUntil(
    (async () => {
      const res = await fetch(MANIFEST, { cache: 'no-store' }).catch(() => null);
      const keep = res && res.ok ? PREFIX + (await res.json()).version : null;
      if (keep) for (const k of await caches.keys()) if (k.startsWith(PREFIX) && k !== keep) await caches.delete(k);
      await self.clients.claim();
    })(),
  );
});

self.addEventListener('fetch', (event) => {
  const req = event.request;
  const url = new URL(req.url);
  if (req.method !== 'GET' || url.origin !== self.location.origin) return;
  if (req.mode === 'navigate') {
    event.respondWith(
      fetch(req).catch(async () => (await caches.match(new URL('./', self.registration.scope).href)) || Response.error()),
    );
    return;
  }
  event.respondWith(
    (async () => {
      const hit = await caches.match(req, { ignoreSearch: true });
      return hit || fetch(req);
    })(),
  );
});
