// better-auth's own routes (sign-in, sign-out, session), behind Tapwright's guards: capped bodies and
// failed sign-ins counted per account. The client address comes from the socket (scripts/serve.mjs
// trusts X-Forwarded-For only from configured proxies), so the per-address limit cannot be dodged.
import type { APIRoute } from "astro";
import { authRoute } from "@/server/auth/signIn.server";

export const ALL: APIRoute = ({ request, clientAddress }) => authRoute(request, clientAddress);
