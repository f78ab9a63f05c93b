// `prbs`: the bits of an ITU-T O.150 sequence (or PRBS13) as a string of 0 and 1.
import { prbs } from "../../analysis/prbs.ts";
import { prbsRequestSchema } from "../../contract/prbs.ts";
import { defineCommand } from "../defineCommand.ts";

/** `prbs`: `{ order, length, invert? }` → `{ bits: "0101…" }` starting at `b[0]`. */
export const prbsCommand = defineCommand({
  name: "prbs",
  schema: prbsRequestSchema,
  errorPaths: { fallback: "" },
  run: (r) => {
    const bits = prbs(r.order, r.length, r.invert ?? false);
    for (let i = 0; i < bits.length; i++) bits[i] += 48; // 0/1 → the characters "0"/"1"
    return { bits: new TextDecoder().decode(bits) };
  },
});
