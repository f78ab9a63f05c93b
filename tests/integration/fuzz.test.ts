// Generated bad input against the running server (fast-check, fixed seeds): mutated Touchstone and
// CSV uploads, and mutated JSON bodies for budgets, synthetic channels, runs and tap tables — 2000+
// requests in all. Whatever arrives, the server answers below 500, every 4xx carries the API's
// error shape ({ error: { message, path? } }), and nothing is left half-written: after the suite
// deletes what it created, every table holds what it held before, and no row points at a missing
// parent. Generous time limits: the machine may be shared, and this suite's point is its count.
import fc from "fast-check";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signIn, type Client } from "../support/http";
import { files } from "../fixtures/channelFiles";
import { budget } from "../support/budget";

const TABLES = [
  "channels",
  "channel_sources",
  "programs",
  "budgets",
  "runs",
  "jobs",
  "tap_tables",
  "tap_table_versions",
  "architecture_studies",
];
/** Rows whose parent is gone: each query counts them for one kind of link. */
const ORPHANS: Record<string, string> = {
  "channel_sources without a channel":
    "SELECT COUNT(*) AS n FROM channel_sources s LEFT JOIN channels c ON c.id = s.channel_id WHERE c.id IS NULL",
  "runs without a job": "SELECT COUNT(*) AS n FROM runs r LEFT JOIN jobs j ON j.id = r.job_id WHERE j.id IS NULL",
  "run jobs without a run":
    "SELECT COUNT(*) AS n FROM jobs j LEFT JOIN runs r ON r.id = j.target_id WHERE j.kind = 'run' AND r.id IS NULL",
  "tap tables without a version":
    "SELECT COUNT(*) AS n FROM tap_tables t LEFT JOIN tap_table_versions v ON v.table_id = t.id WHERE v.id IS NULL",
  "version jobs without a version":
    "SELECT COUNT(*) AS n FROM jobs j LEFT JOIN tap_table_versions v ON v.id = j.target_id WHERE j.kind = 'table-version' AND v.id IS NULL",
};

let db: mysql.Pool;
let designer: Client;
let channelId: number;
let budgetId: number;
const created = { channels: [] as number[], budgets: [] as number[], runs: 0, tables: [] as number[] };
const tally = { requests: 0, byStatus: new Map<number, number>() };

async function counts(): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const t of TABLES)
    out[t] = Number(((await db.query(`SELECT COUNT(*) AS n FROM \`${t}\``))[0] as { n: number }[])[0].n);
  return out;
}

async function orphans(): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const [what, q] of Object.entries(ORPHANS)) out[what] = Number(((await db.query(q))[0] as { n: number }[])[0].n);
  return out;
}

/** The suite's one rule for every answer: below 500, and a 4xx in the error shape. */
async function check(res: Response, what: string): Promise<unknown> {
  tally.requests++;
  tally.byStatus.set(res.status, (tally.byStatus.get(res.status) ?? 0) + 1);
  const text = await res.text();
  expect(res.status, `${what}: ${text.slice(0, 300)}`).toBeLessThan(500);
  if (res.status >= 400) {
    let body: unknown;
    try {
      body = JSON.parse(text);
    } catch {
      throw new Error(`${what}: a ${res.status} without a JSON body: ${text.slice(0, 200)}`);
    }
    const error = (body as { error?: { message?: unknown; path?: unknown } }).error;
    expect(typeof error?.message, `${what}: ${text.slice(0, 300)}`).toBe("string");
    expect((error!.message as string).length).toBeGreaterThan(5);
    if (error!.path !== undefined) expect(typeof error!.path).toBe("string");
    return body;
  }
  return text ? JSON.parse(text) : null;
}

// ---- mutations of text files ----------------------------------------------------------------

const junkToken = fc.oneof(
  fc.constantFrom(
    "NaN",
    "Infinity",
    "-Infinity",
    "1e309",
    "-1e309",
    "0",
    "-0",
    "1e-400",
    "",
    "#",
    "!",
    "GHz",
    "S",
    "RI",
    "R",
    "50",
    "\u0000",
    "é",
    "通道",
  ),
  fc.double({ noNaN: false }).map(String),
  fc.integer().map(String),
  fc.string({ maxLength: 12 }),
);

type TextMutation =
  | { op: "drop"; at: number }
  | { op: "duplicate"; at: number }
  | { op: "swap"; at: number; with: number }
  | { op: "token"; at: number; token: number; value: string }
  | { op: "truncate"; at: number }
  | { op: "insert"; at: number; value: string }
  | { op: "bytes"; at: number; bytes: number[] };

