// `fir-response`: magnitude and phase of a symbol-spaced FIR.
import { firResponseRequestSchema } from "../../contract/firResponse.ts";
import { firResponse } from "../../equalizers/firResponse.ts";
import { defineCommand } from "../defineCommand.ts";

/** `fir-response`: taps, pre, UI and frequencies → `{ magnitude_dB, phase_rad }`. */
export const firResponseCommand = defineCommand({
  name: "fir-response",
  schema: firResponseRequestSchema,
  errorPaths: { fallback: "taps" },
  run: (r) => {
    const { magnitude_dB, phase_rad } = firResponse(r.taps, r.pre, r.ui_s, r.freqs_Hz);
    return { magnitude_dB, phase_rad };
  },
});
