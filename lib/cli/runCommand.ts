// The command line as a pure function: command name and request text in, exit code and JSON text out.
import { z } from "zod";
import { formatPath } from "../contract/common.ts";
import { CliInputError } from "./CliInputError.ts";
import { commands } from "./commands/index.ts";
import { toJsonValue } from "./toJsonValue.ts";

/** What the process prints and how it exits. */
export interface CliResult {
  /** 0 answered, 2 bad input, 1 an internal fault. */
  readonly exitCode: 0 | 1 | 2;
  /** One JSON document: the response, or `{ "error": { "message", "path" } }`. */
  readonly text: string;
}

const fail = (exitCode: 1 | 2, message: string, path: string): CliResult => ({
  exitCode,
  text: JSON.stringify({ error: { message, path } }),
});

/**
 * Serves one request: finds the command, parses the JSON, validates it with the command's zod
 * schema, runs it and serializes the response. Bad input of any kind (unknown command, invalid
 * JSON, NaN/Infinity, wrong types, out-of-range values or indices, malformed files) gives exit 2
 * and an error naming the field; nothing ever prints a stack trace.
 *
 * @param name - the command (first argument), possibly missing.
 * @param input - the request text read from standard input.
 */
export function runCommand(name: string | undefined, input: string): CliResult {
  const known = commands.map((c) => c.name).join(", ");
  if (name === undefined || name === "") return fail(2, `give a command: one of ${known}`, "command");
  const command = commands.find((c) => c.name === name);
  if (command === undefined) return fail(2, `unknown command '${name}'; known commands: ${known}`, "command");

  let json: unknown;
  try {
    json = JSON.parse(input);
  } catch (e) {
    const why = input.trim() === "" ? "the request is empty" : (e as Error).message;
    return fail(2, `the request is not valid JSON: ${why}`, "");
  }
  let request: unknown;
  try {
    const parsed = command.schema.safeParse(json);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const path = formatPath(issue.path);
      const leaf = path.split(".").pop() ?? "";
      const named = path === "" || issue.message.startsWith(leaf);
      return fail(2, named ? issue.message : `${path}: ${issue.message}`, path);
    }
    request = parsed.data;
  } catch (e) {
    // Conversions inside a schema (e.g. building a Pulse) throw the engine's RangeError.
    if (e instanceof RangeError) return fail(2, e.message, "");
    throw e;
  }
  try {
    return { exitCode: 0, text: JSON.stringify(toJsonValue(command.run(request))) };
  } catch (e) {
    if (e instanceof CliInputError) return fail(2, e.message, e.path);
    if (e instanceof RangeError || e instanceof z.ZodError) return fail(2, e.message, "");
    return fail(1, `internal error: ${e instanceof Error ? e.message : String(e)}`, "");
  }
}
