// Column groups shared by the tables of every domain.
import { timestamp } from "drizzle-orm/mysql-core";

/** `created_at` / `updated_at` with millisecond precision, kept by the database. */
export const timestamps = {
  createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { fsp: 3 }).notNull().defaultNow().onUpdateNow(),
};
