// Drawsift service worker: after one visit over http(s) or localhost the
// page and its engine work offline. Network first (a new build is picked
// up at once when online), the cache when the network fails. The engine
// version comes from the registration URL (sw.js?v=VERSION) and names the
// cache, so that each version keeps its own complete set of files.
"use strict";

const VERSION = new URL(self.location.href).searchParams.get("v") || "dev";
const CACHE = "drawsift-" + VERSION;
// Every file the page loads (site_test.go checks this list against
// index.html and engine.js).
const FILES = ["./", "app.css", "charts.js", "store.js", "engine.js", "core.js", "form.js", "results.js", "plots.js", "library.js",
  "mixtures.js", "fit.js", "report.js", "files.js", "app.js", "worker.js", "wasm_exec.js", "drawsift.wasm?v=" + encodeURIComponent(VERSION), "icon.svg",
  "manifest.webmanifest", "demo.json"];

self.addEventListener("install", ev => {
  ev.waitUntil(caches.open(CACHE).then(c => c.addAll(FILES)).then(() => self.skipWaiting()));
});

self.addEventListener("activate", ev => {
  ev.waitUntil(caches.keys()
    .then(keys => Promise.all(keys.filter(k => k.startsWith("drawsift-") && k !== CACHE).map(k => caches.delete(k))))
    .then(() => self.clients.claim()));
});

self.addEventListener("fetch", ev => {
  const req = ev.request;
  const url = new URL(req.url);
  if (req.method !== "GET" || url.origin !== self.location.origin || url.pathname.startsWith("/v1/")) return;
  // Navigations (any page URL, with or without a share-link fragment)
  // fall back to the cached page.
  const key = req.mode === "navigate" ? "./" : req;
  ev.respondWith(
    fetch(req).then(resp => {
      if (resp.ok && resp.type === "basic") {
        const copy = resp.clone();
        caches.open(CACHE).then(c => c.put(key, copy));
      }
      return resp;
    }).catch(() => caches.open(CACHE).then(c => c.match(key, { ignoreSearch: req.mode === "navigate" }))
      .then(hit => hit || Response.error()))
  );
});
