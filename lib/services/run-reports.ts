// Reports a lab files: a run's PDF report and printable page, its peaks CSV and its calibrated
// spectrum as JCAMP-DX, and a notebook's calls CSV. Authorise (team.view; another team's run is not
// found) → gather the plain records → render with lib/reports. Downloads change nothing: no audit.
import "server-only";
import fs from "node:fs";
import path from "node:path";
import type { Actor } from "@/lib/auth/actor";
import { formatNotebookCallsCsv, type NotebookCallsRun } from "@/lib/reports/notebook-calls-csv";
import { formatPeaksCsv, type StoredPeakMatch } from "@/lib/reports/peaks-csv";
import { renderReportPdf, type ReportFonts } from "@/lib/reports/render-report-pdf";
import { buildRunReport, shortRunId, type ReportRound, type RunReport } from "@/lib/reports/report-model";
import type { ReportFile } from "@/lib/reports/report-response";
import { formatRunSpectrumJdx } from "@/lib/reports/spectrum-jdx";
import { thinSpectrum } from "@/lib/reports/thin-spectrum";
import type { WavelengthMedium } from "@/lib/spectrum/types";
import { Instrument, LineRelease, Run, RunRound, RunSignature, SpectrumFile, Team, User } from "@/models";
import { fetchCalibration } from "./calibrations";
import { fetchInstrument } from "./instruments";
import { loadNotebook } from "./notebooks";
import { loadRun } from "./run-lifecycle";
import { fetchRunSpectrum } from "./run-spectrum";
import { toRunRecord } from "./runs";
import { fetchSpectrum } from "./spectra";


/** Points drawn in the report's chart; each bucket keeps its extremes, so no line is lost. */
const CHART_POINTS = 3000;

let fonts: ReportFonts | undefined;

/** IBM Plex as WOFF 1 from fonts/ (fontkit subsets WOFF but not WOFF2), read once. */
function reportFonts(): ReportFonts {
  const read = (name: string) => fs.readFileSync(path.join(process.cwd(), "fonts", name));
  fonts ??= {
    sans: read("IBMPlexSans-Regular.woff"),
    sansBold: read("IBMPlexSans-SemiBold.woff"),
    mono: read("IBMPlexMono-Regular.woff"),
  };
  return fonts;
}

async function namesOf(ids: (string | null)[]): Promise<Map<string, string>> {
  const wanted = [...new Set(ids.filter((id): id is string => id !== null))];
  if (wanted.length === 0) return new Map();
  const users = await User.findAll({ where: { id: wanted }, attributes: ["id", "name"] });
  return new Map(users.map((u) => [u.id, u.name]));
}

function baseName(run: { id: string; versionNumber: number }): string {
  return `emberline-run-${shortRunId(run.id)}-v${run.versionNumber}`;
}

/** Everything the report shows, and the spectrum thinned for its chart. */
export async function fetchRunReport(
  actor: Actor,
  runId: string,
): Promise<{ report: RunReport; chart: { wavelengthNm: Float64Array; counts: Float64Array } }> {
  const row = await loadRun(actor, runId);
  const run = await toRunRecord(row);
  const spectrum = await fetchSpectrum(actor, run.spectrumId);
  const [instrument, calibration, release, notebook, signature, rounds, points] = await Promise.all([
    fetchInstrument(actor, spectrum.instrumentId),
    run.calibrationId ? fetchCalibration(actor, run.calibrationId) : Promise.resolve(null),
    LineRelease.findByPk(run.lineReleaseId),
    loadNotebook(actor, run.notebookId),
    RunSignature.findOne({ where: { runId: run.id } }),
    RunRound.findAll({ where: { runId: run.id }, order: [["round", "ASC"]] }),
    fetchRunSpectrum(actor, run.id),
  ]);
  const names = await namesOf([
    run.createdById,
    ...rounds.flatMap((r) => [r.submittedById, r.requestedReviewerId, r.decidedById ?? null]),
  ]);
  const name = (id: string | null | undefined) => (id ? (names.get(id) ?? null) : null);
  const report = buildRunReport({
    run,
    calibration,
    release: { id: run.lineReleaseId, number: release?.number ?? null, publishedAt: release?.publishedAt?.toISOString() ?? null },
    spectrum: { id: spectrum.id, fileName: spectrum.fileName, label: spectrum.label, sha256: spectrum.sha256, points: spectrum.points },
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
    rounds: rounds.map(
      (r): ReportRound => ({
        round: r.round,
        submittedByName: name(r.submittedById),
        submittedAt: r.submittedAt.toISOString(),
        requestedReviewerName: name(r.requestedReviewerId),
        decision: r.decision ?? null,
        decidedByName: name(r.decidedById),
        decidedAt: r.decidedAt?.toISOString() ?? null,
        comment: r.comment ?? "",
      }),
    ),
    generatedAt: new Date().toISOString(),
  });
  const thin = thinSpectrum(points.wavelengthNm, points.counts, { maxPoints: CHART_POINTS });
  return { report, chart: { wavelengthNm: thin.x, counts: thin.y } };
}

