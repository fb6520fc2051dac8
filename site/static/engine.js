// Drawsift engine client: starts the engine worker, checks its version
// against the page's, and turns worker messages into promises.
"use strict";

(function () {
  const expected = document.querySelector('meta[name="drawsift-engine-version"]').content;

  // Bundle mode: the single-file page carries the worker source and the
  // gzip-compressed wasm in non-executed script elements.
  function bundled() {
    return document.getElementById("ds-wasm") !== null;
  }

  // inflated returns the bytes of the bundle's element id, which holds
  // them gzip-compressed in base64.
  async function inflated(id) {
    const b64 = document.getElementById(id).textContent.trim();
    const bin = atob(b64);
    const gz = new Uint8Array(bin.length);
    for (let i = 0; i < bin.length; i++) gz[i] = bin.charCodeAt(i);
    const stream = new Blob([gz]).stream().pipeThrough(new DecompressionStream("gzip"));
    return await new Response(stream).arrayBuffer();
  }

  // compiled holds one compiled module per engine build, shared by every
  // worker that runs it (the page's engine, the robustness helpers, a
  // restart): the download and the compilation happen once, and the
  // browser's optimising tier works on code that all of them run.
  const compiled = new Map();
  function compile(wasm) {
    let p = compiled.get(wasm);
    if (!p) {
      p = bundled() ? inflated("ds-wasm").then(b => WebAssembly.compile(b)) : (async () => {
        const url = new URL(wasm + "?v=" + encodeURIComponent(expected), document.baseURI).href;
        const resp = await fetch(url, { credentials: "same-origin" });
        if (!resp.ok) throw new Error("could not load the engine (" + resp.status + " " + resp.statusText + ")");
        return WebAssembly.compileStreaming(resp);
      })();
      p.then(() => performance.mark("ds:compiled:" + wasm), () => compiled.delete(wasm)); // a failure is tried again on restart
      compiled.set(wasm, p);
    }
    return p;
  }

  // listings resolves with the engine's listings sent with the page
  // ({version, defaults, presets, solutes}: listings.json beside the
  // served page, inline in the single-file page), or with null when there
  // is none of this page's version: the page then asks its engine. The
  // page builds its form from them while the engine compiles, and checks
  // them against the engine's own answers after the first ranking.
  async function listings() {
    try {
      const l = bundled() ? JSON.parse(new TextDecoder().decode(await inflated("ds-listings")))
        : await fetch("listings.json?v=" + encodeURIComponent(expected), { credentials: "same-origin" }).then(r => r.ok ? r.json() : null);
      return l && l.version === expected && l.defaults && l.presets && l.solutes ? l : null;
    } catch (e) {
      return null; // unreadable: the engine answers instead
    }
  }

  // MEMO_SIZE answers are kept for call's opts.memo: a ranking, its
  // osmotic batch and a sweep per plotted candidate of the whole library,
  // twice over; a few MB at most (our own choice).
  const MEMO_SIZE = 64;

  // reply is a call's answer from the engine's text.
  function reply(ok, text, ms) {
    let data;
    try { data = JSON.parse(text); } catch (e) { return { ok: false, ms: ms, data: { error: { field: "", message: "unreadable engine reply" } } }; }
    return { ok: ok, data: data, ms: ms };
  }

  class Engine {
    // wasm names the engine build to load: drawsift.wasm (the page's), or
    // drawsift-fit.wasm (the full engine the Fit tab loads when used).
    constructor(wasm) {
      this.wasm = wasm || "drawsift.wasm";
      this.worker = null;
      this.pending = new Map();
      this.seq = 0;
      this.version = null;
      this.booting = null; // the start that calls made before the version is known wait for
      // broken holds why the engine cannot be used (a restart that failed
      // or found another engine version); every call then fails with it.
      this.broken = null;
      this.onstatus = () => {};
      this.idlers = []; // resolved when no call is pending (warm)
      this.memo = new Map(); // request text → {ok, text, ms} of recent answers (call's opts.memo)
    }

    // start creates the worker and resolves with the engine's version.
    // A call made before a start has first checked that version waits for
    // the latest start.
    start() {
      const p = this.boot();
      if (this.version === null) this.booting = p;
      return p;
    }

    async boot() {
      let w;
      if (bundled() && this.wasm !== "drawsift.wasm") {
        throw new Error("The single-file page carries the screening engine only; the Fit and Plant tabs need the served page (drawsift serve) or the CLI (drawsift fit, drawsift module, drawsift screen with the system basis).");
      }
      if (bundled()) {
        const src = document.getElementById("ds-worker").textContent;
        const url = URL.createObjectURL(new Blob([src], { type: "text/javascript" }));
        w = new Worker(url);
        URL.revokeObjectURL(url);
      } else {
        w = new Worker("worker.js");
      }
      // The worker starts (and loads wasm_exec.js) while the module compiles.
      const module = compile(this.wasm);
      const init = async () => w.postMessage({ type: "init", module: await module });
      this.worker = w;
      const ready = new Promise((resolve, reject) => {
        w.onmessage = ev => {
          const m = ev.data;
          if (m.type === "ready") resolve(m.version);
          else if (m.type === "failed") reject(new Error(m.message));
          else this.message(m);
        };
        w.onerror = ev => { ev.preventDefault(); reject(new Error(ev.message || "the engine worker failed")); };
      });
      await Promise.all([init(), ready]);
      const v = await ready;
      w.onmessage = ev => this.message(ev.data);
      this.version = v;
      if (v !== expected) {
        this.broken = new Error("The engine (version " + v + ") does not match this page (version " + expected +
          "). Reload the page; if that does not help, clear this site's stored data.");
        throw new Error("The engine (version " + v + ") does not match this page (version " + expected +
          "). Reload the page; if that does not help, clear this site's stored data.");
      }
      return v;
    }

    message(m) {
      const p = this.pending.get(m.id);
      if (!p) return;
      if (m.type === "progress") { if (p.onProgress) p.onProgress(m.fraction); return; }
      if (m.type === "done") {
        this.pending.delete(m.id);
        if (!this.pending.size) for (const f of this.idlers.splice(0)) f();
        const ms = performance.now() - p.t0;
        if (p.key !== undefined && m.ok) this.remember(p.key, { ok: m.ok, text: m.text, ms: ms });
        p.resolve(reply(m.ok, m.text, ms));
      }
    }

    // remember keeps an answer for call's opts.memo, the most recent
    // MEMO_SIZE of them.
    remember(key, answer) {
      this.memo.delete(key);
      this.memo.set(key, answer);
      if (this.memo.size > MEMO_SIZE) this.memo.delete(this.memo.keys().next().value);
    }

    // call runs op on body (an object); resolves {ok, data, ms}, ms the
    // time from sending the request to its answer. opts: onProgress(fraction),
    // signal (an AbortSignal) to cancel, and memo: the answer to the same
    // request text, if one of the last MEMO_SIZE, is given again (the engine
    // is deterministic), with memo set and the ms it first took. The page's
    // re-ranking after an edit that does not reach the request (an
    // uncertainty, a sweep range) then costs nothing, and leaves the engine
    // to the work the edit asked for.
    call(op, body, opts) {
      opts = opts || {};
      if (this.broken) return Promise.resolve({ ok: false, data: { error: { field: "", message: this.broken.message } } });
      if (this.version === null && this.booting) {
        return this.booting.then(() => this.call(op, body, opts),
          e => ({ ok: false, data: { error: { field: "", message: (this.broken || e).message } } }));
      }
      const text = JSON.stringify(body === undefined ? {} : body);
      const key = opts.memo ? op + "\n" + text : undefined;
      const known = key !== undefined && this.memo.get(key);
      if (known) {
        this.remember(key, known);
        return Promise.resolve(Object.assign(reply(known.ok, known.text, known.ms), { memo: true }));
      }
      const id = "r" + (++this.seq);
      return new Promise((resolve, reject) => {
        this.pending.set(id, { resolve, reject, onProgress: opts.onProgress, key: key, t0: performance.now() });
        if (opts.signal) {
          opts.signal.addEventListener("abort", () => this.cancel(id), { once: true });
        }
        this.worker.postMessage({ type: "call", id: id, op: op, body: text });
      });
    }

    // warm runs op on body up to times times while no other call waits,
    // so that the browser has compiled the engine's hot code with its
    // optimising tier before the user's next edit needs it; a call the
    // page makes meanwhile goes first (it waits at most one warm run).
    async warm(op, body, times) {
      for (let i = 0; i < times && !this.broken; i++) {
        while (this.pending.size) await new Promise(f => this.idlers.push(f));
        const r = await this.call(op, body);
        if (!r.ok) return;
      }
    }

    // cancel asks the engine to stop; if it has not stopped within a
    // second (a long step that never yields), the worker is replaced.
    cancel(id) {
      const p = this.pending.get(id);
      if (!p) return;
      this.worker.postMessage({ type: "cancel", id: id });
      setTimeout(() => {
        if (!this.pending.has(id)) return;
        this.restart();
      }, 1000);
    }

    restart() {
      const old = this.worker;
      for (const [, p] of this.pending) p.resolve({ ok: false, cancelled: true, data: { error: { field: "", message: "cancelled" } } });
      this.pending.clear();
      for (const f of this.idlers.splice(0)) f();
      if (old) old.terminate();
      this.onstatus("restarting");
      // Every restart checks the version again (start does); a failure is
      // reported, never left as an unhandled rejection.
      return this.start().then(v => { this.onstatus("ready"); return v; }, e => {
        this.broken = this.broken || e;
        this.onstatus("failed", this.broken.message);
      });
    }
  }

  window.DrawsiftEngine = Engine;
  window.DrawsiftEngine.listings = listings;
})();
