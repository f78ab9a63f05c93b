// Touchstone reader (versions 1.x and 2.0): option line, keywords, comments, any port count. The
// line-by-line state lives in TouchstoneReader; this is the entry point.
import type { NetworkData } from "./networkData.ts";
import { TOUCHSTONE_MAX_PORTS, TouchstoneReader } from "./touchstoneReader.ts";

/** Options of {@link parseTouchstone}. */
export interface TouchstoneOptions {
  /**
   * Port count from the file name's extension (`.s2p` → 2). Version 1 files do not state it;
   * without it the reader infers it from the first frequency's data (frequency lines have an odd
   * number of values, continuation lines an even number).
   */
  readonly ports?: number;
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
  if (
    options.ports !== undefined &&
    (!Number.isInteger(options.ports) || options.ports < 1 || options.ports > TOUCHSTONE_MAX_PORTS)
  ) {
    throw new RangeError(`ports must be an integer 1…${TOUCHSTONE_MAX_PORTS}, got ${String(options.ports)}`);
  }
  const lines = text.replace(/^\ufeff/, "").split(/\r\n|\r|\n/);
  const reader = new TouchstoneReader(options.ports);
  let lastLine = 0;
  for (let li = 0; li < lines.length && !reader.ended; li++) {
    const bang = lines[li].indexOf("!");
    const content = (bang >= 0 ? lines[li].slice(0, bang) : lines[li]).trim();
    if (content === "") continue;
    lastLine = li + 1;
    reader.read(content, lastLine);
  }
  return reader.finish(lastLine);
}
