// One tuning run for the web app's worker: the optimizer's answer plus everything the result page
// draws — eyes before and after, pulses, bathtub, adaptation trajectories, metrics, verdict — as
// plain JSON (number arrays, no NaN or Infinity).
import { bathtub } from "../analysis/bathtub.ts";
import { berContours } from "../analysis/berContours.ts";
import { berMap } from "../analysis/berMap.ts";
import { densityEye } from "../analysis/densityEye.ts";
import { noisyDensityEye } from "../analysis/noisyDensityEye.ts";
import { limiterNoise } from "../analysis/limiterNoise.ts";
import { type StatisticalEye, statisticalEye } from "../analysis/statisticalEye.ts";
import { symbolStream } from "../analysis/symbolStream.ts";
import { samplingPhase } from "../clocking/samplingPhase.ts";
import type { BudgetInput } from "../contract/budget.ts";
import { applyFir } from "../equalizers/applyFir.ts";
import type { LinkAggressor } from "../crosstalk/linkAggressor.ts";
import { ctleNoiseGain } from "../equalizers/ctleNoiseGain.ts";
import { equalizedCursors } from "../optimize/ctleChannel.ts";
import { kernelFloorOf, phaseEye } from "../optimize/evaluateSetting.ts";
import { type CrosstalkResult, type OptimizeResult, optimizeDetailed } from "../optimize/optimize.ts";
import type { SearchSpace } from "../optimize/searchSpace.ts";
import { frontEndLoss_dB } from "../package/frontEnd.ts";
import { pulseLoss_dB } from "../pulse/pulseLoss.ts";
import { scalePulse } from "../pulse/scalePulse.ts";
import { txTraining } from "../solvers/txTraining.ts";
import type { Pulse } from "../types.ts";
import { dfeAdaptation } from "./dfeAdaptation.ts";
import { ENGINE_VERSION } from "./engineVersion.ts";

/** A density eye with BER contours on the same axes (time in UI from the sampling instant). */
export interface EyeFigure {
  readonly image: {
    readonly width: number;
    readonly height: number;
    /** Hits per cell, `counts[row·width + col]`, row 0 the highest voltage. */
    readonly counts: number[];
    readonly time_UI: number[];
    readonly voltage_V: number[];
  };
  /** Lines where the statistical eye's error ratio is `10^log10Ber`; points `[time_UI, voltage_V]`. */
  readonly contours: { readonly log10Ber: number; readonly paths: [number, number][][] }[];
  readonly eyeHeight_V: number;
  /** Sampling phase in UI from the pulse's nominal main cursor (the image is centred on it). */
  readonly samplingPhase_UI: number;
  /** Symbols folded into the image and where they came from. */
  readonly symbols: { readonly count: number; readonly source: string };
  /** The noise and jitter folded into the image: the statistical eye's own (0 for none). */
  readonly spread: { readonly noiseRms_V: number; readonly rjRms_UI: number; readonly djPp_UI: number };
}

