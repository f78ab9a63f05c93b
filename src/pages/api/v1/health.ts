// Liveness and database reachability, without sign-in.
import type { APIRoute } from "astro";
import { sql } from "drizzle-orm";
import { db } from "@/server/db.server";
import { json } from "@/server/http/errors";

export const GET: APIRoute = async () => {
  try {
    await db.execute(sql`SELECT 1`);
    return json({ ok: true, db: true });
  } catch {
    return json({ ok: false, db: false }, 503);
  }
};
