// Loads the signed-in person (session cookie, or API token where the rule allows one) and applies
// the one table of access rules in src/server/auth/rules.ts to every page and API route.
import { defineMiddleware } from "astro:middleware";
import { auth } from "./server/auth/auth.server";
import { allows, ruleFor } from "./server/auth/rules";
import type { SessionUser } from "./server/auth/sessionUser";
import { userForToken } from "./features/tokens/tokens.server";
import { errorBody, json } from "./server/http/errors";
import { refuseDeclaredBody } from "./server/http/bodyLimits";
import { startBackgroundWork } from "./server/background.server";

async function sessionUser(headers: Headers): Promise<SessionUser | null> {
  const s = await auth.api.getSession({ headers });
  if (!s) return null;
  const u = s.user as typeof s.user & { role: SessionUser["role"] };
  return { id: u.id, email: u.email, name: u.name, role: u.role };
}

export const onRequest = defineMiddleware(async (ctx, next) => {
  startBackgroundWork();
  const { pathname } = ctx.url;
  const isApi = pathname.startsWith("/api/");
  // A body larger than the route takes is refused on its declared length, before anything is read.
  const tooLarge = refuseDeclaredBody(ctx.request.method, pathname, ctx.request.headers.get("content-length"));
  if (tooLarge) return json(errorBody(tooLarge.message, tooLarge.path), 413);
  const rule = ruleFor(ctx.request.method, pathname);
  ctx.locals.user = null;
  ctx.locals.authVia = null;

  const bearer = ctx.request.headers.get("authorization")?.match(/^Bearer\s+(\S+)$/i)?.[1];
  if (bearer && rule.access !== "public") {
    if (!rule.token) {
      return json(errorBody("API tokens may only read (and export tap tables); sign in to change anything."), 401);
    }
    const user = await userForToken(bearer);
    if (!user)
      return json(errorBody("That API token is unknown or revoked; create a new one under your profile."), 401);
    ctx.locals.user = user;
    ctx.locals.authVia = "token";
  } else if (!pathname.startsWith("/api/auth/") && !pathname.startsWith("/_astro/")) {
    ctx.locals.user = await sessionUser(ctx.request.headers);
    ctx.locals.authVia = ctx.locals.user ? "session" : null;
  }

  if (rule.access === "public") return next();
  const user = ctx.locals.user;
  if (!user) {
    if (isApi) return json(errorBody("Sign in first (POST /api/auth/sign-in/email), or send an API token."), 401);
    const back = pathname === "/" ? "" : `?next=${encodeURIComponent(pathname + ctx.url.search)}`;
    return ctx.redirect(`/sign-in${back}`, 302);
  }
  if (!allows(rule, user.role)) {
    if (isApi) return json(errorBody(`The ${user.role} role may not do this.`), 403);
    return ctx.rewrite("/forbidden");
  }
  return next();
});
