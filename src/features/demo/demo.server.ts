// Seeds the demo workspace's engineering data (called from scripts/seed.ts, never in production):
// the program, its channels (synthetic lines and one generated Touchstone file), the two budgets,
// and finished tuning runs computed here by the engine itself. Idempotent: skips what exists.
// Computed runs are also kept in .data/demo-runs/ under a hash of their inputs and of every file in
// lib/, so that a fresh test database is seeded in seconds while any engine change recomputes them.
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { and, eq } from "drizzle-orm";
import { db } from "@/server/db.server";
import { config } from "@/server/config.server";
import { budgets, channelAggressors, channels, programs, runs, users } from "@/db/schema";
import type { SessionUser } from "@/server/auth/sessionUser";
import { deriveFromFile, deriveSynthetic } from "@/features/channels/derive";
import { saveChannel } from "@/features/channels/channels.server";
import { createBudget } from "@/features/budgets/budgets.server";
import { recordFinishedRun } from "@/features/runs/runs.server";
import { computeRun, type RunJobInput } from "@/features/runs/runs.job";
import type { TuningRunResult } from "@lib/run";
import { backplaneTouchstone } from "./backplaneTouchstone";
import { laneBundleTouchstone } from "./laneBundleTouchstone";
import { DEMO_BUDGETS, DEMO_CHANNELS, DEMO_PROGRAM, DEMO_RUNS, type DemoChannel } from "./demo";

async function demoDesigner(): Promise<SessionUser | null> {
  const [u] = await db
    .select({ id: users.id, email: users.email, name: users.name, role: users.role })
    .from(users)
    .where(eq(users.email, "designer@tapwright.test"));
  return u ?? null;
}

function deriveDemoChannel(c: DemoChannel) {
  const baud = c.bitRate_bps / (c.modulation === "pam4" ? 2 : 1);
  if (c.bundle) {
    const text = laneBundleTouchstone({
      model: { lossAtNyquist_dB: c.lossAtNyquist_dB, delay_s: c.delay_s },
      nyquist_Hz: baud / 2,
      step_Hz: 25e6,
      stop_Hz: 1.5 * baud,
      neighbours: c.bundle.neighbours,
      comments: [
        `Quillfeather Systems, Brackenridge backplane: ${c.name}, with its neighbours`,
        "Generated for the Tapwright demo workspace (not a measurement).",
      ],
    });
    const bytes = new TextEncoder().encode(text);
    const file = { filename: c.bundle.filename, contentType: "application/octet-stream", bytes };
    const pairs = { inP: 1, inN: 2, outP: 7, outN: 8 };
    const derived = deriveFromFile({
      filename: file.filename,
      bytes,
      bitRate_bps: c.bitRate_bps,
      modulation: c.modulation,
      pairs,
      aggressors: c.bundle.aggressors,
    });
    return { derived, file, aggressors: c.bundle.aggressors };
  }
  if (!c.touchstone) {
    return {
      derived: deriveSynthetic(c.bitRate_bps, c.modulation, {
        lossAtNyquist_dB: c.lossAtNyquist_dB,
        delay_s: c.delay_s,
      }),
    };
  }
  const text = backplaneTouchstone({
    model: { lossAtNyquist_dB: c.lossAtNyquist_dB, delay_s: c.delay_s },
    nyquist_Hz: baud / 2,
    step_Hz: 25e6,
    stop_Hz: 1.5 * baud,
    comments: [
      `Quillfeather Systems, Brackenridge backplane: ${c.name}`,
      "Generated for the Tapwright demo workspace (not a measurement).",
    ],
  });
  const bytes = new TextEncoder().encode(text);
  const file = { filename: c.touchstone.filename, contentType: "application/octet-stream", bytes };
  return {
    derived: deriveFromFile({ filename: file.filename, bytes, bitRate_bps: c.bitRate_bps, modulation: c.modulation }),
    file,
  };
}

/** SHA-256 over every file of the engine (lib/), in path order. */
function engineHash(): string {
  const h = createHash("sha256");
  const walk = (dir: string) => {
    for (const e of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const p = join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else {
        h.update(p);
        h.update(readFileSync(p));
      }
    }
  };
  walk(join(process.cwd(), "lib"));
  return h.digest("hex");
}

