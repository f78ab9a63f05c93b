// Tuning runs: request schemas, the shapes the API answers, and small presentation helpers.
// No server code here: islands import this file.
import { z } from "zod";
import type { Budget } from "@lib/contract/budget";
import type { TuningRunResult } from "@lib/run";
import type { ApiJobStatus } from "@/features/jobs/jobs";
import type { StoredPulse } from "@/features/channels/channels";

const id = (what: string) =>
  z
    .number({ error: `${what} must be a number.` })
    .int(`${what} must be an integer.`)
    .positive(`${what} must be positive.`);

/** POST /api/v1/runs. */
export const startRunRequest = z.object({ channelId: id("channelId"), budgetId: id("budgetId") });
export type StartRunRequest = z.infer<typeof startRunRequest>;

export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  cursor: z.coerce.number().int().min(0).optional(),
  channelId: z.coerce.number().int().positive().optional(),
  budgetId: z.coerce.number().int().positive().optional(),
});
export type RunListQuery = z.input<typeof listQuery>;

export const idParams = z.object({ id: z.coerce.number({ error: "The id must be a number." }).int().positive() });

/** An aggressor as a run copies it. */
export interface RunAggressor {
  name: string;
  kind: "next" | "fext";
  pulse: StoredPulse;
}

/** What a run was computed from, copied at its start so that it never changes afterwards (the budget as stored, defaults filled in). */
export interface RunInputs {
  /** `aggressors`: the channel's crosstalk pulses at the receiver's pins (absent for none, and in runs started before aggressors existed). */
  channel: { id: number; name: string; bitRate_bps: number; pulse: StoredPulse; aggressors?: RunAggressor[] };
  budget: { id: number; name: string; params: Budget };
}

/** The short summary a finished run keeps for lists. */
export interface RunSummary {
  limiterHeadroom_V: number;
  eyeHeight_V: number;
  linearReachExhausted: boolean;
  /** Whether the link meets the required headroom with some number of the budget's DFE taps. */
  closes?: boolean;
}

/** A row of a run list. */
export interface RunListItem {
  id: number;
  status: ApiJobStatus;
  progress: number;
  channel: { id: number | null; name: string };
  budget: { id: number | null; name: string };
  summary: RunSummary | null;
  /** Why the run failed (api.md's error shape), when it did. */
  error: { message: string } | null;
  createdBy: string | null;
  createdAt: string | Date;
  finishedAt: string | Date | null;
}

/** When the run was queued, started and finished, and how long the engine computed. */
export interface RunTimings {
  queuedAt: string | Date;
  startedAt: string | Date | null;
  finishedAt: string | Date | null;
  compute_ms: number | null;
}

/** GET /api/v1/runs/:id. `result` holds the engine's tuning result once the run is done. */
export interface RunView extends RunListItem {
  jobId: number;
  inputs: RunInputs;
  result: TuningRunResult | null;
  engineVersion: string | null;
  rerunOf: number | null;
  timings: RunTimings;
}

export const statusLabels: Record<ApiJobStatus, string> = {
  queued: "Queued",
  running: "Running",
  done: "Done",
  failed: "Failed",
};

/** Badge classes for a status. */
export function statusClass(status: ApiJobStatus): string {
  return {
    queued: "bg-line text-ink-soft",
    running: "bg-warn-soft text-warn",
    done: "bg-good-soft text-good",
    failed: "bg-bad-soft text-bad",
  }[status];
}

/** Milliseconds between two instants, or null. */
export function elapsed_ms(from: string | Date | null, to: string | Date | null): number | null {
  if (!from || !to) return null;
  return new Date(to).getTime() - new Date(from).getTime();
}

/** A duration for people: "850 ms", "2.4 s", "1 min 12 s". */
export function formatDuration(ms: number | null): string {
  if (ms === null) return "—";
  if (ms < 1000) return `${Math.round(ms)} ms`;
  if (ms < 60_000) return `${(ms / 1000).toFixed(1)} s`;
  return `${Math.floor(ms / 60_000)} min ${Math.round((ms % 60_000) / 1000)} s`;
}

