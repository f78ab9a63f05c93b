// The private Redis of this checkout, for the distributed job queue (BullMQ): installed from Debian's
// `redis-server` package when missing, listening on 127.0.0.1:$port only and asking for the
// checkout's password (.data/redis-password, 0600), its data in a git-ignored folder with
// append-only persistence. Idempotent like the MariaDB one: a running server is reused,
// a stale pid file is cleaned, and a kill -9 leaves an append-only file that the next start replays.
// When this script runs as root, the server runs as Debian's unprivileged `redis` account (as
// mariadbd runs as `mysql`), its folder owned by that account.
import { execFileSync, spawn } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { connect } from "node:net";
import { join } from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { log } from "./log.mjs";
import { account, aptInstall, placeFolder, processUid } from "./mariadb.mjs";
import { alive, isRoot, which, withLockFile } from "./processes.mjs";

export function ensureRedisInstalled() {
  if (which("redis-server")) return;
  aptInstall(["redis-server"], "Redis is not installed (the distributed job queue needs it)");
  if (!which("redis-server")) throw new Error("redis-server is still missing after apt-get install.");
}

/**
 * Who the server runs as: the current user when this script is not root (it cannot switch), else
 * the `redis` account that Debian's redis-server package creates.
 */
function serverAccount() {
  if (!isRoot) return null;
  const redis = account("redis");
  if (!redis) log("Redis: there is no `redis` account on this machine; the server runs as root.");
  return redis;
}

/** Gives the server's folder to the account it runs as (older checkouts' files belong to root). */
function ownFolder(redis, who) {
  const p = paths(redis);
  mkdirSync(p.data, { recursive: true });
  const owned = (f) => !existsSync(f) || statSync(f).uid === who.uid;
  if ([redis.dir, p.data, p.log, join(p.data, "appendonlydir")].every(owned)) return;
  execFileSync("chown", ["-R", `${who.uid}:${who.gid}`, redis.dir]);
}

function paths(redis) {
  return {
    data: join(redis.dir, "data"),
    pid: join(redis.dir, "redis.pid"),
    portFile: join(redis.dir, "port"),
    log: join(redis.dir, "redis.log"),
    lock: join(redis.dir, "start.lock"),
  };
}

const resp = (args) => `*${args.length}\r\n${args.map((a) => `$${Buffer.byteLength(a)}\r\n${a}\r\n`).join("")}`;

/**
 * Sends one command (RESP) after AUTH with the checkout's password, and resolves with the first line
 * of its reply ("+PONG", "+OK", "-ERR …"), or with "" when the server closes the connection without
 * answering (SHUTDOWN does). A refused AUTH resolves with AUTH's own error line.
 */
export function redisCommand(redis, args, timeout_ms = 2000) {
  return new Promise((resolve, reject) => {
    const socket = connect({ host: "127.0.0.1", port: redis.port });
    const lines = [];
    let buffer = "";
    const expected = redis.password ? 2 : 1;
    const timer = setTimeout(() => {
      socket.destroy();
      reject(new Error(`Redis on 127.0.0.1:${redis.port} did not answer ${args[0]} within ${timeout_ms} ms.`));
    }, timeout_ms);
    const done = (fn) => {
      clearTimeout(timer);
      socket.destroy();
      fn();
    };
    const answer = () => {
      if (redis.password && lines[0] !== undefined && lines[0] !== "+OK") return lines[0];
      return lines[expected - 1] ?? "";
    };
    socket.on("connect", () => {
      socket.write((redis.password ? resp(["AUTH", redis.password]) : "") + resp(args));
    });
    socket.on("data", (chunk) => {
      buffer += chunk.toString("utf8");
      let end;
      while ((end = buffer.indexOf("\r\n")) >= 0 && lines.length < expected) {
        lines.push(buffer.slice(0, end));
        buffer = buffer.slice(end + 2);
      }
      if (lines.length >= expected || (redis.password && lines[0] !== undefined && lines[0] !== "+OK"))
        done(() => resolve(answer()));
    });
    socket.on("close", () => done(() => resolve(answer())));
    socket.on("error", (e) => done(() => reject(e)));
  });
}

/** The pid of this checkout's running Redis (of `redis.dir`), or null (a stale pid file is removed). */
export function runningRedisPid(redis) {
  const p = paths(redis);
  if (!existsSync(p.pid)) return null;
  const pid = Number(readFileSync(p.pid, "utf8").trim());
  if (Number.isInteger(pid) && pid > 0 && alive(pid)) return pid;
  log("Redis: removing a stale pid file (the server is not running).");
  rmSync(p.pid, { force: true });
  return null;
}

