// Request bodies with a size limit: the raw bytes, JSON, or a multipart form. Above the limit the
// rest is read and dropped (so the client gets the answer instead of a reset connection) and the
// caller's 413 is thrown.
import { ApiError, badRequest } from "./errors";

/** Largest JSON body any route takes (budgets, runs, tables, sign-in…): 64 KiB. */
export const JSON_BODY_LIMIT = 64 * 1024;

/** The 413 for a body above `limit` bytes, in words a person can act on. */
export function bodyTooLarge(limit: number, what = "The request body"): ApiError {
  const size = limit >= 1024 * 1024 ? `${Math.round(limit / 1024 / 1024)} MiB` : `${Math.round(limit / 1024)} KiB`;
  return new ApiError(413, `${what} is larger than the ${size} this route takes; send less.`);
}

/** Reads a request body up to `limit` bytes; throws `tooLarge()` beyond it. */
export async function readBodyLimited(
  request: Request,
  limit: number,
  tooLarge: () => ApiError,
): Promise<Uint8Array<ArrayBuffer>> {
  const declared = Number(request.headers.get("content-length") ?? NaN);
  const reader = request.body?.getReader();
  if (!reader) return new Uint8Array();
  const chunks: Uint8Array[] = [];
  let total = 0;
  let over = Number.isFinite(declared) && declared > limit;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.length;
    if (total > limit) over = true;
    if (!over) chunks.push(value);
  }
  if (over) throw tooLarge();
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

/** A JSON body of at most `limit` bytes, not yet validated; 400 with `hint` when it is not JSON. */
export async function readJsonLimited(
  request: Request,
  limit: number,
  tooLarge: () => ApiError,
  hint: string,
): Promise<unknown> {
  const body = await readBodyLimited(request, limit, tooLarge);
  try {
    return JSON.parse(new TextDecoder().decode(body));
  } catch {
    throw badRequest(hint);
  }
}

/** A file part of a multipart form. */
export interface UploadedFile {
  filename: string;
  contentType: string;
  bytes: Uint8Array;
}

/**
 * A multipart/form-data body of at most `limit` bytes: the file in `fileField` (at most `fileLimit`
 * bytes), the files of fields matching `extraFiles` (all files together at most `fileLimit`), and the
 * non-empty text fields. 400 when the body cannot be read or the file is missing.
 */
export async function readMultipart(
  request: Request,
  o: { limit: number; fileField: string; fileLimit: number; tooLarge: () => ApiError; extraFiles?: RegExp },
): Promise<{ file: UploadedFile; fields: Record<string, string>; extras: Record<string, UploadedFile> }> {
  const body = await readBodyLimited(request, o.limit, o.tooLarge);
  let form: FormData;
  try {
    form = await new Response(body, {
      headers: { "content-type": request.headers.get("content-type") ?? "" },
    }).formData();
  } catch {
    throw badRequest("The multipart body cannot be read; send it as a browser or curl -F would.");
  }
  const file = form.get(o.fileField);
  if (!(file instanceof File)) throw badRequest(`Attach the file in the field '${o.fileField}'.`, o.fileField);
  if (file.size > o.fileLimit) throw o.tooLarge();
  const fields: Record<string, string> = {};
  const extras: Record<string, UploadedFile> = {};
  let total = file.size;
  for (const [k, v] of form.entries()) {
    if (typeof v === "string") {
      if (v !== "") fields[k] = v;
    } else if (k !== o.fileField && o.extraFiles?.test(k)) {
      total += v.size;
      if (total > o.fileLimit) throw o.tooLarge();
      extras[k] = await uploaded(v);
    }
  }
  return { file: await uploaded(file), fields, extras };
}

/**
 * A file's bytes, streamed into a SharedArrayBuffer: the engine worker that derives it reads the
 * same memory, so the upload is held once (no copy per thread).
 */
async function uploaded(file: File): Promise<UploadedFile> {
  const bytes = new Uint8Array(new SharedArrayBuffer(file.size));
  let at = 0;
  for await (const chunk of file.stream()) {
    bytes.set(chunk, at);
    at += chunk.length;
  }
  return { filename: file.name || "upload", contentType: file.type || "application/octet-stream", bytes };
}
