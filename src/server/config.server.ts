// The server's settings, read once from the environment and checked with zod: the one place in
// src/ that reads process.env. README's "Configuration" table lists every variable.
import { join } from "node:path";
import { z } from "zod";

const port = (name: string, fallback: number) =>
  z.coerce
    .number({ error: `${name} must be a port number` })
    .int(`${name} must be a whole port number`)
    .min(1, `${name} must be a port number (1…65535)`)
    .max(65535, `${name} must be a port number (1…65535)`)
    .default(fallback);

/** Empty strings count as unset, as the start and test commands pass them for variables left out. */
const optionalText = z.preprocess((v) => (v === "" ? undefined : v), z.string().optional());

const envSchema = z.object({
  NODE_ENV: z.string().default("development"),
  HOST: z.string().default("127.0.0.1"),
  PORT: port("PORT", 4321),
  DATABASE_URL: optionalText,
  BETTER_AUTH_SECRET: optionalText,
  BETTER_AUTH_URL: optionalText.pipe(
    z.url({ error: "BETTER_AUTH_URL must be a URL, e.g. https://tapwright.example.com" }).optional(),
  ),
  TAPWRIGHT_SIGN_IN_LIMIT: z
    .string()
    .regex(/^\d+\/\d+$/, "TAPWRIGHT_SIGN_IN_LIMIT must be attempts/window_s, e.g. 5/60")
    .default("5/60"),
  SMTP_HOST: optionalText,
  SMTP_PORT: port("SMTP_PORT", 2525),
  SMTP_SECURE: z.string().optional(),
  SMTP_USER: optionalText,
  SMTP_PASSWORD: z.string().default(""),
  MAIL_FROM: z.string().default("Tapwright <no-reply@tapwright.test>"),
  TAPWRIGHT_DEV_MAIL: z.string().optional(),
  TAPWRIGHT_WORKERS: optionalText,
  TAPWRIGHT_DERIVE_THREADS: optionalText,
  TAPWRIGHT_WORKER: optionalText,
  TAPWRIGHT_DATA_DIR: optionalText,
  TAPWRIGHT_QUEUE: z.preprocess(
    (v) => (v === "" ? undefined : v),
    z.enum(["embedded", "bullmq"], { error: 'TAPWRIGHT_QUEUE must be "embedded" or "bullmq"' }).default("embedded"),
  ),
  REDIS_URL: optionalText.pipe(
    z.url({ error: "REDIS_URL must be a URL, e.g. redis://:password@10.0.0.5:6379" }).optional(),
  ),
  TAPWRIGHT_JOB_LOCK_S: z.coerce
    .number({ error: "TAPWRIGHT_JOB_LOCK_S must be a number of seconds" })
    .min(2, "TAPWRIGHT_JOB_LOCK_S must be at least 2 s")
    .max(3600)
    .default(30),
  TAPWRIGHT_WORKER_NAME: optionalText,
  TAPWRIGHT_JOB_TIME_LIMIT_S: z.coerce
    .number({ error: "TAPWRIGHT_JOB_TIME_LIMIT_S must be a number of seconds" })
    .min(1, "TAPWRIGHT_JOB_TIME_LIMIT_S must be at least 1 s")
    .max(86_400, "TAPWRIGHT_JOB_TIME_LIMIT_S must be at most 86400 s (a day)")
    .default(900),
  TAPWRIGHT_WORKER_MEMORY_MB: z.coerce
    .number({ error: "TAPWRIGHT_WORKER_MEMORY_MB must be a number of megabytes" })
    .int("TAPWRIGHT_WORKER_MEMORY_MB must be a whole number of megabytes")
    // Below about 10 MB a worker cannot load the engine, and Node 20 may abort the whole process
    // when a worker runs out of heap while it loads its modules.
    .min(10, "TAPWRIGHT_WORKER_MEMORY_MB must be at least 10 (the engine needs that much to load)")
    .max(65_536)
    .default(2048),
  TAPWRIGHT_QUEUE_POLL_S: z.coerce
    .number({ error: "TAPWRIGHT_QUEUE_POLL_S must be a number of seconds" })
    .min(0.1)
    .max(86_400)
    .default(2),
  TAPWRIGHT_INVITE_LIMIT: z
    .string()
    .regex(/^\d+\/\d+$/, "TAPWRIGHT_INVITE_LIMIT must be attempts/window_s, e.g. 10/600")
    .default("10/600"),
});

