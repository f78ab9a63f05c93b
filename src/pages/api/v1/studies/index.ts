// Architecture studies: the list, and starting one (a job: 202, poll GET /api/v1/studies/:id).
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { createStudyRequest, listQuery } from "@/features/studies/studies";
import { listStudies, startStudy } from "@/features/studies/studies.server";

export const GET = endpoint(async (ctx) => {
  const q = readParams(Object.fromEntries(ctx.url.searchParams), listQuery);
  return listStudies(q.limit, q.cursor);
});

export const POST = endpoint(async (ctx) => {
  const body = await readJson(ctx.request, createStudyRequest);
  return json(await startStudy(currentUser(ctx), body), 202);
});