const textMutation: fc.Arbitrary<TextMutation> = fc.oneof(
  fc.record({ op: fc.constant("drop" as const), at: fc.nat() }),
  fc.record({ op: fc.constant("duplicate" as const), at: fc.nat() }),
  fc.record({ op: fc.constant("swap" as const), at: fc.nat(), with: fc.nat() }),
  fc.record({ op: fc.constant("token" as const), at: fc.nat(), token: fc.nat(8), value: junkToken }),
  fc.record({ op: fc.constant("token" as const), at: fc.nat(3), token: fc.nat(8), value: junkToken }),
  fc.record({ op: fc.constant("truncate" as const), at: fc.nat() }),
  fc.record({
    op: fc.constant("insert" as const),
    at: fc.nat(),
    value: fc.oneof(junkToken, fc.constantFrom("# Hz S MA R 50", "# MHz Y DB R 75", "[Version] 2.0", "! comment")),
  }),
  fc.record({
    op: fc.constant("bytes" as const),
    at: fc.nat(),
    bytes: fc.array(fc.nat(255), { minLength: 1, maxLength: 16 }),
  }),
);

function mutateText(text: string, mutations: TextMutation[]): Uint8Array {
  const lines = text.split("\n");
  let tail: Uint8Array | null = null;
  for (const m of mutations) {
    const i = lines.length ? m.at % lines.length : 0;
    if (m.op === "drop") lines.splice(i, 1);
    else if (m.op === "duplicate") lines.splice(i, 0, lines[i] ?? "");
    else if (m.op === "swap" && lines.length) {
      const j = m.with % lines.length;
      [lines[i], lines[j]] = [lines[j], lines[i]];
    } else if (m.op === "token" && lines.length) {
      const tokens = lines[i].split(/(\s+|,|;)/);
      const words = tokens.map((t, k) => ({ t, k })).filter((x) => x.t.trim() && !/^[,;]$/.test(x.t));
      if (words.length) tokens[words[m.token % words.length].k] = m.value;
      lines[i] = tokens.join("");
    } else if (m.op === "truncate") lines.splice(Math.max(1, i));
    else if (m.op === "insert") lines.splice(i, 0, m.value);
    else if (m.op === "bytes") tail = Uint8Array.from(m.bytes);
  }
  const body = new TextEncoder().encode(lines.join("\n"));
  if (!tail) return body;
  const out = new Uint8Array(body.length + tail.length);
  out.set(body);
  out.set(tail, body.length);
  return out;
}

// ---- mutations of JSON bodies ---------------------------------------------------------------

const junkValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom(
    null,
    true,
    false,
    "",
    "NaN",
    "1e309",
    -1,
    0,
    -0,
    1e308,
    -1e308,
    5e-324,
    2 ** 53 + 1,
    [],
    {},
    [1, 2, 3],
    "通道",
    "<script>",
    "=1+1",
  ),
  fc.double(),
  fc.integer(),
  fc.string({ maxLength: 20 }),
  fc.array(fc.double({ noNaN: true }), { maxLength: 6 }),
);

type JsonMutation = { op: "set" | "delete" | "add"; path: number[]; value: unknown; key: string };
const jsonMutation: fc.Arbitrary<JsonMutation> = fc.record({
  op: fc.constantFrom("set" as const, "set" as const, "delete" as const, "add" as const),
  path: fc.array(fc.nat(), { minLength: 1, maxLength: 3 }),
  value: junkValue,
  key: fc.oneof(fc.constantFrom("__proto__", "constructor", "extra", "id"), fc.string({ maxLength: 8 })),
});

/** Applies one mutation at a path chosen by indexes into each level's keys. */
function mutateJson(template: unknown, mutations: JsonMutation[]): unknown {
  const root = structuredClone(template) as Record<string, unknown>;
  for (const m of mutations) {
    let node: unknown = root;
    for (let d = 0; d < m.path.length; d++) {
      if (node === null || typeof node !== "object") break;
      const keys = Object.keys(node as object);
      if (keys.length === 0) break;
      const key = keys[m.path[d] % keys.length];
      const last =
        d === m.path.length - 1 ||
        typeof (node as Record<string, unknown>)[key] !== "object" ||
        (node as Record<string, unknown>)[key] === null;
      if (last) {
        if (m.op === "delete") delete (node as Record<string, unknown>)[key];
        else if (m.op === "add")
          Object.defineProperty(node, m.key, { value: m.value, enumerable: true, configurable: true, writable: true });
        else (node as Record<string, unknown>)[key] = m.value;
        break;
      }
      node = (node as Record<string, unknown>)[key];
    }
  }
  return root;
}

