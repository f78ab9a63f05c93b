// One tap table and its versions.
import { endpoint, readParams } from "@/server/http/handler";
import { tapTableParams } from "@/features/tapTables/tapTables";
import { getTapTable } from "@/features/tapTables/tapTables.server";

export const GET = endpoint(async (ctx) => getTapTable(readParams(ctx.params, tapTableParams).id));
