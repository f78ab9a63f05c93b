// `mmse`: the linear MMSE (Wiener) equalizer and its mean-square error.
import { mmseRequestSchema } from "../../contract/mmse.ts";
import { mmseEqualizer } from "../../solvers/mmse.ts";
import { defineCommand } from "../defineCommand.ts";

/** `mmse`: → `{ taps, mse, equalized, equalizedMain }`. */
export const mmseCommand = defineCommand({
  name: "mmse",
  schema: mmseRequestSchema,
  errorPaths: { aliases: { "cursors.h": "cursors", cursors: "cursors" }, fallback: "cursors" },
  run: (r) => {
    const { taps, mse, equalized } = mmseEqualizer(
      { h: Float64Array.from(r.cursors), main: r.main },
      r.pre,
      r.post,
      r.noiseRms_V,
    );
    return { taps, mse, equalized: equalized.h, equalizedMain: equalized.main };
  },
});