export async function runReportPdf(actor: Actor, runId: string): Promise<ReportFile> {
  const { report, chart } = await fetchRunReport(actor, runId);
  const body = await renderReportPdf(report, { fonts: reportFonts(), spectrum: chart });
  return { fileName: `${baseName({ id: report.runId, versionNumber: report.versionNumber })}.pdf`, contentType: "application/pdf", body };
}

export async function runPeaksCsv(actor: Actor, runId: string): Promise<ReportFile> {
  const row = await loadRun(actor, runId);
  const run = await toRunRecord(row);
  const body = formatPeaksCsv(run.peaks, row.matches as StoredPeakMatch[], run.calls, run.verdicts);
  return { fileName: `${baseName(run)}-peaks.csv`, contentType: "text/csv; charset=utf-8; header=present", body };
}

export async function runSpectrumJdx(actor: Actor, runId: string): Promise<ReportFile> {
  const row = await loadRun(actor, runId);
  const [points, spectrum, release, team] = await Promise.all([
    fetchRunSpectrum(actor, row.id),
    SpectrumFile.findByPk(row.spectrumId, { attributes: ["id", "fileName", "sha256", "xUnit", "medium"] }),
    LineRelease.findByPk(row.lineReleaseId, { attributes: ["id", "number"] }),
    Team.findByPk(row.teamId, { attributes: ["id", "name"] }),
  ]);
  // A lamp calibration maps onto the table's air wavelengths; a file's own axis is in air when its medium is known.
  const medium: WavelengthMedium | null =
    row.calibrationId || spectrum!.xUnit === "wavenumber" || spectrum!.medium !== null ? "air" : null;
  const body = formatRunSpectrumJdx({
    wavelengthNm: points.wavelengthNm,
    counts: points.counts,
    medium,
    runId: row.id,
    versionNumber: row.versionNumber,
    calibrationId: row.calibrationId,
    releaseId: row.lineReleaseId,
    releaseNumber: release?.number ?? null,
    sampleSha256: spectrum!.sha256,
    sampleFileName: spectrum!.fileName,
    softwareVersion: row.softwareVersion,
    origin: `Emberline, team ${team?.name ?? row.teamId}`,
    analysedAt: row.createdAt.toISOString(),
  });
  return { fileName: `${baseName(row)}-spectrum.jdx`, contentType: "chemical/x-jcamp-dx; charset=utf-8", body };
}

export async function notebookCallsCsv(actor: Actor, notebookId: string): Promise<ReportFile> {
  const notebook = await loadNotebook(actor, notebookId);
  const rows = await Run.findAll({
    where: { notebookId: notebook.id },
    order: [
      ["createdAt", "ASC"],
      ["id", "ASC"],
    ],
  });
  const runs = await Promise.all(rows.map((r) => toRunRecord(r)));
  const spectra = await SpectrumFile.findAll({ where: { id: [...new Set(runs.map((r) => r.spectrumId))] }, attributes: ["id", "instrumentId"] });
  const instruments = await Instrument.findAll({ where: { id: [...new Set(spectra.map((s) => s.instrumentId))] }, attributes: ["id", "name"] });
  const instrumentOf = new Map(spectra.map((s) => [s.id, instruments.find((i) => i.id === s.instrumentId)?.name ?? ""]));
  const names = await namesOf(runs.map((r) => r.createdById));
  const entries: NotebookCallsRun[] = runs.map((run) => ({
    run,
    authorName: run.createdById ? (names.get(run.createdById) ?? null) : null,
    instrumentName: instrumentOf.get(run.spectrumId) ?? "",
  }));
  return {
    fileName: `emberline-notebook-${shortRunId(notebook.id)}-calls.csv`,
    contentType: "text/csv; charset=utf-8; header=present",
    body: formatNotebookCallsCsv(entries),
  };
}
