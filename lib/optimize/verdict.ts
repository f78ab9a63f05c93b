// The verdict of a tuning run: is linear equalization (transmit FIR + CTLE) enough, and if not, why,
// and how few DFE taps close the link.
import { qFromBer } from "../analysis/ber.ts";
import type { DfeErrorPropagation } from "../analysis/dfeErrorPropagation.ts";
import type { Candidate } from "./jointSearch.ts";
import type { SearchSpace } from "./searchSpace.ts";

/** The verdict of the contract's `optimize` response. */
export interface Verdict {
  /** The best linear-only setting misses the required headroom while the DFE search space meets it. */
  readonly linearReachExhausted: boolean;
  /** Why, in words for a reviewer (with the numbers). */
  readonly reasons: string[];
  /** Fewest DFE taps whose best setting meets the required headroom (0: linear suffices; null: none does). */
  readonly fewestDfeTaps: number | null;
}

const mV = (v: number) => `${(v * 1000).toFixed(1)} mV`;

/**
 * Where the eye of a setting went: the main cursor at the limiter, the part noise takes at the
 * target BER (`2·Q(edgeTail)·σ`, the same tail the eye height's edges carry), and the part ISI and
 * jitter take (the rest of the ideal `gap·g₀`).
 */
export interface EyeBudget {
  readonly mainCursor_V: number;
  readonly noiseClosure_V: number;
  readonly isiClosure_V: number;
  /** What the aggressors take: the eye height without them minus with them (0 without aggressors). */
  readonly crosstalkClosure_V: number;
  /** Share of the peak swing the transmit FIR spends on its side taps (de-emphasis, pre-shoot). */
  readonly sideTapShare: number;
}

/**
 * The closure breakdown of a candidate (see {@link EyeBudget}); `withoutCrosstalk_V` is its eye
 * height at the same setting and phase without the aggressors (omit when there are none).
 */
export function eyeBudget(
  space: SearchSpace,
  candidate: Candidate,
  mainCursor_V: number,
  noiseRms_V: number,
  withoutCrosstalk_V?: number,
): EyeBudget {
  const q = qFromBer(space.edgeTail);
  const ideal = space.levelGap * mainCursor_V;
  const noiseClosure_V = 2 * q * noiseRms_V;
  const crosstalkClosure_V =
    withoutCrosstalk_V === undefined ? 0 : Math.max(0, withoutCrosstalk_V - candidate.eyeHeight_V);
  const isiClosure_V = Math.max(0, ideal - noiseClosure_V - candidate.eyeHeight_V - crosstalkClosure_V);
  let side = 0;
  candidate.taps.forEach((c, j) => {
    if (j !== space.firSpec.pre) side += Math.abs(c);
  });
  return { mainCursor_V, noiseClosure_V, isiClosure_V, crosstalkClosure_V, sideTapShare: side };
}

/** The crosstalk at the verdict's two settings: what each would have without the aggressors, and who they are. */
export interface VerdictCrosstalk {
  /** Eye height of the linear-only and of the full setting without the aggressors (same phase), volts. */
  readonly linearWithout_V: number;
  readonly fullWithout_V: number;
  /** Rms of all the crosstalk at the full setting, the number of aggressors, and the largest one. */
  readonly rms_V: number;
  readonly count: number;
  readonly worst: { readonly name: string; readonly rms_V: number };
}

/**
 * Builds the verdict. `linearReachExhausted` is true when the best linear-only headroom is below
 * `requiredHeadroom_V` while the best with the budget's DFE reaches it. The reasons name, with
 * numbers: the shortfall; the noise floor (de-emphasis and the CTLE's DC attenuation bring the main
 * cursor down toward what the noise takes at the target BER); the residual ISI; the crosstalk, which
 * no DFE cancels; the swing spent on side taps; what the DFE recovers; and how much its error
 * propagation raises the BER at the chosen setting (or that it is not modelled). Crosstalk is named
 * when it costs more headroom than the noise does, and when it is what keeps the link from closing.
 *
 * @param space - the resolved budget.
 * @param linear - best setting without DFE (with its main cursor and noise at the limiter).
 * @param full - best setting with the budget's DFE taps (with its noise at the limiter).
 * @param fewestDfeTaps - fewest taps that reach the required headroom (null: none).
 * @param crosstalk - the aggressors' share at both settings (omit when there are none).
 */
