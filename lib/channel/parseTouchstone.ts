// Touchstone reader (versions 1.x and 2.0): option line, keywords, comments, any port count.
import { InputFileError } from "./InputFileError.ts";
import type { NetworkData } from "./networkData.ts";
import { parseDecimal } from "./parseDecimal.ts";

/** Options of {@link parseTouchstone}. */
export interface TouchstoneOptions {
  /**
   * Port count from the file name's extension (`.s2p` → 2). Version 1 files do not state it;
   * without it the reader infers it from the first frequency's data (frequency lines have an odd
   * number of values, continuation lines an even number).
   */
  readonly ports?: number;
}

/** Most ports accepted. */
export const TOUCHSTONE_MAX_PORTS = 64;
/** Most frequencies accepted. */
export const TOUCHSTONE_MAX_FREQUENCIES = 1_000_000;

const UNITS: Record<string, number> = { hz: 1, khz: 1e3, mhz: 1e6, ghz: 1e9 };
type DataFormat = "db" | "ma" | "ri";

interface Options {
  unit: number;
  parameter: string;
  format: DataFormat;
  resistance: number;
}

/** Reads the option line `# <unit> <parameter> <format> R <ohms>` (any order, case-insensitive). */
function readOptionLine(tokens: string[], line: number): Options {
  const o: Options = { unit: 1e9, parameter: "s", format: "ma", resistance: 50 };
  for (let i = 0; i < tokens.length; i++) {
    const t = tokens[i].toLowerCase();
    if (t in UNITS) o.unit = UNITS[t];
    else if (t === "s" || t === "y" || t === "z" || t === "g" || t === "h") o.parameter = t;
    else if (t === "db" || t === "ma" || t === "ri") o.format = t;
    else if (t === "r") {
      const v = i + 1 < tokens.length ? parseDecimal(tokens[i + 1]) : null;
      if (v === null || !(v > 0)) throw new InputFileError(line, "the option line's R must be followed by a positive resistance");
      o.resistance = v;
      i++;
    } else throw new InputFileError(line, `unknown option '${tokens[i]}' on the option line`);
  }
  if (o.parameter !== "s") {
    throw new InputFileError(line, `only S-parameter files are supported; this one holds ${o.parameter.toUpperCase()}-parameters`);
  }
  return o;
}

/** Cells `[row, col]` in data order for a matrix format and, for 2-ports, the pair order. */
function cellOrder(n: number, matrix: "full" | "lower" | "upper", twoPort: "12_21" | "21_12"): [number, number][] {
  const cells: [number, number][] = [];
  if (n === 2 && matrix === "full" && twoPort === "21_12") {
    return [
      [0, 0],
      [1, 0],
      [0, 1],
      [1, 1],
    ];
  }
  for (let r = 0; r < n; r++) {
    const from = matrix === "upper" ? r : 0;
    const to = matrix === "lower" ? r : n - 1;
    for (let c = from; c <= to; c++) cells.push([r, c]);
  }
  return cells;
}

function toComplex(a: number, b: number, format: DataFormat): [number, number] {
  if (format === "ri") return [a, b];
  const mag = format === "ma" ? a : 10 ** (a / 20);
  const rad = (b * Math.PI) / 180;
  return [mag * Math.cos(rad), mag * Math.sin(rad)];
}

/**
 * Parses a Touchstone file into S-parameters.
 *
 * Version 1.x: `!` comments, the option line (defaults `# GHz S MA R 50`), data with one frequency
 * per block; 2-ports as `f N11 N21 N12 N22`, 3- and 4-ports one matrix row per line, larger files
 * wrapping rows at four pairs per line; 2-port noise data after the network data is skipped.
 * Version 2.0: `[Version] 2.0`, `[Number of Ports]`, `[Two-Port Data Order]` (2-ports),
 * `[Number of Frequencies]`, `[Number of Noise Frequencies]`, `[Reference]`, `[Matrix Format]`
 * (Full, Lower, Upper), `[Begin Information]`…`[End Information]`, `[Network Data]`,
 * `[Noise Data]`, `[End]`. Angles are in degrees.
 *
 * @param text - the file's text.
 * @param options - the port count when the file name tells it.
 * @throws InputFileError naming the line and the problem: unknown option or keyword, a value that is
 *   not a number, the wrong number of values for a frequency, frequencies not ascending, a count that
 *   disagrees with `[Number of Frequencies]`, non-S parameters, no data.
 * @see IBIS Open Forum, *Touchstone File Format Specification*, version 2.0 (2009) and 1.1.
 */
