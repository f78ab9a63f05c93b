// From an uploaded file or a loss model to the channel's pulse response, through the engine
// (lib/channel). Decides the file type from its name, and turns the readers' errors into
// ChannelInputErrors that name the line at fault (the service answers them as 400 / 415 / 422).
// Pure: no database, no request objects.
import {
  DEFAULT_PORT_PAIRS,
  InputFileError,
  pulseFromLossModel,
  pulseFromSamples,
  pulseFromTouchstone,
  readCsvResponse,
  type FrequencyPulse,
  type InputQuality,
} from "@lib/channel";
import {
  integratedCrosstalkNoiseOfPulses,
  linkFromTouchstone,
  pulseFromCoupling,
  type CouplingModel,
} from "@lib/crosstalk";
import { pulseFromJson, pulseToJson, trimPulse } from "@lib/pulse";
import { interpolateLinear } from "@lib/signal";
import type { Modulation, Pulse } from "@lib/types";
import {
  aggressorName,
  ICN_REFERENCE_AMPLITUDE_V,
  type AggressorSpec,
  type CouplingSpec,
  type DerivedAggressor,
} from "./aggressors";
import {
  PULSE_KEEP_UI,
  SAMPLES_PER_UI,
  unitInterval_s,
  type ChannelDerivation,
  type ChannelKind,
  type DerivedChannel,
  type StoredCurve,
  type FileKind,
  type LossModel,
  type PortPairs,
} from "./channels";

/**
 * Why a file or a loss model gives no channel: `unsupported` for a file type Tapwright does not
 * read, `unusable` for one it reads but cannot use, `malformed` for a request that does not hang
 * together (an aggressor naming a file that did not come); `path` is the request field at fault.
 */
export class ChannelInputError extends Error {
  constructor(
    readonly reason: "unsupported" | "unusable" | "malformed",
    message: string,
    readonly path: string,
  ) {
    super(message);
    this.name = "ChannelInputError";
  }
}

const unsupported = (message: string, path: string) => new ChannelInputError("unsupported", message, path);
const unusable = (message: string, path: string) => new ChannelInputError("unusable", message, path);
const malformed = (message: string, path: string) => new ChannelInputError("malformed", message, path);

/** Most insertion-loss points stored for plotting (longer curves are thinned evenly). */
const MAX_CURVE_POINTS = 2000;

/** The file formats Tapwright reads, by extension. */
const EXTENSIONS: Record<string, { format: "csv" | "touchstone"; ports?: number }> = {
  csv: { format: "csv" },
  txt: { format: "csv" },
  s2p: { format: "touchstone", ports: 2 },
  s4p: { format: "touchstone", ports: 4 },
  s8p: { format: "touchstone", ports: 8 },
  s12p: { format: "touchstone", ports: 12 },
  s16p: { format: "touchstone", ports: 16 },
};

const accepted =
  "Tapwright reads pulse, step or impulse responses as .csv (or .txt) and Touchstone .s2p / .s4p files (.s8p / .s12p / .s16p for a lane with its neighbours)";

export interface FileOptions {
  filename: string;
  bytes: Uint8Array;
  bitRate_bps: number;
  modulation: Modulation;
  kind?: FileKind;
  pairs?: PortPairs;
  riseTime_s?: number;
  /** The victim's aggressors, and the files of those that came with their own (by multipart field). */
  aggressors?: AggressorSpec[];
  aggressorFiles?: Record<string, { filename: string; bytes: Uint8Array }>;
}

