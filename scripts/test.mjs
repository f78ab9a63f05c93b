#!/usr/bin/env node
// `npm test`: lint (`npm run lint`, whole runs only), then the same set-up as `npm start` on a
// separate test database (and ports), then every suite — unit, integration against MariaDB and
// the running server, browser tests in Chromium — ending with the line `N passed, N failed[, N
// skipped]`. Extra arguments go to vitest as filters (and skip the lint and the type check).
import { spawn, spawnSync } from "node:child_process";
import { mkdirSync, readFileSync, existsSync, rmSync } from "node:fs";
import { join } from "node:path";
import { ensureChromium, ensureNpmPackages, chromiumPath } from "./lib/deps.mjs";
import { root, settings } from "./lib/config.mjs";
import { log } from "./lib/log.mjs";

const outDir = join(root, "tests", "output");
const report = join(outDir, "vitest.json");

function summarize() {
  if (!existsSync(report)) return { passed: 0, failed: 1, skipped: 0 };
  const r = JSON.parse(readFileSync(report, "utf8"));
  // A file that fails to load has no test results; count it as one failure.
  const brokenFiles = r.testResults.filter((f) => f.status === "failed" && f.assertionResults.length === 0).length;
  return {
    passed: r.numPassedTests,
    failed: r.numFailedTests + brokenFiles,
    skipped: r.numPendingTests + r.numTodoTests,
  };
}

let cleanup = async () => {};
let code = 1;
const wholeSuite = process.argv.length <= 2;
try {
  ensureNpmPackages();
  // Lint first (ESLint: typescript-eslint, the import boundaries, React's hooks rules; then
  // Prettier's check of the formatting); it counts as one more test of the whole suite, like the
  // type check at the end.
  let lintPassed = null;
  if (wholeSuite && process.env.TAPWRIGHT_SKIP_LINT !== "1") {
    log("Linting (npm run lint)…");
    lintPassed = spawnSync("npm", ["run", "--silent", "lint"], { cwd: root, stdio: "inherit" }).status === 0;
  }
  await ensureChromium();
  process.env.TAPWRIGHT_DB_FAST ??= "1";
  const cfg = settings("test");
  const { startMariadb, ensureDatabase, stopMariadb } = await import("./lib/mariadb.mjs");
  const { migrate } = await import("./lib/migrate.mjs");
  const { startFakeSmtp } = await import("./lib/fake-smtp.mjs");
  const { build, seed, serve } = await import("./lib/server.mjs");

  const env = {
    ...cfg.env,
    TAPWRIGHT_SIGN_IN_LIMIT: process.env.TAPWRIGHT_SIGN_IN_LIMIT ?? "1000/60",
    TAPWRIGHT_INVITE_LIMIT: process.env.TAPWRIGHT_INVITE_LIMIT ?? "1000/60",
    // A short lease, so the fault tests see a job taken over within seconds of its server dying.
    TAPWRIGHT_JOB_LOCK_S: process.env.TAPWRIGHT_JOB_LOCK_S ?? "10",
  };
  const { startRedis, stopRedis } = await import("./lib/redis.mjs");
  const database = await startMariadb(cfg.db);
  await ensureDatabase(cfg.db, { fresh: true });
  // The distributed queue's tests run their own servers and workers against this private Redis.
  const redis = await startRedis(cfg.redis, { fresh: true });
  await migrate(env.DATABASE_URL);
  seed(env);
  const smtp = await startFakeSmtp({ port: cfg.smtp.port, databaseUrl: env.DATABASE_URL });
  if (process.env.TAPWRIGHT_SKIP_BUILD !== "1") build(env);
  const server = await serve(env, { quiet: true });
  log(`Test server on ${env.BETTER_AUTH_URL}; running every suite…`);
  cleanup = async () => {
    server.kill("SIGTERM");
    await smtp.close();
    if (!redis.reused) await stopRedis(cfg.redis);
    if (!database.reused) await stopMariadb(cfg.db);
  };

  mkdirSync(outDir, { recursive: true });
  rmSync(report, { force: true });
  // Asynchronous on purpose: the fake SMTP server lives in this process and must keep answering.
  const vitest = spawn(
    join(root, "node_modules", ".bin", "vitest"),
    [
      "run",
      "--config",
      "tests/vitest.config.ts",
      "--reporter=default",
      "--reporter=json",
      `--outputFile.json=${report}`,
      ...process.argv.slice(2),
    ],
    {
      cwd: root,
      stdio: "inherit",
      env: {
        ...process.env,
        ...env,
        TAPWRIGHT_BASE_URL: env.BETTER_AUTH_URL,
        TAPWRIGHT_DB_DIR: cfg.db.dir,
        TAPWRIGHT_REDIS_DIR: cfg.redis.dir,
        REDIS_PORT: String(cfg.redis.port),
        REDIS_URL: cfg.redis.url,
        DEMO_PASSWORD: process.env.DEMO_PASSWORD ?? "tapwright-demo",
        CHROMIUM_PATH: chromiumPath,
      },
    },
  );
  await new Promise((resolve) => vitest.once("exit", resolve));
  const s = summarize();
  if (lintPassed !== null) {
    if (lintPassed) s.passed += 1;
    else s.failed += 1;
  }
  // The type check counts as one more test: pages, islands, lib and tests must all type-check.
  if (wholeSuite && process.env.TAPWRIGHT_SKIP_TYPECHECK !== "1") {
    log("Type-checking (astro check)…");
    const check = spawnSync(join(root, "node_modules", ".bin", "astro"), ["check", "--minimumSeverity", "error"], {
      cwd: root,
      stdio: "inherit",
      env: { ...process.env, ASTRO_TELEMETRY_DISABLED: "1" },
    });
    if (check.status === 0) s.passed += 1;
    else s.failed += 1;
  }
  code = s.failed > 0 || s.passed === 0 ? 1 : 0;
  await cleanup();
  console.log(`${s.passed} passed, ${s.failed} failed${s.skipped ? `, ${s.skipped} skipped` : ""}`);
} catch (e) {
  console.error(`[tapwright] ${e.message}`);
  await cleanup().catch(() => {});
  console.log("0 passed, 1 failed");
}
process.exit(code);
