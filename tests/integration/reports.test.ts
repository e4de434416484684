// Reports through HTTP against the real PostgreSQL: a run made from synthetic files is downloaded as
// a PDF (read back with Debian's poppler pdftotext), as a peaks CSV (read back with a CSV parser), as
// JCAMP-DX as calibrated and resampled evenly (checked by the strict validator and read back with the
// app's own parser to the run's calibrated points), and its notebook as a calls CSV; an override and a signature (rows put in directly: another part of the app makes them)
// show in the PDF; another team gets 404 and nobody signed in gets 401.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { detectionLimitText } from "@/lib/reports/detection-limit-text";
import type { StoredDetectionLimit } from "@/lib/runs/types";
import { parseSpectrumFile, resampleEvenly } from "@/lib/spectrum/io";
import { validateStrictJcamp } from "../support/jcamp-strict-validator";
import { APP_URL, ApiClient } from "./support/http-client";
import { createSyntheticInstrument, uploadSpectrumFile } from "./support/bench";
import { DEMO, FLAME_SCREENING, signInDemo, signedIn, teamIdOf } from "./support/accounts";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { closeDb, db, userIdByEmail } from "./support/database";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import { flameFile, flameFileOnWavelengthAxis, lampFile } from "./support/synthetic-files";

interface Call {
  species: string;
  verdict: string;
  lines: { lineNm: number; peakNm: number }[];
  detectionLimit?: StoredDetectionLimit | null;
}
interface Run {
  id: string;
  versionNumber: number;
  calibrationId: string | null;
  lineReleaseId: string;
  peaks: { wavelengthNm: number }[];
  calls: Call[];
  verdicts: Record<string, string>;
}
interface Calibration {
  id: string;
  model: string;
  rmsNm: number;
  coveredRangeNm: [number, number];
}

const SESSION_COOKIE = "emberline_session";
const suffix = Date.now().toString(36);
const grating = syntheticGrating();

let lead: ApiClient;
let chemist: ApiClient;
let outsider: ApiClient;
let teamId: string;
let calibration: Calibration;
let notebookId: string;
let calibratedRun: Run;
let ownAxisRun: Run;
let flameText: string;

async function download(client: ApiClient | null, urlPath: string): Promise<Response> {
  const headers: Record<string, string> = { "x-forwarded-for": client?.address ?? "10.9.9.9" };
  if (client) headers.cookie = `${SESSION_COOKIE}=${client.cookie(SESSION_COOKIE)}`;
  return fetch(`${APP_URL}${urlPath}`, { headers, redirect: "manual" });
}

const upload = async (kind: "lamp" | "sample", content: string, fileName: string) => ({
  id: await uploadSpectrumFile(chemist, instrumentId, kind, content, fileName),
});

let instrumentId: string;

function pdfToText(pdf: Uint8Array): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "emberline-reports-"));
  try {
    const file = path.join(dir, "report.pdf");
    fs.writeFileSync(file, pdf);
    // Debian's poppler-utils; its line breaks fall where the layout wraps, so whitespace is collapsed.
    return execFileSync("/usr/bin/pdftotext", [file, "-"], { encoding: "utf8" }).replace(
      /\s+/g,
      " ",
    );
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

function parseCsv(text: string): Record<string, string>[] {
  const parsed = Papa.parse<Record<string, string>>(text, {
    header: true,
    skipEmptyLines: true,
    delimiter: ",",
    comments: "#",
  });
  expect(parsed.errors).toEqual([]);
  return parsed.data;
}

const shortId = (id: string) => id.replace(/-/g, "").slice(0, 8);

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  await ensureOutsider();
  outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
  teamId = await teamIdOf(lead, FLAME_SCREENING);

  instrumentId = await createSyntheticInstrument(lead, teamId, `report bench ${suffix}`, grating);
  const lamp = await upload("lamp", lampFile(grating), `lamp-${suffix}.csv`);
  const calibrated = await chemist.post<Calibration>("/api/calibrations", {
    instrumentId,
    spectrumId: lamp.id,
    lamps: ["Hg", "Ar"],
  });
  expect(calibrated.status, JSON.stringify(calibrated.body)).toBe(201);
  calibration = calibrated.body;
  const nb = await chemist.post<{ id: string }>("/api/notebooks", {
    teamId,
    title: `Reports ${suffix}`,
  });
  expect(nb.status).toBe(201);
  notebookId = nb.body.id;

  flameText = flameFile(grating);
  const sample = await upload("sample", flameText, `flame-${suffix}.csv`);
  const first = await chemist.post<Run>("/api/runs", {
    notebookId,
    spectrumId: sample.id,
    calibrationId: calibration.id,
    source: "flame",
  });
  expect(first.status, JSON.stringify(first.body)).toBe(201);
  calibratedRun = first.body;
  const ownAxis = await upload(
    "sample",
    flameFileOnWavelengthAxis(grating),
    `flame-nm-${suffix}.csv`,
  );
  const second = await chemist.post<Run>("/api/runs", {
    notebookId,
    spectrumId: ownAxis.id,
    source: "flame",
  });
  expect(second.status, JSON.stringify(second.body)).toBe(201);
  ownAxisRun = second.body;
  expect(ownAxisRun.calibrationId).toBeNull();
});

