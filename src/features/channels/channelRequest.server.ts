// Reads POST /api/v1/channels (and the preview) off the request: a multipart upload with the file,
// the fields of `uploadFields` and any aggressors' own files (aggressor0 … aggressor7), or JSON for
// a synthetic channel. The routes call this; the
// services in channels.server.ts take its result and never see the request.
import { ApiError, zodToApiError } from "@/server/http/errors";
import { bodyTooLarge, JSON_BODY_LIMIT, readJsonLimited, readMultipart, type UploadedFile } from "@/server/http/body";
import { UPLOAD_BODY_LIMIT, uploadTooLarge } from "@/server/http/bodyLimits";
import { MAX_UPLOAD_BYTES, syntheticRequest, uploadFields, type SyntheticRequest, type UploadFields } from "./channels";
import { AGGRESSOR_FILE_FIELD } from "./aggressors";

/** A parsed channel request: a file upload (multipart) or a synthetic channel (JSON). */
export type ChannelRequest =
  | { source: "file"; fields: UploadFields; file: UploadedFile; aggressorFiles: Record<string, UploadedFile> }
  | { source: "synthetic"; body: SyntheticRequest };

/**
 * The channel request in `request`: 413 above the size limit, 415 for another content type, 400
 * for missing or invalid fields. `fileOnly` (the preview) accepts uploads only, named after the file.
 */
export async function readChannelRequest(request: Request, { fileOnly = false } = {}): Promise<ChannelRequest> {
  const type = request.headers.get("content-type") ?? "";
  if (!fileOnly && type.startsWith("application/json")) {
    const raw = await readJsonLimited(
      request,
      JSON_BODY_LIMIT,
      () => bodyTooLarge(JSON_BODY_LIMIT),
      "The request body must be JSON: { name, bitRate_bps, lossModel: { lossAtNyquist_dB } }.",
    );
    const parsed = syntheticRequest.safeParse(raw);
    if (!parsed.success) throw zodToApiError(parsed.error);
    return { source: "synthetic", body: parsed.data };
  }
  if (!type.startsWith("multipart/form-data")) {
    throw new ApiError(
      415,
      fileOnly
        ? "Send the file as multipart/form-data (fields file, name, bitRate_bps…)."
        : "Send a file as multipart/form-data (fields file, name, bitRate_bps…) or a synthetic channel as JSON.",
    );
  }
  const { file, fields, extras } = await readMultipart(request, {
    limit: UPLOAD_BODY_LIMIT,
    fileField: "file",
    fileLimit: MAX_UPLOAD_BYTES,
    tooLarge: uploadTooLarge,
    extraFiles: AGGRESSOR_FILE_FIELD,
  });
  if (fileOnly && !fields.name) fields.name = file.filename;
  const parsed = uploadFields.safeParse(fields);
  if (!parsed.success) throw zodToApiError(parsed.error);
  return { source: "file", fields: parsed.data, file, aggressorFiles: extras };
}
