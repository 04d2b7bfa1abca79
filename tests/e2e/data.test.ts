import { existsSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, DEMO, launchBrowser, SCREENSHOTS, signIn } from "./browser";

let browser: Browser;
// Written by the demo seeder (scripts/seed-demo-data.ts) when the end-to-end database is seeded.
const LATER_BATCH = ".siderea/demo/quebrada-alta-later-batch.csv";

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("data pages in the browser", () => {
  it("shows the seeded demo dataset with its distributions", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, DEMO.analyst.email, DEMO.analyst.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/data`);
    await page.getByRole("link", { name: "Quebrada Alta 2023-2024 (demo)" }).click();
    await page.getByTestId("dataset-events").waitFor();
    expect(await page.getByTestId("dataset-events").textContent()).toBe("40,000");
    expect(await page.getByRole("img", { name: /Declination against the analytic exposure/ }).count()).toBe(1);
    await page.screenshot({ path: `${SCREENSHOTS}/dataset-demo.png`, fullPage: true });
    await context.close();
  });

  it("uploads a CSV through the form, maps its columns, follows the progress and opens the dataset page", async () => {
    expect(existsSync(LATER_BATCH)).toBe(true);
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, DEMO.analyst.email, DEMO.analyst.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/data/upload`);
    await page.locator("form[data-hydrated=true]").waitFor();
    await page.getByLabel("Event list: CSV or gzip-compressed CSV").setInputFiles(LATER_BATCH);
    await page.getByTestId("preview-table").waitFor();
    // The mapping step guessed the canonical columns; check and set one explicitly.
    expect(await page.getByLabel("Zenith (°)").inputValue()).toBe("zenith");
    await page.getByLabel("Time", { exact: true }).selectOption("time");
    await page.getByLabel("Dataset name").fill("Later batch uploaded in the browser");
    await page.screenshot({ path: `${SCREENSHOTS}/upload-mapping.png`, fullPage: true });
    await page.getByRole("button", { name: "Upload and store" }).click();
    await page.getByRole("link", { name: "Open the dataset" }).waitFor({ timeout: 60_000 });
    expect(await page.getByTestId("rows-stored").textContent()).toBe("4,000");
    await page.screenshot({ path: `${SCREENSHOTS}/upload-done.png`, fullPage: true });
    await page.getByRole("link", { name: "Open the dataset" }).click();
    await page.getByTestId("dataset-events").waitFor();
    expect(await page.getByTestId("dataset-events").textContent()).toBe("4,000");
    await context.close();
  });

  it("refuses the member the data pages", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, DEMO.member.email, DEMO.member.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/data/upload`);
    await page.locator("[data-testid=forbidden]:visible").waitFor();
    await page.goto(`${BASE_URL}/data`);
    await page.locator("[data-testid=forbidden]:visible").waitFor();
    await context.close();
  });
});
