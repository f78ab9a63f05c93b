// Tap-table writes: creating a table and its versions (each computed as a job, or in this process
// for the demo seed), editing what is not frozen, and storing a computed version (a late job's
// result is dropped). Every write is one transaction with its audit event.
import { and, asc, desc, eq } from "drizzle-orm";
import { db, type DbOrTx, type Tx } from "@/server/db.server";
import { jobs, studies, tapTableRows, tapTables, tapTableVersions, users, type TapTableVersion } from "@/db/schema";
import { ApiError, badRequest, conflict, notFound, unprocessable } from "@/server/http/errors";
import { recordAudit } from "@/server/audit/audit.server";
import { enqueueJob, registerJobKind, startJobs } from "@/server/jobs/queue.server";
import { finishHere, type RunHere } from "@/server/jobs/inlineJob.server";
import type { SessionUser } from "@/server/auth/sessionUser";
import {
  budgetCopy,
  channelCopies,
  channelSourceText,
  checkBudgetFits,
  checkOneRate,
  findChannels,
  parseBudget,
  type BudgetCopy,
  type ChannelCopy,
} from "@/server/sources.server";
import { config } from "@/server/config.server";
import { cornerBudget } from "@lib/corners";
import { needsTouchstone } from "@/features/channels/lossCorners";
import { sweepCorners, type SweepCorners } from "@/features/sweeps/sweeps.server";
import {
  tableBasis,
  worstOf,
  type TableChannel,
  type TableClassInput,
  type TableClassResult,
  type TableMemberInput,
  type TableMemberResult,
  type TableVersionJob,
} from "./tapTables.job";
import type { Architecture } from "@/features/studies/architecture";
import { classesOf, groupingChannelIds, GroupingError } from "./grouping";
import { defaultRegisterMap, registerMapProblem, type BudgetForMap, type RegisterField } from "./registerMap";
import { budgetForArchitecture, tapTableArchitectureProblem } from "./architectureBudget";
import { getVersion } from "./tapTables.server";
import {
  isEditable,
  type CreateTapTableRequest,
  type CreateVersionRequest,
  type Grouping,
  type UpdateVersionRequest,
  type VersionChannel,
  type VersionInputs,
  type VersionResult,
} from "./tapTables";

type ResolvedArchitecture = Pick<VersionInputs, "architecture" | "study">;

/** The architecture and study record behind a version: a study's decision, or one given by hand. */
async function resolveArchitecture(
  tx: DbOrTx,
  studyId: number | undefined,
  given: Architecture | undefined,
): Promise<ResolvedArchitecture> {
  if (studyId === undefined) {
    if (!given) throw badRequest("Give the architecture, or a studyId whose decision names it.", "architecture");
    return { architecture: given, study: null };
  }
  const [s] = await tx.select().from(studies).where(eq(studies.id, studyId));
  if (!s) throw notFound(`Study ${studyId}`);
  if (!s.decision)
    throw unprocessable(
      `The study “${s.name}” has no recorded decision yet; record the chosen architecture first.`,
      "studyId",
    );
  const inputs = s.inputs;
  const chosen = inputs.candidates.find((c) => c.key === s.decision!.candidateKey);
  if (!chosen) throw unprocessable(`The study's decision names an unknown candidate.`, "studyId");
  if (given && given.key !== chosen.key) {
    throw unprocessable(
      `The architecture “${given.key}” differs from the study's decision “${chosen.key}”; leave one out.`,
      "architecture",
    );
  }
  const [by] = s.decidedBy ? await tx.select({ name: users.name }).from(users).where(eq(users.id, s.decidedBy)) : [];
  return {
    architecture: chosen,
    study: {
      id: s.id,
      name: s.name,
      decision: {
        candidateKey: s.decision.candidateKey,
        rationale: s.decision.rationale,
        decidedBy: by?.name ?? null,
        decidedAt: s.decidedAt ? s.decidedAt.toISOString() : null,
      },
    },
  };
}

/** 422 naming the field when a register map cannot encode the architecture. */
function checkRegisterMap(map: readonly RegisterField[], architecture: Architecture, budget: BudgetForMap): void {
  const problem = registerMapProblem(map, architecture, budget);
  if (problem) throw unprocessable(problem.message, problem.path);
}

