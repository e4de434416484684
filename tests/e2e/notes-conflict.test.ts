// A notes conflict in Chromium: the same run open in two tabs; the second tab saves first, then the
// first tab's save is refused as stale. Its text stays in the box with the newer notes shown beside it
// (nothing is lost), and the user either takes the newer notes or saves their own over them.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { signInAs } from "./pages/sign-in-page";
import { signInDemo } from "../integration/support/accounts";
import { draftRun, type DraftRun } from "../integration/support/review-fixtures";

const CHEMIST = "chem@demo.emberline.example";
const DEMO_PASSWORD = "emberline-demo";

let browser: Session;
let run: DraftRun;

beforeAll(async () => {
  const lead = await signInDemo("labLead");
  const chemist = await signInDemo("chemist");
  run = await draftRun(lead, chemist, chemist, "E2E notes conflict");
  browser = await openBrowser();
  await signInAs(browser, CHEMIST, DEMO_PASSWORD);
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

describe("a notes conflict", () => {
  it("keeps the user's text beside the newer notes and lets them save theirs over them", async () => {
    const { page, context } = browser;
    const other = await context.newPage();
    await Promise.all([page.goto(`/runs/${run.id}`), other.goto(`/runs/${run.id}`)]);
    const mine = "Li I 670.8 nm checked against the morning lamp; the K I doublet is weak.";
    const theirs = "Saved from the other tab: sample diluted 1:10 before the loop.";

    await page.getByLabel("Notes", { exact: true }).fill(mine);
    await other.getByLabel("Notes", { exact: true }).fill(theirs);
    await other.getByRole("button", { name: "Save notes" }).click();
    await expect
      .poll(() => other.getByTestId("notes-status").textContent(), { timeout: 20_000 })
      .toBe("Saved");
    await other.close();

    await page.getByRole("button", { name: "Save notes" }).click();
    const newer = page.getByTestId("newer-notes");
    await newer.waitFor({ timeout: 20_000 });
    expect(await newer.textContent()).toContain(theirs);
    expect(await page.getByLabel("Your text (not saved)").inputValue()).toBe(mine);
    expect(await page.getByTestId("notes-form").getByRole("alert").textContent()).toMatch(
      /^Someone saved these notes since you opened them\. Your text is kept/,
    );
    await screenshot(page, "notes-conflict-1-side-by-side");

    await newer.getByRole("button", { name: "Save my text over them" }).click();
    await expect
      .poll(() => page.getByTestId("notes-status").textContent(), { timeout: 20_000 })
      .toBe("Saved");
    expect(await page.getByTestId("newer-notes").count()).toBe(0);
    await page.reload();
    expect(await page.getByLabel("Notes", { exact: true }).inputValue()).toBe(mine);
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });
});
