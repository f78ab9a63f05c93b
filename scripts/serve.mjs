#!/usr/bin/env node
// The web server process: `node scripts/serve.mjs` runs the built app (dist/server/entry.mjs, the
// Node adapter's handler) behind three things the adapter does not do:
// - the client's address comes from the socket; X-Forwarded-* headers count only when the peer is
//   one of TAPWRIGHT_TRUSTED_PROXIES (the adapter believes any X-Forwarded-For it is sent);
// - hashed assets (/_astro/*) are served from the .br / .gz files made at build time;
// - HTML, JSON and other text responses are compressed (brotli or gzip) on the fly;
// and in production it refuses to start while a demo account can sign in.
import { createReadStream, existsSync, statSync } from "node:fs";
import http from "node:http";
import { extname, join, resolve, sep } from "node:path";
import { pathToFileURL } from "node:url";
import compression from "compression";
import { activeDemoAccounts } from "./lib/demo.mjs";
import { clientAddress, isTrusted, parseProxies } from "./lib/proxies.mjs";

const root = resolve(import.meta.dirname, "..");
const outDir = resolve(root, process.env.TAPWRIGHT_OUT_DIR ?? "dist");
const assetsDir = join(outDir, "client", "_astro");
process.env.TAPWRIGHT_WORKER ??= join(outDir, "engine-worker.mjs");
// The adapter's entry starts its own server on import unless told not to.
process.env.ASTRO_NODE_AUTOSTART = "disabled";

const trustedProxies = parseProxies(process.env.TAPWRIGHT_TRUSTED_PROXIES ?? "");
const FORWARDED = [
  "x-forwarded-for",
  "x-forwarded-host",
  "x-forwarded-proto",
  "x-forwarded-port",
  "x-real-ip",
  "forwarded",
];

/**
 * The adapter takes the client's address from X-Forwarded-For when present: leave it holding
 * exactly the address `clientAddress` settles on, and drop the other forwarding headers unless a
 * trusted proxy sent them.
 */
function settleForwarding(req) {
  const peer = req.socket.remoteAddress ?? "";
  const client = clientAddress(peer, req.headers["x-forwarded-for"], trustedProxies);
  if (!isTrusted(peer, trustedProxies)) for (const h of FORWARDED) delete req.headers[h];
  req.headers["x-forwarded-for"] = client;
}

const assetTypes = {
  ".js": "text/javascript; charset=utf-8",
  ".mjs": "text/javascript; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".svg": "image/svg+xml",
  ".json": "application/json; charset=utf-8",
};

/** The encodings a client accepts (q > 0), from its Accept-Encoding header. */
function accepted(header) {
  const out = new Set();
  for (const part of String(header ?? "").split(",")) {
    const [name, ...params] = part.trim().toLowerCase().split(";");
    const q = params.map((p) => p.trim()).find((p) => p.startsWith("q="));
    if (name && !(q && Number(q.slice(2)) === 0)) out.add(name);
  }
  return out;
}

/** Serves /_astro/<file> from its precompressed twin when the client takes it; false when there is none. */
function servePrecompressed(req, res) {
  if (req.method !== "GET" && req.method !== "HEAD") return false;
  const path = decodeURIComponent((req.url ?? "").split("?")[0]);
  if (!path.startsWith("/_astro/")) return false;
  const file = resolve(assetsDir, path.slice("/_astro/".length));
  const type = assetTypes[extname(file)];
  if (!type || !file.startsWith(assetsDir + sep)) return false;
  const encodings = accepted(req.headers["accept-encoding"]);
  const choice = [
    ["br", ".br"],
    ["gzip", ".gz"],
  ].find(([name, ext]) => encodings.has(name) && existsSync(file + ext));
  if (!choice) return false;
  const body = file + choice[1];
  res.writeHead(200, {
    "content-type": type,
    "content-encoding": choice[0],
    "content-length": statSync(body).size,
    "cache-control": "public, max-age=31536000, immutable",
    vary: "Accept-Encoding",
  });
  if (req.method === "HEAD") res.end();
  else createReadStream(body).pipe(res);
  return true;
}

// Dynamic pages and JSON: the package's fast defaults (gzip 6, brotli 4, nothing under 1 KiB); the
// build already squeezed the static assets hard.
const compress = compression();

// Production refuses to start while a demo account could still sign in (its password is public).
if (process.env.NODE_ENV === "production" && process.env.DATABASE_URL) {
  const demo = await activeDemoAccounts(process.env.DATABASE_URL);
  if (demo.length > 0) {
    console.error(
      `[tapwright] Refusing to start in production: the demo accounts ${demo.join(", ")} can still sign in. ` +
        "Invite an admin of your own, then run `npm run demo:remove` (README, Demo accounts).",
    );
    process.exit(1);
  }
}

const { handler } = await import(pathToFileURL(join(outDir, "server", "entry.mjs")).href);

const server = http.createServer((req, res) => {
  settleForwarding(req);
  if (servePrecompressed(req, res)) return;
  compress(req, res, () => handler(req, res));
});
const port = Number(process.env.PORT ?? 4321);
const host = process.env.HOST ?? "127.0.0.1";
server.listen(port, host, () => console.log(`[tapwright] web server on http://${host}:${port}`));
