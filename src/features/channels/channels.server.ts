// Channels in MariaDB: deriving a channel from a parsed request (channelRequest.server.ts), creating
// it and its original file in one transaction, the list with sorting, filtering and paging, detail,
// the original bytes, and deletion (tuning runs keep their own copy of the inputs).
import { createHash } from "node:crypto";
import { and, asc, count, desc, eq, like, type SQL } from "drizzle-orm";
import { db, type Tx } from "@/server/db.server";
import { channelAggressors, channels, channelSources, programs, runs, users } from "@/db/schema";
import { ApiError, conflict, notFound } from "@/server/http/errors";
import type { UploadedFile } from "@/server/http/body";
import type { Download } from "@/server/http/download";
import { recordAudit } from "@/server/audit/audit.server";
import type { SessionUser } from "@/server/auth/sessionUser";
import type { InputQuality } from "@lib/channel";
import type { Modulation } from "@lib/types";
import type { ChannelDerivation, ChannelDetail, ChannelListItem, DerivedChannel, ListQuery } from "./channels";
import type { AggressorView } from "./aggressors";
import type { ChannelRequest } from "./channelRequest.server";
import { deriveInPool } from "@/server/jobs/pool.server";
import type { DeriveInput } from "./derive.job";

/** What the engine worker derives for a request. */
function deriveInput(req: ChannelRequest): DeriveInput {
  if (req.source === "synthetic") {
    const b = req.body;
    return {
      source: "synthetic",
      bitRate_bps: b.bitRate_bps,
      modulation: b.modulation,
      lossModel: b.lossModel,
      aggressors: b.aggressors,
    };
  }
  const f = req.fields;
  return {
    source: "file",
    file: {
      filename: req.file.filename,
      bytes: req.file.bytes,
      bitRate_bps: f.bitRate_bps,
      modulation: f.modulation,
      kind: f.kind,
      pairs: f.pairs,
      riseTime_s: f.riseTime_s,
      aggressors: f.aggressors,
      aggressorFiles: req.aggressorFiles,
    },
  };
}

const inputErrorStatus = { unsupported: 415, unusable: 422, malformed: 400 } as const;

/**
 * Runs the engine on a request in a worker thread (a big Touchstone file does not hold up other
 * requests): the derived pulse, insertion loss, aggressors and their provenance.
 */
export async function deriveChannel(req: ChannelRequest): Promise<DerivedChannel> {
  const outcome = await deriveInPool(deriveInput(req));
  if (!outcome.ok) throw new ApiError(inputErrorStatus[outcome.reason], outcome.message, outcome.path);
  return outcome.derived;
}

const DEFAULT_PROGRAM = "General";

/** The program a channel goes to: the named one (created when new), or the oldest program. */
async function programFor(tx: Tx, name: string | undefined): Promise<number> {
  if (name) {
    const [found] = await tx.select({ id: programs.id }).from(programs).where(eq(programs.name, name));
    if (found) return found.id;
    const [{ id }] = await tx.insert(programs).values({ name }).$returningId();
    return id;
  }
  const [first] = await tx.select({ id: programs.id }).from(programs).orderBy(asc(programs.id)).limit(1);
  if (first) return first.id;
  const [{ id }] = await tx.insert(programs).values({ name: DEFAULT_PROGRAM }).$returningId();
  return id;
}

export const sha256Hex = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

/**
 * Stores a derived channel with its aggressors and, for uploads, the original files byte for byte
 * (the victim's and each aggressor's own), in one transaction with its audit event. Returns the new
 * channel's list item.
 */
