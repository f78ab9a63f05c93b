#!/usr/bin/env node
// `npm start`: install what is missing, start the private MariaDB, migrate, seed the demo, build and
// serve on http://$HOST:$PORT. Ctrl-C stops the web server; `npm run db:stop` stops the database.
import { ensureNpmPackages } from "./lib/deps.mjs";
import { settings } from "./lib/config.mjs";
import { log } from "./lib/log.mjs";

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
  seed(cfg.env);
  let smtp = null;
  if (cfg.smtp.fake) {
    const { startFakeSmtp } = await import("./lib/fake-smtp.mjs");
    smtp = await startFakeSmtp({ port: cfg.smtp.port, databaseUrl: cfg.env.DATABASE_URL });
  }
  build(cfg.env);
  const server = await serve(cfg.env);
  log(`Tapwright is ready: ${cfg.env.BETTER_AUTH_URL} (Ctrl-C stops it; MariaDB keeps running until \`npm run db:stop\`).`);
  if (cfg.queue === "bullmq") {
    const where = new URL(cfg.redis.url);
    log(`Jobs go to BullMQ on Redis at ${where.host}; start workers with \`npm run worker\` (here or on any machine that reaches Redis and MariaDB).`);
  }
  const stop = async () => {
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
