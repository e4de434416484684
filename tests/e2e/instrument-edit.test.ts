// Editing an instrument in Chromium: the lab lead adds a grating through the form, opens it, clicks
// "Edit instrument", changes the resolution, saves and is back on the instrument page with the new value.
// Once calibrated, the edit form shows the dispersion and pixel count fixed. A chemist sees no edit link
// and finds nothing at the edit address. The instrument page lists its spectra (none, then the lamp).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { signInAs as signInWithPassword } from "./pages/sign-in-page";
import { InstrumentsPage } from "./pages/workflow-pages";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
} from "@/lib/spectrum/synthetic/synthetic-instrument";
import { lampFile } from "../integration/support/synthetic-files";

const DEMO_PASSWORD = "emberline-demo";
const LEAD = "lead@demo.emberline.example";
const CHEMIST = "chem@demo.emberline.example";

let browser: Session;
const suffix = Date.now().toString(36);

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

const signInAs = (email: string) => signInWithPassword(browser, email, DEMO_PASSWORD);

describe("editing an instrument", () => {
  let instrumentId: string;

  it("lets the lab lead change the resolution and shows the new value", async () => {
    const { page } = browser;
    const grating = syntheticGrating();
    const name = `E2E edit grating ${suffix}`;

    await signInAs(LEAD);
    const instruments = new InstrumentsPage(page);
    await instruments.goto();
    instrumentId = await instruments.create({
      name,
      pixels: SYNTHETIC_PIXELS,
      fromNm: grating.nominalRangeNm[0],
      toNm: grating.nominalRangeNm[1],
      resolutionNm: SYNTHETIC_RESOLUTION_NM,
    });
    await page.getByText(`resolution ${SYNTHETIC_RESOLUTION_NM} nm FWHM`).waitFor();
    await page.getByRole("heading", { name: "Calibration history" }).waitFor();
    await page.getByText("Not calibrated yet").waitFor();
    await page.getByText("No spectra yet").waitFor();

    await page.getByRole("link", { name: "Edit instrument" }).click();
    await page.waitForURL(`**/instruments/${instrumentId}/edit`);
    await page.getByRole("heading", { level: 1, name: `Edit ${name}` }).waitFor();
    // The form starts from the stored values; an uncalibrated instrument's geometry may still change.
    expect(await page.getByLabel("Name").inputValue()).toBe(name);
    expect(await page.getByLabel("Pixels").inputValue()).toBe(String(SYNTHETIC_PIXELS));
    expect(await page.getByLabel("Dispersion").isEnabled()).toBe(true);
    const resolution = page.getByLabel("Resolution, FWHM (nm)");
    expect(await resolution.inputValue()).toBe(String(SYNTHETIC_RESOLUTION_NM));

    await resolution.fill("0.75");
    await screenshot(page, "instrument-edit-1-form");
    await page.getByRole("button", { name: "Save changes" }).click();
    await page.waitForURL((url) => url.pathname === `/instruments/${instrumentId}`);
    await page.getByText("resolution 0.75 nm FWHM").waitFor();
    await screenshot(page, "instrument-edit-2-saved");
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });

  it("shows a field message for a bad value and keeps what was typed", async () => {
    const { page } = browser;
    await page.goto(`/instruments/${instrumentId}/edit`);
    await page.getByLabel("Nominal range to (nm)").fill("100");
    await page.getByRole("button", { name: "Save changes" }).click();
    await page.getByText("The longest wavelength must be above the shortest.").waitFor();
    expect(await page.getByLabel("Nominal range to (nm)").inputValue()).toBe("100");
    expect(new URL(page.url()).pathname).toBe(`/instruments/${instrumentId}/edit`);
    await screenshot(page, "instrument-edit-3-invalid");
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });

  it("fixes the dispersion and pixel count once the instrument has a calibration", async () => {
    const { page } = browser;
    // The calibration is made through the API with the browser's session (the workbench has its own test).
    const uploaded = await page.request.post("/api/spectra", {
      multipart: {
        instrumentId,
        kind: "lamp",
        file: {
          name: `lamp-${suffix}.csv`,
          mimeType: "text/csv",
          buffer: Buffer.from(lampFile(syntheticGrating())),
        },
      },
    });
    expect(uploaded.status(), await uploaded.text()).toBe(201);
    const calibration = await page.request.post("/api/calibrations", {
      data: {
        instrumentId,
        spectrumId: ((await uploaded.json()) as { id: string }).id,
        lamps: ["Hg", "Ar"],
      },
    });
    expect(calibration.status(), await calibration.text()).toBe(201);

    await page.goto(`/instruments/${instrumentId}`);
    await page.getByText("default for new runs").waitFor();
    // The instrument page lists its spectra, the lamp with a way to calibrate with it.
    const spectra = page.getByTestId("instrument-spectrum");
    expect(await spectra.count()).toBe(1);
    expect(await spectra.first().textContent()).toContain(`lamp-${suffix}.csv`);
    expect(
      await spectra.first().getByRole("link", { name: "Calibrate with it" }).getAttribute("href"),
    ).toMatch(new RegExp(`^/instruments/${instrumentId}/calibrate\\?spectrum=[0-9a-f-]{36}$`));
    await screenshot(page, "instrument-edit-3b-spectra");
    await page.getByRole("link", { name: "Edit instrument" }).click();
    await page.waitForURL(`**/instruments/${instrumentId}/edit`);
    await page.getByText("its dispersion and pixel count are fixed").waitFor();
    expect(await page.getByLabel("Dispersion").isDisabled()).toBe(true);
    expect(await page.getByLabel("Pixels").getAttribute("readonly")).not.toBeNull();
    await page.getByLabel("Detector maximum (counts, optional)").fill("60000");
    await screenshot(page, "instrument-edit-4-calibrated");
    await page.getByRole("button", { name: "Save changes" }).click();
    await page.waitForURL((url) => url.pathname === `/instruments/${instrumentId}`);
    await page.getByText("detector maximum 60000 counts").waitFor();
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });

  it("offers a chemist no edit link and no edit page", async () => {
    const { page } = browser;
    await signInAs(CHEMIST);
    await page.goto(`/instruments/${instrumentId}`);
    await page.getByText("resolution 0.75 nm FWHM").waitFor();
    expect(await page.getByRole("link", { name: "Edit instrument" }).count()).toBe(0);
    browser.problems.length = 0;
    // The instruments area streams behind its loading state, so the not-found page comes with status 200.
    await page.goto(`/instruments/${instrumentId}/edit`);
    await page.getByRole("heading", { name: "Not found" }).waitFor();
    expect(await page.getByRole("button", { name: "Save changes" }).count()).toBe(0);
  });
});
