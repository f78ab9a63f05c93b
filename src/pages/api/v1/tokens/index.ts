// Everyone: their own API tokens (admins may list everyone's with ?all=1). The secret is shown once.
import { currentUser, endpoint, readJson } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { createToken, listTokens } from "@/features/tokens/tokens.server";
import { createTokenRequest } from "@/features/tokens/tokens";

export const GET = endpoint(async (ctx) => ({
  items: await listTokens(currentUser(ctx), ctx.url.searchParams.get("all") === "1"),
  nextCursor: null,
}));

export const POST = endpoint(async (ctx) => {
  const { name, expiresInDays } = await readJson(ctx.request, createTokenRequest);
  const { token, secret } = await createToken(currentUser(ctx), name, expiresInDays);
  return json({ ...token, secret }, 201);
});
