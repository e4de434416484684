// A notebook's calls as CSV: one row per run and call (a run with no candidate at all has one row
// with the call cells empty, so every run is listed), with the standing and the computed verdict, and
// an absent call's detection limit (the least height its strongest line in range needed to be found).
import type { RunRecord } from "@/lib/services/workflow-types";
import { formatCsv, type CsvCell } from "./csv-table";

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

export function formatNotebookCallsCsv(runs: readonly NotebookCallsRun[]): string {
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
        call.score,
        call.seenCount,
        call.missingCount,
        call.detectionLimit?.lineNm ?? null,
        call.detectionLimit?.counts ?? null,
        call.detectionLimit?.relativeToStrongest ?? null,
      ]);
    }
  }
  return formatCsv(NOTEBOOK_CALLS_CSV_COLUMNS, rows);
}
