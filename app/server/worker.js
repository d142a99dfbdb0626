// Alvea's service worker, version {{.Version}}.
//
// - Every resource is precached inside event.waitUntil, so a failed precache
//   fails the install: a half-cached version never takes control.
// - Lookups ignore query strings; navigations to any route fall back to the
//   app shell "/".
// - A new version waits. It activates only when the page posts
//   {type: "alvea:activate"}, which the page does when the crew accepts the
//   update; until then every tab and reload keeps the running version.
// - Requests to other origins are not handled (the app makes none).
const cacheName = "alvea-{{.Version}}";
const resourcesToCache = {{.ResourcesToCache}};

self.addEventListener("install", (event) => {
  event.waitUntil(precache());
});

async function precache() {
  const cache = await caches.open(cacheName);
  // cache: "no-cache" revalidates each file with the server: a copy the
  // page has just downloaded (app.wasm above all) is taken from the HTTP
  // cache when the server confirms it is current (its ETag is the
  // version), instead of being downloaded a second time; any other copy is
  // fetched anew, so a version never mixes files.
  await cache.addAll(
    resourcesToCache.map((url) => new Request(url, { cache: "no-cache" }))
  );
}

self.addEventListener("activate", (event) => {
  event.waitUntil(
    (async () => {
      const keys = await caches.keys();
      await Promise.all(
        keys
          .filter((key) => key !== cacheName)
          .map((key) => caches.delete(key))
      );
      await self.clients.claim();
    })()
  );
});

self.addEventListener("message", (event) => {
  if (event.data && event.data.type === "alvea:activate") {
    self.skipWaiting();
  }
});

self.addEventListener("fetch", (event) => {
  const request = event.request;
  if (request.method !== "GET") {
    return;
  }
  if (new URL(request.url).origin !== self.location.origin) {
    return;
  }
  event.respondWith(respond(request));
});

// The cache is opened once per worker start, not once per request.
let opened = null;
function openCache() {
  if (!opened) {
    opened = caches.open(cacheName);
    opened.catch(() => {
      opened = null;
    });
  }
  return opened;
}

async function respond(request) {
  const cache = await openCache();
  // An exact match first: matching with ignoreSearch reads every entry of
  // the cache, and a start asks for a dozen files at once. Only a URL that
  // carries a query string needs the second lookup.
  let hit = await cache.match(request);
  if (!hit && new URL(request.url).search !== "") {
    hit = await cache.match(request, { ignoreSearch: true });
  }
  if (hit) {
    return hit;
  }
  if (request.mode === "navigate") {
    const shell = await cache.match("/");
    if (shell) {
      return shell;
    }
  }
  return fetch(request);
}
