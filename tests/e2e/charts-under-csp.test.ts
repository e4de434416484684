// The charts in Chromium under the Content-Security-Policy: a run page and a calibration page draw
// their Plotly charts with no CSP violation and no console error, the page's scripts carry the nonce,
// and no chart's toolbar offers to share or send the chart anywhere (no button or link to another host).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { signInAs } from "./pages/sign-in-page";
import { FLAME_SCREENING, signInDemo, teamIdOf } from "../integration/support/accounts";
import { APP_URL } from "../integration/support/http-client";

const CHEMIST = "chem@demo.emberline.example";
const DEMO_PASSWORD = "emberline-demo";

let browser: Session;
let runId: string;
let calibrationId: string;
/** CSP violations reported by the page itself (securitypolicyviolation events). */
let violations: string[];

beforeAll(async () => {
  const chemist = await signInDemo("chemist");
  const teamId = await teamIdOf(chemist, FLAME_SCREENING);
  const notebooks = await chemist.get<{ id: string; runCount: number }[]>(
    `/api/notebooks?teamId=${teamId}`,
  );
  const notebook = notebooks.body.find((n) => n.runCount > 0);
  expect(notebook, "the demo data has a notebook with a run").toBeDefined();
  const runs = await chemist.get<{ id: string }[]>(`/api/notebooks/${notebook!.id}/runs`);
  runId = runs.body[0].id;
  calibrationId = (await chemist.get<{ calibrationId: string }>(`/api/runs/${runId}`)).body
    .calibrationId;

  browser = await openBrowser();
  violations = [];
  await browser.page.exposeFunction("__cspViolation", (text: string) => violations.push(text));
  await browser.page.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (event) => {
      (window as unknown as { __cspViolation(text: string): void }).__cspViolation(
        `${event.violatedDirective} blocked ${event.blockedURI || "inline"} (${event.sourceFile}:${event.lineNumber})`,
      );
    });
  });
  await signInAs(browser, CHEMIST, DEMO_PASSWORD);
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

/** Opens a page, waits until every chart on it has drawn its plot, and returns how many there are. */
async function chartsDrawn(path: string): Promise<number> {
  const { page } = browser;
  await page.goto(path);
  const charts = page.locator("[data-testid=chart]");
  await charts.first().waitFor();
  const count = await charts.count();
  for (let i = 0; i < count; i++)
    await charts.nth(i).locator(".main-svg").first().waitFor({ timeout: 30_000 });
  return count;
}

/** Every modebar button's title and every link's target inside the charts. */
async function chartControls(): Promise<{ titles: string[]; hrefs: string[]; logos: number }> {
  return browser.page.evaluate(() => {
    const figures = [...document.querySelectorAll("[data-testid=chart]")];
    const titles = figures.flatMap((f) =>
      [...f.querySelectorAll(".modebar-btn")].map((b) => b.getAttribute("data-title") ?? ""),
    );
    const hrefs = figures.flatMap((f) =>
      [...f.querySelectorAll("a[href]")].map((a) => (a as HTMLAnchorElement).href),
    );
    const logos = figures.reduce(
      (n, f) => n + f.querySelectorAll(".plotlyjsicon, a.modebar-btn--logo").length,
      0,
    );
    return { titles, hrefs, logos };
  });
}

describe("charts under the Content-Security-Policy", () => {
  it.each([
    ["a run page", () => `/runs/${runId}`],
    ["a calibration page", () => `/calibrations/${calibrationId}`],
  ])("%s draws its charts with no CSP violation and offers no outside link", async (name, path) => {
    browser.problems.length = 0;
    violations.length = 0;
    const count = await chartsDrawn(path());
    expect(count).toBeGreaterThan(0);
    // Hover the first chart so Plotly builds its modebar, then read every control.
    await browser.page.locator("[data-testid=chart]").first().hover();
    const { titles, hrefs, logos } = await chartControls();
    await screenshot(browser.page, `charts-under-csp-${name.replace(/\W+/g, "-")}`);
    expect(titles.length, "the modebar is there").toBeGreaterThan(0);
    expect(titles).toContain("Download plot as a PNG");
    for (const title of titles) expect(title).not.toMatch(/share|cloud|chart studio|edit in/i);
    const appHost = new URL(APP_URL).host;
    for (const href of hrefs) expect(new URL(href, APP_URL).host, href).toBe(appHost);
    expect(logos).toBe(0);
    expect(violations).toEqual([]);
    expect(browser.problems).toEqual([]);
  });

  it("the page's own scripts run with this response's nonce", async () => {
    const response = await browser.page.goto(`/runs/${runId}`);
    const policy = response?.headers()["content-security-policy"] ?? "";
    const nonce = /'nonce-([^']+)'/.exec(policy)?.[1];
    expect(nonce).toBeTruthy();
    // Every script the server wrote into the page carries it (scripts those load later are allowed
    // by 'strict-dynamic' and carry none).
    const tags = [...((await response?.text()) ?? "").matchAll(/<script\b[^>]*>/g)].map(
      (m) => m[0],
    );
    expect(tags.length).toBeGreaterThan(0);
    for (const tag of tags) expect(tag).toContain(`nonce="${nonce}"`);
    // The charts still drew under that policy.
    await browser.page.locator("[data-testid=chart] .main-svg").first().waitFor();
    expect(violations).toEqual([]);
  });
});
