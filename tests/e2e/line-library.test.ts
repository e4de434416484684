// The line library end to end: the lab lead imports a small CSV into the draft, checks the preview
// (one add, one change, one rejection with its file line), applies it and publishes a release; then
// a chemist finds the new release in the picker and the added line by filtering. Screenshots go to
// test-output/e2e/line-library-*.png.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import path from "node:path";
import { openBrowser, screenshot, SCREENSHOT_DIR, type Session } from "./support/browser";
import { LineDraftPage, LineLibraryPage } from "./pages/line-library-page";
import { SignInPage } from "./pages/sign-in-page";
import { WorkspaceShell } from "./pages/workspace-shell";

const DEMO_PASSWORD = "emberline-demo";
const HEADER =
  "species,air_nm,vacuum_nm,uncertainty_nm,intensity_flame,intensity_arc,intensity_spark,intensity_plasma,intensity_lamp,lower_ev,upper_ev,g_upper,a_per_s,flags,band_extent_nm,band_degrades_to,source,verified,note";
const SOURCE = '"NIST Atomic Spectra Database (ver. 5.x), from memory — unverified"';

// Line 2: a silver line the starter table lacks (Ag I 827.35 nm, value from memory; the test only
// needs a row that passes every check). Line 3: the starter table's Ag I 546.549 row with its flame
// intensity raised from 10 to 25. Line 4: a wavelength that is not a number.
const IMPORT_CSV = [
  HEADER,
  `Ag I,827.352,,0.002,,100,50,,,,,,,,,,${SOURCE},false,Browser-test row.`,
  `Ag I,546.549,546.701,0.002,25,400,300,,,3.7782,6.0461,6,8.6e+7,,,,${SOURCE},false,`,
  `Ag I,5x6.1,,0.002,,100,,,,,,,,,,,${SOURCE},false,`,
].join("\n");

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

async function signIn(email: string): Promise<void> {
  const signInPage = new SignInPage(browser.page);
  await signInPage.goto();
  await signInPage.signIn(email, DEMO_PASSWORD);
  await new WorkspaceShell(browser.page).waitUntilShown();
}

