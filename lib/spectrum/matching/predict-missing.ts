// Which of a species' lines in range should have shown and did not, and what they cost its score.

import type { SourceKind } from "../types";
import { borrowed } from "./borrowed";
import { countAtLeast } from "./count-at-least";
import { leastRelativeAtLeast } from "./least-relative-at-least";
import { positionsWithin } from "./lower-bound";
import type { LineIndex } from "./prepare-line-index";
import type { FlatCandidates, HidingPeaks, SpeciesWork } from "./score-elements-stage-types";
import { sumAtLeast } from "./sum-at-least";
import { walkStrongestFirst } from "./walk-strongest-first";

/** Borrowed intensities come from a hotter or colder source; count their missing lines half. */
const BORROWED_MISSING_WEIGHT = 0.5;

/**
 * Lines of the species in range that no peak matched yet should have stood well above noise. The
 * penalty and the counts are exact, but lines are only visited where needed: totals over the range
 * come from the species' sorted blocks, minus the matched lines (few) and minus the hidden ones,
 * which can only lie within reach of a strong peak; the strongest of the rest are listed from the
 * range-maximum tree, best first.
 */
export function predictMissing(
  entry: SpeciesWork,
  candidates: FlatCandidates,
  isMatched: (lineIndex: number) => boolean,
  index: LineIndex,
  source: SourceKind,
  limits: {
    missingSnr: number;
    strongLineFraction: number;
    maxListed: number;
    hiding: HidingPeaks;
  },
): void {
  const { anchor, info } = entry;
  const { relative, blocks, maxTree } = info.scale;
  const { order, nm } = info.lines;
  const strong = limits.strongLineFraction;
  const scale = anchor ? anchor.snr / anchor.ratedWeight : null;
  const weight =
    info.basis === "none" ? 0 : borrowed(info.basis, source) ? BORROWED_MISSING_WEIGHT : 1;
  // The rated lines that are missing unless matched are exactly those with relative ≥ least.
  // Without an anchor every rated line is listed when something of the species was seen, but
  // only the strong ones are ever reported when nothing was.
  const least =
    scale === null
      ? entry.groups.length > 0
        ? 0
        : strong
      : leastRelativeAtLeast(scale, limits.missingSnr);
  // Only lines where a peak could show can be missing (judgedRangeNm).
  const ranges = [info.atomicJudged, info.bandsJudged];
  const [[atomicFrom, atomicTo], [bandFrom, bandTo]] = ranges;
  const inRange = (p: number) => (p >= atomicFrom && p < atomicTo) || (p >= bandFrom && p < bandTo);

  let matchedCount = 0;
  let matchedStrongCount = 0;
  let matchedSum = 0;
  for (const group of entry.groups) {
    for (const member of group.members) {
      const p = index.positionInSpecies[candidates.lineIndex[member]];
      if (!inRange(p) || !(relative[p] >= least)) continue;
      matchedCount++;
      matchedSum += relative[p];
      if (relative[p] >= strong) matchedStrongCount++;
    }
  }

  // A line can only be hidden by a peak within its reach that outshines even the weakest line
  // that counts, so only the lines in those peaks' reach are examined.
  const hidden: number[] = [];
  const hiddenBy = new Map<number, number>();
  if (scale !== null && least < Infinity) {
    const { wavelengthNm, reachNm, snr, hiderOf } = limits.hiding;
    const prune = Number.isFinite(scale) && scale > 0;
    // A peak hides a line it outshines hidingSnrRatio times, or a fainter companion too close to be
    // resolved from it (see hiderOf): either way the peak is at least as strong as the line.
    const weakestHiderSnr = limits.missingSnr * (1 - 1e-9);
    const examined = new Set<number>();
    for (let i = 0; i < wavelengthNm.length; i++) {
      if (prune && snr[i] < weakestHiderSnr) continue;
      // Lines stronger than the peak cannot hide in it (slack for rounding).
      const mostHideable = prune ? (snr[i] / scale) * (1 + 1e-9) : Infinity;
      const slackNm = 1e-9 * (reachNm[i] + 1);
      for (const [from, to] of ranges) {
        const [first, last] = positionsWithin(
          nm,
          wavelengthNm[i] - reachNm[i] - slackNm,
          wavelengthNm[i] + reachNm[i] + slackNm,
          from,
          to,
        );
        for (let p = first; p < last; p++) {
          if (!(relative[p] >= least) || relative[p] > mostHideable || examined.has(p)) continue;
          examined.add(p);
          if (isMatched(order[p])) continue;
          const by = hiderOf(nm[p], scale * relative[p]);
          if (by === null) continue;
          hidden.push(p);
          hiddenBy.set(p, by);
        }
      }
    }
  }

  const countRanges = (threshold: number) =>
    ranges.reduce((n, [from, to]) => n + countAtLeast(blocks, from, to, threshold), 0);
  entry.missingCount = countRanges(least) - matchedCount;
  entry.missingStrongCount =
    countRanges(Math.max(least, strong)) -
    matchedStrongCount -
    hidden.filter((p) => relative[p] >= strong).length;
  const unhiddenCount = entry.missingCount - hidden.length;

  // The strongest lines that are neither matched nor hidden, from each range (atomic lines and
  // band heads have their own wavelength order); the best of both are kept. At least one is
  // looked for: the strongest caps the species' share of shared peaks.
  const listed: number[] = [];
  const wanted = Math.max(1, limits.maxListed);
  for (const [from, to] of ranges) {
    let taken = 0;
    walkStrongestFirst(maxTree, from, to, least, (p) => {
      if (isMatched(order[p]) || hiddenBy.has(p)) return true;
      listed.push(p);
      return ++taken < wanted;
    });
  }
  const strongestFirst = (a: number, b: number) =>
    relative[b] - relative[a] || nm[a] - nm[b] || a - b;
  listed.sort(strongestFirst);
  entry.strongestMissingRelative = scale !== null && listed.length > 0 ? relative[listed[0]] : 0;
  listed.splice(limits.maxListed);

  if (scale !== null && unhiddenCount > 0) {
    if (listed.length >= unhiddenCount) {
      // All of them are listed: add them in the order a scan of the range meets them, so the
      // penalty is bit for bit what a scan gives.
      for (const p of listed.slice().sort((a, b) => a - b))
        entry.missingWeight += weight * relative[p];
    } else {
      let total = 0;
      for (const [from, to] of ranges) total += sumAtLeast(blocks, from, to, least);
      for (const p of hidden) total -= relative[p];
      entry.missingWeight = weight * Math.max(0, total - matchedSum);
    }
  }
  entry.missing = [...hidden, ...listed].sort(strongestFirst);
  entry.hiddenBy = hiddenBy;
  entry.snrPerRelative = scale;
}
