// Request schemas for API tokens.
import { z } from "zod";

export const createTokenRequest = z.object({
  name: z.string().trim().min(1, "Name the token (e.g. the build machine that uses it).").max(100),
  /** Days until the token stops working; left out, it works until revoked. */
  expiresInDays: z
    .int("Give the expiry as whole days.")
    .min(1, "A token lasts at least 1 day.")
    .max(3650, "A token lasts at most 3650 days.")
    .optional(),
});