describe("the line library", () => {
  it("lets the lab lead import, check, apply and publish, and the chemist find the new line", async () => {
    const { page } = browser;
    const library = new LineLibraryPage(page);
    const draft = new LineDraftPage(page);

    await signIn("lead@demo.emberline.example");
    await library.goto();
    await library.table.waitFor();
    await screenshot(page, "line-library-1-lead-browse");
    await library.openDraft();
    await draft.waitUntilShown();

    await draft.previewImport("silver.csv", IMPORT_CSV);
    expect(await draft.previewAdds.count()).toBe(1);
    expect(await draft.previewAdds.first().textContent()).toContain("827.352");
    expect(await draft.previewChanges.count()).toBe(1);
    const change = (await draft.previewChanges.first().textContent()) ?? "";
    expect(change).toContain("546.549");
    expect(change).toMatch(/10\s*→\s*25/);
    expect(await draft.previewErrors.count()).toBe(1);
    const rejection = (await draft.previewErrors.first().textContent()) ?? "";
    expect(rejection).toContain("line 4");
    expect(rejection).toContain("air_nm");
    await screenshot(page, "line-library-2-import-preview");
    await page
      .getByRole("region", { name: "Import a CSV" })
      .screenshot({ path: path.join(SCREENSHOT_DIR, "line-library-2-import-preview-panel.png") });

    // Nothing is written before the lead applies: the draft still lacks the new line.
    expect(await page.getByTestId("line-table").getByText("827.352").count()).toBe(0);
    await draft.apply();
    await page.getByTestId("line-table").waitFor();
    await screenshot(page, "line-library-3-applied");

    // Publishing asks first; Escape leaves the draft a draft (the page stays on /lines/draft).
    const number = await draft.publish(
      "Adds Ag I 827.35 nm and raises the flame intensity of Ag I 546.55 nm.",
      { cancelFirst: true },
    );
    expect(number).toBeGreaterThanOrEqual(2);
    await page
      .getByRole("status")
      .filter({ hasText: `Release ${number} is published` })
      .waitFor();
    expect(await library.shownRelease.textContent()).toBe(`Release ${number}`);
    await screenshot(page, "line-library-4-published");
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
    await new WorkspaceShell(page).signOut();

    await browser.context.clearCookies();
    await signIn("chem@demo.emberline.example");
    await library.goto();
    expect(await library.selectedRelease()).toMatch(new RegExp(`^Release ${number} ·`));
    expect(await library.releaseOptions()).not.toContainEqual(expect.stringMatching(/^Draft/));
    // Chemists browse read-only: no way into the draft.
    expect(await page.getByRole("button", { name: "Open the draft" }).count()).toBe(0);
    expect(await page.getByRole("link", { name: "Continue the draft" }).count()).toBe(0);

    await library.filter({ element: "Ag", minNm: "827", maxNm: "828" });
    expect(await library.rows.count()).toBe(1);
    expect(await library.rows.first().textContent()).toContain("827.352");
    expect(new URL(page.url()).searchParams.get("element")).toBe("Ag");
    await screenshot(page, "line-library-5-chemist-finds-line");

    // The release's CSV export holds the new line.
    const exportHref = await page
      .getByRole("link", { name: `Download release ${number} as CSV` })
      .getAttribute("href");
    const exported = await page.request.get(exportHref ?? "");
    expect(exported.status()).toBe(200);
    expect(await exported.text()).toContain("827.352");

    // The changed line's page shows the import in its history, with the value before and after.
    await library.filter({ element: "Ag", minNm: "546.5", maxNm: "546.6" });
    await library.rows.first().getByRole("link", { name: "Ag I" }).click();
    await page.getByTestId("line-history").waitFor();
    expect(await page.getByTestId("line-values").textContent()).toContain("25");
    expect(await page.getByTestId("line-history").textContent()).toMatch(/10\s*→\s*25/);
    await screenshot(page, "line-library-6-line-history");
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);

    // The draft is the lab leads' alone. The page streams behind a loading state, so the answer is
    // the not-found page rather than a 404 status.
    await page.goto("/lines/draft");
    await page.getByRole("heading", { level: 1, name: "Not found" }).waitFor();
    expect(await page.getByText("Draft of the line table").count()).toBe(0);
    await screenshot(page, "line-library-7-chemist-draft-not-found");
  });

  it("asks the lab lead for a reason and refuses a change to a row someone else changed first", async () => {
    const { page, context } = browser;
    await signIn("lead@demo.emberline.example");
    const library = new LineLibraryPage(page);
    await library.goto();
    await library.openDraft();
    const query = "/lines/draft?element=Ag&minNm=546.5&maxNm=546.6";
    // A second tab holds the same row at the same version, as a second lead would.
    const other = await context.newPage();
    await Promise.all([page.goto(query), other.goto(query)]);

    const row = (p: typeof page) => p.getByTestId("line-table").locator("tbody tr").first();
    await row(page).locator("summary").click();
    await row(page).getByLabel("Reason").fill("Checking the retire path in the browser test.");
    await row(page).getByRole("button", { name: "Retire" }).click();
    await row(page).getByRole("status").filter({ hasText: "Retired in the draft." }).waitFor();
    await row(page).getByText("retired", { exact: true }).waitFor();
    await screenshot(page, "line-library-8-retired");

    await row(other).locator("summary").click();
    await row(other).getByLabel("Reason").fill("Marking it verified from the stale tab.");
    await row(other).getByRole("button", { name: "Mark verified" }).click();
    await row(other)
      .getByRole("alert")
      .filter({ hasText: "Someone else changed this line first. Reload to see their change." })
      .waitFor();
    await screenshot(other, "line-library-9-conflict");
    await other.close();

    // Restore it, so the draft is as it was.
    await page.reload();
    await row(page).locator("summary").click();
    await row(page).getByLabel("Reason").fill("Undoing the browser test's retirement.");
    await row(page).getByRole("button", { name: "Restore" }).click();
    await row(page).getByRole("status").filter({ hasText: "Restored in the draft." }).waitFor();

    // A correction: only the note changes, so the history shows that field alone.
    await row(page).getByRole("link", { name: "Correct values" }).click();
    const correction = page.getByRole("region", { name: /^Correct Ag I 546\.549 nm$/ });
    await correction.waitFor();
    await correction.getByLabel("Note").fill("Checked in the browser test.");
    await correction
      .getByLabel("Reason for this change")
      .fill("Adding a note in the browser test.");
    await correction.getByRole("button", { name: "Save the correction" }).click();
    await correction
      .getByRole("status")
      .filter({ hasText: "The correction is in the draft." })
      .waitFor();
    await screenshot(page, "line-library-10-corrected");
    await row(page).getByRole("link", { name: "Ag I" }).click();
    await page
      .getByTestId("line-history")
      .getByText("Adding a note in the browser test.")
      .waitFor();
    const history =
      (await page.getByTestId("line-history").locator("li").last().textContent()) ?? "";
    expect(history).toContain("note");
    expect(history).not.toContain("vacuumNm");
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });
});
