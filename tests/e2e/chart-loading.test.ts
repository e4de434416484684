// How charts load in Chromium: pages without a chart never fetch the charting library; a chart page
// fetches it once, after the page itself, however many charts it shows, holding each chart's place with a
// "Loading chart…" skeleton of the chart's height (nothing below moves when the chart arrives); a
// library that fails to arrive leaves a sentence and a reload button; the modebar offers no sharing.
import type { Route } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { signInAs } from "./pages/sign-in-page";
import { chartsDrawn } from "./pages/workflow-pages";
import { FLAME_SCREENING, signInDemo, teamIdOf } from "../integration/support/accounts";

const CHEMIST = "chem@demo.emberline.example";
const DEMO_PASSWORD = "emberline-demo";
/** Text only the charting library holds (its PNG button's title), as the page-weight report reads it. */
const CHART_LIBRARY_SIGNATURE = "Download plot as a";

let browser: Session;
let runId: string;
let calibrationId: string;
let notebookId: string;

/**
 * What the browser fetched: each script's URL, and whether its body holds the charting library (null
 * when its fetch failed, so its body is unknown).
 */
let scripts: { url: string; chartLibrary: boolean | null }[];
/** While set, the chart chunk's answer waits for it (to see the skeleton). */
let holdChartChunk: Promise<void> | null = null;
/** While true, the chart chunk's request fails as on a broken connection. */
let failChartChunk = false;

/**
 * The server's answer to a routed request, asked once more when the first try fails: a loaded CI
 * machine can drop one connection, and an aborted chunk would leave the page unhydrated (no chart ever
 * drawn) for a reason that is not the page's.
 */
async function fetchThrough(route: Route) {
  try {
    return await route.fetch();
  } catch {
    return await route.fetch();
  }
}

async function throughRoute(route: Route): Promise<void> {
  try {
    const response = await fetchThrough(route);
    const body = await response.body();
    const chartLibrary = body.includes(CHART_LIBRARY_SIGNATURE);
    scripts.push({ url: route.request().url(), chartLibrary });
    if (chartLibrary && failChartChunk) return await route.abort("connectionreset");
    if (chartLibrary && holdChartChunk) await holdChartChunk;
    await route.fulfill({ response, body });
  } catch {
    // The page went away (a new navigation) while its chunk was on the way: nothing to answer.
    scripts.push({ url: route.request().url(), chartLibrary: null });
    await route.abort().catch(() => undefined);
  }
}

