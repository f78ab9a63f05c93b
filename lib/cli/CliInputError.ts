// Bad input to the command line: a message a person can act on and the request field it concerns.

/** Thrown for a request the engine refuses; the command line answers exit 2 with `{ error: { message, path } }`. */
export class CliInputError extends Error {
  /** Dotted path of the request field at fault (`source.text`, `cursors.3`), "" for the whole request. */
  readonly path: string;

  constructor(message: string, path: string) {
    super(message);
    this.name = "CliInputError";
    this.path = path;
  }
}
