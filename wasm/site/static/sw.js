// earshot service worker: keeps the page and the app in a cache so the page
// opens again with no server running (same address and port).
//
// Cache first: a request for one of the app's files is answered from the
// cache of this build; anything else goes to the network. The server
// replaces __EARSHOT_VERSION__ with the build's version, so every build
// gives a new worker with its own cache, and the old caches go when it
// takes over.
"use strict";

const VERSION = "__EARSHOT_VERSION__";
const PREFIX = "earshot-";
const CACHE = PREFIX + VERSION;
const FILES = ["./", "index.html", "boot.js", "wasm_exec.js", "app.wasm", "app.css", "icon.svg"];

self.addEventListener("install", (event) => {
  event.waitUntil(
    (async () => {
      const cache = await caches.open(CACHE);
      // "no-cache": revalidate with the server instead of trusting the
      // browser's HTTP cache, so the files match this worker's build.
      await cache.addAll(FILES.map((f) => new Request(f, { cache: "no-cache" })));
      await self.skipWaiting();
    })(),
  );
});

self.addEventListener("activate", (event) => {
  event.waitUntil(
    (async () => {
      for (const name of await caches.keys()) {
        if (name.startsWith(PREFIX) && name !== CACHE) await caches.delete(name);
      }
      await self.clients.claim();
    })(),
  );
});

self.addEventListener("fetch", (event) => {
  const req = event.request;
  if (req.method !== "GET" || new URL(req.url).origin !== self.location.origin) return;
  event.respondWith(
    (async () => {
      const cache = await caches.open(CACHE);
      // ignoreVary: the stored requests carry no Accept-Encoding; the
      // cached bodies are already decoded.
      const hit = await cache.match(req, { ignoreVary: true });
      return hit || fetch(req);
    })(),
  );
});
