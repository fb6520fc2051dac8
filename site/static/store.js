// Drawsift storage: the user's scenario and custom solutes in this
// browser's storage, scenario files, share links and downloads.
//
// A scenario file is exactly the engine's screen request (the contract in
// DEVELOPERS.md), so `drawsift screen -f scenario.json` reproduces a run
// made in the page. Imported files are data only: parsed as JSON, checked
// field by field against the shapes below, never evaluated or inserted as
// markup.
"use strict";

(function () {
  const KEY_SCENARIO = "drawsift.scenario.v1";
  const KEY_CUSTOM = "drawsift.custom-solutes.v1";
  const KEY_PREFS = "drawsift.prefs.v1";
  const MAX_IMPORT_BYTES = 2 << 20;

  function load(key) {
    try {
      const s = localStorage.getItem(key);
      return s ? JSON.parse(s) : null;
    } catch (e) {
      return null; // storage off or a corrupt entry: start afresh
    }
  }
  function save(key, v) {
    try { localStorage.setItem(key, JSON.stringify(v)); return true; } catch (e) { return false; }
  }

  // ---- shape checks ---------------------------------------------------
  // A shape is "number", "integer", "string", "boolean", ["array", item],
  // {object: {key: shape}, required: [...]}, or a function returning an
  // error string or "".
  class ShapeError extends Error {
    constructor(path, msg) { super((path || "file") + ": " + msg); this.field = path; }
  }
  function check(v, shape, path) {
    if (typeof shape === "function") {
      const m = shape(v);
      if (m) throw new ShapeError(path, m);
      return;
    }
    if (shape === "number" || shape === "integer") {
      if (typeof v !== "number" || !isFinite(v)) throw new ShapeError(path, "must be a finite number");
      if (shape === "integer" && !Number.isInteger(v)) throw new ShapeError(path, "must be a whole number");
      return;
    }
    if (shape === "string") { if (typeof v !== "string") throw new ShapeError(path, "must be text"); if (v.length > 2000) throw new ShapeError(path, "is too long (at most 2000 characters)"); return; }
    if (shape === "boolean") { if (typeof v !== "boolean") throw new ShapeError(path, "must be true or false"); return; }
    if (shape === "any") return;
    if (Array.isArray(shape)) {
      if (!Array.isArray(v)) throw new ShapeError(path, "must be a list");
      if (v.length > 5000) throw new ShapeError(path, "has too many entries (at most 5000)");
      v.forEach((x, i) => check(x, shape[1], path + "[" + i + "]"));
      return;
    }
    if (shape && shape.anyOf) {
      const errs = [];
      for (const s of shape.anyOf) { try { check(v, s, path); return; } catch (e) { errs.push(e.message); } }
      throw new ShapeError(path, "has an unexpected form (" + errs[0].replace(/^[^:]*: /, "") + ")");
    }
    if (shape && shape.object) {
      if (v === null || typeof v !== "object" || Array.isArray(v)) throw new ShapeError(path, "must be an object");
      for (const k of Object.keys(v)) {
        if (!Object.prototype.hasOwnProperty.call(shape.object, k)) {
          throw new ShapeError(path ? path + "." + k : k, "is not a known field" +
            (shape.hint ? " (known: " + Object.keys(shape.object).join(", ") + ")" : ""));
        }
        check(v[k], shape.object[k], path ? path + "." + k : k);
      }
      for (const k of shape.required || []) if (!Object.prototype.hasOwnProperty.call(v, k)) throw new ShapeError(path ? path + "." + k : k, "is required");
      return;
    }
    throw new Error("bad shape at " + path);
  }

  // ---- share links ------------------------------------------------------
  function b64url(bytes) {
    let s = "";
    for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode.apply(null, bytes.subarray(i, i + 0x8000));
    return btoa(s).replace(/\+/g, "-").replace(/\//g, "_").replace(/=+$/, "");
  }
  function unb64url(s) {
    const bin = atob(s.replace(/-/g, "+").replace(/_/g, "/"));
    const out = new Uint8Array(bin.length);
    for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
    return out;
  }
  async function pipe(bytes, stream) {
    const s = new Blob([bytes]).stream().pipeThrough(stream);
    return new Uint8Array(await new Response(s).arrayBuffer());
  }
  // encodeShare packs an object into a URL fragment value (deflate + base64url).
  async function encodeShare(obj) {
    const raw = new TextEncoder().encode(JSON.stringify(obj));
    return "z" + b64url(await pipe(raw, new CompressionStream("deflate-raw")));
  }
  // MAX_SHARE_BYTES bounds what a link may expand to: a scenario with its
  // custom solutes is a few kilobytes, so 2 MB (the import file limit) is
  // ample, and a crafted link that inflates a thousandfold is stopped
  // while it is read, not after.
  const MAX_SHARE_BYTES = 2 * 1024 * 1024;
  async function inflateBounded(bytes, limit) {
    const reader = new Blob([bytes]).stream().pipeThrough(new DecompressionStream("deflate-raw")).getReader();
    const parts = [];
    let n = 0;
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      n += value.length;
      if (n > limit) {
        await reader.cancel();
        throw new Error("the link expands past " + limit / (1024 * 1024) + " MB; a scenario is far smaller");
      }
      parts.push(value);
    }
    const out = new Uint8Array(n);
    let at = 0;
    for (const p of parts) { out.set(p, at); at += p.length; }
    return out;
  }
  async function decodeShare(s) {
    if (s.length > 200000) throw new Error("the link is too long");
    let bytes;
    if (s[0] === "z") bytes = await inflateBounded(unb64url(s.slice(1)), MAX_SHARE_BYTES);
    else throw new Error("the link's format is not recognised");
    return JSON.parse(new TextDecoder().decode(bytes));
  }

  // ---- files --------------------------------------------------------------
  function download(name, text, type) {
    const blob = text instanceof Blob ? text : new Blob([text], { type: type || "application/json" });
    const a = document.createElement("a");
    a.href = URL.createObjectURL(blob);
    a.download = name;
    document.body.appendChild(a);
    a.click();
    setTimeout(() => { URL.revokeObjectURL(a.href); a.remove(); }, 1000);
  }
  // readJSONFile reads a user-chosen file as JSON, with a clear error.
  async function readJSONFile(file) {
    if (file.size > MAX_IMPORT_BYTES) throw new Error("“" + file.name + "” is larger than 2 MB; a scenario or solute file is far smaller.");
    const text = await file.text();
    try {
      return JSON.parse(text);
    } catch (e) {
      throw new Error("“" + file.name + "” is not valid JSON (" + e.message + ").");
    }
  }

  window.DrawsiftStore = {
    KEY_SCENARIO, KEY_CUSTOM, KEY_PREFS, load, save, check, ShapeError,
    encodeShare, decodeShare, download, readJSONFile,
  };
})();
