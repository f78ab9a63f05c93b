// The Touchstone reader's state as it walks a file line by line — version, option line, keywords,
// port count, the data of each frequency — and the network the data assemble into.
import { InputFileError } from "./InputFileError.ts";
import type { NetworkData } from "./networkData.ts";
import { parseDecimal } from "./parseDecimal.ts";

/** Most ports accepted. */
export const TOUCHSTONE_MAX_PORTS = 64;
/** Most frequencies accepted. */
export const TOUCHSTONE_MAX_FREQUENCIES = 1_000_000;

const UNITS: Record<string, number> = { hz: 1, khz: 1e3, mhz: 1e6, ghz: 1e9 };
type DataFormat = "db" | "ma" | "ri";
type MatrixFormat = "full" | "lower" | "upper";
type TwoPortOrder = "12_21" | "21_12";

/** What the option line says. */
interface OptionLine {
  unit: number;
  parameter: string;
  format: DataFormat;
  resistance: number;
}

const DEFAULT_OPTIONS: Readonly<OptionLine> = { unit: 1e9, parameter: "s", format: "ma", resistance: 50 };

/** Reads the option line `# <unit> <parameter> <format> R <ohms>` (any order, case-insensitive). */
function readOptionLine(tokens: string[], line: number): OptionLine {
  const o: OptionLine = { ...DEFAULT_OPTIONS };
  for (let i = 0; i < tokens.length; i++) {
    const t = tokens[i].toLowerCase();
    if (t in UNITS) o.unit = UNITS[t];
    else if (t === "s" || t === "y" || t === "z" || t === "g" || t === "h") o.parameter = t;
    else if (t === "db" || t === "ma" || t === "ri") o.format = t;
    else if (t === "r") {
      const v = i + 1 < tokens.length ? parseDecimal(tokens[i + 1]) : null;
      if (v === null || !(v > 0))
        throw new InputFileError(line, "the option line's R must be followed by a positive resistance");
      o.resistance = v;
      i++;
    } else throw new InputFileError(line, `unknown option '${tokens[i]}' on the option line`);
  }
  if (o.parameter !== "s") {
    throw new InputFileError(
      line,
      `only S-parameter files are supported; this one holds ${o.parameter.toUpperCase()}-parameters`,
    );
  }
  return o;
}