/** The extension's format, or an `unsupported` error that says what Tapwright reads. */
export function fileFormat(filename: string, kind?: FileKind) {
  const ext = /\.([A-Za-z0-9]+)$/.exec(filename)?.[1]?.toLowerCase();
  const known = ext ? EXTENSIONS[ext] : undefined;
  if (!known) {
    const sNp = ext && /^s\d+p$/.test(ext);
    throw unsupported(
      sNp
        ? `${filename} is a ${ext!.slice(1, -1)}-port Touchstone file; ${accepted}.`
        : `${filename}: ${ext ? `.${ext} files are not read` : "the file name has no extension"}; ${accepted}.`,
      "file",
    );
  }
  if (kind === "touchstone" && known.format !== "touchstone") {
    throw unsupported(`kind is touchstone but ${filename} is not a Touchstone (.sNp) file.`, "kind");
  }
  if (kind && kind !== "touchstone" && known.format === "touchstone") {
    throw unsupported(`kind is ${kind} but ${filename} is a Touchstone file; leave kind out or upload a .csv.`, "kind");
  }
  return known;
}

function decodeText(filename: string, bytes: Uint8Array): string {
  if (bytes.length === 0) throw unusable(`${filename} is empty.`, "file");
  if (bytes.subarray(0, 8192).includes(0)) {
    throw unusable(`${filename} looks like a binary file; expected plain text (CSV or Touchstone).`, "file");
  }
  return new TextDecoder("utf-8").decode(bytes);
}

