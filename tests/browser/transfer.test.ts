// What a person's browser downloads for a tuning run's page, counted as sent over the wire
// (compressed bodies, from Chromium's own accounting), with the split by kind written to
// tests/output/run-page-transfer.json for the README's figures.
import type { Browser } from "playwright-core";
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launch, screenshotDir, signedInPage } from "../support/browser";
import { baseUrl, signIn } from "../support/http";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("the run page over the wire", () => {
  it("moves under 200 kB of compressed JavaScript, and every script and style arrives compressed", async () => {
    const designer = await signIn("designer");
    const runs = (await (await designer.get("/api/v1/runs?limit=50")).json()).items as { id: number; status: string }[];
    const run = runs.find((r) => r.status === "done")!;
    const page = await signedInPage(browser, "designer");
    const sizes: { url: string; type: string; bytes: number; encoding: string | null }[] = [];
    page.on("requestfinished", async (request) => {
      const response = await request.response();
      const s = await request.sizes();
      sizes.push({
        url: request.url(),
        type: request.resourceType(),
        bytes: s.responseBodySize,
        encoding: (await response?.allHeaders())?.["content-encoding"] ?? null,
      });
    });
    await page.goto(`${baseUrl}/runs/${run.id}`, { waitUntil: "networkidle" });
    // Islands below the fold load when they come into view: scroll through the page first.
    for (let y = 0; y < 12; y++) await page.mouse.wheel(0, 900);
    await page.waitForLoadState("networkidle");
    await page.waitForFunction(() => !document.querySelector("astro-island[ssr]"));
    const byType: Record<string, number> = {};
    for (const s of sizes) byType[s.type] = (byType[s.type] ?? 0) + s.bytes;
    writeFileSync(
      join(screenshotDir, "run-page-transfer.json"),
      JSON.stringify({ run: run.id, byType, requests: sizes }, null, 2),
    );
    expect(byType.script).toBeGreaterThan(0);
    expect(byType.script).toBeLessThan(200_000);
    for (const s of sizes.filter(
      (x) => (x.type === "script" || x.type === "stylesheet" || x.type === "document") && x.bytes > 1024,
    )) {
      expect(s.encoding, s.url).toMatch(/^(br|gzip)$/);
    }
  });
});