/** Names of transmit FIR taps from the earliest pre-cursor tap: c(−1), c(0), c(+1), … */
export function firTapLabels(count: number, pre: number): string[] {
  return Array.from({ length: count }, (_, j) => {
    const k = j - pre;
    return `c(${k > 0 ? "+" : k < 0 ? "−" : ""}${Math.abs(k)})`;
  });
}

/** Columns of a trajectory: `rows[k][j]` → one array per tap j. */
export function byTap(rows: readonly (readonly number[])[]): number[][] {
  const n = rows[0]?.length ?? 0;
  return Array.from({ length: n }, (_, j) => rows.map((r) => r[j]));
}

/** The receiver's figure of merit of transmit training (ISI + noise over the main cursor squared) as an SNR in dB. */
export function trainingSnr_dB(objective: number): number {
  return -10 * Math.log10(objective);
}

/** The sampling-phase policies with their names and what each one means (the run page's tooltips). */
export const SAMPLING_POLICY_HELP: Record<"centre" | "max-height" | "mueller-muller", { label: string; help: string }> =
  {
    centre: {
      label: "Eye centre",
      help: "Where the pulse is equal half a UI before and after the sample, p(t − ½UI) = p(t + ½UI): the point a bang-bang (Alexander) CDR locks to. The default for budgets and the eye command.",
    },
    "max-height": {
      label: "Maximum height",
      help: "The phase within ±½ UI with the tallest eye at the target BER: the best any clock could do, not a point a CDR locks to by itself.",
    },
    "mueller-muller": {
      label: "Mueller–Müller",
      help: "Where the first pre-cursor equals the first post-cursor, h(−1) = h(+1): the lock point of a baud-rate (Mueller–Müller) CDR.",
    },
  };

/** The DFE error-propagation row of the run page: the rise of the BER, or why it is not given. */
export function errorPropagationText(p: TuningRunResult["optimize"]["errorPropagation"] | undefined): string {
  if (p === undefined) return "not computed by this engine version";
  if (p === null) return "no DFE taps";
  if (!p.modelled) return `not modelled: ${p.reason}`;
  if (p.factor === null) return "BER below double precision at the chosen setting; not measured";
  const ber = (x: number) => x.toExponential(1).replace("e+", "e");
  return `BER ×${p.factor < 10 ? p.factor.toFixed(2) : p.factor.toPrecision(3)} (${ber(p.berWithout)} → ${ber(p.berWith)} at the eye centre)`;
}

/** The eye's target BER as people write it: "1e-12". */
export function formatBer(ber: number): string {
  return ber.toExponential(0).replace("e+", "e");
}

/** Numbers as one comma-separated string, rounded to `decimals` (compact island props: a string, not a tagged array). */
export function packNumbers(values: readonly number[], decimals: number): string {
  const f = 10 ** decimals;
  return values.map((v) => Math.round(v * f) / f).join(",");
}

/** The inverse of {@link packNumbers}. */
export function unpackNumbers(text: string): number[] {
  return text === "" ? [] : text.split(",").map(Number);
}

/** A density eye and its contours, packed for an island. */
export interface PackedEye {
  width: number;
  height: number;
  counts: string;
  time_UI: string;
  voltage_V: string;
  /** Per contour: its level and its paths, each a packed flat list `t0,v0,t1,v1,…`. */
  contours: { log10Ber: number; paths: string[] }[];
  eyeHeight_V: number;
  symbols: { count: number; source: string };
  /** The noise and jitter folded into the image (absent in results of engines before it was). */
  spread?: { noiseRms_V: number; rjRms_UI: number; djPp_UI: number };
}

