// Installs what a fresh clone lacks: the npm packages (from package-lock.json) and, for the
// browser tests, Debian's Chromium. Uses only Node's own modules, so it runs before any install.
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { root } from "./config.mjs";
import { log } from "./log.mjs";

const stamp = join(root, "node_modules", ".tapwright-lock-sha256");

function lockHash() {
  return createHash("sha256")
    .update(readFileSync(join(root, "package-lock.json")))
    .digest("hex");
}

/** Runs `npm ci` when node_modules is missing or was installed from another package-lock.json. */
export function ensureNpmPackages() {
  const want = lockHash();
  if (existsSync(stamp) && readFileSync(stamp, "utf8").trim() === want) return;
  log("Installing npm packages (npm ci)…");
  const r = spawnSync("npm", ["ci", "--no-audit", "--no-fund", "--loglevel=error"], { cwd: root, stdio: "inherit" });
  if (r.status !== 0) throw new Error(`npm ci failed (exit ${r.status}).`);
  writeFileSync(stamp, want);
}

export const chromiumPath = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

/** Installs Debian's Chromium for the browser tests when it is missing. */
export async function ensureChromium() {
  if (existsSync(chromiumPath)) return;
  const { aptInstall } = await import("./mariadb.mjs");
  aptInstall(["chromium"], "Chromium is not installed (the browser tests need it)");
}
