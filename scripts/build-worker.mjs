#!/usr/bin/env node
// Bundles the engine worker (src/server/jobs/engine.worker.ts and the lib/ code it calls) into
// dist/engine-worker.mjs (in TAPWRIGHT_OUT_DIR when set) for the worker-thread pool. Packages stay external (node_modules).
import { build } from "esbuild";
import { join } from "node:path";
import { distDir, root } from "./lib/config.mjs";

await build({
  entryPoints: [join(root, "src", "server", "jobs", "engine.worker.ts")],
  outfile: join(distDir, "engine-worker.mjs"),
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  packages: "external",
  sourcemap: "linked",
  logLevel: "warning",
});
