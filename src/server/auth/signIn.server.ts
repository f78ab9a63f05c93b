// The auth library's routes behind guards of Tapwright's own: every body capped at JSON_BODY_LIMIT
// before it is buffered; failed sign-ins counted per account (from whatever address they come), with
// a growing wait after the fifth; and a deactivated person refused at sign-in.
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { db } from "@/server/db.server";
import { users } from "@/db/schema";
import { bodyTooLarge, JSON_BODY_LIMIT, readBodyLimited } from "@/server/http/body";
import { ApiError, errorBody, json } from "@/server/http/errors";
import { auth, CLIENT_IP_HEADER } from "./auth.server";
import { accountWait_s, recordSignIn } from "./attempts.server";

/** The e-mail a sign-in body names, lower-cased, or null when the body does not name one. */
function emailOf(body: Uint8Array): string | null {
  try {
    const email = (JSON.parse(new TextDecoder().decode(body)) as { email?: unknown }).email;
    return typeof email === "string" && email.length <= 254 ? email.trim().toLowerCase() : null;
  } catch {
    return null;
  }
}

/** Handles /api/auth/*: the client's address is the socket's (the server process settles it). */
export async function authRoute(request: Request, clientAddress: string): Promise<Response> {
  const headers = new Headers(request.headers);
  headers.set(CLIENT_IP_HEADER, clientAddress);
  let body: Uint8Array<ArrayBuffer> | undefined;
  if (request.method !== "GET" && request.method !== "HEAD") {
    try {
      body = await readBodyLimited(request, JSON_BODY_LIMIT, () => bodyTooLarge(JSON_BODY_LIMIT));
    } catch (e) {
      if (e instanceof ApiError) return json(errorBody(e.message), e.status);
      throw e;
    }
  }
  const signIn = request.method === "POST" && new URL(request.url).pathname.endsWith("/sign-in/email");
  const email = signIn && body ? emailOf(body) : null;
  // Keyed by a hash: the attempts table need not hold people's addresses.
  const account = email ? createHash("sha256").update(email).digest("hex") : null;
  if (account) {
    const wait_s = await accountWait_s(account);
    if (wait_s > 0) {
      return json(errorBody(`Too many failed sign-ins for this account; wait ${wait_s} s and try again.`), 429, {
        "retry-after": String(wait_s),
      });
    }
    const [person] = await db.select({ deactivatedAt: users.deactivatedAt }).from(users).where(eq(users.email, email!));
    if (person?.deactivatedAt)
      return json(errorBody("This account was deactivated by an admin; ask them if you need it back."), 403);
  }
  const res = await auth.handler(new Request(request.url, { method: request.method, headers, body }));
  if (account && (res.status === 200 || res.status === 401)) await recordSignIn(account, res.status === 200);
  return res;
}