export function parseTouchstone(text: string, options: TouchstoneOptions = {}): NetworkData {
  if (typeof text !== "string") throw new TypeError("text must be a string");
  if (options.ports !== undefined && (!Number.isInteger(options.ports) || options.ports < 1 || options.ports > TOUCHSTONE_MAX_PORTS)) {
    throw new RangeError(`ports must be an integer 1…${TOUCHSTONE_MAX_PORTS}, got ${String(options.ports)}`);
  }
  const lines = text.replace(/^\ufeff/, "").split(/\r\n|\r|\n/);
  let version: 1 | 2 = 1;
  let sawContent = false;
  let opts: Options | null = null;
  let ports: number | null = options.ports ?? null;
  let declaredPorts: number | null = null;
  let twoPort: "12_21" | "21_12" | null = null;
  let declaredFreqs: number | null = null;
  let matrix: "full" | "lower" | "upper" = "full";
  let reference: number[] | null = null;
  let referenceLine = 0;
  let inInformation = false;
  let inNoise = false;
  let inNetwork = false;
  let ended = false;
  let lastLine = 0;

  // Data blocks: each frequency's values with the line where it starts.
  interface Block {
    line: number;
    values: number[];
  }
  const blocks: Block[] = [];
  let current = null as Block | null;
  let sawData = false;
  let optionLineSeen = false;
  let perBlock = 0; // values per frequency once the port count is known
  let inferring = false; // version 1 without a port count: collecting the first block
  let inferLast = 0; // last line of that first block
  let lastFreq = -Infinity;

  const pairsPerBlock = (n: number) => (matrix === "full" ? n * n : (n * (n + 1)) / 2);
  const closeBlock = () => {
    if (current === null) return;
    if (current.values.length !== perBlock) {
      throw new InputFileError(
        current.line,
        `the frequency starting here has ${current.values.length} values; ${perBlock} are expected (1 frequency + ${(perBlock - 1) / 2} value pairs for ${ports} ports)`,
      );
    }
    blocks.push(current);
    current = null;
  };
  const fixPorts = (n: number, line: number) => {
    if (n < 1 || n > TOUCHSTONE_MAX_PORTS) throw new InputFileError(line, `port count ${n} is outside 1…${TOUCHSTONE_MAX_PORTS}`);
    ports = n;
    perBlock = 1 + 2 * pairsPerBlock(n);
  };
  const inferPorts = (first: Block, lastOfBlock: number) => {
    const pairs = (first.values.length - 1) / 2;
    const n = Math.round(Math.sqrt(pairs));
    if (n * n !== pairs) {
      const where = lastOfBlock > first.line ? `lines ${first.line}–${lastOfBlock}` : `line ${first.line}`;
      throw new InputFileError(
        first.line,
        `cannot tell the port count: the first frequency (${where}) has ${pairs} value pairs, and an N-port has N² (1, 4, 9, 16, …)`,
      );
    }
    inferring = false;
    fixPorts(n, first.line);
  };
  if (ports !== null) fixPorts(ports, 0);
  const checkFrequency = (f: number, line: number) => {
    if (f < 0) throw new InputFileError(line, `frequency ${f} is negative`);
    const hz = f * (opts?.unit ?? 1e9);
    if (!(hz > lastFreq)) {
      throw new InputFileError(line, `frequencies must ascend: ${hz} Hz follows ${lastFreq} Hz`);
    }
    lastFreq = hz;
  };

  for (let li = 0; li < lines.length && !ended; li++) {
    const lineNo = li + 1;
    const bang = lines[li].indexOf("!");
    const content = (bang >= 0 ? lines[li].slice(0, bang) : lines[li]).trim();
    if (content === "") continue;
    lastLine = lineNo;

    if (content.startsWith("[")) {
      const close = content.indexOf("]");
      if (close < 0) throw new InputFileError(lineNo, `keyword without a closing bracket: '${content}'`);
      const keyword = content.slice(1, close).trim().toLowerCase().replace(/\s+/g, " ");
      const arg = content.slice(close + 1).trim();
      if (!sawContent && keyword === "version") {
        if (!/^2\.\d+$/.test(arg)) throw new InputFileError(lineNo, `unsupported [Version] '${arg}' (2.0 or 2.1 expected)`);
        version = 2;
        sawContent = true;
        continue;
      }
      if (version === 1) throw new InputFileError(lineNo, `keyword [${content.slice(1, close)}] in a file without [Version] 2.0 first`);
      if (inInformation) {
        if (keyword === "end information") inInformation = false;
        continue;
      }
      if (inNetwork && current !== null) closeBlock();
      switch (keyword) {
        case "number of ports": {
          const n = parseDecimal(arg);
          if (n === null || !Number.isInteger(n)) throw new InputFileError(lineNo, `[Number of Ports] needs an integer, got '${arg}'`);
          if (options.ports !== undefined && options.ports !== n) {
            throw new InputFileError(lineNo, `[Number of Ports] ${n} disagrees with the expected ${options.ports} ports`);
          }
          declaredPorts = n;
          fixPorts(n, lineNo);
          break;
        }
        case "two-port data order":
          if (arg !== "12_21" && arg !== "21_12") throw new InputFileError(lineNo, `[Two-Port Data Order] must be 12_21 or 21_12, got '${arg}'`);
          twoPort = arg;
          break;
        case "number of frequencies": {
          const n = parseDecimal(arg);
          if (n === null || !Number.isInteger(n) || n < 1 || n > TOUCHSTONE_MAX_FREQUENCIES) {
            throw new InputFileError(lineNo, `[Number of Frequencies] needs an integer 1…${TOUCHSTONE_MAX_FREQUENCIES}, got '${arg}'`);
          }
          declaredFreqs = n;
          break;
        }
        case "number of noise frequencies":
          break;
        case "reference": {
          const toks = arg === "" ? [] : arg.split(/\s+/);
          reference = toks.map((t) => {
            const v = parseDecimal(t);
            if (v === null || !(v > 0)) throw new InputFileError(lineNo, `[Reference] impedance '${t}' is not a positive number`);
            return v;
          });
          referenceLine = lineNo;
          break;
        }
        case "matrix format": {
          const m = arg.toLowerCase();
          if (m !== "full" && m !== "lower" && m !== "upper") throw new InputFileError(lineNo, `[Matrix Format] must be Full, Lower or Upper, got '${arg}'`);
          matrix = m;
          if (declaredPorts !== null) fixPorts(declaredPorts, lineNo);
          break;
        }
        case "mixed-mode order":
          throw new InputFileError(lineNo, "mixed-mode Touchstone data is not supported; give the single-ended file");
        case "begin information":
          inInformation = true;
          break;
        case "network data":
          if (opts === null) throw new InputFileError(lineNo, "[Network Data] before the option line");
          if (declaredPorts === null) throw new InputFileError(lineNo, "[Network Data] before [Number of Ports]");
          if (declaredFreqs === null) throw new InputFileError(lineNo, "[Network Data] before [Number of Frequencies]");
          if (declaredPorts === 2 && twoPort === null) throw new InputFileError(lineNo, "a 2-port file needs [Two-Port Data Order]");
          inNetwork = true;
          break;
        case "noise data":
          inNetwork = false;
          inNoise = true;
          break;
        case "end":
          ended = true;
          break;
        default:
          throw new InputFileError(lineNo, `unknown keyword [${content.slice(1, close)}]`);
      }
      continue;
    }
    if (inInformation || inNoise) continue;

    if (content.startsWith("#")) {
      if (!optionLineSeen && sawData) throw new InputFileError(lineNo, "the option line must come before the data");
      if (!optionLineSeen) opts = readOptionLine(content.slice(1).trim().split(/\s+/).filter(Boolean), lineNo);
      optionLineSeen = true; // later option lines are ignored, as the specification says
      sawContent = true;
      continue;
    }
    sawContent = true;
    const tokens = content.split(/\s+/);
    const nums = tokens.map((t) => {
      const v = parseDecimal(t);
      if (v === null) throw new InputFileError(lineNo, `'${t}' is not a number`);
      return v;
    });

    if (version === 2) {
      if (reference !== null && reference.length < (declaredPorts ?? 0) && !inNetwork) {
        reference.push(...nums); // [Reference] continued on the next line
        continue;
      }
      if (!inNetwork) throw new InputFileError(lineNo, "data outside [Network Data]");
    }
    if (opts === null) opts = { unit: 1e9, parameter: "s", format: "ma", resistance: 50 };
    sawData = true;

    // A version 1 file without a port count: the first block tells it.
    if (ports === null && !inferring) {
      if (nums.length % 2 === 0) throw new InputFileError(lineNo, `a frequency line needs an odd number of values (frequency + pairs), got ${nums.length}`);
      inferring = true;
      inferLast = lineNo;
      checkFrequency(nums[0], lineNo);
      current = { line: lineNo, values: nums };
      continue;
    }
    if (inferring && current !== null) {
      if (nums.length % 2 === 0) {
        current.values.push(...nums);
        inferLast = lineNo;
        continue;
      }
      inferPorts(current, inferLast);
      closeBlock();
    }

    if (current === null) {
      // Version 1 two-port noise parameters: five values at a frequency not above the last one.
      if (version === 1 && ports === 2 && nums.length === 5 && nums[0] * opts.unit <= lastFreq) {
        inNoise = true;
        continue;
      }
      checkFrequency(nums[0], lineNo);
      current = { line: lineNo, values: [] };
    }
    current.values.push(...nums);
    if (current.values.length > perBlock) {
      throw new InputFileError(lineNo, `too many values: the frequency starting at line ${current.line} needs ${perBlock} values (1 frequency + ${(perBlock - 1) / 2} value pairs for ${ports} ports), this line brings it to ${current.values.length}`);
    }
    if (current.values.length === perBlock) closeBlock();
    if (blocks.length > TOUCHSTONE_MAX_FREQUENCIES) throw new InputFileError(lineNo, `more than ${TOUCHSTONE_MAX_FREQUENCIES} frequencies`);
  }

  const pending: Block | null = current;
  if (inferring && pending !== null) inferPorts(pending, inferLast);
  if (current !== null) closeBlock();
  if (version === 2 && !ended) throw new InputFileError(lastLine, "a version 2 file must end with [End]");
  if (blocks.length === 0 || ports === null) throw new InputFileError(0, "the file holds no network data");
  if (declaredFreqs !== null && declaredFreqs !== blocks.length) {
    throw new InputFileError(lastLine, `[Number of Frequencies] says ${declaredFreqs} but the file holds ${blocks.length}`);
  }
  const n: number = ports;
  const o = opts as Options;
  const referenceOhms = new Float64Array(n).fill(o.resistance);
  if (reference !== null) {
    if (reference.length !== n) throw new InputFileError(referenceLine, `[Reference] needs ${n} impedances, got ${reference.length}`);
    referenceOhms.set(reference);
  }
  const order = cellOrder(n, matrix, twoPort ?? "21_12");
  const freqs_Hz = new Float64Array(blocks.length);
  const s = new Float64Array(blocks.length * n * n * 2);
  for (let f = 0; f < blocks.length; f++) {
    const v = blocks[f].values;
    freqs_Hz[f] = v[0] * o.unit;
    for (let c = 0; c < order.length; c++) {
      const [row, col] = order[c];
      const [re, im] = toComplex(v[1 + 2 * c], v[2 + 2 * c], o.format);
      if (!Number.isFinite(re) || !Number.isFinite(im)) {
        throw new InputFileError(blocks[f].line, `value pair ${c + 1} overflows (${v[1 + 2 * c]}, ${v[2 + 2 * c]})`);
      }
      const put = (r: number, k: number) => {
        const at = 2 * ((f * n + r) * n + k);
        s[at] = re;
        s[at + 1] = im;
      };
      put(row, col);
      if (matrix !== "full" && row !== col) put(col, row);
    }
  }
  return { ports: n, freqs_Hz, s, referenceOhms };
}
