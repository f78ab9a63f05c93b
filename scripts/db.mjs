#!/usr/bin/env node
// `node scripts/db.mjs start|stop|status`: the private MariaDB of this checkout, by hand.
import { ensureNpmPackages } from "./lib/deps.mjs";
import { settings } from "./lib/config.mjs";

ensureNpmPackages();
const { startMariadb, stopMariadb, ensureDatabase, runningPid } = await import("./lib/mariadb.mjs");
const { db } = settings(process.env.TAPWRIGHT_MODE ?? "dev");
const command = process.argv[2] ?? "status";
try {
  if (command === "start") {
    await startMariadb(db);
    await ensureDatabase(db);
  } else if (command === "stop") {
    await stopMariadb(db);
  } else if (command === "status") {
    const pid = runningPid(db);
    console.log(pid ? `running: pid ${pid}, 127.0.0.1:${db.port}` : "not running");
  } else {
    console.error("usage: node scripts/db.mjs start|stop|status");
    process.exit(2);
  }
} catch (e) {
  console.error(`[tapwright] ${e.message}`);
  process.exit(1);
}
