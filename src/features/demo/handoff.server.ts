// The demo hand-off (called from scripts/seed.ts after the channels and budgets exist, never in
// production): an architecture study of the QL-48 backplane lanes with its decision record, a tap
// table whose v1 is signed off after a short thread, and a v2 awaiting sign-off. Computed here by
// the engine (the study and versions run in this process). Idempotent: skips what exists.
// Results are also kept in .data/demo-handoff/ under a hash of their inputs and of the code that
// computes them (lib/ and the job modules), so a fresh test database is seeded in a moment while
// any change to that code recomputes them.
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { and, eq, inArray } from "drizzle-orm";
import { db } from "@/server/db.server";
import { config } from "@/server/config.server";
import { budgets, channels, studies, tapTables, users } from "@/db/schema";
import type { SessionUser } from "@/server/auth/sessionUser";
import { defaultCandidates } from "@/features/studies/architecture";
import { computeStudy } from "@/features/studies/studies.job";
import { decideStudy, getStudy, startStudy } from "@/features/studies/studies.server";
import { computeTapTableVersion } from "@/features/tapTables/tapTables.job";
import { createTapTable, createVersion } from "@/features/tapTables/tapTableVersions.server";
import { addComment, decideSignOff, requestSignOff } from "@/features/signoff/signoff.server";
import type { CandidateResult, StudyInputs } from "@/features/studies/studies";
import type { VersionInputs } from "@/features/tapTables/tapTables";
import type { RunHere } from "@/server/jobs/inlineJob.server";
import { formatMillivolts } from "@/components/format";
import { DEMO_BUDGETS, DEMO_CHANNELS } from "./demo";

const STUDY = "QL-48 backplane lanes: how much equalization";
const TABLE = "QL-48 backplane lane defaults";
/** Lanes beyond this loss get a retimer in the demo story and stay out of the hand-off. */
const RETIMED_ABOVE_dB = 35;
/** The candidates compared: the transmit FIR the line card's SerDes has (1 pre, 1 post), CTLE, DFE 1/3/5. */
const CANDIDATES = defaultCandidates({ pre: 1, post: 1 }, 5).filter((c) =>
  ["ctle", "tx-ctle", "tx-ctle-dfe1", "tx-ctle-dfe3", "tx-ctle-dfe5"].includes(c.key),
);

/** The code a hand-off result depends on: the engine and the job modules that call it. */
const COMPUTING_CODE = [
  "lib",
  "src/features/studies/studies.job.ts",
  "src/features/tapTables/tapTables.job.ts",
  "src/features/tapTables/architectureBudget.ts",
];

/** SHA-256 over the computing code's files, in path order. */
function codeHash(): string {
  const h = createHash("sha256");
  const add = (p: string) => {
    const full = join(process.cwd(), p);
    if (statSync(full).isDirectory()) {
      for (const e of readdirSync(full).sort()) add(join(p, e));
    } else {
      h.update(p);
      h.update(readFileSync(full));
    }
  };
  COMPUTING_CODE.forEach(add);
  return h.digest("hex");
}

/** Runs a computation, or reuses its result when the same inputs met the same code before. */
function reused<I, R>(kind: string, code: string, compute: (input: I) => R): RunHere<I, R> {
  const base = join(config.dataDir, "demo-handoff");
  const dir = join(base, code.slice(0, 16));
  return {
    compute(input) {
      const file = join(dir, `${kind}-${createHash("sha256").update(JSON.stringify(input)).digest("hex")}.json`);
      if (existsSync(file)) return JSON.parse(readFileSync(file, "utf8")) as { result: R; compute_ms: number };
      const t0 = performance.now();
      const out = { result: compute(input), compute_ms: Math.round(performance.now() - t0) };
      if (!existsSync(dir)) {
        // Results of older code are never read again.
        rmSync(base, { recursive: true, force: true });
        mkdirSync(dir, { recursive: true });
      }
      writeFileSync(file, JSON.stringify(out));
      return out;
    },
  };
}

async function person(email: string): Promise<SessionUser> {
  const [u] = await db
    .select({ id: users.id, email: users.email, name: users.name, role: users.role })
    .from(users)
    .where(eq(users.email, email));
  if (!u) throw new Error(`The demo account ${email} is missing; seed the people first.`);
  return u;
}

/** The candidate with the fewest taps that meets the required headroom on every lane (else the best worst case). */
function choose(cs: readonly CandidateResult[], required_V: number): CandidateResult {
  const passing = cs.filter((c) => c.worstHeadroom_V >= required_V).sort((a, b) => a.complexity - b.complexity);
  return passing[0] ?? [...cs].sort((a, b) => b.worstHeadroom_V - a.worstHeadroom_V)[0];
}

