import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, DEMO, launchBrowser, SCREENSHOTS, signIn } from "./browser";

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** The band edges the page shows, as numbers of degrees ("+28.6°" -> 28.6, "−90.0°" -> -90). */
async function bandEdges(page: Page): Promise<[number, number]> {
  const read = async (id: string) => Number((await page.getByTestId(id).textContent())!.replace("−", "-").replace("°", ""));
  return [await read("band-min"), await read("band-max")];
}

/** The covered band of the geometry: [lat - zenith_max, lat + zenith_max] clipped to [-90, 90] (Sommers 2001; METHODS sec. 8). */
const formulaBand = (lat: number, zm: number): [number, number] => [Math.max(-90, lat - zm), Math.min(90, lat + zm)];

describe("the coverage planner in the browser", () => {
  it("moves the band edge with the zenith-cut slider as the formula says, clips it at the pole, and keeps bad input", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 1000 } });
    const page = await context.newPage();
    await signIn(page, DEMO.member.email, DEMO.member.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/coverage`);
    await page.locator("[data-testid=coverage-planner][data-hydrated=true]").waitFor();
    expect(await bandEdges(page)).toEqual(formulaBand(-31.4, 60));

    // Keyboard: ten steps of 0.5° to the right on the slider.
    const slider = page.getByLabel("Zenith cut slider (°)");
    await slider.focus();
    for (let k = 0; k < 10; k++) await slider.press("ArrowRight");
    const zm = Number(await page.getByLabel("Zenith cut (°)", { exact: true }).inputValue());
    expect(zm).toBe(65);
    const [lo, hi] = await bandEdges(page);
    const [flo, fhi] = formulaBand(-31.4, zm);
    expect(lo).toBe(flo);
    expect(hi).toBeCloseTo(fhi, 1);
    expect(await page.getByTestId("sky-fraction").textContent()).toBe(`${(((Math.sin((fhi * Math.PI) / 180) - Math.sin((flo * Math.PI) / 180)) / 2) * 100).toFixed(1)}% of the sky`);
    await page.screenshot({ path: `${SCREENSHOTS}/coverage-slider.png`, fullPage: true });

    // A northern site whose band reaches the north pole: the upper edge is clipped at +90°.
    await page.getByLabel("Site latitude (°, north +)").fill("40");
    expect(await bandEdges(page)).toEqual([-25, 90]);

    // Bad input is kept, explained, and the last valid figures stay on screen.
    await page.getByLabel("Zenith cut (°)", { exact: true }).fill("95");
    await page.getByText("The zenith cut is at most 90°.").waitFor();
    expect(await page.getByLabel("Zenith cut (°)", { exact: true }).inputValue()).toBe("95");
    await page.getByText(/Showing the last valid values/).waitFor();
    expect(await bandEdges(page)).toEqual([-25, 90]);
    await page.getByLabel("Zenith cut (°)", { exact: true }).fill("30");
    expect(await bandEdges(page)).toEqual([10, 70]);

    const timing = await page.getByTestId("timing").textContent();
    console.log(`coverage planner timing (member, Nside 64): ${timing}`);
    expect(timing).toMatch(/Recomputed in [\d.]+ ms/);
    // Members may plan but not save.
    expect(await page.getByRole("button", { name: "Save configuration" }).count()).toBe(0);
    await context.close();
  }, 120_000);

  it("compares two configurations on one plot and as a difference map, lists directions, saves one and offers it to analyses", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 1000 } });
    const page = await context.newPage();
    await signIn(page, DEMO.analyst.email, DEMO.analyst.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/coverage`);
    await page.locator("[data-testid=coverage-planner][data-hydrated=true]").waitFor();

    await page.getByRole("button", { name: "Add a configuration to compare" }).click();
    await page.getByLabel("Name on the plot").fill("Northern twin");
    await page.getByLabel("Site latitude (°, north +)").fill("39.3");
    await page.getByLabel("Zenith cut (°)", { exact: true }).fill("80");
    expect(await bandEdges(page)).toEqual(formulaBand(39.3, 80).map((x) => Math.round(x * 10) / 10));
    const legend = page.getByRole("list", { name: "Legend" });
    expect(await legend.locator("li").allTextContents()).toEqual(["Configuration A (solid)", "Northern twin (dashed)"]);
    await page.getByTestId("map-difference").waitFor();

    // Directions: the defaults plus one typed in; a bad one is refused and the typed text kept.
    await page.getByLabel("Direction name").fill("Invented source");
    await page.getByLabel("RA (°, ICRS)").fill("400");
    await page.getByLabel("Dec (°, ICRS)").fill("-10");
    await page.getByRole("button", { name: "Add direction" }).click();
    await page.getByText("RA is in [0°, 360°).").waitFor();
    expect(await page.getByLabel("Direction name").inputValue()).toBe("Invented source");
    await page.getByLabel("RA (°, ICRS)").fill("40");
    await page.getByRole("button", { name: "Add direction" }).click();
    const rows = page.getByTestId("directions-table").locator("tbody tr");
    expect(await rows.count()).toBe(3);
    // Galactic centre (dec -28.9°) from the northern twin: |dec - lat| = 68.2° < 80°, so seen.
    const gc = await rows.nth(0).locator("td").allTextContents();
    expect(gc[0]).toBe("Galactic centre");
    expect(Number(gc[3])).toBeGreaterThan(0);
    expect(Number(gc[4])).toBeGreaterThan(0);
    expect(Number(gc[6])).toBeCloseTo(Math.abs(-28.936 - 39.3), 1);
    await page.waitForTimeout(300);
    await page.screenshot({ path: `${SCREENSHOTS}/coverage-compare.png`, fullPage: true });

    // Save the first configuration; it appears in the new-analysis form.
    await page.getByRole("tab", { name: /Configuration A/ }).click();
    await page.getByLabel("Save as").fill("Browser test: Quebrada Alta 60°");
    await page.getByRole("button", { name: "Save configuration" }).click();
    await page.getByText("Saved as “Browser test: Quebrada Alta 60°”.").waitFor();
    await page.goto(`${BASE_URL}/analyses/new`);
    await page.locator("form[data-hydrated=true]").waitFor();
    const select = page.getByLabel("Exposure from a coverage configuration");
    await select.waitFor();
    await select.selectOption({ label: "Browser test: Quebrada Alta 60° (lat -31.4°, cut 60°)" });
    expect(await page.getByLabel("Zenith cut (°)").inputValue()).toBe("60");
    expect(await page.getByRole("option", { name: "Data-driven (time scrambling)" }).count()).toBe(0);
    await page.screenshot({ path: `${SCREENSHOTS}/coverage-analysis-form.png`, fullPage: true });
    await context.close();
  }, 120_000);

  it("shows the demo dataset against its analytic expectation with a verdict in words", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 1000 } });
    const page = await context.newPage();
    await signIn(page, DEMO.analyst.email, DEMO.analyst.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/data`);
    await page.getByRole("link", { name: "Quebrada Alta 2023-2024 (demo)" }).click();
    const verdict = page.getByTestId("coverage-verdict");
    await verdict.waitFor();
    expect(await verdict.textContent()).toMatch(/Analytic exposure (adequate|in doubt)\./);
    expect(await page.getByTestId("coverage-tests").locator("tbody tr").count()).toBe(5);
    await page.getByTestId("observed-vs-expected").scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SCREENSHOTS}/coverage-observed.png`, fullPage: true });
    console.log(`demo dataset verdict: ${await verdict.textContent()}`);
    await context.close();
  }, 120_000);
});