/** The engine's result for a demo run: from the cache when the inputs and the engine are unchanged. */
function cachedRun(input: RunJobInput, engine: string): { result: TuningRunResult; compute_ms: number } {
  const base = join(config.dataDir, "demo-runs");
  const dir = join(base, engine.slice(0, 16));
  const file = join(dir, `${createHash("sha256").update(JSON.stringify(input)).digest("hex")}.json`);
  if (existsSync(file)) return JSON.parse(readFileSync(file, "utf8"));
  const started = performance.now();
  const result = computeRun(input);
  const out = { result, compute_ms: Math.round(performance.now() - started) };
  if (!existsSync(dir)) {
    // Results of an older engine are never read again.
    rmSync(base, { recursive: true, force: true });
    mkdirSync(dir, { recursive: true });
  }
  writeFileSync(file, JSON.stringify(out));
  return out;
}

/** Seeds what is missing; returns counts of what it added. */
export async function seedDemoWork(): Promise<{ channels: number; budgets: number; runs: number }> {
  const designer = await demoDesigner();
  const added = { channels: 0, budgets: 0, runs: 0 };

  const [program] = await db.select({ id: programs.id }).from(programs).where(eq(programs.name, DEMO_PROGRAM.name));
  const programId = program?.id ?? (await db.insert(programs).values(DEMO_PROGRAM).$returningId())[0].id;

  const channelIds = new Map<string, number>();
  for (const c of DEMO_CHANNELS) {
    const [found] = await db
      .select({ id: channels.id })
      .from(channels)
      .where(and(eq(channels.programId, programId), eq(channels.name, c.name)));
    if (found) {
      channelIds.set(c.name, found.id);
      continue;
    }
    const { derived, file, aggressors } = deriveDemoChannel(c);
    const saved = await saveChannel(
      designer,
      {
        name: c.name,
        bitRate_bps: c.bitRate_bps,
        modulation: c.modulation,
        program: DEMO_PROGRAM.name,
        file,
        aggressors,
      },
      derived,
    );
    channelIds.set(c.name, saved.id);
    added.channels++;
  }

  const budgetIds = new Map<string, number>();
  for (const b of DEMO_BUDGETS) {
    const [found] = await db.select({ id: budgets.id }).from(budgets).where(eq(budgets.name, b.name));
    if (found) {
      budgetIds.set(b.name, found.id);
      continue;
    }
    const created = await createBudget(designer, {
      ...(b.budget as Parameters<typeof createBudget>[1]),
      name: b.name,
      description: b.description,
    });
    budgetIds.set(b.name, created.id);
    added.budgets++;
  }

  let engine: string | undefined;
  for (const r of DEMO_RUNS) {
    const channelId = channelIds.get(r.channel)!;
    const budgetId = budgetIds.get(r.budget)!;
    const [exists] = await db
      .select({ id: runs.id })
      .from(runs)
      .where(and(eq(runs.channelId, channelId), eq(runs.budgetId, budgetId)))
      .limit(1);
    if (exists) continue;
    const [channel] = await db
      .select({ id: channels.id, name: channels.name, bitRate_bps: channels.bitRate_bps, pulse: channels.pulse })
      .from(channels)
      .where(eq(channels.id, channelId));
    const [budget] = await db
      .select({ id: budgets.id, name: budgets.name, params: budgets.params })
      .from(budgets)
      .where(eq(budgets.id, budgetId));
    const aggressors = await db
      .select({ name: channelAggressors.name, kind: channelAggressors.kind, pulse: channelAggressors.pulse })
      .from(channelAggressors)
      .where(eq(channelAggressors.channelId, channelId))
      .orderBy(channelAggressors.position);
    engine ??= engineHash();
    // The same inputs a run started from the page copies: the channel with its aggressors.
    const input =
      aggressors.length > 0
        ? { pulse: channel.pulse, budget: budget.params, aggressors }
        : { pulse: channel.pulse, budget: budget.params };
    const { result, compute_ms } = cachedRun(input, engine);
    await recordFinishedRun(
      designer,
      { channel: aggressors.length > 0 ? { ...channel, aggressors } : channel, budget },
      result,
      compute_ms,
    );
    added.runs++;
  }
  return added;
}
