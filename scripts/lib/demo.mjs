// The demo workspace's accounts, and when the start command seeds them: on a loopback HOST unless
// TAPWRIGHT_DEMO=0, elsewhere only with TAPWRIGHT_DEMO=1, never in production.

/** The demo's people (scripts/seed.ts creates them; production refuses to start while one is active). */
export const DEMO_PEOPLE = [
  { email: "admin@tapwright.test", name: "Odile Marchetti", role: "admin" },
  { email: "designer@tapwright.test", name: "Tomas Ekwueme", role: "designer" },
  { email: "firmware@tapwright.test", name: "Priya Halvorsen", role: "firmware" },
  { email: "reviewer@tapwright.test", name: "Jun Castellanos", role: "reviewer" },
];

const isLoopback = (host) => host === "localhost" || host === "::1" || /^127\.\d+\.\d+\.\d+$/.test(host);

/** Whether `npm start` seeds the demo for this environment, and why (for the console). */
export function demoWanted(env) {
  if (env.NODE_ENV === "production") return { seed: false, why: "production never seeds demo data" };
  if (env.TAPWRIGHT_DEMO === "0") return { seed: false, why: "TAPWRIGHT_DEMO=0" };
  if (env.TAPWRIGHT_DEMO === "1") return { seed: true, why: "TAPWRIGHT_DEMO=1" };
  const host = env.HOST ?? "127.0.0.1";
  return isLoopback(host)
    ? { seed: true, why: `HOST ${host} is loopback` }
    : {
        seed: false,
        why: `HOST ${host} is reachable from other machines; set TAPWRIGHT_DEMO=1 to seed the demo anyway`,
      };
}

/** Demo accounts that can still sign in (not deactivated), by e-mail. */
export async function activeDemoAccounts(databaseUrl) {
  const mysql = await import("mysql2/promise");
  const c = await mysql.createConnection({ uri: databaseUrl });
  try {
    const [rows] = await c.query("SELECT email FROM users WHERE email IN (?) AND deactivated_at IS NULL", [
      DEMO_PEOPLE.map((p) => p.email),
    ]);
    return rows.map((r) => r.email);
  } finally {
    await c.end();
  }
}
