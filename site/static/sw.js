// Drawsift service worker: after one visit over http(s) or localhost the
// page and its engine work offline. Network first (a new build is picked
// up at once when online), the cache when the network fails. The engine
// version comes from the registration URL (sw.js?v=VERSION) and names the
// cache, so that each version keeps its own complete set of files.
//
// The cache holds only a set that matches its version: it is filled once,
// at install, all files or none, after checking that the page declares
// VERSION (its drawsift-engine-version meta) and that the engine's wasm
// carries the same version (the mark wasm/page builds into it), as do the
// engine's listings (their version field). A server
// that answers with another build (a deploy in progress, a proxy's stale
// copy) fails the install, so the set already cached stays whole, and
// the open pages are told why (message "offline-refused"). Answers fetched
// later are never written to the cache.
"use strict";

const VERSION = new URL(self.location.href).searchParams.get("v") || "dev";
const CACHE = "drawsift-" + VERSION;
// Every file the page loads (site_test.go checks this list against
// index.html and engine.js).
const FILES = ["./", "app.css", "charts.js", "store.js", "engine.js", "core.js", "form.js", "results.js", "plots.js", "library.js",
  "mixtures.js", "fit.js", "plant.js", "report.js", "files.js", "app.js", "worker.js", "wasm_exec.js", "drawsift.wasm?v=" + encodeURIComponent(VERSION),
  "listings.json?v=" + encodeURIComponent(VERSION), "icon.svg",
  "manifest.webmanifest", "demo.json"];
// The engine's listings are optional: a host that does not make them (see
// cmd/drawsift/listings.go) leaves them out of the set, and the page then
// reads them from its engine.
const LISTINGS = "listings.json?v=" + encodeURIComponent(VERSION);

// The engine's version mark in its wasm: "<drawsift-engine-version:" +
// version + ">" (wasm/page/main.go).
const MARK = "<drawsift-engine-version:";

// wasmVersion finds the version mark in the wasm's bytes ("" if none).
function wasmVersion(bytes) {
  const mark = new TextEncoder().encode(MARK);
  for (let i = bytes.indexOf(mark[0]); i >= 0; i = bytes.indexOf(mark[0], i + 1)) {
    let j = 0;
    while (j < mark.length && bytes[i + j] === mark[j]) j++;
    if (j < mark.length) continue;
    const end = bytes.indexOf(62 /* > */, i + j);
    if (end > 0 && end - i - j <= 64) return new TextDecoder().decode(bytes.subarray(i + j, end));
  }
  return "";
}

// checked resolves with the answer for file f if it may be cached under
// VERSION (null for listings the host does not make), else rejects saying
// why.
async function checked(f, resp) {
  if (!resp.ok && f === LISTINGS) return null; // optional: the page asks its engine instead
  if (!resp.ok) throw new Error(f + " answered " + resp.status);
  let got = null;
  if (f === "./") {
    const m = /<meta name="drawsift-engine-version" content="([^"]*)">/.exec(await resp.clone().text());
    got = m ? m[1] : "none";
  } else if (f.startsWith("drawsift.wasm")) {
    got = wasmVersion(new Uint8Array(await resp.clone().arrayBuffer())) || "none";
  } else if (f === LISTINGS) {
    got = String((await resp.clone().json()).version);
  }
  if (got !== null && got !== VERSION) {
    const what = f === "./" ? "a page" : f === LISTINGS ? "engine listings" : "an engine";
    throw new Error("the server sent " + what + " of version " + got + ", not " + VERSION);
  }
  return resp;
}

// fill caches every file of FILES, or none.
async function fill() {
  const answers = await Promise.all(FILES.map(f => fetch(new Request(f, { cache: "no-cache" })).then(r => checked(f, r))));
  const c = await caches.open(CACHE);
  try {
    await Promise.all(answers.map((r, i) => r && c.put(FILES[i], r)));
  } catch (e) {
    await caches.delete(CACHE);
    throw e;
  }
}

// tell posts a message to every window of this origin, controlled or not.
async function tell(msg) {
  const all = await self.clients.matchAll({ includeUncontrolled: true, type: "window" });
  for (const c of all) c.postMessage(msg);
}

self.addEventListener("install", ev => {
  ev.waitUntil(fill().then(() => self.skipWaiting(), async err => {
    await tell({ type: "offline-refused", version: VERSION, reason: String(err && err.message || err) });
    throw err;
  }));
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
  // The network's answer goes to the page as it is, never into the cache
  // (see the top of this file).
  ev.respondWith(
    fetch(req).catch(() => caches.open(CACHE).then(c => c.match(key, { ignoreSearch: req.mode === "navigate" }))
      .then(hit => hit || Response.error()))
  );
});
