// drizzle-kit: generates SQL migrations from src/db/schema into drizzle/ (`npm run db:generate`).
import { defineConfig } from "drizzle-kit";
import { settings } from "./scripts/lib/config.mjs";

export default defineConfig({
  dialect: "mysql",
  schema: "./src/db/schema/index.ts",
  out: "./drizzle",
  // The private database's address with this checkout's generated password, unless DATABASE_URL is set.
  dbCredentials: { url: process.env.DATABASE_URL ?? settings("dev").env.DATABASE_URL },
});
