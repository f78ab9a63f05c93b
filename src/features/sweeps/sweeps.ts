// Corner sweeps: the request schema, how a sweep's pairs are cut into batches, the shapes a sweep
// stores and the API answers, and the figures its page shows (worst corner per channel, histogram,
// time left, CSV). No server code here: islands import this file.
import { z } from "zod";
import type { BudgetInput } from "@lib/contract/budget";
import { cornerSchema, type Corner } from "@lib/contract/corner";
import { csvCell } from "@/features/tapTables/exports";

export { cornerSchema, type Corner };

/** What a sweep was started with: copies, so later edits of the budget or channels do not change it. */
export interface SweepInputs {
  budget: { id: number; name: string; params: BudgetInput };
  corners: Corner[];
  /** The channels in the order asked (their pulses are in `sweep_channels`, one row each). */
  channels: { id: number; name: string; lossAtNyquist_dB: number | null }[];
}

/** What the sweep's last job gathers once every pair is done: each channel's binding corner. */
export interface SweepSummary {
  worst: { channelId: number; corner: string; cornerIndex: number; limiterHeadroom_V: number }[];
  /** Pairs the engine refused (a corner taking the budget out of range, …). */
  refused: number;
  linearReachExhausted: number;
  compute_ms: number;
}

/** The equalizer setting a pair's joint search found. */
export interface PairSetting {
  tx: number[];
  ctle: { gDc_dB: number; gDc2_dB: number };
  dfe: number[];
}

/** Largest number of channels in one sweep. */
export const MAX_SWEEP_CHANNELS = 500;
/** Largest number of corners in one sweep. */
export const MAX_CORNERS = 24;
/** Largest number of channel × corner pairs in one sweep. */
export const MAX_PAIRS = 4000;
/**
 * Corners of one channel computed by one job (a batch): the channel's pulse is rebuilt once per
 * distinct loss factor of the batch, and a batch is short enough (a few joint searches) that a
 * worker lost mid-batch costs little.
 */
export const CORNERS_PER_BATCH = 4;

const cornersSchema = z
  .array(cornerSchema, { error: "Give the corners as a list." })
  .min(1, "Define at least one corner.")
  .max(MAX_CORNERS, `A sweep has at most ${MAX_CORNERS} corners.`)
  .refine(
    (cs) => new Set(cs.map((c) => c.name.toLowerCase())).size === cs.length,
    "Two corners have the same name; name each corner once.",
  );

/** POST /api/v1/sweeps: channels (by id, or a program's channels), a budget and named corners. */
export const createSweepRequest = z
  .object({
    name: z
      .string({ error: "Give the sweep a name." })
      .trim()
      .min(1, "Give the sweep a name.")
      .max(200, "Keep the name under 200 characters."),
    channelIds: z
      .array(z.int({ error: "Channel ids are whole numbers." }).positive(), {
        error: "Give channelIds as a list of channel ids.",
      })
      .min(1, "Choose at least one channel.")
      .max(MAX_SWEEP_CHANNELS, `A sweep covers at most ${MAX_SWEEP_CHANNELS} channels.`)
      .refine((ids) => new Set(ids).size === ids.length, "A channel appears twice; list each channel once.")
      .optional(),
    programId: z.int({ error: "The program id is a whole number." }).positive().optional(),
    budgetId: z.int({ error: "Choose a budget (budgetId)." }).positive(),
    corners: cornersSchema,
  })
  .refine((r) => (r.channelIds === undefined) !== (r.programId === undefined), {
    message: "Give channelIds or a programId (all of that program's channels), not both.",
    path: ["channelIds"],
  });
export type CreateSweepRequest = z.infer<typeof createSweepRequest>;

export const sweepParams = z.object({
  id: z.coerce.number({ error: "The sweep id must be a number." }).int().positive(),
});
export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  cursor: z.coerce.number().int().positive().optional(),
});

/** One job's share of a sweep: one channel and a run of its corners. */
export interface SweepBatch {
  channelIndex: number;
  cornerIndices: number[];
}

/** The batches of a sweep, channel by channel, `CORNERS_PER_BATCH` corners at most each. */
export function sweepBatches(channelCount: number, cornerCount: number): SweepBatch[] {
  const out: SweepBatch[] = [];
  for (let c = 0; c < channelCount; c++) {
    for (let k = 0; k < cornerCount; k += CORNERS_PER_BATCH) {
      out.push({
        channelIndex: c,
        cornerIndices: Array.from({ length: Math.min(CORNERS_PER_BATCH, cornerCount - k) }, (_, i) => k + i),
      });
    }
  }
  return out;
}

/** What one channel × corner pair gets: the joint search's best setting and the linear-reach verdict. */
export interface PairResult {
  channelId: number;
  cornerIndex: number;
  /** Limiter headroom at the target BER with the best setting (null when the engine refused the pair). */
  limiterHeadroom_V: number | null;
  eyeHeight_V: number | null;
  /** Best headroom without the DFE (transmit FIR + CTLE only). */
  linearHeadroom_V: number | null;
  linearReachExhausted: boolean | null;
  /** Fewest DFE taps that meet the required headroom (null: none does). */
  fewestDfeTaps: number | null;
  setting: PairSetting | null;
  /** Why the engine refused this pair (e.g. a corner that takes the budget out of range). */
  error: string | null;
}

