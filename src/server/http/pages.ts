// What detail pages share: loading their subject, and "not found" as one page with a 404.
import { ApiError } from "./errors";

/** A positive integer id from a route parameter, or null when it is not one. */
export function idParam(value: string | undefined): number | null {
  const id = Number(value);
  return Number.isInteger(id) && id > 0 ? id : null;
}

/** Runs a page's loader; null when the service answers 404 (other errors propagate). */
export async function loadOrNull<T>(load: () => Promise<T>): Promise<T | null> {
  try {
    return await load();
  } catch (e) {
    if (e instanceof ApiError && e.status === 404) return null;
    throw e;
  }
}

/**
 * Where sign-in may send a person next: `next` resolved against this site's origin, kept only when
 * it stays on that origin and names a path ("/\\evil.example" and "//evil.example" resolve to another
 * host and are dropped); otherwise the overview.
 */
export function safeNextPath(next: string | null, origin: string): string {
  if (!next?.startsWith("/")) return "/";
  try {
    const url = new URL(next, origin);
    return url.origin === origin ? `${url.pathname}${url.search}${url.hash}` : "/";
  } catch {
    return "/";
  }
}