/** Builds a version's inputs; 422 with the field's path for what cannot be grouped or mapped. */
function versionInputs(
  budget: BudgetCopy,
  arch: ResolvedArchitecture,
  registerMap: RegisterField[] | undefined,
  grouping: Grouping,
  chans: ReadonlyMap<number, ChannelCopy>,
  corners: SweepCorners | null,
): VersionInputs {
  const problem = tapTableArchitectureProblem(arch.architecture);
  if (problem) throw unprocessable(problem, arch.study ? "studyId" : "architecture");
  const map = registerMap ?? defaultRegisterMap(arch.architecture, budget.budget);
  checkRegisterMap(map, arch.architecture, budget.budget);
  const derived = budgetForArchitecture(budget.budget, arch.architecture);
  for (const c of corners?.corners ?? []) {
    try {
      cornerBudget(derived, c);
    } catch (e) {
      if (e instanceof RangeError) throw unprocessable(`The sweep “${corners!.sweep.name}”: ${e.message}`, "sweepId");
      throw e;
    }
  }
  let classes;
  try {
    classes = classesOf(grouping, chans);
  } catch (e) {
    if (e instanceof GroupingError) throw unprocessable(e.message, e.path);
    throw e;
  }
  // A class default is one search over the class's channels together: the largest class counts.
  const members = Math.max(1, ...classes.map((c) => c.channels.length));
  checkBudgetFits(derived, budget.name, [...chans.values()], "budgetId", { members });
  return {
    budget: { id: budget.id, name: budget.name, params: budget.params },
    architecture: arch.architecture,
    study: arch.study,
    registerMap: map,
    grouping: grouping.mode === "loss-bins" ? { mode: "loss-bins", edges_dB: grouping.edges_dB } : { mode: "manual" },
    classes,
    corners: corners?.corners ?? null,
    sweep: corners?.sweep ?? null,
  };
}

/**
 * The parts of a version's job (`versionJob`, enqueued waiting for its children): one job per class,
 * each waiting for one job per channel (its own optimum at every corner), so the work spreads over
 * every worker.
 */
async function enqueueVersionParts(
  tx: DbOrTx,
  versionJob: number,
  versionId: number,
  inputs: VersionInputs,
): Promise<void> {
  for (const [index, cls] of inputs.classes.entries()) {
    const classJob = await enqueueJob(tx, "table-class", versionId, {
      parentId: versionJob,
      part: index,
      waitForChildren: true,
    });
    await tx.insert(jobs).values(
      cls.channels.map((_, part) => ({
        kind: "table-member" as const,
        targetId: versionId,
        queue: config.queue.backend,
        parentId: classJob,
        part,
        status: "queued" as const,
      })),
    );
  }
}

/** Inserts a version and its job (computing), with the audit event. */
async function insertVersion(
  tx: DbOrTx,
  user: SessionUser,
  tableId: number,
  version: number,
  inputs: VersionInputs,
  note: string | undefined,
  parts: boolean,
) {
  const jobId = await enqueueJob(tx, "table-version", 0, { waitForChildren: true });
  const [{ id }] = await tx
    .insert(tapTableVersions)
    .values({
      tableId,
      version,
      jobId,
      budgetId: inputs.budget.id,
      inputs,
      note: note ?? null,
      createdBy: user.id,
    })
    .$returningId();
  await tx.update(jobs).set({ targetId: id }).where(eq(jobs.id, jobId));
  // Computed here (the demo seed) the version needs no parts.
  if (parts) await enqueueVersionParts(tx, jobId, id, inputs);
  await recordAudit(tx, user, "table.version", "tap-table", tableId, {
    version,
    architecture: inputs.architecture.key,
    budget: inputs.budget.name,
    classes: inputs.classes.map((c) => ({ name: c.name, channels: c.channels.length })),
  });
  return { versionId: id, jobId, inputs };
}

/** After the commit: the worker pool computes the version — or, with `here` (the demo seed), this process does. */
async function computeVersion(
  queued: { versionId: number; jobId: number; inputs: VersionInputs },
  here: RunHere<VersionInputs, VersionResult> | undefined,
) {
  if (here)
    await finishHere(queued.jobId, queued.inputs, here, (tx, result) => saveVersion(tx, queued.versionId, result));
  else startJobs(queued.jobId);
}

