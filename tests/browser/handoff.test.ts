// The hand-off in Chromium: the designer builds a tap table and asks for sign-off; the reviewer
// comments and approves; the version shows as signed off; firmware downloads the C header; the
// printable report shows the decision. Each step starts from a table of its own, made through the
// API up to where the step begins, so the steps pass in any order or alone. Screenshots go to
// tests/output/ for people to look at.
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launch, screenshotDir, signedInPage } from "../support/browser";
import { baseUrl, signIn, type Client } from "../support/http";
import {
  computedTable,
  decideSignOff,
  population,
  requestSignOff,
  unique,
  type Population,
} from "../integration/handoff.fixture";

let browser: Browser;

/** Waits until every island of the page has hydrated (inputs filled before that would be reset). */
const hydrated = (page: Page) => page.waitForFunction(() => document.querySelector("astro-island[ssr]") === null);
let pop: Population;
let designer: Client;
let reviewer: Client;

beforeAll(async () => {
  browser = await launch();
  [designer, reviewer] = await Promise.all([signIn("designer"), signIn("reviewer")]);
  pop = await population(designer, [7, 13, 19, 25]);
});
afterAll(async () => {
  await browser?.close();
});

describe("the hand-off from designer to reviewer to firmware", () => {
  it("the designer builds a tap table and requests a sign-off", async () => {
    const tableName = unique("Quillfeather lanes");
    const page = await signedInPage(browser, "designer");
    await page.goto(`${baseUrl}/tables/new`);
    const form = page.getByRole("form", { name: "Build a tap table" });
    await hydrated(page);
    await form.getByLabel("Name", { exact: true }).fill(tableName);
    await form.getByLabel("Budget").selectOption({ label: pop.budgetName });
    await form.getByLabel("Picked by hand").check();
    await form.getByLabel("DFE taps").fill("1");
    await form.getByRole("button", { name: "None" }).click();
    for (const name of pop.names) await form.getByLabel(name, { exact: true }).check();
    await form.getByLabel("Bin edges in dB").fill("16");
    await expect.poll(async () => form.getByTestId("class-preview").locator("li").count()).toBe(2);
    await expect(form.getByTestId("register-map").textContent()).resolves.toContain("dfe[1]");
    expect(await form.getByLabel("Name of dfe[1]").inputValue()).toBe("dfe_tap1");
    await page.screenshot({ path: join(screenshotDir, "table-builder.png"), fullPage: true });
    await form.getByRole("button", { name: "Compute v1" }).click();
    await page.waitForURL(/\/tables\/\d+$/);
    await page.getByTestId("version-state").filter({ hasText: "Ready for sign-off" }).waitFor({ timeout: 90_000 });
    await hydrated(page);
    expect(await page.getByTestId("class-table").locator("tbody tr").count()).toBe(2);
    await page.screenshot({ path: join(screenshotDir, "table-version.png"), fullPage: true });

    const ask = page.getByRole("form", { name: "Request sign-off" });
    await ask.getByLabel("Reviewer").selectOption({ label: "Jun Castellanos (reviewer)" });
    await ask.getByLabel("Message (optional)").fill("Two classes split at 16 dB; please check the 25 dB lane.");
    await ask.getByRole("button", { name: "Request sign-off of v1" }).click();
    await page.waitForURL(/\/sign-off\/\d+$/);
    expect(await page.getByTestId("signoff-state").textContent()).toBe("Awaiting decision");
    await page.context().close();
  });

  it("the reviewer sees headroom against the requirement, comments, and approves", async () => {
    const table = await computedTable(designer, pop, unique("Quillfeather review"));
    const signOffId = await requestSignOff(
      designer,
      reviewer,
      table.id,
      "Two classes split at 16 dB; please check the 25 dB lane.",
    );
    const page = await signedInPage(browser, "reviewer");
    await page.goto(`${baseUrl}/sign-off`);
    await page
      .getByTestId("waiting-for-me")
      .getByRole("link", { name: `${table.name} v1` })
      .click();
    await page.waitForURL(`${baseUrl}/sign-off/${signOffId}`);
    await hydrated(page);
    expect(await page.getByTestId("caution").textContent()).toMatch(/lab confirmation on real hardware/);
    expect(await page.getByTestId("review-table").locator("tbody tr").count()).toBe(4);
    const comment = page.getByRole("form", { name: "Comment" });
    await comment.getByLabel("Comment text").fill("The 25 dB lane keeps its margin with the default; fine by me.");
    await comment.getByRole("button", { name: "Comment" }).click();
    await page.getByRole("list", { name: "Comments" }).getByText("fine by me.").waitFor();
    await page.screenshot({ path: join(screenshotDir, "signoff-review.png"), fullPage: true });
    await page
      .getByRole("form", { name: "Decision" })
      .getByLabel(/Comment/)
      .fill("Checked every lane against the required headroom.");
    await page.getByRole("button", { name: "Approve and freeze v1" }).click();
    await page.getByTestId("signoff-state").filter({ hasText: "Approved" }).waitFor();
    await page.context().close();
  });

  it("the version shows as signed off, and firmware downloads the C header", async () => {
    const table = await computedTable(designer, pop, unique("Quillfeather signed"));
    await decideSignOff(
      reviewer,
      await requestSignOff(designer, reviewer, table.id),
      "approve",
      "Checked every lane against the required headroom.",
    );
    const tableUrl = `${baseUrl}/tables/${table.id}`;
    const page = await signedInPage(browser, "firmware");
    await page.goto(tableUrl);
    await hydrated(page);
    expect(await page.getByTestId("version-state").textContent()).toBe("Signed off");
    expect(await page.getByText("this version is frozen").count()).toBe(1);
    expect(await page.getByRole("form", { name: "Request sign-off" }).count()).toBe(0);
    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByTestId("exports").getByRole("link", { name: "C header" }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/_v1\.h$/);
    const text = readFileSync((await download.path())!, "utf8");
    expect(text).toMatch(/signed off/);
    expect(text).toMatch(/#define TW_\w+_SIGNED_OFF 1/);
    expect(text).toContain("_defaults[");
    await page.screenshot({ path: join(screenshotDir, "table-signed-off.png"), fullPage: true });

    await page.goto(`${tableUrl.replace("/tables/", "/reports/tables/")}/1`);
    expect(await page.getByTestId("report-state").textContent()).toMatch(/Signed off by Jun Castellanos/);
    expect(await page.getByTestId("report-decision").textContent()).toMatch(/Checked every lane/);
    await page.screenshot({ path: join(screenshotDir, "table-report.png"), fullPage: true });
    await page.context().close();
  });
});
