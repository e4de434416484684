// The upload preview (POST /api/spectra/preview) against the real server and PostgreSQL: it returns the
// parsed facts and a thinned series and writes nothing (no spectrum_files row, no audit event); a bad
// file answers 400 with the core's located message; a file stored before is flagged; another team's
// person gets 404; a chemist may preview. Facts are checked against the test's own reading of the bytes.
import { createHash, randomInt } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { MAX_CHART_POINTS } from "@/lib/charts/thin-series";
import { DEMO, FLAME_SCREENING, signInDemo, signedIn, teamIdOf } from "./support/accounts";
import { createSyntheticInstrument, uploadSpectrumFile } from "./support/bench";
import { auditEventsSince, auditMark, closeDb, db, userIdByEmail } from "./support/database";
import type { ApiClient, ErrorBody } from "./support/http-client";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import { SYNTHETIC_PIXELS } from "@/lib/spectrum/synthetic/synthetic-instrument";
import { lampFile } from "./support/synthetic-files";

interface Preview {
  instrumentId: string;
  kind: string;
  label: string;
  fileName: string;
  byteSize: number;
  sha256: string;
  points: number;
  xUnit: string;
  medium: string | null;
  xRange: [number, number];
  yRange: [number, number];
  duplicateOf: { id: string; fileName: string; uploadedAt: string } | null;
  warnings: string[];
  series: { x: number[]; y: number[] };
}

const suffix = Date.now().toString(36);
const grating = syntheticGrating();
let lead: ApiClient;
let chemist: ApiClient;
let chemistId: string;
let instrumentId: string;

function preview(
  client: ApiClient,
  content: string | Uint8Array,
  fileName: string,
  fields: Record<string, string> = {},
) {
  const form = new FormData();
  form.set("file", new Blob([content as BlobPart]), fileName);
  form.set("instrumentId", instrumentId);
  form.set("kind", "lamp");
  for (const [name, value] of Object.entries(fields)) form.set(name, value);
  return client.request<Preview & ErrorBody>("POST", "/api/spectra/preview", { form });
}

async function storedRows(): Promise<number> {
  const { rows } = await db().query<{ n: string }>(
    "SELECT count(*) AS n FROM spectrum_files WHERE instrument_id = $1",
    [instrumentId],
  );
  return Number(rows[0].n);
}

/** "pixel,counts" rows read back by the test itself: the x and y columns as numbers. */
function columns(csv: string): { x: number[]; y: number[] } {
  const rows = csv
    .trim()
    .split("\n")
    .slice(1)
    .map((line) => line.split(",").map(Number));
  return { x: rows.map((r) => r[0]), y: rows.map((r) => r[1]) };
}

beforeAll(async () => {
  await ensureOutsider();
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  chemistId = await userIdByEmail(DEMO.chemist.email);
  instrumentId = await createSyntheticInstrument(
    lead,
    await teamIdOf(lead, FLAME_SCREENING),
    `Preview bench ${suffix}`,
  );
});

afterAll(async () => {
  await closeDb();
});

