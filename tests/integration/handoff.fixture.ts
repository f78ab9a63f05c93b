// Shared set-up of the study, tap-table, sign-off and export tests: a small population of
// synthetic channels at one bit rate, a quick budget, waiting for jobs, and the dev mailbox.
import { eventually, type Client } from "../support/http";
import { unique } from "../fixtures/workspace";

export { unique };

/** A budget small enough that a table of a few channels computes in seconds. */
export const quickBudget = {
  modulation: "nrz",
  bitRate_bps: 28e9,
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.0015,
  limiterSensitivity_V: 0.015,
  targetBer: 1e-12,
  requiredHeadroom_V: 0.005,
  jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
  tx: { pre: 0, post: 1, step: 0.05 },
  ctle: { gDc_dB: [-9, 0, 3], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
  dfe: { taps: 2, limits_V: 0.1 },
  clocking: { scheme: "recovered", policy: "centre" },
} as const;

export interface Population {
  budgetId: number;
  channelIds: number[];
  /** Channel ids by their loss at Nyquist in dB. */
  byLoss: Map<number, number>;
  /** Channel names, in the order of `channelIds`. */
  names: string[];
  budgetName: string;
}

/** Synthetic 28 Gb/s channels with these losses at Nyquist, and the quick budget, all uniquely named. */
export async function population(designer: Client, losses: readonly number[], budget: Record<string, unknown> = quickBudget): Promise<Population> {
  const tag = unique("Hand-off");
  const budgetName = `${tag} budget`;
  const b = await designer.send("POST", "/api/v1/budgets", { name: budgetName, ...budget });
  if (b.status !== 201) throw new Error(`budget: ${b.status} ${await b.text()}`);
  const budgetId = (await b.json()).id as number;
  const byLoss = new Map<number, number>();
  const names: string[] = [];
  for (const loss of losses) {
    const name = `${tag} ${loss} dB`;
    const r = await designer.send("POST", "/api/v1/channels", { name, bitRate_bps: 28e9, lossModel: { lossAtNyquist_dB: loss } });
    if (r.status !== 201) throw new Error(`channel: ${r.status} ${await r.text()}`);
    byLoss.set(loss, (await r.json()).id);
    names.push(name);
  }
  return { budgetId, budgetName, channelIds: [...byLoss.values()], byLoss, names };
}

interface JobState {
  status: string;
  progress: number;
  error?: { message: string };
}

/** Polls a study until its job is done or failed. */
export function studyFinished(client: Client, id: number, timeout_ms = 120_000) {
  return eventually(
    async () => {
      const s = await (await client.get(`/api/v1/studies/${id}`)).json();
      return s.status === "done" || s.status === "failed" ? s : undefined;
    },
    timeout_ms,
    `study ${id} to finish`,
  );
}

/** Polls a tap table version until it is computed (or failed). */
export function versionComputed(client: Client, tableId: number, v: number, timeout_ms = 120_000) {
  return eventually(
    async () => {
      const r = await (await client.get(`/api/v1/tap-tables/${tableId}/versions/${v}`)).json();
      const job = r.job as JobState;
      return job.status === "done" || job.status === "failed" ? r : undefined;
    },
    timeout_ms,
    `tap table ${tableId} v${v} to compute`,
  );
}

export interface Mail {
  id: number;
  to: string[];
  subject: string;
  text: string;
}

/** Waits for a message to `to` whose subject contains `subject` (admins read the dev mailbox). */
export function mailArrives(admin: Client, to: string, subject: string, timeout_ms = 15_000): Promise<Mail> {
  return eventually(
    async () => {
      const box = await (await admin.get("/api/v1/dev/mail?limit=200")).json();
      return (box.items as Mail[]).find((m) => m.to.includes(to) && m.subject.includes(subject));
    },
    timeout_ms,
    `an e-mail to ${to} about “${subject}”`,
  );
}

/** Audit events of one kind of action, newest first. */
export async function auditEvents(admin: Client, action: string) {
  const r = await (await admin.get(`/api/v1/audit?action=${encodeURIComponent(action)}&limit=200`)).json();
  return r.items as { action: string; targetType: string; targetId: string; actorEmail: string; detail: Record<string, unknown> | null }[];
}
