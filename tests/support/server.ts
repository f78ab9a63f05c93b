// A second web server process for tests that restart it or give it other settings.
import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { join } from "node:path";

const root = join(import.meta.dirname, "..", "..");

export interface TestServer {
  base: string;
  stop(): Promise<void>;
  /** kill -9: the process ends at once, mid-request, without any shutdown. */
  kill(): void;
  /** What the server wrote to stderr so far (passed through to the test's stderr as well). */
  stderr(): string;
}

export async function startServer(port: number, extraEnv: Record<string, string> = {}): Promise<TestServer> {
  const base = `http://127.0.0.1:${port}`;
  const child: ChildProcess = spawn(process.execPath, [join(root, "scripts", "serve.mjs")], {
    cwd: root,
    env: { ...process.env, PORT: String(port), HOST: "127.0.0.1", BETTER_AUTH_URL: base, ...extraEnv },
    stdio: ["ignore", "ignore", "pipe"],
  });
  let stderr = "";
  child.stderr?.on("data", (chunk: Buffer) => {
    stderr += chunk.toString();
    process.stderr.write(chunk);
  });
  const until = Date.now() + 30_000;
  for (;;) {
    try {
      if ((await fetch(`${base}/api/v1/health`)).ok) break;
    } catch {
      /* not up yet */
    }
    if (child.exitCode !== null) throw new Error(`test server exited with ${child.exitCode}`);
    if (Date.now() > until) throw new Error(`test server on ${port} did not start`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    base,
    kill: () => child.kill("SIGKILL"),
    stderr: () => stderr,
    stop: () =>
      new Promise<void>((resolve) => {
        // Already gone (stopped before, or killed: then it has a signal and no exit code).
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        child.once("exit", () => resolve());
        child.kill("SIGTERM");
      }),
  };
}

/**
 * A port the system reports free right now. Ports counted from the test server's own would land on
 * another checkout's server when several test runs share the machine, and that server would answer.
 */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const address = probe.address();
      probe.close(() =>
        address && typeof address === "object" ? resolve(address.port) : reject(new Error("no free port")),
      );
    });
  });
}
