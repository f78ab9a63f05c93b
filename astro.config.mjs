// Astro 5 in server output on the Node adapter (standalone), React islands and Tailwind 4.
import { defineConfig } from "astro/config";
import node from "@astrojs/node";
import react from "@astrojs/react";
import tailwindcss from "@tailwindcss/vite";

// Host names the server trusts in the Host header (Astro ignores it otherwise, and then its own
// origin check cannot match same-origin requests). Add more with TAPWRIGHT_ALLOWED_HOSTS=a,b.
const allowedHosts = [
  "127.0.0.1",
  "localhost",
  process.env.HOST,
  ...(process.env.TAPWRIGHT_ALLOWED_HOSTS ?? "").split(","),
].filter((h) => h && h !== "0.0.0.0" && h !== "::");

export default defineConfig({
  output: "server",
  // Another build folder lets two checkouts' test runs share one working tree (TAPWRIGHT_OUT_DIR).
  outDir: process.env.TAPWRIGHT_OUT_DIR ?? "./dist",
  adapter: node({ mode: "standalone" }),
  integrations: [react()],
  security: { checkOrigin: true, allowedDomains: [...new Set(allowedHosts)].map((hostname) => ({ hostname })) },
  server: { host: process.env.HOST ?? "127.0.0.1", port: Number(process.env.PORT ?? 4321) },
  vite: {
    plugins: [tailwindcss()],
    ssr: { external: ["@node-rs/argon2", "piscina", "mysql2"] },
  },
});