beforeAll(async () => {
  const chemist = await signInDemo("chemist");
  const teamId = await teamIdOf(chemist, FLAME_SCREENING);
  const notebooks = await chemist.get<{ id: string; runCount: number }[]>(
    `/api/notebooks?teamId=${teamId}`,
  );
  const notebook = notebooks.body.find((n) => n.runCount > 0);
  expect(notebook, "the demo data has a notebook with a run").toBeDefined();
  notebookId = notebook!.id;
  const runs = await chemist.get<{ id: string }[]>(`/api/notebooks/${notebookId}/runs`);
  runId = runs.body[0].id;
  calibrationId = (await chemist.get<{ calibrationId: string }>(`/api/runs/${runId}`)).body
    .calibrationId;

  browser = await openBrowser();
  scripts = [];
  await browser.page.route("**/_next/static/chunks/*.js", throughRoute);
  await signInAs(browser, CHEMIST, DEMO_PASSWORD);
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

/** A full page load that waits until the network is quiet, so late chunks are counted too. */
async function visit(path: string): Promise<void> {
  scripts.length = 0;
  await browser.page.goto(path, { waitUntil: "networkidle" });
}

describe("loading the charts", () => {
  it("fetches no charting library on pages without a chart, and one chunk on a chart page", async () => {
    // First, in this fresh profile, pages with no chart: nothing the library holds may arrive.
    for (const path of ["/", "/notebooks", `/notebooks/${notebookId}`, "/lines", "/instruments"]) {
      await visit(path);
      expect(scripts.length, `${path} loaded its scripts`).toBeGreaterThan(0);
      expect(
        scripts.filter((s) => s.chartLibrary !== false).map((s) => s.url),
        `${path} fetched the charting library (or a script whose body could not be read)`,
      ).toEqual([]);
    }
    // The same watch sees the library on a page with two charts: one chunk, fetched once, and not
    // named in the page's HTML (it is loaded by the page's code, not with the page).
    const path = `/calibrations/${calibrationId}`;
    const html = await (await browser.page.request.get(path)).text();
    // The server already draws both skeletons, so the first paint has the charts' room.
    expect(html.match(/Loading chart…/g)).toHaveLength(2);
    await visit(path);
    expect(
      scripts.filter((s) => s.chartLibrary === null).map((s) => s.url),
      "scripts of the chart page that did not arrive",
    ).toEqual([]);
    await chartsDrawn(browser.page);
    expect(await browser.page.locator("[data-testid=chart]").count()).toBe(2);
    const library = scripts.filter((s) => s.chartLibrary);
    expect(
      library.map((s) => s.url),
      "the charting library, once",
    ).toHaveLength(1);
    expect(html).not.toContain(new URL(library[0].url).pathname);
  });

  it("holds each chart's place with a skeleton of its height, then draws the chart", async () => {
    const { page } = browser;
    let release!: () => void;
    holdChartChunk = new Promise((resolve) => (release = resolve));
    browser.problems.length = 0;
    try {
      // Not "load": a script the page adds before its load event (the held chart chunk) delays it.
      await page.goto(`/runs/${runId}`, { waitUntil: "domcontentloaded" });
      const figure = page.locator("[data-testid=chart]").first();
      const skeleton = figure.getByTestId("chart-skeleton");
      await skeleton.waitFor();
      await expect(skeleton.getAttribute("role")).resolves.toBe("status");
      await expect(skeleton.textContent()).resolves.toBe("Loading chart…");
      await expect(figure.getAttribute("aria-busy")).resolves.toBe("true");
      // The run chart is 420 px high; its skeleton is too.
      expect((await skeleton.boundingBox())!.height).toBe(420);
      const below = page.getByRole("heading", { name: "Calls and their evidence" });
      const before = (await below.boundingBox())!.y;
      await screenshot(page, "chart-loading-skeleton");

      release();
      await figure.locator(".main-svg").first().waitFor({ timeout: 30_000 });
      await expect(skeleton.count()).resolves.toBe(0);
      await expect(figure.getAttribute("aria-busy")).resolves.toBe("false");
      expect((await below.boundingBox())!.y, "nothing below the chart moved").toBe(before);
      await screenshot(page, "chart-loading-drawn");

      // The modebar (built on hover) keeps zoom and PNG export and offers no sharing.
      await figure.hover();
      const titles = await figure
        .locator(".modebar-btn")
        .evaluateAll((buttons) => buttons.map((b) => b.getAttribute("data-title") ?? ""));
      expect(titles).toContain("Download plot as a PNG");
      expect(titles).toContain("Zoom");
      for (const title of titles) expect(title).not.toMatch(/share|cloud|chart studio|edit in/i);
      const links = await figure
        .locator("a[href]")
        .evaluateAll((anchors) => anchors.map((a) => (a as HTMLAnchorElement).href));
      for (const href of links) expect(new URL(href).origin).toBe(new URL(page.url()).origin);
      expect(browser.problems).toEqual([]);
    } finally {
      release?.();
      holdChartChunk = null;
    }
  });

  it("says so and offers a reload when the charting library does not arrive", async () => {
    const { page } = browser;
    failChartChunk = true;
    try {
      await page.goto(`/calibrations/${calibrationId}`);
      const errors = page.getByTestId("chart-error");
      await errors.first().waitFor({ timeout: 30_000 });
      // Both charts of the page say it; neither is left loading.
      await expect(errors.count()).resolves.toBe(2);
      await expect(page.getByTestId("chart-skeleton").count()).resolves.toBe(0);
      await expect(errors.first().getAttribute("role")).resolves.toBe("alert");
      await expect(errors.first().textContent()).resolves.toContain("The chart could not be shown");
      await screenshot(page, "chart-loading-failed");
      failChartChunk = false;
      await errors.first().getByRole("button", { name: "Reload the page" }).click();
      await chartsDrawn(page);
    } finally {
      failChartChunk = false;
      // The aborted request and the chunk error the page logged belong to this test alone.
      browser.problems.length = 0;
    }
  });
});
