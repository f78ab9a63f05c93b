// An equalizer setting rounded to the codes of a register map, kept legal for the transmitter.
import { decodeField, encodeField, type RegisterField } from "./registerMap.ts";

/** The equalizer quantities a register map can hold. */
export interface EqualizerSetting {
  /** Transmit FIR taps (main tap `tx[txPre]`), fractions of the peak swing. */
  readonly tx: readonly number[];
  readonly txPre: number;
  readonly ctle: { readonly gDc_dB: number; readonly gDc2_dB: number };
  /** DFE taps in volts, tap 1 first. */
  readonly dfe: readonly number[];
  /** Receive FFE taps (main tap `ffe[ffePre]`), when the architecture has one. */
  readonly ffe?: readonly number[];
  readonly ffePre?: number;
}

/** A quantized setting: codes and values per field, and the setting rebuilt from them. */
export interface QuantizedSetting {
  readonly codes: Record<string, number>;
  readonly values: Record<string, number>;
  readonly setting: EqualizerSetting;
}

/** Reads the quantity a field's `parameter` names from a setting (undefined when absent). */
export function settingValue(setting: EqualizerSetting, parameter: string): number | undefined {
  const m = /^(tx|dfe|ffe)\[(-?\d+)\]$/.exec(parameter);
  if (parameter === "ctle.gDc_dB") return setting.ctle.gDc_dB;
  if (parameter === "ctle.gDc2_dB") return setting.ctle.gDc2_dB;
  if (m === null) return undefined;
  const k = Number(m[2]);
  if (m[1] === "tx") return setting.tx[setting.txPre + k];
  if (m[1] === "dfe") return setting.dfe[k - 1];
  return setting.ffe === undefined ? undefined : setting.ffe[(setting.ffePre ?? 0) + k];
}

/**
 * Rounds every quantity the map holds to its nearest code; quantities without a field stay as they
 * are. If rounding lifts the transmit FIR's `Σ|c|` above 1, the main tap's code is lowered until it
 * no longer does (the peak-swing limit holds after quantization).
 *
 * @param setting - the setting in physical units.
 * @param map - register fields (each parameter at most once).
 * @throws RangeError naming the field when a value lies outside its range, or a parameter repeats.
 */
export function quantizeSetting(setting: EqualizerSetting, map: readonly RegisterField[]): QuantizedSetting {
  const seen = new Set<string>();
  const codes: Record<string, number> = {};
  const values: Record<string, number> = {};
  const tx = [...setting.tx];
  const dfe = [...setting.dfe];
  const ffe = setting.ffe === undefined ? undefined : [...setting.ffe];
  const ctle = { ...setting.ctle };
  for (const f of map) {
    if (seen.has(f.parameter))
      throw new RangeError(`field ${f.name}: parameter ${f.parameter} appears twice in the map`);
    seen.add(f.parameter);
    const v = settingValue(setting, f.parameter);
    if (v === undefined) continue;
    const code = encodeField(f, v);
    codes[f.name] = code;
    values[f.name] = decodeField(f, code);
  }
  const place = (f: RegisterField) => {
    const v = values[f.name];
    if (v === undefined) return;
    const m = /^(tx|dfe|ffe)\[(-?\d+)\]$/.exec(f.parameter);
    if (f.parameter === "ctle.gDc_dB") ctle.gDc_dB = v;
    else if (f.parameter === "ctle.gDc2_dB") ctle.gDc2_dB = v;
    else if (m !== null && m[1] === "tx") tx[setting.txPre + Number(m[2])] = v;
    else if (m !== null && m[1] === "dfe") dfe[Number(m[2]) - 1] = v;
    else if (m !== null && ffe !== undefined) ffe[(setting.ffePre ?? 0) + Number(m[2])] = v;
  };
  map.forEach(place);
  const mainField = map.find((f) => f.parameter === "tx[0]");
  const sumAbs = () => tx.reduce((s, c) => s + Math.abs(c), 0);
  if (mainField !== undefined && codes[mainField.name] !== undefined) {
    while (sumAbs() > 1 + 1e-9) {
      const next = codes[mainField.name] - 1;
      values[mainField.name] = decodeField(mainField, next); // throws when no lower code exists
      codes[mainField.name] = next;
      tx[setting.txPre] = values[mainField.name];
    }
  }
  return { codes, values, setting: { ...setting, tx, dfe, ffe, ctle } };
}
