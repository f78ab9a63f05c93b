// Shared shapes of the engine: the pulse response and the modulation. Every area of lib/ uses these.

/** Line coding of the symbols: NRZ (±1) or PAM4 (−1, −1/3, +1/3, +1). */
export type Modulation = "nrz" | "pam4";

/**
 * A pulse response: the channel's response to one symbol of value +1 lasting one unit
 * interval (a 1 V rectangle of width `ui_s`), sampled uniformly at `dt = ui_s / samplesPerUi`.
 * `mainIndex` is the sample of the main cursor. Arrays are never mutated by the engine.
 */
export interface Pulse {
  /** Unit interval in seconds. */
  readonly ui_s: number;
  /** Samples per unit interval (integer ≥ 1). */
  readonly samplesPerUi: number;
  /** Sampled response in volts for a 1 V symbol. */
  readonly values_V: Float64Array;
  /** Index into `values_V` of the main cursor. */
  readonly mainIndex: number;
}

/** A frequency response sampled on a grid, for plotting (insertion loss, filter responses). */
export interface MagnitudeCurve {
  readonly freqs_Hz: Float64Array;
  readonly magnitude_dB: Float64Array;
}