export function verdict(
  space: SearchSpace,
  linear: { candidate: Candidate; mainCursor_V: number; noiseRms_V: number },
  full: { candidate: Candidate; noiseRms_V?: number; errorPropagation?: DfeErrorPropagation | null },
  fewestDfeTaps: number | null,
  crosstalk?: VerdictCrosstalk,
): Verdict {
  const required = space.budget.requiredHeadroom_V;
  const lin = linear.candidate.limiterHeadroom_V;
  const dfe = full.candidate.limiterHeadroom_V;
  const exhausted = lin < required && dfe >= required && space.dfeCount > 0;
  const ber = space.budget.targetBer.toExponential(0);
  const reasons: string[] = [];
  const b = eyeBudget(space, linear.candidate, linear.mainCursor_V, linear.noiseRms_V, crosstalk?.linearWithout_V);
  const who =
    crosstalk === undefined
      ? ""
      : `${crosstalk.count === 1 ? "the aggressor" : `${crosstalk.count} aggressors`} (${mV(crosstalk.rms_V)} rms at the sampler, the largest ${crosstalk.worst.name} with ${mV(crosstalk.worst.rms_V)})`;
  const ctle = linear.candidate.ctle;
  if (lin >= required) {
    reasons.push(
      `Linear equalization alone (transmit FIR + CTLE) leaves ${mV(lin)} of limiter headroom at BER ${ber}, meeting the required ${mV(required)}.`,
    );
  } else {
    reasons.push(
      `Linear equalization alone (transmit FIR + CTLE) leaves ${mV(lin)} of limiter headroom at BER ${ber}, short of the required ${mV(required)}.`,
    );
    const parts: { size: number; text: string }[] = [
      {
        size: b.noiseClosure_V,
        text:
          `Noise floor: with ${(b.sideTapShare * 100).toFixed(0)} % of the swing spent on de-emphasis and pre-shoot and the CTLE's DC gain at ` +
          `${ctle.gDc_dB} dB${ctle.gDc2_dB !== 0 ? ` (low-frequency stage ${ctle.gDc2_dB} dB)` : ""}, the main cursor reaches the limiter at ` +
          `${mV(b.mainCursor_V)}, while the noise there (${mV(linear.noiseRms_V)} rms) takes ${mV(b.noiseClosure_V)} of the eye at BER ${ber}.`,
      },
      {
        size: b.isiClosure_V,
        text: `${space.jitter.rjRms_UI > 0 || space.jitter.djPp_UI > 0 ? "Residual ISI and jitter close" : "Residual ISI closes"} a further ${mV(b.isiClosure_V)} of the eye that linear taps cannot remove without costing swing.`,
      },
    ];
    if (crosstalk !== undefined && b.crosstalkClosure_V > 0) {
      parts.push({
        size: b.crosstalkClosure_V,
        text: `Crosstalk: ${who} closes ${mV(b.crosstalkClosure_V)} of the eye; the CTLE's peaking lifts it with the signal.`,
      });
    }
    parts.sort((x, y) => y.size - x.size);
    for (const p of parts) reasons.push(p.text);
  }
  if (crosstalk !== undefined) {
    const closure = Math.max(0, crosstalk.fullWithout_V - full.candidate.eyeHeight_V);
    const noise = 2 * qFromBer(space.edgeTail) * (full.noiseRms_V ?? linear.noiseRms_V);
    const without = crosstalk.fullWithout_V - space.budget.limiterSensitivity_V;
    if (dfe < required && without >= required) {
      reasons.push(
        `Crosstalk is what closes the eye: at the best setting ${who} take ${mV(closure)}; without them the headroom would be ${mV(without)}, meeting the required ${mV(required)}. No DFE cancels crosstalk.`,
      );
    } else if (closure > noise) {
      reasons.push(
        `Crosstalk costs more headroom than noise: ${who} take ${mV(closure)} of the eye at BER ${ber}, the noise ${mV(noise)}. No DFE cancels crosstalk.`,
      );
    }
  }
  if (space.dfeCount > 0) {
    if (dfe >= required) {
      reasons.push(
        fewestDfeTaps !== null && fewestDfeTaps > 0
          ? `A DFE recovers it: ${fewestDfeTaps === 1 ? "one tap reaches" : `${fewestDfeTaps} taps reach`} the required headroom; with ${space.dfeCount === 1 ? "it" : `all ${space.dfeCount}`} the headroom is ${mV(dfe)}.`
          : `With the DFE (${space.dfeCount} taps) the headroom is ${mV(dfe)}.`,
      );
    } else {
      reasons.push(
        `Even with ${space.dfeCount} DFE taps the headroom is ${mV(dfe)}, short of the required ${mV(required)}: the link does not close with this budget.`,
      );
    }
  }
  const propagation = full.errorPropagation;
  if (propagation) reasons.push(errorPropagationReason(propagation));
  return { linearReachExhausted: exhausted, reasons, fewestDfeTaps };
}

/** A bit error ratio as people write it: "3.2e-15". */
const berText = (x: number) => x.toExponential(1).replace("e+", "e");

/** The verdict's sentence on DFE error propagation (see `dfeErrorPropagation`). */
export function errorPropagationReason(p: DfeErrorPropagation): string {
  if (!p.modelled) return `DFE error propagation: ${p.reason}; the figures above assume correct decisions fed back.`;
  if (p.factor === null) {
    return "DFE error propagation: the BER at the chosen setting is below what double precision resolves, so its rise is not measured; the figures above assume correct decisions fed back.";
  }
  return (
    `With error propagation the BER at the chosen setting rises ×${p.factor < 10 ? p.factor.toFixed(2) : p.factor.toPrecision(3)} ` +
    `(from ${berText(p.berWithout)} to ${berText(p.berWith)} at the eye-centre threshold; the DFE's own decisions fed back, a Markov chain of its ${p.states} error states); ` +
    "eye height and headroom assume correct decisions."
  );
}
