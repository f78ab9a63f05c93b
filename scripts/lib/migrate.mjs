// Applies the SQL migrations in drizzle/ to the configured database (drizzle-orm's migrator).
import { join } from "node:path";
import { root } from "./config.mjs";
import { log } from "./log.mjs";

export async function migrate(databaseUrl) {
  const mysql = await import("mysql2/promise");
  const { drizzle } = await import("drizzle-orm/mysql2");
  const { migrate: run } = await import("drizzle-orm/mysql2/migrator");
  const connection = await mysql.createConnection({ uri: databaseUrl, multipleStatements: true });
  try {
    await run(drizzle(connection), { migrationsFolder: join(root, "drizzle") });
    log("Database migrated.");
  } finally {
    await connection.end();
  }
}
