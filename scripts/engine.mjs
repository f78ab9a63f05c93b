#!/usr/bin/env node
// `npm run --silent engine -- <command>`: the engine's JSON command line. Runs a bundle of
// lib/cli/main.ts (dist/engine-cli.mjs), rebuilt with esbuild whenever a file in lib/ is newer,
// so that a call costs Node's start-up rather than a TypeScript compile.
import { existsSync, readdirSync, renameSync, statSync } from "node:fs";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { distDir, root } from "./lib/config.mjs";

const bundle = join(distDir, "engine-cli.mjs");

function newestSource_ms(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestSource_ms(path));
    else if (entry.name.endsWith(".ts")) newest = Math.max(newest, statSync(path).mtimeMs);
  }
  return newest;
}

if (!existsSync(bundle) || statSync(bundle).mtimeMs < newestSource_ms(join(root, "lib"))) {
  const { build } = await import("esbuild");
  // Written aside and renamed, so that concurrent calls never import a half-written bundle.
  const fresh = `${bundle}.${process.pid}.tmp.mjs`;
  await build({
    entryPoints: [join(root, "lib", "cli", "main.ts")],
    outfile: fresh,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    packages: "external",
    logLevel: "error",
  });
  renameSync(fresh, bundle);
}
await import(pathToFileURL(bundle).href);
