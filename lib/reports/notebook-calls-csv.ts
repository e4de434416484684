// A notebook's calls as CSV: one row per run and call (a run with no candidate at all has one row
// with the call cells empty, so every run is listed), with the standing and the computed verdict, and
// an absent call's detection limit (the least height its strongest line in range needed to be found).
// Comment lines name the notebook, the runs' line-table releases and the caveat.
import type { RunRecord } from "@/lib/runs/types";
import { formatCsv, type CsvCell } from "./csv-table";
import { SCREENING_CAVEAT } from "./report-text";
import { roundSignificant } from "./round-to-uncertainty";

export interface NotebookCallsRun {
  run: RunRecord;
  authorName: string | null;
  instrumentName: string;
}

export const NOTEBOOK_CALLS_CSV_COLUMNS = [
  "run_id",
  "version",
  "status",
  "analysed_at",
  "author",
  "instrument",
  "source",
  "species",
  "element",
  "standing_verdict",
  "computed_verdict",
  "override_reason",
  "score",
  "lines_seen",
  "lines_missing",
  "detection_limit_nm",
  "detection_limit_counts",
  "detection_limit_of_strongest",
] as const;

/** The notebook the calls CSV lists. */
export interface NotebookCallsAbout {
  notebookId: string;
}

export function formatNotebookCallsCsv(
  runs: readonly NotebookCallsRun[],
  about: NotebookCallsAbout,
): string {
  const rows: CsvCell[][] = [];
  for (const { run, authorName, instrumentName } of runs) {
    const runCells: CsvCell[] = [
      run.id,
      run.versionNumber,
      run.status,
      run.createdAt,
      authorName ?? "",
      instrumentName,
      run.source,
    ];
    if (run.calls.length === 0)
      rows.push([...runCells, "", "", "", "", "", null, null, null, null, null, null]);
    for (const call of run.calls) {
      const newest = run.overrides.filter((o) => o.species === call.species).at(-1);
      rows.push([
        ...runCells,
        call.species,
        call.element,
        run.verdicts[call.species] ?? call.verdict,
        call.computedVerdict,
        newest?.reason ?? "",
        // A score is a weighing of evidence: three digits say all it can.
        roundSignificant(call.score, 3),
        call.seenCount,
        call.missingCount,
        call.detectionLimit?.lineNm ?? null,
        call.detectionLimit?.counts ?? null,
        call.detectionLimit?.relativeToStrongest ?? null,
      ]);
    }
  }
  const releases = [...new Set(runs.map(({ run }) => run.lineReleaseNumber ?? "unpublished"))];
  return formatCsv(NOTEBOOK_CALLS_CSV_COLUMNS, rows, {
    comments: [
      `Emberline calls of notebook ${about.notebookId}: ${runs.length} run${runs.length === 1 ? "" : "s"} (run_id and version name each)`,
      releases.length === 0
        ? "No runs yet: no line-table release."
        : `Line-table release${releases.length === 1 ? "" : "s"} the runs used: ${releases.join(" and ")}`,
      SCREENING_CAVEAT,
    ],
  });
}
