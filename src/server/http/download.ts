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

/** `attachment; filename="…"; filename*=UTF-8''…`. */
export function attachmentDisposition(filename: string): string {
  const safe = filename.replace(/["\\\r\n]/g, "_");
  return `attachment; filename="${safe}"; filename*=UTF-8''${encodeURIComponent(filename)}`;
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
      "cache-control": d.cacheControl,
      ...d.headers,
    },
  });
}
