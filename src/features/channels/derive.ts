// From an uploaded file or a loss model to the channel's pulse response, through the engine
// (lib/channel). Decides the file type from its name, and turns the readers' errors into the API's
// 415 / 422 answers that name the line at fault. Pure: no database, no request objects.
import {
  DEFAULT_PORT_PAIRS,
  InputFileError,
  pulseFromLossModel,
  pulseFromSamples,
  pulseFromTouchstone,
  readCsvResponse,
  type FrequencyPulse,
} from "@lib/channel";
import { pulseToJson, trimPulse } from "@lib/pulse";
import { interpolateLinear } from "@lib/signal";
import type { Pulse } from "@lib/types";
import { ApiError, unprocessable } from "@/server/http/errors";
import type { ChannelKind, StoredCurve } from "@/db/schema/channels";
import {
  PULSE_KEEP_UI,
  SAMPLES_PER_UI,
  unitInterval_s,
  type DerivedChannel,
  type FileKind,
  type LossModel,
  type ModulationName,
  type PortPairs,
} from "./channels";

/** Most insertion-loss points stored for plotting (longer curves are thinned evenly). */
const MAX_CURVE_POINTS = 2000;

/** The file formats Tapwright reads, by extension. */
const EXTENSIONS: Record<string, { format: "csv" | "touchstone"; ports?: number }> = {
  csv: { format: "csv" },
  txt: { format: "csv" },
  s2p: { format: "touchstone", ports: 2 },
  s4p: { format: "touchstone", ports: 4 },
};

const accepted = "Tapwright reads pulse, step or impulse responses as .csv (or .txt) and Touchstone .s2p / .s4p files";

export interface FileOptions {
  filename: string;
  bytes: Uint8Array;
  bitRate_bps: number;
  modulation: ModulationName;
  kind?: FileKind;
  pairs?: PortPairs;
  riseTime_s?: number;
}

/** The extension's format, or a 415 that says what Tapwright reads. */
export function fileFormat(filename: string, kind?: FileKind) {
  const ext = /\.([A-Za-z0-9]+)$/.exec(filename)?.[1]?.toLowerCase();
  const known = ext ? EXTENSIONS[ext] : undefined;
  if (!known) {
    const sNp = ext && /^s\d+p$/.test(ext);
    throw new ApiError(
      415,
      sNp
        ? `${filename} is a ${ext!.slice(1, -1)}-port Touchstone file; ${accepted}.`
        : `${filename}: ${ext ? `.${ext} files are not read` : "the file name has no extension"}; ${accepted}.`,
      "file",
    );
  }
  if (kind === "touchstone" && known.format !== "touchstone") {
    throw new ApiError(415, `kind is touchstone but ${filename} is not a .s2p or .s4p file.`, "kind");
  }
  if (kind && kind !== "touchstone" && known.format === "touchstone") {
    throw new ApiError(415, `kind is ${kind} but ${filename} is a Touchstone file; leave kind out or upload a .csv.`, "kind");
  }
  return known;
}

function decodeText(filename: string, bytes: Uint8Array): string {
  if (bytes.length === 0) throw unprocessable(`${filename} is empty.`, "file");
  if (bytes.subarray(0, 8192).includes(0)) {
    throw unprocessable(`${filename} looks like a binary file; expected plain text (CSV or Touchstone).`, "file");
  }
  return new TextDecoder("utf-8").decode(bytes);
}

/** Engine errors → 422 with the reader's own words ("line 12: frequencies must ascend"). */
function readerError(filename: string, e: unknown): never {
  if (e instanceof InputFileError) throw unprocessable(`${filename}, ${e.message}`, "file");
  if (e instanceof RangeError || e instanceof TypeError) throw unprocessable(`${filename}: ${e.message}`, "file");
  throw e;
}

function thinCurve(freqs: ArrayLike<number>, mags: ArrayLike<number>): StoredCurve {
  const stride = Math.max(1, Math.ceil(freqs.length / MAX_CURVE_POINTS));
  const out: StoredCurve = { freqs_Hz: [], magnitude_dB: [] };
  for (let i = 0; i < freqs.length; i += stride) {
    out.freqs_Hz.push(freqs[i]);
    out.magnitude_dB.push(mags[i]);
  }
  const last = freqs.length - 1;
  if (last % stride !== 0) {
    out.freqs_Hz.push(freqs[last]);
    out.magnitude_dB.push(mags[last]);
  }
  return out;
}

