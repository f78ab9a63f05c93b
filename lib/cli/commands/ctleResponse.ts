// `ctle-response`: magnitude of the Annex 93A CTLE with the optional low-frequency stage.
import { ctleResponseRequestSchema } from "../../contract/ctle.ts";
import { ctleMagnitudeDb } from "../../equalizers/ctleResponse.ts";
import { defineCommand } from "../defineCommand.ts";

/** `ctle-response`: CTLE settings and frequencies → `{ magnitude_dB }`. */
export const ctleResponseCommand = defineCommand({
  name: "ctle-response",
  schema: ctleResponseRequestSchema,
  errorPaths: { fallback: "" },
  run: (r) => ({ magnitude_dB: ctleMagnitudeDb(r, r.freqs_Hz) }),
});
