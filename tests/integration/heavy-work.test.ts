// Heavy work off the request thread, seen from outside: a signed run's PDF is rendered once and kept
// (the second download is the kept file, byte for byte, and one row holds it under the signature's
// content hash); a run still in draft is never kept; a line import over the row limit is refused with
// a sentence that names the limit, before anything is parsed or locked.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { APP_URL, type ApiClient } from "./support/http-client";
import { DEMO_PASSWORD, FLAME_SCREENING, signInDemo, teamIdOf } from "./support/accounts";
import { closeDb, db } from "./support/database";
import { draftRun } from "./support/review-fixtures";

const SESSION_COOKIE = "emberline_session";
// The row limit of one import (lib/services/line-library-import.ts MAX_IMPORT_ROWS).
const MAX_IMPORT_ROWS = 20_000;

let lead: ApiClient;
let chemist: ApiClient;
let supervisor: ApiClient;

async function pdf(client: ApiClient, runId: string): Promise<Buffer> {
  const response = await fetch(`${APP_URL}/api/runs/${runId}/report.pdf`, {
    headers: {
      "x-forwarded-for": client.address,
      cookie: `${SESSION_COOKIE}=${client.cookie(SESSION_COOKIE)}`,
    },
  });
  expect(response.status).toBe(200);
  expect(response.headers.get("content-type")).toBe("application/pdf");
  return Buffer.from(await response.arrayBuffer());
}

async function keptRows(runId: string) {
  const { rows } = await db().query<{ content_hash: string; pdf: Buffer }>(
    "SELECT content_hash, pdf FROM run_report_pdfs WHERE run_id = $1",
    [runId],
  );
  return rows;
}

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  supervisor = await signInDemo("supervisor");
});

afterAll(closeDb);

describe("a signed run's PDF report", () => {
  it("is rendered once and then served as kept", async () => {
    const run = await draftRun(lead, chemist, chemist, "Kept report");
    expect((await chemist.post(`/api/runs/${run.id}/submit`, {})).status).toBe(200);
    expect(
      (
        await supervisor.post(`/api/runs/${run.id}/review`, {
          decision: "sign",
          password: DEMO_PASSWORD,
        })
      ).status,
    ).toBe(200);
    expect(await keptRows(run.id)).toHaveLength(0);

    const first = await pdf(chemist, run.id);
    const [kept, ...more] = await keptRows(run.id);
    expect(more).toHaveLength(0);
    const {
      rows: [signature],
    } = await db().query<{ content_hash: string }>(
      "SELECT content_hash FROM run_signatures WHERE run_id = $1",
      [run.id],
    );
    expect(kept.content_hash).toBe(signature.content_hash);
    expect(Buffer.compare(kept.pdf, first)).toBe(0);

    // A new render would carry a new creation time and "generated" time: identical bytes mean no render.
    await new Promise((resolve) => setTimeout(resolve, 1100));
    const [second, third] = await Promise.all([pdf(chemist, run.id), pdf(supervisor, run.id)]);
    expect(Buffer.compare(second, first)).toBe(0);
    expect(Buffer.compare(third, first)).toBe(0);
    expect(await keptRows(run.id)).toHaveLength(1);
  });

  it("is not kept while the run can still change, and the database refuses to keep one", async () => {
    const run = await draftRun(lead, chemist, chemist, "Draft report");
    await pdf(chemist, run.id);
    expect(await keptRows(run.id)).toHaveLength(0);
    await expect(
      db().query(
        "INSERT INTO run_report_pdfs (run_id, content_hash, pdf, byte_size) VALUES ($1, $2, $3, 1)",
        [run.id, "ab".repeat(32), Buffer.from("x")],
      ),
    ).rejects.toThrow(/only a signed run/);
  });
});

describe("a line-table import", () => {
  it(`is refused over ${MAX_IMPORT_ROWS.toLocaleString("en")} rows with a sentence naming the limit`, async () => {
    const teamId = await teamIdOf(lead, FLAME_SCREENING);
    const draft = await lead.post<{ id: string }>("/api/releases/draft", { teamId });
    expect(draft.status).toBeLessThan(300);
    const rows = Array.from(
      { length: MAX_IMPORT_ROWS + 1 },
      (_, i) => `Fe I,${(300 + i * 0.01).toFixed(3)},,test source`,
    );
    const csv = ["species,air_nm,vacuum_nm,source", ...rows].join("\n");
    const reply = await lead.post<{ error: { code: string; message: string } }>(
      `/api/releases/${draft.body.id}/import/preview`,
      { csv },
    );
    expect(reply.status).toBe(413);
    expect(reply.body.error.message).toContain("20,001 rows");
    expect(reply.body.error.message).toContain("at most 20,000");
  });
});