describe("the upload preview", () => {
  it("returns the facts and the points for a chart, and writes nothing (chemist allowed)", async () => {
    // A seed of our own, so no earlier test stored these bytes in the team.
    const content = lampFile(grating, randomInt(1_000_000, 2_000_000_000));
    const before = await storedRows();
    const mark = await auditMark();
    const reply = await preview(chemist, content, "lamp-preview.csv", { label: "Pencil lamp" });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    const { x, y } = columns(content);
    expect(reply.body).toMatchObject({
      instrumentId,
      kind: "lamp",
      label: "Pencil lamp",
      fileName: "lamp-preview.csv",
      byteSize: Buffer.byteLength(content),
      sha256: createHash("sha256").update(content).digest("hex"),
      points: SYNTHETIC_PIXELS,
      xUnit: "pixel",
      xRange: [0, SYNTHETIC_PIXELS - 1],
      yRange: [Math.min(...y), Math.max(...y)],
      duplicateOf: null,
      warnings: [],
    });
    // Within the chart limit the series is every point, as the file has them.
    expect(reply.body.series).toEqual({ x, y });
    expect(await storedRows()).toBe(before);
    expect(await auditEventsSince(mark, { actorId: chemistId })).toEqual([]);
  });

  it("thins a long file for the chart and keeps a one-sample spike", async () => {
    // 50,000 points on a wavelength axis inside the instrument's nominal range (a pixel file that long
    // could not come from its 2,048-pixel detector).
    const n = 50_000;
    const [low, high] = grating.nominalRangeNm;
    const nmAt = (i: number) => Number((low + ((high - low) * i) / (n - 1)).toFixed(5));
    const rows = Array.from(
      { length: n },
      (_, i) => `${nmAt(i)},${i === 31_337 ? 90_000 : 200 + (i % 7)}`,
    );
    const reply = await preview(chemist, `wavelength_nm,counts\n${rows.join("\n")}\n`, "long.csv");
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body.points).toBe(n);
    expect(reply.body.warnings).toEqual([]);
    expect(reply.body.yRange).toEqual([200, 90_000]);
    expect(reply.body.series.x.length).toBeLessThan(n);
    expect(reply.body.series.x.length).toBeLessThanOrEqual(MAX_CHART_POINTS);
    expect(reply.body.series.y).toContain(90_000);
    expect(reply.body.series.x[reply.body.series.y.indexOf(90_000)]).toBe(nmAt(31_337));
  });

  it("refuses a pixel file longer than the instrument's detector, for the preview and for storing, writing nothing", async () => {
    const before = await storedRows();
    const mark = await auditMark();
    const rows = Array.from({ length: 2 * SYNTHETIC_PIXELS }, (_, i) => `${i},${200 + (i % 13)}`);
    const content = `pixel,counts\n${rows.join("\n")}\n`;
    const refused = await preview(chemist, content, "other-detector.csv");
    expect(refused.status).toBe(400);
    expect(refused.body.error.message).toBe(
      `This file's first column runs over pixels 0 to ${2 * SYNTHETIC_PIXELS - 1}, but Preview bench ${suffix} has ` +
        `${SYNTHETIC_PIXELS.toLocaleString("en")} pixels (0 to ${SYNTHETIC_PIXELS - 1}): it was recorded on another detector or with ` +
        "other binning. Upload it to the instrument it was recorded on.",
    );
    expect(refused.body.error.fieldErrors?.file?.[0]).toBe(refused.body.error.message);
    const form = new FormData();
    form.set("file", new Blob([content]), "other-detector.csv");
    form.set("instrumentId", instrumentId);
    form.set("kind", "lamp");
    const stored = await chemist.request<ErrorBody>("POST", "/api/spectra", { form });
    expect(stored.status).toBe(400);
    // Pixels counted from 1 up to the detector's size are its own.
    const fromOne = Array.from(
      { length: SYNTHETIC_PIXELS },
      (_, i) => `${i + 1},${200 + (i % 13)}`,
    );
    expect(
      (await preview(chemist, `pixel,counts\n${fromOne.join("\n")}\n`, "from-one.csv")).status,
    ).toBe(200);
    expect(await storedRows()).toBe(before);
    expect(await auditEventsSince(mark, { actorId: chemistId })).toEqual([]);
  });

  it("says on the preview when a wavelength file lies mostly outside the instrument's nominal range", async () => {
    const [low, high] = grating.nominalRangeNm;
    const span = high - low;
    const rows = Array.from(
      { length: 500 },
      (_, i) => `${(high + 0.5 * span * (i / 499 - 0.2)).toFixed(3)},${300 + (i % 5)}`,
    );
    const reply = await preview(
      chemist,
      `wavelength_nm,counts\n${rows.join("\n")}\n`,
      "red-end.csv",
    );
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body.warnings).toHaveLength(1);
    expect(reply.body.warnings[0]).toMatch(
      new RegExp(
        `only 20 % of it lies in Preview bench ${suffix}'s nominal range \\(${low} to ${high} nm\\)`,
      ),
    );
  });

  it("refuses a bad file with the located message (400) and a too big one with 413, writing nothing", async () => {
    const before = await storedRows();
    const mark = await auditMark();
    const rows = Array.from({ length: 30 }, (_, i) => (i === 7 ? `${i},1x5` : `${i},${100 + i}`));
    const bad = await preview(chemist, `pixel,counts\n${rows.join("\n")}\n`, "bad.csv");
    expect(bad.status).toBe(400);
    // The header is line 1, so data row 7 (0-based) is line 9; its counts are the second column.
    expect(bad.body.error.message).toMatch(/^Line 9, column 2: /);
    expect(bad.body.error.fieldErrors?.file?.[0]).toBe(bad.body.error.message);

    const huge = await preview(
      chemist,
      new Uint8Array(16 * 1024 * 1024 + 1).fill(0x31),
      "huge.csv",
    );
    expect(huge.status).toBe(413);

    const noKind = new FormData();
    noKind.set("file", new Blob([lampFile(grating)]), "lamp.csv");
    noKind.set("instrumentId", instrumentId);
    const missing = await chemist.request<ErrorBody>("POST", "/api/spectra/preview", {
      form: noKind,
    });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fieldErrors?.kind).toBeDefined();

    expect(await storedRows()).toBe(before);
    expect(await auditEventsSince(mark, { actorId: chemistId })).toEqual([]);
  });

  it("warns when the same bytes were stored before in the team", async () => {
    const content = lampFile(grating, randomInt(1_000_000, 2_000_000_000));
    const storedId = await uploadSpectrumFile(
      chemist,
      instrumentId,
      "lamp",
      content,
      "first-copy.csv",
    );
    const reply = await preview(chemist, content, "second-copy.csv");
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body.duplicateOf).toMatchObject({ id: storedId, fileName: "first-copy.csv" });
    expect(reply.body.fileName).toBe("second-copy.csv");
  });

  it("answers 404 to a person of another team", async () => {
    const outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
    const reply = await preview(outsider, lampFile(grating), "lamp.csv");
    expect(reply.status).toBe(404);
  });
});
