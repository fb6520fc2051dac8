// Drawsift engine worker: runs the Go engine (js/wasm) off the page's main
// thread. Served as a file it loads wasm_exec.js itself; in the single-file
// bundle the page builds this worker from a Blob that already holds
// wasm_exec.js followed by this file.
//
// Messages in:  {type: "init", module: WebAssembly.Module} (compiled once
//               by the page and shared by its workers)
//               {type: "call", id, op, body}
//               {type: "cancel", id}
// Messages out: {type: "ready", version} | {type: "failed", message}
//               {type: "progress", id, fraction}
//               {type: "done", id, ok, text}
"use strict";

if (typeof Go === "undefined") importScripts("wasm_exec.js");

// booted settles when the engine has started (or failed to); a call
// that arrives before the init message waits for it.
let started;
const booted = new Promise(resolve => { started = resolve; });

async function boot(msg) {
  const go = new Go();
  const instance = await WebAssembly.instantiate(msg.module, go.importObject);
  const ready = new Promise(resolve => { self.drawsiftReady = resolve; });
  go.run(instance).then(() => self.postMessage({ type: "failed", message: "the engine stopped" }));
  const version = await ready;
  self.postMessage({ type: "ready", version: version });
}

self.onmessage = ev => {
  const m = ev.data || {};
  switch (m.type) {
    case "init":
      started(boot(m).catch(err => {
        self.postMessage({ type: "failed", message: String(err && err.message || err) });
        throw err;
      }));
      break;
    case "call":
      booted.then(() => {
        let last = 0;
        const onProgress = f => {
          const now = Date.now();
          if (now - last >= 50 || f >= 1) { last = now; self.postMessage({ type: "progress", id: m.id, fraction: f }); }
        };
        const onDone = (ok, text) => self.postMessage({ type: "done", id: m.id, ok: ok, text: text });
        self.drawsiftCall(m.id, m.op, m.body, onProgress, onDone);
      }, () => self.postMessage({ type: "done", id: m.id, ok: false,
        text: JSON.stringify({ error: { field: "", message: "the engine did not start" } }) }));
      break;
    case "cancel":
      if (self.drawsiftCancel) self.drawsiftCancel(m.id);
      break;
  }
};
