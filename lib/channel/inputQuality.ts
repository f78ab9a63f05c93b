// How far an S-parameter file can be trusted: passivity, reciprocity, causality, band, step, DC, mode conversion.
import type { ComplexArray } from "../signal/fftPlan.ts";
import { causalityCheck } from "./causalityCheck.ts";
import type { ChannelWarning } from "./channelWarning.ts";
import { maxSingularValues } from "./maxSingularValues.ts";
import type { NetworkData } from "./networkData.ts";
import type { S21Pulse } from "./pulseFromS21.ts";
import { reciprocityErrors } from "./reciprocityErrors.ts";
import { DEFAULT_PORT_PAIRS, type PortPairs } from "./sdd21.ts";
import { sParameter } from "./networkData.ts";

/**
 * Thresholds of {@link inputQuality} (common practice for measured and simulated channel data, not
 * taken from a standard): passivity within 1e-6 of 1 (rounding in the file); reciprocity within
 * 0.01 (−40 dB, above the noise of a calibrated measurement); pre-onset energy at most 1e-3
 * (−30 dB) of the impulse response's; data from at most 100 MHz (below that the DC extrapolation
 * is a short step); mode conversion SCD21 at most −20 dB up to the baud rate.
 */
export const INPUT_QUALITY_LIMITS = {
  maxSingularValue: 1 + 1e-6,
  maxReciprocityError: 0.01,
  maxPreOnsetEnergy: 1e-3,
  maxFirstFrequency_Hz: 100e6,
  maxModeConversion_dB: -20,
} as const;

/** The judgement of a Touchstone channel (the `pulse` command's `quality`). */
export interface InputQuality {
  readonly passive: boolean;
  /** Largest singular value of S over the file's frequencies, and where. */
  readonly maxSingularValue: number;
  readonly maxSingularValueAt_Hz: number;
  readonly reciprocal: boolean;
  /** Largest `|Sᵢⱼ − Sⱼᵢ|` over the file's frequencies. */
  readonly maxReciprocityError: number;
  readonly causal: boolean;
  /** Share of the impulse response's energy before its onset, and the delay the phase shows. */
  readonly preOnsetEnergy: number;
  readonly phaseDelay_s: number;
  readonly bandCoverage: { readonly fmax_Hz: number; readonly baudRatio: number };
  /** Mean frequency step and the longest delay plus ring-down it holds (1/Δf). */
  readonly frequencyStep: { readonly df_Hz: number; readonly maxDelay_s: number };
  readonly dcPoint: "measured" | "extrapolated";
  /** Largest |SCD21| up to the baud rate in dB, for files of 4 or more ports; null for 2-ports. */
  readonly modeConversion_dB: number | null;
  readonly warnings: ChannelWarning[];
}

/**
 * Judges a Touchstone channel: passivity ({@link maxSingularValues}), reciprocity
 * ({@link reciprocityErrors}), causality ({@link causalityCheck}), band coverage (fmax against the
 * baud rate), the frequency step against the time window, the DC point, and mode conversion
 * (SCD21, differential in → common out, Bockelman & Eisenstadt 1995) for 4 or more ports. Each
 * finding beyond {@link INPUT_QUALITY_LIMITS} becomes a warning saying what to do; the pulse's own
 * warnings (band, window) are included.
 *
 * @param net - the file's network, already re-referenced to the system's impedance.
 * @param transfer - the channel's S21 or SDD21 over `net.freqs_Hz`.
 * @param built - the pulse built from `transfer` (its window and warnings).
 * @param grid - `ui_s` (one symbol) and `samplesPerUi` of the pulse; `pairs` for 4 or more ports.
 */
