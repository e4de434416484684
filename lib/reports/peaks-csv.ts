// A run's peaks with their candidate lines as CSV: one row per peak and candidate (a peak with no
// candidate has one row with the candidate cells empty), and which calls took the peak as evidence.
import type { Verdict } from "@/lib/spectrum/matching";
import type { RunCall, RunPeak } from "@/lib/services/workflow-types";
import { formatCsv, type CsvCell } from "./csv-table";

/** One peak's candidates as stored with the run. */
export interface StoredPeakMatch {
  peakIndex: number;
  candidates: {
    lineId: string;
    species: string;
    kind: string;
    referenceNm: number;
    deltaNm: number;
    sigmaNm: number;
    deltaSigma: number;
  }[];
}

export const PEAKS_CSV_COLUMNS = [
  "peak_nm",
  "peak_uncertainty_nm",
  "fwhm_nm",
  "height_counts",
  "snr",
  "flags",
  "candidate_species",
  "candidate_kind",
  "reference_nm",
  "delta_nm",
  "delta_over_sigma",
  "candidate_used_by_call",
  "candidate_standing_verdict",
  "peak_assigned_to",
] as const;

/** Same peak when the centres agree to a millionth of a nm (the call stores the peak's centre as found). */
const SAME_PEAK_NM = 1e-6;

export function formatPeaksCsv(
  peaks: readonly RunPeak[],
  matches: readonly StoredPeakMatch[],
  calls: readonly RunCall[],
  verdicts: Record<string, Verdict>,
): string {
  const byPeak = new Map(matches.map((m) => [m.peakIndex, m.candidates]));
  const rows: CsvCell[][] = [];
  peaks.forEach((peak, index) => {
    const uses = (call: RunCall, lineId?: string) =>
      call.lines.some(
        (l) =>
          Math.abs(l.peakNm - peak.wavelengthNm) < SAME_PEAK_NM &&
          (lineId === undefined || l.lineId === lineId),
      );
    const assignedTo = calls
      .filter((c) => (verdicts[c.species] ?? c.verdict) !== "absent" && uses(c))
      .map((c) => c.species)
      .join("; ");
    const flags = [peak.saturated ? "saturated" : "", peak.blended ? "blended" : ""]
      .filter(Boolean)
      .join("; ");
    const peakCells: CsvCell[] = [
      peak.wavelengthNm,
      peak.uncertaintyNm,
      peak.fwhmNm,
      peak.height,
      peak.snr,
      flags,
    ];
    const candidates = byPeak.get(index) ?? [];
    if (candidates.length === 0)
      rows.push([...peakCells, "", "", null, null, null, "", "", assignedTo]);
    for (const c of candidates) {
      const call = calls.find((k) => k.species === c.species);
      rows.push([
        ...peakCells,
        c.species,
        c.kind,
        c.referenceNm,
        c.deltaNm,
        c.deltaSigma,
        call && uses(call, c.lineId) ? "yes" : "no",
        verdicts[c.species] ?? "",
        assignedTo,
      ]);
    }
  });
  return formatCsv(PEAKS_CSV_COLUMNS, rows);
}
