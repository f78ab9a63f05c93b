// Link budgets: the `budget` object of the engine's optimize request (lib/contract/budget.ts), named.
import { int, json, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import type { Budget } from "@lib/contract/budget";
import { timestamps } from "./columns";
import { users } from "./auth";

export const budgets = mysqlTable("budgets", {
  id: int("id").autoincrement().primaryKey(),
  name: varchar("name", { length: 200 }).notNull().unique(),
  description: varchar("description", { length: 2000 }),
  /** Validated with lib/contract/budget.ts before every write. */
  params: json("params").$type<Budget>().notNull(),
  createdBy: varchar("created_by", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
  ...timestamps,
});

export type BudgetRow = typeof budgets.$inferSelect;
