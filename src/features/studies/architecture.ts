// Equalizer architectures as studies compare them and tap tables use them: which blocks a receiver
// and transmitter have (transmit FIR, CTLE, DFE taps, receive FFE), with the usual candidates.
import { z } from "zod";

/** An equalizer architecture: the blocks and their tap counts. */
export const architectureSchema = z
  .object({
    key: z
      .string()
      .trim()
      .regex(
        /^[a-z0-9][a-z0-9-]{0,47}$/,
        "An architecture key is lowercase letters, digits and dashes (e.g. tx-ctle-dfe2).",
      ),
    label: z.string().trim().min(1, "Give the architecture a label.").max(100),
    tx: z
      .object({
        pre: z.int().min(0).max(4, "At most 4 transmit pre-cursor taps."),
        post: z.int().min(0).max(8, "At most 8 transmit post-cursor taps."),
      })
      .nullable()
      .describe("transmit FIR tap counts; null for a transmitter without de-emphasis"),
    ctle: z.boolean().describe("whether the receiver has the budget's CTLE"),
    dfeTaps: z.int().min(0).max(32, "At most 32 DFE taps."),
    ffe: z
      .object({
        pre: z.int().min(0).max(8, "At most 8 receive FFE pre-cursor taps."),
        post: z.int().min(0).max(16, "At most 16 receive FFE post-cursor taps."),
      })
      .nullable()
      .describe("receive FFE tap counts; null for none"),
  })
  .refine(
    (a) => a.tx !== null || a.ctle || a.dfeTaps > 0 || a.ffe !== null,
    "An architecture needs at least one equalizer.",
  );
export type Architecture = z.infer<typeof architectureSchema>;

/** A one-line description: "TX FIR 1+1 · CTLE · DFE 3". */
export function describeArchitecture(a: Architecture): string {
  const parts: string[] = [];
  if (a.tx) parts.push(`TX FIR ${a.tx.pre} pre / ${a.tx.post} post`);
  if (a.ctle) parts.push("CTLE");
  if (a.ffe) parts.push(`RX FFE ${a.ffe.pre} pre / ${a.ffe.post} post`);
  if (a.dfeTaps > 0) parts.push(`DFE ${a.dfeTaps} tap${a.dfeTaps === 1 ? "" : "s"}`);
  return parts.join(" · ");
}

/** The blocks of an architecture when its label does not already say them (null otherwise). */
export function architectureDetail(a: Architecture): string | null {
  const d = describeArchitecture(a);
  return d === a.label ? null : d;
}

/**
 * The usual candidates for a budget: CTLE only; transmit FIR + CTLE; + DFE with 1 … `maxDfe` taps;
 * CTLE + a receive FFE. Transmit tap counts come from the budget's FIR.
 */
export function defaultCandidates(tx: { pre: number; post: number }, maxDfe: number): Architecture[] {
  const txFir = tx.pre + tx.post > 0 ? { pre: tx.pre, post: tx.post } : { pre: 1, post: 1 };
  const list: Architecture[] = [
    { key: "ctle", label: "CTLE only", tx: null, ctle: true, dfeTaps: 0, ffe: null },
    { key: "tx-ctle", label: "TX FIR + CTLE", tx: txFir, ctle: true, dfeTaps: 0, ffe: null },
  ];
  for (let n = 1; n <= maxDfe; n++) {
    list.push({
      key: `tx-ctle-dfe${n}`,
      label: `TX FIR + CTLE + DFE ${n}`,
      tx: txFir,
      ctle: true,
      dfeTaps: n,
      ffe: null,
    });
  }
  list.push({ key: "ctle-ffe", label: "CTLE + RX FFE", tx: null, ctle: true, dfeTaps: 0, ffe: { pre: 1, post: 3 } });
  return list;
}
