import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, DEMO, launchBrowser, SCREENSHOTS, signIn } from "./browser";

// The demo scenario of alerts, in the browser: the analyst watches a published scan of the demo
// dataset, the demo member subscribes, the analyst appends the demo's later batch (its stronger
// cluster at l = 310, b = +20), the worker reruns the scan, the member sees the alert and the
// administrator sees the e-mail in the SMTP sink's inbox. Runs after the other browser tests
// (scripts/test.sh), which expect the demo dataset as seeded.
const LATER_BATCH = ".siderea/demo/quebrada-alta-later-batch.csv";
let browser: Browser;
let analysisId = 0;
let datasetId = 0;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function signedIn(who: keyof typeof DEMO): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const page = await context.newPage();
  await signIn(page, DEMO[who].email, DEMO[who].password);
  await page.waitForURL(`${BASE_URL}/`);
  return page;
}

describe("alerts in the browser", () => {
  it("lets the analyst watch a published scan of the demo dataset", async () => {
    const page = await signedIn("analyst");
    const datasets = (await (await page.request.get(`${BASE_URL}/api/datasets?q=Quebrada%20Alta%202023`)).json()).rows as { id: number; name: string }[];
    datasetId = datasets.find((d) => d.name === "Quebrada Alta 2023-2024 (demo)")!.id;
    // A quick scan (Nside 16, 20 isotropic skies) keeps the reruns short.
    const created = await page.request.post(`${BASE_URL}/api/analyses`, {
      data: { name: "Watched demo scan", purpose: "alerts", settings: { kind: "hotspot", datasetId, zenithMaxDeg: 60, nside: 16, radiiDeg: [10], nSkies: 20, seed: 31 } },
    });
    expect(created.status()).toBe(202);
    analysisId = (await created.json()).analysis.id;
    for (let i = 0; i < 240; i++) {
      const a = (await (await page.request.get(`${BASE_URL}/api/analyses/${analysisId}`)).json()).analysis;
      if (a.status === "done") break;
      expect(["queued", "running"]).toContain(a.status);
      await page.waitForTimeout(500);
    }
    expect((await page.request.post(`${BASE_URL}/api/analyses/${analysisId}/publish`)).status()).toBe(200);
    await page.goto(`${BASE_URL}/analyses/${analysisId}`);
    await page.locator("form[aria-label='Watch settings'][data-hydrated=true]").waitFor();
    await page.getByRole("button", { name: "Watch this analysis" }).click();
    await page.getByTestId("watch-state").getByText(/^Watched since/).waitFor();
    await page.getByTestId("watch-panel").screenshot({ path: `${SCREENSHOTS}/alerts-watch.png` });
    await page.context().close();
  }, 180_000);

  it("lets the demo member subscribe from the analysis page", async () => {
    const page = await signedIn("member");
    await page.goto(`${BASE_URL}/analyses/${analysisId}`);
    const form = page.locator("form[aria-label='Subscribe to alerts'][data-hydrated=true]");
    await form.waitFor();
    await form.getByLabel("Local threshold (σ)").fill("4");
    await form.getByLabel("Delivery").selectOption("immediate");
    await form.getByRole("button", { name: "Subscribe" }).click();
    await page.getByTestId("watch-subscription").getByText(/Subscribed at 4σ local, e-mail at once/).waitFor();
    await page.getByTestId("watch-panel").screenshot({ path: `${SCREENSHOTS}/alerts-member-subscribed.png` });
    await page.goto(`${BASE_URL}/alerts`);
    await page.getByTestId("subscriptions").getByText("Watched demo scan").filter({ visible: true }).waitFor();
    // The inbox of the SMTP sink is for administrators only.
    await page.goto(`${BASE_URL}/admin/inbox`);
    await page.locator("[data-testid=forbidden]:visible").waitFor();
    await page.context().close();
  }, 60_000);

  it("appends the demo's later batch as the analyst; the member sees the alert; the admin sees the e-mail in the inbox", async () => {
    // The data browser test stores this same batch as a dataset of its own, and a batch stored
    // anywhere is refused as a duplicate: the same events under other ids.
    const dir = mkdtempSync(join(tmpdir(), "siderea-e2e-"));
    const file = join(dir, "quebrada-alta-later-batch.csv");
    writeFileSync(file, readFileSync(LATER_BATCH, "utf8").replace(/^QB-/gm, "QE-"));
    const analyst = await signedIn("analyst");
    await analyst.goto(`${BASE_URL}/data/${datasetId}`);
    await analyst.locator("form[aria-label='Append a batch'][data-hydrated=true]").waitFor();
    await analyst.getByLabel("Batch file (CSV or .csv.gz)").setInputFiles(file);
    await analyst.getByRole("button", { name: "Append batch" }).click();
    await analyst.getByText(/Stored 4,000 events/).waitFor({ timeout: 60_000 });
    await analyst.context().close();

    const member = await signedIn("member");
    let found = false;
    for (let i = 0; i < 120 && !found; i++) {
      await member.goto(`${BASE_URL}/alerts`);
      found = (await member.getByTestId("alerts-table").count()) > 0;
      if (!found) await member.waitForTimeout(1000);
    }
    expect(found).toBe(true);
    const row = member.getByTestId("alerts-table").locator("tbody tr").first();
    expect(await row.textContent()).toContain("Watched demo scan");
    expect(await row.getByTestId("alert-local").textContent()).toMatch(/^\d+\.\d\dσ local/);
    expect(await row.getByTestId("alert-post-trial").textContent()).toMatch(/p [<=] .*20 skies.*Trials counted: 1 radii x 1 energy thresholds x 3072 windows/);
    // The demo's cluster is at l = 310, b = +20 (lib/demo/generate.ts); the alert's window within 10° of it.
    const pos = (await row.getByTestId("alert-position").textContent())!;
    const [, l, bSign, b] = /l (\d+\.\d+)°, b ([+−])(\d+\.\d+)°/.exec(pos)!;
    expect(Math.abs(Number(l) - 310)).toBeLessThan(12);
    expect(Math.abs((bSign === "−" ? -1 : 1) * Number(b) - 20)).toBeLessThan(10);
    expect(await member.getByText(/^Preliminary\./).count()).toBeGreaterThan(0);
    await member.screenshot({ path: `${SCREENSHOTS}/alerts-page.png`, fullPage: true });
    // The watched analysis's page: the rerun on version 2 compared with the run before.
    await member.goto(`${BASE_URL}/analyses/${analysisId}`);
    await member.getByTestId("watch-runs").getByText("v1 → v2").waitFor();
    expect(await member.getByTestId("watch-runs").textContent()).toMatch(/40,000 → 44,000.*1 new, 0 updates/);
    await member.getByTestId("watch-alerts").getByText(/Alert on v2/).waitFor();
    await member.getByTestId("watch-panel").screenshot({ path: `${SCREENSHOTS}/alerts-watch-runs.png` });
    await member.context().close();

    const admin = await signedIn("admin");
    let subject = "";
    for (let i = 0; i < 60 && !subject.startsWith("[Siderea] Alert"); i++) {
      await admin.goto(`${BASE_URL}/admin/inbox`);
      // no message yet: the page shows "No message received yet" and no subject (do not wait for one).
      // While the streamed page is being revealed a hidden copy of it may still be in the document: read the visible one.
      const shown = admin.getByTestId("inbox-subject").filter({ visible: true });
      subject = (await shown.count()) ? ((await shown.first().textContent()) ?? "") : "";
      if (!subject.startsWith("[Siderea] Alert")) await admin.waitForTimeout(1000);
    }
    expect(subject).toMatch(/^\[Siderea\] Alert: Watched demo scan, \d+\.\d\dσ local at RA/);
    expect(await admin.getByTestId("inbox-to").filter({ visible: true }).textContent()).toBe(DEMO.member.email);
    await admin.waitForLoadState("networkidle");
    const text = (await admin.getByTestId("inbox-text").filter({ visible: true }).textContent())!;
    expect(text).toContain("Local significance (pre-trial, Li & Ma eq. 17)");
    expect(text).toContain("Trials counted: 1 radii x 1 energy thresholds x 3072 windows");
    expect(text).toContain("PRELIMINARY");
    expect(text).toMatch(new RegExp(`${BASE_URL.replace(/[.:/]/g, "\\$&")}/unsubscribe\\?token=`));
    // The HTML part in its sandboxed frame, with the window's map drawn from the inline PNG.
    const frame = admin.frameLocator("[data-testid=inbox-html]");
    await frame.getByText(/New cluster: Watched demo scan/).waitFor();
    const img = frame.locator("img").first();
    await img.waitFor();
    expect(await img.evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth)).toBe(200);
    await admin.screenshot({ path: `${SCREENSHOTS}/alerts-inbox.png`, fullPage: true });
    expect(await admin.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(1280);

    // The unsubscribe link of the e-mail works without signing in, once.
    const link = /(\/unsubscribe\?token=[\w.-]+)/.exec(text)![1]!;
    const anonymous = await (await browser.newContext()).newPage();
    await anonymous.goto(`${BASE_URL}${link}`);
    await anonymous.locator("form[data-hydrated=true]").waitFor();
    await anonymous.getByRole("button", { name: "Unsubscribe" }).click();
    await anonymous.getByTestId("unsubscribe-result").getByText(/You no longer receive alerts of “Watched demo scan”/).waitFor();
    await anonymous.screenshot({ path: `${SCREENSHOTS}/alerts-unsubscribed.png` });
    await anonymous.goto(`${BASE_URL}${link}`);
    await anonymous.getByTestId("unsubscribe-state").getByText(/already been used/).waitFor();
    await anonymous.context().close();
    await admin.context().close();
  }, 240_000);
});
