// Request of the `mmse` command: the linear MMSE (Wiener) equalizer.
import { z } from "zod";
import { checkMainInCursors, cursorWindowShape, nonNegativeNumber } from "./common.ts";

/** `{ cursors, main, pre, post, noiseRms_V }`. */
export const mmseRequestSchema = z
  .object({ ...cursorWindowShape, noiseRms_V: nonNegativeNumber })
  .superRefine(checkMainInCursors);

/** A validated request (defaults applied). */
export type MmseRequest = z.output<typeof mmseRequestSchema>;
