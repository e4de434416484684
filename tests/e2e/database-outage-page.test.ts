// A page during a database outage, in Chromium: the error boundary says the database is unreachable
// (it asks /api/health, since a production build hides the server's error), and "Try again" shows the
// page once PostgreSQL is back. The test's cluster is stopped with pg_ctl and always started again.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { signInAs } from "./pages/sign-in-page";
import { startDatabase, stopDatabase } from "../integration/support/cluster";
import { APP_URL } from "../integration/support/http-client";

let browser: Session;
let stopped = false;

beforeAll(async () => {
  browser = await openBrowser();
  await signInAs(browser, "chem@demo.emberline.example", "emberline-demo");
}, 120_000);

afterAll(async () => {
  if (stopped) startDatabase();
  await browser?.close();
});

async function health(): Promise<number> {
  return (await fetch(`${APP_URL}/api/health`)).status;
}

describe("a page while the database is down", () => {
  it("says the database is unreachable, and shows the page again once it is back", async () => {
    const { page } = browser;
    await page.goto("/notebooks");
    await page.getByRole("heading", { level: 1 }).first().waitFor();

    stopDatabase();
    stopped = true;
    await page.goto("/notebooks");
    const alert = page.getByRole("alert").filter({ hasText: "The database is unreachable" });
    await alert.waitFor({ timeout: 20_000 });
    expect(await alert.textContent()).toMatch(/Try again in a few seconds/);
    await screenshot(page, "database-outage-page");

    startDatabase();
    stopped = false;
    for (let i = 0; i < 60 && (await health()) !== 200; i++)
      await new Promise((resolve) => setTimeout(resolve, 500));
    await page.reload();
    await page.getByRole("heading", { level: 1, name: "Notebooks" }).waitFor({ timeout: 20_000 });
  });
});
