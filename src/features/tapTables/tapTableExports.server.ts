// A tap-table version's exports (CSV, JSON, C header) with the export audited, and the printable
// report of a version.
import { and, eq } from "drizzle-orm";
import { db } from "@/server/db.server";
import { signOffs, tapTables, users, type TapTableVersion } from "@/db/schema";
import { conflict } from "@/server/http/errors";
import { recordAudit } from "@/server/audit/audit.server";
import type { Download } from "@/server/http/download";
import type { SessionUser } from "@/server/auth/sessionUser";
import { parseBudget } from "@/server/sources.server";
import { renderExport, exportFilename, exportMediaType, type ExportModel } from "./exports";
import { getVersion, versionRow } from "./tapTables.server";
import type { ExportFormat, VersionResult } from "./tapTables";

/** GET …/export?format=: the file, with the export recorded in the audit trail. */
export async function exportVersion(
  user: SessionUser,
  via: "session" | "token" | null,
  tableId: number,
  v: number,
  format: ExportFormat,
): Promise<Download> {
  const { version, table } = await versionRow(tableId, v);
  if (!version.result) {
    throw conflict(
      version.state === "failed"
        ? `v${v} failed to compute; there is nothing to export.`
        : `v${v} is still computing; export it when it is done.`,
    );
  }
  const model = await exportModel(table, version, version.result);
  const body = renderExport(model, format);
  await recordAudit(db, user, "table.export", "tap-table", tableId, { version: v, format, state: version.state, via });
  return {
    filename: exportFilename(model, format),
    contentType: exportMediaType(format),
    body,
    cacheControl: "no-store",
  };
}

/** The approval behind a version (the approving sign-off's reviewer and time), if any. */
async function approvalOf(versionId: number) {
  const [row] = await db
    .select({ at: signOffs.decidedAt, by: users.name })
    .from(signOffs)
    .innerJoin(users, eq(users.id, signOffs.reviewerId))
    .where(and(eq(signOffs.versionId, versionId), eq(signOffs.state, "approved")))
    .limit(1);
  return row && row.at ? { by: row.by, at: row.at } : null;
}

async function exportModel(
  table: typeof tapTables.$inferSelect,
  version: TapTableVersion,
  result: VersionResult,
): Promise<ExportModel> {
  const inputs = version.inputs;
  const b = parseBudget(inputs.budget.params, inputs.budget.name);
  return {
    table: { id: table.id, name: table.name },
    version: version.version,
    state: version.state,
    approval: await approvalOf(version.id),
    budget: {
      name: inputs.budget.name,
      modulation: b.modulation,
      bitRate_bps: b.bitRate_bps ?? null,
      targetBer: b.targetBer,
      requiredHeadroom_V: b.requiredHeadroom_V,
    },
    architecture: inputs.architecture,
    registerMap: inputs.registerMap,
    classes: result.classes,
    corners: inputs.corners ?? null,
    engineVersion: result.engineVersion,
    generatedAt: new Date(),
  };
}

/** Everything the printable report shows. */
export async function getVersionReport(tableId: number, v: number) {
  const view = await getVersion(tableId, v);
  const { version } = await versionRow(tableId, v);
  const inputs = version.inputs;
  return {
    ...view,
    budgetParams: parseBudget(inputs.budget.params, inputs.budget.name),
    approval: await approvalOf(version.id),
  };
}