// ---- the suite -------------------------------------------------------------------------------

let before: Record<string, number>;
let orphansBefore: Record<string, number>;

beforeAll(async () => {
  db = mysql.createPool({ uri: process.env.DATABASE_URL!, connectionLimit: 2 });
  before = await counts();
  orphansBefore = await orphans();
  designer = await signIn("designer");
  const channels = (await (await designer.get("/api/v1/channels?limit=100")).json()).items as {
    id: number;
    bitRate_bps: number;
  }[];
  channelId = channels.find((c) => c.bitRate_bps === 28e9)!.id;
  const b = await designer.send("POST", "/api/v1/budgets", { ...budget(), name: `Fuzz budget ${Date.now()}` });
  budgetId = (await b.json()).id;
  created.budgets.push(budgetId);
});

afterAll(async () => {
  await db?.end();
});

describe("fuzz: 2000+ generated requests", () => {
  const uploadTemplates = [
    { name: "lane.s2p", text: () => files.s2p(12) },
    { name: "lane.s4p", text: () => files.s4p(18) },
    { name: "pulse.csv", text: () => files.pulseCsv() },
    { name: "step.csv", text: () => files.stepCsv() },
    { name: "impulse.txt", text: () => files.impulseCsv() },
  ];

  it("mutated Touchstone and CSV uploads: 700 saved, 300 previewed", async () => {
    const texts = uploadTemplates.map((t) => ({ ...t, body: t.text() }));
    // Mostly good fields, so that most requests reach the file readers; now and then a bad one.
    const rarely = <T>(bad: fc.Arbitrary<T>) =>
      fc.oneof({ arbitrary: fc.constant(undefined), weight: 8 }, { arbitrary: bad, weight: 1 });
    const upload = fc.record({
      template: fc.nat(texts.length - 1),
      mutations: fc.array(textMutation, { minLength: 1, maxLength: 4 }),
      kind: rarely(fc.constantFrom("pulse-csv", "step-csv", "impulse-csv", "touchstone", "bogus")),
      bitRate: fc.oneof(
        { arbitrary: fc.constant("28e9"), weight: 8 },
        { arbitrary: fc.constant("56e9"), weight: 1 },
        { arbitrary: junkToken, weight: 1 },
      ),
      modulation: rarely(fc.constantFrom("nrz", "pam4", "pam8")),
      pairs: rarely(fc.oneof(fc.constant("1,3,2,4"), fc.constant("1,1,2,2"), junkToken)),
      preview: fc.boolean(),
    });
    const uploadStatuses = new Map<number, number>();
    let previews = 0;
    let saves = 0;
    await fc.assert(
      fc.asyncProperty(upload, async (u) => {
        const t = texts[u.template];
        const form = new FormData();
        form.set("file", new Blob([mutateText(t.body, u.mutations) as BlobPart]), t.name);
        form.set("name", `fuzz upload ${saves + previews}`);
        form.set("bitRate_bps", u.bitRate);
        if (u.kind) form.set("kind", u.kind);
        if (u.modulation) form.set("modulation", u.modulation);
        if (u.pairs) form.set("pairs", u.pairs);
        const preview = u.preview && previews < 300;
        if (preview) previews++;
        else saves++;
        const res = await designer.fetch(preview ? "/api/v1/channels/preview" : "/api/v1/channels", {
          method: "POST",
          body: form,
        });
        const body = (await check(res, `upload ${t.name} ${JSON.stringify(u.mutations).slice(0, 200)}`)) as {
          id?: number;
        };
        if (res.status === 201 && body?.id) created.channels.push(body.id);
        uploadStatuses.set(res.status, (uploadStatuses.get(res.status) ?? 0) + 1);
      }),
      { seed: 20261204, numRuns: 1000, endOnFailure: true },
    );
    // Most requests got past the form fields to the readers (saved, or refused for their content).
    const readers =
      (uploadStatuses.get(200) ?? 0) +
      (uploadStatuses.get(201) ?? 0) +
      (uploadStatuses.get(415) ?? 0) +
      (uploadStatuses.get(422) ?? 0);
    expect(readers).toBeGreaterThan(500);
  }, 300_000);

  it("mutated budgets (create and replace), synthetic channels, runs and tap tables: 1100 JSON bodies", async () => {
    const budgetTemplate = { ...budget(), name: "fuzz budget" };
    const syntheticTemplate = {
      name: "fuzz synthetic",
      bitRate_bps: 28e9,
      modulation: "nrz",
      lossModel: { lossAtNyquist_dB: 12, delay_s: 1e-9 },
    };
    const runTemplate = { channelId, budgetId };
    // One fixed name: at most one mutated table request can be valid and new; the rest conflict.
    const tableTemplate = {
      name: `Fuzz table ${Date.now()}`,
      budgetId,
      architecture: {
        key: "tx-ctle-dfe2",
        label: "TX FIR + CTLE + DFE 2",
        tx: { pre: 0, post: 1 },
        ctle: true,
        dfeTaps: 2,
        ffe: null,
      },
      grouping: { mode: "loss-bins", edges_dB: [15], channelIds: [channelId] },
    };
    const cases = [
      { what: "budget", method: "POST", path: () => "/api/v1/budgets", template: budgetTemplate, runs: 400 },
      {
        what: "budget replace",
        method: "PUT",
        path: () => `/api/v1/budgets/${budgetId}`,
        template: budgetTemplate,
        runs: 200,
      },
      {
        what: "synthetic channel",
        method: "POST",
        path: () => "/api/v1/channels",
        template: syntheticTemplate,
        runs: 200,
      },
      { what: "run", method: "POST", path: () => "/api/v1/runs", template: runTemplate, runs: 150 },
      { what: "tap table", method: "POST", path: () => "/api/v1/tap-tables", template: tableTemplate, runs: 150 },
    ];
    for (const [n, c] of cases.entries()) {
      await fc.assert(
        fc.asyncProperty(
          fc.array(jsonMutation, { minLength: 1, maxLength: 4 }),
          fc.boolean(),
          async (mutations, asText) => {
            const body = mutateJson(c.template, mutations);
            // Now and then the body is not even JSON: cut short, or with a stray byte.
            const text = asText ? JSON.stringify(body).slice(0, -1 - (mutations.length % 3)) : JSON.stringify(body);
            const res = await designer.fetch(c.path(), {
              method: c.method,
              headers: { "content-type": "application/json" },
              body: text,
            });
            const answer = (await check(res, `${c.what} ${text.slice(0, 300)}`)) as { id?: number };
            if (res.status === 201 && c.what === "budget" && answer?.id) created.budgets.push(answer.id);
            if (res.status === 201 && c.what === "synthetic channel" && answer?.id) created.channels.push(answer.id);
            if (res.status === 202 && c.what === "run") created.runs++;
            if (res.status === 202 && c.what === "tap table" && answer?.id) created.tables.push(answer.id);
          },
        ),
        { seed: 20261205 + n, numRuns: c.runs, endOnFailure: true },
      );
    }
  }, 300_000);

  it("deleting what it created leaves every table as it was, and no row without its parent", async () => {
    for (const id of created.channels)
      expect((await designer.send("DELETE", `/api/v1/channels/${id}?confirm=true`)).status).toBe(200);
    for (const id of created.budgets) expect((await designer.send("DELETE", `/api/v1/budgets/${id}`)).status).toBe(200);
    const after = await counts();
    // A version is a tree of jobs (the version's, one per class, one per channel): count the trees.
    const [trees] = created.tables.length
      ? await db.query(
          "SELECT COUNT(*) AS n FROM jobs WHERE kind IN ('table-version', 'table-class', 'table-member') AND target_id IN (SELECT id FROM tap_table_versions WHERE table_id IN (?))",
          [created.tables],
        )
      : [[{ n: 0 }]];
    expect(after).toEqual({
      ...before,
      // Runs and tap tables cannot be deleted through the API; they count once each.
      runs: before.runs + created.runs,
      jobs: before.jobs + created.runs + Number((trees as { n: number }[])[0].n),
      tap_tables: before.tap_tables + created.tables.length,
      tap_table_versions: before.tap_table_versions + created.tables.length,
    });
    expect(await orphans()).toEqual(orphansBefore);
    expect(Object.values(await orphans()).every((n) => n === 0)).toBe(true);
    expect(tally.requests).toBeGreaterThanOrEqual(2000);
    console.log(
      `fuzz: ${tally.requests} requests, statuses ${JSON.stringify(Object.fromEntries([...tally.byStatus].sort()))}`,
    );
  }, 300_000);
});
