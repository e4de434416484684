// The chemist's journey in Chromium: the lab lead adds a grating instrument through its form; the
// chemist drops a synthetic Hg–Ar lamp file on the upload zone, sees its preview and stores it (after
// setting a first file aside), calibrates, chooses a synthetic flame
// file with the file picker, starts a flame run in a new notebook, and sees the labelled chart and the
// calls; then switches the chart to continuum-removed with the keyboard, overrides a call with a
// reason and writes a note. The files come from the integration tests' generator (known truth, nothing hard-coded here).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Route } from "playwright-core";
import { SCREENSHOT_DIR, openBrowser, screenshot, type Session } from "./support/browser";
import { signInAs as signInWithPassword } from "./pages/sign-in-page";
import { InstrumentsPage, RunPage, UploadZone, chartsDrawn } from "./pages/workflow-pages";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
} from "@/lib/spectrum/synthetic/synthetic-instrument";
import { flameFile, lampFile } from "../integration/support/synthetic-files";
import { LTE_FLAME_TEMPERATURE_K, lteCalciumFlame } from "../integration/support/lte-flame";

const DEMO_PASSWORD = "emberline-demo";
const LEAD = "lead@demo.emberline.example";
const CHEMIST = "chem@demo.emberline.example";
/** Elements drawn into the flame file with clear lines (sodium is left out: it is called with care by design). */
const EXPECTED_PRESENT = ["K I", "Li I", "Sr I"];

let browser: Session;
const suffix = Date.now().toString(36);

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

const signInAs = (email: string) => signInWithPassword(browser, email, DEMO_PASSWORD);

