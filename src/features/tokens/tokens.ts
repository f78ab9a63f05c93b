// Request schemas for API tokens.
import { z } from "zod";

export const createTokenRequest = z.object({
  name: z.string().trim().min(1, "Name the token (e.g. the build machine that uses it).").max(100),
});
