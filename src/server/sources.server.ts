// Copies of the budget and the channels a study or a tap table version is computed from, read
// inside the caller's transaction so that the copy and the work it starts agree.
import { inArray, eq } from "drizzle-orm";
import { budgetSchema, type Budget, type BudgetInput } from "@lib/contract/budget";
import { searchSize, searchSizeProblem, searchSpace } from "@lib/optimize";
import { pulseFromJson } from "@lib/pulse";
import { budgets, channelAggressors, channelSources, channels } from "@/db/schema";
import type { ChannelKind, StoredPulse } from "@/features/channels/channels";
import type { RunAggressor } from "@/features/runs/runs";
import type { DbOrTx } from "@/server/db.server";
import { notFound, unprocessable } from "@/server/http/errors";

export interface BudgetCopy {
  id: number;
  name: string;
  params: BudgetInput;
  /** The params with every default filled in. */
  budget: Budget;
}

export interface ChannelCopy {
  id: number;
  name: string;
  lossAtNyquist_dB: number | null;
  pulse: StoredPulse;
  /** What the channel was made of (its loss corners are rebuilt from it); absent in older copies. */
  kind?: ChannelKind;
  derivation?: Record<string, unknown>;
  /** Its aggressors (crosstalk pulses at the receiver's pins), when it has any. */
  aggressors?: RunAggressor[];
}

/** A budget with its validated params; 404 when missing, 422 when its params no longer validate. */
export async function budgetCopy(tx: DbOrTx, id: number): Promise<BudgetCopy> {
  const [row] = await tx.select().from(budgets).where(eq(budgets.id, id));
  if (!row) throw notFound(`Budget ${id}`);
  return { id: row.id, name: row.name, params: row.params, budget: parseBudget(row.params, row.name) };
}

/** A stored budget's params with defaults filled in; 422 naming the field when they do not validate. */
export function parseBudget(params: unknown, name: string): Budget {
  const parsed = budgetSchema.safeParse(params);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw unprocessable(
      `The budget “${name}” is not usable: ${issue.path.join(".")}: ${issue.message}. Fix it on the Budgets page.`,
      "budgetId",
    );
  }
  return parsed.data;
}

/** The channels among these ids that exist (deleted ones are left out). */
export async function findChannels(tx: DbOrTx, ids: readonly number[]): Promise<ChannelCopy[]> {
  if (ids.length === 0) return [];
  const rows = await tx
    .select({
      id: channels.id,
      name: channels.name,
      lossAtNyquist_dB: channels.lossAtNyquist_dB,
      pulse: channels.pulse,
      kind: channels.kind,
      derivation: channels.derivation,
    })
    .from(channels)
    .where(inArray(channels.id, [...ids]));
  const aggressors = await tx
    .select({
      channelId: channelAggressors.channelId,
      name: channelAggressors.name,
      kind: channelAggressors.kind,
      pulse: channelAggressors.pulse,
    })
    .from(channelAggressors)
    .where(inArray(channelAggressors.channelId, [...ids]))
    .orderBy(channelAggressors.channelId, channelAggressors.position);
  return rows.map((r) => {
    const own = aggressors.filter((a) => a.channelId === r.id).map(({ name, kind, pulse }) => ({ name, kind, pulse }));
    return own.length > 0 ? { ...r, aggressors: own } : r;
  });
}

/** One default setting serves channels of one symbol rate: 422 naming the first channel that differs. */
export function checkOneRate(list: readonly ChannelCopy[], path: string): void {
  if (list.length === 0) return;
  const ui = list[0].pulse.ui_s;
  const other = list.find((c) => Math.abs(c.pulse.ui_s - ui) > ui * 1e-9);
  if (other) {
    throw unprocessable(
      `“${other.name}” runs at another symbol rate than “${list[0].name}”; choose channels of one bit rate.`,
      path,
    );
  }
}

/** The channels with these ids, in the order asked; 404 naming the first missing one, 422 for mixed rates. */
export async function channelCopies(tx: DbOrTx, ids: readonly number[], path = "channelIds"): Promise<ChannelCopy[]> {
  const byId = new Map((await findChannels(tx, ids)).map((r) => [r.id, r]));
  const missing = ids.find((id) => !byId.has(id));
  if (missing !== undefined) throw notFound(`Channel ${missing}`);
  const list = ids.map((id) => byId.get(id)!);
  checkOneRate(list, path);
  return list;
}

/**
 * Whether the engine accepts this budget for these channels (their symbol rate against the budget's
 * bit rate, the grids) and the search it asks for is within `MAX_SEARCH_SIZE` (with `members`
 * channels searched together, a tap-table class): 422 with the engine's message otherwise, before
 * any job is queued.
 */
export function checkBudgetFits(
  budget: BudgetInput,
  name: string,
  list: readonly ChannelCopy[],
  path = "budgetId",
  { members = 1 } = {},
): void {
  if (list.length === 0) return;
  try {
    searchSpace(pulseFromJson(list[0].pulse), budget);
  } catch (e) {
    if (e instanceof RangeError || e instanceof TypeError) {
      throw unprocessable(`The budget “${name}” does not fit “${list[0].name}”: ${e.message}`, path);
    }
    throw e;
  }
  checkSearchSize(budget, list[0].pulse.samplesPerUi, members, path, name);
}

/** 422 saying what to coarsen when the budget's search (see `searchSize`) is past the limit. */
export function checkSearchSize(
  budget: BudgetInput,
  samplesPerUi: number,
  members: number,
  path: string,
  name?: string,
): void {
  const problem = searchSizeProblem(budget, searchSize(budget, { samplesPerUi, members }));
  if (problem !== null) throw unprocessable(name === undefined ? problem : `The budget “${name}”: ${problem}`, path);
}

/** The channels without their pulses (for API answers: pulses are large). */
export function withoutPulses<T extends { pulse: StoredPulse; aggressors?: RunAggressor[] }>(
  list: readonly T[],
): Omit<T, "pulse" | "aggressors">[] {
  return list.map(({ pulse: _pulse, aggressors: _aggressors, ...rest }) => rest);
}

/** The text of a channel's uploaded file (its Touchstone file), or null when it has none any more. */
export async function channelSourceText(tx: DbOrTx, channelId: number): Promise<string | null> {
  const [src] = await tx
    .select({ bytes: channelSources.bytes })
    .from(channelSources)
    .where(eq(channelSources.channelId, channelId));
  return src ? new TextDecoder("utf-8").decode(src.bytes) : null;
}
