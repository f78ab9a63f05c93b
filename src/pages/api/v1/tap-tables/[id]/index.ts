// One tap table and its versions.
import { endpoint, readParams } from "@/server/http/handler";
import { tableParams } from "@/features/tables/tables";
import { getTable } from "@/features/tables/tables.server";

export const GET = endpoint(async (ctx) => getTable(readParams(ctx.params, tableParams).id));
