// Helpers the private services (MariaDB, Redis) share: finding a program, telling whether a pid is
// alive, and an exclusive lock file so that two start commands at once do not start two servers.
import { closeSync, existsSync, openSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { setTimeout as sleep } from "node:timers/promises";

const SBIN = ["/usr/sbin", "/usr/bin", "/usr/local/sbin", "/usr/local/bin"];

/** The full path of a program on PATH (or in the usual sbin folders), or null. */
export function which(cmd) {
  for (const dir of [...(process.env.PATH ?? "").split(":"), ...SBIN]) {
    if (dir && existsSync(join(dir, cmd))) return join(dir, cmd);
  }
  return null;
}

export const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

export function alive(pid) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** Runs `fn` holding the lock file `lock` (a stale lock of a dead process is taken over). */
export async function withLockFile(lock, what, fn) {
  const until = Date.now() + 30_000;
  for (;;) {
    try {
      closeSync(openSync(lock, "wx"));
      break;
    } catch {
      const holder = Number(readFileSync(lock, "utf8").trim() || 0);
      if (holder && !alive(holder)) rmSync(lock, { force: true });
      else if (Date.now() > until)
        throw new Error(`${what} start lock ${lock} is held; remove it if no start is running.`);
      await sleep(100);
    }
  }
  writeFileSync(lock, String(process.pid));
  try {
    return await fn();
  } finally {
    rmSync(lock, { force: true });
  }
}