/** Cells `[row, col]` in data order for a matrix format and, for 2-ports, the pair order. */
function cellOrder(n: number, matrix: MatrixFormat, twoPort: TwoPortOrder): [number, number][] {
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

/** One frequency's values and the line where it starts. */
interface Block {
  line: number;
  values: number[];
}

/**
 * A Touchstone file being read: feed it each line's content (comments stripped, trimmed, not
 * empty) with {@link read} until {@link ended}, then {@link finish} checks the whole and assembles
 * the network. Errors are {@link InputFileError}s naming the line.
 */
export class TouchstoneReader {
  #version: 1 | 2 = 1;
  #sawContent = false;
  #options: OptionLine | null = null;
  #optionLineSeen = false;
  #ports: number | null;
  readonly #expectedPorts: number | undefined;
  #declaredPorts: number | null = null;
  #twoPort: TwoPortOrder | null = null;
  #declaredFreqs: number | null = null;
  #matrix: MatrixFormat = "full";
  #reference: number[] | null = null;
  #referenceLine = 0;
  #inInformation = false;
  #inNoise = false;
  #inNetwork = false;
  #ended = false;
  readonly #blocks: Block[] = [];
  #current: Block | null = null;
  #sawData = false;
  /** Values per frequency once the port count is known. */
  #perBlock = 0;
  /** Version 1 without a port count: collecting the first block, which tells it. */
  #inferring = false;
  /** Last line of that first block. */
  #inferLast = 0;
  #lastFreq = Number.NEGATIVE_INFINITY;

  /** @param expectedPorts - the port count from the file name, when known (1 … {@link TOUCHSTONE_MAX_PORTS}). */
  constructor(expectedPorts: number | undefined) {
    this.#expectedPorts = expectedPorts;
    this.#ports = expectedPorts ?? null;
    if (this.#ports !== null) this.#fixPorts(this.#ports, 0);
  }

  /** True once `[End]` was read: later lines are not part of the file. */
  get ended(): boolean {
    return this.#ended;
  }

  /** Reads the content of line `lineNo` (comments stripped, trimmed, not empty). */
  read(content: string, lineNo: number): void {
    if (content.startsWith("[")) {
      this.#keywordLine(content, lineNo);
      return;
    }
    if (this.#inInformation || this.#inNoise) return;
    if (content.startsWith("#")) {
      if (!this.#optionLineSeen && this.#sawData)
        throw new InputFileError(lineNo, "the option line must come before the data");
      if (!this.#optionLineSeen)
        this.#options = readOptionLine(content.slice(1).trim().split(/\s+/).filter(Boolean), lineNo);
      this.#optionLineSeen = true; // later option lines are ignored, as the specification says
      this.#sawContent = true;
      return;
    }
    this.#sawContent = true;
    const nums = content.split(/\s+/).map((t) => {
      const v = parseDecimal(t);
      if (v === null) throw new InputFileError(lineNo, `'${t}' is not a number`);
      return v;
    });
    this.#dataLine(nums, lineNo);
  }

  /**
   * Checks the file as a whole and assembles the network.
   *
   * @param lastLine - the last line with content (for errors about the file's end).
   */
  finish(lastLine: number): NetworkData {
    const pending: Block | null = this.#current;
    if (this.#inferring && pending !== null) this.#inferPorts(pending, this.#inferLast);
    if (this.#current !== null) this.#closeBlock();
    if (this.#version === 2 && !this.#ended) throw new InputFileError(lastLine, "a version 2 file must end with [End]");
    const blocks = this.#blocks;
    if (blocks.length === 0 || this.#ports === null) throw new InputFileError(0, "the file holds no network data");
    if (this.#declaredFreqs !== null && this.#declaredFreqs !== blocks.length) {
      throw new InputFileError(
        lastLine,
        `[Number of Frequencies] says ${this.#declaredFreqs} but the file holds ${blocks.length}`,
      );
    }
    const n: number = this.#ports;
    const o = this.#options as OptionLine;
    const referenceOhms = new Float64Array(n).fill(o.resistance);
    if (this.#reference !== null) {
      if (this.#reference.length !== n) {
        throw new InputFileError(
          this.#referenceLine,
          `[Reference] needs ${n} impedances, got ${this.#reference.length}`,
        );
      }
      referenceOhms.set(this.#reference);
    }
    const order = cellOrder(n, this.#matrix, this.#twoPort ?? "21_12");
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
        if (this.#matrix !== "full" && row !== col) put(col, row);
      }
    }
    return { ports: n, freqs_Hz, s, referenceOhms };
  }

  /** A `[Keyword] argument` line. */
  #keywordLine(content: string, lineNo: number): void {
    const close = content.indexOf("]");
    if (close < 0) throw new InputFileError(lineNo, `keyword without a closing bracket: '${content}'`);
    const keyword = content.slice(1, close).trim().toLowerCase().replace(/\s+/g, " ");
    const arg = content.slice(close + 1).trim();
    if (!this.#sawContent && keyword === "version") {
      if (!/^2\.\d+$/.test(arg))
        throw new InputFileError(lineNo, `unsupported [Version] '${arg}' (2.0 or 2.1 expected)`);
      this.#version = 2;
      this.#sawContent = true;
      return;
    }
    if (this.#version === 1)
      throw new InputFileError(lineNo, `keyword [${content.slice(1, close)}] in a file without [Version] 2.0 first`);
    if (this.#inInformation) {
      if (keyword === "end information") this.#inInformation = false;
      return;
    }
    if (this.#inNetwork && this.#current !== null) this.#closeBlock();
    this.#keyword(keyword, arg, content.slice(1, close), lineNo);
  }

  /** The version 2 keyword `keyword` (lower case; `name` as written) with its argument. */
  #keyword(keyword: string, arg: string, name: string, lineNo: number): void {
    switch (keyword) {
      case "number of ports": {
        const n = parseDecimal(arg);
        if (n === null || !Number.isInteger(n))
          throw new InputFileError(lineNo, `[Number of Ports] needs an integer, got '${arg}'`);
        if (this.#expectedPorts !== undefined && this.#expectedPorts !== n) {
          throw new InputFileError(
            lineNo,
            `[Number of Ports] ${n} disagrees with the expected ${this.#expectedPorts} ports`,
          );
        }
        this.#declaredPorts = n;
        this.#fixPorts(n, lineNo);
        break;
      }
      case "two-port data order":
        if (arg !== "12_21" && arg !== "21_12")
          throw new InputFileError(lineNo, `[Two-Port Data Order] must be 12_21 or 21_12, got '${arg}'`);
        this.#twoPort = arg;
        break;
      case "number of frequencies": {
        const n = parseDecimal(arg);
        if (n === null || !Number.isInteger(n) || n < 1 || n > TOUCHSTONE_MAX_FREQUENCIES) {
          throw new InputFileError(
            lineNo,
            `[Number of Frequencies] needs an integer 1…${TOUCHSTONE_MAX_FREQUENCIES}, got '${arg}'`,
          );
        }
        this.#declaredFreqs = n;
        break;
      }
      case "number of noise frequencies":
        break;
      case "reference": {
        const toks = arg === "" ? [] : arg.split(/\s+/);
        this.#reference = toks.map((t) => {
          const v = parseDecimal(t);
          if (v === null || !(v > 0))
            throw new InputFileError(lineNo, `[Reference] impedance '${t}' is not a positive number`);
          return v;
        });
        this.#referenceLine = lineNo;
        break;
      }
      case "matrix format": {
        const m = arg.toLowerCase();
        if (m !== "full" && m !== "lower" && m !== "upper")
          throw new InputFileError(lineNo, `[Matrix Format] must be Full, Lower or Upper, got '${arg}'`);
        this.#matrix = m;
        if (this.#declaredPorts !== null) this.#fixPorts(this.#declaredPorts, lineNo);
        break;
      }
      case "mixed-mode order":
        throw new InputFileError(lineNo, "mixed-mode Touchstone data is not supported; give the single-ended file");
      case "begin information":
        this.#inInformation = true;
        break;
      case "network data":
        if (this.#options === null) throw new InputFileError(lineNo, "[Network Data] before the option line");
        if (this.#declaredPorts === null) throw new InputFileError(lineNo, "[Network Data] before [Number of Ports]");
        if (this.#declaredFreqs === null)
          throw new InputFileError(lineNo, "[Network Data] before [Number of Frequencies]");
        if (this.#declaredPorts === 2 && this.#twoPort === null)
          throw new InputFileError(lineNo, "a 2-port file needs [Two-Port Data Order]");
        this.#inNetwork = true;
        break;
      case "noise data":
        this.#inNetwork = false;
        this.#inNoise = true;
        break;
      case "end":
        this.#ended = true;
        break;
      default:
        throw new InputFileError(lineNo, `unknown keyword [${name}]`);
    }
  }

  /** A line of numbers: network data (or, in version 2, the continuation of `[Reference]`). */
  #dataLine(nums: number[], lineNo: number): void {
    if (this.#version === 2) {
      if (this.#reference !== null && this.#reference.length < (this.#declaredPorts ?? 0) && !this.#inNetwork) {
        this.#reference.push(...nums); // [Reference] continued on the next line
        return;
      }
      if (!this.#inNetwork) throw new InputFileError(lineNo, "data outside [Network Data]");
    }
    if (this.#options === null) this.#options = { ...DEFAULT_OPTIONS };
    const options = this.#options;
    this.#sawData = true;

    // A version 1 file without a port count: the first block tells it.
    if (this.#ports === null && !this.#inferring) {
      if (nums.length % 2 === 0)
        throw new InputFileError(
          lineNo,
          `a frequency line needs an odd number of values (frequency + pairs), got ${nums.length}`,
        );
      this.#inferring = true;
      this.#inferLast = lineNo;
      this.#checkFrequency(nums[0], lineNo);
      this.#current = { line: lineNo, values: nums };
      return;
    }
    if (this.#inferring && this.#current !== null) {
      if (nums.length % 2 === 0) {
        this.#current.values.push(...nums);
        this.#inferLast = lineNo;
        return;
      }
      this.#inferPorts(this.#current, this.#inferLast);
      this.#closeBlock();
    }

    if (this.#current === null) {
      // Version 1 two-port noise parameters: five values at a frequency not above the last one.
      if (this.#version === 1 && this.#ports === 2 && nums.length === 5 && nums[0] * options.unit <= this.#lastFreq) {
        this.#inNoise = true;
        return;
      }
      this.#checkFrequency(nums[0], lineNo);
      this.#current = { line: lineNo, values: [] };
    }
    const current = this.#current;
    current.values.push(...nums);
    const perBlock = this.#perBlock;
    if (current.values.length > perBlock) {
      throw new InputFileError(
        lineNo,
        `too many values: the frequency starting at line ${current.line} needs ${perBlock} values (1 frequency + ${(perBlock - 1) / 2} value pairs for ${this.#ports} ports), this line brings it to ${current.values.length}`,
      );
    }
    if (current.values.length === perBlock) this.#closeBlock();
    if (this.#blocks.length > TOUCHSTONE_MAX_FREQUENCIES)
      throw new InputFileError(lineNo, `more than ${TOUCHSTONE_MAX_FREQUENCIES} frequencies`);
  }

  #closeBlock(): void {
    const current = this.#current;
    if (current === null) return;
    if (current.values.length !== this.#perBlock) {
      throw new InputFileError(
        current.line,
        `the frequency starting here has ${current.values.length} values; ${this.#perBlock} are expected (1 frequency + ${(this.#perBlock - 1) / 2} value pairs for ${this.#ports} ports)`,
      );
    }
    this.#blocks.push(current);
    this.#current = null;
  }

  #fixPorts(n: number, line: number): void {
    if (n < 1 || n > TOUCHSTONE_MAX_PORTS)
      throw new InputFileError(line, `port count ${n} is outside 1…${TOUCHSTONE_MAX_PORTS}`);
    this.#ports = n;
    const pairs = this.#matrix === "full" ? n * n : (n * (n + 1)) / 2;
    this.#perBlock = 1 + 2 * pairs;
  }

  #inferPorts(first: Block, lastOfBlock: number): void {
    const pairs = (first.values.length - 1) / 2;
    const n = Math.round(Math.sqrt(pairs));
    if (n * n !== pairs) {
      const where = lastOfBlock > first.line ? `lines ${first.line}–${lastOfBlock}` : `line ${first.line}`;
      throw new InputFileError(
        first.line,
        `cannot tell the port count: the first frequency (${where}) has ${pairs} value pairs, and an N-port has N² (1, 4, 9, 16, …)`,
      );
    }
    this.#inferring = false;
    this.#fixPorts(n, first.line);
  }

  #checkFrequency(f: number, line: number): void {
    if (f < 0) throw new InputFileError(line, `frequency ${f} is negative`);
    const hz = f * (this.#options?.unit ?? 1e9);
    if (!(hz > this.#lastFreq)) {
      throw new InputFileError(line, `frequencies must ascend: ${hz} Hz follows ${this.#lastFreq} Hz`);
    }
    this.#lastFreq = hz;
  }
}
