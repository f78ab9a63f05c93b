// The one connection pool to MariaDB and the Drizzle client over it.
import { drizzle } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import * as schema from "@/db/schema";
import { config } from "./config.server";

function databaseUrl(): string {
  const url = config.databaseUrl;
  if (!url) throw new Error("DATABASE_URL is not set; start the app with `npm start`.");
  return url;
}

const globalForDb = globalThis as unknown as { tapwrightPool?: mysql.Pool };

/** The shared pool (one per process; reused across hot reloads in development). */
export const pool: mysql.Pool =
  globalForDb.tapwrightPool ??
  (globalForDb.tapwrightPool = mysql.createPool({
    uri: databaseUrl(),
    connectionLimit: 10,
    timezone: "Z",
    dateStrings: false,
  }));

export const db = drizzle(pool, { schema, mode: "default" });
export type Db = typeof db;
/** A transaction handle, for services that take part in a caller's transaction. */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
export type DbOrTx = Db | Tx;
