// File downloads: the body with its media type, an attachment disposition that keeps any file name
// (an ASCII-safe `filename` plus the exact name as RFC 6266's `filename*`), and the caching rule.
export interface Download {
  filename: string;
  contentType: string;
  body: string | Uint8Array;
  /** `no-store` for generated files, `private, max-age=0` for stored ones. */
  cacheControl: string;
  /** More headers, e.g. a checksum. */
  headers?: Record<string, string>;
}

/** RFC 5987's attr-char encoding: what encodeURIComponent leaves alone, less ' ( ) and *. */
const rfc5987 = (s: string) =>
  encodeURIComponent(s).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);

/**
 * `attachment; filename="…"; filename*=UTF-8''…` (RFC 6266): the quoted name in printable ASCII
 * only (a header cannot carry other characters, and a name like 通道.s2p must not break the answer),
 * and the exact name, percent-encoded, for the clients that read filename*.
 */
export function attachmentDisposition(filename: string): string {
  const ascii = filename.normalize("NFKD").replace(/[^\x20-\x7e]|["\\]/g, "_") || "download";
  return `attachment; filename="${ascii}"; filename*=UTF-8''${rfc5987(filename)}`;
}

/** The response that downloads a file. */
export function downloadResponse(d: Download): Response {
  const body = typeof d.body === "string" ? d.body : new Uint8Array(d.body);
  return new Response(body, {
    status: 200,
    headers: {
      "content-type": d.contentType,
      ...(typeof body === "string" ? {} : { "content-length": String(body.byteLength) }),
      "content-disposition": attachmentDisposition(d.filename),
      // Browsers must take the declared type, never guess one from the bytes (an uploaded file may hold HTML).
      "x-content-type-options": "nosniff",
      "cache-control": d.cacheControl,
      ...d.headers,
    },
  });
}
