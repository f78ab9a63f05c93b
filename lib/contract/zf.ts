// Request of the `zf` command: zero-forcing taps for symbol-spaced cursors.
import { z } from "zod";
import { checkMainInCursors, cursorWindowShape, nonNegativeInt } from "./common.ts";

/**
 * `{ cursors, main, pre, post, normalize? }`; `window` (an extension) widens the forced window to
 * `{ pre, post }` cursors around the combined main cursor for a least-squares solution.
 */
export const zfRequestSchema = z
  .object({
    ...cursorWindowShape,
    normalize: z.enum(["unit-cursor", "peak-swing"], { error: 'expected "unit-cursor" or "peak-swing"' }).optional(),
    window: z
      .object({ pre: nonNegativeInt.max(2048), post: nonNegativeInt.max(2048) })
      .optional()
      .describe("cursors forced around the combined main cursor; wider than pre/post gives least squares"),
  })
  .superRefine((r, ctx) => {
    checkMainInCursors(r, ctx);
    if (r.window !== undefined && (r.window.pre < r.pre || r.window.post < r.post)) {
      ctx.addIssue({
        code: "custom",
        path: ["window"],
        message: "window must reach at least pre cursors before and post cursors after the main cursor",
      });
    }
  });

/** A validated request (defaults applied). */
export type ZfRequest = z.output<typeof zfRequestSchema>;
