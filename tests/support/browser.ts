// Debian's Chromium driven by playwright-core, for the browser tests.
import { chromium, type Browser, type Page } from "playwright-core";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { baseUrl, demoEmail, demoPassword, type DemoRole } from "./http";

export const screenshotDir = join(import.meta.dirname, "..", "output");
mkdirSync(screenshotDir, { recursive: true });

export function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

/** Opens a fresh context and signs in through the sign-in form, as a person would. */
export async function signedInPage(browser: Browser, role: DemoRole): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
  const page = await context.newPage();
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel("E-mail").fill(demoEmail(role));
  await page.getByLabel("Password").fill(demoPassword);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${baseUrl}/`);
  return page;
}
