// The app shell in Chromium: signing in through the form, the sections, the person and role,
// and what a reviewer does not see.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launch, screenshotDir, signedInPage } from "../support/browser";
import { baseUrl } from "../support/http";
import { join } from "node:path";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("the shell", () => {
  it("the demo designer signs in and sees the sections, their name and role", async () => {
    const page = await signedInPage(browser, "designer");
    const nav = page.getByRole("navigation", { name: "Sections" });
    for (const label of ["Channels", "Budgets", "Tuning runs", "Architecture studies", "Tap tables", "Sign-off"]) {
      await expect(nav.getByRole("link", { name: label, exact: true }).count()).resolves.toBe(1);
    }
    expect(await nav.getByRole("link", { name: "Admin" }).count()).toBe(0);
    expect(await page.getByTestId("user-name").textContent()).toBe("Tomas Ekwueme");
    expect(await page.getByTestId("user-role").textContent()).toBe("Designer");
    await page.screenshot({ path: join(screenshotDir, "home-designer.png"), fullPage: true });
    await page.context().close();
  });

  it("a wrong password shows a message that does not say which part was wrong", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseUrl}/sign-in`);
    await page.getByLabel("E-mail").fill("designer@tapwright.test");
    await page.getByLabel("Password").fill("wrong-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("alert").textContent()).resolves.toMatch(/do not match an account/);
    await page.close();
  });

  it("a reviewer sees no designer-only actions and no admin section", async () => {
    const page = await signedInPage(browser, "reviewer");
    expect(await page.getByRole("link", { name: "Admin" }).count()).toBe(0);
    expect(await page.getByTestId("role-part").textContent()).toMatch(/approve or send back/);
    await page.context().close();
  });

  it("signing out returns to the sign-in page and the session is gone", async () => {
    const page = await signedInPage(browser, "firmware");
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(`${baseUrl}/sign-in`);
    await page.goto(`${baseUrl}/`);
    expect(page.url()).toBe(`${baseUrl}/sign-in`);
    await page.context().close();
  });
});
