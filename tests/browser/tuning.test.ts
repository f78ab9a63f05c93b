// The main job in Chromium, as the demo designer: upload a Touchstone file (port pairing with the
// SDD21 preview), see a broken file's error inline, create a budget from a starting point, start a
// tuning run, watch it finish, and see both eyes drawn, the verdict and the metrics. Screenshots
// of the channel page and the result page go to tests/output/.
import type { Browser, Page } from "playwright-core";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launch, screenshotDir, signedInPage } from "../support/browser";
import { baseUrl, signIn } from "../support/http";
import { badFiles, files } from "../fixtures/channelFiles";
import { upload } from "../fixtures/workspace";
import { budgetPresets } from "@/features/budgets/budgetPresets";

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
const file = (name: string, text: string | Uint8Array) => ({
  name,
  mimeType: "application/octet-stream",
  buffer: Buffer.from(text),
});

/** Opens a page and waits until every island on it has hydrated. */
async function open(path: string) {
  await page.goto(`${baseUrl}${path}`);
  await page.waitForFunction(() => !document.querySelector("astro-island[ssr]"));
}

describe("channels in the browser", () => {
  it("uploads a 4-port Touchstone file after previewing SDD21 for two pairings", async () => {
    await open("/channels");
    await page
      .getByLabel("Channel file", { exact: true })
      .setInputFiles(file(`browser-lane-${stamp}.s4p`, files.s4p(20)));
    const preview = page.getByTestId("upload-preview");
    await preview.waitFor();
    await expect(preview.textContent()).resolves.toMatch(/loss at Nyquist 20\.\d dB/);
    await page.getByLabel("Port pairing").selectOption({ label: "1,3 → 2,4 (thrus 1→2 and 3→4)" });
    await page.waitForFunction(() =>
      /loss at Nyquist [4-9]\d\.\d dB/.test(document.querySelector("[data-testid=upload-preview]")?.textContent ?? ""),
    );
    await page.getByLabel("Port pairing").selectOption({ label: "1,2 → 3,4 (inputs on 1 and 2)" });
    await page.waitForFunction(() =>
      /loss at Nyquist 20\.\d dB/.test(document.querySelector("[data-testid=upload-preview]")?.textContent ?? ""),
    );
    await page.getByLabel("Name", { exact: true }).fill(`Browser lane ${stamp}`);
    await page.getByRole("button", { name: "Upload and derive the pulse" }).click();
    await page.waitForURL(/\/channels\/\d+$/);
    await expect(page.getByTestId("channel-name").textContent()).resolves.toBe(`Browser lane ${stamp}`);
    await expect(page.getByTestId("sha256").textContent()).resolves.toMatch(/^[0-9a-f]{64}$/);
    await page.getByRole("img", { name: "Pulse response" }).waitFor();
    await page.getByRole("img", { name: "Insertion loss" }).waitFor();
    expect(await page.locator("[data-series=cursors] circle").count()).toBeGreaterThan(10);
    await page.screenshot({ path: join(screenshotDir, "channel.png"), fullPage: true });
  });

  it("shows a broken file's error inline, naming the line", async () => {
    await open("/channels");
    const descending = badFiles.find((b) => b.what === "descending frequencies")!;
    await page
      .getByLabel("Channel file", { exact: true })
      .setInputFiles(file(descending.filename, descending.body() as string));
    const error = page.getByTestId("upload-error");
    await error.waitFor();
    await expect(error.textContent()).resolves.toMatch(/line 4: frequencies must ascend/);

    const nan = badFiles.find((b) => b.what === "NaN")!;
    await page.getByLabel("Channel file", { exact: true }).setInputFiles(file(nan.filename, nan.body() as string));
    await page.getByRole("button", { name: "Upload and derive the pulse" }).click();
    await page.waitForFunction(() =>
      /line 3/.test(document.querySelector("[data-testid=upload-error]")?.textContent ?? ""),
    );
    await page.screenshot({ path: join(screenshotDir, "channel-upload-error.png") });
    expect(page.url()).toBe(`${baseUrl}/channels`);
  });
});

describe("budgets in the browser", () => {
  it("creates a budget from a starting point; a wrong field is named beside it", async () => {
    await open("/budgets/new");
    await page.getByRole("button", { name: /28 Gb\/s NRZ backplane/ }).click();
    await page.getByLabel("Name", { exact: true }).fill(`Browser budget ${stamp}`);
    await page.getByLabel("Transmit swing (mVppd)").fill("-5");
    await page.getByRole("button", { name: "Create budget" }).click();
    await page.locator("#budget-txSwing_Vppd[aria-invalid=true]").waitFor();
    await page.getByLabel("Transmit swing (mVppd)").fill("800");
    await page.getByRole("button", { name: "Create budget" }).click();
    await page.waitForURL(/\/budgets\/\d+\?saved=1$/);
    await expect(page.getByTestId("budget-name").textContent()).resolves.toBe(`Browser budget ${stamp}`);
  });
});

