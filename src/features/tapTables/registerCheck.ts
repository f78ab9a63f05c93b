// Server-side check of a register map against the architecture it encodes: one field per
// parameter, no strays, and codes inside every field's range at its width and LSB (422 otherwise).
import { codeRange } from "@lib/tapTables";
import type { Architecture } from "@/features/studies/architecture";
import { unprocessable } from "@/server/http/errors";
import { requiredParameters, type BudgetForMap, type RegisterField } from "./registerMap";

export function checkRegisterMap(map: readonly RegisterField[], architecture: Architecture, budget: BudgetForMap): void {
  const needed = requiredParameters(architecture, budget);
  const have = new Set(map.map((f) => f.parameter));
  const missing = needed.filter((p) => !have.has(p));
  if (missing.length > 0) {
    throw unprocessable(`The register map has no field for ${missing.join(", ")} (the architecture “${architecture.label}” needs one).`, "registerMap");
  }
  const stray = map.findIndex((f) => !needed.includes(f.parameter));
  if (stray !== -1) {
    throw unprocessable(`The field “${map[stray].name}” holds ${map[stray].parameter}, which “${architecture.label}” does not have.`, `registerMap.${stray}.parameter`);
  }
  map.forEach((f, i) => {
    try {
      codeRange(f);
    } catch (e) {
      if (e instanceof RangeError) throw unprocessable(`${e.message}; widen the field or change its LSB or range.`, `registerMap.${i}`);
      throw e;
    }
  });
}
