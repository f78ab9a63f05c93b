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

declare global {
  // The pool outlives module reloads in development: kept on the global object.
  var tapwrightPool: mysql.Pool | undefined;
}

/** The shared pool (one per process; reused across hot reloads in development). */
export const pool: mysql.Pool = (globalThis.tapwrightPool ??= mysql.createPool({
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
