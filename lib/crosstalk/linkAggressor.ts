// An aggressor as a link budget sees it: its crosstalk pulse at the victim's receiver pins and the
// transmitter behind it (NEXT: its own swing and FIR; FEXT: by default the victim link's).
import { assertPulse } from "../pulse/assertPulse.ts";
import type { Pulse } from "../types.ts";
import { type AggressorKind, checkAggressorKind } from "./aggressorKind.ts";

/** An aggressor of `optimize` / `population`. */
export interface LinkAggressor {
  /** Crosstalk pulse at the victim's receiver pins for a 1 V aggressor symbol. */
  readonly pulse: Pulse;
  readonly kind: AggressorKind;
  readonly name?: string;
  /** The aggressor transmitter's peak-to-peak swing (default the budget's). */
  readonly txSwing_Vppd?: number;
  /** The aggressor transmitter's FIR (NEXT default `[1]`; FEXT default the victim's chosen FIR). */
  readonly txTaps?: readonly number[];
}

/** Throws TypeError/RangeError naming the aggressor unless the list is usable with the victim `pulse`. */
export function checkLinkAggressors(aggressors: readonly LinkAggressor[], pulse: Pulse, name = "aggressors"): void {
  if (!Array.isArray(aggressors)) throw new TypeError(`${name} must be an array`);
  aggressors.forEach((a, i) => {
    const at = `${name}[${i}]`;
    if (a === null || typeof a !== "object") throw new TypeError(`${at} must be an object`);
    checkAggressorKind(a.kind, `${at}.kind`);
    assertPulse(a.pulse, `${at}.pulse`);
    if (Math.abs(a.pulse.ui_s / pulse.ui_s - 1) > 1e-9 || a.pulse.samplesPerUi !== pulse.samplesPerUi) {
      throw new RangeError(`${at}.pulse must share the victim pulse's ui_s and samplesPerUi`);
    }
    if (a.txSwing_Vppd !== undefined && !(Number.isFinite(a.txSwing_Vppd) && a.txSwing_Vppd > 0)) {
      throw new RangeError(`${at}.txSwing_Vppd must be a finite number > 0, got ${String(a.txSwing_Vppd)}`);
    }
    if (a.txTaps !== undefined) {
      if (a.txTaps.length === 0 || a.txTaps.some((c: number) => !Number.isFinite(c)))
        throw new RangeError(`${at}.txTaps must be finite numbers, at least one`);
    }
  });
}

/** The aggressor's display name (its own, or "NEXT 1", "FEXT 2", … by position). */
export function aggressorLabel(a: LinkAggressor, i: number): string {
  return a.name ?? `${a.kind === "next" ? "NEXT" : "FEXT"} ${i + 1}`;
}
