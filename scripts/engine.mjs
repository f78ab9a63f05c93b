#!/usr/bin/env node
// `npm run --silent engine -- <command>`: the engine's JSON command line. Runs a bundle of
// lib/cli/main.ts (dist/engine-cli.mjs), rebuilt with esbuild whenever a file in lib/ is newer,
// so that a call costs Node's start-up rather than a TypeScript compile.
import { existsSync, readdirSync, statSync } from "node:fs";
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
  await build({
    entryPoints: [join(root, "lib", "cli", "main.ts")],
    outfile: bundle,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    packages: "external",
    logLevel: "error",
  });
}
await import(pathToFileURL(bundle).href);
