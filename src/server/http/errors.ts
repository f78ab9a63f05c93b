// The one error shape of the API, `{ error: { message, path? } }`, and the statuses api.md lists.
import { z } from "zod";
import { logError } from "./logError";

export type ErrorStatus = 400 | 401 | 403 | 404 | 409 | 413 | 415 | 422 | 429 | 500 | 503;

/** An error a person can act on; thrown by services and turned into a response by `errorResponse`. */
export class ApiError extends Error {
  constructor(
    readonly status: ErrorStatus,
    message: string,
    readonly path?: string,
  ) {
    super(message);
    this.name = "ApiError";
  }
}

export const badRequest = (message: string, path?: string) => new ApiError(400, message, path);
export const notFound = (what: string) => new ApiError(404, `${what} was not found.`);
export const forbidden = (message = "Your role may not do this.") => new ApiError(403, message);
export const conflict = (message: string) => new ApiError(409, message);
export const unprocessable = (message: string, path?: string) => new ApiError(422, message, path);

const jsonHeaders = { "content-type": "application/json; charset=utf-8", "cache-control": "no-store" };

export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), { status, headers: { ...jsonHeaders, ...headers } });
}

export function errorBody(message: string, path?: string) {
  return { error: path ? { message, path } : { message } };
}

/** Turns a zod issue list into the first issue's message, with its field path. */
export function zodToApiError(error: z.ZodError, status: ErrorStatus = 400): ApiError {
  const issue = error.issues[0];
  const path = issue?.path.length ? issue.path.join(".") : undefined;
  const message = issue ? (path ? `${path}: ${issue.message}` : issue.message) : "Invalid request.";
  return new ApiError(status, message, path);
}

/** Any thrown value → a JSON error response; unexpected errors are logged, never shown. */
export function errorResponse(e: unknown): Response {
  if (e instanceof ApiError) return json(errorBody(e.message, e.path), e.status);
  if (e instanceof z.ZodError) {
    const a = zodToApiError(e);
    return json(errorBody(a.message, a.path), a.status);
  }
  logError("unexpected error", e);
  return json(
    errorBody("Something went wrong on the server; the request changed nothing. Try again, or tell an admin."),
    500,
  );
}
