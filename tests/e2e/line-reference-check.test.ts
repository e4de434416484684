// The reference check in Chromium: the demo lab lead goes from the line library to "Check against a
// reference", sees a bad file refused with its located problem, checks the example reference file
// (plus one deliberately shifted test row), keeps our value for that disagreement, confirms, and finds
// the verified rows with their citation in the draft and on a line's page. Screenshots go to
// test-output/e2e/line-reference-check-*.png.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { LineLibraryPage } from "./pages/line-library-page";
import { ReferenceCheckPage } from "./pages/reference-check-page";
import { SignInPage } from "./pages/sign-in-page";
import { WorkspaceShell } from "./pages/workspace-shell";

const DEMO_PASSWORD = "emberline-demo";
const EXAMPLE = fs.readFileSync(
  path.resolve(__dirname, "../fixtures/lines/reference-check-example.csv"),
  "utf8",
);
// The starter table's Hg I 576.960 nm moved by 0.010 nm: a test value, not reference data, so that the
// check has a disagreement for the lead to decide.
const SHIFTED_ROW =
  'Hg I,576.970,0.0005,"Browser test: deliberately shifted by 0.010 nm (a test value, not reference data)",air';
const REFERENCE = `${EXAMPLE.trimEnd()}\n${SHIFTED_ROW}\n`;

let browser: Session;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

beforeEach(async () => {
  await browser.context.clearCookies();
  browser.problems.length = 0;
});

describe("checking the draft against a reference", () => {
  it("refuses a bad file, then verifies the agreeing rows with their citation in one confirmed step", async () => {
    const { page } = browser;
    const signIn = new SignInPage(page);
    await signIn.goto();
    await signIn.signIn("lead@demo.emberline.example", DEMO_PASSWORD);
    await new WorkspaceShell(page).waitUntilShown();

    const library = new LineLibraryPage(page);
    await library.goto();
    await page.getByRole("link", { name: "Check against a reference" }).click();
    await page.waitForURL((url) => url.pathname === "/lines/reference");
    const check = new ReferenceCheckPage(page);
    // Without a draft the page offers to open one first.
    const open = page.getByRole("main").getByRole("button", { name: "Open the draft" });
    if (await open.isVisible()) {
      await open.click();
      await page.waitForURL((url) => url.pathname === "/lines/draft");
      await page.goto("/lines/reference");
    }
    await check.waitUntilShown();
    await screenshot(page, "line-reference-check-1-form");

    // A file without its uncertainty column is refused whole, saying where and that nothing was written.
    await check.check(
      "no-uncertainty.csv",
      "species,wavelength_nm,citation\nNa I,588.995,test\n",
      "air",
      { expect: "refusal" },
    );
    expect(await check.error.first().textContent()).toMatch(
      /nothing was compared or written.*"uncertainty_nm" is missing/,
    );
    // The file field's own error region (aria-describedby of the file input) lists the located problems.
    expect(await page.locator("#reference-file-error").textContent()).toMatch(
      /^Line 1: required column "uncertainty_nm" is missing/,
    );
    await screenshot(page, "line-reference-check-2-refused");

    await check.check("nist-asd-example.csv", REFERENCE);
    const agreeing = [
      ...(await check.agreeing.allTextContents()),
      ...(await check.alreadyVerified.allTextContents()),
    ].join("\n");
    // The starter table's values were typed from the same source as the example file's (both from memory).
    for (const line of ["Na I 588.995", "Na I 589.592", "Hg I 435.833", "Hg I 546.074"]) {
      expect(agreeing).toContain(line);
    }
    // Hg I 253.652 nm in air is compared with the file's vacuum 253.728 nm (Morton 2000).
    expect(agreeing).toMatch(/Hg I 253\.728\s*vacuum/);
    expect(await check.disagreeing.count()).toBe(1);
    const disagreement = (await check.disagreeing.first().textContent()) ?? "";
    expect(disagreement).toContain("576.960");
    expect(disagreement).toContain("−0.0100");
    expect(await check.referenceOnly.allTextContents()).toEqual([
      expect.stringContaining("Na I 285.281 nm (air)"),
    ]);
    await screenshot(page, "line-reference-check-3-preview");

    await check.decide("576.960", "Keep ours");
    const confirm = (await check.confirmButton.textContent()) ?? "";
    const count = Number(confirm.match(/^Mark (\d+)/)?.[1]);
    expect(count).toBeGreaterThanOrEqual(1);
    expect(confirm).toMatch(/with their citations \(\d+ sources\)$/);
    await check.reason.fill("Checked the sodium and mercury lines in the browser test.");
    await check.confirmButton.click();
    await page
      .getByRole("status")
      .filter({
        hasText: new RegExp(`^Marked ${count} rows? verified; kept our value in 1 row\\.$`),
      })
      .waitFor();
    await screenshot(page, "line-reference-check-4-confirmed");

    // The draft filtered to verified rows shows the citation beside the mark.
    await page.getByRole("link", { name: "Show the verified rows of the draft" }).click();
    await page.waitForURL((url) => url.searchParams.get("verified") === "yes");
    await page.goto("/lines/draft?element=Hg&minNm=546&maxNm=546.2&verified=yes");
    const row = page.getByTestId("line-table").locator("tbody tr").first();
    await row.waitFor();
    expect(await row.textContent()).toContain("546.074");
    expect(await row.getByTestId("verified-citation").textContent()).toMatch(
      /against NIST ASD ver\. 5\.x/,
    );
    // The kept row stays unverified.
    await page.goto("/lines/draft?element=Hg&minNm=576.9&maxNm=577&verified=no");
    expect(
      await page.getByTestId("line-table").locator("tbody tr").first().textContent(),
    ).toContain("576.96");
    await screenshot(page, "line-reference-check-5-unverified-filter");

    // The line's page says what it was verified against, by whom, and its history holds the step.
    await page.goto("/lines/draft?element=Hg&minNm=546&maxNm=546.2&verified=yes");
    await row.getByRole("link", { name: "Hg I" }).click();
    await page.getByTestId("verified-against").waitFor();
    expect(await page.getByTestId("verified-against").textContent()).toMatch(
      /Against the reference: NIST ASD ver\. 5\.x/,
    );
    await page
      .getByTestId("line-history")
      .getByText("verified against a reference", { exact: false })
      .first()
      .waitFor();
    await screenshot(page, "line-reference-check-6-line-page");
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });
});
