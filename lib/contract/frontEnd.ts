// Optional budget sections for what surrounds the channel: the packages at both ends and the
// receiver's bandwidth filter, and the receive FFE of the joint search.
import { z } from "zod";
import { ANNEX_93A_PACKAGE } from "../package/packageModel.ts";
import { nonNegativeInt, nonNegativeNumber, positiveNumber } from "./common.ts";

const d = ANNEX_93A_PACKAGE;

/** A package (single-ended values of the differential half-circuit); each field defaults to IEEE 802.3 Annex 93A's value (from memory). */
export const packageSchema = z.object({
  dieCapacitance_F: nonNegativeNumber
    .max(1e-9, { error: "expected a capacitance in farads, at most 1e-9 (e.g. 2.5e-13)" })
    .default(d.dieCapacitance_F),
  padCapacitance_F: nonNegativeNumber
    .max(1e-9, { error: "expected a capacitance in farads, at most 1e-9 (e.g. 1.8e-13)" })
    .default(d.padCapacitance_F),
  traceLength_m: nonNegativeNumber
    .max(0.1, { error: "expected a trace length in metres, at most 0.1 (e.g. 0.012)" })
    .default(d.traceLength_m),
  traceImpedance_Ohm: positiveNumber
    .max(1000, { error: "expected an impedance in ohms, at most 1000" })
    .default(d.traceImpedance_Ohm),
  traceLoss: z
    .object({
      skinAt1GHz_NpPerM: nonNegativeNumber.max(1000, { error: "expected a loss in Np/m at 1 GHz, at most 1000" }),
      dielectricAt1GHz_NpPerM: nonNegativeNumber.max(1000, { error: "expected a loss in Np/m at 1 GHz, at most 1000" }),
      delay_sPerM: positiveNumber.max(1e-7, { error: "expected a delay in s/m, at most 1e-7 (e.g. 6.1e-9)" }),
    })
    .default({ ...d.traceLoss }),
  termination_Ohm: positiveNumber
    .max(10000, { error: "expected a termination in ohms, at most 10000" })
    .default(d.termination_Ohm),
  reference_Ohm: positiveNumber.max(10000, { error: "expected a reference in ohms, at most 10000" }).default(50),
});

/** The packages: the transmitter's (die → board) and the receiver's (board → die); either may be omitted. */
export const packagesSchema = z.object({ tx: packageSchema.optional(), rx: packageSchema.optional() });

/** The receiver's front end: its bandwidth (a 4th-order Butterworth, IEEE 802.3 Annex 93A). */
export const frontEndSchema = z.object({
  rxBandwidth_Hz: positiveNumber
    .max(1e12, { error: "expected a bandwidth in Hz, at most 1e12" })
    .describe("−3 dB frequency; 0.75 × baud is usual"),
});

/** A receive FFE: the feed-forward filter of an MMSE-DFE, designed per CTLE setting. */
export const ffeSchema = z.object({
  pre: nonNegativeInt.max(8, { error: "at most 8 receive FFE pre-cursor taps" }).default(1),
  post: nonNegativeInt.max(16, { error: "at most 16 receive FFE post-cursor taps" }).default(2),
});
