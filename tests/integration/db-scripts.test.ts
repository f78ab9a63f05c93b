// The private-MariaDB scripts: starting twice gives one server; after kill -9 the next start
// comes back on the same data; stop ends the process; the server is locked down (root only through
// the socket with the generated password, no fixed application password, an unprivileged server
// process, secure_file_priv). Uses its own data folder and port.
import { execFileSync } from "node:child_process";
import { chmodSync, lstatSync, mkdtempSync, readFileSync, readlinkSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import mysql from "mysql2/promise";
import { afterAll, describe, expect, it } from "vitest";

const root = join(import.meta.dirname, "..", "..");
const dataDir = mkdtempSync(join(tmpdir(), "tapwright-db-"));
chmodSync(dataDir, 0o755); // a checkout's folder is open to other accounts; the closed case is tested below
// A port derived from the web port, so parallel test runs (other PORTs) do not collide.
const port = 20000 + (Number(process.env.PORT ?? 4399) % 1000);
const env = {
  ...process.env,
  TAPWRIGHT_DATA_DIR: dataDir,
  DB_PORT: String(port),
  DB_NAME: "scripts_check",
  TAPWRIGHT_DB_FAST: "0",
};
const db = (command: string) =>
  execFileSync(process.execPath, [join(root, "scripts", "db.mjs"), command], { env, encoding: "utf8" });
const pid = () => Number(readFileSync(join(dataDir, "mariadb", "mariadbd.pid"), "utf8").trim());
const alive = (p: number) => {
  try {
    process.kill(p, 0);
    return true;
  } catch {
    return false;
  }
};
const appPassword = () => readFileSync(join(dataDir, "db-password"), "utf8").trim();
const connect = () =>
  mysql.createConnection({
    host: "127.0.0.1",
    port,
    user: "tapwright",
    password: appPassword(),
    database: "scripts_check",
  });
const isRoot = process.getuid?.() === 0;
/** The error a connection attempt fails with (null when it succeeds). */
async function refusal(
  options: Parameters<typeof mysql.createConnection>[0],
): Promise<{ errno?: number; message: string } | null> {
  try {
    const c = await mysql.createConnection(options);
    await c.end();
    return null;
  } catch (e) {
    return e as { errno?: number; message: string };
  }
}

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

  it("root over TCP without a password is refused, and root over the socket needs the generated one", async () => {
    const tcp = await refusal({ host: "127.0.0.1", port, user: "root", password: "" });
    expect(tcp?.errno).toBe(1045); // ER_ACCESS_DENIED_ERROR
    const socket = join(dataDir, "mariadb", "mysql.sock");
    expect((await refusal({ socketPath: socket, user: "root", password: "" }))?.errno).toBe(1045);
    const rootPassword = readFileSync(join(dataDir, "db-root-password"), "utf8").trim();
    expect(rootPassword.length).toBeGreaterThanOrEqual(32);
    expect(await refusal({ host: "127.0.0.1", port, user: "root", password: rootPassword })).not.toBeNull();
    const c = await mysql.createConnection({ socketPath: socket, user: "root", password: rootPassword });
    const [accounts] = await c.query("SELECT User AS user, Host AS host FROM mysql.user WHERE User IN ('root', '')");
    const [[priv]] = (await c.query("SELECT @@secure_file_priv AS dir")) as unknown as [{ dir: string | null }[]];
    await c.end();
    expect(accounts).toEqual([{ user: "root", host: "localhost" }]);
    expect(priv.dir).toMatch(/mariadb\/files\/?$/);
  });

  it("the passwords live in .data with mode 0600; the application's is generated, not a fixed default", () => {
    for (const name of ["db-password", "db-root-password"]) {
      expect(statSync(join(dataDir, name)).mode & 0o777).toBe(0o600);
    }
    expect(appPassword()).not.toBe("tapwright-local");
    expect(appPassword().length).toBeGreaterThanOrEqual(32);
  });

  it.runIf(isRoot)("run as root, the server process runs as the unprivileged mysql account", () => {
    const uid = Number(/^Uid:\s+(\d+)/m.exec(readFileSync(`/proc/${pid()}/status`, "utf8"))![1]);
    const mysqlUid = Number(
      readFileSync("/etc/passwd", "utf8")
        .split("\n")
        .find((l) => l.startsWith("mysql:"))!
        .split(":")[2],
    );
    expect(uid).toBe(mysqlUid);
    expect(statSync(join(dataDir, "mariadb", "data")).uid).toBe(mysqlUid);
  });

  it("stop ends the server cleanly", () => {
    const p = pid();
    expect(db("stop")).toMatch(/stopped/);
    expect(alive(p)).toBe(false);
    expect(db("status")).toMatch(/not running/);
  });
});

describe("scripts/db.mjs in a checkout the mysql account cannot enter", () => {
  it.runIf(isRoot)("the server's files move to /var/lib/tapwright behind a link, and it runs as mysql", async () => {
    const closed = mkdtempSync(join(tmpdir(), "tapwright-closed-")); // mode 0700, owned by root
    const data = join(closed, "checkout", ".data");
    const env2 = { ...env, TAPWRIGHT_DATA_DIR: data, DB_PORT: String(port + 1) };
    const run = (command: string) =>
      execFileSync(process.execPath, [join(root, "scripts", "db.mjs"), command], { env: env2, encoding: "utf8" });
    let target = "";
    try {
      expect(run("start")).toMatch(/is closed to the mysql account/);
      expect(lstatSync(join(data, "mariadb")).isSymbolicLink()).toBe(true);
      target = readlinkSync(join(data, "mariadb"));
      expect(target).toMatch(/^\/var\/lib\/tapwright\/mariadb-[0-9a-f]{12}$/);
      const c = await mysql.createConnection({
        host: "127.0.0.1",
        port: port + 1,
        user: "tapwright",
        password: readFileSync(join(data, "db-password"), "utf8").trim(),
        database: "scripts_check",
      });
      await c.end();
    } finally {
      run("stop");
      if (target) rmSync(target, { recursive: true, force: true });
      rmSync(closed, { recursive: true, force: true });
    }
  });
});
