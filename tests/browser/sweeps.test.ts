// A corner sweep in Chromium, as the demo designer: define it (two channels, the nominal corner plus
// a preset that says where its numbers come from), watch its progress, and read the heat map — one
// cell per pair, each channel's binding corner outlined and listed as its worst case. The page's
// figures are checked against the API's. Screenshot to tests/output/sweep.png.
import type { Browser, Page } from "playwright-core";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launch, screenshotDir, signedInPage } from "../support/browser";
import { baseUrl, signIn } from "../support/http";

let browser: Browser;
let page: Page;
beforeAll(async () => {
  browser = await launch();
  page = await signedInPage(browser, "designer");
});
afterAll(async () => {
  await browser?.close();
});

describe("sweeps in the browser", () => {
  it("creates a sweep from the form, shows its progress, then the heat map with the binding corners", async () => {
    await page.goto(`${baseUrl}/sweeps`);
    await page.waitForFunction(() => !document.querySelector("astro-island[ssr]"));
    const name = `Browser sweep ${Date.now().toString(36)}`;
    await page.getByLabel("Name", { exact: true }).fill(name);
    await page.getByLabel("Budget").selectOption({ label: "28 Gb/s NRZ backplane" });
    await page.getByRole("button", { name: "None" }).click();
    const boxes = page.locator("fieldset", { hasText: "Channels" }).getByRole("checkbox");
    await boxes.nth(0).check();
    await boxes.nth(1).check();
    const preset = page
      .getByRole("list", { name: "Corner presets" })
      .getByRole("listitem")
      .filter({ hasText: "Loss ±10 %" });
    await expect(preset.textContent()).resolves.toMatch(/common practice/);
    await page.getByRole("button", { name: "Add the preset Loss ±10 %" }).click();
    await expect(page.getByTestId("pair-count").textContent()).resolves.toMatch(/2 channels × 3 corners = 6 pairs/);
    await page.getByRole("button", { name: "Start sweep" }).click();
    await page.waitForURL(/\/sweeps\/\d+$/);
    const id = Number(page.url().split("/").pop());

    // Progress while it computes (it may also finish before the first look): done of all, and the time left.
    const progress = page.getByTestId("sweep-progress");
    if (await progress.isVisible()) await expect(progress.textContent()).resolves.toMatch(/of 6 pairs/);

    const heatmap = page.getByRole("img", { name: "Limiter headroom per channel and corner" });
    await heatmap.waitFor({ timeout: 120_000 });
    await page.waitForFunction(
      () =>
        document.querySelectorAll("[data-testid=sweep-heatmap] [data-headroom-mv]").length === 6 &&
        !document.querySelector("[data-testid=sweep-progress]"),
      undefined,
      { timeout: 120_000 },
    );
    await page.waitForFunction(() => !document.querySelector("astro-island[ssr]"));
    const cells = await page.locator("[data-testid=sweep-heatmap] [data-headroom-mv]").evaluateAll((els) =>
      els.map((e) => ({
        channel: e.getAttribute("data-channel"),
        corner: e.getAttribute("data-corner"),
        mV: Number(e.getAttribute("data-headroom-mv")),
        binding: e.getAttribute("data-binding") === "true",
      })),
    );
    expect(cells).toHaveLength(6);
    expect(new Set(cells.map((c) => c.corner))).toEqual(new Set(["nominal", "loss −10 %", "loss +10 %"]));
    // One binding corner per channel, at its lowest headroom.
    for (const channel of new Set(cells.map((c) => c.channel))) {
      const mine = cells.filter((c) => c.channel === channel);
      const bound = mine.filter((c) => c.binding);
      expect(bound).toHaveLength(1);
      expect(bound[0].mV).toBe(Math.min(...mine.map((c) => c.mV)));
    }
    // The page's cells are the API's numbers.
    const api = await (await (await signIn("designer")).get(`/api/v1/sweeps/${id}`)).json();
    for (const r of api.results as { corner: string; channelId: number; limiterHeadroom_V: number }[]) {
      const channelName = api.channels.find((c: { id: number; name: string }) => c.id === r.channelId).name;
      const cell = cells.find((c) => c.channel === channelName && c.corner === r.corner)!;
      expect(cell.mV).toBeCloseTo(r.limiterHeadroom_V * 1e3, 9);
    }
    expect(await page.getByTestId("worst-table").locator("tbody tr").count()).toBe(2);
    await page.getByRole("img", { name: "Histogram of limiter headroom over all pairs" }).waitFor();
    await page.screenshot({ path: join(screenshotDir, "sweep.png"), fullPage: true });
  });
});
