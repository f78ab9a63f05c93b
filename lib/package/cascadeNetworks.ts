// Chaining networks (board + connector + cable, package + channel + package): 2N-port S-matrices
// connected right half to left half.
import { inverse, Matrix } from "ml-matrix";
import type { NetworkData } from "../channel/networkData.ts";
import { embeddedBlock, storeEmbeddedBlock } from "./embeddedBlock.ts";

/** Throws unless `net` is a usable 2N-port network (ports, frequencies, S-matrix size, finite values). */
export function checkNetwork(net: NetworkData, name = "net"): void {
  if (net === null || typeof net !== "object") throw new TypeError(`${name} must be a network`);
  const n = net.ports;
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`${name}.ports must be an integer ≥ 1, got ${String(n)}`);
  const count = net.freqs_Hz.length;
  if (count < 1) throw new RangeError(`${name} must hold at least one frequency`);
  if (net.s.length !== 2 * count * n * n)
    throw new RangeError(`${name}.s must hold ${2 * count * n * n} numbers, got ${net.s.length}`);
  for (let i = 0; i < net.s.length; i++)
    if (!Number.isFinite(net.s[i])) throw new RangeError(`${name}.s holds a value that is not finite`);
  if (net.referenceOhms.length !== n) throw new RangeError(`${name}.referenceOhms must hold one impedance per port`);
}

const range = (from: number, count: number) => Array.from({ length: count }, (_, i) => from + i);

/**
 * The cascade of two 2N-port networks: ports `N+1 … 2N` of `a` (its right side) connected to ports
 * `1 … N` of `b` (its left side), in order. The result's ports are `a`'s left side then `b`'s right
 * side. With `A`, `B` partitioned into N × N blocks (1 = left, 2 = right), the Redheffer star product
 * `S11 = A11 + A12·B11·(I − A22·B11)⁻¹·A21`, `S21 = B21·(I − A22·B11)⁻¹·A21`,
 * `S12 = A12·(I − B11·A22)⁻¹·B12`, `S22 = B22 + B21·A22·(I − B11·A22)⁻¹·B12`, per frequency.
 * A 2-port is N = 1 (port 1 left, port 2 right); a 4-port N = 2 with ports 1, 2 on the left.
 *
 * @param a - the first network (its left side is the cascade's input).
 * @param b - the second, on the same frequencies and with the same port count.
 * @throws RangeError when the port counts, frequencies or the connected ports' reference
 *   impedances differ (renormalize first).
 * @see R. Redheffer, "On a certain linear fractional transformation", J. Math. Phys. 39 (1960);
 *   Pozar, *Microwave Engineering* (cascading S-parameter networks) [memory: recalled, not re-read].
 */
export function cascadeNetworks(a: NetworkData, b: NetworkData): NetworkData {
  checkNetwork(a, "a");
  checkNetwork(b, "b");
  const P = a.ports;
  if (P % 2 !== 0) throw new RangeError(`a must have an even number of ports (N in, N out), it has ${P}`);
  if (b.ports !== P) throw new RangeError(`b must have as many ports as a (${P}), it has ${b.ports}`);
  const count = a.freqs_Hz.length;
  if (b.freqs_Hz.length !== count || a.freqs_Hz.some((f, i) => Math.abs(f - b.freqs_Hz[i]) > 1e-9 * Math.max(1, f))) {
    throw new RangeError("a and b must share their frequencies (resample one onto the other's first)");
  }
  const N = P / 2;
  for (let i = 0; i < N; i++) {
    const ra = a.referenceOhms[N + i];
    const rb = b.referenceOhms[i];
    if (Math.abs(ra - rb) > 1e-9 * ra) {
      throw new RangeError(
        `port ${N + i + 1} of a (${ra} Ω) and port ${i + 1} of b (${rb} Ω) have different reference impedances; renormalize first`,
      );
    }
  }
  if (N === 1) return cascadeTwoPorts(a, b);
  const left = range(0, N);
  const right = range(N, N);
  const eye = Matrix.eye(2 * N);
  const s = new Float64Array(2 * count * P * P);
  for (let f = 0; f < count; f++) {
    const a11 = embeddedBlock(a, f, left, left);
    const a12 = embeddedBlock(a, f, left, right);
    const a21 = embeddedBlock(a, f, right, left);
    const a22 = embeddedBlock(a, f, right, right);
    const b11 = embeddedBlock(b, f, left, left);
    const b12 = embeddedBlock(b, f, left, right);
    const b21 = embeddedBlock(b, f, right, left);
    const b22 = embeddedBlock(b, f, right, right);
    const u = inverse(Matrix.sub(eye, a22.mmul(b11))); // (I − A22·B11)⁻¹
    const v = inverse(Matrix.sub(eye, b11.mmul(a22))); // (I − B11·A22)⁻¹
    storeEmbeddedBlock(Matrix.add(a11, a12.mmul(b11).mmul(u).mmul(a21)), s, P, f, left, left);
    storeEmbeddedBlock(b21.mmul(u).mmul(a21), s, P, f, right, left);
    storeEmbeddedBlock(a12.mmul(v).mmul(b12), s, P, f, left, right);
    storeEmbeddedBlock(Matrix.add(b22, b21.mmul(a22).mmul(v).mmul(b12)), s, P, f, right, right);
  }
  const referenceOhms = Float64Array.from([...a.referenceOhms.subarray(0, N), ...b.referenceOhms.subarray(N)]);
  return { ports: P, freqs_Hz: Float64Array.from(a.freqs_Hz), s, referenceOhms };
}

/** The N = 1 case of {@link cascadeNetworks} in scalar complex arithmetic (no matrices per frequency). */
function cascadeTwoPorts(a: NetworkData, b: NetworkData): NetworkData {
  const count = a.freqs_Hz.length;
  const s = new Float64Array(8 * count);
  for (let f = 0; f < count; f++) {
    const o = 8 * f;
    const [a11r, a11i, a12r, a12i, a21r, a21i, a22r, a22i] = a.s.subarray(o, o + 8);
    const [b11r, b11i, b12r, b12i, b21r, b21i, b22r, b22i] = b.s.subarray(o, o + 8);
    // u = 1/(1 − A22·B11)
    const dr = 1 - (a22r * b11r - a22i * b11i);
    const di = -(a22r * b11i + a22i * b11r);
    const den = dr * dr + di * di;
    const ur = dr / den;
    const ui = -di / den;
    const mul = (xr: number, xi: number, yr: number, yi: number): [number, number] => [
      xr * yr - xi * yi,
      xr * yi + xi * yr,
    ];
    const [t21r, t21i] = mul(...mul(b21r, b21i, ur, ui), a21r, a21i);
    const [t12r, t12i] = mul(...mul(a12r, a12i, ur, ui), b12r, b12i);
    const [r11r, r11i] = mul(...mul(...mul(a12r, a12i, b11r, b11i), ur, ui), a21r, a21i);
    const [r22r, r22i] = mul(...mul(...mul(b21r, b21i, a22r, a22i), ur, ui), b12r, b12i);
    s[o] = a11r + r11r;
    s[o + 1] = a11i + r11i;
    s[o + 2] = t12r;
    s[o + 3] = t12i;
    s[o + 4] = t21r;
    s[o + 5] = t21i;
    s[o + 6] = b22r + r22r;
    s[o + 7] = b22i + r22i;
  }
  return {
    ports: 2,
    freqs_Hz: Float64Array.from(a.freqs_Hz),
    s,
    referenceOhms: Float64Array.of(a.referenceOhms[0], b.referenceOhms[1]),
  };
}
