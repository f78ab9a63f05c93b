// People, their sessions and credentials (the tables better-auth reads and writes), roles,
// invitations and API tokens.
import { bigint, boolean, index, int, mysqlEnum, mysqlTable, timestamp, varchar } from "drizzle-orm/mysql-core";
import { roles } from "@/features/people/people";
import { timestamps } from "./columns";

export const users = mysqlTable("users", {
  id: varchar("id", { length: 36 }).primaryKey(),
  name: varchar("name", { length: 200 }).notNull(),
  email: varchar("email", { length: 254 }).notNull().unique(),
  emailVerified: boolean("email_verified").notNull().default(false),
  image: varchar("image", { length: 1000 }),
  role: mysqlEnum("role", roles).notNull().default("designer"),
  /** Set when an admin offboards the person: they cannot sign in, and their sessions and tokens are gone. */
  deactivatedAt: timestamp("deactivated_at", { fsp: 3 }),
  ...timestamps,
});

export const sessions = mysqlTable(
  "sessions",
  {
    id: varchar("id", { length: 36 }).primaryKey(),
    token: varchar("token", { length: 255 }).notNull().unique(),
    userId: varchar("user_id", { length: 36 })
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: timestamp("expires_at", { fsp: 3 }).notNull(),
    ipAddress: varchar("ip_address", { length: 64 }),
    userAgent: varchar("user_agent", { length: 500 }),
    ...timestamps,
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

export const accounts = mysqlTable(
  "accounts",
  {
    id: varchar("id", { length: 36 }).primaryKey(),
    accountId: varchar("account_id", { length: 255 }).notNull(),
    providerId: varchar("provider_id", { length: 64 }).notNull(),
    userId: varchar("user_id", { length: 36 })
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    accessToken: varchar("access_token", { length: 2000 }),
    refreshToken: varchar("refresh_token", { length: 2000 }),
    idToken: varchar("id_token", { length: 4000 }),
    accessTokenExpiresAt: timestamp("access_token_expires_at", { fsp: 3 }),
    refreshTokenExpiresAt: timestamp("refresh_token_expires_at", { fsp: 3 }),
    scope: varchar("scope", { length: 1000 }),
    password: varchar("password", { length: 255 }),
    ...timestamps,
  },
  (t) => [index("accounts_user_idx").on(t.userId)],
);

export const verifications = mysqlTable("verifications", {
  id: varchar("id", { length: 36 }).primaryKey(),
  identifier: varchar("identifier", { length: 255 }).notNull(),
  value: varchar("value", { length: 2000 }).notNull(),
  expiresAt: timestamp("expires_at", { fsp: 3 }).notNull(),
  ...timestamps,
});

/** Sign-in attempts per client and route, kept in the database so limits survive restarts. */
export const rateLimits = mysqlTable("rate_limits", {
  id: varchar("id", { length: 36 }).primaryKey(),
  key: varchar("key", { length: 255 }).notNull().unique(),
  count: int("count").notNull(),
  lastRequest: bigint("last_request", { mode: "number" }).notNull(),
});

/** An admin's invitation: the link carries the secret, the table only its SHA-256. */
export const invitations = mysqlTable("invitations", {
  id: int("id").autoincrement().primaryKey(),
  email: varchar("email", { length: 254 }).notNull(),
  role: mysqlEnum("role", roles).notNull(),
  tokenHash: varchar("token_hash", { length: 64 }).notNull().unique(),
  invitedBy: varchar("invited_by", { length: 36 })
    .notNull()
    .references(() => users.id),
  expiresAt: timestamp("expires_at", { fsp: 3 }).notNull(),
  acceptedAt: timestamp("accepted_at", { fsp: 3 }),
  ...timestamps,
});

/** API tokens for scripts (`Authorization: Bearer …`): the secret is shown once, stored hashed. */
export const apiTokens = mysqlTable(
  "api_tokens",
  {
    id: int("id").autoincrement().primaryKey(),
    userId: varchar("user_id", { length: 36 })
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    name: varchar("name", { length: 100 }).notNull(),
    prefix: varchar("prefix", { length: 16 }).notNull(),
    secretHash: varchar("secret_hash", { length: 64 }).notNull().unique(),
    lastUsedAt: timestamp("last_used_at", { fsp: 3 }),
    /** After this the token is refused; null for a token that lasts until revoked. */
    expiresAt: timestamp("expires_at", { fsp: 3 }),
    revokedAt: timestamp("revoked_at", { fsp: 3 }),
    revokedBy: varchar("revoked_by", { length: 36 }),
    ...timestamps,
  },
  (t) => [index("api_tokens_user_idx").on(t.userId)],
);

export type User = typeof users.$inferSelect;
export type ApiToken = typeof apiTokens.$inferSelect;
