// The demo workspace (never in production): an invented company, Quillfeather Systems, with one
// person per role. Idempotent: running it again adds only what is missing.
import { ensurePerson } from "@/features/people/people.server";
import { pool } from "@/server/db.server";
import { seedDemoWork } from "@/features/demo/demo.server";
import { seedHandoff } from "@/features/demo/handoff.server";
import type { Role } from "@/features/people/people";
import { DEMO_PEOPLE } from "./lib/demo.mjs";

export const DEMO_PASSWORD = process.env.DEMO_PASSWORD ?? "tapwright-demo";

const people = DEMO_PEOPLE as readonly { email: string; name: string; role: Role }[];

async function main() {
  if (process.env.NODE_ENV === "production") {
    console.log("[tapwright] Production mode: no demo data is seeded.");
    return;
  }
  for (const p of people) await ensurePerson(p.email, p.name, p.role, DEMO_PASSWORD);
  console.log(`[tapwright] Demo accounts: ${people.map((p) => p.email).join(", ")} — password: ${DEMO_PASSWORD}`);
  const work = await seedDemoWork();
  console.log(
    `[tapwright] Demo work: added ${work.channels} channels, ${work.budgets} budgets, ${work.runs} tuning runs.`,
  );
  const handoff = await seedHandoff();
  if (handoff.table)
    console.log(
      "[tapwright] Demo hand-off: an architecture study with its decision, a tap table with v1 signed off and v2 awaiting sign-off.",
    );
}

main()
  .catch((e) => {
    console.error("[tapwright] Seeding failed:", e);
    process.exitCode = 1;
  })
  .finally(() => pool.end());