/** Everything a tuning run's result page shows. */
export interface TuningRunResult {
  readonly engineVersion: string;
  /** The optimizer's response (contract `optimize` plus surface, top settings, clocking). */
  readonly optimize: OptimizeResult;
  /** The channel with the transmit swing only (no equalization, no DFE), and after equalization. */
  readonly eyes: { readonly before: EyeFigure; readonly after: EyeFigure };
  /** Pulses at the limiter input on a common time axis (UI from each pulse's main cursor). */
  readonly pulses: { readonly time_UI: number[]; readonly before_V: number[]; readonly after_V: number[] };
  /** Bathtub of the equalized eye (phase in UI from the sampling instant). */
  readonly bathtub: { readonly phase_UI: number[]; readonly log10Ber: number[] };
  readonly adaptation: {
    /** LMS of the receive DFE toward its closed form (null without DFE taps). */
    readonly dfe: {
      readonly variant: string;
      readonly mu: number;
      readonly iterations: number[];
      readonly taps: number[][];
      readonly target: number[];
    } | null;
    /** Back-channel transmit training from a plain FIR: taps and figure of merit per exchange. */
    readonly txTraining: {
      readonly taps: number[][];
      readonly objective: number[];
      readonly converged: boolean;
      readonly final: number[];
    };
  };
  readonly metrics: {
    readonly eyeHeight_V: number;
    readonly eyeWidth_UI: number;
    readonly limiterHeadroom_V: number;
    /** Residual ISI at the sampling instant after the DFE: peak (Σ|r|) and rms (√Σr²), volts. */
    readonly residualIsiPeak_V: number;
    readonly residualIsiRms_V: number;
    /** The CTLE's noise-power gain over [0, baud/2] (dB; it scales the front-end noise), and the total noise at the limiter. */
    readonly noiseGain_dB: number;
    readonly noiseRms_V: number;
    readonly txTaps: number[];
    readonly ctle: { readonly gDc_dB: number; readonly gDc2_dB: number };
    readonly dfe: { readonly taps: number[]; readonly limits_V: (number | null)[]; readonly clipped: boolean[] };
  };
  readonly verdict: OptimizeResult["verdict"];
  /**
   * The aggressors at the chosen setting (null: none): the optimizer's figures and the after-eye
   * drawn again without them (same setting and phase; its contours without crosstalk).
   */
  readonly crosstalk: (CrosstalkResult & { readonly eyeWithout: EyeFigure }) | null;
  /**
   * Loss at Nyquist, dB: the channel's (from its pulse, relative to DC), each package's and the
   * receiver filter's, and the packages' share of the total (null: the budget has no package).
   */
  readonly loss: {
    readonly channelAtNyquist_dB: number;
    readonly txPackage_dB: number | null;
    readonly rxPackage_dB: number | null;
    readonly rxFilter_dB: number | null;
    readonly packageShare: number | null;
  };
}

/** Size and content of the run's pictures. */
const IMAGE = { width: 128, height: 96 };
const CONTOUR_LEVELS = [-3, -6, -9, -12, -15];

function finite(x: number): number {
  if (!Number.isFinite(x)) throw new RangeError(`a result value is not finite (${x})`);
  return x;
}

/** Density image and matching BER contours of a pulse (volts at the limiter) and its statistical eye. */
function eyeFigure(pulse: Pulse, eye: StatisticalEye, phase: number, space: SearchSpace, ber: number): EyeFigure {
  const mod = space.modulation;
  const order = mod === "pam4" ? 13 : 9;
  const symbols = symbolStream(mod, { kind: "prbs", order });
  // The noise-free image first, for its peak; then the image again with room for 4 σ of noise, and
  // the statistical eye's noise and jitter folded in, so the picture closes where the contours do.
  const bare = densityEye(pulse, symbols, { ...IMAGE, phase });
  const top = bare.voltage_V[0] + 0.5 * Math.abs(bare.voltage_V[0] - bare.voltage_V[1]) + 4 * eye.noiseRms_V;
  const img = noisyDensityEye(
    densityEye(pulse, symbols, { ...IMAGE, phase, voltageRange_V: [-top, top] }),
    eye.noiseRms_V,
    eye.jitter,
  );
  const spu = pulse.samplesPerUi;
  const phases = Float64Array.from(img.time_UI, (t) => phase + t * spu);
  const map = berMap(eye, phases, img.voltage_V);
  const levels = [...new Set([...CONTOUR_LEVELS, Math.round(Math.log10(ber) * 100) / 100])].sort((a, b) => b - a);
  const contours = berContours(map, levels, 1 / spu).map((c) => ({
    log10Ber: c.log10Ber,
    paths: c.paths.map((p) => p.map(([t, v]) => [finite(t - phase / spu), finite(v)] as [number, number])),
  }));
  return {
    image: {
      width: img.width,
      height: img.height,
      // Expected hits to 1/100 (a cell below 0.005 hits is drawn empty).
      counts: Array.from(img.counts, (c) => Math.round(c * 100) / 100),
      time_UI: Array.from(img.time_UI),
      voltage_V: Array.from(img.voltage_V),
    },
    contours,
    eyeHeight_V: eye.eyeHeight(phase, ber),
    samplingPhase_UI: phase / spu,
    symbols: { count: symbols.length, source: `PRBS${order}${mod === "pam4" ? " (Gray-coded PAM4)" : ""}` },
    spread: { noiseRms_V: eye.noiseRms_V, rjRms_UI: eye.jitter?.rjRms_UI ?? 0, djPp_UI: eye.jitter?.djPp_UI ?? 0 },
  };
}