function rationale(
  chosen: CandidateResult,
  cs: readonly CandidateResult[],
  required_V: number,
  retimed: string[],
): string {
  const richer = cs
    .filter((c) => c.complexity > chosen.complexity)
    .sort((a, b) => b.worstHeadroom_V - a.worstHeadroom_V)[0];
  const leaner = cs.filter((c) => c.complexity < chosen.complexity && c.worstHeadroom_V < required_V);
  const lines = [
    `${chosen.label} keeps ${formatMillivolts(chosen.worstHeadroom_V)} on the worst lane (${chosen.worstChannel.name}) against the ${formatMillivolts(required_V)} the budget requires.`,
  ];
  if (leaner.length > 0)
    lines.push(`${leaner.map((c) => c.label).join(", ")} leave${leaner.length === 1 ? "s" : ""} that lane short.`);
  if (richer)
    lines.push(
      `${richer.label} would add only ${formatMillivolts(richer.worstHeadroom_V - chosen.worstHeadroom_V)} for ${richer.complexity - chosen.complexity} more taps of power and area.`,
    );
  if (retimed.length > 0)
    lines.push(
      `${retimed.map((n) => `“${n}”`).join(" and ")} ${retimed.length === 1 ? "gets" : "get"} a retimer and ${retimed.length === 1 ? "is" : "are"} left out of the study.`,
    );
  return lines.join(" ");
}

/** Seeds the hand-off when it is missing; returns what it added. */
export async function seedHandoff(): Promise<{ study: boolean; table: boolean }> {
  const [existing] = await db.select({ id: tapTables.id }).from(tapTables).where(eq(tapTables.name, TABLE));
  if (existing) return { study: false, table: false };
  const designer = await person("designer@tapwright.test");
  const reviewer = await person("reviewer@tapwright.test");

  const budget = DEMO_BUDGETS.find((b) => b.budget.modulation === "nrz")!;
  const [b] = await db.select({ id: budgets.id }).from(budgets).where(eq(budgets.name, budget.name));
  // The lane bundled with its neighbours shows what crosstalk costs on its own run; it fails this
  // budget with them, so the hand-off (lanes that close) leaves it out.
  const lanes = DEMO_CHANNELS.filter(
    (c) => c.modulation === "nrz" && c.bitRate_bps === budget.budget.bitRate_bps && !c.bundle,
  );
  const names = lanes.filter((c) => c.lossAtNyquist_dB <= RETIMED_ABOVE_dB).map((c) => c.name);
  const retimed = lanes.filter((c) => c.lossAtNyquist_dB > RETIMED_ABOVE_dB).map((c) => c.name);
  const rows = await db
    .select({ id: channels.id, name: channels.name })
    .from(channels)
    .where(inArray(channels.name, names));
  const channelIds = names
    .map((n) => rows.find((r) => r.name === n)?.id)
    .filter((id): id is number => id !== undefined);
  if (!b || channelIds.length !== names.length)
    throw new Error("The demo channels and budgets must be seeded before the hand-off.");

  let [study] = await db
    .select({ id: studies.id })
    .from(studies)
    .where(and(eq(studies.name, STUDY), eq(studies.budgetId, b.id)));
  const addedStudy = !study;
  const code = codeHash();
  if (!study)
    study = await startStudy(
      designer,
      { name: STUDY, channelIds, budgetId: b.id, candidates: CANDIDATES },
      reused("study", code, (i: StudyInputs) => computeStudy(i, () => {})),
    );
  const view = await getStudy(study.id);
  if (!view.result) throw new Error(`The demo study failed: ${view.error?.message ?? "no result"}`);
  if (!view.decision) {
    const chosen = choose(view.result.candidates, view.result.requiredHeadroom_V);
    await decideStudy(designer, study.id, {
      candidateKey: chosen.key,
      rationale: rationale(chosen, view.result.candidates, view.result.requiredHeadroom_V, retimed),
    });
  }

  const here = reused("version", code, (i: VersionInputs) => computeTapTableVersion(i, () => {}));
  const { id: tableId } = await createTapTable(
    designer,
    {
      name: TABLE,
      description:
        "Default equalizer settings per reach class for the QL-48 line card's backplane lanes, loaded by the bring-up firmware.",
      budgetId: b.id,
      studyId: study.id,
      grouping: { mode: "loss-bins", edges_dB: [16], channelIds },
      note: "First cut: short and long lanes split at 16 dB.",
    },
    here,
  );
  const { id: first } = await requestSignOff(
    designer,
    tableId,
    1,
    { reviewerId: reviewer.id, message: "Two classes split at 16 dB; the long class is set by its longest lane." },
    "later",
  );
  const longest = names[names.length - 1];
  const question = await addComment(reviewer, first, {
    body: `${longest} keeps the least headroom with the long-class default. Is the default tuned for it, or a compromise with the shorter long lane?`,
    channelName: longest,
  });
  await addComment(designer, first, {
    body: "A compromise by construction: the default maximizes the worst lane of the class, and that lane is this one — no setting does better for it without costing the other more.",
    parentId: question.id,
  });
  await decideSignOff(
    reviewer,
    first,
    {
      decision: "approve",
      comment: "Approved for the bring-up firmware: every lane clears the required headroom at the target BER.",
    },
    "later",
  );

  await createVersion(
    designer,
    tableId,
    {
      edges_dB: [10, 20],
      note: "Three classes: the short lane gets its own default and the headroom the shared one cost it.",
    },
    here,
  );
  await requestSignOff(
    designer,
    tableId,
    2,
    { reviewerId: reviewer.id, message: "v2 splits the short lanes; the long class is unchanged from v1." },
    "later",
  );
  return { study: addedStudy, table: true };
}
