// `ber`: Q factor ↔ bit error ratio.
import { berFromQ, qFromBer } from "../../analysis/ber.ts";
import { berRequestSchema } from "../../contract/ber.ts";
import { defineCommand } from "../defineCommand.ts";

export const berCommand = defineCommand({
  name: "ber",
  schema: berRequestSchema,
  errorPaths: { fallback: "" },
  run: (r) => (r.q !== undefined ? { ber: berFromQ(r.q) } : { q: qFromBer(r.ber as number) }),
});
