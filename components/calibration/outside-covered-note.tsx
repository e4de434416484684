// The note a used pair of a calibration's pairs table gets when it lies outside the covered range
// (lib/calibrations/covered-range.ts): the calibration page and the workbench mark them alike.
import { withinCoveredRange } from "@/lib/calibrations/covered-range";

/** " · outside the covered range" after a used pair's state, or nothing. */
export function OutsideCoveredNote({
  pair,
  coveredRangeNm,
}: {
  pair: { wavelengthNm: number; residualNm: number };
  coveredRangeNm: readonly [number, number];
}) {
  return withinCoveredRange(pair, coveredRangeNm) ? null : (
    <span className="muted"> · outside the covered range</span>
  );
}