/** The channel's and the front end's loss at Nyquist (see {@link TuningRunResult.loss}). */
function lossAtNyquist(pulse: Pulse, space: SearchSpace): TuningRunResult["loss"] {
  const f = space.baud_Hz / 2;
  const fe = space.frontEnd;
  const channel = pulseLoss_dB(pulse, f);
  const tx = fe.txPackage === undefined ? null : frontEndLoss_dB({ txPackage: fe.txPackage }, f);
  const rx = fe.rxPackage === undefined ? null : frontEndLoss_dB({ rxPackage: fe.rxPackage }, f);
  const filter = fe.rxBandwidth_Hz === undefined ? null : frontEndLoss_dB({ rxBandwidth_Hz: fe.rxBandwidth_Hz }, f);
  const packages = (tx ?? 0) + (rx ?? 0);
  const total = channel + packages + (filter ?? 0);
  return {
    channelAtNyquist_dB: channel,
    txPackage_dB: tx,
    rxPackage_dB: rx,
    rxFilter_dB: filter,
    packageShare: tx === null && rx === null ? null : total > 0 ? packages / total : 0,
  };
}

/** `pulse` sampled at `time_UI` from its main cursor (linear, 0 outside). */
function sampleAt(pulse: Pulse, time_UI: readonly number[]): number[] {
  const v = pulse.values_V;
  return time_UI.map((t) => {
    const x = pulse.mainIndex + t * pulse.samplesPerUi;
    const i = Math.floor(x);
    const f = x - i;
    const a = i >= 0 && i < v.length ? v[i] : 0;
    const b = i + 1 >= 0 && i + 1 < v.length ? v[i + 1] : 0;
    return a + f * (b - a);
  });
}

/**
 * The tuning run of the web app: {@link optimizeDetailed} for the pulse and budget, then the figures.
 *
 * - Eye before: the channel's pulse times the transmit swing (`txSwing_Vppd/2`), no CTLE, FIR or DFE,
 *   noise `√(noiseRms_V² + inputNoiseRms_V²)`, sampled by the budget's policy.
 * - Eye after: the equalized pulse (CTLE and transmit FIR) with the DFE's feedback drawn as one UI
 *   of `−d_k` per post-cursor around its sampling instant, so the time-domain image opens exactly
 *   where the statistical eye (DFE included) does.
 * - Density images fold a PRBS (PRBS9 NRZ, PRBS13 Gray-coded PAM4) over 2 UI, 128 × 96 cells, with
 *   the statistical eye's noise (in voltage) and jitter (in time) folded in (`noisyDensityEye`); the
 *   contours are the statistical eye's BER at 1e-3, 1e-6, 1e-9, 1e-12, 1e-15 and the target.
 * - Adaptation: LMS of the DFE taps on the equalized cursors toward their closed form, and
 *   back-channel transmit training with the chosen CTLE.
 *
 * - Crosstalk: with aggressors, the optimizer's crosstalk figures and the after-eye's contours again
 *   without them; loss: the channel's and the front end's at Nyquist.
 *
 * @param pulse - channel pulse response for a 1 V symbol.
 * @param budget - the budget (validated; RangeError names the field).
 * @param onProgress - progress 0 … 1.
 * @param aggressors - the channel's aggressors (crosstalk pulses at the receiver's pins).
 */
