// Reports a lab files: a run's PDF report and printable page, its peaks CSV and its calibrated
// spectrum as JCAMP-DX (as calibrated, and resampled onto an even axis), and a notebook's calls CSV. Authorise (team.view; another team's run is not
// found) → gather the plain records → render with lib/reports. Downloads change nothing: no audit.
import "server-only";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { notFound } from "@/lib/errors";
import { formatNotebookCallsCsv, type NotebookCallsRun } from "@/lib/reports/notebook-calls-csv";
import { formatPeaksCsv } from "@/lib/reports/peaks-csv";
import {
  buildRunReport,
  shortRunId,
  type ReportRound,
  type RunReport,
} from "@/lib/reports/report-model";
import type { ReportFile } from "@/lib/reports/report-response";
import { formatRunSpectrumJdx } from "@/lib/reports/spectrum-jdx";
import { thinSeries } from "@/lib/charts/thin-series";
import type { WavelengthMedium } from "@/lib/spectrum/types";
import { runHeavyTask } from "@/lib/workers/heavy-pool";
import {
  Calibration,
  Instrument,
  LineRelease,
  Notebook,
  Run,
  RunRound,
  RunSignature,
  SpectrumFile,
  Team,
  User,
} from "@/models";
import { toCalibrationRecord } from "./calibrations";
import { loadNotebook } from "./notebooks";
import { keepReportPdf, keptReportPdf } from "./report-cache";
import { loadRun } from "./run-lifecycle";
import { runSpectrumOf } from "./run-spectrum";
import {
  RUN_RECORD_ATTRIBUTES,
  loadRunRecordContext,
  overridesByRun,
  toRunRecord,
} from "./run-records";

/** Points drawn in the report's chart; each bucket keeps its extremes, so no line is lost. */
const CHART_POINTS = 3000;

async function namesOf(ids: (string | null)[]): Promise<Map<string, string>> {
  const wanted = [...new Set(ids.filter((id): id is string => id !== null))];
  if (wanted.length === 0) return new Map();
  const users = await User.findAll({ where: { id: wanted }, attributes: ["id", "name"] });
  return new Map(users.map((u) => [u.id, u.name]));
}

function baseName(run: { id: string; versionNumber: number }): string {
  return `emberline-run-${shortRunId(run.id)}-v${run.versionNumber}`;
}

/** The run a report is made from, without its candidate matches (no report shows them; 3 MB on a large table). */
async function loadReportRun(actor: Actor, runId: string): Promise<Run> {
  const row = await Run.findByPk(runId, { attributes: RUN_RECORD_ATTRIBUTES });
  if (!row) throw notFound("No such run.");
  authorize(actor, "team.view", { teamId: row.teamId });
  return row;
}

type ReportAndChart = {
  report: RunReport;
  chart: { wavelengthNm: Float64Array; counts: Float64Array };
};

/** Everything the report shows, and the spectrum thinned for its chart. */
export async function fetchRunReport(actor: Actor, runId: string): Promise<ReportAndChart> {
  return reportOf(await loadReportRun(actor, runId));
}

/**
 * Each row once: the run (given), the spectrum (without the raw upload), the calibration; the records
 * and the chart are made from these rows rather than fetched again by the services that serve pages.
 */
