// Astro 5 in server output on the Node adapter (standalone), React islands and Tailwind 4.
import { defineConfig } from "astro/config";
import node from "@astrojs/node";
import react from "@astrojs/react";
import tailwindcss from "@tailwindcss/vite";

export default defineConfig({
  output: "server",
  adapter: node({ mode: "standalone" }),
  integrations: [react()],
  security: { checkOrigin: true },
  server: { host: process.env.HOST ?? "127.0.0.1", port: Number(process.env.PORT ?? 4321) },
  vite: {
    plugins: [tailwindcss()],
    ssr: { external: ["@node-rs/argon2", "piscina", "mysql2"] },
  },
});