/** Loss in dB (positive) at Nyquist read off the curve, or null when Nyquist is beyond the data. */
function lossAt(curve: { freqs_Hz: Float64Array; magnitude_dB: Float64Array }, freq_Hz: number): number | null {
  const f = curve.freqs_Hz;
  if (f.length === 0 || freq_Hz < f[0] || freq_Hz > f[f.length - 1]) return null;
  return -interpolateLinear(f, curve.magnitude_dB, Float64Array.of(freq_Hz))[0];
}

/** The stored form of a pulse: trimmed around the main cursor, plain numbers. */
function stored(pulse: Pulse) {
  const before = Math.floor(pulse.mainIndex / pulse.samplesPerUi);
  const after = Math.floor((pulse.values_V.length - 1 - pulse.mainIndex) / pulse.samplesPerUi);
  const trimmed = trimPulse(pulse, Math.min(before, PULSE_KEEP_UI.pre), Math.min(after, PULSE_KEEP_UI.post));
  const json = pulseToJson(trimmed);
  return { pulse: json, mainCursor_V: json.values_V[json.mainIndex] };
}

function fromFrequency(kind: ChannelKind, fp: FrequencyPulse, ui_s: number, derivation: Record<string, unknown>): DerivedChannel {
  const { pulse, mainCursor_V } = stored(fp.pulse);
  return {
    kind,
    pulse,
    insertionLoss: thinCurve(fp.insertionLoss.freqs_Hz, fp.insertionLoss.magnitude_dB),
    lossAtNyquist_dB: lossAt(fp.insertionLoss, 1 / (2 * ui_s)),
    mainCursor_V,
    derivation,
  };
}

/**
 * Derives a channel from an uploaded file.
 * @throws ApiError 415 for a file type Tapwright does not read, 422 for an unusable file (the
 *   message names the line and what is wrong there).
 */
export function deriveFromFile(o: FileOptions): DerivedChannel {
  const format = fileFormat(o.filename, o.kind);
  const text = decodeText(o.filename, o.bytes);
  const ui_s = unitInterval_s(o.bitRate_bps, o.modulation);
  const grid = { ui_s, samplesPerUi: SAMPLES_PER_UI, riseTime_s: o.riseTime_s };
  const common = { modulation: o.modulation, ui_s, samplesPerUi: SAMPLES_PER_UI, ...(o.riseTime_s ? { riseTime_s: o.riseTime_s } : {}) };
  if (format.format === "touchstone") {
    const pairs = format.ports === 4 ? (o.pairs ?? DEFAULT_PORT_PAIRS) : undefined;
    let fp: FrequencyPulse;
    try {
      fp = pulseFromTouchstone(text, { ...grid, ports: format.ports, pairs });
    } catch (e) {
      readerError(o.filename, e);
    }
    return fromFrequency("touchstone", fp, ui_s, {
      ...common,
      source: "touchstone",
      ports: format.ports,
      ...(pairs ? { pairs, transfer: "SDD21" } : { transfer: "S21" }),
    });
  }
  const kind = o.kind ?? "pulse-csv";
  const response = kind === "step-csv" ? "step" : kind === "impulse-csv" ? "impulse" : "pulse";
  let pulse: Pulse;
  let rows: number;
  try {
    const record = readCsvResponse(text);
    rows = record.time_s.length;
    pulse = pulseFromSamples({ response, values: record.values, time_s: record.time_s }, grid).pulse;
  } catch (e) {
    readerError(o.filename, e);
  }
  const s = stored(pulse);
  return { kind, pulse: s.pulse, insertionLoss: null, lossAtNyquist_dB: null, mainCursor_V: s.mainCursor_V, derivation: { ...common, source: kind, response, rows } };
}

/** Derives a synthetic channel from the loss model. */
export function deriveSynthetic(bitRate_bps: number, modulation: ModulationName, model: LossModel): DerivedChannel {
  const ui_s = unitInterval_s(bitRate_bps, modulation);
  let fp: FrequencyPulse;
  try {
    fp = pulseFromLossModel(model, { ui_s, samplesPerUi: SAMPLES_PER_UI });
  } catch (e) {
    if (e instanceof RangeError || e instanceof TypeError) throw unprocessable(e.message, "lossModel");
    throw e;
  }
  return fromFrequency("synthetic", fp, ui_s, { modulation, ui_s, samplesPerUi: SAMPLES_PER_UI, source: "loss-model", lossModel: model });
}
