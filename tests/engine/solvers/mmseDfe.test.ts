// The MMSE-DFE feed-forward filter for coloured noise, and the symbol-spaced noise correlation it uses.
import { inverse, Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { noiseCorrelation } from "@lib/analysis/noiseCorrelation";
import { ctleNoiseGain, type CtleParams, ctleResponse } from "@lib/equalizers";
import { mmseDfe, mmseEqualizer } from "@lib/solvers";

/**
 * Oracle: the finite-length MMSE-DFE in the form of Al-Dhahir and Cioffi (IEEE Trans. Inform. Theory
 * 41(4), 1995) [memory]: R_yy = E_s·H·Hᵀ + R_nn, R_x|y = E_s·I − E_s²·Hᵀ·R_yy⁻¹·H; over the support
 * S = {Δ … Δ + N_b} the feedback b̃_S = R_S⁻¹e₁/(e₁ᵀR_S⁻¹e₁), MSE = 1/(e₁ᵀR_S⁻¹e₁), w = R_yy⁻¹·E_s·H·b̃.
 */
function alDhahirCioffi(
  h: number[],
  nf: number,
  nb: number,
  delay: number,
  r: number[],
  es: number,
  cancelled?: boolean[],
) {
  const L = h.length;
  const cols = nf + L - 1;
  const H = new Matrix(nf, cols);
  for (let j = 0; j < nf; j++) for (let l = 0; l < L; l++) H.set(j, j + l, h[l]);
  const Rnn = new Matrix(nf, nf);
  for (let i = 0; i < nf; i++)
    for (let j = 0; j < nf; j++) Rnn.set(i, j, Math.abs(i - j) < r.length ? r[Math.abs(i - j)] : 0);
  const Ryy = H.mmul(H.transpose()).mul(es).add(Rnn);
  const Ryyi = inverse(Ryy);
  const Rxgy = Matrix.eye(cols)
    .mul(es)
    .sub(
      H.transpose()
        .mmul(Ryyi)
        .mmul(H)
        .mul(es * es),
    );
  const S = Array.from({ length: nb + 1 }, (_, k) => delay + k).filter(
    (_, k) => k === 0 || cancelled === undefined || cancelled[k - 1],
  );
  const RSi = inverse(Rxgy.selection(S, S));
  const e1 = RSi.getColumn(0);
  const b = new Matrix(cols, 1);
  S.forEach((s, k) => b.set(s, 0, e1[k] / e1[0]));
  const w = Ryyi.mmul(H.mul(es)).mmul(b);
  return { w: w.getColumn(0), b: Array.from({ length: nb }, (_, k) => b.get(delay + 1 + k, 0)), mse: 1 / e1[0] };
}

describe("mmseDfe", () => {
  const h = Float64Array.of(0.15, 1, 0.55, 0.3, -0.1, 0.05);
  const cursors = { h, main: 1 };

  it.each([
    ["white noise, NRZ", 2, 3, 2, [0.01], 1],
    ["coloured noise, NRZ", 1, 4, 3, [0.02, 0.012, 0.004], 1],
    ["coloured noise, PAM4 symbol power", 2, 2, 1, [0.01, -0.004], 5 / 9],
    ["no feedback taps (linear MMSE)", 2, 3, 0, [0.01, 0.005], 1],
  ] as const)("oracle: equals the Al-Dhahir–Cioffi closed form (%s) [memory]", (_label, pre, post, nb, r, es) => {
    const got = mmseDfe(cursors, { pre, post, feedbackTaps: nb, noiseCorrelation_V2: r, symbolPower: es });
    const want = alDhahirCioffi(Array.from(h), pre + 1 + post, nb, cursors.main + pre, [...r], es);
    got.taps.forEach((c, j) => expect(c).toBeCloseTo(want.w[j], 11));
    got.feedback.forEach((b, k) => expect(b).toBeCloseTo(want.b[k], 11));
    expect(got.mse).toBeCloseTo(want.mse, 11);
  });

  it("oracle: a feedback tap left out (e.g. one its limit keeps from cancelling) counts as ISI, as in the closed form with that tap removed", () => {
    const cancelled = [true, false, true];
    const got = mmseDfe(cursors, {
      pre: 1,
      post: 3,
      feedbackTaps: 3,
      cancelled,
      noiseCorrelation_V2: [0.01, 0.004],
      symbolPower: 1,
    });
    const want = alDhahirCioffi(Array.from(h), 5, 3, cursors.main + 1, [0.01, 0.004], 1, cancelled);
    got.taps.forEach((c, j) => expect(c).toBeCloseTo(want.w[j], 11));
    expect(got.mse).toBeCloseTo(want.mse, 11);
    expect(got.feedback[1]).toBe(0);
    expect(() =>
      mmseDfe(cursors, { pre: 1, post: 1, feedbackTaps: 2, cancelled: [true], noiseCorrelation_V2: [0.01] }),
    ).toThrow(/cancelled/);
  });

  it("identities: no feedback and white noise is the linear MMSE equalizer; the reported noise is cᵀR_nc", () => {
    const lin = mmseEqualizer(cursors, 2, 3, 0.1);
    const got = mmseDfe(cursors, { pre: 2, post: 3, feedbackTaps: 0, noiseCorrelation_V2: [0.01] });
    got.taps.forEach((c, j) => expect(c).toBeCloseTo(lin.taps[j], 13));
    expect(got.mse).toBeCloseTo(lin.mse, 13);
    let c2 = 0;
    for (const c of got.taps) c2 += c * c;
    expect(got.noiseVariance_V2).toBeCloseTo(0.01 * c2, 15);
  });

  it("analytic: feedback taps take over the post-cursors, so the feed-forward filter leaves them alone and the MSE falls", () => {
    const linear = mmseDfe(cursors, { pre: 1, post: 2, feedbackTaps: 0, noiseCorrelation_V2: [0.01] });
    const dfe = mmseDfe(cursors, { pre: 1, post: 2, feedbackTaps: 4, noiseCorrelation_V2: [0.01] });
    expect(dfe.mse).toBeLessThan(linear.mse);
    // The feedback taps equal the combined post-cursors they cancel.
    dfe.feedback.forEach((b, k) => expect(b).toBe(dfe.equalized.h[dfe.equalized.main + 1 + k]));
  });

  it("noise colour matters: low-pass noise (correlated samples) is fought differently from white noise of the same power", () => {
    const white = mmseDfe(cursors, { pre: 2, post: 2, feedbackTaps: 2, noiseCorrelation_V2: [0.05] });
    const coloured = mmseDfe(cursors, { pre: 2, post: 2, feedbackTaps: 2, noiseCorrelation_V2: [0.05, 0.045, 0.04] });
    const diff = white.taps.reduce((s, c, j) => s + Math.abs(c - coloured.taps[j]), 0);
    expect(diff).toBeGreaterThan(0.05);
    let c2 = 0;
    for (const c of coloured.taps) c2 += c * c;
    expect(Math.abs(coloured.noiseVariance_V2 - 0.05 * c2)).toBeGreaterThan(1e-3); // not a ‖c‖² scaling
  });

  it("edges: negative variance, bad counts or singular systems are refused", () => {
    expect(() => mmseDfe(cursors, { pre: 1, post: 1, feedbackTaps: 0, noiseCorrelation_V2: [-1] })).toThrow(/variance/);
    expect(() => mmseDfe(cursors, { pre: 1, post: 1, feedbackTaps: -1, noiseCorrelation_V2: [0] })).toThrow(
      /feedbackTaps/,
    );
    expect(() => mmseDfe(cursors, { pre: 1, post: 1, feedbackTaps: 0, noiseCorrelation_V2: [] })).toThrow(/r\[0\]/);
    expect(() =>
      mmseDfe({ h: new Float64Array(3), main: 1 }, { pre: 1, post: 1, feedbackTaps: 0, noiseCorrelation_V2: [0] }),
    ).toThrow(/singular/);
  });
});

describe("noiseCorrelation", () => {
  const ui = 1 / 28e9;
  it("analytic: white noise band-limited to Nyquist gives uncorrelated samples (r[m] = σ²·sinc(m) = 0 for m ≥ 1)", () => {
    const fN = 0.5 / ui;
    const r = noiseCorrelation(() => 1e-6 / fN, fN, ui, 4);
    expect(r[0]).toBeCloseTo(1e-6, 15);
    for (let m = 1; m <= 4; m++) expect(Math.abs(r[m])).toBeLessThan(1e-15);
  });

  it("identity: through a CTLE, r[0] is the noise variance times the CTLE's noise-power gain", () => {
    const fN = 0.5 / ui;
    const p: CtleParams = { gDc_dB: -8, fz_Hz: 11e9, fp1_Hz: 11e9, fp2_Hz: 28e9 };
    const psd = (f: number) => {
      const hf = ctleResponse(p, [f]);
      return (1e-6 / fN) * (hf.re[0] ** 2 + hf.im[0] ** 2);
    };
    const r = noiseCorrelation(psd, fN, ui, 3);
    expect(r[0]).toBeCloseTo(1e-6 * ctleNoiseGain(p, fN), 12);
    expect(r[1]).toBeLessThan(0); // a peaking CTLE de-correlates (high-pass) neighbouring samples
  });

  it("edges: negative or non-finite PSD values and bad sizes are refused", () => {
    expect(() => noiseCorrelation(() => -1, 1e9, ui, 1)).toThrow(/psd/);
    expect(() => noiseCorrelation(() => 1, 0, ui, 1)).toThrow(/band_Hz/);
    expect(() => noiseCorrelation(() => 1, 1e9, ui, -1)).toThrow(/lags/);
  });
});