export function tuningRun(
  pulse: Pulse,
  budget: BudgetInput,
  onProgress?: (fraction: number) => void,
  aggressors: readonly LinkAggressor[] = [],
): TuningRunResult {
  const report = onProgress ?? (() => {});
  const detail = optimizeDetailed(pulse, budget, { onProgress: (f) => report(0.8 * f), aggressors });
  const { space, full, result } = detail;
  const b = space.budget;
  const ber = b.targetBer;
  const s = space.scale_V;
  const jitter = space.jitter.rjRms_UI > 0 || space.jitter.djPp_UI > 0 ? space.jitter : undefined;

  // Before: the channel alone at the transmit swing.
  const rawAtLimiter = scalePulse(pulse, s);
  const noiseBefore = limiterNoise(b.noiseRms_V, b.inputNoiseRms_V, 1);
  const beforeEye = statisticalEye(rawAtLimiter, {
    modulation: space.modulation,
    noiseRms_V: noiseBefore,
    jitter,
    kernelFloor: kernelFloorOf(space),
    targetBer: ber,
  });
  const beforePhase = samplingPhase(beforeEye, space.policy, ber);
  const before = eyeFigure(rawAtLimiter, beforeEye, beforePhase, space, ber);
  report(0.86);

  // After: CTLE + transmit FIR at the swing, DFE feedback as a one-UI step per post-cursor.
  const spu = pulse.samplesPerUi;
  const equalized = scalePulse(applyFir(full.channel.pulse, full.taps, space.firSpec.pre), s);
  const withDfe = Float64Array.from(equalized.values_V);
  const dfe = full.eye.dfeTaps;
  const half = Math.floor(spu / 2);
  for (let k = 0; k < dfe.length; k++) {
    const centre = equalized.mainIndex + full.eye.phase + (k + 1) * spu;
    for (let i = centre - half; i < centre - half + spu; i++) if (i >= 0 && i < withDfe.length) withDfe[i] -= dfe[k];
  }
  const afterPulse: Pulse = { ...equalized, values_V: withDfe };
  const after = eyeFigure(afterPulse, full.eye.eye, full.eye.phase, space, ber);
  let crosstalk: TuningRunResult["crosstalk"] = null;
  if (result.crosstalk !== null) {
    const without = phaseEye(full.channel, space, full.taps, full.eye.dfeTaps.length, full.eye.phase, false);
    crosstalk = { ...result.crosstalk, eyeWithout: eyeFigure(afterPulse, without.eye, full.eye.phase, space, ber) };
  }
  report(0.93);

  const tub = bathtub(full.eye.eye, full.eye.phase, 1);
  const time_UI = Array.from({ length: 24 * 8 + 1 }, (_, i) => -4 + i / 8);

  // Adaptation trajectories.
  const atPhase = equalizedCursors(full.channel, full.taps, space.firSpec.pre, full.eye.phase, s);
  const N = dfe.length;
  let dfeTrack: TuningRunResult["adaptation"]["dfe"] = null;
  if (N > 0) {
    const mu = 0.002;
    const limits = Array.from(space.dfeLimits_V.subarray(0, N));
    const run = dfeAdaptation(atPhase, {
      modulation: space.modulation,
      taps: N,
      limits_V: limits,
      noiseRms_V: full.channel.noiseRms_V,
      mu,
      iterations: 20_000,
      seed: 1,
      variant: "lms",
    });
    dfeTrack = {
      variant: "lms",
      mu,
      iterations: run.iterationsAt,
      taps: run.trajectory.map((t) => Array.from(t)),
      target: Array.from(dfe),
    };
  }
  const training = txTraining(
    { h: full.channel.cursors(0), main: full.channel.pre },
    { spec: space.firSpec, noiseRms_V: full.channel.noiseRms_V / s, dfeTaps: N, maxRounds: 500 },
  );
  report(0.97);

  // Metrics at the sampling instant.
  let peak = 0;
  let power = 0;
  atPhase.h.forEach((v, i) => {
    if (i === atPhase.main) return;
    const k = i - atPhase.main;
    const r = k >= 1 && k <= N ? v - dfe[k - 1] : v;
    peak += Math.abs(r);
    power += r * r;
  });
  const out: TuningRunResult = {
    engineVersion: ENGINE_VERSION,
    optimize: result,
    eyes: { before, after },
    pulses: { time_UI, before_V: sampleAt(rawAtLimiter, time_UI), after_V: sampleAt(equalized, time_UI) },
    bathtub: {
      phase_UI: Array.from(tub.phase_UI, (p) => p - full.eye.phase / spu),
      log10Ber: Array.from(tub.log10Ber),
    },
    adaptation: {
      dfe: dfeTrack,
      txTraining: {
        taps: training.rounds.map((r) => Array.from(r.taps)),
        objective: training.rounds.map((r) => finite(r.objective)),
        converged: training.converged,
        final: Array.from(training.taps),
      },
    },
    metrics: {
      eyeHeight_V: result.eye.eyeHeight_V,
      eyeWidth_UI: result.eye.eyeWidth_UI,
      limiterHeadroom_V: result.limiterHeadroom_V,
      residualIsiPeak_V: peak,
      residualIsiRms_V: Math.sqrt(power),
      noiseGain_dB: 10 * Math.log10(ctleNoiseGain(full.channel.params, space.baud_Hz / 2)),
      noiseRms_V: full.channel.noiseRms_V,
      txTaps: result.tx.taps,
      ctle: result.ctle,
      dfe: result.dfe,
    },
    verdict: result.verdict,
    crosstalk,
    loss: lossAtNyquist(pulse, space),
  };
  report(1);
  return out;
}
