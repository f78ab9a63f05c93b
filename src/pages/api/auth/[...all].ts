// better-auth's own routes (sign-in, sign-out, session). The client address comes from the socket,
// never from a header the client sent, so the sign-in rate limit cannot be dodged.
import type { APIRoute } from "astro";
import { auth, CLIENT_IP_HEADER } from "@/server/auth/auth.server";

export const ALL: APIRoute = async ({ request, clientAddress }) => {
  const headers = new Headers(request.headers);
  headers.set(CLIENT_IP_HEADER, clientAddress);
  const body = request.method === "GET" || request.method === "HEAD" ? undefined : await request.arrayBuffer();
  return auth.handler(new Request(request.url, { method: request.method, headers, body }));
};
