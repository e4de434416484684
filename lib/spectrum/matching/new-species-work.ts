// A species' work record before anything is weighed: its lines in range and its strong-line count.

import { countAtLeast } from "./count-at-least";
import { positionsWithin } from "./lower-bound";
import type { SpeciesLines } from "./prepare-line-index";
import type { ScoreSettings, SpeciesInfo, SpeciesWork } from "./score-elements-stage-types";

/** The species' lines in rangeNm and judgedRangeNm, located by binary search, and its strong lines in
 * range counted from its sorted blocks; nothing seen, nothing missing yet. */
export function newSpeciesWork(
  lines: SpeciesLines,
  settings: Pick<ScoreSettings, "source" | "strongLineFraction"> & {
    rangeNm: [number, number];
    judgedRangeNm: [number, number];
  },
): SpeciesWork {
  const { source, strongLineFraction, rangeNm, judgedRangeNm } = settings;
  const positions = ([from, to]: [number, number], first: number, end: number) =>
    positionsWithin(lines.nm, from, to, first, end);
  const info: SpeciesInfo = {
    lines,
    scale: lines.bySource[source],
    basis: lines.bySource[source].basis,
    atomicInRange: positions(rangeNm, 0, lines.atomicCount),
    bandsInRange: positions(rangeNm, lines.atomicCount, lines.nm.length),
    atomicJudged: positions(judgedRangeNm, 0, lines.atomicCount),
    bandsJudged: positions(judgedRangeNm, lines.atomicCount, lines.nm.length),
  };
  // An unrated line counts as intensity 0, so with a zero fraction every line in range is strong.
  const strongInRange =
    strongLineFraction > 0
      ? countAtLeast(info.scale.blocks, ...info.atomicInRange, strongLineFraction) +
        countAtLeast(info.scale.blocks, ...info.bandsInRange, strongLineFraction)
      : info.atomicInRange[1] - info.atomicInRange[0] + info.bandsInRange[1] - info.bandsInRange[0];
  return {
    info,
    groups: [],
    strongInRange,
    missing: [],
    hiddenBy: new Map(),
    snrPerRelative: null,
    missingCount: 0,
    missingStrongCount: 0,
    missingWeight: 0,
    strongestMissingRelative: 0,
    anchor: null,
    heldPeaks: [],
    score: 0,
  };
}
