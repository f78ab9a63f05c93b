// Shared set-up of the study, tap-table, sign-off and export tests: a small population of
// synthetic channels at one bit rate with the test budget, waiting for jobs, a computed table and
// its sign-off made through the API, and the dev mailbox.
import { eventually, type Client } from "../support/http";
import { unique } from "../fixtures/workspace";
import { budgetBody, type BudgetChanges } from "../support/budget";

export { unique };

export interface Population {
  budgetId: number;
  channelIds: number[];
  /** Channel ids by their loss at Nyquist in dB. */
  byLoss: Map<number, number>;
  /** Channel names, in the order of `channelIds`. */
  names: string[];
  budgetName: string;
}

/** Synthetic 28 Gb/s channels with these losses at Nyquist, and the test budget (with `changes`), all uniquely named. */
export async function population(
  designer: Client,
  losses: readonly number[],
  changes: BudgetChanges = {},
): Promise<Population> {
  const tag = unique("Hand-off");
  const budgetName = `${tag} budget`;
  const b = await designer.send("POST", "/api/v1/budgets", budgetBody(budgetName, changes));
  if (b.status !== 201) throw new Error(`budget: ${b.status} ${await b.text()}`);
  const budgetId = (await b.json()).id as number;
  const byLoss = new Map<number, number>();
  const names: string[] = [];
  for (const loss of losses) {
    const name = `${tag} ${loss} dB`;
    const r = await designer.send("POST", "/api/v1/channels", {
      name,
      bitRate_bps: 28e9,
      lossModel: { lossAtNyquist_dB: loss },
    });
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

/** TX FIR + CTLE + one DFE tap, given by hand (no study). */
export const txCtleDfe1 = {
  key: "tx-ctle-dfe1",
  label: "TX FIR + CTLE + DFE 1",
  tx: { pre: 0, post: 1 },
  ctle: true,
  dfeTaps: 1,
  ffe: null,
} as const;

/** A new tap table over the population, split into loss bins at 16 dB, with v1 computed. */
export async function computedTable(
  designer: Client,
  pop: Population,
  name: string,
): Promise<{ id: number; name: string }> {
  const res = await designer.send("POST", "/api/v1/tap-tables", {
    name,
    budgetId: pop.budgetId,
    architecture: txCtleDfe1,
    grouping: { mode: "loss-bins", channelIds: pop.channelIds, edges_dB: [16] },
  });
  if (res.status !== 202) throw new Error(`tap table: ${res.status} ${await res.text()}`);
  const { id } = await res.json();
  const v = await versionComputed(designer, id, 1);
  if (v.job.status !== "done") throw new Error(`tap table ${id} v1: ${v.job.error?.message}`);
  return { id, name };
}

/** The designer asks the demo reviewer to sign off v1 of a table; the sign-off's id. */
export async function requestSignOff(
  designer: Client,
  reviewer: Client,
  tableId: number,
  message?: string,
): Promise<number> {
  const reviewerId = (await (await reviewer.get("/api/v1/me")).json()).id;
  const res = await designer.send("POST", `/api/v1/tap-tables/${tableId}/versions/1/sign-off`, { reviewerId, message });
  if (res.status !== 201) throw new Error(`sign-off request: ${res.status} ${await res.text()}`);
  return (await res.json()).id;
}

/** The reviewer decides a sign-off. */
export async function decideSignOff(
  reviewer: Client,
  signOffId: number,
  decision: "approve" | "reject",
  comment: string,
): Promise<void> {
  const res = await reviewer.send("POST", `/api/v1/sign-offs/${signOffId}/decision`, { decision, comment });
  if (res.status !== 200) throw new Error(`decision: ${res.status} ${await res.text()}`);
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
  return r.items as {
    action: string;
    targetType: string;
    targetId: string;
    actorEmail: string;
    detail: Record<string, unknown> | null;
  }[];
}