describe("the chemist's journey", () => {
  it("goes from a lamp and a flame file to labelled calls", async () => {
    const { page } = browser;
    const grating = syntheticGrating();

    await signInAs(LEAD);
    const instruments = new InstrumentsPage(page);
    await instruments.goto();
    const instrumentId = await instruments.create({
      name: `E2E grating ${suffix}`,
      pixels: SYNTHETIC_PIXELS,
      fromNm: grating.nominalRangeNm[0],
      toNm: grating.nominalRangeNm[1],
      resolutionNm: SYNTHETIC_RESOLUTION_NM,
    });

    await signInAs(CHEMIST);
    await page.goto(`/instruments/${instrumentId}`);
    await page.getByRole("link", { name: "Upload a spectrum" }).click();
    await page.waitForURL(/\/upload/);
    const zone = new UploadZone(page);
    await zone.describe("lamp", "Hg–Ar pencil lamp");
    // A first drop is previewed, then set aside from the keyboard: back to the zone, nothing stored.
    await zone.drop(`not-this-${suffix}.csv`, lampFile(grating, 4));
    await zone.awaitPreview();
    await zone.preview.getByRole("button", { name: "Choose another file" }).press("Enter");
    await zone.zone.waitFor();
    expect(await page.evaluate(() => document.activeElement?.textContent)).toBe("Choose a file…");
    // A file the core cannot read: the located message, and the zone stays for another try.
    const rows = Array.from({ length: 30 }, (_, i) => (i === 7 ? `${i},1x5` : `${i},${100 + i}`));
    await zone.drop(`bad-${suffix}.csv`, `pixel,counts\n${rows.join("\n")}\n`);
    await page
      .getByRole("alert")
      .filter({ hasText: /^Line 9, column 2: .*Nothing was stored\.$/ })
      .waitFor();
    await screenshot(page, "chemist-0-bad-file");
    // The refusal is the one failed response so far, and it is expected.
    expect(browser.problems).toEqual(["HTTP 400 /api/spectra/preview"]);
    browser.problems.length = 0;
    await zone.drop(`lamp-${suffix}.csv`, lampFile(grating));
    await zone.awaitPreview();
    await chartsDrawn(page);
    const facts = (await page.getByTestId("preview-facts").textContent()) ?? "";
    expect(facts).toContain("2,048");
    expect(facts).toMatch(/SHA-256[0-9a-f]{64}/);
    expect(await zone.preview.getByRole("heading").textContent()).toContain("not stored yet");
    await screenshot(page, "chemist-1-lamp-preview");
    await zone.store();
    expect(await zone.status.textContent()).toContain("2,048 points");
    // The label typed before the preview is the one stored.
    expect(await page.getByText("Hg–Ar pencil lamp", { exact: true }).count()).toBe(1);
    await chartsDrawn(page);
    await screenshot(page, "chemist-2-lamp-uploaded");

    await page.getByRole("link", { name: "Calibrate with this lamp" }).click();
    await page.getByRole("checkbox", { name: "Hg", exact: true }).check();
    await page.getByRole("checkbox", { name: "Ar", exact: true }).check();
    await page.getByRole("button", { name: "Pair the lines and fit" }).click();
    await page.getByRole("button", { name: "Save the calibration" }).click({ timeout: 60_000 });
    await page.waitForURL(/\/calibrations\/[0-9a-f-]{36}$/, { timeout: 60_000 });
    await chartsDrawn(page);
    const summary = (await page.getByTestId("calibration-summary").textContent()) ?? "";
    const rmsNm = Number(/RMS([\d.]+) nm/.exec(summary)?.[1]);
    // A good lamp calibration of a 1 nm instrument reaches a few hundredths to ~0.1 nm (common practice).
    expect(rmsNm).toBeLessThan(0.1);
    expect(
      await page.getByTestId("pairs-table").locator("tbody tr").count(),
    ).toBeGreaterThanOrEqual(5);
    // The claim starts one pair in from each end: the two outermost pairs are fitted, not claimed.
    expect(
      await page
        .getByTestId("pairs-table")
        .locator("tbody tr", { hasText: "outside the covered range" })
        .count(),
    ).toBe(2);
    await screenshot(page, "chemist-3-calibration");

    await page.goto("/notebooks");
    await page.getByLabel("Title", { exact: true }).fill(`Flame screening ${suffix}`);
    await page.getByRole("button", { name: "Open the notebook" }).click();
    await page.waitForURL(/\/notebooks\/[0-9a-f-]{36}$/);
    await page
      .getByRole("link", { name: new RegExp(`Upload a sample on E2E grating ${suffix}`) })
      .click();
    await page.waitForURL(/\/upload/);
    await zone.choose(`flame-${suffix}.csv`, flameFile(grating));
    await zone.upload("sample", "Mixed chloride flame");
    await page.getByRole("link", { name: `Flame screening ${suffix}` }).click();
    await page.waitForURL(/\/notebooks\/.*spectrum=/);
    await page.getByLabel("Kind of source").selectOption("flame");
    expect(await page.getByRole("complementary", { name: "Flame safety" }).textContent()).toContain(
      "thallium",
    );
    await screenshot(page, "chemist-4-new-run");
    // The analysis says what it is doing while it runs (its server action is held 2.5 s here, so the
    // status is seen however fast the analysis is).
    const holdAction = async (route: Route) => {
      if (route.request().method() === "POST") await new Promise((r) => setTimeout(r, 2500));
      await route.continue();
    };
    await page.route(/\/notebooks\/[0-9a-f-]{36}/, holdAction);
    await page.getByRole("button", { name: "Start the run" }).click();
    await expect
      .poll(() => page.getByTestId("run-form-status").textContent())
      .toMatch(/^Analysing the sample: finding its peaks/);
    await screenshot(page, "chemist-4b-analysing");
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/, { timeout: 60_000 });
    await page.unroute(/\/notebooks\/[0-9a-f-]{36}/, holdAction);
    await chartsDrawn(page);

    const run = new RunPage(page);
    for (const species of EXPECTED_PRESENT)
      expect(await run.verdictOf(species), species).toBe("present");
    // Species sharing a peak are stacked in one label, so look for each name in the labels' text.
    const labels = (await run.chartLabels()).join(" | ");
    for (const species of EXPECTED_PRESENT)
      expect(labels, `chart label ${species}`).toContain(species);
    expect(await page.getByTestId("screening-notice").textContent()).toContain(
      "A screening aid, not a certified analysis.",
    );
    await screenshot(page, "chemist-5-run");
    await page.screenshot({ path: `${SCREENSHOT_DIR}/chemist-6-run-chart.png` });
    // The species called absent open from the keyboard and carry their detection limits.
    const absent = page.getByTestId("absent-calls");
    await absent.locator("summary").focus();
    await page.keyboard.press("Enter");
    const limits = await absent.getByTestId("detection-limit").allTextContents();
    expect(
      limits.some((t) =>
        /^< [\d.]+ counts \([\d.]+ % of the strongest peak\) at \d+\.\d\d nm/.test(t),
      ),
      limits.join(" | "),
    ).toBe(true);
    await absent.scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/chemist-6b-absent-limits.png` });

    // Raw / continuum-removed, from the keyboard: arrow keys move between the two views.
    await page.getByRole("radio", { name: "Raw counts" }).focus();
    await page.keyboard.press("ArrowRight");
    expect(await page.getByRole("radio", { name: "Continuum removed" }).isChecked()).toBe(true);
    await page
      .locator("[data-testid=chart] .ytitle", { hasText: "Counts above the continuum" })
      .waitFor();
    await page.getByTestId("spectrum-view").scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/chemist-7-continuum-removed.png` });

    // Override a call with a reason: the standing verdict changes and the override says who and why.
    const potassium = run.calls
      .filter({ has: page.getByTestId("call-species").getByText("K I", { exact: true }) })
      .first();
    await potassium.getByRole("button", { name: "Override this call" }).press("Enter");
    const form = potassium.getByTestId("override-form");
    await form.getByLabel("Verdict").selectOption("possible");
    await form
      .getByLabel("Reason (required)")
      .fill("Potassium from the glassware; blank shows it too.");
    await form.getByRole("button", { name: "Save override" }).click();
    await page.getByTestId("override-note").filter({ hasText: "blank shows it too" }).waitFor();
    expect(await run.verdictOf("K I")).toBe("possible");
    expect(await page.getByTestId("override-note").first().textContent()).toMatch(
      /Mara Quist.*computed verdict:.*present/,
    );
    await page.getByTestId("override-note").first().scrollIntoViewIfNeeded();
    await screenshot(page, "chemist-8-override");

    // Notes: Ctrl+Enter saves, and the indicator says so.
    const notes = page.getByLabel("Notes", { exact: true });
    await notes.fill("Loop cleaned in HCl between samples; K blank to be run tomorrow.");
    expect(await page.getByTestId("notes-status").textContent()).toMatch(/Unsaved/);
    await notes.press("Control+Enter");
    await page
      .getByTestId("notes-status")
      .filter({ hasText: /^Saved$/ })
      .waitFor();
    await page.reload();
    expect(await page.getByLabel("Notes", { exact: true }).inputValue()).toContain(
      "K blank to be run tomorrow",
    );
    await page.getByTestId("notes-form").scrollIntoViewIfNeeded();
    await screenshot(page, "chemist-9-notes");

    // A calcium flame in LTE, run with its excitation temperature assumed: the page shows T ± σ and the plot.
    await page.getByRole("link", { name: "Back to the notebook" }).click();
    await page.waitForURL(/\/notebooks\/[0-9a-f-]{36}$/);
    await page
      .getByRole("link", { name: new RegExp(`Upload a sample on E2E grating ${suffix}`) })
      .click();
    await page.waitForURL(/\/upload/);
    await zone.choose(`calcium-${suffix}.csv`, lteCalciumFlame(grating));
    await zone.upload("sample", "Calcium, hot flame");
    await page.getByRole("link", { name: `Flame screening ${suffix}` }).click();
    await page.waitForURL(/\/notebooks\/.*spectrum=/);
    await page.getByText("Analysis settings (optional; blank keeps the defaults)").click();
    await page.getByLabel("Excitation temperature (K)").fill(String(LTE_FLAME_TEMPERATURE_K));
    await page.getByRole("button", { name: "Start the run" }).click();
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/, { timeout: 60_000 });
    await chartsDrawn(page);
    const temperature = (await page.getByTestId("temperature").textContent()) ?? "";
    const kelvin = Number(/(\d+) ± \d+ K/.exec(temperature)?.[1]);
    // Within 5 % of the generator's temperature (the integration test states why).
    expect(Math.abs(kelvin / LTE_FLAME_TEMPERATURE_K - 1), temperature).toBeLessThan(0.05);
    expect(temperature).toContain("Ca I");
    await page.getByTestId("temperature").scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/chemist-10-temperature.png` });

    await page.goto(new URL(page.url()).pathname.replace(/\/runs\/.*/, "/notebooks"));
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  }, 240_000);
});
