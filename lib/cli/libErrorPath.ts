// Which request field an engine error is about, read from the parameter name its message starts with.

/**
 * The request path an engine RangeError concerns. Engine messages start with the parameter they
 * refuse (`mu = 5 makes…`, `pairs.outN must be…`, `cursors.h[3] must be finite`). When that leading
 * name, mapped through `aliases`, is a field of the request, it is the path; otherwise `fallback`.
 *
 * @param message - the engine error's message.
 * @param request - the validated request (its top-level keys are candidate fields).
 * @param aliases - engine parameter names → request paths (e.g. `{ "cursors.h": "cursors" }`).
 * @param fallback - path when nothing matches.
 */
export function libErrorPath(
  message: string,
  request: object,
  aliases: Readonly<Record<string, string>>,
  fallback: string,
): string {
  const m = /^([A-Za-z_]\w*(?:\.[A-Za-z_]\w*)*)((?:\[\d+\])*)/.exec(message);
  if (m === null) return fallback;
  const name = m[1];
  const index = m[2].replace(/\[(\d+)\]/g, ".$1");
  for (const [from, to] of Object.entries(aliases)) {
    if (name === from || name.startsWith(`${from}.`)) return to + name.slice(from.length) + index;
  }
  if (name.split(".")[0] in request) return name + index;
  return fallback;
}
