// What the server sends over the wire: pages and JSON compressed (brotli or gzip, as the client
// asks), hashed assets from their build-time .br / .gz twins with a year-long immutable lifetime.
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { brotliDecompressSync, gunzipSync } from "node:zlib";
import { beforeAll, describe, expect, it } from "vitest";
import { baseUrl, signIn, type Client } from "../support/http";

const assets = join(import.meta.dirname, "..", "..", process.env.TAPWRIGHT_OUT_DIR ?? "dist", "client", "_astro");
let designer: Client;

/** Raw bytes as sent (Node's fetch would decode them). */
async function raw(path: string, encoding: string, cookie = "") {
  const { request } = await import("node:http");
  const url = new URL(path, baseUrl);
  return new Promise<{ status: number; headers: Record<string, string | string[] | undefined>; body: Buffer }>(
    (resolve, reject) => {
      const req = request(url, { headers: { "accept-encoding": encoding, cookie } }, (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () =>
          resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }),
        );
      });
      req.on("error", reject);
      req.end();
    },
  );
}

beforeAll(async () => {
  designer = await signIn("designer");
});

describe("compression", () => {
  it("a page is sent brotli-compressed to a client that takes brotli, and says it varies", async () => {
    const r = await raw("/channels", "br, gzip", designer.cookie);
    expect(r.status).toBe(200);
    expect(r.headers["content-encoding"]).toBe("br");
    expect(String(r.headers.vary)).toMatch(/accept-encoding/i);
    expect(brotliDecompressSync(r.body).toString("utf8")).toContain("<html");
  });

  it("JSON is sent gzip-compressed to a client that takes only gzip", async () => {
    const r = await raw("/api/v1/channels?limit=50", "gzip", designer.cookie);
    expect(r.headers["content-encoding"]).toBe("gzip");
    expect(JSON.parse(gunzipSync(r.body).toString("utf8")).items.length).toBeGreaterThan(0);
  });

  it("a client that asks for no encoding gets plain bytes", async () => {
    const r = await raw("/api/v1/channels?limit=50", "identity", designer.cookie);
    expect(r.headers["content-encoding"]).toBeUndefined();
    expect(JSON.parse(r.body.toString("utf8")).items.length).toBeGreaterThan(0);
  });

  it("hashed assets come precompressed from the build, keep their immutable year, and decode to the file", async () => {
    const js = readdirSync(assets).filter((f) => f.endsWith(".js") && readdirSync(assets).includes(`${f}.br`));
    expect(js.length).toBeGreaterThan(5);
    const largest = js
      .map((f) => ({ f, size: readFileSync(join(assets, f)).length }))
      .sort((a, b) => b.size - a.size)[0].f;
    const br = await raw(`/_astro/${largest}`, "gzip, deflate, br");
    expect(br.headers["content-encoding"]).toBe("br");
    expect(br.headers["cache-control"]).toBe("public, max-age=31536000, immutable");
    expect(Number(br.headers["content-length"])).toBe(readFileSync(join(assets, `${largest}.br`)).length);
    expect(brotliDecompressSync(br.body).equals(readFileSync(join(assets, largest)))).toBe(true);
    const gz = await raw(`/_astro/${largest}`, "gzip");
    expect(gz.headers["content-encoding"]).toBe("gzip");
    expect(gunzipSync(gz.body).equals(readFileSync(join(assets, largest)))).toBe(true);
    const plain = await raw(`/_astro/${largest}`, "identity");
    expect(plain.headers["content-encoding"]).toBeUndefined();
    expect(plain.headers["cache-control"]).toBe("public, max-age=31536000, immutable");
    expect(plain.body.equals(readFileSync(join(assets, largest)))).toBe(true);
  });

  it("a path outside the asset folder is not served from disk", async () => {
    const r = await raw("/_astro/..%2f..%2fserver%2fentry.mjs", "br");
    expect(r.status).not.toBe(200);
  });
});
