// `zf`: zero-forcing taps (square, or least squares over a wider window).
import { zfRequestSchema } from "../../contract/zf.ts";
import { zeroForcing } from "../../solvers/zeroForcing.ts";
import { defineCommand } from "../defineCommand.ts";

/** `zf`: → `{ taps, equalized, equalizedMain }` (`equalized` is the whole combined `g`). */
export const zfCommand = defineCommand({
  name: "zf",
  schema: zfRequestSchema,
  errorPaths: { aliases: { "cursors.h": "cursors", cursors: "cursors" }, fallback: "cursors" },
  run: (r) => {
    const { taps, equalized } = zeroForcing({ h: Float64Array.from(r.cursors), main: r.main }, r.pre, r.post, {
      normalize: r.normalize,
      window: r.window,
    });
    return { taps, equalized: equalized.h, equalizedMain: equalized.main };
  },
});
