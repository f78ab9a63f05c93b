// Fenced results, against the real MariaDB: a second attempt at a job takes its row over with a new
// token, and the first attempt's result is then refused; a job for a tap table version that is
// signed off (frozen) stores nothing. The job rows are handed to the distributed queue (which the
// test server's embedded dispatcher leaves alone), and this process plays the workers.
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { db, pool } from "@/server/db.server";
import { jobs, runs, tapTableVersions } from "@/db/schema";
import { claimJob, runClaimed } from "@/server/jobs/attempt.server";
import "@/server/jobs/allKinds.server";

afterAll(async () => {
  await pool.end();
});

/** A job row for the distributed queue, so no dispatcher of the test server claims it. */
async function distributedJob(kind: "run" | "table-version", targetId: number): Promise<number> {
  const [{ id }] = await db.insert(jobs).values({ kind, targetId, queue: "bullmq", status: "queued" }).$returningId();
  return id;
}

describe("fenced results", () => {
  it("an attempt overtaken by a newer one stores nothing; the newer one stores its result; a done job is not claimed again", async () => {
    const [run] = await db.select().from(runs).limit(1);
    const before = run.result;
    const id = await distributedJob("run", run.id);
    const first = await claimJob(id, "worker-first");
    const second = await claimJob(id, "worker-second");
    expect(first && second).toBeTruthy();
    expect(second!.token).not.toBe(first!.token);
    const fake = (headroom: number) => async () => ({
      engineVersion: "fenced-test",
      metrics: { limiterHeadroom_V: headroom, eyeHeight_V: headroom },
      verdict: { linearReachExhausted: false, fewestDfeTaps: 0 },
    });
    expect(await runClaimed(first!, fake(1))).toEqual({ kind: "fenced" });
    const [afterLate] = await db.select().from(runs).where(eq(runs.id, run.id));
    expect(afterLate.result).toEqual(before);
    expect(await runClaimed(second!, fake(2))).toEqual({ kind: "done", parentQueued: null });
    const [afterNew] = await db.select().from(runs).where(eq(runs.id, run.id));
    expect(afterNew.summary?.limiterHeadroom_V).toBe(2);
    const [row] = await db.select().from(jobs).where(eq(jobs.id, id));
    expect(row).toMatchObject({ status: "done", attempts: 2, lockedBy: null });
    expect(await claimJob(id, "worker-third")).toBeNull();
    // Put the demo run's own result back.
    await db
      .update(runs)
      .set({ result: before, summary: run.summary, engineVersion: run.engineVersion })
      .where(eq(runs.id, run.id));
  });

  it("a late job for a signed-off (frozen) version finishes without touching it", async () => {
    const [frozen] = await db.select().from(tapTableVersions).where(eq(tapTableVersions.state, "approved")).limit(1);
    expect(frozen).toBeDefined();
    const id = await distributedJob("table-version", frozen.id);
    const claim = await claimJob(id, "worker-late");
    const out = await runClaimed(claim!, async () => ({
      engineVersion: "late",
      requiredHeadroom_V: 0,
      targetBer: 1e-12,
      classes: [],
      worstEye: null,
    }));
    expect(out.kind).toBe("done");
    const [after] = await db.select().from(tapTableVersions).where(eq(tapTableVersions.id, frozen.id));
    expect(after.state).toBe("approved");
    expect(after.result).toEqual(frozen.result);
    expect(after.engineVersion).toBe(frozen.engineVersion);
  });
});
