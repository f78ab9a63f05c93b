// The private MariaDB of this checkout: installed from Debian's packages when missing, data in a
// git-ignored folder, listening on 127.0.0.1:$DB_PORT with its own socket. Idempotent: a running
// server is reused, a stale pid file is cleaned, a kill -9 leaves data that the next start reuses.
import { execFileSync, spawn, spawnSync } from "node:child_process";
import { closeSync, existsSync, mkdirSync, openSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { log } from "./log.mjs";

const SBIN = ["/usr/sbin", "/usr/bin", "/usr/local/sbin", "/usr/local/bin"];

function which(cmd) {
  for (const dir of [...(process.env.PATH ?? "").split(":"), ...SBIN]) {
    if (dir && existsSync(join(dir, cmd))) return join(dir, cmd);
  }
  return null;
}

const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

/** Runs apt-get for Debian packages, as root or through sudo. */
export function aptInstall(packages, why) {
  log(`${why}: installing ${packages.join(", ")} from Debian's packages (apt-get, about 20–40 s)…`);
  const prefix = isRoot ? [] : which("sudo") ? ["sudo"] : null;
  if (prefix === null) {
    throw new Error(`apt-get needs root; run as root or install ${packages.join(" ")} yourself.`);
  }
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const run = (args) => {
    const r = spawnSync(prefix[0] ?? args[0], prefix.length ? args : args.slice(1), { stdio: "inherit", env });
    if (r.status !== 0) throw new Error(`${args.join(" ")} failed (exit ${r.status}).`);
  };
  run(["apt-get", "update", "-qq"]);
  run(["apt-get", "install", "-y", "-qq", "--no-install-recommends", ...packages]);
}

export function ensureMariadbInstalled() {
  if (which("mariadbd") && which("mariadb-install-db")) return;
  aptInstall(["mariadb-server", "mariadb-client"], "MariaDB is not installed");
  if (!which("mariadbd")) throw new Error("mariadbd is still missing after apt-get install.");
}

function paths(db) {
  return {
    data: join(db.dir, "data"),
    socket: join(db.dir, "mysql.sock"),
    pid: join(db.dir, "mariadbd.pid"),
    portFile: join(db.dir, "port"),
    log: join(db.dir, "error.log"),
    lock: join(db.dir, "start.lock"),
  };
}

function alive(pid) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** The pid of this checkout's running server, or null (a stale pid file is removed). */
export function runningPid(db) {
  const p = paths(db);
  if (!existsSync(p.pid)) return null;
  const pid = Number(readFileSync(p.pid, "utf8").trim());
  if (Number.isInteger(pid) && pid > 0 && alive(pid)) return pid;
  log("MariaDB: removing a stale pid file (the server is not running).");
  rmSync(p.pid, { force: true });
  rmSync(p.socket, { force: true });
  return null;
}

async function rootConnection(db) {
  const mysql = await import("mysql2/promise");
  return mysql.createConnection({ socketPath: paths(db).socket, user: "root", multipleStatements: true });
}

async function waitUntilReady(db, timeout_ms) {
  const until = Date.now() + timeout_ms;
  let lastError;
  while (Date.now() < until) {
    try {
      const c = await rootConnection(db);
      await c.query("SELECT 1");
      await c.end();
      return;
    } catch (e) {
      lastError = e;
      await sleep(100);
    }
  }
  const tail = existsSync(paths(db).log) ? readFileSync(paths(db).log, "utf8").split("\n").slice(-15).join("\n") : "";
  throw new Error(`MariaDB did not become ready in ${timeout_ms} ms (${lastError?.message}).\n${tail}`);
}

/** Takes an exclusive lock file so that two start commands at once do not start two servers. */
async function withLock(db, fn) {
  const { lock } = paths(db);
  const until = Date.now() + 30_000;
  for (;;) {
    try {
      closeSync(openSync(lock, "wx"));
      break;
    } catch {
      const holder = Number(readFileSync(lock, "utf8").trim() || 0);
      if (holder && !alive(holder)) rmSync(lock, { force: true });
      else if (Date.now() > until) throw new Error(`MariaDB start lock ${lock} is held; remove it if no start is running.`);
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

/** Starts the private server (or reuses the running one); says which. */
export async function startMariadb(db) {
  ensureMariadbInstalled();
  mkdirSync(db.dir, { recursive: true });
  const p = paths(db);
  return withLock(db, async () => {
    const pid = runningPid(db);
    if (pid) {
      const port = existsSync(p.portFile) ? Number(readFileSync(p.portFile, "utf8")) : db.port;
      if (port === db.port) {
        await waitUntilReady(db, 10_000);
        log(`MariaDB: reusing the running server (pid ${pid}, 127.0.0.1:${db.port}).`);
        return { pid, reused: true };
      }
      log(`MariaDB: the running server listens on ${port}, not ${db.port}; restarting it.`);
      await stopMariadb(db);
    }
    if (!existsSync(join(p.data, "mysql"))) {
      log(`MariaDB: initialising a data folder in ${p.data}…`);
      mkdirSync(p.data, { recursive: true });
      execFileSync(
        which("mariadb-install-db"),
        [
          "--no-defaults",
          ...(isRoot ? ["--user=root"] : []),
          `--datadir=${p.data}`,
          "--auth-root-authentication-method=normal",
          "--skip-test-db",
          "--skip-name-resolve",
        ],
        { stdio: ["ignore", "ignore", "inherit"] },
      );
    }
    const testSpeed = process.env.TAPWRIGHT_DB_FAST === "1"
      ? ["--innodb-buffer-pool-size=16M", "--innodb-log-file-size=8M", "--innodb-flush-log-at-trx-commit=0", "--innodb-doublewrite=0"]
      : [];
    const child = spawn(
      which("mariadbd"),
      [
        "--no-defaults",
        ...(isRoot ? ["--user=root"] : []),
        `--datadir=${p.data}`,
        `--socket=${p.socket}`,
        `--port=${db.port}`,
        "--bind-address=127.0.0.1",
        `--pid-file=${p.pid}`,
        `--log-error=${p.log}`,
        "--skip-name-resolve",
        "--character-set-server=utf8mb4",
        "--collation-server=utf8mb4_unicode_ci",
        "--max-allowed-packet=256M",
        ...testSpeed,
      ],
      { detached: true, stdio: "ignore" },
    );
    child.unref();
    writeFileSync(p.portFile, String(db.port));
    await waitUntilReady(db, 30_000);
    log(`MariaDB: started (pid ${child.pid}) on 127.0.0.1:${db.port}, data in ${p.data}.`);
    return { pid: child.pid, reused: false };
  });
}

/** Stops the server with SQL SHUTDOWN and waits for the process to end. */
export async function stopMariadb(db) {
  const pid = runningPid(db);
  if (!pid) {
    log("MariaDB: not running.");
    return;
  }
  try {
    const c = await rootConnection(db);
    await c.query("SHUTDOWN");
    await c.end().catch(() => {});
  } catch {
    process.kill(pid, "SIGTERM");
  }
  const until = Date.now() + 20_000;
  while (alive(pid) && Date.now() < until) await sleep(50);
  if (alive(pid)) throw new Error(`MariaDB (pid ${pid}) did not stop within 20 s.`);
  rmSync(paths(db).pid, { force: true });
  log(`MariaDB: stopped (pid ${pid}).`);
}

/** Creates the database and the application user (idempotent); `fresh` drops the database first. */
export async function ensureDatabase(db, { fresh = false } = {}) {
  const c = await rootConnection(db);
  try {
    const name = c.escapeId(db.name);
    if (fresh) await c.query(`DROP DATABASE IF EXISTS ${name}`);
    await c.query(`CREATE DATABASE IF NOT EXISTS ${name} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    for (const host of ["127.0.0.1", "localhost"]) {
      const account = `${c.escape(db.user)}@${c.escape(host)}`;
      await c.query(`CREATE USER IF NOT EXISTS ${account} IDENTIFIED BY ${c.escape(db.password)}`);
      await c.query(`ALTER USER ${account} IDENTIFIED BY ${c.escape(db.password)}`);
      await c.query(`GRANT ALL PRIVILEGES ON ${name}.* TO ${account}`);
    }
  } finally {
    await c.end();
  }
}
