// The input checks in Chromium: a Touchstone file that gains energy and stops below the baud rate
// is named on the upload preview, on the channel page and on a tuning run of that channel.
// Screenshots go to tests/output/.
import type { Browser, Page } from "playwright-core";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launch, screenshotDir, signedInPage } from "../support/browser";
import { baseUrl, signIn } from "../support/http";
import { files } from "../fixtures/channelFiles";

let browser: Browser;
let page: Page;
beforeAll(async () => {
  browser = await launch();
  page = await signedInPage(browser, "designer");
});
afterAll(async () => {
  await browser?.close();
});

const stamp = Date.now().toString(36);

describe("input warnings in the browser", () => {
  it("shows the findings on the preview, the channel page and a run's page", async () => {
    await page.goto(`${baseUrl}/channels`);
    await page.waitForFunction(() => !document.querySelector("astro-island[ssr]"));
    await page.getByLabel("Channel file", { exact: true }).setInputFiles({
      name: `hot-${stamp}.s2p`,
      mimeType: "application/octet-stream",
      buffer: Buffer.from(files.hotShortS2p()),
    });
    // A Touchstone file is previewed as soon as it is chosen.
    const warnings = page.getByTestId("upload-preview").getByTestId("input-warnings");
    await warnings.waitFor();
    await expect(warnings.textContent()).resolves.toMatch(
      /not passive: the largest singular value of S reaches 1\.0800/,
    );
    await expect(warnings.textContent()).resolves.toMatch(/0\.71× the baud rate/);
    await page.getByTestId("upload-preview").screenshot({ path: join(screenshotDir, "input-warnings-preview.png") });

    await page.getByLabel("Name", { exact: true }).fill(`Hot lane ${stamp}`);
    await page.getByRole("button", { name: "Upload and derive the pulse" }).click();
    await page.waitForURL(/\/channels\/\d+$/);
    const channelId = Number(page.url().split("/").pop());
    const onChannel = page.getByTestId("input-quality");
    await expect(onChannel.textContent()).resolves.toMatch(/not passive \(largest singular value 1\.0800\)/);
    await expect(
      onChannel.locator("li[data-code]").evaluateAll((els) => els.map((e) => e.getAttribute("data-code"))),
    ).resolves.toEqual(["not-passive", "band-below-baud"]);
    await page.screenshot({ path: join(screenshotDir, "input-warnings-channel.png"), fullPage: true });

    const designer = await signIn("designer");
    const budgets = (await (await designer.get("/api/v1/budgets?limit=50")).json()).items as {
      id: number;
      modulation: string;
    }[];
    const budget = budgets.find((b) => b.modulation === "nrz") ?? budgets[0];
    const run = await (await designer.send("POST", "/api/v1/runs", { channelId, budgetId: budget.id })).json();
    await page.goto(`${baseUrl}/runs/${run.id}`);
    const onRun = page.getByTestId("run-input-warnings");
    await expect(onRun.textContent()).resolves.toMatch(/2 findings that limit what this run can claim/);
    await expect(onRun.textContent()).resolves.toMatch(/singular value of S reaches 1\.0800 at .*GHz/);
    await onRun.screenshot({ path: join(screenshotDir, "input-warnings-run.png") });
  });
});
