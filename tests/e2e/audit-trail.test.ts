// The audit trail in Chromium: the lab lead adds a line to the draft and retires it again (a real
// edit, made through the API with the browser's own session; a retired line is left out when the
// draft is published), opens the audit page, filters by action from the keyboard, opens the row to
// see before and after with the changed field marked, pages with "Load more", downloads the CSV and
// reads it back, and finds the same events at the foot of the release's page; a calibration and a
// run made through the API show their own trails on their pages. Screenshots go to
// test-output/e2e/audit-trail-*.png.
import fs from "node:fs";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { AuditTrailPage } from "./pages/audit-page";
import { SignInPage } from "./pages/sign-in-page";
import { WorkspaceShell } from "./pages/workspace-shell";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
} from "@/lib/spectrum/synthetic/synthetic-instrument";
import { flameFile, lampFile } from "../integration/support/synthetic-files";

const DEMO_PASSWORD = "emberline-demo";
const LEAD = "lead@demo.emberline.example";
const suffix = Date.now().toString(36);

let browser: Session;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

interface Me {
  teams: { id: string; name: string }[];
}

async function signInLead(): Promise<void> {
  await browser.context.clearCookies();
  browser.problems.length = 0;
  const signIn = new SignInPage(browser.page);
  await signIn.goto();
  await signIn.signIn(LEAD, DEMO_PASSWORD);
  await new WorkspaceShell(browser.page).waitUntilShown();
}