export async function saveChannel(
  user: SessionUser | null,
  input: {
    name: string;
    bitRate_bps: number;
    modulation: Modulation;
    program?: string;
    file?: UploadedFile;
    aggressors?: { source: string; field?: string }[];
    aggressorFiles?: Record<string, UploadedFile>;
  },
  derived: DerivedChannel,
): Promise<ChannelListItem & { sha256?: string }> {
  const { id, sha256 } = await db.transaction(async (tx) => {
    const programId = await programFor(tx, input.program);
    const [{ id }] = await tx
      .insert(channels)
      .values({
        programId,
        name: input.name,
        kind: derived.kind,
        bitRate_bps: input.bitRate_bps,
        pulse: derived.pulse,
        insertionLoss: derived.insertionLoss,
        lossAtNyquist_dB: derived.lossAtNyquist_dB,
        mainCursor_V: derived.mainCursor_V,
        derivation: derived.derivation,
        quality: derived.quality,
        createdBy: user?.id ?? null,
      })
      .$returningId();
    let sha256: string | undefined;
    if (input.file) {
      sha256 = sha256Hex(input.file.bytes);
      await tx.insert(channelSources).values({
        channelId: id,
        filename: input.file.filename.slice(0, 255),
        contentType: input.file.contentType.slice(0, 100),
        size_bytes: input.file.bytes.length,
        sha256,
        bytes: Buffer.from(input.file.bytes.buffer, input.file.bytes.byteOffset, input.file.bytes.byteLength),
      });
    }
    for (const [position, a] of derived.aggressors.entries()) {
      const field = input.aggressors?.[position]?.field;
      const own = field ? input.aggressorFiles?.[field] : undefined;
      await tx.insert(channelAggressors).values({
        channelId: id,
        position,
        name: a.name,
        kind: a.kind,
        source: a.source,
        pulse: a.pulse,
        coupling: a.coupling,
        icnRms_V: a.icnRms_V,
        derivation: a.derivation,
        ...(own
          ? {
              filename: own.filename.slice(0, 255),
              contentType: own.contentType.slice(0, 100),
              size_bytes: own.bytes.length,
              sha256: sha256Hex(own.bytes),
              bytes: Buffer.from(own.bytes.buffer, own.bytes.byteOffset, own.bytes.byteLength),
            }
          : {}),
      });
    }
    await recordAudit(tx, user, input.file ? "channel.upload" : "channel.synthesize", "channel", id, {
      name: input.name,
      kind: derived.kind,
      ...(input.file ? { filename: input.file.filename, bytes: input.file.bytes.length, sha256 } : {}),
      ...(derived.aggressors.length > 0 ? { aggressors: derived.aggressors.map((a) => `${a.name} (${a.kind})`) } : {}),
    });
    return { id, sha256 };
  });
  const [item] = await listRows(eq(channels.id, id), [asc(channels.id)], 1, 0);
  return sha256 ? { ...item, sha256 } : item;
}

/** POST /api/v1/channels: derive, then store. */
export async function createChannel(user: SessionUser, req: ChannelRequest) {
  const derived = await deriveChannel(req);
  if (req.source === "synthetic") return saveChannel(user, req.body, derived);
  return saveChannel(user, { ...req.fields, file: req.file, aggressorFiles: req.aggressorFiles }, derived);
}

/** POST /api/v1/channels/preview: what the engine derives, without storing anything. */
export function previewChannel(req: ChannelRequest) {
  return deriveChannel(req);
}

const listColumns = {
  id: channels.id,
  name: channels.name,
  kind: channels.kind,
  program: programs.name,
  programId: channels.programId,
  bitRate_bps: channels.bitRate_bps,
  derivation: channels.derivation,
  lossAtNyquist_dB: channels.lossAtNyquist_dB,
  mainCursor_V: channels.mainCursor_V,
  createdBy: users.name,
  createdAt: channels.createdAt,
};

/** A row of `listColumns` (the creator's name is null when the account is gone). */
interface ListRow {
  id: number;
  name: string;
  kind: ChannelListItem["kind"];
  program: string;
  bitRate_bps: number;
  derivation: ChannelDerivation;
  lossAtNyquist_dB: number | null;
  mainCursor_V: number;
  createdBy: string | null;
  createdAt: Date;
}

