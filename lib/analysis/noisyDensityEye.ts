// The density eye as the sampler sees it: the noise-free image spread by Gaussian noise in voltage and
// by dual-Dirac jitter in time, so the picture closes where the statistical eye's contours do.
import erfc from "@stdlib/math-base-special-erfc";
import type { DensityEye } from "./densityEye.ts";
import type { Jitter } from "./jitterKernel.ts";

/** Kernels reach this many rms (the Gaussian's mass beyond it is below 10⁻¹¹). */
const KERNEL_SIGMAS = 7;

/** `P(a < Z < b)` for a standard normal `Z`. */
function normalMass(a: number, b: number): number {
  return a >= 0
    ? 0.5 * (erfc(a / Math.SQRT2) - erfc(b / Math.SQRT2))
    : 0.5 * (erfc(-b / Math.SQRT2) - erfc(-a / Math.SQRT2));
}

/**
 * Weights of a law on cells of width `cell` at integer offsets `first + i` (cell `k` covers
 * `[(k − ½)·cell, (k + ½)·cell)`): Gaussian of rms `rms` at each of `centres` (equal shares); with
 * `rms = 0` each centre's share is split linearly between its two nearest cells.
 */
function cellKernel(centres: readonly number[], rms: number, cell: number): { first: number; weights: Float64Array } {
  const reach = Math.ceil((Math.max(...centres.map(Math.abs)) + KERNEL_SIGMAS * rms) / cell) + 1;
  const weights = new Float64Array(2 * reach + 1);
  const share = 1 / centres.length;
  for (const c of centres) {
    if (rms === 0) {
      const x = c / cell;
      const k = Math.floor(x);
      weights[reach + k] += share * (1 - (x - k));
      weights[reach + k + 1] += share * (x - k);
      continue;
    }
    for (let k = -reach; k <= reach; k++)
      weights[reach + k] += share * normalMass(((k - 0.5) * cell - c) / rms, ((k + 0.5) * cell - c) / rms);
  }
  return { first: -reach, weights };
}

/**
 * The density eye with noise and jitter folded in: each column's voltage histogram convolved with
 * the Gaussian noise (`noiseRms_V`, integrated over each row), then each row convolved in time with
 * the dual-Dirac jitter law (±DJ/2 with ½ each, Gaussian RJ, integrated over each column). The folded
 * image is periodic in time with period one UI, so the time convolution wraps around; counts pushed
 * beyond the top or bottom row are dropped (give the noise-free image room, e.g. 4 σ beyond its peak).
 * Jitter moves the sampling instant, the same for the whole waveform, as in the statistical eye.
 *
 * @param eye - a density eye from `densityEye` (2 UI wide, rows descending in voltage).
 * @param noiseRms_V - Gaussian noise rms at the sampler, volts (≥ 0).
 * @param jitter - dual-Dirac jitter in UI (omit for none).
 * @returns a new image on the same axes (counts are expected hits, not integers).
 */
export function noisyDensityEye(eye: DensityEye, noiseRms_V: number, jitter?: Jitter): DensityEye {
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0))
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${noiseRms_V}`);
  const { width: W, height: H } = eye;
  let counts = Float64Array.from(eye.counts);
  if (noiseRms_V > 0) {
    const dv = Math.abs(eye.voltage_V[0] - eye.voltage_V[1]);
    const k = cellKernel([0], noiseRms_V, dv);
    const out = new Float64Array(W * H);
    for (let r = 0; r < H; r++) {
      for (let c = 0; c < W; c++) {
        const n = counts[r * W + c];
        if (n === 0) continue;
        for (let i = 0; i < k.weights.length; i++) {
          const rr = r + k.first + i;
          if (rr >= 0 && rr < H) out[rr * W + c] += n * k.weights[i];
        }
      }
    }
    counts = out;
  }
  if (jitter !== undefined && (jitter.rjRms_UI > 0 || jitter.djPp_UI > 0)) {
    const dt = 2 / W;
    const half = jitter.djPp_UI / 2;
    const k = cellKernel(half > 0 ? [-half, half] : [0], jitter.rjRms_UI, dt);
    const out = new Float64Array(W * H);
    for (let r = 0; r < H; r++) {
      for (let c = 0; c < W; c++) {
        const n = counts[r * W + c];
        if (n === 0) continue;
        for (let i = 0; i < k.weights.length; i++) {
          const cc = (((c + k.first + i) % W) + W) % W;
          out[r * W + cc] += n * k.weights[i];
        }
      }
    }
    counts = out;
  }
  return { ...eye, counts };
}
