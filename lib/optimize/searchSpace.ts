// A budget resolved against a pulse: the grids to search, the scale of the signal at the limiter,
// the jitter left at the sampler, and every check that needs both.
import { edgeTail } from "../analysis/berConvention.ts";
import type { Jitter } from "../analysis/jitterKernel.ts";
import { type SamplerJitter, samplerJitter } from "../clocking/jitterTransfer.ts";
import type { SamplingPolicy } from "../clocking/samplingPhase.ts";
import { type Budget, type BudgetInput, budgetSchema, gridValues } from "../contract/budget.ts";
import { formatPath } from "../contract/common.ts";
import { formatQuantity } from "../contract/formatQuantity.ts";
import type { CtleParams } from "../equalizers/ctleResponse.ts";
import type { TxFirSpec } from "../equalizers/txFirConstraints.ts";
import { type FrontEnd, frontEndTransfer, isNeutralFrontEnd } from "../package/frontEnd.ts";
import { assertPulse } from "../pulse/assertPulse.ts";
import type { Modulation, Pulse } from "../types.ts";

/** Step of the scaffold grid searched before the refinement when the budget's FIR has no step. */
export const CONTINUOUS_SCAFFOLD_STEP = 0.05;

/** One CTLE setting of the grid. */
export interface CtleSetting {
  readonly gDc_dB: number;
  readonly gDc2_dB: number;
}

/** Everything a search needs, derived from a budget and a pulse. */
export interface SearchSpace {
  readonly budget: Budget;
  readonly modulation: Modulation;
  /** Symbol amplitude at the transmitter: `txSwing_Vppd / 2` (volts per unit of pulse). */
  readonly scale_V: number;
  /** Spacing of adjacent symbol levels (NRZ 2, PAM4 2/3) — the eye's nominal height per volt of main cursor. */
  readonly levelGap: number;
  /** Symbol rate in Hz (`1/ui_s`). */
  readonly baud_Hz: number;
  /** The CTLE grid, `gDc2_dB` varying slowest; `ctleAxes` gives the two axes. */
  readonly ctleSettings: readonly CtleSetting[];
  readonly ctleAxes: { readonly gDc_dB: readonly number[]; readonly gDc2_dB: readonly number[] };
  /** Fixed CTLE corners. */
  readonly ctleCorners: Omit<CtleParams, "gDc_dB" | "gDc2_dB">;
  /** The transmit FIR grid searched (the scaffold step when the budget's FIR is continuous). */
  readonly firSpec: TxFirSpec;
  /** True when the budget gives no FIR step: taps are continuous and refined after the grid search. */
  readonly continuousFir: boolean;
  /** Number of DFE taps and the limit of each, volts (Infinity for none). */
  readonly dfeCount: number;
  readonly dfeLimits_V: Float64Array;
  /** Jitter at the sampler after the clocking scheme's tracking. */
  readonly jitter: SamplerJitter;
  readonly policy: SamplingPolicy;
  /** The conditional tail each eye edge carries at the budget's target bit error ratio (`edgeTail`). */
  readonly edgeTail: number;
  /** Packages and the receiver's bandwidth filter, applied to the channel and every aggressor before the CTLE. */
  readonly frontEnd: FrontEnd;
  /**
   * `|H_rx(f)|²` of the receiver's package and bandwidth filter (what shapes the front-end noise) on
   * [0, baud/2], interpolated from a 4097-point table; null when the receiver has neither.
   */
  readonly rxNoiseShaping: ((freq_Hz: number) => number) | null;
  /** The receive FFE's tap counts (null: none). */
  readonly ffe: { readonly pre: number; readonly post: number } | null;
}

/**
 * Validates a budget (zod schema of the contract) and throws a RangeError whose message starts with
 * the field's path (`budget.ctle.gDc_dB: …`).
 */
export function resolveBudget(budget: BudgetInput | Budget): Budget {
  const r = budgetSchema.safeParse(budget);
  if (!r.success) {
    const issue = r.error.issues[0];
    const path = formatPath(issue.path);
    throw new RangeError(`budget${path === "" ? "" : `.${path}`}: ${issue.message}`);
  }
  return r.data;
}

/** Number of bits one symbol carries. */
export function bitsPerSymbol(modulation: Modulation): number {
  return modulation === "pam4" ? 2 : 1;
}

/**
 * Resolves a budget against a pulse.
 *
 * @param pulse - channel pulse response for a 1 V symbol.
 * @param budget - the budget (validated here).
 * @throws RangeError naming the field when the budget is invalid or its bit rate does not match the
 *   pulse's UI (within 1 %).
 */