async function waitUntilReady(redis, timeout_ms) {
  const until = Date.now() + timeout_ms;
  let last = "";
  while (Date.now() < until) {
    try {
      // A server still replaying its append-only file answers -LOADING; wait for +PONG.
      last = await redisCommand(redis, ["PING"]);
      if (last === "+PONG") return;
      if (/^-(WRONGPASS|ERR AUTH|NOAUTH)/.test(last))
        throw new Error(`Redis refuses the checkout's password (${last}).`);
    } catch (e) {
      if (e.message.startsWith("Redis refuses")) throw e;
      last = e.message;
    }
    await sleep(50);
  }
  const tail = existsSync(paths(redis).log)
    ? readFileSync(paths(redis).log, "utf8").split("\n").slice(-15).join("\n")
    : "";
  throw new Error(`Redis did not become ready on 127.0.0.1:${redis.port} in ${timeout_ms} ms (${last}).\n${tail}`);
}

/** Starts the private Redis (or reuses the running one); `fresh` empties it (the test queue). */
export async function startRedis(redis, { fresh = false } = {}) {
  ensureRedisInstalled();
  const who = serverAccount();
  if (who) placeFolder(redis.dir, who, "Redis");
  else mkdirSync(redis.dir, { recursive: true });
  const p = paths(redis);
  const result = await withLockFile(p.lock, "Redis", async () => {
    const pid = runningRedisPid(redis);
    if (pid) {
      const port = existsSync(p.portFile) ? Number(readFileSync(p.portFile, "utf8")) : redis.port;
      const uid = processUid(pid);
      let restart = `the running server listens on ${port}, not ${redis.port}`;
      if (port === redis.port && who && uid !== null && uid !== who.uid) {
        restart = `the running server runs as uid ${uid}, not as ${who.name}`;
      } else if (port === redis.port) {
        try {
          await waitUntilReady(redis, 10_000);
          log(`Redis: reusing the running server (pid ${pid}, 127.0.0.1:${redis.port}).`);
          return { pid, reused: true };
        } catch (e) {
          if (!e.message.startsWith("Redis refuses")) throw e;
          restart = "the running server was started without the checkout's password";
        }
      }
      log(`Redis: ${restart}; restarting it.`);
      await stopRedis(redis);
    }
    if (who) ownFolder(redis, who);
    else mkdirSync(p.data, { recursive: true });
    const child = spawn(
      which("redis-server"),
      [
        "--port",
        String(redis.port),
        "--bind",
        "127.0.0.1",
        "--protected-mode",
        "yes",
        "--dir",
        p.data,
        // Every write goes to the append-only file, flushed to disk every second; no RDB snapshots.
        "--appendonly",
        "yes",
        "--appendfsync",
        "everysec",
        "--save",
        "",
        // BullMQ needs every key kept: refuse writes rather than evict when memory is full.
        "--maxmemory-policy",
        "noeviction",
        ...(redis.password ? ["--requirepass", redis.password] : []),
        "--daemonize",
        "no",
        "--pidfile",
        p.pid,
        "--logfile",
        p.log,
      ],
      { detached: true, stdio: "ignore", ...(who ? { uid: who.uid, gid: who.gid } : {}) },
    );
    child.unref();
    writeFileSync(p.portFile, String(redis.port));
    try {
      await waitUntilReady(redis, 30_000);
    } catch (e) {
      if (child.exitCode === null) child.kill("SIGKILL");
      throw e;
    }
    // redis-server writes its pid file itself; write it too so a fast stop after start finds it.
    writeFileSync(p.pid, String(child.pid));
    log(
      `Redis: started (pid ${child.pid}${who ? `, as ${who.name}` : ""}) on 127.0.0.1:${redis.port}, data in ${p.data}.`,
    );
    return { pid: child.pid, reused: false };
  });
  if (fresh) {
    const r = await redisCommand(redis, ["FLUSHALL"]);
    if (r !== "+OK") throw new Error(`Redis FLUSHALL answered ${r}.`);
  }
  return result;
}

/** Stops the private Redis with SHUTDOWN (which flushes the append-only file) and waits for it. */
export async function stopRedis(redis) {
  const pid = runningRedisPid(redis);
  if (!pid) {
    log("Redis: not running.");
    return;
  }
  // SHUTDOWN answers nothing when it works; on any answer (or none at all) SIGTERM does the same.
  const reply = await redisCommand(redis, ["SHUTDOWN"], 10_000).catch(() => "no answer");
  if (reply !== "") process.kill(pid, "SIGTERM");
  const until = Date.now() + 20_000;
  while (alive(pid) && Date.now() < until) await sleep(50);
  if (alive(pid)) throw new Error(`Redis (pid ${pid}) did not stop within 20 s.`);
  rmSync(paths(redis).pid, { force: true });
  log(`Redis: stopped (pid ${pid}).`);
}
