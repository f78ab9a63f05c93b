// What goes to the server's error log: enough to find the fault, never the request's secrets. URLs
// lose their query strings (invitation and sign-in links carry secrets there), and database errors
// lose their SQL parameters (mail bodies, password hashes, token hashes travel in them).

const QUERY_STRING = /((?:https?:\/\/[^\s?#"']+)|(?:\/[\w.~%!$&'()*+,;=:@/-]*))\?[^\s"'<>]*/g;

/** A line of text with every URL's query string replaced by `?…`. */
export function withoutQueryStrings(text: string): string {
  return text.replace(QUERY_STRING, "$1?…");
}

/** Drizzle's "Failed query: … params: …" and mysql2's `sql` carry the values; keep the statement's shape only. */
function withoutParams(text: string): string {
  return text.replace(/\bparams:[\s\S]*$/m, "params: [left out]");
}

/** One error, as a single line safe to log: its name, message and code, its cause's, and where it was thrown. */
export function describeError(e: unknown): string {
  const parts: string[] = [];
  let err: unknown = e;
  for (let depth = 0; err && depth < 4; depth++) {
    if (err instanceof Error) {
      const code = (err as { code?: unknown }).code;
      parts.push(`${err.name}${code ? ` (${String(code)})` : ""}: ${withoutParams(err.message)}`);
      err = (err as { cause?: unknown }).cause;
    } else {
      parts.push(String(err));
      break;
    }
  }
  const at = e instanceof Error ? e.stack?.split("\n").find((l) => l.trim().startsWith("at ")) : undefined;
  return withoutQueryStrings(parts.join(" ← ") + (at ? ` ${at.trim()}` : "")).replace(/\s*\n\s*/g, " ");
}

/** Logs an unexpected error under a context (e.g. "job queue"), redacted as above. */
export function logError(context: string, e: unknown): void {
  console.error(`[tapwright] ${context}: ${describeError(e)}`);
}
