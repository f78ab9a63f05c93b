// The shape of one command of the engine's command line: its request schema and what it does.
import type { z } from "zod";
import { CliInputError } from "./CliInputError.ts";
import { libErrorPath } from "./libErrorPath.ts";

/** A command as the dispatcher sees it. */
export interface Command {
  /** The name typed after `npm run --silent engine --`. */
  readonly name: string;
  /** The request schema (zod); extra fields are allowed and ignored. */
  readonly schema: z.ZodType;
  /**
   * Runs a request that passed the schema and returns the response object (typed arrays allowed).
   * Throws CliInputError for input the engine refuses.
   */
  run(request: unknown): unknown;
}

/** How engine errors map to request fields (see {@link libErrorPath}). */
export interface ErrorPaths {
  /** Engine parameter names → request paths, e.g. `{ "cursors.h": "cursors" }`. */
  readonly aliases?: Readonly<Record<string, string>>;
  /** Path when the message names no request field. */
  readonly fallback: string;
}

/**
 * Ties a schema to the function that serves its validated requests. A RangeError the engine
 * throws while running becomes a CliInputError at the request field its message names.
 */
export function defineCommand<S extends z.ZodType>(spec: {
  name: string;
  schema: S;
  errorPaths: ErrorPaths;
  run: (request: z.output<S>) => unknown;
}): Command {
  return {
    name: spec.name,
    schema: spec.schema,
    run(request) {
      try {
        return spec.run(request as z.output<S>);
      } catch (e) {
        if (e instanceof RangeError) {
          const path = libErrorPath(
            e.message,
            request as object,
            spec.errorPaths.aliases ?? {},
            spec.errorPaths.fallback,
          );
          throw new CliInputError(e.message, path);
        }
        throw e;
      }
    },
  };
}
