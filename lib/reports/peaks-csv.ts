// A run's peaks with their candidate lines as CSV: one row per peak and candidate (a peak with no
// candidate has one row with the candidate cells empty), and which calls took the peak as evidence.
// Numbers carry the digits their uncertainty supports; comment lines name the run, release and caveat.
import type { RunCall, RunRecord, StoredPeakMatch } from "@/lib/runs/types";
import { formatCsv, type CsvCell } from "./csv-table";
import { SCREENING_CAVEAT } from "./report-text";
import {
  decimalsForUncertainty,
  roundSignificant,
  roundToDecimals,
  roundToUncertainty,
} from "./round-to-uncertainty";

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

/** What the peaks CSV reads of a run. */
export type PeaksCsvRun = Pick<
  RunRecord,
  | "id"
  | "versionNumber"
  | "lineReleaseId"
  | "lineReleaseNumber"
  | "softwareVersion"
  | "peaks"
  | "calls"
  | "verdicts"
>;

/** The comment lines above the header: which run and release, the caveat, how numbers are rounded. */
export function peaksCsvComments(run: PeaksCsvRun): string[] {
  return [
    `Emberline peaks and candidate lines of run ${run.id} version ${run.versionNumber}`,
    `Line-table release ${run.lineReleaseNumber ?? "(unpublished)"} (${run.lineReleaseId}); software ${run.softwareVersion}`,
    SCREENING_CAVEAT,
    "peak_uncertainty_nm has two significant digits and peak_nm and fwhm_nm its decimal places; height_counts is rounded as its noise (height/snr) and delta_nm as the matching sigma.",
  ];
}

export function formatPeaksCsv(run: PeaksCsvRun, matches: readonly StoredPeakMatch[]): string {
  const { peaks, calls, verdicts } = run;
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
    // The centre's decimal places serve the width too: a width is known no better than the centre it is
    // measured from (common practice). A height is known to its noise, height/snr.
    const decimals = decimalsForUncertainty(peak.uncertaintyNm);
    const nm = (value: number) =>
      decimals === null ? roundSignificant(value, 6) : roundToDecimals(value, decimals);
    const peakCells: CsvCell[] = [
      nm(peak.wavelengthNm),
      roundSignificant(peak.uncertaintyNm, 2),
      nm(peak.fwhmNm),
      roundToUncertainty(peak.height, peak.snr > 0 ? peak.height / peak.snr : NaN),
      peak.snr >= 10 ? Math.round(peak.snr) : roundToDecimals(peak.snr, 1),
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
        // The table's wavelength as typed (ten digits drop a double's conversion noise only).
        roundSignificant(c.referenceNm, 10),
        roundToUncertainty(c.deltaNm, c.sigmaNm),
        roundSignificant(c.deltaSigma, 2),
        call && uses(call, c.lineId) ? "yes" : "no",
        verdicts[c.species] ?? "",
        assignedTo,
      ]);
    }
  });
  return formatCsv(PEAKS_CSV_COLUMNS, rows, { comments: peaksCsvComments(run) });
}