/** POST /api/v1/tap-tables: a table and its v1, queued (computed here with `here`, for the demo seed). */
export async function createTapTable(
  user: SessionUser,
  req: CreateTapTableRequest,
  here?: RunHere<VersionInputs, VersionResult>,
) {
  const { tableId, queued } = await db.transaction(async (tx) => {
    const [taken] = await tx.select({ id: tapTables.id }).from(tapTables).where(eq(tapTables.name, req.name));
    if (taken) throw conflict(`A tap table named “${req.name}” exists; choose another name or add a version to it.`);
    const budget = await budgetCopy(tx, req.budgetId);
    const arch = await resolveArchitecture(tx, req.studyId, req.architecture);
    const chans = await channelCopies(tx, groupingChannelIds(req.grouping), "grouping");
    const corners = req.sweepId === undefined ? null : await sweepCorners(tx, req.sweepId);
    const inputs = versionInputs(
      budget,
      arch,
      req.registerMap,
      req.grouping,
      new Map(chans.map((c) => [c.id, c])),
      corners,
    );
    const [{ id }] = await tx
      .insert(tapTables)
      .values({
        name: req.name,
        description: req.description ?? null,
        studyId: arch.study?.id ?? null,
        createdBy: user.id,
      })
      .$returningId();
    await recordAudit(tx, user, "table.create", "tap-table", id, { name: req.name });
    return { tableId: id, queued: await insertVersion(tx, user, id, 1, inputs, req.note, here === undefined) };
  });
  await computeVersion(queued, here);
  return { id: tableId, version: 1, status: here ? ("done" as const) : ("queued" as const) };
}

/** The grouping a version was made with, rebuilt from its inputs (to carry into a new version). */
function groupingOf(inputs: VersionInputs): Grouping {
  if (inputs.grouping.mode === "loss-bins") {
    return {
      mode: "loss-bins",
      edges_dB: inputs.grouping.edges_dB ?? [],
      channelIds: inputs.classes.flatMap((c) => c.channels.map((ch) => ch.id)),
    };
  }
  return {
    mode: "manual",
    classes: inputs.classes.map((c) => ({ name: c.name, channelIds: c.channels.map((ch) => ch.id) })),
  };
}

/**
 * POST /api/v1/tap-tables/:id/versions: the next version. What the request leaves out comes from
 * the latest version: its budget (re-read, so budget edits count), architecture, register map and
 * grouping (channels re-read; a channel deleted since keeps its copy).
 */
export async function createVersion(
  user: SessionUser,
  tableId: number,
  req: CreateVersionRequest,
  here?: RunHere<VersionInputs, VersionResult>,
) {
  const { version, queued } = await db.transaction(async (tx) => {
    const [table] = await tx.select().from(tapTables).where(eq(tapTables.id, tableId)).for("update");
    if (!table) throw notFound(`Tap table ${tableId}`);
    const [latest] = await tx
      .select()
      .from(tapTableVersions)
      .where(eq(tapTableVersions.tableId, tableId))
      .orderBy(desc(tapTableVersions.version))
      .limit(1);
    const prev = latest.inputs;
    const budget =
      req.budgetId !== undefined
        ? await budgetCopy(tx, req.budgetId)
        : await budgetCopy(tx, prev.budget.id).catch((e) => {
            if (e instanceof ApiError && e.status === 404)
              return { ...prev.budget, budget: parseBudget(prev.budget.params, prev.budget.name) };
            throw e;
          });
    const arch: ResolvedArchitecture =
      req.studyId !== undefined || req.architecture !== undefined
        ? await resolveArchitecture(tx, req.studyId, req.architecture)
        : { architecture: prev.architecture, study: prev.study };
    const prevGrouping = groupingOf(prev);
    const grouping: Grouping =
      req.grouping ??
      (req.edges_dB
        ? { mode: "loss-bins", edges_dB: req.edges_dB, channelIds: groupingChannelIds(prevGrouping) }
        : prevGrouping);
    const known = new Map<number, ChannelCopy>(
      prev.classes.flatMap((c) => c.channels.map((ch) => [ch.id, ch] as const)),
    );
    const ids = groupingChannelIds(grouping);
    for (const c of await findChannels(tx, ids)) known.set(c.id, c);
    const missing = ids.find((id) => !known.has(id));
    if (missing !== undefined) throw notFound(`Channel ${missing}`);
    checkOneRate(
      ids.map((id) => known.get(id)!),
      "grouping",
    );
    const sameArchitecture = arch.architecture.key === prev.architecture.key && budget.id === prev.budget.id;
    const registerMap = req.registerMap ?? (sameArchitecture ? prev.registerMap : undefined);
    const corners: SweepCorners | null =
      req.sweepId === undefined
        ? prev.corners && prev.sweep
          ? { corners: prev.corners, sweep: prev.sweep }
          : null
        : req.sweepId === null
          ? null
          : await sweepCorners(tx, req.sweepId);
    const inputs = versionInputs(budget, arch, registerMap, grouping, known, corners);
    const next = latest.version + 1;
    const queued = await insertVersion(tx, user, tableId, next, inputs, req.note, here === undefined);
    if (arch.study && arch.study.id !== table.studyId)
      await tx.update(tapTables).set({ studyId: arch.study.id }).where(eq(tapTables.id, tableId));
    return { version: next, queued };
  });
  await computeVersion(queued, here);
  return { id: tableId, version, status: here ? ("done" as const) : ("queued" as const) };
}

