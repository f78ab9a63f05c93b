// Tap-table queries: a table with its versions, one version with the diff against the previous
// computed one and its sign-offs, the list, the count.
import { and, asc, count, desc, eq, lt, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { db } from "@/server/db.server";
import { jobs, signOffs, tapTableRows, tapTables, tapTableVersions, users } from "@/db/schema";
import { notFound } from "@/server/http/errors";
import { apiStatus, jobStatus } from "@/server/jobs/queue.server";
import { diffVersions } from "./diff";
import type { VersionInputs } from "./tapTables";

/** A version with its job and table; 404 when the table has no such version. */
export async function versionRow(tableId: number, v: number) {
  const [row] = await db
    .select({ version: tapTableVersions, job: jobs, table: tapTables })
    .from(tapTableVersions)
    .innerJoin(jobs, eq(jobs.id, tapTableVersions.jobId))
    .innerJoin(tapTables, eq(tapTables.id, tapTableVersions.tableId))
    .where(and(eq(tapTableVersions.tableId, tableId), eq(tapTableVersions.version, v)));
  if (!row) throw notFound(`Version ${v} of tap table ${tableId}`);
  return row;
}

/** The inputs without pulses (for answers). */
function inputsView(inputs: VersionInputs) {
  return {
    budget: { id: inputs.budget.id, name: inputs.budget.name, params: inputs.budget.params },
    architecture: inputs.architecture,
    study: inputs.study,
    registerMap: inputs.registerMap,
    grouping: inputs.grouping,
    classes: inputs.classes.map((c) => ({
      name: c.name,
      lossRange_dB: c.lossRange_dB,
      channels: c.channels.map((ch) => ({ id: ch.id, name: ch.name, lossAtNyquist_dB: ch.lossAtNyquist_dB })),
    })),
    corners: inputs.corners ?? null,
    sweep: inputs.sweep ?? null,
  };
}

/** GET /api/v1/tap-tables/:id/versions/:v: inputs, status, result, the diff against the previous computed version, sign-offs. */
export async function getVersion(tableId: number, v: number) {
  const { version, job, table } = await versionRow(tableId, v);
  const result = version.result;
  let diff = null;
  if (result && v > 1) {
    const [prev] = await db
      .select({ version: tapTableVersions.version, result: tapTableVersions.result })
      .from(tapTableVersions)
      .where(and(eq(tapTableVersions.tableId, tableId), lt(tapTableVersions.version, v)))
      .orderBy(desc(tapTableVersions.version))
      .limit(1);
    const prevResult = prev?.result;
    if (prev && prevResult) diff = diffVersions(prev.version, prevResult.classes, result.classes);
  }
  const reviews = await db
    .select({ s: signOffs, reviewer: users.name })
    .from(signOffs)
    .innerJoin(users, eq(users.id, signOffs.reviewerId))
    .where(eq(signOffs.versionId, version.id))
    .orderBy(asc(signOffs.id));
  const [creator] = version.createdBy
    ? await db.select({ name: users.name }).from(users).where(eq(users.id, version.createdBy))
    : [];
  return {
    table: { id: table.id, name: table.name, description: table.description },
    id: version.id,
    version: version.version,
    state: version.state,
    note: version.note,
    frozenAt: version.frozenAt,
    createdBy: creator?.name ?? null,
    createdAt: version.createdAt,
    job: jobStatus(job),
    inputs: inputsView(version.inputs),
    result,
    engineVersion: version.engineVersion,
    diff,
    signOffs: reviews.map(({ s, reviewer }) => ({
      id: s.id,
      state: s.state,
      reviewer,
      createdAt: s.createdAt,
      decidedAt: s.decidedAt,
      decisionComment: s.decisionComment,
    })),
  };
}

/** GET /api/v1/tap-tables/:id: the table and its versions (newest first). */
export async function getTapTable(tableId: number) {
  const [table] = await db.select().from(tapTables).where(eq(tapTables.id, tableId));
  if (!table) throw notFound(`Tap table ${tableId}`);
  // Each version's summary is read in SQL: its inputs and result (every channel's pulse) stay in the database.
  const rows = await db
    .select({
      version: tapTableVersions.version,
      state: tapTableVersions.state,
      status: jobs.status,
      progress: jobs.progress,
      error: jobs.error,
      note: tapTableVersions.note,
      architecture: sql<string>`JSON_VALUE(${tapTableVersions.inputs}, '$.architecture.label')`,
      budget: sql<string>`JSON_VALUE(${tapTableVersions.inputs}, '$.budget.name')`,
      classCount: sql<number>`JSON_LENGTH(${tapTableVersions.inputs}, '$.classes')`,
      channelCount: sql<number>`JSON_LENGTH(JSON_EXTRACT(${tapTableVersions.inputs}, '$.classes[*].channels[*].name'))`,
      worstHeadroom_V: sql<
        number | null
      >`(SELECT MIN(r.worst_headroom_v) FROM ${tapTableRows} r WHERE r.version_id = ${tapTableVersions.id})`,
      frozenAt: tapTableVersions.frozenAt,
      createdBy: users.name,
      createdAt: tapTableVersions.createdAt,
    })
    .from(tapTableVersions)
    .innerJoin(jobs, eq(jobs.id, tapTableVersions.jobId))
    .leftJoin(users, eq(users.id, tapTableVersions.createdBy))
    .where(eq(tapTableVersions.tableId, tableId))
    .orderBy(desc(tapTableVersions.version));
  return {
    id: table.id,
    name: table.name,
    description: table.description,
    studyId: table.studyId,
    createdAt: table.createdAt,
    versions: rows.map(({ status, ...v }) => ({
      ...v,
      status: apiStatus(status),
      classCount: Number(v.classCount ?? 0),
      channelCount: Number(v.channelCount ?? 0),
      worstHeadroom_V: v.worstHeadroom_V === null ? null : Number(v.worstHeadroom_V),
    })),
  };
}

/** Number of tap tables (the overview's count). */
export async function countTapTables(): Promise<number> {
  const [{ n }] = await db.select({ n: count() }).from(tapTables);
  return n;
}

/**
 * GET /api/v1/tap-tables: newest first, one query for the page. Each row carries its latest
 * version's number, state and the three names the list shows, read in SQL from that version's
 * inputs (never the inputs themselves: they hold every channel's pulse), and its signed-off version.
 */
export async function listTapTables(limit: number, cursor?: number) {
  const latest = alias(tapTableVersions, "latest");
  const newest = sql`(SELECT MAX(v.version) FROM ${tapTableVersions} v WHERE v.table_id = ${tapTables.id})`;
  const rows = await db
    .select({
      id: tapTables.id,
      name: tapTables.name,
      description: tapTables.description,
      createdAt: tapTables.createdAt,
      createdBy: users.name,
      latestVersion: latest.version,
      latestState: latest.state,
      architecture: sql<string | null>`JSON_VALUE(${latest.inputs}, '$.architecture.label')`,
      budget: sql<string | null>`JSON_VALUE(${latest.inputs}, '$.budget.name')`,
      classCount: sql<number | null>`JSON_LENGTH(${latest.inputs}, '$.classes')`,
      signedOffVersion: sql<
        number | null
      >`(SELECT MAX(a.version) FROM ${tapTableVersions} a WHERE a.table_id = ${tapTables.id} AND a.state = 'approved')`,
    })
    .from(tapTables)
    .leftJoin(users, eq(users.id, tapTables.createdBy))
    .leftJoin(latest, and(eq(latest.tableId, tapTables.id), eq(latest.version, newest)))
    .where(cursor ? lt(tapTables.id, cursor) : undefined)
    .orderBy(desc(tapTables.id))
    .limit(limit + 1);
  const page = rows.slice(0, limit);
  const items = page.map((r) => ({
    id: r.id,
    name: r.name,
    description: r.description,
    latestVersion: r.latestVersion ?? 0,
    latestState: r.latestState ?? "computing",
    signedOffVersion: r.signedOffVersion === null ? null : Number(r.signedOffVersion),
    architecture: r.architecture ?? "",
    budget: r.budget ?? "",
    classCount: Number(r.classCount ?? 0),
    createdBy: r.createdBy,
    createdAt: r.createdAt,
  }));
  return { items, nextCursor: rows.length > limit ? String(page[page.length - 1].id) : null };
}
