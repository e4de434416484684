// The home page in Chromium, as each demo role: "Waiting for you" shows the headings of that role
// (a supervisor's review queue, a lab lead's line table), every item links where the work is done,
// and recent activity reads as sentences, never raw event names. Screenshots go to
// test-output/e2e/home-*.png.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { SignInPage } from "./pages/sign-in-page";
import { WorkspaceShell } from "./pages/workspace-shell";

const DEMO_PASSWORD = "emberline-demo";
const PEOPLE = [
  { role: "chemist", email: "chem@demo.emberline.example" },
  { role: "supervisor", email: "super@demo.emberline.example" },
  { role: "lab-lead", email: "lead@demo.emberline.example" },
] as const;

let browser: Session;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

async function signIn(email: string): Promise<void> {
  await browser.context.clearCookies();
  browser.problems.length = 0;
  const page = new SignInPage(browser.page);
  await page.goto();
  await page.signIn(email, DEMO_PASSWORD);
  await new WorkspaceShell(browser.page).waitUntilShown();
}

describe("the home page", () => {
  for (const person of PEOPLE) {
    it(`tells the ${person.role} what is waiting and what happened, in words`, async () => {
      const { page } = browser;
      await signIn(person.email);
      await page.goto("/");
      const waiting = page.getByTestId("waiting");
      await waiting.getByRole("heading", { name: "Waiting for you", exact: true }).waitFor();
      const headings = await waiting.getByRole("heading", { level: 3 }).allTextContents();
      if (person.role === "lab-lead") {
        expect(headings.some((h) => h.startsWith("Unverified lines in the published table"))).toBe(
          true,
        );
        expect(headings.some((h) => h.startsWith("Runs waiting for your review"))).toBe(false);
      }
      if (person.role === "chemist") {
        expect(headings.some((h) => /review|line table|Unverified|calibrated/.test(h))).toBe(false);
      }
      // Every listed item opens a page of the app.
      for (const href of await waiting
        .getByRole("link")
        .evaluateAll((links) => links.map((a) => a.getAttribute("href")))) {
        expect(href).toMatch(/^\/(runs|instruments|lines|review)\b/);
      }
      const activity = page.getByTestId("activity");
      if (await activity.count()) {
        const items = await activity.locator("li").allTextContents();
        expect(items.length).toBeGreaterThan(0);
        for (const text of items) {
          // No raw event name such as "run.create" or "line_release.publish".
          expect(text).not.toMatch(
            /\b(run|notebook|lines?|line_release|instrument|calibration|spectrum|session|token|password|user|membership|invitation)\.[a-z_]+\b/,
          );
          expect(text).toMatch(/\.\s*(—.*)?\d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC$/);
        }
      }
      await screenshot(page, `home-${person.role}`);
      expect(browser.problems, browser.problems.join("\n")).toEqual([]);
    });
  }
});
