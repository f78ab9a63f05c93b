// Budgets: the request schema (the engine's own Budget schema plus a name), what the API answers,
// and the one-line summary lists show. The starting points are in budgetPresets.ts, the form's
// model in budgetForm.ts. No server code here: the form island imports this file.
import { z } from "zod";
import { budgetSchema, type Budget } from "@lib/contract/budget";

/** POST/PUT /api/v1/budgets: the `budget` object of the engine's optimize request, with a name. */
export const budgetRequest = budgetSchema.extend({
  name: z
    .string({ error: "Give the budget a name." })
    .trim()
    .min(1, "Give the budget a name.")
    .max(200, "Keep the name under 200 characters."),
  description: z.string().trim().max(2000, "Keep the description under 2000 characters.").optional(),
});
export type BudgetRequest = z.output<typeof budgetRequest>;

export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(100),
  cursor: z.coerce.number().int().min(0).optional(),
});

export const idParams = z.object({ id: z.coerce.number({ error: "The id must be a number." }).int().positive() });

/** What the API answers for a budget: the stored budget's fields, flattened, plus bookkeeping. */
export type BudgetView = Budget & {
  id: number;
  name: string;
  description: string | null;
  createdBy: string | null;
  createdAt: string | Date;
  updatedAt: string | Date;
  runCount?: number;
};

/** Short description of a budget for lists: "NRZ 28 Gb/s · 1+2 FIR · CTLE −12…0 dB · 5 DFE". */
export function budgetSummary(b: Budget): string {
  const rate = b.bitRate_bps ? ` ${Number((b.bitRate_bps / 1e9).toPrecision(6))} Gb/s` : "";
  const [lo, hi] = b.ctle.gDc_dB;
  const pkg =
    b.package?.tx || b.package?.rx
      ? ` · package${b.package.tx && b.package.rx ? "s" : b.package.tx ? " (Tx)" : " (Rx)"}`
      : "";
  const ffe = b.ffe ? ` · FFE ${b.ffe.pre}+1+${b.ffe.post}` : "";
  return `${b.modulation.toUpperCase()}${rate} · FIR ${b.tx.pre}+1+${b.tx.post} · CTLE ${lo}…${hi} dB${ffe} · ${b.dfe.taps} DFE tap${b.dfe.taps === 1 ? "" : "s"}${pkg} · BER ${b.targetBer.toExponential(0)}`;
}
