// The error for a malformed uploaded file: it names the line and what is wrong there.

/**
 * A file (CSV, Touchstone) that cannot be read. `message` starts with `line N:` when a line is
 * to blame; `line` is that 1-based line number, or 0 when the problem concerns the whole file.
 */
export class InputFileError extends RangeError {
  readonly line: number;

  constructor(line: number, problem: string) {
    super(line > 0 ? `line ${line}: ${problem}` : problem);
    this.name = "InputFileError";
    this.line = line;
  }
}