async function reportOf(row: Run): Promise<ReportAndChart> {
  const [overrides, spectrumRow, calibrationRow, release, notebook, signature, rounds] =
    await Promise.all([
      overridesByRun([row.id]),
      SpectrumFile.findByPk(row.spectrumId, { attributes: { exclude: ["rawBytes"] } }),
      row.calibrationId ? Calibration.findByPk(row.calibrationId) : Promise.resolve(null),
      LineRelease.findByPk(row.lineReleaseId, { attributes: ["id", "number", "publishedAt"] }),
      Notebook.findByPk(row.notebookId, { attributes: ["id", "title"] }),
      RunSignature.findOne({ where: { runId: row.id } }),
      RunRound.findAll({ where: { runId: row.id }, order: [["round", "ASC"]] }),
    ]);
  if (!spectrumRow || !notebook) throw notFound("No such run.");
  // The record's context from the rows at hand: its release is loaded here anyway.
  const run = toRunRecord(row, {
    overrides,
    releaseNumbers: new Map(release ? [[release.id, release.number]] : []),
  });
  const instrument = await Instrument.findByPk(spectrumRow.instrumentId, {
    attributes: ["id", "name", "dispersion"],
  });
  if (!instrument) throw notFound("No such run.");
  const calibration = calibrationRow ? toCalibrationRecord(calibrationRow) : null;
  const points = runSpectrumOf(row, spectrumRow, calibrationRow);
  const spectrum = {
    id: spectrumRow.id,
    fileName: spectrumRow.fileName,
    label: spectrumRow.label,
    sha256: spectrumRow.sha256,
    points: spectrumRow.pointCount,
  };
  const names = await namesOf([
    run.createdById,
    ...rounds.flatMap((r) => [r.submittedById, r.requestedReviewerId, r.decidedById ?? null]),
  ]);
  const name = (id: string | null | undefined) => (id ? (names.get(id) ?? null) : null);
  const report = buildRunReport({
    run,
    calibration,
    release: {
      id: run.lineReleaseId,
      number: release?.number ?? null,
      publishedAt: release?.publishedAt?.toISOString() ?? null,
    },
    spectrum: {
      id: spectrum.id,
      fileName: spectrum.fileName,
      label: spectrum.label,
      sha256: spectrum.sha256,
      points: spectrum.points,
    },
    instrument: { name: instrument.name, dispersion: instrument.dispersion },
    notebook: { id: notebook.id, title: notebook.title },
    authorName: name(run.createdById),
    signature: signature
      ? {
          signerName: signature.signerName,
          meaning: signature.meaning,
          signedAt: signature.signedAt.toISOString(),
          contentHash: signature.contentHash,
          round: signature.round,
        }
      : null,
    rounds: rounds.map((r): ReportRound => ({
      round: r.round,
      submittedByName: name(r.submittedById),
      submittedAt: r.submittedAt.toISOString(),
      requestedReviewerName: name(r.requestedReviewerId),
      decision: r.decision ?? null,
      decidedByName: name(r.decidedById),
      decidedAt: r.decidedAt?.toISOString() ?? null,
      comment: r.comment ?? "",
    })),
    generatedAt: new Date().toISOString(),
  });
  const thin = thinSeries(points.wavelengthNm, points.counts, {}, CHART_POINTS);
  return {
    report,
    chart: { wavelengthNm: Float64Array.from(thin.x), counts: Float64Array.from(thin.y) },
  };
}

/** Renders in the worker pool (seconds of CPU; 503 with Retry-After when its queue is full). */
async function renderPdf(row: Run): Promise<{ report: RunReport; pdf: Buffer }> {
  const { report, chart } = await reportOf(row);
  const bytes = await runHeavyTask({ kind: "report-pdf", report, chart });
  return { report, pdf: Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) };
}

/** Renders of a signed run in flight in this process, so that requests arriving together share one. */
const signedRenders = new Map<string, Promise<Buffer>>();

/**
 * A signed run's report is rendered once and kept (it can no longer change; its "generated" time is
 * the first render's); any other run's is rendered on every request, as its state may have moved on.
 */
export async function runReportPdf(actor: Actor, runId: string): Promise<ReportFile> {
  const row = await loadReportRun(actor, runId);
  const file = (body: Buffer): ReportFile => ({
    fileName: `${baseName(row)}.pdf`,
    contentType: "application/pdf",
    body,
  });
  if (row.status !== "signed") return file((await renderPdf(row)).pdf);
  const kept = await keptReportPdf(row.id);
  if (kept) return file(kept);
  let render = signedRenders.get(row.id);
  if (!render) {
    render = (async () => {
      const { report, pdf } = await renderPdf(row);
      if (report.signature) await keepReportPdf(row.id, report.signature.contentHash, pdf);
      return pdf;
    })().finally(() => signedRenders.delete(row.id));
    signedRenders.set(row.id, render);
  }
  return file(await render);
}

export async function runPeaksCsv(actor: Actor, runId: string): Promise<ReportFile> {
  const row = await loadRun(actor, runId, "team.view", undefined, { withMatches: true });
  const run = toRunRecord(row, await loadRunRecordContext([row]));
  const body = formatPeaksCsv(run, row.matches);
  return {
    fileName: `${baseName(run)}-peaks.csv`,
    contentType: "text/csv; charset=utf-8; header=present",
    body,
  };
}

