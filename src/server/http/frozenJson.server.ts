// Answers that never change once written (a finished run's detail: its inputs and result are
// stored once), serialized and compressed once per process and then served as bytes: a run's
// result is megabytes of JSON, and parsing, serializing and compressing it again for every request
// is what kept its detail from answering under load.
import { createHash } from "node:crypto";
import { promisify } from "node:util";
import { brotliCompress, constants, gzip } from "node:zlib";

const brotliAsync = promisify(brotliCompress);
const gzipAsync = promisify(gzip);

/** One answer, in the encodings a client may take. */
interface Frozen {
  readonly etag: string;
  readonly identity: Buffer;
  readonly br: Buffer;
  readonly gzip: Buffer;
}

/** Bytes the cache may hold (all three encodings counted); the least recently used go first. */
const CACHE_BYTES = 64 * 1024 * 1024;

const cache = new Map<string, Frozen>();
let held = 0;

const sizeOf = (f: Frozen) => f.identity.length + f.br.length + f.gzip.length;

function remember(key: string, f: Frozen): void {
  const size = sizeOf(f);
  if (size > CACHE_BYTES / 4) return;
  while (held + size > CACHE_BYTES && cache.size > 0) {
    const [oldest, value] = cache.entries().next().value as [string, Frozen];
    cache.delete(oldest);
    held -= sizeOf(value);
  }
  cache.set(key, f);
  held += size;
}

/** Serialized once, compressed once (off the event loop, in libuv's threads) and harder than per-request compression can afford. */
async function freeze(value: unknown): Promise<Frozen> {
  const identity = Buffer.from(JSON.stringify(value));
  const [br, gz] = await Promise.all([
    brotliAsync(identity, {
      params: { [constants.BROTLI_PARAM_QUALITY]: 9, [constants.BROTLI_PARAM_SIZE_HINT]: identity.length },
    }),
    gzipAsync(identity, { level: 9 }),
  ]);
  return {
    etag: `"${createHash("sha256").update(identity).digest("base64url").slice(0, 27)}"`,
    identity,
    br,
    gzip: gz,
  };
}

/** Answers being built, so that many requests for one uncached answer build it once. */
const building = new Map<string, Promise<Frozen>>();

/** The encoding to send: brotli, then gzip, when the client accepts it (q > 0). */
function encodingFor(acceptEncoding: string | null): "br" | "gzip" | "identity" {
  const accepted = new Set<string>();
  for (const part of (acceptEncoding ?? "").split(",")) {
    const [name, ...params] = part.trim().toLowerCase().split(";");
    const q = params.map((p) => p.trim()).find((p) => p.startsWith("q="));
    if (name && !(q && Number(q.slice(2)) === 0)) accepted.add(name);
  }
  if (accepted.has("br")) return "br";
  if (accepted.has("gzip")) return "gzip";
  return "identity";
}

/**
 * A JSON response for an answer that never changes once `key` is written: built by `build` (and
 * serialized and compressed) the first time, then served from memory with an ETag (304 when the
 * client has it). Forget nothing by hand: keys name immutable things.
 *
 * @param request - the request (its Accept-Encoding and If-None-Match).
 * @param key - what the answer is (e.g. "run:12"), unique across callers.
 * @param build - computes the answer when it is not cached.
 */
export async function frozenJsonResponse(
  request: Request,
  key: string,
  build: () => Promise<unknown>,
): Promise<Response> {
  let f = cache.get(key);
  if (f) {
    // Most recently used last.
    cache.delete(key);
    cache.set(key, f);
  } else {
    let pending = building.get(key);
    if (!pending) {
      pending = build()
        .then(freeze)
        .then((done) => {
          remember(key, done);
          return done;
        })
        .finally(() => building.delete(key));
      building.set(key, pending);
    }
    f = await pending;
  }
  const headers: Record<string, string> = {
    "content-type": "application/json",
    etag: f.etag,
    vary: "accept-encoding",
    "cache-control": "private, no-cache",
  };
  if (request.headers.get("if-none-match") === f.etag) return new Response(null, { status: 304, headers });
  const encoding = encodingFor(request.headers.get("accept-encoding"));
  const body = f[encoding];
  if (encoding !== "identity") headers["content-encoding"] = encoding;
  headers["content-length"] = String(body.length);
  // A copy of the bytes for this response (a few hundred kilobytes compressed): the cached ones stay intact.
  return new Response(new Uint8Array(body), { status: 200, headers });
}
