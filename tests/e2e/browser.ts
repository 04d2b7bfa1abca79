import { mkdirSync } from "node:fs";
import { chromium, type Browser, type Page } from "playwright-core";

export const BASE_URL = process.env.E2E_BASE_URL ?? "http://127.0.0.1:3100";
export const SCREENSHOTS = "tests/e2e/screenshots";

/** Debian's Chromium, headless, with the network chatter it would otherwise attempt turned off. */
export async function launchBrowser(): Promise<Browser> {
  mkdirSync(SCREENSHOTS, { recursive: true });
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--disable-background-networking",
      "--disable-component-update", "--disable-sync", "--no-first-run"],
  });
}

export const DEMO = {
  admin: { email: "admin@demo.siderea.test", password: "siderea-admin", label: "Administrator" },
  analyst: { email: "analyst@demo.siderea.test", password: "siderea-analyst", label: "Analyst" },
  referee: { email: "referee@demo.siderea.test", password: "siderea-referee", label: "Referee" },
  member: { email: "member@demo.siderea.test", password: "siderea-member", label: "Member" },
} as const;

/** Signs in through the sign-in form, as a person would. */
export async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto(`${BASE_URL}/sign-in`);
  await page.locator("form[data-hydrated=true]").waitFor();
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}
