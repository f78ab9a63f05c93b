// Request of the `ber` command: a Q factor to a BER, or a BER to a Q factor.
import { z } from "zod";
import { finiteNumber } from "./common.ts";

/** `{ q }` → BER, or `{ ber }` → Q; exactly one of the two. */
export const berRequestSchema = z
  .object({
    q: finiteNumber.min(-40).max(40, { error: "expected a Q factor within ±40" }).optional(),
    ber: finiteNumber
      .gt(0, { error: "expected a BER above 0 (e.g. 1e-12)" })
      .lt(1, { error: "expected a BER below 1" })
      .optional(),
  })
  .superRefine((r, ctx) => {
    if ((r.q === undefined) === (r.ber === undefined)) {
      ctx.addIssue({ code: "custom", path: [], message: "give either q or ber (exactly one of them)" });
    }
  });

/** A validated request (defaults applied). */
export type BerRequest = z.output<typeof berRequestSchema>;