export function inputQuality(
  net: NetworkData,
  transfer: ComplexArray,
  built: S21Pulse,
  grid: { readonly ui_s: number; readonly samplesPerUi: number; readonly pairs?: PortPairs },
): InputQuality {
  const L = INPUT_QUALITY_LIMITS;
  const f = net.freqs_Hz;
  const count = f.length;
  const warnings: ChannelWarning[] = [];
  const sv = maxSingularValues(net);
  let worst = 0;
  for (let i = 1; i < count; i++) if (sv[i] > sv[worst]) worst = i;
  const passive = sv[worst] <= L.maxSingularValue;
  if (!passive) {
    warnings.push({
      code: "not-passive",
      message:
        `the file is not passive: the largest singular value of S reaches ${sv[worst].toFixed(4)} at ${ghz(f[worst])} (a passive channel stays at or below 1), ` +
        `so it gains energy there and eyes may look better than the hardware; fix it where the file was made (calibration, de-embedding, a passivity enforcement step) before signing off`,
    });
  }
  const rec = reciprocityErrors(net);
  let maxRec = 0;
  let recAt = 0;
  for (let i = 0; i < count; i++) if (rec[i] > maxRec) [maxRec, recAt] = [rec[i], i];
  const reciprocal = maxRec <= L.maxReciprocityError;
  if (!reciprocal) {
    warnings.push({
      code: "not-reciprocal",
      message:
        `the file is not reciprocal: S and its transpose differ by up to ${maxRec.toFixed(3)} (at ${ghz(f[recAt])}), where a board, cable or connector gives at most ${L.maxReciprocityError}; ` +
        `check the port order and the measurement's calibration`,
    });
  }
  const dt = grid.ui_s / grid.samplesPerUi;
  const c = causalityCheck(f, transfer, dt, built.window_s);
  // A delay more negative than the band's resolution (2/fmax) is an advance, not rounding.
  const advanced = c.phaseDelay_s < -2 / f[count - 1];
  const causal = !advanced && c.preOnsetEnergy <= L.maxPreOnsetEnergy;
  if (advanced) {
    warnings.push({
      code: "not-causal",
      message:
        `the channel's phase rises with frequency (a delay of ${ns(c.phaseDelay_s)}): its response would come before its stimulus; ` +
        `the file may use the opposite sign convention for phase (a delay τ is exp(−j2πfτ))`,
    });
  } else if (!causal) {
    warnings.push({
      code: "not-causal",
      message:
        `the impulse response carries ${(100 * c.preOnsetEnergy).toFixed(2)} % of its energy before its onset (at most ${100 * L.maxPreOnsetEnergy} % is expected): ` +
        `the file is not causal (interpolated, de-embedded or too coarse data); the pulse's precursors are not to be trusted, so re-measure or make the data causal`,
    });
  }
  const dcPoint = f[0] === 0 ? "measured" : "extrapolated";
  if (f[0] > L.maxFirstFrequency_Hz) {
    warnings.push({
      code: "dc-extrapolated",
      message:
        `the data start at ${mhz(f[0])}: S21 at 0 Hz was extrapolated from the first two points (magnitude and phase linear in frequency), so the DC gain and the slow tail are guesses; ` +
        `use data from ${mhz(L.maxFirstFrequency_Hz)} or lower`,
    });
  }
  let modeConversion_dB: number | null = null;
  if (net.ports >= 4) {
    const p = grid.pairs ?? DEFAULT_PORT_PAIRS;
    const [a, b, cc, d] = [
      sParameter(net, p.outP, p.inP),
      sParameter(net, p.outP, p.inN),
      sParameter(net, p.outN, p.inP),
      sParameter(net, p.outN, p.inN),
    ];
    let peak = 0;
    let peakAt = 0;
    for (let i = 0; i < count && f[i] <= 1 / grid.ui_s; i++) {
      const m = 0.5 * Math.hypot(a.re[i] - b.re[i] + cc.re[i] - d.re[i], a.im[i] - b.im[i] + cc.im[i] - d.im[i]);
      if (m > peak) [peak, peakAt] = [m, i];
    }
    modeConversion_dB = peak > 0 ? 20 * Math.log10(peak) : -400;
    if (modeConversion_dB > L.maxModeConversion_dB) {
      warnings.push({
        code: "mode-conversion",
        message:
          `the pair converts differential to common-mode signal: |SCD21| reaches ${modeConversion_dB.toFixed(1)} dB at ${ghz(f[peakAt])} (above ${L.maxModeConversion_dB} dB); ` +
          `the differential loss alone understates the channel: check the pair's skew and the port pairing`,
      });
    }
  }
  const baud_Hz = 1 / grid.ui_s;
  const df = (f[count - 1] - f[0]) / (count - 1);
  return {
    passive,
    maxSingularValue: sv[worst],
    maxSingularValueAt_Hz: f[worst],
    reciprocal,
    maxReciprocityError: maxRec,
    causal,
    preOnsetEnergy: c.preOnsetEnergy,
    phaseDelay_s: c.phaseDelay_s,
    bandCoverage: { fmax_Hz: f[count - 1], baudRatio: f[count - 1] / baud_Hz },
    frequencyStep: { df_Hz: df, maxDelay_s: 1 / df },
    dcPoint,
    modeConversion_dB,
    warnings: [...warnings, ...built.warnings],
  };
}

const ghz = (f_Hz: number) => `${+(f_Hz / 1e9).toPrecision(3)} GHz`;
const mhz = (f_Hz: number) => `${+(f_Hz / 1e6).toPrecision(3)} MHz`;
const ns = (t_s: number) => `${+(t_s * 1e9).toPrecision(3)} ns`;
