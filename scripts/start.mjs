#!/usr/bin/env node
// `npm start`: install what is missing, start the private MariaDB (and, with TAPWRIGHT_QUEUE=bullmq,
// the private Redis and one worker), migrate, seed the demo, build and serve on http://$HOST:$PORT.
// Ctrl-C stops the web server; `npm run db:stop` stops the database and Redis.
import { ensureNpmPackages } from "./lib/deps.mjs";
import { settings } from "./lib/config.mjs";
import { log } from "./lib/log.mjs";
import { demoWanted } from "./lib/demo.mjs";

try {
  ensureNpmPackages();
  const cfg = settings("dev");
  const { startMariadb, ensureDatabase } = await import("./lib/mariadb.mjs");
  const { migrate } = await import("./lib/migrate.mjs");
  const { build, seed, serve } = await import("./lib/server.mjs");

  await startMariadb(cfg.db);
  await ensureDatabase(cfg.db);
  if (cfg.queue === "bullmq" && cfg.redis.private) {
    const { startRedis } = await import("./lib/redis.mjs");
    await startRedis(cfg.redis);
  }
  await migrate(cfg.env.DATABASE_URL);
  const demo = demoWanted({ ...process.env, HOST: cfg.host });
  if (demo.seed) seed(cfg.env);
  else log(`Demo data: not seeded (${demo.why}).`);
  let smtp = null;
  if (cfg.smtp.fake) {
    const { startFakeSmtp } = await import("./lib/fake-smtp.mjs");
    smtp = await startFakeSmtp({ port: cfg.smtp.port, databaseUrl: cfg.env.DATABASE_URL });
  }
  build(cfg.env);
  const server = await serve(cfg.env);
  log(
    `Tapwright is ready: ${cfg.env.BETTER_AUTH_URL} (Ctrl-C stops it; MariaDB keeps running until \`npm run db:stop\`).`,
  );
  // With the distributed queue this machine also runs one worker (unless TAPWRIGHT_LOCAL_WORKER=0);
  // more machines add theirs with `npm run worker`.
  let worker = null;
  if (cfg.queue === "bullmq") {
    const where = new URL(cfg.redis.url);
    if (process.env.TAPWRIGHT_LOCAL_WORKER !== "0") {
      const { startWorker } = await import("./lib/worker.mjs");
      worker = startWorker(cfg.env);
    }
    log(
      `Jobs go to BullMQ on Redis at ${where.host}${worker ? ", computed by a worker on this machine" : ""}; add workers with \`npm run worker\` (here or on any machine that reaches Redis and MariaDB).`,
    );
  }
  const stop = async () => {
    worker?.kill("SIGTERM");
    server.kill("SIGTERM");
    await smtp?.close();
    process.exit(0);
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
  server.on("exit", (code) => {
    log(`The web server exited (code ${code}).`);
    process.exit(code ?? 1);
  });
} catch (e) {
  console.error(`[tapwright] ${e.message}`);
  process.exit(1);
}
