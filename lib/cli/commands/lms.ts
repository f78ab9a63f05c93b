// `lms`: LMS or sign-sign LMS adaptation with the tap trajectory and the MSE at each record.
import { lmsRequestSchema } from "../../contract/lms.ts";
import { lmsAdapt } from "../../solvers/lmsAdapt.ts";
import { defineCommand } from "../defineCommand.ts";

/** `lms`: → `{ taps, trajectory, mse, iterationsAt }` (MSE exact for each recorded tap vector). */
export const lmsCommand = defineCommand({
  name: "lms",
  schema: lmsRequestSchema,
  errorPaths: { aliases: { "cursors.h": "cursors", cursors: "cursors" }, fallback: "mu" },
  run: (r) => {
    const out = lmsAdapt({ h: Float64Array.from(r.cursors), main: r.main }, r.pre, r.post, {
      noiseRms_V: r.noiseRms_V,
      mu: r.mu,
      iterations: r.iterations,
      seed: r.seed,
      variant: r.variant,
      every: r.every,
    });
    return { taps: out.taps, trajectory: out.trajectory, mse: out.mse, iterationsAt: out.iterationsAt };
  },
});
