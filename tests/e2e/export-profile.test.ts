// Uploads as instruments export them, in Chromium. A lab lead adds an instrument whose files hold
// wavelengths in nm, in air, with no header: the instrument page shows that profile, and a headerless
// semicolon file with decimal commas is previewed and stored through it without a question. On an
// instrument with no profile, a headerless wavelength file (not one row per pixel) makes the upload page
// ask with a select; the answer reads the file, storing it sets the profile (the page says so), and the
// next headerless file is read through it. Screenshots of each state land in test-output/e2e/.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { signInAs as signInWithPassword } from "./pages/sign-in-page";
import { InstrumentsPage, UploadZone, chartsDrawn } from "./pages/workflow-pages";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
} from "@/lib/spectrum/synthetic/synthetic-instrument";

const DEMO_PASSWORD = "emberline-demo";
const LEAD = "lead@demo.emberline.example";
const CHEMIST = "chem@demo.emberline.example";

let browser: Session;
const suffix = Date.now().toString(36);
const grating = syntheticGrating();

/** A headerless two-column file of 600 wavelengths inside the grating's range, as `separator` and `decimal` write it. */
function headerless(separator: string, decimal: "." | ",", seed: number): string {
  const from = grating.nominalRangeNm[0] + 15;
  return (
    Array.from({ length: 600 }, (_, i) => {
      const nm = (from + i * 0.75).toFixed(2);
      // A few lines on a flat continuum, so the preview's chart has something to show.
      const counts = (
        180 +
        ((i * 37 + seed) % 23) +
        4000 * Math.exp(-(((i - 150) / 3) ** 2)) +
        2500 * Math.exp(-(((i - 420) / 4) ** 2))
      ).toFixed(1);
      const cell = (text: string) => (decimal === "," ? text.replace(".", ",") : text);
      return `${cell(nm)}${separator}${cell(counts)}`;
    }).join("\n") + "\n"
  );
}

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

const signInAs = (email: string) => signInWithPassword(browser, email, DEMO_PASSWORD);

async function newInstrument(name: string, profile: { firstColumn?: string; medium?: string }) {
  const instruments = new InstrumentsPage(browser.page);
  await instruments.goto();
  return instruments.create({
    name,
    pixels: SYNTHETIC_PIXELS,
    fromNm: grating.nominalRangeNm[0],
    toNm: grating.nominalRangeNm[1],
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
    ...profile,
  });
}