function toItem(r: ListRow): ChannelListItem {
  return {
    id: r.id,
    name: r.name,
    kind: r.kind,
    program: r.program,
    bitRate_bps: r.bitRate_bps,
    modulation: r.derivation.modulation ?? "nrz",
    lossAtNyquist_dB: r.lossAtNyquist_dB,
    mainCursor_V: r.mainCursor_V,
    createdBy: r.createdBy,
    createdAt: r.createdAt,
  };
}

async function listRows(
  where: SQL | undefined,
  order: SQL[],
  limit: number,
  offset: number,
): Promise<ChannelListItem[]> {
  const rows = await db
    .select(listColumns)
    .from(channels)
    .innerJoin(programs, eq(programs.id, channels.programId))
    .leftJoin(users, eq(users.id, channels.createdBy))
    .where(where)
    .orderBy(...order)
    .limit(limit)
    .offset(offset);
  return rows.map(toItem);
}

const sortColumns = {
  name: channels.name,
  kind: channels.kind,
  bitRate: channels.bitRate_bps,
  loss: channels.lossAtNyquist_dB,
  mainCursor: channels.mainCursor_V,
  createdBy: users.name,
  createdAt: channels.createdAt,
} as const;

/** The channel list: filtered by name, kind and program, sorted, paged by an offset cursor. */
export async function listChannels(q: ListQuery) {
  const where: SQL[] = [];
  if (q.q) where.push(like(channels.name, `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`));
  if (q.kind) where.push(eq(channels.kind, q.kind));
  if (q.program) where.push(eq(channels.programId, q.program));
  const dir = q.dir === "asc" ? asc : desc;
  const offset = q.cursor ?? 0;
  const rows = await listRows(
    where.length ? and(...where) : undefined,
    [dir(sortColumns[q.sort]), dir(channels.id)],
    q.limit + 1,
    offset,
  );
  const items = rows.slice(0, q.limit);
  return { items, nextCursor: rows.length > q.limit ? String(offset + q.limit) : null };
}

export async function listPrograms() {
  return db.select({ id: programs.id, name: programs.name }).from(programs).orderBy(asc(programs.name));
}

/** Channel names and rates for pickers (the run form). */
export async function channelChoices() {
  const rows = await db
    .select({
      id: channels.id,
      name: channels.name,
      bitRate_bps: channels.bitRate_bps,
      derivation: channels.derivation,
      lossAtNyquist_dB: channels.lossAtNyquist_dB,
    })
    .from(channels)
    .orderBy(asc(channels.name));
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    bitRate_bps: r.bitRate_bps,
    modulation: r.derivation.modulation ?? "nrz",
    lossAtNyquist_dB: r.lossAtNyquist_dB,
  }));
}

/** GET /api/v1/channels/:id. */
export async function getChannel(id: number): Promise<ChannelDetail> {
  const [row] = await db
    .select({ ...listColumns, pulse: channels.pulse, insertionLoss: channels.insertionLoss, quality: channels.quality })
    .from(channels)
    .innerJoin(programs, eq(programs.id, channels.programId))
    .leftJoin(users, eq(users.id, channels.createdBy))
    .where(eq(channels.id, id));
  if (!row) throw notFound(`Channel ${id}`);
  const [source] = await db
    .select({
      filename: channelSources.filename,
      contentType: channelSources.contentType,
      bytes: channelSources.size_bytes,
      sha256: channelSources.sha256,
    })
    .from(channelSources)
    .where(eq(channelSources.channelId, id));
  const [{ n }] = await db.select({ n: count() }).from(runs).where(eq(runs.channelId, id));
  return {
    ...toItem(row),
    programId: row.programId,
    pulse: row.pulse,
    insertionLoss: row.insertionLoss ?? null,
    derivation: row.derivation,
    source: source ?? null,
    runCount: n,
    aggressors: await channelAggressorViews(id),
    quality: row.quality ?? null,
  };
}

