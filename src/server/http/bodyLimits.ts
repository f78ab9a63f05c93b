// How large a body each route may send: uploads up to the file limit plus the multipart envelope,
// everything else (JSON, the auth routes) up to JSON_BODY_LIMIT. The middleware refuses a larger
// declared Content-Length before anything is read; the readers enforce the same limits while reading.
import { MAX_UPLOAD_BYTES, formatBytes } from "@/features/channels/channels";
import { ApiError } from "./errors";
import { bodyTooLarge, JSON_BODY_LIMIT } from "./body";

/** Room for the multipart envelope around an uploaded file. */
const MULTIPART_OVERHEAD = 256 * 1024;
/** Largest multipart body of a channel upload. */
export const UPLOAD_BODY_LIMIT = MAX_UPLOAD_BYTES + MULTIPART_OVERHEAD;

const UPLOAD_ROUTES = /^\/api\/v1\/channels(\/preview)?\/?$/;

/** The 413 of an upload above the file limit. */
export const uploadTooLarge = () =>
  new ApiError(
    413,
    `The file is larger than the ${formatBytes(MAX_UPLOAD_BYTES)} limit; trim the frequency range or the record length and upload again.`,
    "file",
  );

/** The 413 to answer before reading, when the declared body is larger than the route takes; else null. */
export function refuseDeclaredBody(method: string, pathname: string, contentLength: string | null): ApiError | null {
  const declared = Number(contentLength ?? 0);
  if (!(declared > 0)) return null;
  const upload = method === "POST" && UPLOAD_ROUTES.test(pathname);
  const limit = upload ? UPLOAD_BODY_LIMIT : JSON_BODY_LIMIT;
  if (declared <= limit) return null;
  return upload ? uploadTooLarge() : bodyTooLarge(limit);
}
