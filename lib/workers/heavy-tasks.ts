// The CPU-heavy tasks the worker pool runs: pure inputs in, plain results out (no database, no
// request). Each runs on a worker thread, so one person's report or import never stalls the others.
// Errors come back as data (name, message, code) because a thrown class does not survive the thread
// boundary; lib/workers/heavy-pool.ts turns them back into the errors the services expect.
import fs from "node:fs";
import path from "node:path";
import { renderReportPdf, type ReportFonts } from "@/lib/reports/render-report-pdf";
import type { RunReport } from "@/lib/reports/report-model";
import { woffToSfnt } from "@/lib/reports/woff-to-sfnt";
import {
  analyzeSample,
  calibrateLamp,
  editLampCalibration,
  type AnalyzeSampleOptions,
  type CalibrateLampOptions,
  type EditedLampCalibration,
  type EditLampCalibrationOptions,
  type LampCalibrationEdits,
  type SampleAnalysis,
} from "@/lib/spectrum/analysis";
import { CalibrationError, type LampLine } from "@/lib/spectrum/calibration";
import { prepareLineIndex, type LineIndex } from "@/lib/spectrum/matching";
import type { ReferenceLine } from "@/lib/spectrum/types";
import { planImport, type PlannedImport } from "@/lib/services/line-import-plan";
import type { LineDbRow } from "@/lib/services/line-library-rows";

export type HeavyTask =
  | {
      kind: "report-pdf";
      report: RunReport;
      chart: { wavelengthNm: Float64Array; counts: Float64Array };
    }
  | {
      /** The workbench: the automatic calibration, then the chemist's edits and every model compared. */
      kind: "edit-lamp-calibration";
      x: Float64Array;
      y: Float64Array;
      lines: LampLine[];
      options: CalibrateLampOptions & EditLampCalibrationOptions;
      edits: LampCalibrationEdits;
    }
  | {
      kind: "analyze-sample";
      x: Float64Array;
      y: Float64Array;
      /** Releases never change, so a worker keeps the index it built for one; lines are sent only when it has none. */
      releaseId: string;
      lines: readonly ReferenceLine[] | null;
      options: AnalyzeSampleOptions;
    }
  | { kind: "plan-line-import"; releaseId: string; csvText: string; draftRows: LineDbRow[] }
  /** For the pool's own tests: holds the thread for a while, then answers. */
  | { kind: "sleep"; ms: number };

export interface HeavyResults {
  "report-pdf": Uint8Array;
  "edit-lamp-calibration": EditedLampCalibration;
  /** null: this worker has no index of the release yet; send the lines. */
  "analyze-sample": SampleAnalysis | null;
  "plan-line-import": PlannedImport;
  sleep: { sleptMs: number };
}

export interface HeavyTaskError {
  name: string;
  message: string;
  code?: string;
  details?: Record<string, unknown>;
}

export type HeavyOutcome<K extends HeavyTask["kind"]> =
  { ok: true; value: HeavyResults[K] } | { ok: false; error: HeavyTaskError };

let fonts: ReportFonts | undefined;

/** IBM Plex from the complete WOFF 1 files in fonts/, unpacked to sfnt once per thread (see woff-to-sfnt). */
function reportFonts(): ReportFonts {
  const read = (name: string) =>
    woffToSfnt(fs.readFileSync(path.join(process.cwd(), "fonts", name)));
  fonts ??= {
    sans: read("IBMPlexSans-Regular.woff"),
    sansBold: read("IBMPlexSans-SemiBold.woff"),
    mono: read("IBMPlexMono-Regular.woff"),
  };
  return fonts;
}

/** Line indexes this thread built, by release; a few releases at most, oldest dropped first. */
const indexes = new Map<string, LineIndex>();
const MAX_INDEXES = 4;

function indexFor(releaseId: string, lines: readonly ReferenceLine[] | null): LineIndex | null {
  let index = indexes.get(releaseId);
  if (!index && lines) {
    index = prepareLineIndex(lines);
    if (indexes.size >= MAX_INDEXES) indexes.delete(indexes.keys().next().value!);
    indexes.set(releaseId, index);
  }
  return index ?? null;
}

async function run(task: HeavyTask): Promise<unknown> {
  switch (task.kind) {
    case "report-pdf": {
      const pdf = await renderReportPdf(task.report, {
        fonts: reportFonts(),
        spectrum: task.chart,
      });
      return new Uint8Array(pdf.buffer, pdf.byteOffset, pdf.byteLength);
    }
    case "edit-lamp-calibration": {
      const automatic = calibrateLamp(task.x, task.y, task.lines, task.options);
      return editLampCalibration(automatic, task.lines, task.edits, task.options);
    }
    case "analyze-sample": {
      const index = indexFor(task.releaseId, task.lines);
      return index ? analyzeSample(task.x, task.y, index, task.options) : null;
    }
    case "plan-line-import":
      return planImport(task.releaseId, task.csvText, task.draftRows);
    case "sleep": {
      const until = Date.now() + task.ms;
      while (Date.now() < until) {
        // Busy on purpose: a task that holds its thread, as a report does.
      }
      return { sleptMs: task.ms };
    }
  }
}

/** The worker's entry: never throws, so every failure keeps its name and code across the thread. */
export async function runHeavyTask(task: HeavyTask): Promise<HeavyOutcome<HeavyTask["kind"]>> {
  try {
    return { ok: true, value: (await run(task)) as HeavyResults[HeavyTask["kind"]] };
  } catch (error) {
    if (error instanceof CalibrationError) {
      return {
        ok: false,
        error: {
          name: error.name,
          message: error.message,
          code: error.code,
          details: error.details,
        },
      };
    }
    if (error instanceof Error)
      return { ok: false, error: { name: error.name, message: error.message } };
    return { ok: false, error: { name: "Error", message: String(error) } };
  }
}