/** Painted (non-blank) pixels of a canvas. */
function paintedPixels(testId: string): Promise<number> {
  return page.evaluate((id) => {
    const canvas = document.querySelector<HTMLCanvasElement>(`[data-testid=${id}]`);
    if (!canvas || canvas.width === 0) return 0;
    const data = canvas.getContext("2d")!.getImageData(0, 0, canvas.width, canvas.height).data;
    let n = 0;
    for (let i = 0; i < data.length; i += 4)
      if (data[i + 3] > 0 && (data[i] < 250 || data[i + 1] < 250 || data[i + 2] < 250)) n++;
    return n;
  }, testId);
}

describe("a tuning run in the browser", () => {
  it("starts from the budget page, shows progress, and ends on the result: both eyes drawn, the verdict, the metrics", async () => {
    // Its own channel (the 20 dB four-port file) and budget (the NRZ backplane starting point), made through the API.
    const designer = await signIn("designer");
    const laneName = `Run lane ${stamp}`;
    const channel = await upload(designer, "/api/v1/channels", `run-lane-${stamp}.s4p`, files.s4p(20), {
      name: laneName,
      bitRate_bps: "28e9",
      pairs: "1,2,3,4",
    });
    expect(channel.status, await channel.clone().text()).toBe(201);
    const backplane = budgetPresets.find((p) => p.key === "nrz28-backplane")!;
    const made = await designer.send("POST", "/api/v1/budgets", { name: `Run budget ${stamp}`, ...backplane.budget });
    expect(made.status, await made.clone().text()).toBe(201);
    await open(`/budgets/${(await made.json()).id}`);
    const option = await page.locator("option", { hasText: laneName }).getAttribute("value");
    await page.getByLabel("Channel", { exact: true }).selectOption(option!);
    await page.getByRole("button", { name: "Start tuning run" }).click();
    await page.waitForURL(/\/runs\/\d+$/);
    // The run takes seconds, so the page opens on the progress bar and then reloads onto the result.
    if ((await page.getByTestId("run-status").textContent()) !== "Done")
      await page.getByRole("progressbar", { name: "Run progress" }).waitFor();
    await page.getByTestId("verdict").waitFor({ timeout: 60_000 });
    await expect(page.getByTestId("run-status").textContent()).resolves.toBe("Done");
    await expect.poll(() => paintedPixels("eye-before")).toBeGreaterThan(1000);
    await expect.poll(() => paintedPixels("eye-after")).toBeGreaterThan(1000);
    await expect(page.getByTestId("verdict").textContent()).resolves.toMatch(
      /All clear|Linear reach exhausted|does not close/,
    );
    const metrics = await page.getByTestId("metrics").textContent();
    for (const words of [
      "Eye height",
      "Eye width",
      "Limiter headroom",
      "Residual ISI",
      "CTLE noise gain",
      "Transmit FIR",
    ])
      expect(metrics).toContain(words);
    expect(await page.getByTestId("dfe-taps").locator("tbody tr").count()).toBe(5);
    // Each sampling policy explains itself in a tooltip, the one used is marked; DFE error propagation
    // has its row and its sentence in the verdict; the eyes say which noise and jitter they carry.
    const policyRow = page.getByTestId("sampling-policy");
    for (const key of ["centre", "max-height", "mueller-muller"]) {
      await expect(policyRow.locator(`[data-policy="${key}"]`).getAttribute("title")).resolves.toMatch(/^.{60,}$/);
    }
    expect(await policyRow.locator('[aria-current="true"]').count()).toBe(1);
    await expect(page.getByTestId("error-propagation").textContent()).resolves.toMatch(
      /BER ×\d|not modelled|not measured/,
    );
    await expect(page.getByTestId("verdict").textContent()).resolves.toMatch(/error propagation/i);
    await expect(page.getByRole("region", { name: "Eyes" }).textContent()).resolves.toMatch(/mV rms noise/);
    await page.getByRole("img", { name: "Bathtub" }).waitFor();
    await page.getByRole("img", { name: "DFE tap trajectories" }).waitFor();
    await page.getByRole("img", { name: "Transmit tap trajectories" }).waitFor();
    await page.screenshot({ path: join(screenshotDir, "run-result.png"), fullPage: true });
  });

  it("the demo's long lane shows Linear reach exhausted with the fewest DFE taps; its short lane the all-clear", async () => {
    await open("/runs");
    const rows = page.getByTestId("run-table").locator("tbody tr");
    await rows
      .filter({ hasText: "Slot 11 lane 2" })
      .first()
      .getByRole("link", { name: /^#\d+$/ })
      .click();
    await page.waitForURL(/\/runs\/\d+$/);
    const verdict = page.getByTestId("verdict");
    await expect(verdict.getAttribute("data-verdict")).resolves.toBe("exhausted");
    await expect(verdict.locator("h2").textContent()).resolves.toBe("Linear reach exhausted");
    await expect(page.getByTestId("fewest-dfe-taps").textContent()).resolves.toMatch(/fewest DFE taps: \d+/);
    await page.screenshot({ path: join(screenshotDir, "run-linear-reach-exhausted.png"), fullPage: true });

    await open("/runs");
    await rows
      .filter({ hasText: "Slot 2 lane 0" })
      .last()
      .getByRole("link", { name: /^#\d+$/ })
      .click();
    await page.waitForURL(/\/runs\/\d+$/);
    await expect(verdict.getAttribute("data-verdict")).resolves.toBe("clear");
    await expect(verdict.locator("h2").textContent()).resolves.toMatch(/^All clear/);
  });
});
