// The private MariaDB of this checkout: installed from Debian's packages when missing, data in a
// git-ignored folder, listening on 127.0.0.1:$DB_PORT with its own socket. Idempotent: a running
// server is reused, a stale pid file is cleaned, a kill -9 leaves data that the next start reuses.
// Locked down like a shared machine's server: root only through the socket and with a random
// password kept in .data/ (mode 0600), no root account over TCP, the server process as the
// unprivileged `mysql` user even when this script runs as root, file import/export confined to an
// empty folder (secure_file_priv).
import { execFileSync, spawn, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import {
  chmodSync,
  chownSync,
  closeSync,
  cpSync,
  existsSync,
  lstatSync,
  mkdirSync,
  openSync,
  readFileSync,
  realpathSync,
  renameSync,
  rmSync,
  statSync,
  symlinkSync,
  writeFileSync,
} from "node:fs";
import { hostname } from "node:os";
import { dirname, join, resolve } from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { storedSecret } from "./config.mjs";
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

/** Where the server's files live: the checkout's folder, or the place it points to (see `placeFolder`). */
function serverDir(db) {
  return existsSync(db.dir) ? realpathSync(db.dir) : db.dir;
}

function paths(db) {
  const dir = serverDir(db);
  return {
    dir,
    data: join(dir, "data"),
    socket: join(dir, "mysql.sock"),
    pid: join(dir, "mariadbd.pid"),
    portFile: join(dir, "port"),
    log: join(dir, "error.log"),
    lock: join(dir, "start.lock"),
    /** The only folder LOAD DATA / SELECT … INTO OUTFILE may touch (kept empty). */
    files: join(dir, "files"),
    init: join(dir, "init.sql"),
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

/** MariaDB's root password for this checkout, generated once into .data/db-root-password (0600). */
const rootPassword = () => storedSecret("db-root-password");

const ACCESS_DENIED = 1045;

async function connectRoot(db, password) {
  const mysql = await import("mysql2/promise");
  return mysql.createConnection({ socketPath: paths(db).socket, user: "root", password, multipleStatements: true });
}

/**
 * Root over the socket with the checkout's password. A data folder made before root had a password
 * (older checkouts, or a server not yet secured) still lets root in without one: then secure it.
 */
async function rootConnection(db) {
  try {
    return await connectRoot(db, rootPassword());
  } catch (e) {
    if (e?.errno !== ACCESS_DENIED) throw e;
  }
  let c;
  try {
    c = await connectRoot(db, "");
  } catch (e) {
    if (e?.errno !== ACCESS_DENIED) throw e;
    throw new Error(
      `MariaDB refuses root with the password in ${join(dirname(db.dir), "db-root-password")}; restore that file, or remove ${db.dir} to start from an empty database.`,
    );
  }
  await secureRoot(c);
  return c;
}

/** Root only as root@localhost (the socket) with the checkout's password; no anonymous accounts. */
async function secureRoot(c) {
  const [rows] = await c.query(
    "SELECT User AS user, Host AS host FROM mysql.user WHERE (User = 'root' AND Host <> 'localhost') OR User = ''",
  );
  for (const r of rows) await c.query(`DROP USER ${c.escape(r.user)}@${c.escape(r.host)}`);
  await c.query(`ALTER USER 'root'@'localhost' IDENTIFIED BY ${c.escape(rootPassword())}`);
  log("MariaDB: root now needs the password in .data/db-root-password and the socket; root over TCP is gone.");
}

/** The statements a new data folder runs at its first start, before it takes a connection. */
function initStatements() {
  const hosts = ["127.0.0.1", "::1", hostname().toLowerCase()].filter((h) => h && h !== "localhost");
  const q = (s) => `'${s.replace(/\\/g, "\\\\").replace(/'/g, "''")}'`;
  return [
    ...hosts.map((h) => `DROP USER IF EXISTS 'root'@${q(h)};`),
    `ALTER USER 'root'@'localhost' IDENTIFIED BY ${q(rootPassword())};`,
  ].join("\n");
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
      if (e instanceof Error && e.message.startsWith("MariaDB refuses root")) throw e;
      await sleep(100);
    }
  }
  const tail = existsSync(paths(db).log) ? readFileSync(paths(db).log, "utf8").split("\n").slice(-15).join("\n") : "";
  throw new Error(`MariaDB did not become ready in ${timeout_ms} ms (${lastError?.message}).\n${tail}`);
}

/** uid and gid of a local account (from /etc/passwd), or null when it does not exist. */
export function account(name) {
  try {
    const line = readFileSync("/etc/passwd", "utf8")
      .split("\n")
      .find((l) => l.startsWith(`${name}:`));
    if (!line) return null;
    const [, , uid, gid] = line.split(":");
    return { name, uid: Number(uid), gid: Number(gid) };
  } catch {
    return null;
  }
}

/**
 * Who the server runs as: the current user when this script is not root (it cannot switch), else
 * Debian's unprivileged `mysql` account (installed with mariadb-server).
 */
function serverAccount() {
  if (!isRoot) return null;
  const mysql = account("mysql");
  if (!mysql) log("MariaDB: there is no `mysql` account on this machine; the server runs as root.");
  return mysql;
}

/** Whether an account may enter a folder (owner, group or other search bit; ACLs aside). */
function canSearch(dir, who) {
  const st = statSync(dir);
  if (st.uid === who.uid) return (st.mode & 0o100) !== 0;
  if (st.gid === who.gid) return (st.mode & 0o010) !== 0;
  return (st.mode & 0o001) !== 0;
}

/** The first folder above `dir` that the account cannot enter, or null when the path is open to it. */
export function blockingAncestor(dir, who) {
  for (let d = dirname(resolve(dir)); ; d = dirname(d)) {
    if (!canSearch(d, who)) return d;
    if (d === dirname(d)) return null;
  }
}

/**
 * Makes a server's folder usable by the account it runs as. The checkout's `.data/` gets the
 * search bit for others (its secrets are 0600 files). When a folder above the checkout is closed
 * to that account (a checkout under /root, say), the server's files move to
 * /var/lib/tapwright/<id>, and `.data/mariadb` (or `.data/redis`) becomes a link to it, so every
 * path stays the same. Shared with the private Redis, which runs as `redis` the same way.
 */
export function placeFolder(dir, who, label = "MariaDB") {
  const parent = dirname(resolve(dir));
  mkdirSync(parent, { recursive: true });
  const st = statSync(parent);
  if ((st.mode & 0o001) === 0) chmodSync(parent, (st.mode & 0o7777) | 0o001);
  const linked = existsSync(dir) && lstatSync(dir).isSymbolicLink();
  const blocked = linked ? null : blockingAncestor(dir, who);
  if (blocked) {
    const target = join(
      "/var/lib/tapwright",
      `${label.toLowerCase()}-${createHash("sha256").update(resolve(dir)).digest("hex").slice(0, 12)}`,
    );
    log(
      `${label}: ${blocked} is closed to the ${who.name} account, so the server's files live in ${target} (linked from ${dir}).`,
    );
    mkdirSync(dirname(target), { recursive: true, mode: 0o755 });
    if (existsSync(dir)) {
      rmSync(target, { recursive: true, force: true });
      try {
        renameSync(dir, target);
      } catch (e) {
        if (e.code !== "EXDEV") throw e;
        cpSync(dir, target, { recursive: true, preserveTimestamps: true });
        rmSync(dir, { recursive: true, force: true });
      }
    } else {
      mkdirSync(target, { recursive: true });
    }
    symlinkSync(target, dir);
  }
  mkdirSync(dir, { recursive: true });
}

/** Gives the server's folder to the account it runs as (older checkouts' files belong to root). */
function ownFolder(p, who) {
  mkdirSync(p.files, { recursive: true, mode: 0o700 });
  const owned = (f) => !existsSync(f) || statSync(f).uid === who.uid;
  if ([p.dir, p.data, p.files, p.log].every(owned)) return;
  execFileSync("chown", ["-R", `${who.uid}:${who.gid}`, p.dir]);
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
      else if (Date.now() > until)
        throw new Error(`MariaDB start lock ${lock} is held; remove it if no start is running.`);
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

/** The uid a process runs as (Linux's /proc), or null when it cannot be read. */
export function processUid(pid) {
  try {
    const line = readFileSync(`/proc/${pid}/status`, "utf8").match(/^Uid:\s+(\d+)/m);
    return line ? Number(line[1]) : null;
  } catch {
    return null;
  }
}

/** Starts the private server (or reuses the running one); says which. */
export async function startMariadb(db) {
  ensureMariadbInstalled();
  const who = serverAccount();
  if (who) placeFolder(db.dir, who);
  else mkdirSync(db.dir, { recursive: true });
  const p = paths(db);
  return withLock(db, async () => {
    const pid = runningPid(db);
    if (pid) {
      const port = existsSync(p.portFile) ? Number(readFileSync(p.portFile, "utf8")) : db.port;
      const uid = processUid(pid);
      if (port === db.port && !(who && uid !== null && uid !== who.uid)) {
        await waitUntilReady(db, 10_000);
        log(`MariaDB: reusing the running server (pid ${pid}, 127.0.0.1:${db.port}).`);
        return { pid, reused: true };
      }
      log(
        port !== db.port
          ? `MariaDB: the running server listens on ${port}, not ${db.port}; restarting it.`
          : `MariaDB: the running server runs as uid ${uid}; restarting it as ${who.name}.`,
      );
      await stopMariadb(db);
    }
    if (who) ownFolder(p, who);
    else mkdirSync(p.files, { recursive: true, mode: 0o700 });
    const user = who ? [`--user=${who.name}`] : isRoot ? ["--user=root"] : [];
    const fresh = !existsSync(join(p.data, "mysql"));
    if (fresh) {
      log(`MariaDB: initialising a data folder in ${p.data}…`);
      mkdirSync(p.data, { recursive: true });
      if (who) chownSync(p.data, who.uid, who.gid);
      execFileSync(
        which("mariadb-install-db"),
        [
          "--no-defaults",
          ...user,
          `--datadir=${p.data}`,
          "--auth-root-authentication-method=normal",
          "--skip-test-db",
          "--skip-name-resolve",
        ],
        { stdio: ["ignore", "ignore", "inherit"] },
      );
      // A new server secures root before it takes its first connection.
      writeFileSync(p.init, initStatements(), { mode: 0o600 });
      if (who) chownSync(p.init, who.uid, who.gid);
    }
    const testSpeed =
      process.env.TAPWRIGHT_DB_FAST === "1"
        ? [
            "--innodb-buffer-pool-size=16M",
            "--innodb-log-file-size=8M",
            "--innodb-flush-log-at-trx-commit=0",
            "--innodb-doublewrite=0",
          ]
        : [];
    const child = spawn(
      which("mariadbd"),
      [
        "--no-defaults",
        ...user,
        `--datadir=${p.data}`,
        `--socket=${p.socket}`,
        `--port=${db.port}`,
        "--bind-address=127.0.0.1",
        `--pid-file=${p.pid}`,
        `--log-error=${p.log}`,
        `--secure-file-priv=${p.files}`,
        ...(fresh ? [`--init-file=${p.init}`] : []),
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
    try {
      await waitUntilReady(db, 30_000);
    } finally {
      rmSync(p.init, { force: true });
    }
    log(
      `MariaDB: started (pid ${child.pid}${who ? `, as ${who.name}` : ""}) on 127.0.0.1:${db.port}, data in ${p.data}.`,
    );
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