describe("uploads as instruments export them", () => {
  it("reads a headerless file through the instrument's export profile", async () => {
    const { page } = browser;
    await signInAs(LEAD);
    const instrumentId = await newInstrument(`E2E profile nm ${suffix}`, {
      firstColumn: "Wavelength in nm",
      medium: "in air",
    });
    const profile = page.getByTestId("export-profile");
    expect(await profile.textContent()).toContain(
      "Files without a header are read with their first column as Wavelength in nm, in air.",
    );
    await screenshot(page, "export-profile-1-instrument");
    // The edit form starts from the stored profile.
    await page.getByRole("link", { name: "Change the profile" }).click();
    await page.waitForURL(`**/instruments/${instrumentId}/edit`);
    expect(await page.getByLabel("First column of its files").inputValue()).toBe("nm");
    expect(await page.getByLabel("Wavelengths measured").inputValue()).toBe("air");
    await screenshot(page, "export-profile-1b-edit-form");

    await signInAs(CHEMIST);
    await page.goto(`/instruments/${instrumentId}/upload?kind=sample`);
    expect(await page.getByTestId("upload-profile").textContent()).toContain(
      "through E2E profile nm " + suffix + "'s export profile, as Wavelength in nm, in air",
    );
    const zone = new UploadZone(page);
    await zone.describe("sample", "Semicolons and decimal commas");
    await zone.drop(`no-header-${suffix}.csv`, headerless(";", ",", 1));
    await zone.awaitPreview();
    await chartsDrawn(page);
    expect(await page.getByTestId("first-column").textContent()).toBe(
      "Wavelength in nm, in air, read through the instrument's export profile",
    );
    expect(await zone.question.count()).toBe(0);
    expect(await page.getByTestId("profile-proposal").count()).toBe(0);
    expect(await page.getByTestId("preview-facts").textContent()).toContain("600");
    await screenshot(page, "export-profile-2-preview-through-profile");
    await zone.store();
    expect(await zone.status.textContent()).toMatch(/600 points, wavelength \(nm\) .* \(air\)\./);
    expect(await page.getByTestId("profile-set").count()).toBe(0);
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });

  it("asks with a select when nothing tells, then remembers the answer in the profile", async () => {
    const { page } = browser;
    await signInAs(LEAD);
    const name = `E2E profile unset ${suffix}`;
    const instrumentId = await newInstrument(name, {});
    expect(await page.getByTestId("export-profile").textContent()).toContain("Not set yet");

    await signInAs(CHEMIST);
    await page.goto(`/instruments/${instrumentId}/upload?kind=sample`);
    expect(await page.getByTestId("upload-profile").textContent()).toContain(
      "otherwise you are asked what its first column holds",
    );
    await screenshot(page, "export-profile-3-upload-page");
    const zone = new UploadZone(page);
    await zone.describe("sample", "Tab-separated, no header");
    await zone.drop(`ask-${suffix}.txt`, headerless("\t", ".", 2));
    await zone.question.waitFor({ timeout: 30_000 });
    expect(await zone.question.getByRole("heading").textContent()).toBe(
      `What does the first column of ask-${suffix}.txt hold?`,
    );
    expect(await page.evaluate(() => document.activeElement?.id)).toBe("first-column-question");
    expect(await zone.question.getByRole("alert").textContent()).toBe(
      "The file does not say what its first column holds.",
    );
    expect(await zone.question.textContent()).toContain(
      `Storing the file with your answer makes the answer ${name}'s export profile`,
    );
    // No option was chosen: the select says so, and nothing is sent.
    await zone.question.getByRole("button", { name: "Read the file this way" }).click();
    await zone.question.getByText("Choose what the first column holds.").waitFor();
    await screenshot(page, "export-profile-4-question");
    // The one failed response is the preview's refusal that made the page ask.
    expect(browser.problems).toEqual(["HTTP 400 /api/spectra/preview"]);
    browser.problems.length = 0;

    await zone.answerFirstColumn("Wavelength in nm", "in vacuum");
    await zone.awaitPreview();
    await chartsDrawn(page);
    expect(await page.getByTestId("first-column").textContent()).toBe(
      "Wavelength in nm, in vacuum, read as you said",
    );
    expect(await page.getByTestId("profile-proposal").textContent()).toContain(
      `${name} has no export profile yet. Storing this file also sets it: files without a header will then be read with their first column as Wavelength in nm, in vacuum.`,
    );
    await screenshot(page, "export-profile-5-preview-with-answer");
    await zone.store();
    expect(await zone.status.textContent()).toMatch(/\(vacuum\)\.$/);
    expect(await page.getByTestId("profile-set").textContent()).toContain(
      "Files without a header are now read with their first column as Wavelength in nm, in vacuum.",
    );
    await screenshot(page, "export-profile-6-stored-profile-set");

    await page.goto(`/instruments/${instrumentId}`);
    expect(await page.getByTestId("export-profile").textContent()).toContain(
      "Wavelength in nm, in vacuum",
    );

    // The next headerless file is read through the remembered answer, without a question.
    await page.goto(`/instruments/${instrumentId}/upload?kind=sample`);
    await zone.describe("sample", "Spaces, no header");
    await zone.drop(`remembered-${suffix}.txt`, headerless("  ", ".", 3));
    await zone.awaitPreview();
    expect(await page.getByTestId("first-column").textContent()).toBe(
      "Wavelength in nm, in vacuum, read through the instrument's export profile",
    );
    expect(await page.getByTestId("profile-proposal").count()).toBe(0);
    // Read differently for this file only: the question again, this time without a refusal.
    await zone.preview.getByRole("button", { name: "Read the first column differently…" }).click();
    await zone.question.waitFor();
    expect(await zone.question.getByRole("alert").count()).toBe(0);
    expect(await zone.question.textContent()).toContain(
      `Your answer is used for this file only; ${name}'s export profile (Wavelength in nm, in vacuum) stays as it is.`,
    );
    expect(await zone.question.getByLabel("First column").inputValue()).toBe("nm");
    await screenshot(page, "export-profile-7-read-differently");
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });
});
