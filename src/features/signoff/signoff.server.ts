// Sign-off: a designer asks a reviewer to sign off a tap table version; the reviewer comments and
// approves (which freezes the version) or sends it back with a reason. Each request and decision
// is one transaction with its audit event and its e-mail (queued in the outbox, sent after commit).
import { and, asc, count, desc, eq, inArray, lt, or, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { db } from "@/server/db.server";
import { config } from "@/server/config.server";
import { signOffComments, signOffs, tapTables, tapTableVersions, users } from "@/db/schema";
import { conflict, forbidden, notFound, unprocessable } from "@/server/http/errors";
import { recordAudit } from "@/server/audit/audit.server";
import { deliverQueuedMail, enqueueMail } from "@/server/mail/mail.server";
import type { SessionUser } from "@/server/auth/sessionUser";
import { parseBudget } from "@/server/sources.server";
import type {
  CommentRequest,
  CommentView,
  DecisionRequest,
  Person,
  SignOffDetail,
  SignOffListItem,
  SignOffRequest,
  SignOffState,
} from "./signoff";
import { logError } from "@/server/http/logError";

const requester = alias(users, "requester");
const reviewer = alias(users, "reviewer");

function link(path: string): string {
  return new URL(path, config.publicUrl).toString();
}

/**
 * When the e-mail of an action leaves: right after the commit, or (the demo seed, which runs before
 * the mail server) with the server's next delivery pass.
 */
export type Delivery = "now" | "later";

/** Delivers the outbox after a commit (a pass already running is followed by another). */
function sendMailSoon() {
  void deliverQueuedMail().catch((e) => logError("mail delivery", e));
}

/** People who may decide a sign-off (reviewers and admins). */
export async function listReviewers(): Promise<(Person & { role: string })[]> {
  return db
    .select({ id: users.id, name: users.name, email: users.email, role: users.role })
    .from(users)
    .where(inArray(users.role, ["reviewer", "admin"]))
    .orderBy(asc(users.role), asc(users.name));
}

/** POST /api/v1/tap-tables/:id/versions/:v/sign-off: asks a reviewer; the version goes into review. */
export async function requestSignOff(
  user: SessionUser,
  tableId: number,
  v: number,
  req: SignOffRequest,
  delivery: Delivery = "now",
) {
  const id = await db.transaction(async (tx) => {
    const [row] = await tx
      .select({ version: tapTableVersions, table: tapTables })
      .from(tapTableVersions)
      .innerJoin(tapTables, eq(tapTables.id, tapTableVersions.tableId))
      .where(and(eq(tapTableVersions.tableId, tableId), eq(tapTableVersions.version, v)))
      .for("update");
    if (!row) throw notFound(`Version ${v} of tap table ${tableId}`);
    const { version, table } = row;
    if (version.state === "approved") throw conflict(`v${v} is already signed off and frozen.`);
    if (version.state === "in-review") throw conflict(`v${v} is already in review; wait for the decision.`);
    if (version.state === "computing") throw conflict(`v${v} is still computing; ask for sign-off when it is done.`);
    if (version.state === "failed") throw conflict(`v${v} failed to compute; there is nothing to sign off.`);
    const [who] = await tx.select().from(users).where(eq(users.id, req.reviewerId));
    if (!who) throw unprocessable("That reviewer was not found; choose someone from the list.", "reviewerId");
    if (who.role !== "reviewer" && who.role !== "admin") {
      throw unprocessable(`${who.name} is a ${who.role} and cannot decide sign-offs; choose a reviewer.`, "reviewerId");
    }
    if (who.id === user.id)
      throw unprocessable("You cannot sign off your own request; choose another reviewer.", "reviewerId");
    if (who.id === version.createdBy)
      throw unprocessable(
        `${who.name} built this version and cannot sign it off; choose another reviewer.`,
        "reviewerId",
      );
    const [{ id }] = await tx
      .insert(signOffs)
      .values({ versionId: version.id, requestedBy: user.id, reviewerId: who.id, message: req.message ?? null })
      .$returningId();
    await tx.update(tapTableVersions).set({ state: "in-review" }).where(eq(tapTableVersions.id, version.id));
    await enqueueMail(tx, {
      to: [who.email],
      subject: `Sign-off requested: ${table.name} v${v}`,
      text:
        `${user.name} (${user.email}) asks you to sign off the tap table “${table.name}”, version ${v}.\n\n` +
        (req.message ? `Their message:\n${req.message}\n\n` : "") +
        `Review each channel's limiter headroom and approve or send it back here:\n${link(`/sign-off/${id}`)}\n`,
    });
    await recordAudit(tx, user, "signoff.request", "sign-off", id, {
      table: table.name,
      tableId,
      version: v,
      reviewer: who.email,
    });
    return id;
  });
  if (delivery === "now") sendMailSoon();
  return { id, state: "pending" as const };
}

/** POST /api/v1/sign-offs/:id/decision: approve (freezes the version) or send back with a reason. */
export async function decideSignOff(user: SessionUser, id: number, req: DecisionRequest, delivery: Delivery = "now") {
  await db.transaction(async (tx) => {
    const [row] = await tx
      .select({ s: signOffs, version: tapTableVersions, table: tapTables })
      .from(signOffs)
      .innerJoin(tapTableVersions, eq(tapTableVersions.id, signOffs.versionId))
      .innerJoin(tapTables, eq(tapTables.id, tapTableVersions.tableId))
      .where(eq(signOffs.id, id))
      .for("update");
    if (!row) throw notFound(`Sign-off ${id}`);
    const { s, version, table } = row;
    // Four eyes: whoever asked for the sign-off or built the version decides neither, admins included.
    if (s.requestedBy === user.id)
      throw forbidden("You asked for this sign-off, so someone else must decide it (four eyes; admins too).");
    if (version.createdBy === user.id)
      throw forbidden("You built this version, so someone else must decide its sign-off (four eyes; admins too).");
    if (s.reviewerId !== user.id && user.role !== "admin")
      throw forbidden("This sign-off was asked of another reviewer.");
    if (s.state !== "pending")
      throw conflict(`This sign-off was already decided (${s.state === "approved" ? "approved" : "sent back"}).`);
    const approve = req.decision === "approve";
    const now = new Date();
    await tx
      .update(signOffs)
      .set({ state: approve ? "approved" : "rejected", decisionComment: req.comment || null, decidedAt: now })
      .where(eq(signOffs.id, id));
    await tx
      .update(tapTableVersions)
      .set(approve ? { state: "approved", frozenAt: now } : { state: "changes-requested" })
      .where(eq(tapTableVersions.id, version.id));
    const recipients = await tx
      .select({ email: users.email })
      .from(users)
      .where(or(eq(users.id, s.requestedBy), ...(version.createdBy ? [eq(users.id, version.createdBy)] : [])));
    await enqueueMail(tx, {
      to: [...new Set(recipients.map((r) => r.email))],
      subject: `${approve ? "Signed off" : "Sent back"}: ${table.name} v${version.version}`,
      text:
        `${user.name} (${user.email}) ${approve ? "approved" : "sent back"} the tap table “${table.name}”, version ${version.version}.\n\n` +
        (req.comment ? `${approve ? "Comment" : "Reason"}:\n${req.comment}\n\n` : "") +
        (approve
          ? `The version is now frozen; firmware can take its exports. The printable report:\n${link(`/reports/tables/${table.id}/${version.version}`)}\n`
          : `Answer in the sign-off thread or make a new version:\n${link(`/sign-off/${id}`)}\n`),
    });
    await recordAudit(tx, user, "signoff.decision", "sign-off", id, {
      decision: req.decision,
      table: table.name,
      tableId: table.id,
      version: version.version,
    });
  });
  if (delivery === "now") sendMailSoon();
  return getSignOff(id);
}

/** POST /api/v1/sign-offs/:id/comments: a comment, or a reply in a thread, optionally about one channel. */
export async function addComment(user: SessionUser, id: number, req: CommentRequest) {
  const commentId = await db.transaction(async (tx) => {
    const [row] = await tx
      .select({ s: signOffs, inputs: tapTableVersions.inputs })
      .from(signOffs)
      .innerJoin(tapTableVersions, eq(tapTableVersions.id, signOffs.versionId))
      .where(eq(signOffs.id, id));
    if (!row) throw notFound(`Sign-off ${id}`);
    if (req.parentId !== undefined) {
      const [parent] = await tx
        .select({ signOffId: signOffComments.signOffId })
        .from(signOffComments)
        .where(eq(signOffComments.id, req.parentId));
      if (!parent || parent.signOffId !== id)
        throw unprocessable("The comment you reply to is not in this sign-off.", "parentId");
    }
    if (req.channelName) {
      const inputs = row.inputs;
      const names = inputs.classes.flatMap((c) => c.channels.map((ch) => ch.name));
      if (!names.includes(req.channelName))
        throw unprocessable(`“${req.channelName}” is not a channel of this version.`, "channelName");
    }
    const [{ id: cid }] = await tx
      .insert(signOffComments)
      .values({
        signOffId: id,
        parentId: req.parentId ?? null,
        authorId: user.id,
        channelName: req.channelName ?? null,
        body: req.body,
      })
      .$returningId();
    await recordAudit(tx, user, "signoff.comment", "sign-off", id, {
      comment: cid,
      ...(req.parentId ? { parentId: req.parentId } : {}),
    });
    return cid;
  });
  return (await comments(id)).find((c) => c.id === commentId)!;
}

async function comments(id: number): Promise<CommentView[]> {
  const rows = await db
    .select({ c: signOffComments, name: users.name, email: users.email })
    .from(signOffComments)
    .innerJoin(users, eq(users.id, signOffComments.authorId))
    .where(eq(signOffComments.signOffId, id))
    .orderBy(asc(signOffComments.id));
  return rows.map(({ c, name, email }) => ({
    id: c.id,
    parentId: c.parentId,
    author: { id: c.authorId, name, email },
    channelName: c.channelName,
    body: c.body,
    createdAt: c.createdAt,
  }));
}

const listColumns = {
  s: signOffs,
  version: tapTableVersions.version,
  versionState: tapTableVersions.state,
  tableId: tapTables.id,
  tableName: tapTables.name,
  requester: { id: requester.id, name: requester.name, email: requester.email },
  reviewer: { id: reviewer.id, name: reviewer.name, email: reviewer.email },
};

function listBase() {
  return db
    .select(listColumns)
    .from(signOffs)
    .innerJoin(tapTableVersions, eq(tapTableVersions.id, signOffs.versionId))
    .innerJoin(tapTables, eq(tapTables.id, tapTableVersions.tableId))
    .innerJoin(requester, eq(requester.id, signOffs.requestedBy))
    .innerJoin(reviewer, eq(reviewer.id, signOffs.reviewerId));
}

type ListRow = Awaited<ReturnType<ReturnType<typeof listBase>["execute"]>>[number];

function listItem(r: ListRow): SignOffListItem {
  return {
    id: r.s.id,
    state: r.s.state as SignOffState,
    table: { id: r.tableId, name: r.tableName },
    version: r.version,
    versionState: r.versionState,
    requestedBy: r.requester,
    reviewer: r.reviewer,
    createdAt: r.s.createdAt,
    decidedAt: r.s.decidedAt,
  };
}

/** GET /api/v1/sign-offs: newest first; `mine` keeps those the person reviews or requested. */
export async function listSignOffs(
  user: SessionUser,
  q: { state?: SignOffState; mine?: "1" | "0"; limit: number; cursor?: number },
) {
  const where: SQL[] = [];
  if (q.state) where.push(eq(signOffs.state, q.state));
  if (q.mine === "1") where.push(or(eq(signOffs.reviewerId, user.id), eq(signOffs.requestedBy, user.id))!);
  if (q.cursor) where.push(lt(signOffs.id, q.cursor));
  const rows = await listBase()
    .where(where.length ? and(...where) : undefined)
    .orderBy(desc(signOffs.id))
    .limit(q.limit + 1);
  const items = rows.slice(0, q.limit).map(listItem);
  return { items, nextCursor: rows.length > q.limit ? String(items[items.length - 1].id) : null };
}

/** Number of sign-offs awaiting a decision (the overview's count). */
export async function countPending(): Promise<number> {
  const [{ n }] = await db.select({ n: count() }).from(signOffs).where(eq(signOffs.state, "pending"));
  return n;
}

/** Pending sign-offs asked of this person (the overview shows them to reviewers). */
export async function pendingFor(user: SessionUser): Promise<SignOffListItem[]> {
  const rows = await listBase()
    .where(and(eq(signOffs.state, "pending"), eq(signOffs.reviewerId, user.id)))
    .orderBy(asc(signOffs.id))
    .limit(20);
  return rows.map(listItem);
}

/** GET /api/v1/sign-offs/:id: the version's headroom per channel, the decision record, the thread. */
export async function getSignOff(id: number): Promise<SignOffDetail> {
  const [row] = await listBase().where(eq(signOffs.id, id));
  if (!row) throw notFound(`Sign-off ${id}`);
  const [v] = await db
    .select({ inputs: tapTableVersions.inputs, result: tapTableVersions.result })
    .from(tapTableVersions)
    .where(eq(tapTableVersions.id, row.s.versionId));
  const inputs = v.inputs;
  const result = v.result;
  const b = parseBudget(inputs.budget.params, inputs.budget.name);
  return {
    ...listItem(row),
    message: row.s.message,
    decisionComment: row.s.decisionComment,
    budget: inputs.budget,
    architecture: inputs.architecture,
    study: inputs.study,
    registerMap: inputs.registerMap,
    requiredHeadroom_V: b.requiredHeadroom_V,
    targetBer: b.targetBer,
    classes: result?.classes ?? [],
    comments: await comments(id),
  };
}
