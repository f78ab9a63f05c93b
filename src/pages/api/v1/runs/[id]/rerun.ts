// Run again: a new run from this run's own copy of the inputs → 202 { id, status: "queued" }.
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { idParams } from "@/features/runs/runs";
import { rerun } from "@/features/runs/runs.server";

export const POST = endpoint(async (ctx) =>
  json(await rerun(currentUser(ctx), readParams(ctx.params, idParams).id), 202),
);
