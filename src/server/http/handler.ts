// Thin endpoints: parse → authorize (done by the middleware's rule table) → call a service → answer.
import type { APIContext } from "astro";
import type { z } from "zod";
import { errorResponse, json, zodToApiError } from "./errors";
import { bodyTooLarge, JSON_BODY_LIMIT, readJsonLimited } from "./body";

type Handler = (ctx: APIContext) => Promise<Response | unknown>;

/** Wraps an endpoint so that every error becomes the API's error shape. Plain values become 200 JSON. */
export function endpoint(fn: Handler) {
  return async (ctx: APIContext): Promise<Response> => {
    try {
      const out = await fn(ctx);
      return out instanceof Response ? out : json(out);
    } catch (e) {
      return errorResponse(e);
    }
  };
}

/** Reads (at most JSON_BODY_LIMIT bytes, else 413) and validates a JSON body. */
export async function readJson<T extends z.ZodType>(request: Request, schema: T): Promise<z.infer<T>> {
  const raw = await readJsonLimited(
    request,
    JSON_BODY_LIMIT,
    () => bodyTooLarge(JSON_BODY_LIMIT),
    "The request body must be JSON (Content-Type: application/json).",
  );
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw zodToApiError(parsed.error);
  return parsed.data;
}

/** Validates path or query parameters. */
export function readParams<T extends z.ZodType>(params: unknown, schema: T): z.infer<T> {
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw zodToApiError(parsed.error);
  return parsed.data;
}

/** The signed-in user of a request; the middleware guarantees it on every non-public route. */
export function currentUser(ctx: APIContext) {
  const user = ctx.locals.user;
  if (!user) throw new Error("currentUser called on a public route");
  return user;
}
