// Request of the `prbs` command: a PRBS of one of the built-in orders.
import { z } from "zod";
import { fieldError, nonNegativeInt } from "./common.ts";

/** Most bits one request may ask for (the response is a string of that many characters). */
export const PRBS_REQUEST_MAX_LENGTH = 10_000_000;

/** `{ order, length, invert? }`; order 7, 9, 11, 15, 23, 31 (ITU-T O.150) or 13 (PAM4 tests). */
export const prbsRequestSchema = z.object({
  order: z.literal([7, 9, 11, 13, 15, 23, 31], {
    error: fieldError("expected an order of 7, 9, 11, 13, 15, 23 or 31"),
  }),
  length: nonNegativeInt.max(PRBS_REQUEST_MAX_LENGTH, { error: `expected at most ${PRBS_REQUEST_MAX_LENGTH} bits` }),
  invert: z.boolean({ error: "expected true or false" }).optional(),
});

/** A validated request (defaults applied). */
export type PrbsRequest = z.output<typeof prbsRequestSchema>;