/** The address people reach the server at, when BETTER_AUTH_URL does not say: the listening host (loopback for a wildcard) and port. */
export function defaultPublicUrl(host: string, port: number): string {
  const publicHost = host === "0.0.0.0" || host === "::" ? "127.0.0.1" : host;
  return `http://${publicHost}:${port}`;
}

/** The settings for an environment; throws one message naming every variable that is wrong. */
export function parseConfig(env: Record<string, string | undefined>, cwd: string) {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    throw new Error(
      `The server's configuration is not usable: ${parsed.error.issues.map((i) => i.message).join("; ")}.`,
    );
  }
  const e = parsed.data;
  if (e.TAPWRIGHT_QUEUE === "bullmq" && !e.REDIS_URL) {
    throw new Error(
      "The server's configuration is not usable: TAPWRIGHT_QUEUE=bullmq needs REDIS_URL (npm start sets it for the private Redis).",
    );
  }
  const [max, window] = e.TAPWRIGHT_SIGN_IN_LIMIT.split("/").map(Number);
  const [inviteMax, inviteWindow] = e.TAPWRIGHT_INVITE_LIMIT.split("/").map(Number);
  const smtpHost = e.SMTP_HOST ?? "127.0.0.1";
  return {
    production: e.NODE_ENV === "production",
    databaseUrl: e.DATABASE_URL,
    /** The public address: links in e-mails, the auth library's base URL (https turns on Secure cookies). */
    publicUrl: e.BETTER_AUTH_URL ?? defaultPublicUrl(e.HOST, e.PORT),
    authSecret: e.BETTER_AUTH_SECRET,
    /** Sign-in attempts per client address per window (s). */
    signInLimit: { max: max || 5, window: window || 60 },
    /** Invitation-accept attempts per client address per window (s). */
    inviteLimit: { max: inviteMax || 10, window: inviteWindow || 600 },
    smtp: {
      host: smtpHost,
      port: e.SMTP_PORT,
      secure: e.SMTP_SECURE === "1",
      /** The local fake on loopback speaks no TLS. */
      ignoreTls: smtpHost === "127.0.0.1",
      auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASSWORD } : undefined,
      from: e.MAIL_FROM,
    },
    /** Whether admins may read the messages the local fake SMTP server caught (never in production). */
    devMail: e.TAPWRIGHT_DEV_MAIL === "1" && e.NODE_ENV !== "production",
    /** Engine worker threads asked for (the pool keeps at most one per core). */
    workers: Number(e.TAPWRIGHT_WORKERS) || 2,
    /** Engine threads deriving channel uploads at once, apart from the job threads. */
    deriveThreads: Number(e.TAPWRIGHT_DERIVE_THREADS) || 1,
    /** Where the bundled engine worker is, when not beside the server's build. */
    workerFile: e.TAPWRIGHT_WORKER,
    /** The checkout's private data folder (the database, the demo's computed results). */
    dataDir: e.TAPWRIGHT_DATA_DIR ?? join(cwd, ".data"),
    /**
     * Who runs long work: the embedded queue (MariaDB plus this process's worker pool) or BullMQ on
     * Redis (standalone workers started with `npm run worker`).
     */
    queue: {
      backend: e.TAPWRIGHT_QUEUE,
      redisUrl: e.REDIS_URL,
      lock_s: e.TAPWRIGHT_JOB_LOCK_S,
      workerName: e.TAPWRIGHT_WORKER_NAME,
      poll_s: e.TAPWRIGHT_QUEUE_POLL_S,
    },
    /**
     * Bounds of one attempt at a job, whichever backend runs it: its wall time (past it the worker
     * thread is terminated and the job failed) and each engine worker thread's heap.
     */
    jobs: { timeLimit_s: e.TAPWRIGHT_JOB_TIME_LIMIT_S, workerMemory_MB: e.TAPWRIGHT_WORKER_MEMORY_MB },
  };
}

export type Config = ReturnType<typeof parseConfig>;

/** This process's settings. */
export const config: Config = parseConfig(process.env, process.cwd());
