#!/usr/bin/env node
// After `astro build`: writes a brotli (.br, quality 11) and a gzip (.gz, level 9) twin beside each
// hashed text asset in <out>/client/_astro, so the server sends them without compressing per request.
import { readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { extname, join, resolve } from "node:path";
import zlib from "node:zlib";

const root = resolve(import.meta.dirname, "..");
const assets = join(resolve(root, process.env.TAPWRIGHT_OUT_DIR ?? "dist"), "client", "_astro");
const TEXT = new Set([".js", ".mjs", ".css", ".svg", ".json"]);
/** Below this, the encoding's own overhead eats the gain. */
const MIN_BYTES = 1024;

let files = 0;
let raw = 0;
let br = 0;
for (const name of readdirSync(assets)) {
  const file = join(assets, name);
  if (!TEXT.has(extname(name)) || statSync(file).size < MIN_BYTES) continue;
  const bytes = readFileSync(file);
  const brotli = zlib.brotliCompressSync(bytes, {
    params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 11, [zlib.constants.BROTLI_PARAM_SIZE_HINT]: bytes.length },
  });
  writeFileSync(`${file}.br`, brotli);
  writeFileSync(`${file}.gz`, zlib.gzipSync(bytes, { level: 9 }));
  files++;
  raw += bytes.length;
  br += brotli.length;
}
console.log(
  `[tapwright] Precompressed ${files} assets: ${(raw / 1024).toFixed(0)} KiB → ${(br / 1024).toFixed(0)} KiB (brotli).`,
);