/** A channel's worst corner: the binding one, the lowest headroom over the corners. */
export interface ChannelWorst {
  channelId: number;
  channelName: string;
  corner: string;
  cornerIndex: number;
  limiterHeadroom_V: number;
}

/** The worst corner of every channel that has at least one result (refused pairs are left out). */
export function worstPerChannel(
  channels: SweepInputs["channels"],
  corners: readonly Corner[],
  results: readonly PairResult[],
): ChannelWorst[] {
  const byChannel = new Map<number, PairResult>();
  for (const r of results) {
    if (r.limiterHeadroom_V === null) continue;
    const w = byChannel.get(r.channelId);
    if (
      !w ||
      r.limiterHeadroom_V < (w.limiterHeadroom_V as number) ||
      (r.limiterHeadroom_V === w.limiterHeadroom_V && r.cornerIndex < w.cornerIndex)
    ) {
      byChannel.set(r.channelId, r);
    }
  }
  return channels.flatMap((ch) => {
    const w = byChannel.get(ch.id);
    if (!w) return [];
    return [
      {
        channelId: ch.id,
        channelName: ch.name,
        corner: corners[w.cornerIndex].name,
        cornerIndex: w.cornerIndex,
        limiterHeadroom_V: w.limiterHeadroom_V as number,
      },
    ];
  });
}

/** One bar of the headroom histogram: `[from_V, to_V)` and how many pairs fall in it. */
export interface HistogramBin {
  from_V: number;
  to_V: number;
  count: number;
}

/**
 * Histogram of the pairs' headroom on `bins` equal bins from the lowest to the highest value (the
 * last bin closed). A single value makes one bin of zero width.
 */
export function headroomHistogram(values_V: readonly number[], bins = 20): HistogramBin[] {
  if (values_V.length === 0) return [];
  const lo = Math.min(...values_V);
  const hi = Math.max(...values_V);
  if (hi === lo) return [{ from_V: lo, to_V: hi, count: values_V.length }];
  const width = (hi - lo) / bins;
  const out = Array.from({ length: bins }, (_, i) => ({
    from_V: lo + i * width,
    to_V: lo + (i + 1) * width,
    count: 0,
  }));
  for (const v of values_V) out[Math.min(bins - 1, Math.floor((v - lo) / width))].count++;
  return out;
}

/**
 * Seconds left at the pace so far: the time per finished pair since the first one started, times
 * the pairs left (null before the first pair ends).
 */
export function timeLeft_s(done: number, total: number, elapsed_s: number): number | null {
  if (done <= 0 || total <= done) return done >= total && total > 0 ? 0 : null;
  return (elapsed_s / done) * (total - done);
}

/** Seconds for people: "45 s", "3 min", "1 h 20 min". */
export function formatDuration(s: number): string {
  if (s < 60) return `${Math.max(1, Math.round(s))} s`;
  if (s < 3600) return `${Math.round(s / 60)} min`;
  const h = Math.floor(s / 3600);
  return `${h} h ${Math.round((s - h * 3600) / 60)} min`;
}

/**
 * The sweep as CSV (RFC 4180, a header row, CRLF; text that a spreadsheet would run as a formula is
 * neutralised like the tap table exports): one row per channel × corner pair with the
 * corner's factors, the headroom and eye height in mV, the linear-only headroom, the verdict, the
 * fewest DFE taps, and the engine's message for a refused pair.
 */
export function sweepCsv(inputs: SweepInputs, results: readonly PairResult[]): string {
  const header = [
    "channel_id",
    "channel",
    "loss_at_nyquist_dB",
    "corner",
    "loss_scale",
    "tx_swing_scale",
    "noise_scale",
    "jitter_scale",
    "sensitivity_scale",
    "limiter_headroom_mV",
    "eye_height_mV",
    "linear_headroom_mV",
    "linear_reach_exhausted",
    "fewest_dfe_taps",
    "error",
  ];
  const byPair = new Map(results.map((r) => [`${r.channelId}:${r.cornerIndex}`, r]));
  const mV = (v: number | null) => (v === null ? null : Math.round(v * 1e6) / 1e3);
  const rows = [header.join(",")];
  for (const ch of inputs.channels) {
    inputs.corners.forEach((c, k) => {
      const r = byPair.get(`${ch.id}:${k}`);
      rows.push(
        [
          ch.id,
          ch.name,
          ch.lossAtNyquist_dB,
          c.name,
          c.lossScale ?? 1,
          c.txSwingScale ?? 1,
          c.noiseScale ?? 1,
          c.jitterScale ?? 1,
          c.sensitivityScale ?? 1,
          mV(r?.limiterHeadroom_V ?? null),
          mV(r?.eyeHeight_V ?? null),
          mV(r?.linearHeadroom_V ?? null),
          r?.linearReachExhausted ?? null,
          r?.fewestDfeTaps ?? null,
          r?.error ?? null,
        ]
          .map((v) => csvCell(typeof v === "boolean" ? String(v) : v))
          .join(","),
      );
    });
  }
  return `${rows.join("\r\n")}\r\n`;
}
