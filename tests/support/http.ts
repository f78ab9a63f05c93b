// Talking to the running test server as a person or a script would: sign-in, cookies, JSON.
export const baseUrl = process.env.TAPWRIGHT_BASE_URL ?? "http://127.0.0.1:4399";
export const demoPassword = process.env.DEMO_PASSWORD ?? "tapwright-demo";

export type DemoRole = "admin" | "designer" | "firmware" | "reviewer";
export const demoEmail = (role: DemoRole) => `${role}@tapwright.test`;

/** A signed-in client: every request carries the session cookie and a same-origin Origin header. */
export class Client {
  constructor(
    readonly cookie: string,
    readonly base = baseUrl,
  ) {}

  fetch(path: string, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (this.cookie) headers.set("cookie", this.cookie);
    if (!headers.has("origin")) headers.set("origin", this.base);
    return fetch(this.base + path, { ...init, headers, redirect: "manual" });
  }

  get(path: string) {
    return this.fetch(path);
  }

  send(method: string, path: string, body?: unknown) {
    return this.fetch(path, {
      method,
      headers: body === undefined ? {} : { "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  }
}

export async function signInRaw(email: string, password: string, base = baseUrl): Promise<Response> {
  return fetch(`${base}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: base },
    body: JSON.stringify({ email, password }),
  });
}

/** Signs in and returns a client holding the session cookie. */
export async function signIn(emailOrRole: string, password = demoPassword, base = baseUrl): Promise<Client> {
  const email = emailOrRole.includes("@") ? emailOrRole : demoEmail(emailOrRole as DemoRole);
  const res = await signInRaw(email, password, base);
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: HTTP ${res.status} ${await res.text()}`);
  const cookie = res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
  return new Client(cookie, base);
}

export const anonymous = () => new Client("");

/** Polls until `check` returns a value (not undefined), or fails after `timeout_ms`. */
export async function eventually<T>(
  check: () => Promise<T | undefined>,
  timeout_ms = 10_000,
  what = "condition",
): Promise<T> {
  const until = Date.now() + timeout_ms;
  for (;;) {
    const v = await check();
    if (v !== undefined) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}
