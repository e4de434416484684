// The evidence a call lists for its missing lines.

import type { ReferenceLine } from "../types";
import type { MissingLineEvidence } from "./score-elements-types";
import type { SpeciesWork } from "./score-elements-stage-types";

/** The evidence of the missing lines at `positions` of `entry`'s species (see predictMissing). */
export function missingEvidence(
  entry: SpeciesWork,
  positions: readonly number[],
  lines: readonly ReferenceLine[],
): MissingLineEvidence[] {
  const { relative } = entry.info.scale;
  const { order, nm } = entry.info.lines;
  const scale = entry.snrPerRelative;
  return positions.map((position) => ({
    lineIndex: order[position],
    line: lines[order[position]],
    referenceNm: nm[position],
    relativeIntensity: relative[position],
    predictedSnr: scale === null ? null : scale * relative[position],
    hiddenByPeakIndex: entry.hiddenBy.get(position) ?? null,
  }));
}
