// Reports in Chromium: a run (made through the API from the synthetic files) opens as a printable
// report with its chart, calls and caveat, prints without the navigation, and its PDF downloads from
// the run page's Downloads block; the notebook page offers its calls as CSV.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { SignInPage } from "./pages/sign-in-page";
import { PrintableReportPage, RunDownloadsBlock } from "./pages/report-pages";
import { FLAME_SCREENING, signInDemo, teamIdOf } from "../integration/support/accounts";
import { APP_URL } from "../integration/support/http-client";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
} from "@/lib/spectrum/synthetic/synthetic-instrument";
import { flameFile, lampFile } from "../integration/support/synthetic-files";

const CHEMIST = "chem@demo.emberline.example";
const DEMO_PASSWORD = "emberline-demo";
const suffix = Date.now().toString(36);

let browser: Session;
let runId: string;
let notebookId: string;
let present: string[];

beforeAll(async () => {
  const grating = syntheticGrating();
  const lead = await signInDemo("labLead");
  const chemist = await signInDemo("chemist");
  const teamId = await teamIdOf(lead, FLAME_SCREENING);
  const instrument = await lead.post<{ id: string }>("/api/instruments", {
    teamId,
    name: `E2E report bench ${suffix}`,
    dispersion: "grating",
    pixels: SYNTHETIC_PIXELS,
    nominalMinNm: grating.nominalRangeNm[0],
    nominalMaxNm: grating.nominalRangeNm[1],
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
  });
  expect(instrument.status).toBe(201);
  const upload = async (kind: string, text: string, fileName: string) => {
    const form = new FormData();
    form.set("file", new Blob([text]), fileName);
    form.set("instrumentId", instrument.body.id);
    form.set("kind", kind);
    const response = await fetch(`${APP_URL}/api/spectra`, {
      method: "POST",
      headers: {
        cookie: `emberline_session=${chemist.cookie("emberline_session")}`,
        "x-forwarded-for": chemist.address,
      },
      body: form,
    });
    expect(response.status).toBe(201);
    return ((await response.json()) as { id: string }).id;
  };
  const lampId = await upload("lamp", lampFile(grating), `lamp-${suffix}.csv`);
  const calibration = await chemist.post<{ id: string }>("/api/calibrations", {
    instrumentId: instrument.body.id,
    spectrumId: lampId,
    lamps: ["Hg", "Ar"],
  });
  expect(calibration.status).toBe(201);
  const notebook = await chemist.post<{ id: string }>("/api/notebooks", {
    teamId,
    title: `E2E reports ${suffix}`,
  });
  notebookId = notebook.body.id;
  const sampleId = await upload("sample", flameFile(grating), `flame-${suffix}.csv`);
  const run = await chemist.post<{ id: string; calls: { species: string; verdict: string }[] }>(
    "/api/runs",
    {
      notebookId,
      spectrumId: sampleId,
      calibrationId: calibration.body.id,
      source: "flame",
    },
  );
  expect(run.status).toBe(201);
  runId = run.body.id;
  present = run.body.calls.filter((c) => c.verdict === "present").map((c) => c.species);
  expect(present.length).toBeGreaterThan(0);

  browser = await openBrowser();
  const signIn = new SignInPage(browser.page);
  await signIn.goto();
  await signIn.signIn(CHEMIST, DEMO_PASSWORD);
  await browser.page.waitForURL((url) => url.pathname === "/");
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

describe("reports", () => {
  it("shows the printable report with its chart, calls and caveat, and prints without the navigation", async () => {
    const { page } = browser;
    const printable = new PrintableReportPage(page);
    await printable.goto(runId);
    const text = (await printable.report.textContent()) ?? "";
    for (const species of present) expect(text).toContain(species);
    expect(text).toContain("Qualitative screening result only, not a certified analysis");
    expect(text).toContain("Flame test cautions");
    expect(await printable.chart.locator("path").count()).toBeGreaterThan(0);
    expect(
      await printable.chart.locator("text").filter({ hasText: present[0] }).count(),
    ).toBeGreaterThan(0);
    await screenshot(page, "reports-1-printable");

    await page.emulateMedia({ media: "print" });
    expect(await page.getByRole("navigation").first().isVisible()).toBe(false);
    expect(await page.getByRole("button", { name: "Print" }).isVisible()).toBe(false);
    await screenshot(page, "reports-2-print-media");
    // Printed to PDF as the print dialog would: every page carries the caveat and its number in the margins.
    const printed = await page.pdf({ preferCSSPageSize: true, printBackground: true });
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "emberline-print-"));
    const file = path.join(dir, "printed.pdf");
    fs.writeFileSync(file, printed);
    const info = execFileSync("/usr/bin/pdfinfo", [file], { encoding: "utf8" });
    const pages = Number(/Pages:\s+(\d+)/.exec(info)![1]);
    const printedText = execFileSync("/usr/bin/pdftotext", [file, "-"], {
      encoding: "utf8",
    }).replace(/\s+/g, " ");
    fs.rmSync(dir, { recursive: true, force: true });
    expect(info).toMatch(/Page size:.*\(A4\)/);
    expect(pages).toBeGreaterThanOrEqual(2);
    expect(printedText).toContain(`Page ${pages} of ${pages}`);
    expect(
      printedText.split("Qualitative screening result only, not a certified analysis").length - 1,
    ).toBeGreaterThanOrEqual(pages);
    expect(printedText).not.toContain("Line library");
    await page.emulateMedia({ media: "screen" });
    expect(browser.problems).toEqual([]);
  });

  it("downloads the PDF, the peaks CSV and the even-step JCAMP-DX from the run page's Downloads block", async () => {
    const { page } = browser;
    await page.goto(`/runs/${runId}`);
    await page.getByTestId("run-downloads").scrollIntoViewIfNeeded();
    await screenshot(page, "reports-3-run-downloads");
    const pdf = await new RunDownloadsBlock(page).download("download-report-pdf");
    expect(pdf.name).toMatch(/^emberline-run-[0-9a-f]{8}-v1\.pdf$/);
    expect(pdf.bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const csv = await new RunDownloadsBlock(page).download("download-peaks-csv");
    const csvLines = csv.bytes.toString("utf8").split("\r\n");
    expect(csvLines[0]).toMatch(/^# Emberline peaks and candidate lines of run /);
    expect(csvLines.find((line) => !line.startsWith("#"))).toMatch(/^peak_nm,/);
    const even = await new RunDownloadsBlock(page).download("download-spectrum-even-jdx");
    expect(even.name).toMatch(/^emberline-run-[0-9a-f]{8}-v1-spectrum-even\.jdx$/);
    expect(even.bytes.toString("latin1")).toContain("##XYDATA=(X++(Y..Y))");
  });

  it("says while the PDF is prepared and when it is saved, works from the keyboard, and says why a download failed", async () => {
    const { page } = browser;
    await page.goto(`/runs/${runId}`);
    const block = new RunDownloadsBlock(page);
    // The reply is held back 2.5 s here, so the preparing state is seen whatever the report cache holds.
    const pdfPath = `/api/runs/${runId}/report.pdf`;
    await page.route(`**${pdfPath}`, async (route) => {
      await new Promise((resolve) => setTimeout(resolve, 2500));
      await route.continue();
    });
    const pdfButton = block.button("download-report-pdf");
    await pdfButton.focus();
    const downloaded = page.waitForEvent("download");
    // Until the page has hydrated the button has no handler and Enter does nothing: press again
    // while nothing has started (once it has, the button is disabled and the status says so).
    // Focus is set again each time: a page that re-renders while hydrating may drop it.
    await expect
      .poll(
        async () => {
          const text = (await block.status("download-report-pdf").textContent()) ?? "";
          if (text === "") {
            await pdfButton.focus();
            await page.keyboard.press("Enter");
          }
          return text;
        },
        { timeout: 15_000, interval: 250 },
      )
      .toMatch(/^Preparing the PDF…/);
    expect(await pdfButton.getAttribute("aria-busy")).toBe("true");
    expect(await pdfButton.isDisabled()).toBe(true);
    expect(await block.status("download-report-pdf").getAttribute("aria-live")).toBe("polite");
    await screenshot(page, "reports-4-preparing-pdf");
    const download = await downloaded;
    expect(download.suggestedFilename()).toMatch(/^emberline-run-[0-9a-f]{8}-v1\.pdf$/);
    await expect
      .poll(() => block.status("download-report-pdf").textContent())
      .toBe(`Ready — saved as ${download.suggestedFilename()}.`);
    expect(await pdfButton.isDisabled()).toBe(false);
    await screenshot(page, "reports-5-pdf-ready");
    await page.unroute(`**${pdfPath}`);

    // A failure the server answers (here: the CSV asked of a run that is not there) is a sentence.
    const csvPath = `/api/runs/${runId}/peaks.csv`;
    const missing = "00000000-0000-4000-8000-000000000000";
    await page.route(`**${csvPath}`, (route) =>
      route.continue({ url: route.request().url().replace(runId, missing) }),
    );
    await block.button("download-peaks-csv").click();
    await expect
      .poll(() => block.status("download-peaks-csv").textContent())
      .toMatch(/^The peaks CSV could not be prepared: [a-z].*\.$/);
    await screenshot(page, "reports-6-download-failed");
    await page.unroute(`**${csvPath}`);
    // The 404 asked for above is the only problem this test caused.
    const expected = browser.problems.filter(
      (p) => p.startsWith("HTTP 404") && (p.includes(missing) || p.includes(csvPath)),
    );
    expect(expected).toHaveLength(1);
    browser.problems.splice(browser.problems.indexOf(expected[0]), 1);
  });

  it("offers the notebook's calls as CSV", async () => {
    const { page } = browser;
    await page.goto(`/notebooks/${notebookId}`);
    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByTestId("download-calls-csv").click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^emberline-notebook-[0-9a-f]{8}-calls\.csv$/);
    expect(browser.problems).toEqual([]);
  });
});
