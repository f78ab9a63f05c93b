// `ber`: Q factor ↔ bit error ratio.
import { berFromQ, qFromBer } from "../../analysis/ber.ts";
import { berRequestSchema } from "../../contract/ber.ts";
import { defineCommand } from "../defineCommand.ts";

/** `ber`: `{ q }` → `{ ber }` with `BER = ½·erfc(Q/√2)`, or `{ ber }` → `{ q }`. */
export const berCommand = defineCommand({
  name: "ber",
  schema: berRequestSchema,
  errorPaths: { fallback: "" },
  run: (r) => (r.q !== undefined ? { ber: berFromQ(r.q) } : { q: qFromBer(r.ber as number) }),
});