afterAll(async () => {
  await closeDb();
});

describe("the PDF report", () => {
  it("downloads as an uncached attachment that opens in pdftotext with the calls, the caveat, the calibration and the release", async () => {
    const response = await download(chemist, `/api/runs/${calibratedRun.id}/report.pdf`);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("application/pdf");
    expect(response.headers.get("content-disposition")).toBe(
      `attachment; filename="emberline-run-${shortId(calibratedRun.id)}-v1.pdf"`,
    );
    expect(response.headers.get("cache-control")).toMatch(/no-store/);
    expect(response.headers.get("cache-control")).toMatch(/private/);
    const pdf = new Uint8Array(await response.arrayBuffer());
    expect(Buffer.from(pdf.subarray(0, 5)).toString("latin1")).toBe("%PDF-");

    const text = pdfToText(pdf);
    const called = calibratedRun.calls.filter(
      (c) => calibratedRun.verdicts[c.species] !== "absent",
    );
    expect(called.length).toBeGreaterThanOrEqual(4);
    for (const c of called) expect(text, c.species).toContain(c.species);
    expect(text).toContain("Qualitative screening result only, not a certified analysis");
    expect(text).toContain(calibration.model);
    expect(text).toContain(`RMS ${calibration.rmsNm.toFixed(4)} nm`);
    expect(text).toContain(
      `${calibration.coveredRangeNm[0].toFixed(2)}–${calibration.coveredRangeNm[1].toFixed(2)} nm`,
    );
    const { rows } = await db().query<{ number: number }>(
      "SELECT number FROM line_releases WHERE id = $1",
      [calibratedRun.lineReleaseId],
    );
    expect(text).toContain(`release ${rows[0].number}`);
    expect(text).toContain("Flame test cautions");
    expect(text).toContain("Not signed.");
    // Absent calls with their detection limits, worded as on the page.
    const limited = calibratedRun.calls.find(
      (c) => calibratedRun.verdicts[c.species] === "absent" && c.detectionLimit,
    );
    expect(limited, "an absent call with a detection limit").toBeDefined();
    expect(text).toContain("Detection limits");
    expect(text.replace(/\s+/g, " ")).toContain(
      `${limited!.species} ${detectionLimitText(limited!.detectionLimit)}`,
    );
  });

  it("shows an override with its reason and a signature with its signer and content hash", async () => {
    const chemistId = await userIdByEmail(DEMO.chemist.email);
    const supervisorId = await userIdByEmail(DEMO.supervisor.email);
    const potassium = calibratedRun.calls.find((c) => c.species === "K I")!;
    await db().query(
      "INSERT INTO run_overrides (run_id, species, computed_verdict, verdict, reason, created_by_id) VALUES ($1, 'K I', $2, 'possible', $3, $4)",
      [
        calibratedRun.id,
        potassium.verdict,
        `violet flame through cobalt glass was faint ${suffix}`,
        chemistId,
      ],
    );
    const hash = "5e".repeat(32);
    await db().query(
      "INSERT INTO run_signatures (run_id, round, signer_id, signer_name, meaning, content_hash) VALUES ($1, 1, $2, 'Sam Supervisor', $3, $4)",
      [calibratedRun.id, supervisorId, `Reviewed and approved ${suffix}`, hash],
    );
    const response = await download(chemist, `/api/runs/${calibratedRun.id}/report.pdf`);
    expect(response.status).toBe(200);
    const text = pdfToText(new Uint8Array(await response.arrayBuffer()));
    expect(text).toContain("Sam Supervisor");
    expect(text).toContain(`Reviewed and approved ${suffix}`);
    expect(text).toContain(hash);
    expect(text).toContain(`violet flame through cobalt glass was faint ${suffix}`);
    expect(text).not.toContain("Not signed.");
    // The PDF reads the standing verdict, as the page and the CSV do: K I's evidence is headed
    // possible and it is not among the species called present.
    expect(text).toContain("Evidence: K I (possible)");
    const calledPresent = (/Called present: ([^\n]*)/.exec(text)?.[1] ?? "").split("Possible:")[0];
    expect(calledPresent).toContain("Na I");
    expect(calledPresent).not.toContain("K I");
  });
});

