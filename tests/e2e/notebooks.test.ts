// Notebooks in Chromium: the chemist opens a notebook, starts two runs from the sample picker (the
// seeded demo flame sample and lamp read-back on the demo grating), filters the runs by a species
// called present, by status and by text, sees the empty state, reloads a shared filtered address,
// and renames the notebook. Screenshots land in test-output/e2e/.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { SignInPage } from "./pages/sign-in-page";
import { NotebookPage } from "./pages/notebook-page";

const DEMO_PASSWORD = "emberline-demo";
const CHEMIST = "chem@demo.emberline.example";
const DEMO_INSTRUMENT = "Bench grating";
const FLAME_SAMPLE = "Mixed chloride salts, loop 1";
const LAMP_SAMPLE = "Hg–Ar lamp, read back as a sample";

let browser: Session;
const suffix = Date.now().toString(36);

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

describe("notebooks", () => {
  it("lets the chemist filter a notebook's runs and rename the notebook", async () => {
    const { page } = browser;
    const signIn = new SignInPage(page);
    await signIn.goto();
    await signIn.signIn(CHEMIST, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === "/");

    await page.goto("/notebooks");
    await page.getByRole("link", { name: "Chloride salts, week 48" }).waitFor();
    await screenshot(page, "notebooks-1-list");
    await page.getByLabel("Search titles").fill("read-back");
    await page.waitForURL(/\?q=read-back/);
    await page.getByRole("link", { name: "Lamp read-back checks" }).waitFor();
    await page
      .getByRole("link", { name: "Chloride salts, week 48" })
      .waitFor({ state: "detached" });
    expect(await page.getByTestId("notebooks-count").textContent()).toMatch(/shown$/);

    await page.getByLabel("Title", { exact: true }).fill(`Filter practice ${suffix}`);
    await page.getByRole("button", { name: "Open the notebook" }).click();
    await page.waitForURL(/\/notebooks\/[0-9a-f-]{36}$/);
    const notebookUrl = new URL(page.url()).pathname;
    const notebook = new NotebookPage(page);
    expect(await page.getByTestId("runs-empty").textContent()).toContain("No runs yet");

    await notebook.startRun(DEMO_INSTRUMENT, FLAME_SAMPLE, "flame");
    await page.goto(notebookUrl);
    await screenshot(page, "notebooks-2-run-form");
    await notebook.startRun(DEMO_INSTRUMENT, LAMP_SAMPLE, "lamp");
    await page.goto(notebookUrl);
    await notebook.waitForRuns(2);
    await screenshot(page, "notebooks-3-runs");

    // Mercury is called only in the lamp read-back; the filter goes into the URL.
    await page.getByLabel("Called present").fill("Hg I");
    await page.waitForURL(/species=Hg\+I|species=Hg%20I/);
    await notebook.waitForRuns(1);
    expect(await notebook.rows.first().textContent()).toContain(LAMP_SAMPLE);
    await page.getByLabel("Status").selectOption("draft");
    await page.waitForURL(/status=draft/);
    await notebook.waitForRuns(1);
    await screenshot(page, "notebooks-4-filtered");

    // A shared address opens with the same filters and the same rows.
    const shared = page.url();
    await page.goto(shared);
    await notebook.waitForRuns(1);
    expect(await page.getByLabel("Called present").inputValue()).toBe("Hg I");
    expect(await page.getByLabel("Status").inputValue()).toBe("draft");

    await page.getByLabel("Status").selectOption("signed");
    await page
      .getByTestId("runs-empty")
      .filter({ hasText: "No runs match these filters." })
      .waitFor();
    await screenshot(page, "notebooks-5-no-match");
    await page.getByRole("button", { name: "Clear the filters" }).first().click();
    await notebook.waitForRuns(2);
    expect(new URL(page.url()).search).toBe("");

    await page.getByLabel("Search", { exact: true }).fill("chloride");
    await notebook.waitForRuns(1);
    expect(await notebook.rows.first().textContent()).toContain(FLAME_SAMPLE);

    const title = `Filter practice, renamed ${suffix}`;
    await notebook.rename(title);
    await page
      .getByRole("status")
      .filter({ hasText: `Renamed to “${title}”.` })
      .waitFor();
    await page.getByRole("heading", { level: 1, name: title }).waitFor();
    await screenshot(page, "notebooks-6-renamed");
    await notebook.rename("");
    await page.getByText("Give the notebook a title.").waitFor();
    expect(await page.getByRole("heading", { level: 1 }).textContent()).toBe(title);
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  }, 240_000);
});