interface EyeLike {
  image: {
    width: number;
    height: number;
    counts: readonly number[];
    time_UI: readonly number[];
    voltage_V: readonly number[];
  };
  contours: readonly { log10Ber: number; paths: readonly (readonly (readonly [number, number])[])[] }[];
  eyeHeight_V: number;
  symbols: { count: number; source: string };
  spread?: { noiseRms_V: number; rjRms_UI: number; djPp_UI: number };
}

/** Packs an eye: counts to 1/100 hit (noise spreads them over cells), times to 1/1000 UI, voltages to 10 µV. */
export function packEye(e: EyeLike): PackedEye {
  return {
    width: e.image.width,
    height: e.image.height,
    counts: packNumbers(e.image.counts, 2),
    time_UI: packNumbers(e.image.time_UI, 4),
    voltage_V: packNumbers(e.image.voltage_V, 6),
    contours: e.contours.map((c) => ({
      log10Ber: c.log10Ber,
      paths: c.paths.map((p) =>
        p.map(([t, v]) => `${Math.round(t * 1e3) / 1e3},${Math.round(v * 1e5) / 1e5}`).join(","),
      ),
    })),
    eyeHeight_V: e.eyeHeight_V,
    symbols: e.symbols,
    spread: e.spread,
  };
}

/** The inverse of {@link packEye}, in the shapes the DensityEye chart takes. */
export function unpackEye(p: PackedEye) {
  return {
    image: {
      width: p.width,
      height: p.height,
      counts: unpackNumbers(p.counts),
      time_UI: unpackNumbers(p.time_UI),
      voltage_V: unpackNumbers(p.voltage_V),
    },
    contours: p.contours.map((c) => ({
      log10Ber: c.log10Ber,
      paths: c.paths.map((s) => {
        const n = unpackNumbers(s);
        const pts: [number, number][] = [];
        for (let i = 0; i + 1 < n.length; i += 2) pts.push([n[i], n[i + 1]]);
        return pts;
      }),
    })),
    eyeHeight_V: p.eyeHeight_V,
    symbols: p.symbols,
    spread: p.spread,
  };
}

/** The charts below the eyes, packed for their island. */
export interface PackedRunCharts {
  pulses: { time_UI: string; before_V: string; after_V: string };
  bathtub: { phase_UI: string; log10Ber: string };
  surface: TuningRunResult["optimize"]["surface"];
  dfe: { variant: string; mu: number; iterations: string; taps: string[]; target: number[] } | null;
  txTraining: { taps: string[]; snr_dB: string; converged: boolean };
  chosen: { gDc_dB: number; gDc2_dB: number };
  targetBer: number;
  txPre: number;
  requiredHeadroom_V: number;
}

/** Display-ready, compact props of the result page's islands (values rounded well below what a chart shows). */
export function packRunCharts(
  result: TuningRunResult,
  budget: { targetBer: number; requiredHeadroom_V: number; tx: { pre: number } },
): PackedRunCharts {
  const dfe = result.adaptation.dfe;
  const tx = result.adaptation.txTraining;
  return {
    pulses: {
      time_UI: packNumbers(result.pulses.time_UI, 4),
      before_V: packNumbers(result.pulses.before_V, 7),
      after_V: packNumbers(result.pulses.after_V, 7),
    },
    bathtub: { phase_UI: packNumbers(result.bathtub.phase_UI, 4), log10Ber: packNumbers(result.bathtub.log10Ber, 3) },
    surface: result.optimize.surface,
    dfe: dfe && {
      variant: dfe.variant,
      mu: dfe.mu,
      iterations: packNumbers(dfe.iterations, 0),
      taps: byTap(dfe.taps).map((t) => packNumbers(t, 7)),
      target: dfe.target,
    },
    txTraining: {
      taps: byTap(tx.taps).map((t) => packNumbers(t, 5)),
      snr_dB: packNumbers(tx.objective.map(trainingSnr_dB), 3),
      converged: tx.converged,
    },
    chosen: result.optimize.ctle,
    targetBer: budget.targetBer,
    txPre: budget.tx.pre,
    requiredHeadroom_V: budget.requiredHeadroom_V,
  };
}