describe("the JCAMP-DX export", () => {
  it("reads back through the app's parser to the run's calibrated points", async () => {
    const response = await download(chemist, `/api/runs/${calibratedRun.id}/spectrum.jdx`);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-disposition")).toBe(
      `attachment; filename="emberline-run-${shortId(calibratedRun.id)}-v1-spectrum.jdx"`,
    );
    expect(response.headers.get("cache-control")).toMatch(/no-store/);
    const text = await response.text();
    // A strict JCAMP-DX 4.24 reader takes it (tests/support/jcamp-strict-validator.ts).
    expect(validateStrictJcamp(text).problems).toEqual([]);
    expect(text).toContain("##XUNITS=NANOMETERS");
    expect(text).toContain("##YUNITS=ARBITRARY UNITS");
    expect(text).toContain("##$MEDIUM=AIR");
    expect(text.match(/MEDIUM=/g)).toHaveLength(1);
    expect(text).toContain(`##$EMBERLINE RUN ID=${calibratedRun.id}`);
    expect(text).toContain(`##$EMBERLINE CALIBRATION ID=${calibration.id}`);
    expect(text).toContain(`##$EMBERLINE LINE RELEASE ID=${calibratedRun.lineReleaseId}`);
    const back = parseSpectrumFile(text);
    expect(back.xUnit).toBe("nm");
    expect(back.medium).toBe("air");

    // The same points computed another way: the file's counts at the calibration's wavelengths.
    const sample = parseSpectrumFile(flameText);
    const evaluated = await chemist.post<{ wavelengthsNm: (number | null)[] }>(
      `/api/calibrations/${calibration.id}/evaluate`,
      {
        pixels: Array.from(sample.x),
      },
    );
    expect(evaluated.status).toBe(200);
    const expected = evaluated.body.wavelengthsNm
      .map((nm, i) => [nm, sample.y[i]] as const)
      .filter(([nm]) => nm !== null)
      .sort((a, b) => a[0]! - b[0]!);
    expect(back.x.length).toBe(expected.length);
    // XYPOINTS (an uneven axis) are written at full double precision: the points come back exactly.
    for (let i = 0; i < expected.length; i++) {
      expect(back.x[i]).toBe(expected[i][0]);
      expect(back.y[i]).toBe(expected[i][1]);
    }
  });

  it("offers the same spectrum resampled onto an even axis, as compressed XYDATA a strict reader takes", async () => {
    const [even, calibrated] = await Promise.all([
      download(chemist, `/api/runs/${calibratedRun.id}/spectrum-even.jdx`),
      download(chemist, `/api/runs/${calibratedRun.id}/spectrum.jdx`),
    ]);
    expect(even.status).toBe(200);
    expect(even.headers.get("content-type")).toMatch(/^chemical\/x-jcamp-dx/);
    expect(even.headers.get("content-disposition")).toBe(
      `attachment; filename="emberline-run-${shortId(calibratedRun.id)}-v1-spectrum-even.jdx"`,
    );
    expect(even.headers.get("cache-control")).toMatch(/no-store/);
    const text = await even.text();
    const strict = validateStrictJcamp(text);
    expect(strict.problems).toEqual([]);
    expect(text).toContain("##XYDATA=(X++(Y..Y))");
    expect(text).toMatch(/^##\$EMBERLINE RESAMPLED=LINEAR INTERPOLATION ONTO \d+ EVEN STEPS$/m);
    expect(text).toContain(`##$EMBERLINE LINE RELEASE ID=${calibratedRun.lineReleaseId}`);
    // The even axis is the calibrated points resampled: the app's reader and the strict validator both
    // return them within half of YFACTOR.
    const points = parseSpectrumFile(await calibrated.text());
    const expected = resampleEvenly(points);
    const yFactor = Number(/^##YFACTOR=(.*)$/m.exec(text)![1]);
    const back = parseSpectrumFile(text);
    expect(back.x.length).toBe(expected.x.length);
    expect(back.medium).toBe("air");
    const step = expected.x[1] - expected.x[0];
    for (let i = 0; i < expected.x.length; i++) {
      expect(Math.abs(back.x[i] - expected.x[i])).toBeLessThanOrEqual(1e-9 * step);
      expect(Math.abs(back.y[i] - expected.y[i])).toBeLessThanOrEqual(yFactor / 2);
      expect(Math.abs(strict.points!.y[i] - expected.y[i])).toBeLessThanOrEqual(yFactor / 2);
    }
  });

  it("states that the medium is unknown for a run on a file's own axis, and keeps its points", async () => {
    const response = await download(chemist, `/api/runs/${ownAxisRun.id}/spectrum.jdx`);
    expect(response.status).toBe(200);
    const text = await response.text();
    expect(validateStrictJcamp(text).problems).toEqual([]);
    expect(text).toContain("##$MEDIUM=NOT STATED");
    expect(text).toContain("##$EMBERLINE CALIBRATION ID=NONE");
    const back = parseSpectrumFile(text);
    const source = parseSpectrumFile(flameFileOnWavelengthAxis(grating));
    expect(back.x.length).toBe(source.x.length);
    // The grating's axis is uneven, so it is written as XYPOINTS at full precision: the file's own points come back.
    for (let i = 0; i < source.x.length; i++) {
      expect(back.x[i]).toBe(source.x[i]);
      expect(back.y[i]).toBe(source.y[i]);
    }
  });
});

describe("the CSV exports", () => {
  it("peaks.csv has one row per peak and candidate, and parses back", async () => {
    const response = await download(chemist, `/api/runs/${calibratedRun.id}/peaks.csv`);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(response.headers.get("content-disposition")).toBe(
      `attachment; filename="emberline-run-${shortId(calibratedRun.id)}-v1-peaks.csv"`,
    );
    const text = await response.text();
    // Comment lines name the run, its release and the caveat.
    expect(text).toContain(
      `# Emberline peaks and candidate lines of run ${calibratedRun.id} version 1\r\n`,
    );
    expect(text).toMatch(
      new RegExp(`^# Line-table release \\d+ \\(${calibratedRun.lineReleaseId}\\)`, "m"),
    );
    expect(text).toContain("# Qualitative screening result only - not a certified analysis");
    const rows = parseCsv(text);
    const { rows: stored } = await db().query<{
      matches: { peakIndex: number; candidates: unknown[] }[];
    }>("SELECT matches FROM runs WHERE id = $1", [calibratedRun.id]);
    const candidatesOf = new Map(stored[0].matches.map((m) => [m.peakIndex, m.candidates.length]));
    const expectedRows = calibratedRun.peaks.reduce(
      (sum, _p, i) => sum + Math.max(1, candidatesOf.get(i) ?? 0),
      0,
    );
    expect(rows).toHaveLength(expectedRows);
    // Each peak's centre, rounded to the decimal place of its uncertainty's second digit: no 15-digit
    // doubles, and never further from the stored centre than half that place.
    const peakRows = new Map(rows.map((r) => [r.peak_nm, r]));
    expect(peakRows.size).toBe(calibratedRun.peaks.length);
    for (const r of peakRows.values()) {
      const decimals = r.peak_nm.split(".")[1]?.length ?? 0;
      expect(
        r.peak_uncertainty_nm.replace(/^0\.0*/, "").replace(".", "").length,
      ).toBeLessThanOrEqual(2);
      const stored = calibratedRun.peaks.find(
        (p) => Math.abs(p.wavelengthNm - Number(r.peak_nm)) <= 0.5 * 10 ** -decimals + 1e-12,
      );
      expect(stored, r.peak_nm).toBeDefined();
      expect(Number(r.peak_uncertainty_nm)).toBeGreaterThan(0);
      expect(decimals).toBeLessThanOrEqual(
        2 - 1 - Math.floor(Math.log10(Number(r.peak_uncertainty_nm))),
      );
    }
    // Every line a call used shows as a candidate that the call took.
    for (const c of calibratedRun.calls.filter((k) => k.verdict === "present")) {
      for (const l of c.lines) {
        const row = rows.find(
          (r) =>
            r.candidate_species === c.species &&
            Math.abs(Number(r.reference_nm) - l.lineNm) < 1e-6 &&
            Math.abs(Number(r.peak_nm) - l.peakNm) <= Number(r.peak_uncertainty_nm),
        );
        expect(row, `${c.species} ${l.lineNm}`).toBeDefined();
        expect(row!.candidate_used_by_call).toBe("yes");
      }
    }
  });

  it("the notebook's calls.csv lists every call of every run", async () => {
    const response = await download(chemist, `/api/notebooks/${notebookId}/calls.csv`);
    expect(response.status).toBe(200);
    expect(response.headers.get("cache-control")).toMatch(/no-store/);
    const text = await response.text();
    expect(text).toContain(`# Emberline calls of notebook ${notebookId}: 2 runs`);
    expect(text).toMatch(/^# Line-table release the runs used: \d+\r$/m);
    expect(text).toContain("# Qualitative screening result only - not a certified analysis");
    const rows = parseCsv(text);
    const runs = [calibratedRun, ownAxisRun];
    expect(rows).toHaveLength(runs.reduce((sum, r) => sum + Math.max(1, r.calls.length), 0));
    for (const run of runs) {
      const mine = rows.filter((r) => r.run_id === run.id);
      expect(mine.map((r) => r.species).sort()).toEqual(run.calls.map((c) => c.species).sort());
    }
    // The override put in above stands in the calibrated run's potassium row.
    const potassium = rows.find((r) => r.run_id === calibratedRun.id && r.species === "K I")!;
    expect(potassium.standing_verdict).toBe("possible");
    expect(potassium.override_reason).toContain("cobalt glass");
    expect(rows.find((r) => r.run_id === ownAxisRun.id)?.author).toBe(DEMO.chemist.name);
    // Absent calls carry their detection limit, as stored with the run; other calls leave it empty.
    for (const run of runs) {
      for (const call of run.calls) {
        const row = rows.find((r) => r.run_id === run.id && r.species === call.species)!;
        if (call.verdict === "absent" && call.detectionLimit) {
          expect(Number(row.detection_limit_nm)).toBe(call.detectionLimit.lineNm);
          expect(Number(row.detection_limit_counts)).toBe(call.detectionLimit.counts);
        } else if (call.verdict !== "absent") {
          expect(row.detection_limit_counts).toBe("");
        }
      }
    }
    expect(
      runs.some((run) => run.calls.some((c) => c.verdict === "absent" && c.detectionLimit)),
    ).toBe(true);
  });
});

describe("access", () => {
  it("answers 404 to another team and 401 to nobody signed in, on every download", async () => {
    const paths = [
      `/api/runs/${calibratedRun.id}/report.pdf`,
      `/api/runs/${calibratedRun.id}/peaks.csv`,
      `/api/runs/${calibratedRun.id}/spectrum.jdx`,
      `/api/runs/${calibratedRun.id}/spectrum-even.jdx`,
      `/api/notebooks/${notebookId}/calls.csv`,
    ];
    for (const p of paths) {
      expect((await download(outsider, p)).status, p).toBe(404);
      expect((await download(null, p)).status, p).toBe(401);
    }
    expect((await download(chemist, "/api/runs/not-a-uuid/report.pdf")).status).toBe(404);
  });

  it("lets every member of the team download (a supervisor too)", async () => {
    const supervisor = await signInDemo("supervisor");
    expect((await download(supervisor, `/api/runs/${calibratedRun.id}/peaks.csv`)).status).toBe(
      200,
    );
  });
});