/** Refuses changes to a version that is signed off, in review or computing (409 with the reason). */
function assertEditable(v: Pick<TapTableVersion, "state" | "version">): void {
  if (v.state === "approved")
    throw conflict(`v${v.version} is signed off and frozen; create a new version to change it.`);
  if (v.state === "in-review")
    throw conflict(`v${v.version} is in review; wait for the reviewer's decision, or create a new version.`);
  if (v.state === "computing") throw conflict(`v${v.version} is still computing; change it when it is done.`);
  if (!isEditable(v.state)) throw conflict(`v${v.version} cannot be changed in its state (${v.state}).`);
}

/** PUT /api/v1/tap-tables/:id/versions/:v: the note, or the register map (which recomputes the version). */
export async function updateVersion(user: SessionUser, tableId: number, v: number, req: UpdateVersionRequest) {
  const recompute = await db.transaction(async (tx) => {
    const [row] = await tx
      .select()
      .from(tapTableVersions)
      .where(and(eq(tapTableVersions.tableId, tableId), eq(tapTableVersions.version, v)))
      .for("update");
    if (!row) throw notFound(`Version ${v} of tap table ${tableId}`);
    assertEditable(row);
    const inputs = row.inputs;
    const changes: Partial<typeof tapTableVersions.$inferInsert> = {};
    if (req.note !== undefined) changes.note = req.note;
    const mapChanged =
      req.registerMap !== undefined && JSON.stringify(req.registerMap) !== JSON.stringify(inputs.registerMap);
    if (mapChanged) {
      checkRegisterMap(req.registerMap!, inputs.architecture, parseBudget(inputs.budget.params, inputs.budget.name));
      changes.inputs = { ...inputs, registerMap: req.registerMap! };
      changes.state = "computing";
      changes.result = null;
      changes.jobId = await enqueueJob(tx, "table-version", row.id, { waitForChildren: true });
      await enqueueVersionParts(tx, changes.jobId, row.id, changes.inputs);
      await tx.delete(tapTableRows).where(eq(tapTableRows.versionId, row.id));
    }
    await tx.update(tapTableVersions).set(changes).where(eq(tapTableVersions.id, row.id));
    await recordAudit(tx, user, "table.version-edit", "tap-table", tableId, {
      version: v,
      ...(req.note !== undefined ? { note: true } : {}),
      ...(mapChanged ? { registerMap: req.registerMap!.map((f) => f.name) } : {}),
    });
    return mapChanged ? (changes.jobId as number) : null;
  });
  if (recompute !== null) startJobs(recompute);
  return getVersion(tableId, v);
}

/** Stores a computed version: its result, one row per class, and the state "ready". */
async function saveVersion(tx: Tx, versionId: number, r: VersionResult) {
  await tx
    .update(tapTableVersions)
    .set({ result: r, engineVersion: r.engineVersion, state: "ready" })
    .where(eq(tapTableVersions.id, versionId));
  await tx.delete(tapTableRows).where(eq(tapTableRows.versionId, versionId));
  if (r.classes.length > 0) {
    await tx.insert(tapTableRows).values(
      r.classes.map((c) => ({
        versionId,
        classIndex: c.index,
        className: c.name,
        codes: c.codes,
        values: c.values,
        worstHeadroom_V: c.worstHeadroom_V,
        channelCount: c.channels.length,
      })),
    );
  }
}

