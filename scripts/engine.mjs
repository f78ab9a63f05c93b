#!/usr/bin/env node
// `npm run --silent engine -- <command>`: the engine's JSON command line. Runs a bundle of
// lib/cli/main.ts with every package inlined (dist/engine-cli.js: one file, no module resolution at
// start), rebuilt with esbuild whenever a file in lib/ is newer. The code V8 compiles while serving
// a command is kept per command and bundle (dist/engine-cli-cache/, V8's code cache) and handed
// back on the next call, so that a call costs little more than Node's own start-up.
import { mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { join } from "node:path";
import vm from "node:vm";
import { distDir, root } from "./lib/config.mjs";

const bundle = join(distDir, "engine-cli.js");
const cacheDir = join(distDir, "engine-cli-cache");
/** The name the bundle gives its exports (an IIFE: no `module`/`exports` in scope for UMD packages). */
const globalName = "tapwrightEngineCli";

function newestSource_ms(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestSource_ms(path));
    else if (entry.name.endsWith(".ts")) newest = Math.max(newest, statSync(path).mtimeMs);
  }
  return newest;
}

function bundleTime_ms() {
  try {
    return statSync(bundle).mtimeMs;
  } catch {
    return -1;
  }
}

if (bundleTime_ms() < newestSource_ms(join(root, "lib"))) {
  const { build } = await import("esbuild");
  // Written aside and renamed, so that concurrent calls never load a half-written bundle.
  const fresh = `${bundle}.${process.pid}.tmp`;
  await build({
    entryPoints: [join(root, "lib", "cli", "main.ts")],
    outfile: fresh,
    bundle: true,
    platform: "node",
    format: "iife",
    globalName,
    target: "node20",
    logLevel: "error",
  });
  renameSync(fresh, bundle);
  rmSync(cacheDir, { recursive: true, force: true });
}

// Only command names get a cache file (the argument is the user's). The file name carries the
// bundle's time and size: V8 checks a cache against the source's length only, so a cache written by
// a call that loaded an earlier bundle must never be offered to a later one.
const command = process.argv[2];
const { mtimeMs, size } = statSync(bundle);
const cacheFile =
  typeof command === "string" && /^[a-z][a-z0-9-]{0,39}$/.test(command)
    ? join(cacheDir, `${command}.${Math.round(mtimeMs)}.${size}.bin`)
    : null;
let cachedData;
if (cacheFile !== null) {
  try {
    cachedData = readFileSync(cacheFile);
  } catch {
    cachedData = undefined;
  }
}
const script = new vm.Script(`(function (require) {${readFileSync(bundle, "utf8")}\nreturn ${globalName};\n})`, {
  filename: bundle,
  cachedData,
});
const engine = script.runInThisContext()(createRequire(bundle));
await engine.served;
// Saved after a served request only (exit 0), so that the cache holds that command's code.
if (cacheFile !== null && process.exitCode === 0 && (cachedData === undefined || script.cachedDataRejected)) {
  // A cache is an optimization only: failing to write one changes nothing else.
  try {
    mkdirSync(cacheDir, { recursive: true });
    const fresh = `${cacheFile}.${process.pid}.tmp`;
    writeFileSync(fresh, script.createCachedData());
    renameSync(fresh, cacheFile);
  } catch {
    // read-only or full disk: run without a cache next time too
  }
}
