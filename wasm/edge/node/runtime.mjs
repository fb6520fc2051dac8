// A Node runtime for the worker glue that workers-assets-gen generates
// (-mode=go). It takes the place of the generated runtime.mjs, which
// imports the wasm the way the edge platform's bundler does; here the
// module is read from app.wasm beside it. Used only by the edge tests.
import { readFile } from "node:fs/promises";

const modPromise = readFile(new URL("./app.wasm", import.meta.url)).then((bytes) =>
  WebAssembly.compile(bytes),
);

export async function loadModule() {
  return modPromise;
}

export function createRuntimeContext({ env, ctx, binding }) {
  return { env, ctx, binding };
}
