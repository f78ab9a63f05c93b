// The budget a tap table's minimax searches: the budget restricted to the chosen architecture's
// blocks — its transmit FIR tap counts (or a single full-swing tap), the budget's CTLE grid, its
// receive FFE (designed per channel and CTLE setting, as an adapting block) and its DFE tap count
// (limits beyond the budget's list repeat the last one).
import type { Budget, BudgetInput } from "@lib/contract/budget";
import type { Architecture } from "@/features/studies/architecture";

/** Why an architecture cannot have a tap table, or null when it can. */
export function tapTableArchitectureProblem(a: Architecture): string | null {
  if (!a.ctle)
    return `“${a.label}” has no CTLE; tap tables hold the budget's CTLE setting, so choose an architecture with one.`;
  return null;
}

/**
 * The budget for a table of this architecture (call only when {@link tapTableArchitectureProblem}
 * is null).
 */
export function budgetForArchitecture(b: Budget, a: Architecture): BudgetInput {
  const sameTx = a.tx !== null && a.tx.pre === b.tx.pre && a.tx.post === b.tx.post;
  const tx =
    a.tx === null
      ? { pre: 0, post: 0, step: 0.5, ranges: [[1, 1]] as [number, number][] }
      : { pre: a.tx.pre, post: a.tx.post, step: b.tx.step, ranges: sameTx ? b.tx.ranges : undefined };
  const lim = b.dfe.limits_V;
  const limits_V = Array.isArray(lim)
    ? lim.length === 0
      ? undefined
      : Array.from({ length: a.dfeTaps }, (_, k) => lim[Math.min(k, lim.length - 1)])
    : lim;
  return { ...b, tx, dfe: { taps: a.dfeTaps, limits_V }, ffe: a.ffe ?? undefined };
}

/**
 * The budget whose only setting is a class default's receiver side, for a channel that already
 * carries the default's transmit FIR: a plain full-swing transmitter, the CTLE grid reduced to the
 * default's gains, the DFE as the architecture has it (adapting in closed form). The engine's tuning
 * run of that channel under this budget draws the class default's eyes.
 */
export function receiverOnlyBudget(b: Budget, ctle: { gDc_dB: number; gDc2_dB: number }): BudgetInput {
  const g2 = b.ctle.gDc2_dB;
  return {
    ...b,
    tx: { pre: 0, post: 0, step: 0.5, ranges: [[1, 1]] },
    ctle: {
      ...b.ctle,
      gDc_dB: [ctle.gDc_dB, ctle.gDc_dB, 1],
      gDc2_dB: Array.isArray(g2) ? [ctle.gDc2_dB, ctle.gDc2_dB, 1] : g2,
    },
  };
}