export function searchSpace(pulse: Pulse, budget: BudgetInput | Budget): SearchSpace {
  assertPulse(pulse);
  const b = resolveBudget(budget);
  const baud_Hz = 1 / pulse.ui_s;
  if (b.bitRate_bps !== undefined) {
    const want = baud_Hz * bitsPerSymbol(b.modulation);
    if (Math.abs(b.bitRate_bps / want - 1) > 0.01) {
      throw new RangeError(
        `budget.bitRate_bps: ${formatQuantity(b.bitRate_bps, "b/s")} does not match the channel's ${formatQuantity(want, "b/s")} (${b.modulation.toUpperCase()}, UI ${formatQuantity(pulse.ui_s, "s")})`,
      );
    }
  }
  const g1 = gridValues(b.ctle.gDc_dB);
  const g2raw = b.ctle.gDc2_dB;
  const g2 = g2raw === undefined ? [0] : typeof g2raw === "number" ? [g2raw] : gridValues(g2raw);
  const ctleSettings: CtleSetting[] = [];
  for (const gDc2_dB of g2) for (const gDc_dB of g1) ctleSettings.push({ gDc_dB, gDc2_dB });
  const continuousFir = b.tx.step === undefined;
  const firSpec: TxFirSpec = {
    pre: b.tx.pre,
    post: b.tx.post,
    step: b.tx.step ?? CONTINUOUS_SCAFFOLD_STEP,
    ranges: b.tx.ranges,
  };
  const dfeCount = b.dfe.taps;
  const lim = b.dfe.limits_V;
  const dfeLimits_V = Float64Array.from({ length: dfeCount }, (_, k) =>
    lim === undefined ? Number.POSITIVE_INFINITY : typeof lim === "number" ? lim : lim[k],
  );
  const linkJitter: (Jitter & { djFreq_Hz?: number }) | undefined = b.jitter;
  return {
    budget: b,
    modulation: b.modulation,
    scale_V: b.txSwing_Vppd / 2,
    levelGap: b.modulation === "pam4" ? 2 / 3 : 2,
    baud_Hz,
    ctleSettings,
    ctleAxes: { gDc_dB: g1, gDc2_dB: g2 },
    ctleCorners: { fz_Hz: b.ctle.fz_Hz, fp1_Hz: b.ctle.fp1_Hz, fp2_Hz: b.ctle.fp2_Hz, fLf_Hz: b.ctle.fLf_Hz },
    firSpec,
    continuousFir,
    dfeCount,
    dfeLimits_V,
    jitter: samplerJitter(linkJitter, b.clocking.scheme, b.clocking.bandwidth_Hz, baud_Hz),
    policy: b.clocking.policy,
    edgeTail: edgeTail(b.modulation, b.targetBer),
    frontEnd: { txPackage: b.package?.tx, rxPackage: b.package?.rx, rxBandwidth_Hz: b.frontEnd?.rxBandwidth_Hz },
    rxNoiseShaping: rxNoiseShaping(
      { rxPackage: b.package?.rx, rxBandwidth_Hz: b.frontEnd?.rxBandwidth_Hz },
      baud_Hz / 2,
    ),
    ffe: b.ffe ?? null,
  };
}

/** Points of the table {@link SearchSpace.rxNoiseShaping} interpolates. */
const SHAPING_POINTS = 4096;

function rxNoiseShaping(rx: FrontEnd, band_Hz: number): ((freq_Hz: number) => number) | null {
  if (isNeutralFrontEnd(rx)) return null;
  const freqs = Float64Array.from({ length: SHAPING_POINTS + 1 }, (_, k) => (k * band_Hz) / SHAPING_POINTS);
  const h = frontEndTransfer(rx, freqs);
  const p = Float64Array.from(freqs, (_, k) => h.re[k] * h.re[k] + h.im[k] * h.im[k]);
  return (f) => {
    const x = Math.min(SHAPING_POINTS, Math.max(0, (f / band_Hz) * SHAPING_POINTS));
    const i = Math.min(SHAPING_POINTS - 1, Math.floor(x));
    return p[i] + (x - i) * (p[i + 1] - p[i]);
  };
}

/**
 * What two resolved budgets searched together (members of one population, e.g. corners) must share:
 * modulation, sampling policy, the CTLE grid and corners, the transmit FIR grid, the DFE's taps and
 * limits, and the receive FFE's taps (the class default carries starting values for them). Returns the first field that differs, or null. Swing, noise, jitter, sensitivity and
 * the BER target may differ.
 */
export function sharedGridMismatch(a: SearchSpace, b: SearchSpace): string | null {
  if (a.modulation !== b.modulation) return "modulation";
  if (a.policy !== b.policy) return "clocking.policy";
  if (a.baud_Hz !== b.baud_Hz) return "bitRate_bps";
  const settings = (s: SearchSpace) => s.ctleSettings.map((c) => `${c.gDc_dB}/${c.gDc2_dB}`).join(",");
  if (settings(a) !== settings(b) || JSON.stringify(a.ctleCorners) !== JSON.stringify(b.ctleCorners)) return "ctle";
  if (JSON.stringify(a.firSpec) !== JSON.stringify(b.firSpec)) return "tx";
  if (a.dfeCount !== b.dfeCount || a.dfeLimits_V.some((l, k) => l !== b.dfeLimits_V[k])) return "dfe";
  if (JSON.stringify(a.ffe) !== JSON.stringify(b.ffe)) return "ffe";
  return null;
}
