#!/usr/bin/env node
// `npm run demo:remove`: takes the demo accounts out of service in this checkout's database (or
// DATABASE_URL's): deactivated, their passwords, sessions and API tokens gone. Their rows stay, so
// the audit trail and the work they are named on keep their authors.
import { settings } from "./lib/config.mjs";
import { DEMO_PEOPLE } from "./lib/demo.mjs";
import { log } from "./lib/log.mjs";

const url = process.env.DATABASE_URL ?? settings("dev").env.DATABASE_URL;
const mysql = await import("mysql2/promise");
const c = await mysql.createConnection({ uri: url });
try {
  const emails = DEMO_PEOPLE.map((p) => p.email);
  await c.beginTransaction();
  const [admins] = await c.query(
    "SELECT id FROM users WHERE role = 'admin' AND deactivated_at IS NULL AND email NOT IN (?) FOR UPDATE",
    [emails],
  );
  if (admins.length === 0) {
    throw new Error(
      "No admin of your own would be left: invite one (Admin → People), accept the invitation, then run this again.",
    );
  }
  const [found] = await c.query("SELECT id FROM users WHERE email IN (?)", [emails]);
  const ids = found.map((r) => r.id);
  if (ids.length > 0) {
    await c.query("UPDATE users SET deactivated_at = COALESCE(deactivated_at, NOW(3)) WHERE id IN (?)", [ids]);
    await c.query("DELETE FROM accounts WHERE user_id IN (?)", [ids]);
    await c.query("DELETE FROM sessions WHERE user_id IN (?)", [ids]);
    await c.query("UPDATE api_tokens SET revoked_at = COALESCE(revoked_at, NOW(3)) WHERE user_id IN (?)", [ids]);
  }
  await c.commit();
  log(ids.length ? `Demo accounts removed from service: ${emails.join(", ")}.` : "No demo accounts in this database.");
} catch (e) {
  await c.rollback().catch(() => {});
  console.error(`[tapwright] ${e.message}`);
  process.exitCode = 1;
} finally {
  await c.end();
}
