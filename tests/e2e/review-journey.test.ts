// Review and sign-off in Chromium: a draft run is made through the API (instrument, lamp calibration,
// synthetic flame sample); the chemist submits it from the run page; the supervisor sees the count in
// the navigation, opens the queue, marks a call and returns the run with a comment; the chemist reads
// the comment, answers it in the run's notes and a reply, and resubmits; the supervisor signs with the password, the
// run shows Signed, and the supervisor downloads its PDF, which carries the signature and the caveat.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { RunDownloadsBlock } from "./pages/report-pages";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { signInAs as signInWithPassword } from "./pages/sign-in-page";
import { signInDemo } from "../integration/support/accounts";
import type { ApiClient } from "../integration/support/http-client";
import { draftRun, type DraftRun } from "../integration/support/review-fixtures";

const DEMO_PASSWORD = "emberline-demo";
const CHEMIST = "chem@demo.emberline.example";
const SUPERVISOR = "super@demo.emberline.example";

let browser: Session;
let run: DraftRun;

beforeAll(async () => {
  const lead: ApiClient = await signInDemo("labLead");
  const chemist: ApiClient = await signInDemo("chemist");
  run = await draftRun(lead, chemist, chemist, "E2E review");
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

const signInAs = (email: string) => signInWithPassword(browser, email, DEMO_PASSWORD);

describe("the review journey", () => {
  it("goes from submission through a return and a resubmission to a signature", async () => {
    const { page } = browser;
    const comment = "Please check the lithium line against a fresh lamp spectrum.";

    // The chemist submits the draft from its run page.
    await signInAs(CHEMIST);
    await page.goto(`/runs/${run.id}`);
    const panel = page.getByTestId("run-review-panel");
    await expect.poll(() => panel.getByTestId("run-status").textContent()).toBe("Draft");
    await screenshot(page, "review-1-draft-run");
    await page
      .getByLabel("Reviewer", { exact: true })
      .selectOption({ label: "Any supervisor of the team" });
    await panel.getByRole("button", { name: "Submit for review" }).click();
    await expect
      .poll(() => panel.getByTestId("run-status").textContent(), { timeout: 20_000 })
      .toBe("Awaiting review");
    expect(await panel.getByTestId("lock-note").textContent()).toMatch(/waiting for review/);
    await screenshot(page, "review-2-submitted");

    // The supervisor sees the count, opens the queue and the run.
    await signInAs(SUPERVISOR);
    const count = Number(
      await page
        .getByTestId("nav-count-review")
        .textContent()
        .then((t) => t?.match(/\d+/)?.[0]),
    );
    expect(count).toBeGreaterThanOrEqual(1);
    await page.getByRole("link", { name: /^Review/ }).click();
    await page.waitForURL(/\/review$/);
    const row = page
      .getByTestId("queue-row")
      .filter({ has: page.locator(`a[href="/review/${run.id}"]`) });
    await row.waitFor();
    expect(await row.textContent()).toContain("Mara Quist");
    await screenshot(page, "review-3-queue");
    await row.getByRole("link").first().click();
    await page.waitForURL(new RegExp(`/review/${run.id}$`));
    await page.getByTestId("review-pairs").waitFor();
    const settings = (await page.getByTestId("review-settings").textContent()) ?? "";
    expect(settings).toContain("Software");
    // Settings left blank show the defaults they stand for.
    expect(settings).toContain("Detection threshold (min SNR, minSnr)5 (default)");
    expect(settings).toContain("Match window (k·σ, k)3 (default)");

    // A mark on the first call, then the return with a comment.
    const firstCall = page.getByTestId("call-to-review").first();
    await firstCall.getByRole("radio", { name: "Agree", exact: true }).check();
    await firstCall.getByRole("button", { name: "Add the mark" }).click();
    await page.getByTestId("review-mark").first().waitFor({ timeout: 20_000 });
    await page.getByLabel("What should the author look at again?").fill(comment);
    // The supervisor judges the spectrum and the calibration's residuals, not only the tables: every
    // chart on the page is drawn before the page is looked at.
    const charts = page.getByTestId("chart");
    expect(await charts.count()).toBeGreaterThan(0);
    for (let i = 0; i < (await charts.count()); i++) {
      await charts.nth(i).locator(".main-svg").first().waitFor({ timeout: 30_000 });
    }
    await screenshot(page, "review-4-review-page");
    // The calls come before Decide on the page: the reviewer reads them first.
    const callsTop = (await page.getByTestId("calls-to-review").boundingBox())!.y;
    const decideTop = (await page.getByRole("heading", { name: "Decide" }).boundingBox())!.y;
    expect(callsTop).toBeLessThan(decideTop);
    await page.getByRole("button", { name: "Return with comments" }).click();
    await page
      .getByTestId("round-comment")
      .filter({ hasText: comment })
      .waitFor({ timeout: 20_000 });
    expect(await page.getByRole("heading", { name: "Decide" }).count()).toBe(0);
    // The page then says what was done, not that the run cannot be decided.
    const outcome = page.getByTestId("review-outcome");
    expect(await outcome.textContent()).toMatch(
      /^Returned for revision\. You returned this run to its author on \d{4}-\d\d-\d\d \d\d:\d\d UTC \(round 1\)\./,
    );
    expect(await page.getByText("You cannot decide").count()).toBe(0);
    await screenshot(page, "review-5-returned");

    // The chemist reads the comment on the run page and submits again.
    await signInAs(CHEMIST);
    await page.goto(`/runs/${run.id}`);
    await expect
      .poll(() => panel.getByTestId("run-status").textContent())
      .toBe("Returned for revision");
    expect(await panel.getByTestId("round-comment").first().textContent()).toContain(comment);
    await screenshot(page, "review-6-returned-to-author");
    const answer = "Rechecked Li I 670.8 nm against this morning's lamp spectrum: unchanged.";
    await page.getByLabel("Notes", { exact: true }).fill(answer);
    await page.getByRole("button", { name: "Save notes" }).click();
    await expect
      .poll(() => page.getByTestId("notes-status").textContent(), { timeout: 20_000 })
      .toBe("Saved");
    const reply = "Rechecked against a fresh lamp spectrum; see the notes.";
    await panel.getByLabel("Reply to the reviewer's comments").fill(reply);
    await panel.getByLabel("Reviewer", { exact: true }).selectOption({ label: "Tobias Wren" });
    await panel.getByRole("button", { name: "Submit for review" }).click();
    await expect
      .poll(() => panel.getByTestId("run-status").textContent(), { timeout: 20_000 })
      .toBe("Awaiting review");

    // The supervisor signs with the password; the run shows Signed with the signature.
    await signInAs(SUPERVISOR);
    await page.goto(`/review/${run.id}`);
    expect(await page.getByTestId("signature-meaning").textContent()).toContain(
      "Reviewed and approved",
    );
    await page.getByLabel("Your password, to confirm it is you").fill(DEMO_PASSWORD);
    await screenshot(page, "review-7-sign-form");
    await page.getByRole("button", { name: /^Sign:/ }).click();
    await page.getByTestId("signature").waitFor({ timeout: 20_000 });
    expect(await page.getByTestId("signature").textContent()).toContain("Tobias Wren");
    expect(await page.getByTestId("round-reply").textContent()).toContain(reply);
    expect(await page.getByTestId("review-outcome").textContent()).toMatch(
      /^Signed\. You signed this run on .* UTC \(round 2\), meaning “Reviewed and approved”\./,
    );
    await page.goto(`/runs/${run.id}`);
    await expect.poll(() => panel.getByTestId("run-status").textContent()).toBe("Signed");
    expect(await panel.getByTestId("signature").textContent()).toMatch(/[0-9a-f]{64}/);
    // The signed run offers an amendment (a new version) instead of any edit.
    await panel.getByRole("button", { name: /^Amend: start version 2/ }).waitFor();
    await screenshot(page, "review-8-signed-run");
    // A signed run's notes are read-only.
    expect(await page.getByTestId("notes-form").count()).toBe(0);
    expect(await page.getByTestId("run-notes").textContent()).toContain(answer);

    // The supervisor files the signed run's PDF: it names the signer, the meaning and the caveat.
    const pdf = await new RunDownloadsBlock(page).download("download-report-pdf");
    expect(pdf.bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "emberline-signed-")), pdf.name);
    fs.writeFileSync(file, pdf.bytes);
    const text = execFileSync("/usr/bin/pdftotext", [file, "-"], { encoding: "utf8" }).replace(
      /\s+/g,
      " ",
    );
    expect(text).toContain("Tobias Wren");
    expect(text).toContain("Reviewed and approved");
    expect(text).toMatch(/not a certified analysis/i);
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
    // The whole journey in one test, under a loaded machine: more than the default two minutes.
  }, 240_000);
});
