// Sign-off of a tap table version: a request to a reviewer, threaded comments, the decision.
import { index, int, mysqlEnum, mysqlTable, text, timestamp, varchar } from "drizzle-orm/mysql-core";
import { signOffStates } from "@/features/signoff/signoff";
import { timestamps } from "./columns";
import { users } from "./auth";
import { tapTableVersions } from "./tapTables";

export const signOffs = mysqlTable(
  "sign_offs",
  {
    id: int("id").autoincrement().primaryKey(),
    versionId: int("version_id")
      .notNull()
      .references(() => tapTableVersions.id, { onDelete: "cascade" }),
    requestedBy: varchar("requested_by", { length: 36 })
      .notNull()
      .references(() => users.id),
    reviewerId: varchar("reviewer_id", { length: 36 })
      .notNull()
      .references(() => users.id),
    state: mysqlEnum("state", signOffStates).notNull().default("pending"),
    message: varchar("message", { length: 2000 }),
    decisionComment: varchar("decision_comment", { length: 4000 }),
    decidedAt: timestamp("decided_at", { fsp: 3 }),
    ...timestamps,
  },
  (t) => [index("sign_offs_version_idx").on(t.versionId), index("sign_offs_reviewer_idx").on(t.reviewerId, t.state)],
);

export const signOffComments = mysqlTable(
  "sign_off_comments",
  {
    id: int("id").autoincrement().primaryKey(),
    signOffId: int("sign_off_id")
      .notNull()
      .references(() => signOffs.id, { onDelete: "cascade" }),
    parentId: int("parent_id"),
    authorId: varchar("author_id", { length: 36 })
      .notNull()
      .references(() => users.id),
    /** The channel the comment is about, when it is about one. */
    channelName: varchar("channel_name", { length: 200 }),
    body: text("body").notNull(),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [index("sign_off_comments_idx").on(t.signOffId)],
);

export type SignOff = typeof signOffs.$inferSelect;
export type SignOffComment = typeof signOffComments.$inferSelect;
