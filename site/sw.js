// Evenbeat service worker: keeps one complete, consistent version of the app
// for offline use. Every asset is precached under ONE cache named after the
// content hash of all assets, so a page is always served entirely from one
// version: a new worker waits until no page uses the old one, or until the
// user restarts into it from the app's banner (the page then posts
// {type: "activate"} and reloads), then deletes the old cache.
"use strict";

const VERSION = "__EVENBEAT_VERSION__";
const ASSETS = __EVENBEAT_ASSETS__;
const PREFIX = "evenbeat-";

self.addEventListener("install", (event) => {
  event.waitUntil(
    caches.open(VERSION).then((cache) =>
      // cache: "reload" skips the HTTP cache, so a stale file from an older
      // version cannot slip into this version's cache.
      cache.addAll(ASSETS.map((url) => new Request(url, { cache: "reload" })))
    )
  );
});

self.addEventListener("activate", (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((keys) =>
        Promise.all(
          keys
            .filter((key) => key.startsWith(PREFIX) && key !== VERSION)
            .map((key) => caches.delete(key))
        )
      )
      .then(() => self.clients.claim())
  );
});

// The page asks a waiting worker to take over only when the user chose to
// restart into the new version, and reloads as soon as it has: old and new
// files never serve one page.
self.addEventListener("message", (event) => {
  if (event.data && event.data.type === "activate") {
    self.skipWaiting();
  }
});

self.addEventListener("fetch", (event) => {
  const req = event.request;
  if (req.method !== "GET" || new URL(req.url).origin !== self.location.origin) {
    return;
  }
  // Navigations are answered with the cached "./" (never ./index.html:
  // some servers answer that with a redirect, which must not be cached).
  const key = req.mode === "navigate" ? "./" : req;
  event.respondWith(
    caches
      .open(VERSION)
      .then((cache) => cache.match(key, { ignoreSearch: true }))
      .then((hit) => hit || fetch(req))
  );
});