describe("the audit trail", () => {
  it("lets the lab lead filter, open a change, page, and download the CSV", async () => {
    const { page } = browser;
    await signInLead();

    // A line added to the draft and retired again, with the browser's session.
    const me = (await (await page.request.get("/api/me")).json()) as Me;
    const teamId = me.teams.find((t) => t.name === "Flame Screening")!.id;
    const draft = await page.request.post("/api/releases/draft", { data: { teamId } });
    expect(draft.status()).toBe(200);
    const draftId = ((await draft.json()) as { id: string }).id;
    const added = await page.request.post(`/api/releases/${draftId}/lines`, {
      data: {
        line: {
          species: "Xe I",
          // Between the table's Xe I lines at 828.01 and 834.68 nm (823.1–823.2 met Xe I 823.163).
          airNm: 831.0 + (Date.now() % 1000) / 10_000,
          uncertaintyNm: 0.002,
          source: "Browser test row (from memory), retired at once",
        },
        reason: `Browser test ${suffix}`,
      },
    });
    expect(added.status(), await added.text()).toBe(201);
    const line = (await added.json()) as { id: string; lineKey: string; version: number };
    const reason = `Added by mistake, ${suffix}`;
    const retired = await page.request.post(`/api/lines/${line.id}/retire`, {
      data: { version: line.version, reason },
    });
    expect(retired.status(), await retired.text()).toBe(200);

    const audit = new AuditTrailPage(page);
    await audit.goto();
    await audit.rows.first().waitFor();
    await screenshot(page, "audit-trail-1-everything");

    await audit.filterByAction("line.retire");
    const actions = await audit.rows.evaluateAll((rows) =>
      rows.map((r) => r.getAttribute("data-action")),
    );
    expect(actions.length).toBeGreaterThan(0);
    expect(new Set(actions)).toEqual(new Set(["line.retire"]));
    const row = audit.rows.filter({ hasText: reason });
    expect(await row.count()).toBe(1);
    expect(await row.getByRole("link").getAttribute("href")).toBe(`/lines/${line.lineKey}`);

    const details = await audit.expand(row);
    const retiredField = details
      .locator('tr[data-changed="changed"]')
      .filter({ hasText: "retired" });
    expect(await retiredField.count()).toBe(1);
    // Before and after side by side, and the change told by a word as well as a tint.
    expect((await retiredField.locator("td").allTextContents()).map((t) => t.trim())).toEqual([
      "false",
      "true",
      "Δ changed",
    ]);
    expect(
      await details
        .locator("tr")
        .filter({ hasText: "releaseId" })
        .locator("td")
        .last()
        .textContent(),
    ).toBe("same");
    await screenshot(page, "audit-trail-2-row-open");

    // Paging: one event a page through the URL's page size, then "Load more" adds the next.
    await audit.goto(`?teamId=${teamId}&action=line.&limit=1`);
    expect(await audit.rows.count()).toBe(1);
    await audit.loadMore.click();
    await audit.rows.nth(1).waitFor();
    expect(await audit.rows.count()).toBe(2);
    expect(
      await audit.rows.evaluateAll((rows) => rows.map((r) => r.getAttribute("data-action"))),
    ).toEqual(["line.retire", "line.add"]);

    await audit.goto(`?teamId=${teamId}&action=line.retire`);
    const shown = await audit.rows.count();
    const download = await audit.downloadCsv();
    expect(download.suggestedFilename()).toMatch(
      /^emberline-audit-flame-screening-\d{4}-\d{2}-\d{2}-filtered\.csv$/,
    );
    const file = await download.path();
    const parsed = Papa.parse<Record<string, string>>(fs.readFileSync(file, "utf8"), {
      header: true,
      skipEmptyLines: true,
      comments: "#",
    });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toHaveLength(shown);
    expect(new Set(parsed.data.map((r) => r.action))).toEqual(new Set(["line.retire"]));
    const mine = parsed.data.find((r) => r.reason === reason);
    expect(mine?.actor_email).toBe(LEAD);
    expect(mine?.changed_fields.split("; ")).toContain("retired");
    expect(JSON.parse(mine!.before_json).retired).toBe(false);
    expect(JSON.parse(mine!.after_json).retired).toBe(true);

    // The release's own trail, at the foot of its page, with a link to the full trail.
    await page.goto(`/lines?release=${draftId}`);
    const trail = page.getByTestId("entity-trail");
    await trail.waitFor();
    const entry = trail.locator("li").filter({ hasText: reason });
    expect(await entry.count()).toBe(1);
    await entry.locator("summary").click();
    await entry.getByTestId("before-after").waitFor();
    await trail.screenshot({ path: "test-output/e2e/audit-trail-3-release-trail.png" });
    expect(
      await trail.getByRole("link", { name: "Open in the full audit trail" }).getAttribute("href"),
    ).toBe(`/audit?teamId=${teamId}&entity=line_release&entityId=${draftId}`);

    await audit.goto(`?teamId=${teamId}&from=2001-01-01&to=2001-01-01`);
    await page.getByRole("heading", { name: "No event matches these filters" }).waitFor();
    expect(await audit.download.count()).toBe(0);
    await audit.goto(`?teamId=${teamId}&from=2001-02-30`);
    await page.getByText("The first date is not a day of the calendar.").waitFor();
    await screenshot(page, "audit-trail-4-bad-date");
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });

  it("shows a calibration's and a run's own trail at the foot of their pages", async () => {
    const { page } = browser;
    await signInLead();
    const post = async (path: string, data: unknown) => {
      const reply = await page.request.post(path, { data });
      expect(reply.status(), await reply.text()).toBe(201);
      return (await reply.json()) as { id: string };
    };
    const upload = async (
      instrumentId: string,
      kind: "lamp" | "sample",
      name: string,
      text: string,
    ) => {
      const reply = await page.request.post("/api/spectra", {
        multipart: {
          file: { name, mimeType: "text/csv", buffer: Buffer.from(text) },
          instrumentId,
          kind,
          label: name,
        },
      });
      expect(reply.status(), await reply.text()).toBe(201);
      return ((await reply.json()) as { id: string }).id;
    };
    const me = (await (await page.request.get("/api/me")).json()) as Me;
    const teamId = me.teams.find((t) => t.name === "Flame Screening")!.id;
    const grating = syntheticGrating();
    const instrument = await post("/api/instruments", {
      teamId,
      name: `Audit grating ${suffix}`,
      dispersion: "grating",
      pixels: SYNTHETIC_PIXELS,
      nominalMinNm: grating.nominalRangeNm[0],
      nominalMaxNm: grating.nominalRangeNm[1],
      resolutionNm: SYNTHETIC_RESOLUTION_NM,
    });
    const lampId = await upload(instrument.id, "lamp", `lamp-${suffix}.csv`, lampFile(grating));
    const calibration = await post("/api/calibrations", {
      instrumentId: instrument.id,
      spectrumId: lampId,
      lamps: ["Hg", "Ar"],
    });
    const notebook = await post("/api/notebooks", { teamId, title: `Audit notebook ${suffix}` });
    const flameId = await upload(
      instrument.id,
      "sample",
      `flame-${suffix}.csv`,
      flameFile(grating),
    );
    const run = await post("/api/runs", {
      notebookId: notebook.id,
      spectrumId: flameId,
      calibrationId: calibration.id,
      source: "flame",
    });

    for (const [path, entity, action, name] of [
      [`/calibrations/${calibration.id}`, "calibration", "calibration.create", "calibration"],
      [`/runs/${run.id}`, "run", "run.create", "run"],
    ] as const) {
      await page.goto(path);
      const trail = page.getByTestId("entity-trail");
      await trail.waitFor();
      expect(await trail.getByRole("heading", { level: 2 }).textContent()).toBe(
        `Audit trail of this ${name}`,
      );
      const entry = trail.locator("li").filter({ hasText: action });
      expect(await entry.count()).toBe(1);
      expect(await entry.textContent()).toContain("Ilse Varga");
      await entry.locator("summary").focus();
      await page.keyboard.press("Enter");
      await entry.getByTestId("before-after").waitFor();
      expect(await entry.textContent()).toContain("Nothing before: the record was created here.");
      await trail.screenshot({ path: `test-output/e2e/audit-trail-5-${entity}-trail.png` });
      const href = await trail
        .getByRole("link", { name: "Open in the full audit trail" })
        .getAttribute("href");
      expect(href).toBe(
        `/audit?teamId=${teamId}&entity=${entity}&entityId=${path.split("/").pop()}`,
      );
      await page.goto(href!);
      const audit = new AuditTrailPage(page);
      await audit.rows.first().waitFor();
      expect(
        await audit.rows.evaluateAll((rows) => rows.map((r) => r.getAttribute("data-action"))),
      ).toEqual([action]);
    }
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
  });
});
