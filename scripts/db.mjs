#!/usr/bin/env node
// `node scripts/db.mjs start|stop|status`: the private MariaDB of this checkout, by hand; `stop` (and
// `status`) also cover the private Redis of the distributed queue.
import { ensureNpmPackages } from "./lib/deps.mjs";
import { settings } from "./lib/config.mjs";

ensureNpmPackages();
const { startMariadb, stopMariadb, ensureDatabase, runningPid } = await import("./lib/mariadb.mjs");
const { runningRedisPid, stopRedis } = await import("./lib/redis.mjs");
const { db, redis } = settings(process.env.TAPWRIGHT_MODE ?? "dev");
const command = process.argv[2] ?? "status";
try {
  if (command === "start") {
    await startMariadb(db);
    await ensureDatabase(db);
  } else if (command === "stop") {
    await stopMariadb(db);
    if (runningRedisPid(redis)) await stopRedis(redis);
  } else if (command === "status") {
    const pid = runningPid(db);
    console.log(pid ? `MariaDB running: pid ${pid}, 127.0.0.1:${db.port}` : "MariaDB not running");
    const redisPid = runningRedisPid(redis);
    console.log(redisPid ? `Redis running: pid ${redisPid}, 127.0.0.1:${redis.port}` : "Redis not running");
  } else {
    console.error("usage: node scripts/db.mjs start|stop|status");
    process.exit(2);
  }
} catch (e) {
  console.error(`[tapwright] ${e.message}`);
  process.exit(1);
}