/** The judgement of a channel's uploaded file (null when none was judged or the channel is gone). */
export async function channelQuality(id: number): Promise<InputQuality | null> {
  const [row] = await db.select({ quality: channels.quality }).from(channels).where(eq(channels.id, id));
  return row?.quality ?? null;
}

/** A channel's aggressors in upload order (without their files' bytes). */
export async function channelAggressorViews(channelId: number): Promise<AggressorView[]> {
  const rows = await db
    .select({
      position: channelAggressors.position,
      name: channelAggressors.name,
      kind: channelAggressors.kind,
      source: channelAggressors.source,
      pulse: channelAggressors.pulse,
      coupling: channelAggressors.coupling,
      icnRms_V: channelAggressors.icnRms_V,
      derivation: channelAggressors.derivation,
      filename: channelAggressors.filename,
      size_bytes: channelAggressors.size_bytes,
      sha256: channelAggressors.sha256,
    })
    .from(channelAggressors)
    .where(eq(channelAggressors.channelId, channelId))
    .orderBy(asc(channelAggressors.position));
  return rows.map(({ filename, size_bytes, sha256, coupling, ...a }) => ({
    ...a,
    coupling: coupling ?? null,
    file: filename && sha256 ? { filename, bytes: size_bytes ?? 0, sha256 } : null,
  }));
}

/** GET /api/v1/channels/:id/aggressors/:position/original: an aggressor's own file, byte for byte. */
export async function aggressorOriginalFile(id: number, position: number): Promise<Download> {
  const [a] = await db
    .select({
      filename: channelAggressors.filename,
      contentType: channelAggressors.contentType,
      sha256: channelAggressors.sha256,
      bytes: channelAggressors.bytes,
    })
    .from(channelAggressors)
    .where(and(eq(channelAggressors.channelId, id), eq(channelAggressors.position, position)));
  if (!a?.bytes || !a.filename) throw notFound(`A file of aggressor ${position} of channel ${id}`);
  return {
    filename: a.filename,
    contentType: a.contentType || "application/octet-stream",
    body: a.bytes,
    cacheControl: "private, max-age=0",
    headers: { "x-content-sha256": a.sha256 ?? "" },
  };
}

/** GET /api/v1/channels/:id/original: the uploaded file, byte for byte, with its SHA-256. */
export async function originalFile(id: number): Promise<Download> {
  const [src] = await db.select().from(channelSources).where(eq(channelSources.channelId, id));
  if (!src) throw notFound(`An uploaded file for channel ${id}`);
  return {
    filename: src.filename,
    // Never the type the uploader claimed: a stored file is bytes to save, not something to render.
    contentType: "application/octet-stream",
    body: src.bytes,
    cacheControl: "private, max-age=0",
    headers: { "x-content-sha256": src.sha256 },
  };
}

/**
 * Deletes a channel and its original file. When tuning runs used it, `confirm` must be set: the
 * runs keep their copy of the pulse and lose only the link.
 */
export async function deleteChannel(user: SessionUser, id: number, confirm: boolean) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ id: channels.id, name: channels.name })
      .from(channels)
      .where(eq(channels.id, id))
      .for("update");
    if (!row) throw notFound(`Channel ${id}`);
    const [{ n }] = await tx.select({ n: count() }).from(runs).where(eq(runs.channelId, id));
    if (n > 0 && !confirm) {
      throw conflict(
        `${row.name} is used by ${n} tuning run${n === 1 ? "" : "s"}. They keep their own copy of its pulse; delete again with ?confirm=true to go ahead.`,
      );
    }
    await tx.delete(channels).where(eq(channels.id, id));
    await recordAudit(tx, user, "channel.delete", "channel", id, { name: row.name, runs: n });
    return { id, deleted: true, runsKept: n };
  });
}

/** How many channels the workspace holds. */
export async function countChannels(): Promise<number> {
  const [{ n }] = await db.select({ n: count() }).from(channels);
  return n;
}