/** Engine errors → `unusable`, in the reader's own words ("line 12: frequencies must ascend"). */
function readerError(filename: string, e: unknown): never {
  if (e instanceof InputFileError) throw unusable(`${filename}, ${e.message}`, "file");
  if (e instanceof RangeError || e instanceof TypeError) throw unusable(`${filename}: ${e.message}`, "file");
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

/** The stored form of a pulse: trimmed around the main cursor, plain numbers (also a sweep's corner pulses). */
export function storedPulse(pulse: Pulse) {
  const before = Math.floor(pulse.mainIndex / pulse.samplesPerUi);
  const after = Math.floor((pulse.values_V.length - 1 - pulse.mainIndex) / pulse.samplesPerUi);
  const trimmed = trimPulse(pulse, Math.min(before, PULSE_KEEP_UI.pre), Math.min(after, PULSE_KEEP_UI.post));
  const json = pulseToJson(trimmed);
  return { pulse: json, mainCursor_V: json.values_V[json.mainIndex] };
}

function fromFrequency(
  kind: ChannelKind,
  fp: FrequencyPulse,
  ui_s: number,
  derivation: ChannelDerivation,
  quality: InputQuality | null = null,
): DerivedChannel {
  const { pulse, mainCursor_V } = storedPulse(fp.pulse);
  return {
    kind,
    pulse,
    insertionLoss: thinCurve(fp.insertionLoss.freqs_Hz, fp.insertionLoss.magnitude_dB),
    lossAtNyquist_dB: lossAt(fp.insertionLoss, 1 / (2 * ui_s)),
    mainCursor_V,
    derivation,
    quality,
    aggressors: [],
  };
}

/** The default victim pairing of a multi-port file: the first pair on the left to the first on the right. */
export function defaultMultiPortPairs(ports: number): PortPairs {
  return ports === 4 ? DEFAULT_PORT_PAIRS : { inP: 1, inN: 2, outP: ports / 2 + 1, outN: ports / 2 + 2 };
}

/**
 * Derives a channel from an uploaded file, with its aggressors: pairs of the same multi-port file,
 * files of their own, or the coupling model.
 * @throws ChannelInputError `unsupported` for a file type Tapwright does not read, `unusable` for a
 *   file it cannot use (the message names the line and what is wrong there) or an aggressor that
 *   does not fit the file, `malformed` for an aggressor whose file did not come.
 */
export function deriveFromFile(o: FileOptions): DerivedChannel {
  const format = fileFormat(o.filename, o.kind);
  const text = decodeText(o.filename, o.bytes);
  const ui_s = unitInterval_s(o.bitRate_bps, o.modulation);
  const grid = { ui_s, samplesPerUi: SAMPLES_PER_UI, riseTime_s: o.riseTime_s };
  const common = {
    modulation: o.modulation,
    ui_s,
    samplesPerUi: SAMPLES_PER_UI,
    ...(o.riseTime_s ? { riseTime_s: o.riseTime_s } : {}),
  };
  const specs = o.aggressors ?? [];
  const fromPorts = specs.flatMap((a, i) => (a.source === "ports" ? [{ a, i }] : []));
  if (fromPorts.length > 0 && !(format.format === "touchstone" && (format.ports ?? 0) >= 8)) {
    throw unusable(
      `Aggressor ${aggressorName(fromPorts[0].a, fromPorts[0].i)} names ports of the victim's file, which needs a multi-port Touchstone file (.s8p, .s12p or .s16p).`,
      "aggressors",
    );
  }
  let derived: DerivedChannel;
  const multiPort: DerivedAggressor[] = [];
  if (format.format === "touchstone") {
    const ports = format.ports ?? 2;
    const pairs = ports >= 4 ? (o.pairs ?? defaultMultiPortPairs(ports)) : undefined;
    if (pairs) {
      const bad = Object.entries(pairs).find(([, p]) => p > ports);
      if (bad) throw unusable(`pairs.${bad[0]} is port ${bad[1]}, but ${o.filename} has ${ports} ports.`, "pairs");
    }
    let fp: FrequencyPulse;
    let quality: InputQuality;
    try {
      if (ports >= 8) {
        const link = linkFromTouchstone(text, {
          ...grid,
          ports,
          victim: pairs!,
          aggressors: fromPorts.map(({ a, i }) => ({
            kind: a.kind,
            p: (a as { p: number }).p,
            n: (a as { n: number }).n,
            name: aggressorName(a, i),
          })),
        });
        fp = link.victim;
        quality = link.quality;
        link.aggressors.forEach((x, j) => {
          const { a } = fromPorts[j];
          multiPort.push(
            storedAggressor(x.name, x.kind, "ports", x.pulse, x.insertionLoss, {
              ports: { p: (a as { p: number }).p, n: (a as { n: number }).n },
            }),
          );
        });
      } else {
        const tp = pulseFromTouchstone(text, { ...grid, ports, pairs });
        [fp, quality] = [tp, tp.quality];
      }
    } catch (e) {
      readerError(o.filename, e);
    }
    derived = fromFrequency(
      "touchstone",
      fp,
      ui_s,
      {
        ...common,
        source: "touchstone",
        ports,
        ...(pairs ? { pairs, transfer: "SDD21" } : { transfer: "S21" }),
      },
      quality,
    );
  } else {
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
    const s = storedPulse(pulse);
    derived = {
      kind,
      pulse: s.pulse,
      insertionLoss: null,
      lossAtNyquist_dB: null,
      mainCursor_V: s.mainCursor_V,
      derivation: { ...common, source: kind, response, rows },
      quality: null,
      aggressors: [],
    };
  }
  // The aggressors in the order given: pairs of this file, files of their own, coupling models.
  let nextPort = 0;
  const aggressors = specs.map((a, i) => {
    if (a.source === "ports") return multiPort[nextPort++];
    if (a.source === "coupling") return couplingAggressor(a, i, grid);
    const file = o.aggressorFiles?.[a.field];
    if (!file)
      throw malformed(
        `Aggressor ${aggressorName(a, i)} names the file field '${a.field}', but no file came in it.`,
        "aggressors",
      );
    const own = deriveFromFile({
      filename: file.filename,
      bytes: file.bytes,
      bitRate_bps: o.bitRate_bps,
      modulation: o.modulation,
      kind: a.csvKind ?? (fileFormat(file.filename).format === "touchstone" ? undefined : "pulse-csv"),
      pairs: a.pairs,
      riseTime_s: o.riseTime_s,
    });
    return storedAggressor(aggressorName(a, i), a.kind, "file", pulseFromJson(own.pulse), own.insertionLoss, {
      file: own.derivation,
    });
  });
  return { ...derived, aggressors: withIcn(aggressors, ui_s) };
}

/** An aggressor's pulse in the stored form: kept from 64 UI before its peak to 240 after. */
function storedAggressor(
  name: string,
  kind: DerivedAggressor["kind"],
  source: DerivedAggressor["source"],
  pulse: Pulse,
  coupling: { freqs_Hz: ArrayLike<number>; magnitude_dB: ArrayLike<number> } | StoredCurve | null,
  derivation: Record<string, unknown>,
): DerivedAggressor {
  const before = Math.floor(pulse.mainIndex / pulse.samplesPerUi);
  const after = Math.floor((pulse.values_V.length - 1 - pulse.mainIndex) / pulse.samplesPerUi);
  const trimmed = trimPulse(pulse, Math.min(before, 64), Math.min(after, PULSE_KEEP_UI.post));
  return {
    name,
    kind,
    source,
    pulse: pulseToJson(trimmed),
    coupling: coupling === null ? null : thinCurve(coupling.freqs_Hz, coupling.magnitude_dB),
    icnRms_V: 0,
    derivation,
  };
}

/** The coupling model's pulse on the channel's grid. */
function couplingAggressor(
  a: AggressorSpec & { source: "coupling" },
  i: number,
  grid: { ui_s: number; samplesPerUi: number },
): DerivedAggressor {
  const c: CouplingSpec = a.coupling;
  const line = { lossAtNyquist_dB: c.lossAtNyquist_dB, delay_s: c.delay_s };
  const model: CouplingModel =
    a.kind === "next"
      ? { kind: "next", backwardCoefficient: c.backwardCoefficient ?? 0, line }
      : { kind: "fext", forwardCoupling_s: c.forwardCoupling_s ?? 0, line };
  let fp: FrequencyPulse;
  try {
    fp = pulseFromCoupling(model, grid);
  } catch (e) {
    if (e instanceof RangeError || e instanceof TypeError)
      throw unusable(`Aggressor ${aggressorName(a, i)}: ${e.message}`, "aggressors");
    throw e;
  }
  return storedAggressor(aggressorName(a, i), a.kind, "coupling", fp.pulse, fp.insertionLoss, { coupling: model });
}

/** Each aggressor's ICN for a 1 Vppd transmitter (IEEE 802.3 Annex 85A form, from its stored pulse). */
function withIcn(aggressors: DerivedAggressor[], ui_s: number): DerivedAggressor[] {
  if (aggressors.length === 0) return aggressors;
  const icn = integratedCrosstalkNoiseOfPulses(
    aggressors.map((a) => ({ kind: a.kind, pulse: pulseFromJson(a.pulse), amplitude_V: ICN_REFERENCE_AMPLITUDE_V })),
    { baud_Hz: 1 / ui_s },
  );
  return aggressors.map((a, i) => ({ ...a, icnRms_V: icn.perAggressor_V[i] }));
}

/** Derives a synthetic channel from the loss model, with coupling-model aggressors. */
export function deriveSynthetic(
  bitRate_bps: number,
  modulation: Modulation,
  model: LossModel,
  aggressors: AggressorSpec[] = [],
): DerivedChannel {
  const ui_s = unitInterval_s(bitRate_bps, modulation);
  let fp: FrequencyPulse;
  try {
    fp = pulseFromLossModel(model, { ui_s, samplesPerUi: SAMPLES_PER_UI });
  } catch (e) {
    if (e instanceof RangeError || e instanceof TypeError) throw unusable(e.message, "lossModel");
    throw e;
  }
  const derived = fromFrequency("synthetic", fp, ui_s, {
    modulation,
    ui_s,
    samplesPerUi: SAMPLES_PER_UI,
    source: "loss-model",
    lossModel: model,
  });
  const grid = { ui_s, samplesPerUi: SAMPLES_PER_UI };
  const own = aggressors.map((a, i) => {
    if (a.source !== "coupling")
      throw malformed(
        `Aggressor ${aggressorName(a, i)}: a synthetic channel's aggressors come from the coupling model (source "coupling").`,
        "aggressors",
      );
    return couplingAggressor(a, i, grid);
  });
  return { ...derived, aggressors: withIcn(own, ui_s) };
}
