// Drives the edge build under Node: node drive.mjs BUILD_DIR REQUESTS.json OUT.json
//
// BUILD_DIR holds the generated glue (worker.mjs, wasm_exec.js), app.wasm
// and node/runtime.mjs copied in as runtime.mjs. Each request in
// REQUESTS.json ({method, path, headers, body, env}) goes through the
// worker's fetch handler, one after another, as the platform would call
// it; the answers ({status, headers, body, ms}) are written to OUT.json.
// (The Go program's own output goes to stdout, so results go to a file.)
import { writeFile, readFile } from "node:fs/promises";
import path from "node:path";
import { pathToFileURL } from "node:url";

const [dir, reqFile, outFile] = process.argv.slice(2);
const worker = (await import(pathToFileURL(path.join(path.resolve(dir), "worker.mjs")).href)).default;
const requests = JSON.parse(await readFile(reqFile, "utf8"));
const ctx = { waitUntil() {}, passThroughOnException() {} };
const results = [];
for (const r of requests) {
  const init = { method: r.method, headers: r.headers || {} };
  if (r.body !== undefined && r.body !== null) init.body = r.body;
  const t0 = performance.now();
  const res = await worker.fetch(new Request("http://edge.test" + r.path, init), r.env || {}, ctx);
  const body = await res.text();
  const headers = {};
  res.headers.forEach((v, k) => {
    headers[k] = v;
  });
  results.push({ status: res.status, headers, body, ms: performance.now() - t0 });
}
await writeFile(outFile, JSON.stringify(results));
