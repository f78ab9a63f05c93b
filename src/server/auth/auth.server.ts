// Sign-in and sessions: better-auth over Drizzle (MySQL provider on MariaDB), argon2id passwords,
// sessions stored in the database (they survive restarts), sign-in rate limited per client address.
import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { db } from "@/server/db.server";
import { accounts, rateLimits, sessions, users, verifications } from "@/db/schema";
import { config } from "@/server/config.server";
import { hashPassword, verifyPassword } from "./password.server";

const baseURL = config.publicUrl;
const isLocal = /^http:\/\/(127\.0\.0\.1|localhost|\[::1\])(:\d+)?$/.test(baseURL);

/** The header the auth route fills from the socket's address; clients cannot set it themselves. */
export const CLIENT_IP_HEADER = "x-tapwright-client-ip";

export const auth = betterAuth({
  baseURL,
  secret: config.authSecret,
  database: drizzleAdapter(db, {
    provider: "mysql",
    schema: { user: users, session: sessions, account: accounts, verification: verifications, rateLimit: rateLimits },
  }),
  emailAndPassword: {
    enabled: true,
    disableSignUp: true, // people join through an admin's invitation
    minPasswordLength: 10,
    password: { hash: hashPassword, verify: verifyPassword },
  },
  user: {
    additionalFields: {
      role: { type: "string", required: false, defaultValue: "designer", input: false },
    },
  },
  session: {
    expiresIn: 60 * 60 * 24 * 7,
    updateAge: 60 * 60 * 24,
  },
  rateLimit: {
    enabled: true,
    storage: "database",
    window: 60,
    max: 300,
    customRules: { "/sign-in/email": config.signInLimit },
  },
  advanced: {
    useSecureCookies: !isLocal,
    cookiePrefix: "tapwright",
    defaultCookieAttributes: { httpOnly: true, sameSite: "lax", secure: !isLocal },
    ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
    database: { generateId: () => crypto.randomUUID() },
  },
  telemetry: { enabled: false },
});

export type AuthSession = typeof auth.$Infer.Session;
