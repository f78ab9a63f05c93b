// Shared argument checks of the symbol-spaced solvers.
import type { Cursors } from "../pulse/cursorsAt.ts";

/** Throws RangeError unless `cursors` holds finite values with `main` inside, and tap counts are sane. */
export function checkCursorWindow(cursors: Cursors, pre: number, post: number): void {
  if (cursors === null || typeof cursors !== "object") throw new TypeError("cursors must be { h, main }");
  const { h, main } = cursors;
  if (!(h instanceof Float64Array) || h.length === 0)
    throw new RangeError("cursors.h must be a non-empty Float64Array");
  for (let i = 0; i < h.length; i++) {
    if (!Number.isFinite(h[i])) throw new RangeError(`cursors.h[${i}] must be finite, got ${h[i]}`);
  }
  if (!Number.isInteger(main) || main < 0 || main >= h.length) {
    throw new RangeError(`main must be an integer 0…${h.length - 1} (an index into the cursors), got ${String(main)}`);
  }
  if (!Number.isInteger(pre) || pre < 0 || pre > 1024)
    throw new RangeError(`pre must be an integer 0…1024, got ${String(pre)}`);
  if (!Number.isInteger(post) || post < 0 || post > 1024) {
    throw new RangeError(`post must be an integer 0…1024, got ${String(post)}`);
  }
}
