// The two kinds of aggressor: a transmitter at the victim's receiving end (NEXT) or at its far end (FEXT).

/** Near-end (the neighbour's transmitter beside the victim's receiver) or far-end crosstalk. */
export type AggressorKind = "next" | "fext";

/** Throws RangeError naming `name` unless `kind` is "next" or "fext". */
export function checkAggressorKind(kind: unknown, name = "kind"): asserts kind is AggressorKind {
  if (kind !== "next" && kind !== "fext") throw new RangeError(`${name} must be "next" or "fext", got ${String(kind)}`);
}
