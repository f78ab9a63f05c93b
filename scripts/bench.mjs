#!/usr/bin/env node
// `npm run bench`: the engine's benchmarks (vitest bench over tests/bench/, once, in the unit
// project), in-process and whole-process through the engine's command line.
import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { ensureNpmPackages } from "./lib/deps.mjs";
import { root } from "./lib/config.mjs";

ensureNpmPackages();
const r = spawnSync(
  join(root, "node_modules", ".bin", "vitest"),
  ["bench", "--run", "--config", "tests/vitest.config.ts", "--project", "unit", ...process.argv.slice(2)],
  { cwd: root, stdio: "inherit" },
);
process.exit(r.status ?? 1);