/**
 * Whether a job is still the one that computes its version: a version recomputed since (a new
 * register map) has a newer job, and a version past "computing" (signed off, in review) is frozen.
 * A late job's result is then dropped, never written over the newer one.
 */
async function stillComputes(tx: Tx, versionId: number, jobId: number): Promise<boolean> {
  const [v] = await tx
    .select({ jobId: tapTableVersions.jobId, state: tapTableVersions.state })
    .from(tapTableVersions)
    .where(eq(tapTableVersions.id, versionId))
    .for("update");
  return v !== undefined && v.jobId === jobId && v.state === "computing";
}

/** A version's inputs, for its jobs. */
async function inputsOf(versionId: number): Promise<VersionInputs> {
  const [row] = await db
    .select({ inputs: tapTableVersions.inputs })
    .from(tapTableVersions)
    .where(eq(tapTableVersions.id, versionId));
  if (!row) throw new Error(`Tap table version ${versionId} no longer exists.`);
  return row.inputs;
}

/** A channel of a version for its jobs, with its Touchstone text when the version's corners need it. */
async function tableChannel(inputs: VersionInputs, ch: VersionChannel): Promise<TableChannel> {
  if (!needsTouchstone(ch.kind, inputs.corners ?? [])) return { ...ch, touchstone: null };
  const touchstone = await channelSourceText(db, ch.id);
  if (touchstone === null)
    throw new Error(`The Touchstone file of “${ch.name}” was deleted; its loss corners cannot be rebuilt.`);
  return { ...ch, touchstone };
}

/** The stored results of a job's children, in their order (`part`). */
async function childResults<T>(jobId: number): Promise<T[]> {
  const rows = await db
    .select({ result: jobs.result })
    .from(jobs)
    .where(eq(jobs.parentId, jobId))
    .orderBy(asc(jobs.part));
  return rows.map((r) => r.result as T);
}

/** A part's result, kept on its own job row for its parent to read. */
async function keepOnJob(tx: Tx, jobId: number, result: unknown): Promise<void> {
  await tx.update(jobs).set({ result }).where(eq(jobs.id, jobId));
}

registerJobKind("table-member", {
  async input(job): Promise<TableMemberInput> {
    const inputs = await inputsOf(job.targetId);
    const [classJob] = await db
      .select({ part: jobs.part })
      .from(jobs)
      .where(eq(jobs.id, job.parentId ?? -1));
    const ch = inputs.classes[classJob?.part ?? -1]?.channels[job.part ?? -1];
    if (!ch) throw new Error(`Tap table version ${job.targetId} has no channel for job ${job.id}.`);
    return { ...tableBasis(inputs), channel: await tableChannel(inputs, ch) };
  },
  save: (tx, job, result) => keepOnJob(tx, job.id, result),
});

registerJobKind("table-class", {
  async input(job): Promise<TableClassInput> {
    const inputs = await inputsOf(job.targetId);
    const cls = inputs.classes[job.part ?? -1];
    if (!cls) throw new Error(`Tap table version ${job.targetId} has no class ${job.part}.`);
    const channels = await Promise.all(cls.channels.map((ch) => tableChannel(inputs, ch)));
    return {
      ...tableBasis(inputs),
      registerMap: inputs.registerMap,
      index: job.part as number,
      cls: { ...cls, channels },
      own: await childResults<TableMemberResult>(job.id),
    };
  },
  save: (tx, job, result) => keepOnJob(tx, job.id, result),
});

registerJobKind("table-version", {
  async input(job): Promise<TableVersionJob> {
    const inputs = await inputsOf(job.targetId);
    const classes = await childResults<TableClassResult>(job.id);
    // A version queued before its work was split in parts is computed in one go.
    if (classes.length === 0) return { whole: inputs };
    const w = worstOf(classes);
    return {
      ...tableBasis(inputs),
      classes,
      worstChannel: await tableChannel(inputs, inputs.classes[w.classIndex].channels[w.channelIndex]),
    };
  },
  async save(tx, job, result) {
    if (await stillComputes(tx, job.targetId, job.id)) await saveVersion(tx, job.targetId, result as VersionResult);
  },
  async fail(tx, job) {
    if (await stillComputes(tx, job.targetId, job.id))
      await tx.update(tapTableVersions).set({ state: "failed" }).where(eq(tapTableVersions.id, job.targetId));
  },
});
