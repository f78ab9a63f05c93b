// Sign-off and studies in Chromium: on the demo hand-off the seed creates, the study shows its
// decision record and the reviewer finds the pending v2 on the overview, cannot send it back
// without a reason, answers in the thread and sends it back; on a table of its own sent back
// through the API, the designer sees why. The tests pass in any order or alone.
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launch, screenshotDir, signedInPage } from "../support/browser";
import { baseUrl, signIn } from "../support/http";
import { computedTable, decideSignOff, population, requestSignOff, unique } from "../integration/handoff.fixture";

let browser: Browser;
const hydrated = (page: Page) => page.waitForFunction(() => document.querySelector("astro-island[ssr]") === null);

beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("sign-off in the browser (demo hand-off)", () => {
  it("the designer sees the study's decision record and its headroom against complexity", async () => {
    const page = await signedInPage(browser, "designer");
    await page.goto(`${baseUrl}/studies`);
    await page.getByRole("link", { name: "QL-48 backplane lanes: how much equalization" }).click();
    await hydrated(page);
    expect(await page.getByTestId("decision-record").textContent()).toMatch(/keeps [\d.]+ mV on the worst lane/);
    expect(
      await page.getByRole("img", { name: "Limiter headroom against complexity" }).locator("[data-candidate]").count(),
    ).toBe(5);
    expect(await page.getByTestId("candidate-table").locator("tbody tr").count()).toBe(5);
    await page.screenshot({ path: join(screenshotDir, "study.png"), fullPage: true });
    await page.context().close();
  });

  it("the reviewer needs a reason to send back, answers in the thread, and sends v2 back", async () => {
    const page = await signedInPage(browser, "reviewer");
    await page.getByTestId("pending-signoffs").getByRole("link", { name: "QL-48 backplane lane defaults v2" }).click();
    await page.waitForURL(/\/sign-off\/\d+$/);
    await hydrated(page);
    expect(await page.getByTestId("signoff-decision-record").textContent()).toMatch(
      /keeps [\d.]+ mV on the worst lane/,
    );
    expect(await page.getByTestId("all-pass").count()).toBe(1);

    await page.getByRole("button", { name: "Send back" }).click();
    await expect
      .poll(() => page.getByRole("form", { name: "Decision" }).getByRole("alert").textContent())
      .toMatch(/Say what must change/);

    const comment = page.getByRole("form", { name: "Comment" });
    await comment.getByLabel("Comment text").fill("Why does the short class get its own default now?");
    await comment.getByLabel("About channel").selectOption({ index: 1 });
    await comment.getByRole("button", { name: "Comment" }).click();
    await page
      .getByRole("list", { name: "Comments" })
      .getByText("Why does the short class get its own default now?")
      .waitFor();
    await page.locator("[data-comment]").last().getByRole("button", { name: "Reply" }).click();
    const reply = page.getByRole("form", { name: "Reply" });
    await reply.getByLabel("Reply text").fill("Noting for the record: asked the designer in the meeting.");
    await reply.getByRole("button", { name: "Reply" }).click();
    await page.screenshot({ path: join(screenshotDir, "signoff-thread.png"), fullPage: true });
    await expect.poll(() => page.locator("[data-comment] [data-comment]").count()).toBe(1);
    expect(await page.locator("[data-comment] [data-comment]").textContent()).toMatch(/Noting for the record/);

    await page
      .getByRole("form", { name: "Decision" })
      .getByLabel(/Comment/)
      .fill("Keep two classes until the lab has the short lane's eye scan.");
    await page.getByRole("button", { name: "Send back" }).click();
    await page.getByTestId("signoff-state").filter({ hasText: "Sent back" }).waitFor();
    await page.screenshot({ path: join(screenshotDir, "signoff-sent-back.png"), fullPage: true });
    await page.context().close();
  });

  it("the designer sees the version sent back with the reason", async () => {
    const [designer, reviewer] = await Promise.all([signIn("designer"), signIn("reviewer")]);
    const table = await computedTable(designer, await population(designer, [8, 20]), unique("Sent-back lanes"));
    await decideSignOff(
      reviewer,
      await requestSignOff(designer, reviewer, table.id),
      "reject",
      "Keep two classes until the lab has the short lane's eye scan.",
    );
    const page = await signedInPage(browser, "designer");
    await page.goto(`${baseUrl}/tables`);
    await page.getByRole("link", { name: table.name }).click();
    await hydrated(page);
    expect(await page.getByTestId("version-state").textContent()).toBe("Changes requested");
    expect(
      await page
        .getByTestId("version-header")
        .getByText("Keep two classes until the lab has the short lane's eye scan.")
        .count(),
    ).toBe(1);
    expect(await page.getByRole("form", { name: "Request sign-off" }).count()).toBe(1);
    await page.context().close();
  });

  it("the demo's v1 shows as signed off", async () => {
    const page = await signedInPage(browser, "designer");
    await page.goto(`${baseUrl}/tables`);
    await page.getByRole("link", { name: "QL-48 backplane lane defaults" }).click();
    await page.waitForURL(/\/tables\/\d+$/);
    await page.goto(`${page.url()}?v=1`);
    expect(await page.getByTestId("version-state").textContent()).toBe("Signed off");
    await page.context().close();
  });
});
