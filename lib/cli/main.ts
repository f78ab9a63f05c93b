// Entry of `npm run --silent engine -- <command>`: reads the request from stdin, prints one JSON response.
import process from "node:process";
import { runCommand } from "./runCommand.ts";

// A reader that stops early (`… | head`) closes the pipe: nothing is wrong with the answer, so
// end quietly instead of printing a stack trace.
process.stdout.on("error", (e: NodeJS.ErrnoException) => {
  if (e.code === "EPIPE") process.exit(process.exitCode ?? 0);
  throw e;
});

async function serve(): Promise<void> {
  const chunks: Uint8Array[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Uint8Array);
  const result = runCommand(process.argv[2], Buffer.concat(chunks).toString("utf8"));
  process.stdout.write(`${result.text}\n`);
  process.exitCode = result.exitCode;
}

/** Settles once the response is written (the launcher then saves the code it compiled). */
export const served: Promise<void> = serve();
