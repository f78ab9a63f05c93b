#!/usr/bin/env node
// Bundles the engine worker (src/server/jobs/engine.worker.ts and the lib/ code it calls) into
// dist/engine-worker.mjs for the worker-thread pool, and the standalone worker process of the
// distributed queue (src/server/jobs/worker.main.ts) into dist/worker.mjs, both in TAPWRIGHT_OUT_DIR
// when set. Packages stay external (node_modules).
import { build } from "esbuild";
import { join } from "node:path";
import { distDir, root } from "./lib/config.mjs";

const common = {
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  packages: "external",
  sourcemap: "linked",
  logLevel: "warning",
};

await Promise.all([
  build({
    ...common,
    entryPoints: [join(root, "src", "server", "jobs", "engine.worker.ts")],
    outfile: join(distDir, "engine-worker.mjs"),
  }),
  build({
    ...common,
    entryPoints: [join(root, "src", "server", "jobs", "worker.main.ts")],
    outfile: join(distDir, "worker.mjs"),
  }),
]);
