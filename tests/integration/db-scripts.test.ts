// The private-MariaDB scripts: starting twice gives one server; after kill -9 the next start
// comes back on the same data; stop ends the process. Uses its own data folder and port.
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import mysql from "mysql2/promise";
import { afterAll, describe, expect, it } from "vitest";

const root = join(import.meta.dirname, "..", "..");
const dataDir = mkdtempSync(join(tmpdir(), "tapwright-db-"));
// A port derived from the web port, so parallel test runs (other PORTs) do not collide.
const port = 20000 + (Number(process.env.PORT ?? 4399) % 1000);
const env = { ...process.env, TAPWRIGHT_DATA_DIR: dataDir, DB_PORT: String(port), DB_NAME: "scripts_check", TAPWRIGHT_DB_FAST: "0" };
const db = (command: string) => execFileSync(process.execPath, [join(root, "scripts", "db.mjs"), command], { env, encoding: "utf8" });
const pid = () => Number(readFileSync(join(dataDir, "mariadb", "mariadbd.pid"), "utf8").trim());
const alive = (p: number) => {
  try {
    process.kill(p, 0);
    return true;
  } catch {
    return false;
  }
};
const connect = () => mysql.createConnection({ host: "127.0.0.1", port, user: "tapwright", password: "tapwright-local", database: "scripts_check" });

afterAll(() => {
  try {
    db("stop");
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
  }
});

describe("scripts/db.mjs", () => {
  it("start twice → one server", () => {
    expect(db("start")).toMatch(/started/);
    const first = pid();
    expect(db("start")).toMatch(/reusing the running server/);
    expect(pid()).toBe(first);
    expect(db("status")).toContain(`pid ${first}`);
  });

  it("start after kill -9 → the same data, and a stale pid file is handled", async () => {
    const c = await connect();
    await c.query("CREATE TABLE IF NOT EXISTS keepsake (v VARCHAR(20))");
    await c.query("INSERT INTO keepsake VALUES ('still here')");
    await c.end();
    const before = pid();
    process.kill(before, "SIGKILL");
    while (alive(before)) await new Promise((r) => setTimeout(r, 20));

    db("start");
    expect(pid()).not.toBe(before);
    const again = await connect();
    const [rows] = await again.query("SELECT v FROM keepsake");
    await again.end();
    expect(rows).toEqual([{ v: "still here" }]);
  });

  it("stop ends the server cleanly", () => {
    const p = pid();
    expect(db("stop")).toMatch(/stopped/);
    expect(alive(p)).toBe(false);
    expect(db("status")).toMatch(/not running/);
  });
});
