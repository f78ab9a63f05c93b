// PRBS generator: the ITU-T O.150 patterns and the PRBS13 used for PAM4 tests.
import { describe, expect, it } from "vitest";
import { PRBS_TAPS, prbs, prbsFromTaps, prbsPeriod, type PrbsOrder } from "@lib/analysis/prbs";

const asText = (bits: Uint8Array) => Array.from(bits).join("");

/** Oracle: a shift-register LFSR (state held in an integer), clocked one bit at a time. */
function lfsrOracle(taps: readonly number[], length: number): number[] {
  const order = Math.max(...taps);
  // state bit i holds b[n−1−i]; start all ones.
  let state = (1n << BigInt(order)) - 1n;
  const out: number[] = [];
  for (let n = 0; n < length; n++) {
    if (n < order) {
      out.push(1);
      continue;
    }
    let b = 0n;
    for (const t of taps) b ^= (state >> BigInt(t - 1)) & 1n;
    out.push(Number(b));
    state = ((state << 1n) | b) & ((1n << BigInt(order)) - 1n);
  }
  return out;
}

function primeFactors(n: number): number[] {
  const f: number[] = [];
  for (let p = 2; p * p <= n; p++) {
    if (n % p === 0) {
      f.push(p);
      while (n % p === 0) n /= p;
    }
  }
  if (n > 1) f.push(n);
  return f;
}

function hasPeriod(bits: Uint8Array, p: number, span: number): boolean {
  for (let n = 0; n < span; n++) if (bits[n] !== bits[n + p]) return false;
  return true;
}

/** Longest circular runs of ones and zeros over one period. */
function longestRuns(bits: Uint8Array, period: number): { ones: number; zeros: number } {
  const best = [0, 0];
  let run = 0;
  let cur = -1;
  for (let n = 0; n < 2 * period; n++) {
    const b = bits[n % period];
    run = b === cur ? run + 1 : 1;
    cur = b;
    if (run <= period) best[b] = Math.max(best[b], run);
  }
  return { ones: best[1], zeros: best[0] };
}

describe("prbs", () => {
  // [source] ITU-T O.150 via shared/references.md: recurrence b[n] = b[n−a] XOR b[n−b], all-ones seed.
  it("PRBS7 begins 1111111000000100 [source: ITU-T O.150, shared/references.md]", () => {
    expect(asText(prbs(7, 16))).toBe("1111111000000100");
  });
  it("PRBS9 begins 1111111110000011 — nine ones first [source: ITU-T O.150]", () => {
    expect(asText(prbs(9, 16))).toBe("1111111110000011");
  });

  // [source] ITU-T O.150 (periods); run and weight properties of maximal-length sequences.
  it.each([7, 9, 11, 13, 15, 23] as PrbsOrder[])(
    "order %i: period 2^n−1, 2^(n−1) ones, longest runs n ones / n−1 zeros [source: ITU-T O.150]",
    (order) => {
      const period = prbsPeriod(order);
      const bits = prbs(order, 2 * period + order);
      expect(hasPeriod(bits, period, period + order)).toBe(true);
      for (const q of primeFactors(period)) {
        expect(hasPeriod(bits, period / q, period)).toBe(false);
      }
      let ones = 0;
      for (let n = 0; n < period; n++) ones += bits[n];
      expect(ones).toBe(2 ** (order - 1));
      expect(longestRuns(bits, period)).toEqual({ ones: order, zeros: order - 1 });
    },
  );

  it("oracle: matches a shift-register LFSR for every built-in order, PRBS31 included", () => {
    for (const order of Object.keys(PRBS_TAPS).map(Number) as PrbsOrder[]) {
      const n = 3000;
      expect(Array.from(prbs(order, n))).toEqual(lfsrOracle(PRBS_TAPS[order], n));
    }
  });

  it("identity: the inverted pattern is the bitwise complement", () => {
    const a = prbs(15, 5000);
    const b = prbs(15, 5000, true);
    for (let i = 0; i < a.length; i++) expect(a[i] ^ b[i]).toBe(1);
  });

  it("identity: PRBS31 obeys its recurrence far into the sequence", () => {
    const bits = prbs(31, 200_000);
    for (let n = 31; n < bits.length; n += 997) expect(bits[n]).toBe(bits[n - 31] ^ bits[n - 28]);
    let ones = 0;
    for (const b of bits) ones += b;
    expect(Math.abs(ones / bits.length - 0.5)).toBeLessThan(0.01);
  });

  it("edges: empty and shorter-than-seed lengths, custom taps, bad arguments", () => {
    expect(prbs(7, 0).length).toBe(0);
    expect(asText(prbs(9, 4))).toBe("1111");
    expect(asText(prbsFromTaps([2, 1], 6))).toBe("110110"); // x^2 + x + 1: period 3
    expect(() => prbs(8 as PrbsOrder, 10)).toThrow(/order/);
    expect(() => prbs(7, -1)).toThrow(/length/);
    expect(() => prbs(7, 1.5)).toThrow(/length/);
    expect(() => prbsFromTaps([], 4)).toThrow(/taps/);
    expect(() => prbsFromTaps([3, 3], 4)).toThrow(/distinct/);
    expect(() => prbsFromTaps([0, 2], 4)).toThrow(/taps/);
    expect(() => prbsPeriod(0)).toThrow(/order/);
  });
});
