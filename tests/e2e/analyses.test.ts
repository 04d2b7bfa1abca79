import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, DEMO, launchBrowser, SCREENSHOTS, signIn } from "./browser";

let browser: Browser;
let analysisUrl = "";

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("analyses in the browser", () => {
  it("starts a hotspot scan on the demo dataset, waits for it, reads a pixel, switches to galactic and exports a PNG", async () => {
    const context = await browser.newContext({ acceptDownloads: true, viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signIn(page, DEMO.analyst.email, DEMO.analyst.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/analyses/new`);
    await page.locator("form[data-hydrated=true]").waitFor();
    await page.getByLabel("Dataset", { exact: true }).selectOption({ label: "Quebrada Alta 2023-2024 (demo) (40,000 events)" });
    await page.getByLabel("Window radii (°)").fill("10, 15");
    await page.getByLabel("Window centres (Nside)").selectOption("32");
    await page.getByLabel("Isotropic trial skies").fill("40");
    await page.getByLabel("Name").fill("Browser test scan");
    await page.getByRole("button", { name: "Start analysis" }).click();
    await page.waitForURL(/\/analyses\/\d+$/);
    analysisUrl = page.url();
    await page.getByTestId("local-significance").waitFor({ timeout: 180_000 });
    const local = await page.getByTestId("local-significance").textContent();
    const post = await page.getByTestId("post-trial").textContent();
    expect(local).toMatch(/Local \(pre-trial\)/);
    expect(post).toMatch(/Trials counted: 2 radii x 1 energy thresholds x 12288 windows/);
    expect(await page.getByText(/Preliminary\./).count()).toBeGreaterThan(0);
    const map = page.getByRole("application").first();
    await map.waitFor();
    await page.waitForTimeout(500);
    const box = (await map.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.4);
    await page.getByTestId("pixel-readout").getByText(/N_on \d+, N_exp [\d.]+, local significance -?[\d.]+σ/).waitFor();
    await page.mouse.click(box.x + box.width * 0.5, box.y + box.height * 0.4);
    await page.getByTestId("pinned-window").getByText(/events within 15° of the pinned window|events within 10° of the pinned window/).waitFor();
    await page.screenshot({ path: `${SCREENSHOTS}/analysis-equatorial.png`, fullPage: true });
    await page.getByLabel("Frame").selectOption("galactic");
    await page.waitForTimeout(500);
    await page.screenshot({ path: `${SCREENSHOTS}/analysis-galactic.png`, fullPage: true });
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: /Download the map as PNG/ }).first().click()]);
    expect(download.suggestedFilename()).toMatch(/^analysis-\d+-significance\.png$/);
    expect(await page.getByTestId("cluster-table").locator("tbody tr").count()).toBeGreaterThan(0);
    await page.getByLabel("Share with a referee (read and reproduce only)").fill(DEMO.referee.email);
    await page.getByRole("button", { name: "Share", exact: true }).click();
    await page.getByText(/analysis\.share/).waitFor();
    await context.close();
  }, 240_000);

  it("lets the referee reproduce the shared scan and see the match", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, DEMO.referee.email, DEMO.referee.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(analysisUrl);
    await page.getByRole("button", { name: "Reproduce" }).click();
    await page.getByTestId("reproduction-match").waitFor({ timeout: 180_000 });
    await page.screenshot({ path: `${SCREENSHOTS}/analysis-reproduced.png`, fullPage: true });
    expect(await page.getByRole("button", { name: "Start analysis" }).count()).toBe(0);
    await context.close();
  }, 240_000);

  it("does not show the unpublished scan to the member", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, DEMO.member.email, DEMO.member.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(analysisUrl);
    await page.locator("[data-testid=forbidden]:visible").waitFor();
    await context.close();
  });
});
