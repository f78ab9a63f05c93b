// Mixed-mode SDD21 from a single-ended 4-port, for any port pairing.
import { describe, expect, it } from "vitest";
import { channelTransfer, sdd21, sParameter, type NetworkData } from "@lib/channel";
import { seededRandom } from "@lib/signal";

/** A random 4-port (not physical; the formulas are linear in S) over two frequencies, seed fixed. */
const randomNet = (seed: number, ports = 4): NetworkData => {
  const r = seededRandom(seed);
  return {
    ports,
    freqs_Hz: Float64Array.of(1e9, 2e9),
    s: Float64Array.from({ length: 2 * ports * ports * 2 }, r.normal),
    referenceOhms: new Float64Array(ports).fill(50),
  };
};
const S = (net: NetworkData, o: number, i: number) => sParameter(net, o, i);

describe("sdd21", () => {
  // [source] Bockelman & Eisenstadt, IEEE T-MTT 43(7), 1995, via shared/references.md.
  it("thrus 1→2 and 3→4, pairs (1,3) in / (2,4) out: SDD21 = ½(S21 − S23 − S41 + S43) [source: Bockelman & Eisenstadt 1995]", () => {
    const net = randomNet(1);
    const got = sdd21(net, { inP: 1, inN: 3, outP: 2, outN: 4 });
    const [a, b, c, d] = [S(net, 2, 1), S(net, 2, 3), S(net, 4, 1), S(net, 4, 3)];
    for (let f = 0; f < 2; f++) {
      expect(got.re[f]).toBeCloseTo(0.5 * (a.re[f] - b.re[f] - c.re[f] + d.re[f]), 14);
      expect(got.im[f]).toBeCloseTo(0.5 * (a.im[f] - b.im[f] - c.im[f] + d.im[f]), 14);
    }
  });

  it("pairs (1,2) in / (3,4) out: SDD21 = ½(S31 − S32 − S41 + S42) [source: Bockelman & Eisenstadt 1995]", () => {
    const net = randomNet(2);
    const got = sdd21(net);
    const [a, b, c, d] = [S(net, 3, 1), S(net, 3, 2), S(net, 4, 1), S(net, 4, 2)];
    for (let f = 0; f < 2; f++) {
      expect(got.re[f]).toBeCloseTo(0.5 * (a.re[f] - b.re[f] - c.re[f] + d.re[f]), 14);
      expect(got.im[f]).toBeCloseTo(0.5 * (a.im[f] - b.im[f] - c.im[f] + d.im[f]), 14);
    }
  });

  it("analytic: two uncoupled identical thrus give SDD21 = the thru's S21; swapping a pair's wires flips the sign", () => {
    const n = 4;
    const s = new Float64Array(n * n * 2);
    const put = (o: number, i: number, re: number, im: number) => {
      s[2 * ((o - 1) * n + (i - 1))] = re;
      s[2 * ((o - 1) * n + (i - 1)) + 1] = im;
    };
    put(3, 1, 0.6, -0.3);
    put(1, 3, 0.6, -0.3);
    put(4, 2, 0.6, -0.3);
    put(2, 4, 0.6, -0.3);
    const net: NetworkData = {
      ports: 4,
      freqs_Hz: Float64Array.of(1e9),
      s,
      referenceOhms: new Float64Array(4).fill(50),
    };
    const d = sdd21(net);
    expect([d.re[0], d.im[0]]).toEqual([0.6, -0.3]);
    const flipped = sdd21(net, { inP: 2, inN: 1, outP: 3, outN: 4 });
    expect([flipped.re[0], flipped.im[0]]).toEqual([-0.6, 0.3]);
    expect(channelTransfer(net).re[0]).toBe(0.6);
  });

  it("identity: an 8-port with any pairing equals the 4-port sub-network's SDD21", () => {
    const big = randomNet(5, 8);
    const pairs = { inP: 7, inN: 2, outP: 5, outN: 8 };
    const got = sdd21(big, pairs);
    const [a, b, c, d] = [S(big, 5, 7), S(big, 5, 2), S(big, 8, 7), S(big, 8, 2)];
    expect(got.re[1]).toBeCloseTo(0.5 * (a.re[1] - b.re[1] - c.re[1] + d.re[1]), 14);
  });

  it("edges: too few ports, repeated or out-of-range ports; a 2-port's channel is S21; a 3-port is refused", () => {
    const two = randomNet(3, 2);
    expect(() => sdd21(two)).toThrow(/at least 4 ports/);
    expect(channelTransfer(two).re[0]).toBe(S(two, 2, 1).re[0]);
    expect(() => channelTransfer(randomNet(4, 3))).toThrow(/3 port/);
    const net = randomNet(6);
    expect(() => sdd21(net, { inP: 1, inN: 1, outP: 3, outN: 4 })).toThrow(/four different/);
    expect(() => sdd21(net, { inP: 1, inN: 2, outP: 3, outN: 5 })).toThrow(/pairs.outN/);
    expect(() => sParameter(net, 0, 1)).toThrow(/outPort/);
  });
});
