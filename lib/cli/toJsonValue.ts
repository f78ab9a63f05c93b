// Response values to plain JSON: typed arrays become arrays; a non-finite number is a bug, not output.

/**
 * A deep copy of `value` ready for `JSON.stringify`: typed arrays become arrays, `undefined`
 * fields are dropped. Throws Error naming the field when a number is NaN or ±Infinity, so the
 * command line never prints them (JSON has no such numbers).
 */
export function toJsonValue(value: unknown, path = ""): unknown {
  if (typeof value === "number") {
    if (!Number.isFinite(value)) throw new Error(`the response field '${path || "(root)"}' is ${value}`);
    return value;
  }
  if (value === null || typeof value === "string" || typeof value === "boolean") return value;
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) {
    // Every view but DataView (excluded above) is a typed array, but TypeScript's ArrayBufferView does not say it is indexable.
    return toJsonValue(Array.from(value as unknown as ArrayLike<number>), path);
  }
  if (Array.isArray(value)) return value.map((v, i) => toJsonValue(v, path ? `${path}.${i}` : String(i)));
  if (typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value as Record<string, unknown>)) {
      if (v !== undefined) out[k] = toJsonValue(v, path ? `${path}.${k}` : k);
    }
    return out;
  }
  throw new Error(`the response field '${path || "(root)"}' has type ${typeof value}`);
}