/** The run's calibrated spectrum as JCAMP-DX, point by point (XYPOINTS on an uneven axis). */
export function runSpectrumJdx(actor: Actor, runId: string): Promise<ReportFile> {
  return spectrumJdx(actor, runId, false);
}

/** The same spectrum linearly resampled onto an even axis, as compressed XYDATA, for programs that take no other. */
export function runSpectrumEvenJdx(actor: Actor, runId: string): Promise<ReportFile> {
  return spectrumJdx(actor, runId, true);
}

async function spectrumJdx(actor: Actor, runId: string, even: boolean): Promise<ReportFile> {
  const row = await loadRun(actor, runId);
  // Each row once: the spectrum's points and facts (not its raw upload) and the calibration's model.
  const [spectrum, calibration, release, team] = await Promise.all([
    SpectrumFile.findByPk(row.spectrumId, { attributes: { exclude: ["rawBytes"] } }),
    row.calibrationId
      ? Calibration.findByPk(row.calibrationId, { attributes: ["model"] })
      : Promise.resolve(null),
    LineRelease.findByPk(row.lineReleaseId, { attributes: ["id", "number"] }),
    Team.findByPk(row.teamId, { attributes: ["id", "name"] }),
  ]);
  if (!spectrum) throw notFound("No such run.");
  const points = runSpectrumOf(row, spectrum, calibration);
  // A lamp calibration maps onto the table's air wavelengths; a file's own axis is in air when its medium is known.
  const medium: WavelengthMedium | null =
    row.calibrationId || spectrum.xUnit === "wavenumber" || spectrum.medium !== null ? "air" : null;
  const body = formatRunSpectrumJdx(
    {
      wavelengthNm: points.wavelengthNm,
      counts: points.counts,
      medium,
      runId: row.id,
      versionNumber: row.versionNumber,
      calibrationId: row.calibrationId,
      releaseId: row.lineReleaseId,
      releaseNumber: release?.number ?? null,
      sampleSha256: spectrum.sha256,
      sampleFileName: spectrum.fileName,
      softwareVersion: row.softwareVersion,
      origin: `Emberline, team ${team?.name ?? row.teamId}`,
      analysedAt: row.createdAt.toISOString(),
    },
    { resampleEvenly: even },
  );
  return {
    fileName: `${baseName(row)}-spectrum${even ? "-even" : ""}.jdx`,
    contentType: "chemical/x-jcamp-dx; charset=utf-8",
    body,
  };
}

export async function notebookCallsCsv(actor: Actor, notebookId: string): Promise<ReportFile> {
  const notebook = await loadNotebook(actor, notebookId);
  const rows = await Run.findAll({
    where: { notebookId: notebook.id },
    attributes: RUN_RECORD_ATTRIBUTES,
    order: [
      ["createdAt", "ASC"],
      ["id", "ASC"],
    ],
  });
  const context = await loadRunRecordContext(rows);
  const runs = rows.map((row) => toRunRecord(row, context));
  const spectra = await SpectrumFile.findAll({
    where: { id: [...new Set(runs.map((r) => r.spectrumId))] },
    attributes: ["id", "instrumentId"],
  });
  const instruments = await Instrument.findAll({
    where: { id: [...new Set(spectra.map((s) => s.instrumentId))] },
    attributes: ["id", "name"],
  });
  const instrumentOf = new Map(
    spectra.map((s) => [s.id, instruments.find((i) => i.id === s.instrumentId)?.name ?? ""]),
  );
  const names = await namesOf(runs.map((r) => r.createdById));
  const entries: NotebookCallsRun[] = runs.map((run) => ({
    run,
    authorName: run.createdById ? (names.get(run.createdById) ?? null) : null,
    instrumentName: instrumentOf.get(run.spectrumId) ?? "",
  }));
  return {
    fileName: `emberline-notebook-${shortRunId(notebook.id)}-calls.csv`,
    contentType: "text/csv; charset=utf-8; header=present",
    body: formatNotebookCallsCsv(entries, { notebookId: notebook.id }),
  };
}
