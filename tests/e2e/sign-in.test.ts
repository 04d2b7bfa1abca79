import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, DEMO, launchBrowser, SCREENSHOTS, signIn } from "./browser";

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("signing in and roles in the browser", () => {
  it("sends a visitor who is not signed in to the sign-in page", async () => {
    const page = await browser.newPage();
    await page.goto(`${BASE_URL}/`);
    await page.waitForURL(/\/sign-in$/);
    expect(await page.getByRole("heading", { name: "Sign in" }).isVisible()).toBe(true);
    await page.close();
  });

  it.each(Object.entries(DEMO))("signs in the demo %s and shows the dashboard with the role", async (role, demo) => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, demo.email, demo.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.getByTestId("signed-in-as").waitFor();
    expect(await page.getByTestId("signed-in-as").textContent()).toContain(demo.label);
    expect(await page.getByRole("heading", { level: 1 }).textContent()).toMatch(/^Welcome, /);
    expect(await page.getByTestId("count-sites").textContent()).toBe("1");
    const adminLink = page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Admin" });
    expect(await adminLink.count()).toBe(role === "admin" ? 1 : 0);
    await page.screenshot({ path: `${SCREENSHOTS}/dashboard-${role}.png`, fullPage: true });
    await context.close();
  });

  it("sends each workspace page whole in its first response, with no hidden streamed copy, and follows the navigation", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, DEMO.analyst.email, DEMO.analyst.password);
    await page.waitForURL(`${BASE_URL}/`);
    // A route-level loading fallback made React stream each page as a hidden segment
    // (<div hidden id="S:...">) that sat beside the hydrated page for up to a second.
    for (const path of ["/", "/data", "/analyses", "/coverage", "/alerts"]) {
      const html = await (await page.request.get(`${BASE_URL}${path}`)).text();
      expect(html, path).toContain('id="main"');
      expect(html.match(/<div hidden id="S:/g) ?? [], path).toEqual([]);
    }
    // The followed link carries a pending mark while the page is on its way (held back here by 1.5 s).
    await page.route(/[?&]_rsc=/, async (route) => {
      await new Promise((resolve) => setTimeout(resolve, 1500));
      await route.continue();
    });
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Coverage" }).click();
    await page.getByRole("navigation", { name: "Main" }).getByTestId("nav-pending").waitFor();
    expect(await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Coverage (loading)" }).count()).toBe(1);
    await page.waitForURL(`${BASE_URL}/coverage`);
    await page.unroute(/[?&]_rsc=/);
    await page.locator("[data-testid=coverage-planner][data-hydrated=true]").waitFor();
    expect(await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Coverage" }).getAttribute("aria-current")).toBe("page");
    expect(await page.getByTestId("band-min").count()).toBe(1);
    await context.close();
  });

  it("shows one message for a wrong password that does not say whether the account exists", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, DEMO.referee.email, "not-the-password");
    const alert = page.getByTestId("sign-in-error");
    await alert.waitFor();
    const known = await alert.textContent();
    await signIn(page, "nobody-here@demo.siderea.test", "not-the-password");
    await alert.waitFor();
    const unknown = await alert.textContent();
    expect(known).toBe("The e-mail address or password is incorrect.");
    expect(unknown).toBe(known);
    expect(page.url()).toMatch(/\/sign-in$/);
    await context.close();
  });

  it("refuses the member the admin page, on the page and on the API", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, DEMO.member.email, DEMO.member.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/admin`);
    const refusal = page.locator("[data-testid=forbidden]:visible");
    await refusal.waitFor();
    expect(await refusal.textContent()).toContain("Not available to your role");
    expect(await page.getByRole("button", { name: "Create user" }).count()).toBe(0);
    await page.screenshot({ path: `${SCREENSHOTS}/admin-refused-member.png` });
    const api = await page.request.get(`${BASE_URL}/api/users`);
    expect(api.status()).toBe(403);
    expect((await api.json()).error.code).toBe("forbidden");
    await context.close();
  });

  it("lets the admin create a user who can then sign in", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, DEMO.admin.email, DEMO.admin.password);
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/admin`);
    const email = `new-${Date.now()}@demo.siderea.test`;
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Name").fill("New Colleague");
    await page.getByLabel("Role", { exact: true }).selectOption("referee");
    await page.getByLabel("Initial password").fill("a-long-initial-password");
    await page.getByRole("button", { name: "Create user" }).click();
    await page.getByText(`Created ${email} as referee.`).waitFor();
    await page.screenshot({ path: `${SCREENSHOTS}/admin-users.png`, fullPage: true });
    const other = await browser.newContext();
    const second = await other.newPage();
    await signIn(second, email, "a-long-initial-password");
    await second.waitForURL(`${BASE_URL}/`);
    expect(await second.getByTestId("signed-in-as").textContent()).toContain("Referee");
    await other.close();
    await context.close();
  });
});
