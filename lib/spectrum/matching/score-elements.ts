// Weighs the matched lines per species into a present / possible / absent call with its evidence.

import type { CalibratedPeak, ReferenceLine, SourceKind } from "../types";
import { closestFirstOrder, type CandidateColumns } from "./candidate-columns";
import type { PeakMatch } from "./match-peaks-to-lines";
import { countAtLeast } from "./count-at-least";
import { depthIntoBandNm } from "./depth-into-band";
import { lowerBound, positionsWithin } from "./lower-bound";
import { dipIsShallow } from "./two-line-dip";
import { sumAtLeast } from "./sum-at-least";
import { walkStrongestFirst } from "./walk-strongest-first";
import {
  prepareLineIndex,
  type LineIndex,
  type SpeciesBasis,
  type SpeciesLines,
} from "./prepare-line-index";

export type Verdict = "present" | "possible" | "absent";

export interface ScoreElementsOptions {
  /** Kind of source; chooses the expected relative intensities.
   * @default "flame" */
  source?: SourceKind;
  /** Calibrated range of the spectrum [min, max] in nm; only lines inside it are expected.
   * @default the span of the matched peaks' wavelengths */
  rangeNm?: [number, number];
  /** The part of rangeNm where a line would show as a peak; a line closer to the array's ends than
   * that (half of it off the detector) is never counted missing, though it counts when seen.
   * @default rangeNm */
  judgedRangeNm?: [number, number];
  /** Signal-to-noise ratio at which a line is just detectable.
   * @default 3 */
  detectionLimitSnr?: number;
  /** Noise of the spectrum in counts; when given, a peak's SNR is taken as height / noiseCounts
   * instead of the peak's own snr.
   * @default undefined */
  noiseCounts?: number;
  /** A missing line counts against a species when its predicted SNR is at least this many times
   * the detection limit ("well above" it, so noise alone cannot hide it).
   * @default 2 */
  missingSnrFactor?: number;
  /** A line is one of a species' strong lines when its relative intensity is at least this.
   * @default 0.3 */
  strongLineFraction?: number;
  /** Lowest score for "present" (which also needs a strong line seen and none missing).
   * @default 0.5 */
  presentScore?: number;
  /** A missing line within this many FWHM of a peak at least `hidingSnrRatio` times stronger
   * than the line's prediction may be hidden in that peak's wing.
   * @default 1.5 */
  hidingFwhmFactor?: number;
  /** See hidingFwhmFactor.
   * @default 3 */
  hidingSnrRatio?: number;
  /** Lowest score for "possible".
   * @default 0.2 */
  possibleScore?: number;
  /** Weight of a seen line that has no relative intensity on the species' basis.
   * @default 0.1 */
  unratedLineWeight?: number;
  /** Species seen in nearly every run of this source, called present only when intense.
   * @default ["Na I"] for flames, [] otherwise */
  ubiquitousSpecies?: string[];
  /** A ubiquitous species is only a trace when its strongest peak is below this fraction of the
   * tallest peak of the spectrum.
   * @default 0.1 */
  traceFraction?: number;
  /** How many of a call's missing lines that are not hidden are listed, strongest first; the
   * penalty, missingCount and missingStrongCount always take every missing line into account.
   * @default 25 */
  maxMissingListed?: number;
  /** How many of a call's seen lines are listed, strongest first; seenCount, the score, the
   * verdict and the rationale's numbers always take every seen line into account.
   * @default 25 */
  maxSeenListed?: number;
  /** How many seen and missing lines an absent call lists (hidden ones included); its counts stay
   * exact. Against a dense table most species a peak reaches are absent, and their full lists were
   * most of a run's stored size.
   * @default 5 */
  maxListedWhenAbsent?: number;
}

/** A table line seen in the spectrum. */
export interface SeenLineEvidence {
  lineIndex: number;
  line: ReferenceLine;
  peakIndex: number;
  peakWavelengthNm: number;
  referenceNm: number;
  deltaNm: number;
  deltaSigma: number;
  /** Relative intensity on the species' basis, or null when the table has none. */
  relativeIntensity: number | null;
  /** The peak's signal-to-noise ratio. */
  snr: number;
}

/** A line expected in range that no peak matched. */
export interface MissingLineEvidence {
  lineIndex: number;
  line: ReferenceLine;
  referenceNm: number;
  relativeIntensity: number;
  /** SNR the line should have had, scaled from the species' strongest observed line; null when
   * nothing of the species was seen. */
  predictedSnr: number | null;
  /** A much stronger peak close enough to hide the line in its wing; such a line is listed but
   * not counted against the species. */
  hiddenByPeakIndex: number | null;
}

/** Other species whose lines also fall on a peak this species uses. */
export interface OverlapEvidence {
  peakIndex: number;
  peakWavelengthNm: number;
  otherSpecies: string[];
}

/** The call for one species. */
export interface ElementCall {
  species: string;
  element: string;
  ionStage: number | null;
  verdict: Verdict;
  /** 0 … 1: intensity-weighted share of the expected evidence that was seen, each seen line
   * weighted by match closeness and by its share of a peak claimed by several species. */
  score: number;
  /** The `maxSeenListed` strongest seen lines (by relative intensity, unrated ones last, ties in
   * the order below), listed by peak and then in table order; the rest are only counted. */
  seen: SeenLineEvidence[];
  /** Exact number of seen lines (listed or not). */
  seenCount: number;
  /** Exact number of peaks the seen lines stand on: lines blended into one peak are one group and
   * earn one credit, their relative intensities summed (capped at 1). */
  seenPeaks: number;
  /** Missing lines, strongest first (then by wavelength): every one that may be hidden, and the
   * `maxMissingListed` strongest of the others; the rest are only counted. */
  missing: MissingLineEvidence[];
  /** Exact number of missing lines, hidden or not (listed or not). */
  missingCount: number;
  /** Exact number of strong lines (relative intensity ≥ strongLineFraction) missing and not
   * hidden; a present call has none. */
  missingStrongCount: number;
  overlaps: OverlapEvidence[];
  /** Kind of source whose relative intensities were used. */
  intensityBasis: SourceKind | "none";
  notes: string[];
  rationale: string;
}

/** A peak matched by lines of several species that are not absent. */
export interface PeakOverlap {
  peakIndex: number;
  peakWavelengthNm: number;
  species: string[];
}

/** A peak that no credible species explains. */
export interface UnexplainedPeak {
  peakIndex: number;
  peak: CalibratedPeak;
  reason: "no-candidate" | "only-absent-species";
}

export interface ElementScoring {
  /** Sorted by score (highest first), then verdict, then species. */
  calls: ElementCall[];
  overlaps: PeakOverlap[];
  unexplainedPeaks: UnexplainedPeak[];
}

/** Every candidate of every peak in one numbering (see flattenCandidates). */
interface FlatCandidates {
  /** Each candidate's peak (its position in the matches) and its position in that peak's columns. */
  matchOf: Uint32Array;
  at: Uint32Array;
  lineIndex: Uint32Array;
  /** |Δλ/σ|. */
  absSigma: Float64Array;
  /** The columns of each peak, by position in the matches. */
  columns: CandidateColumns[];
}

interface SeenGroup {
  peakIndex: number;
  peak: CalibratedPeak;
  /** Its lines' candidates (numbers in FlatCandidates), in table order. */
  members: number[];
  weight: number;
  ratedWeight: number;
  quality: number;
  snr: number;
}

/** One species' lines and the scale used for the chosen source. */
interface SpeciesInfo {
  lines: SpeciesLines;
  scale: SpeciesBasis;
  basis: SourceKind | "none";
  /** Positions [from, to) in lines.order of its atomic lines in range, then of its band heads. */
  atomicInRange: [number, number];
  bandsInRange: [number, number];
  /** The same inside the judged range (judgedRangeNm): the lines that can be missing. */
  atomicJudged: [number, number];
  bandsJudged: [number, number];
}

interface SpeciesWork {
  info: SpeciesInfo;
  groups: SeenGroup[];
  /** Lines in range whose relative intensity is at least strongLineFraction. */
  strongInRange: number;
  /** Positions (in info.lines) of the hidden missing lines and of the strongest others, strongest
   * first; see ElementCall.missing. Evidence is built only for those a call lists. */
  missing: number[];
  /** The peak that may hide each hidden missing line, by position. */
  hiddenBy: Map<number, number>;
  /** SNR per unit of relative intensity, from the anchor; null without one. */
  snrPerRelative: number | null;
  missingCount: number;
  missingStrongCount: number;
  missingWeight: number;
  /** Relative intensity of the strongest missing line that is not hidden; 0 when there is none. */
  strongestMissingRelative: number;
  anchor: SeenGroup | null;
  score: number;
  /** Peaks of which the species could have made a fair share (EXPLAINING_SHARE or more). */
  heldPeaks: number[];
  /** Its faintest rated line in the judged range (Infinity: none), once unseenLinesAllow needs it. */
  faintestJudged?: number;
}

const VERDICT_RANK: Record<Verdict, number> = { present: 0, possible: 1, absent: 2 };
const CREDIT_FLOOR = 0.01;
/** Borrowed intensities come from a hotter or colder source; count their missing lines half. */
const BORROWED_MISSING_WEIGHT = 0.5;
const UBIQUITOUS_NOTE = "Ubiquitous in flames: trace contamination likely; judge by intensity.";

/**
 * Calls each species with lines in range. Seen lines earn credit by relative intensity × match
 * closeness × share of the peak; missing lines that should have been well above the detection
 * limit (scaled from the species' strongest observed line) add to the expected total. The method
 * is laid out in docs/identification-scoring.md.
 */
export function scoreElements(
  matches: readonly PeakMatch[],
  lines: readonly ReferenceLine[] | LineIndex,
  options: ScoreElementsOptions = {},
): ElementScoring {
  const {
    source = "flame",
    detectionLimitSnr = 3,
    noiseCounts,
    missingSnrFactor = 2,
    strongLineFraction = 0.3,
    presentScore = 0.5,
    possibleScore = 0.2,
    unratedLineWeight = 0.1,
    ubiquitousSpecies = source === "flame" ? ["Na I"] : [],
    traceFraction = 0.1,
    hidingFwhmFactor = 1.5,
    hidingSnrRatio = 3,
    maxMissingListed = 25,
    maxSeenListed = 25,
    maxListedWhenAbsent = 5,
  } = options;
  assertPositive("detectionLimitSnr", detectionLimitSnr);
  if (noiseCounts !== undefined) assertPositive("noiseCounts", noiseCounts);
  assertPositive("missingSnrFactor", missingSnrFactor);
  assertFraction("strongLineFraction", strongLineFraction);
  assertFraction("presentScore", presentScore);
  assertFraction("possibleScore", possibleScore);
  assertFraction("unratedLineWeight", unratedLineWeight);
  assertFraction("traceFraction", traceFraction);
  assertPositive("hidingFwhmFactor", hidingFwhmFactor);
  assertPositive("hidingSnrRatio", hidingSnrRatio);
  if (!Number.isInteger(maxMissingListed) || maxMissingListed < 0) {
    throw new RangeError(`maxMissingListed must be an integer ≥ 0, got ${maxMissingListed}`);
  }
  if (!Number.isInteger(maxSeenListed) || maxSeenListed < 0) {
    throw new RangeError(`maxSeenListed must be an integer ≥ 0, got ${maxSeenListed}`);
  }
  if (!Number.isInteger(maxListedWhenAbsent) || maxListedWhenAbsent < 0) {
    throw new RangeError(`maxListedWhenAbsent must be an integer ≥ 0, got ${maxListedWhenAbsent}`);
  }
  if (possibleScore > presentScore) {
    throw new RangeError(
      `possibleScore (${possibleScore}) must not exceed presentScore (${presentScore})`,
    );
  }
  const index = Array.isArray(lines)
    ? prepareLineIndex(lines as readonly ReferenceLine[])
    : (lines as LineIndex);
  const rangeNm = options.rangeNm ?? peakSpan(matches);
  const judgedRangeNm = options.judgedRangeNm ?? rangeNm;
  assertRangeNm("rangeNm", rangeNm);
  assertRangeNm("judgedRangeNm", judgedRangeNm);
  const relativeOf = (lineIndex: number): number | undefined => {
    const entry = index.species[index.speciesOfLine[lineIndex]];
    const value = entry.bySource[source].relative[index.positionInSpecies[lineIndex]];
    return Number.isNaN(value) ? undefined : value;
  };
  const snrOf = (peak: CalibratedPeak) => (noiseCounts ? peak.height / noiseCounts : peak.snr);
  const tallestHeight = matches.reduce((h, m) => Math.max(h, m.peak.height), 0);
  const hiding = hidingPeaks(matches, snrOf, hidingFwhmFactor, hidingSnrRatio);

  // Each line is credited to the one peak it matches best, so no line is seen twice. The winner
  // of each line is kept in scratch arrays over the table, valid for this call's generation only.
  const candidates = flattenCandidates(matches, index);
  const { owner: bestCandidateOfLine, stamp, generation } = nextScratch(index);
  const isMatched = (lineIndex: number) => stamp[lineIndex] === generation;
  for (let flat = 0; flat < candidates.lineIndex.length; flat++) {
    const lineIndex = candidates.lineIndex[flat];
    if (stamp[lineIndex] !== generation) {
      stamp[lineIndex] = generation;
      bestCandidateOfLine[lineIndex] = flat;
      continue;
    }
    const heldFlat = bestCandidateOfLine[lineIndex];
    const heldSigma = candidates.absSigma[heldFlat];
    const sigma = candidates.absSigma[flat];
    if (
      sigma < heldSigma ||
      (sigma === heldSigma &&
        matches[candidates.matchOf[flat]].peakIndex <
          matches[candidates.matchOf[heldFlat]].peakIndex)
    ) {
      bestCandidateOfLine[lineIndex] = flat;
    }
  }

  // Only species with a matched line, or with strong lines in range to report missing, are
  // worked on; each is located in the table by binary search, never by scanning the range.
  const work = new Map<string, SpeciesWork>();
  const newWork = (lines: SpeciesLines): SpeciesWork => {
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
        : info.atomicInRange[1] -
          info.atomicInRange[0] +
          info.bandsInRange[1] -
          info.bandsInRange[0];
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
  };
  const workOf = (lineIndex: number): SpeciesWork => {
    const lines = index.species[index.speciesOfLine[lineIndex]];
    let entry = work.get(lines.species);
    if (!entry) {
      entry = newWork(lines);
      work.set(lines.species, entry);
    }
    return entry;
  };

  // One group per species and peak, holding its lines in table order (the order their
  // intensities are summed in); the groups of a peak are kept in the order of their first line.
  const groupsByPeak = new Map<number, Map<string, SeenGroup>>();
  const speciesAtPeak = new Map<number, string[]>();
  const speciesStamp = new Int32Array(index.species.length).fill(-1);
  const groupOfSpecies: (SeenGroup | undefined)[] = new Array(index.species.length);
  let flat = 0;
  for (let m = 0; m < matches.length; m++) {
    const match = matches[m];
    const names: string[] = [];
    const here: SeenGroup[] = [];
    for (let c = 0; c < match.columns.count; c++, flat++) {
      const lineIndex = candidates.lineIndex[flat];
      const id = index.speciesOfLine[lineIndex];
      if (speciesStamp[id] !== m) {
        speciesStamp[id] = m;
        names.push(index.species[id].species);
        groupOfSpecies[id] = undefined;
      }
      if (bestCandidateOfLine[lineIndex] !== flat) continue;
      let group = groupOfSpecies[id];
      if (!group) {
        group = {
          peakIndex: match.peakIndex,
          peak: match.peak,
          members: [],
          weight: 0,
          ratedWeight: 0,
          quality: 0,
          snr: snrOf(match.peak),
        };
        groupOfSpecies[id] = group;
        here.push(group);
      }
      group.members.push(flat);
    }
    speciesAtPeak.set(match.peakIndex, names.sort());
    if (here.length === 0) continue;
    // The columns hold a table's lines in wavelength order, then its bands: a group is in table
    // order already unless the table was not given in wavelength order or mixes in a band.
    const lineOf = candidates.lineIndex;
    for (const group of here) {
      const { members } = group;
      for (let i = 1; i < members.length; i++) {
        if (lineOf[members[i]] < lineOf[members[i - 1]]) {
          members.sort((x, y) => lineOf[x] - lineOf[y]);
          break;
        }
      }
    }
    here.sort((x, y) => lineOf[x.members[0]] - lineOf[y.members[0]]);
    const atPeak = new Map<string, SeenGroup>();
    for (const group of here) {
      const lineIndex = lineOf[group.members[0]];
      atPeak.set(index.species[index.speciesOfLine[lineIndex]].species, group);
      workOf(lineIndex).groups.push(group);
    }
    groupsByPeak.set(match.peakIndex, atPeak);
  }
  for (const lines of index.species) {
    if (work.has(lines.species)) continue;
    const entry = newWork(lines);
    if (entry.strongInRange > 0) work.set(lines.species, entry);
  }

  const { positionInSpecies } = index;
  for (const entry of work.values()) {
    const { relative: relativeInSpecies } = entry.info.scale;
    for (const group of entry.groups) {
      let rated = 0;
      let unrated = 0;
      let closest = Infinity;
      for (const member of group.members) {
        const relative = relativeInSpecies[positionInSpecies[candidates.lineIndex[member]]];
        if (Number.isNaN(relative)) unrated += unratedLineWeight;
        else rated += relative;
        closest = Math.min(closest, candidates.absSigma[member]);
      }
      group.ratedWeight = Math.min(1, rated);
      group.weight = Math.min(1, rated + unrated);
      // Half-weight at 2.35σ: a softer fall than the Gaussian itself, so 1–2σ matches stay strong.
      group.quality = Math.exp(-0.5 * (closest / 2) ** 2);
    }
    entry.groups.sort((a, b) => a.peakIndex - b.peakIndex);
    // The species' scale comes from its own lines: the strongest peak no other species claims, when
    // there is one. A shared peak may be mostly another species' (a weak line at a strong neighbour's
    // peak would predict every other line of the species far too bright).
    const ownPeak = (group: SeenGroup) => groupsByPeak.get(group.peakIndex)!.size === 1;
    const strongest = (from: SeenGroup[]) =>
      from.reduce<SeenGroup | null>(
        (best, group) => (group.ratedWeight > 0 && (!best || group.snr > best.snr) ? group : best),
        null,
      );
    entry.anchor = strongest(entry.groups.filter(ownPeak)) ?? strongest(entry.groups);
    predictMissing(entry, candidates, isMatched, index, source, {
      missingSnr: detectionLimitSnr * missingSnrFactor,
      strongLineFraction,
      maxListed: maxMissingListed,
      hidingSnrRatio,
      hiding,
    });
  }

  // First pass with every peak fully credited. Then a peak claimed by several species is shared
  // in proportion to what each is expected to contribute there, capped at what was observed, times
  // its first-pass support, so a weak line of a well-supported species cannot take the peak of
  // another species' strongest line. The expected contribution scales from the species' strongest
  // observed line, but no further than its missing lines allow: had it been brighter, its
  // strongest missing line would have reached missingSnr and been seen. Without that cap a
  // species anchored on another species' peak (a lamp gas on the K I doublet) expects the whole
  // peak by construction, however many of its own strong lines are absent.
  const missingSnr = detectionLimitSnr * missingSnrFactor;
  const claimOf = (entry: SpeciesWork, group: SeenGroup): number => {
    const { anchor } = entry;
    if (!anchor || group.ratedWeight === 0 || group.snr <= 0) return CREDIT_FLOOR;
    let scale = anchor.snr / anchor.ratedWeight;
    if (entry.strongestMissingRelative > 0) {
      scale = Math.min(scale, missingSnr / entry.strongestMissingRelative);
    }
    return Math.max(CREDIT_FLOOR, Math.min(1, (scale * group.ratedWeight) / group.snr));
  };
  const scoreRound = (credit: (species: string, group: SeenGroup) => number) => {
    const next = new Map<string, number>();
    for (const [species, entry] of work) {
      let earned = 0;
      let expected = entry.missingWeight;
      for (const group of entry.groups) {
        earned += group.weight * group.quality * credit(species, group);
        expected += group.weight;
      }
      next.set(species, expected > 0 ? earned / expected : 0);
    }
    return next;
  };
  const firstPass = scoreRound(() => 1);
  const weightOf = (name: string, claimantGroup: SeenGroup) =>
    claimOf(work.get(name)!, claimantGroup) * Math.max(CREDIT_FLOOR, firstPass.get(name)!);
  // Each shared peak's total claim is summed once, in the order its claimants were grouped.
  const totalClaim = new Map<number, number>();
  const share = (species: string, group: SeenGroup): number => {
    const claimants = groupsByPeak.get(group.peakIndex)!;
    if (claimants.size === 1) return 1;
    let total = totalClaim.get(group.peakIndex);
    if (total === undefined) {
      total = 0;
      for (const [name, claimantGroup] of claimants) total += weightOf(name, claimantGroup);
      totalClaim.set(group.peakIndex, total);
    }
    return weightOf(species, group) / total;
  };
  for (const [species, score] of scoreRound(share)) work.get(species)!.score = score;
  // The peaks a species could have made a fair share of: evidence of its own. A sliver of another
  // species' peak is no second line seen.
  for (const [species, entry] of work) {
    entry.heldPeaks = entry.groups
      .filter((group) => share(species, group) >= EXPLAINING_SHARE)
      .map((group) => group.peakIndex);
  }

  const matchByPeak = new Map(matches.map((match) => [match.peakIndex, match]));
  const calls: ElementCall[] = [];
  for (const [species, entry] of work) {
    const call = buildCall(species, entry, {
      strongLineFraction,
      presentScore,
      possibleScore,
      ubiquitous: ubiquitousSpecies.includes(species),
      source,
      traceFraction,
      tallestHeight,
      matchByPeak,
      speciesAtPeak,
      relativeOf,
      positionInSpecies,
      maxSeenListed,
      maxListedWhenAbsent,
      candidates,
      lines: index.lines,
    });
    if (call) calls.push(call);
  }
  const byStanding = (a: ElementCall, b: ElementCall) =>
    b.score - a.score ||
    VERDICT_RANK[a.verdict] - VERDICT_RANK[b.verdict] ||
    (a.species < b.species ? -1 : a.species > b.species ? 1 : 0);
  calls.sort(byStanding);

  const verdictOf = new Map(calls.map((call) => [call.species, call.verdict]));
  const credible = (species: string) => {
    const verdict = verdictOf.get(species);
    return verdict === "present" || verdict === "possible";
  };
  for (const call of calls) {
    for (const overlap of call.overlaps) {
      overlap.otherSpecies = overlap.otherSpecies.filter(
        (other) => verdictOf.get(other) !== "absent",
      );
    }
    call.overlaps = call.overlaps.filter((overlap) => overlap.otherSpecies.length > 0);
  }
  demoteSinglePeakCalls(calls, {
    matchByPeak,
    work,
    index,
    isMatched,
    hiding,
    missingSnr,
    source,
  });
  capBorrowedCalls(calls, source);
  calls.sort(byStanding);

  const overlaps: PeakOverlap[] = [];
  const unexplainedPeaks: UnexplainedPeak[] = [];
  for (const match of matches) {
    const credibleHere = speciesAtPeak.get(match.peakIndex)!.filter(credible);
    if (credibleHere.length >= 2) {
      overlaps.push({
        peakIndex: match.peakIndex,
        peakWavelengthNm: match.peak.wavelengthNm,
        species: credibleHere,
      });
    }
    if (match.columns.count === 0) {
      unexplainedPeaks.push({
        peakIndex: match.peakIndex,
        peak: match.peak,
        reason: "no-candidate",
      });
    } else if (credibleHere.length === 0) {
      unexplainedPeaks.push({
        peakIndex: match.peakIndex,
        peak: match.peak,
        reason: "only-absent-species",
      });
    }
  }
  for (const call of calls) {
    if (call.verdict === "absent") trimAbsentEvidence(call, maxListedWhenAbsent);
  }
  return { calls, overlaps, unexplainedPeaks };
}

/** A line expected at this share of the peak's SNR, or more, could have made the peak. */
const EXPLAINING_SHARE = 0.3;

/**
 * Whether `rival`'s line at `peakIndex` could have made that peak: judged from the rival's strongest
 * line seen at another peak, scaled by the two lines' relative intensities (a faint line of a species
 * seen strongly elsewhere cannot make a strong peak). A line the table gives no intensity is taken as
 * no stronger than the rival's faintest rated line seen (the table rates a species' strong lines).
 * Null without a rated line seen elsewhere: nothing there to judge from.
 */
function couldMake(
  rival: ElementCall,
  peakIndex: number,
  relativeHere: number,
  peakSnr: number,
): boolean | null {
  const elsewhere = rival.seen.filter(
    (s) => s.peakIndex !== peakIndex && s.relativeIntensity !== null && s.relativeIntensity > 0,
  );
  if (elsewhere.length === 0) return null;
  if (!(peakSnr > 0)) return true;
  const anchor = elsewhere.reduce((a, b) => (b.relativeIntensity! > a.relativeIntensity! ? b : a));
  const relative = Number.isNaN(relativeHere)
    ? Math.min(...elsewhere.map((s) => s.relativeIntensity!))
    : relativeHere;
  const expectedSnr = (anchor.snr * relative) / anchor.relativeIntensity!;
  return expectedSnr >= EXPLAINING_SHARE * peakSnr;
}

/**
 * The species' strongest line in range (by relative intensity for the source) farther than the
 * peak's FWHM from it: where a peak would tell this species from its rivals. Null when none.
 */
function decidingLineNm(entry: SpeciesWork | undefined, peak: CalibratedPeak): number | null {
  if (!entry) return null;
  const { maxTree } = entry.info.scale;
  const { nm } = entry.info.lines;
  let found: number | null = null;
  for (const [from, to] of [entry.info.atomicInRange, entry.info.bandsInRange]) {
    walkStrongestFirst(maxTree, from, to, 0, (p) => {
      if (Math.abs(nm[p] - peak.wavelengthNm) <= peak.fwhmNm) return true;
      found = nm[p];
      return false;
    });
    if (found !== null) break;
  }
  return found;
}

/** A call resting on one peak needs it this far above the noise, above the peak finder's default
 * threshold of 5: bumps of continuum noise at SNR 5–6 made a band present on the sample sweep
 * (seeds 12 and 97, n 200: false present 0.50 → 0.35 % and 0.55 → 0.35 %; recall with the
 * principal line in range 95.3 → 95.3 % and 93.0 → 92.5 %). */
const SINGLE_PEAK_MIN_SNR = 7;

interface SinglePeakContext {
  matchByPeak: Map<number, PeakMatch>;
  work: Map<string, SpeciesWork>;
  index: LineIndex;
  isMatched: (lineIndex: number) => boolean;
  hiding: HidingPeaks;
  missingSnr: number;
  source: SourceKind;
}

/**
 * Whether `rival`, had its line `lineIndex` stood at SNR `peakSnr` (the share of the peak it is asked
 * to make), would have shown no other line: every line of it in range that would then stand at
 * missingSnr or more is matched to some peak or may hide in a stronger one's wing. A line the table gives no intensity is taken as the rival's
 * faintest rated line in range (the table rates a species' strong lines). A rival without intensities
 * is not weighed and always could.
 */
function unseenLinesAllow(
  rival: SpeciesWork,
  lineIndex: number,
  peakSnr: number,
  context: SinglePeakContext,
): boolean {
  const { relative, maxTree } = rival.info.scale;
  const { order, nm } = rival.info.lines;
  const ranges = [rival.info.atomicJudged, rival.info.bandsJudged];
  let here = relative[context.index.positionInSpecies[lineIndex]];
  if (Number.isNaN(here)) {
    if (rival.faintestJudged === undefined) {
      let faintest = Infinity;
      for (const [from, to] of ranges) {
        for (let p = from; p < to; p++) if (relative[p] < faintest) faintest = relative[p];
      }
      rival.faintestJudged = faintest;
    }
    here = rival.faintestJudged;
    if (here === Infinity) return true;
  }
  if (!(peakSnr > 0)) return true;
  const scale = peakSnr / here;
  const least = leastRelativeAtLeast(scale, context.missingSnr);
  let allows = true;
  for (const [from, to] of ranges) {
    walkStrongestFirst(maxTree, from, to, least, (p) => {
      if (context.isMatched(order[p])) return true;
      if (context.hiding.hiderOf(nm[p], scale * relative[p]) !== null) return true;
      allows = false;
      return false;
    });
    if (!allows) break;
  }
  return allows;
}

/**
 * One peak is proof only of the species' principal line, and only when no other species in the table
 * explains it. A species holds a peak when its share of it is EXPLAINING_SHARE or more (heldPeaks); a
 * "present" call that holds none becomes "possible". One that holds a single peak becomes "possible" when the peak holds none of
 * its principal line (the strongest for the source), or when another species (of another element) has
 * a line there that could have made the peak: its unseen lines allow it (unseenLinesAllow) and, when it
 * is seen elsewhere, its line here is not too faint for the peak (couldMake). Two single-peak calls on
 * one peak both become "possible": neither is present on that evidence alone.
 */
function demoteSinglePeakCalls(calls: ElementCall[], context: SinglePeakContext): void {
  const callOf = new Map(calls.map((call) => [call.species, call]));
  const { index } = context;
  for (const call of calls) {
    const held = context.work.get(call.species)?.heldPeaks ?? [];
    if (call.verdict !== "present" || held.length > 1 || call.seen.length === 0) continue;
    if (held.length === 0) {
      const at = [...new Set(call.seen.map((s) => s.peakWavelengthNm.toFixed(2)))].join(", ");
      demoteToPossible(
        call,
        `Its lines stand only on peaks that other species explain for the most part (${at} nm); ` +
          `a peak of its own would decide.`,
        "No peak of its own.",
      );
      continue;
    }
    const peakIndex = held[0];
    const match = context.matchByPeak.get(peakIndex)!;
    const peakNm = match.peak.wavelengthNm.toFixed(2);
    const snr = match.peak.snr;
    const alone = call.seenPeaks === 1;
    const onlyPeak = alone
      ? `Only one peak is seen (${peakNm} nm)`
      : `Only one peak is its own (${peakNm} nm; the others are mostly other species')`;
    if (snr < SINGLE_PEAK_MIN_SNR) {
      demoteToPossible(
        call,
        `${onlyPeak}, at SNR ${snr.toFixed(1)}: too faint alone to call ` +
          `${call.species} present; another of its lines would decide.`,
        "One faint peak is no proof.",
      );
      continue;
    }
    if (!call.seen.some((s) => s.peakIndex === peakIndex && s.relativeIntensity === 1)) {
      demoteToPossible(
        call,
        `${onlyPeak} and it holds none of the principal line of ${call.species}; ` +
          `its strongest line would decide.`,
        "One peak without the principal line is no proof.",
      );
      continue;
    }
    // The rival's line at the peak most able to make it: its strongest there. Any line within half the
    // instrument's width of the peak can be part of it, matched or not; a species the table rates only
    // for other sources is weighed on their scale (the table holds it, and a lamp or a sample can show it).
    const rivalLine = new Map<string, { lineIndex: number; relative: number }>();
    const halfWidthNm = 0.5 * (match.peak.resolutionNm ?? match.peak.fwhmNm);
    const within: number[] = [];
    for (
      let i = lowerBound(index.lineWavelengthNm, match.peak.wavelengthNm - halfWidthNm);
      i < index.lineWavelengthNm.length &&
      index.lineWavelengthNm[i] <= match.peak.wavelengthNm + halfWidthNm;
      i++
    ) {
      within.push(index.lineOrder[i]);
    }
    const { columns } = match;
    const closest = Array.from(closestFirstOrder(columns), (i) => columns.lineIndex[i]);
    for (const lineIndex of [...closest, ...within]) {
      const lines = index.species[index.speciesOfLine[lineIndex]];
      const rival = context.work.get(lines.species);
      if (lines.element === call.element || !rival) continue;
      const relative = rival.info.scale.relative[index.positionInSpecies[lineIndex]];
      const held = rivalLine.get(lines.species);
      if (held === undefined || relative > held.relative) {
        rivalLine.set(lines.species, { lineIndex, relative });
      }
    }
    const explainers: string[] = [];
    for (const [species, { lineIndex, relative }] of rivalLine) {
      // A rival explains the peak when it could make a fair share of it (EXPLAINING_SHARE) without its
      // other lines showing. One seen elsewhere must also not be too faint there for the peak, and
      // when its own lines call it absent at that scale, the share must still be allowed.
      const rivalCall = callOf.get(species);
      const allowedByUnseen = () =>
        unseenLinesAllow(context.work.get(species)!, lineIndex, EXPLAINING_SHARE * snr, context);
      const fromElsewhere = rivalCall ? couldMake(rivalCall, peakIndex, relative, snr) : null;
      const could =
        fromElsewhere === null
          ? allowedByUnseen()
          : fromElsewhere && (rivalCall!.verdict !== "absent" || allowedByUnseen());
      if (could) explainers.push(species);
    }
    // A line inside the extent of a band called present needs its own confirming lines: the band's
    // fading tail lies under it whatever the band's head zone says.
    for (const species of seenBandsCovering(match.peak, call.element, callOf, index)) {
      if (!explainers.includes(species)) explainers.push(species);
    }
    if (explainers.length === 0) continue;
    explainers.sort();
    const names = explainers.join(", ");
    // The line that would decide: the strongest of each species in range away from this peak.
    const deciders = [call.species, ...explainers].flatMap((species) => {
      const nm = decidingLineNm(context.work.get(species), match.peak);
      return nm === null ? [] : [`${species} ${nm.toFixed(2)} nm`];
    });
    demoteToPossible(
      call,
      `Interference: ${names} also explain${explainers.length === 1 ? "s" : ""} the only peak ${alone ? "seen" : "of its own"}, at ` +
        `${peakNm} nm; ` +
        (deciders.length > 0
          ? `a peak at ${deciders.join(" or ")} would decide.`
          : `another line of ${call.species} would decide.`),
      `Only one peak is ${alone ? "seen" : "its own"}, and ${names} ${explainers.length === 1 ? "has" : "have"} a line there too.`,
    );
  }
}

/** Species of bands called present whose extent, from the head in the direction the band degrades,
 * covers the peak, and which are bright enough to make EXPLAINING_SHARE of it: a band's tail is never
 * brighter than its head, so a band whose brightest seen peak is fainter than that cannot (Tl I
 * 535.05 nm standing 20 times above the BaCl heads it lies beyond). A band of `element`'s own molecule
 * (CaOH for Ca: its formula's first element symbol) stands with it, not against it. */
function seenBandsCovering(
  peak: CalibratedPeak,
  element: string,
  callOf: Map<string, ElementCall>,
  index: LineIndex,
): string[] {
  const nm = peak.wavelengthNm;
  const out: string[] = [];
  for (
    let i = lowerBound(index.bandHeadNm, nm - index.maxBandExtentNm);
    i < index.bandHeadNm.length && index.bandHeadNm[i] <= nm + index.maxBandExtentNm;
    i++
  ) {
    const line = index.lines[index.bandOrder[i]];
    const band = line.band!;
    const depthNm = depthIntoBandNm(band, index.bandHeadNm[i], nm);
    const bandCall = callOf.get(line.species);
    if (
      depthNm >= 0 &&
      depthNm <= band.extentNm &&
      firstElementOf(line.element) !== element &&
      bandCall?.verdict === "present" &&
      !out.includes(line.species) &&
      bandCall.seen.some((seen) => seen.snr >= EXPLAINING_SHARE * peak.snr)
    ) {
      out.push(line.species);
    }
  }
  return out;
}

/** The element symbol a formula opens with: "Ca" of "CaOH", "B" of "BO2". */
function firstElementOf(formula: string): string | undefined {
  return /^[A-Z][a-z]?/.exec(formula)?.[0];
}

/** Throws unless `range` is [min, max] of finite numbers with min ≤ max. */
function assertRangeNm(name: string, range: [number, number]): void {
  if (!(range[0] <= range[1]) || !range.every(Number.isFinite)) {
    throw new RangeError(`${name} must be [min, max] with min ≤ max, got [${range.join(", ")}]`);
  }
}

/**
 * A species the table rates only for other kinds of source is "possible" at most: the curated table
 * does not list it as seen in this one, so a peak of it here is more likely another species' line or a
 * contaminant's than a line the source excites (nitrogen, oxygen and the noble gases, weighed on arc
 * intensities, were called present in flames on the sample sweep; docs/identification-scoring.md §7).
 */
function capBorrowedCalls(calls: ElementCall[], source: SourceKind): void {
  for (const call of calls) {
    if (call.verdict !== "present" || !borrowed(call.intensityBasis, source)) continue;
    demoteToPossible(
      call,
      `The table lists none of its lines for a ${source}: called possible, not present.`,
      `The table does not list it for a ${source}.`,
    );
  }
}

/** A present call becomes possible, with a note saying why and the reason added to its rationale. */
function demoteToPossible(call: ElementCall, note: string, reason: string): void {
  call.verdict = "possible";
  call.notes.push(note);
  call.rationale = `${call.rationale.replace(/^Present:/, "Possible:")} ${reason}`;
}

/**
 * Lines of the species in range that no peak matched yet should have stood well above noise. The
 * penalty and the counts are exact, but lines are only visited where needed: totals over the range
 * come from the species' sorted blocks, minus the matched lines (few) and minus the hidden ones,
 * which can only lie within reach of a strong peak; the strongest of the rest are listed from the
 * range-maximum tree, best first.
 */
function predictMissing(
  entry: SpeciesWork,
  candidates: FlatCandidates,
  isMatched: (lineIndex: number) => boolean,
  index: LineIndex,
  source: SourceKind,
  limits: {
    missingSnr: number;
    strongLineFraction: number;
    maxListed: number;
    hidingSnrRatio: number;
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

/** The evidence of the missing lines at `positions` of `entry`'s species (see predictMissing). */
function missingEvidence(
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

/** Per line of a table: the winning candidate, and the call (generation) that wrote it. */
interface Scratch {
  owner: Uint32Array;
  stamp: Uint32Array;
  generation: number;
}

const scratchByIndex = new WeakMap<LineIndex, Scratch>();

/** The index's scratch arrays for a new call: entries written by earlier calls are stale. */
function nextScratch(index: LineIndex): Scratch {
  let scratch = scratchByIndex.get(index);
  if (!scratch || scratch.generation >= 0xffffffff) {
    const n = index.lines.length;
    scratch = { owner: new Uint32Array(n), stamp: new Uint32Array(n), generation: 0 };
    scratchByIndex.set(index, scratch);
  }
  scratch.generation++;
  return scratch;
}

/**
 * The smallest relative intensity v ≥ 0 whose predicted SNR, scale × v in floating point, is not
 * below missingSnr (Infinity when none is). The product is monotone in v, so a line counts exactly
 * when its relative intensity reaches this value; it is found from missingSnr / scale by stepping
 * a few units in the last place.
 */
function leastRelativeAtLeast(scale: number, missingSnr: number): number {
  const counts = (v: number) => !(scale * v < missingSnr);
  if (counts(0)) return 0;
  if (!counts(Number.MAX_VALUE)) return Infinity;
  let v = Math.min(Number.MAX_VALUE, missingSnr / scale);
  while (!counts(v)) v = nextDouble(v, 1);
  while (v > 0 && counts(nextDouble(v, -1))) v = nextDouble(v, -1);
  return v;
}

const doubleView = new Float64Array(1);
const bitsView = new BigInt64Array(doubleView.buffer);

/** The neighbouring double of a non-negative finite v, upwards (+1) or downwards (−1). */
function nextDouble(v: number, direction: 1 | -1): number {
  doubleView[0] = v;
  bitsView[0] += BigInt(direction);
  return doubleView[0];
}

/**
 * A dip between two lines must be this many noise σ deep for the peak finder to keep them apart: its
 * test is 3 σ on the smoothed signal, and smoothing and sampling at 2–3 samples per FWHM take about half
 * of a dip away (Na D1 beside D2 at 0.46 nm resolution went unseen at SNR 40 with a 4 σ dip).
 */
const RESOLVING_DIP_SNR = 6;

/** The peaks by wavelength with their hiding reach and SNR, and the hiding test itself. */
interface HidingPeaks {
  wavelengthNm: Float64Array;
  reachNm: Float64Array;
  snr: Float64Array;
  /** For a missing line at `nm` with its predicted SNR, the strongest peak that may hide it. */
  hiderOf: (nm: number, predictedSnr: number) => number | null;
}

/**
 * For a missing line at `nm` with its predicted SNR, the strongest peak within hidingFwhmFactor of
 * its own FWHM that outshines the prediction by hidingSnrRatio, if any. Peaks are searched by
 * wavelength within the widest reach of any peak, so each look-up costs log P plus the peaks near.
 */
function hidingPeaks(
  matches: readonly PeakMatch[],
  snrOf: (peak: CalibratedPeak) => number,
  fwhmFactor: number,
  snrRatio: number,
): HidingPeaks {
  const byWavelength = [...matches].sort((a, b) => a.peak.wavelengthNm - b.peak.wavelengthNm);
  const wavelengthNm = Float64Array.from(byWavelength, (match) => match.peak.wavelengthNm);
  const reachNm = Float64Array.from(byWavelength, (match) => fwhmFactor * match.peak.fwhmNm);
  const snr = Float64Array.from(byWavelength, (match) => snrOf(match.peak));
  const instrumentNm = Float64Array.from(
    byWavelength,
    (match) => match.peak.resolutionNm ?? match.peak.fwhmNm,
  );
  // How many samples an instrument FWHM spans at each peak (NaN when the peak does not say).
  const instrumentSamples = Float64Array.from(byWavelength, (match, i) =>
    match.peak.fwhmSamples !== undefined && match.peak.fwhmNm > 0
      ? (instrumentNm[i] * match.peak.fwhmSamples) / match.peak.fwhmNm
      : Number.NaN,
  );
  const maxReachNm = reachNm.reduce((r, reach) => Math.max(r, reach), 0);
  // Slack so that rounding in nm ± reach cannot drop a peak the exact test below would accept.
  const slackNm = 1e-9 * (maxReachNm + 1);
  const hiderOf = (nm: number, predictedSnr: number) => {
    let best: PeakMatch | null = null;
    let bestSnr = -Infinity;
    const from = lowerBound(wavelengthNm, nm - maxReachNm - slackNm);
    for (
      let i = from;
      i < byWavelength.length && wavelengthNm[i] <= nm + maxReachNm + slackNm;
      i++
    ) {
      if (Math.abs(wavelengthNm[i] - nm) > reachNm[i]) continue;
      // Far fainter than the peak, or a companion so close that the dip between them would not clear
      // the peak finder's test: in either case no peak of its own could show.
      // (The dip is worked out only for a line the peak does not outshine.)
      const hides =
        snr[i] >= snrRatio * predictedSnr ||
        (predictedSnr <= snr[i] &&
          dipIsShallow(
            Math.abs(wavelengthNm[i] - nm) / instrumentNm[i],
            predictedSnr / snr[i],
            Number.isNaN(instrumentSamples[i]) ? undefined : instrumentSamples[i],
            snr[i],
            RESOLVING_DIP_SNR,
          ));
      if (!hides) continue;
      if (!best || snr[i] > bestSnr) {
        best = byWavelength[i];
        bestSnr = snr[i];
      }
    }
    return best ? best.peakIndex : null;
  };
  return { wavelengthNm, reachNm, snr, hiderOf };
}

interface CallContext {
  strongLineFraction: number;
  presentScore: number;
  possibleScore: number;
  ubiquitous: boolean;
  source: SourceKind;
  traceFraction: number;
  tallestHeight: number;
  matchByPeak: Map<number, PeakMatch>;
  /** Species of each peak's candidates, sorted, by peak index. */
  speciesAtPeak: Map<number, string[]>;
  relativeOf: (lineIndex: number) => number | undefined;
  positionInSpecies: Uint32Array;
  maxSeenListed: number;
  maxListedWhenAbsent: number;
  candidates: FlatCandidates;
  /** The scored table's lines. */
  lines: readonly ReferenceLine[];
}

function buildCall(species: string, entry: SpeciesWork, context: CallContext): ElementCall | null {
  const { info } = entry;
  const { relative } = info.scale;
  const strong = context.strongLineFraction;
  const tally = tallySeen(
    entry.groups,
    context.candidates,
    info.scale.relative,
    context.positionInSpecies,
    strong,
    context.maxSeenListed,
  );
  const seen = tally.listed;
  const { strongInRange } = entry;
  if (tally.count === 0) {
    // Report an unseen species only where it had strong lines to show; keeps the output small.
    if (strongInRange === 0) return null;
    const missing = missingEvidence(
      entry,
      entry.missing.filter((p) => relative[p] >= strong),
      context.lines,
    );
    const count = entry.missingStrongCount;
    // Its strong lines all lie at the array's ends, where no peak could show them: nothing to say.
    if (count === 0 && missing.length === 0) return null;
    return {
      species,
      element: info.lines.element,
      ionStage: info.lines.ionStage,
      verdict: "absent",
      score: 0,
      seen,
      seenCount: 0,
      seenPeaks: 0,
      missing,
      missingCount: entry.missingCount,
      missingStrongCount: count,
      overlaps: [],
      intensityBasis: info.basis,
      notes: context.ubiquitous ? [UBIQUITOUS_NOTE] : [],
      rationale: `No line seen; its strong line${plural(count)} in range (${formatNm(
        missing.map((m) => m.referenceNm),
      )}${andMore(count - missing.length)}) show${count === 1 ? "s" : ""} no peak.`,
    };
  }

  const overlaps: OverlapEvidence[] = [];
  for (const group of entry.groups) {
    const others = context.speciesAtPeak.get(group.peakIndex)!.filter((other) => other !== species);
    if (others.length > 0) {
      overlaps.push({
        peakIndex: group.peakIndex,
        peakWavelengthNm: group.peak.wavelengthNm,
        otherSpecies: others,
      });
    }
  }

  const strongMissing = missingEvidence(
    entry,
    entry.missing.filter((p) => relative[p] >= strong && !entry.hiddenBy.has(p)),
    context.lines,
  );
  const notes: string[] = [];
  for (const p of entry.missing) {
    const hiddenBy = entry.hiddenBy.get(p);
    if (hiddenBy === undefined) continue;
    const hider = context.matchByPeak.get(hiddenBy)!;
    notes.push(
      `${info.lines.nm[p].toFixed(2)} nm may be hidden in the wing of the stronger peak at ${hider.peak.wavelengthNm.toFixed(2)} nm.`,
    );
  }
  let verdict: Verdict;
  if (
    entry.score >= context.presentScore &&
    tally.strongCount > 0 &&
    entry.missingStrongCount === 0
  ) {
    verdict = "present";
  } else if (entry.score >= context.possibleScore) {
    verdict = "possible";
  } else {
    verdict = "absent";
  }

  if (borrowed(info.basis, context.source)) {
    notes.push(
      `No ${context.source} intensities in the table; used ${info.basis} intensities instead.`,
    );
  }
  if (info.basis === "none") {
    notes.push(
      "The table gives no relative intensities for this species: missing lines are not weighed.",
    );
  }
  if (entry.anchor?.peak.saturated) {
    notes.push("Its strongest observed line is saturated: predicted intensities are lower bounds.");
  }
  if (context.ubiquitous) {
    notes.push(UBIQUITOUS_NOTE);
    const strongestHeight = entry.groups.reduce((h, g) => Math.max(h, g.peak.height), -Infinity);
    const share = context.tallestHeight > 0 ? strongestHeight / context.tallestHeight : 1;
    if (verdict === "present" && share < context.traceFraction) {
      verdict = "possible";
      notes.push(
        `Its strongest peak is ${(100 * share).toFixed(1)} % of the tallest peak: treated as a trace, not called present.`,
      );
    }
  }

  return {
    species,
    element: info.lines.element,
    ionStage: info.lines.ionStage,
    verdict,
    score: entry.score,
    seen,
    seenCount: tally.count,
    seenPeaks: entry.groups.length,
    // An absent call lists only its first few (see trimAbsentEvidence); its verdict stands from here.
    missing: missingEvidence(
      entry,
      verdict === "absent" ? entry.missing.slice(0, context.maxListedWhenAbsent) : entry.missing,
      context.lines,
    ),
    missingCount: entry.missingCount,
    missingStrongCount: entry.missingStrongCount,
    overlaps,
    intensityBasis: info.basis,
    notes,
    rationale: rationaleOf(verdict, tally, strongMissing, strongInRange, entry, overlaps),
  };
}

function rationaleOf(
  verdict: Verdict,
  tally: SeenTally,
  strongMissing: MissingLineEvidence[],
  strongInRange: number,
  entry: SpeciesWork,
  overlaps: OverlapEvidence[],
): string {
  const { count, listed } = tally;
  const peaks = entry.groups.length;
  // Lines blended into one peak are one piece of evidence: say how many peaks they stand on.
  const atPeaks = peaks < count ? ` at ${peaks} peak${plural(peaks)}` : "";
  const parts: string[] = [];
  parts.push(
    `${count} line${plural(count)} seen${atPeaks} (${formatNm(listed.map((s) => s.referenceNm))}${andMore(count - listed.length)}; within ${tally.worstSigma.toFixed(1)}σ)`,
  );
  if (strongInRange > 0) {
    parts.push(
      `${tally.strongCount} of ${strongInRange} strong line${plural(strongInRange)} in range seen`,
    );
  } else {
    parts.push("its strong lines lie outside the range");
  }
  // strongMissing holds the listed ones; missingStrongCount counts them all.
  const strongCount = entry.missingStrongCount;
  if (strongCount > 0 && strongMissing.every((m) => m.predictedSnr === null)) {
    // No rated line of the species was seen to scale a prediction from: name the lines only.
    parts.push(
      `strong line${plural(strongCount)} missing (${formatNm(strongMissing.map((m) => m.referenceNm))}${andMore(strongCount - strongMissing.length)})`,
    );
  } else if (strongCount > 0) {
    parts.push(
      `strong line${plural(strongCount)} missing though expected at SNR ≈ ${strongMissing
        .map((m) => `${Math.round(m.predictedSnr ?? 0)} (${m.referenceNm.toFixed(2)} nm)`)
        .join(", ")}${andMore(strongCount - strongMissing.length)}`,
    );
  }
  // Every hidden line is listed; the rest of the missing lines are strong or weaker.
  const hiddenCount = entry.hiddenBy.size;
  const weakMissing = entry.missingCount - hiddenCount - strongCount;
  if (weakMissing > 0)
    parts.push(`${weakMissing} weaker expected line${plural(weakMissing)} missing`);
  if (overlaps.length > 0) {
    // Capped both ways: against a dense table every species shares every peak with every other,
    // and an uncapped sentence grew with the square of the species called (megabytes per run).
    const listed = overlaps.slice(0, SHARED_PEAKS_LISTED).map((o) => {
      const named = o.otherSpecies.slice(0, SHARING_SPECIES_LISTED).join(", ");
      return `${o.peakWavelengthNm.toFixed(2)} nm with ${named}${andMore(o.otherSpecies.length - SHARING_SPECIES_LISTED)}`;
    });
    const morePeaks = overlaps.length - SHARED_PEAKS_LISTED;
    parts.push(
      `shares ${listed.join("; ")}${morePeaks > 0 ? `; and ${morePeaks} more peak${plural(morePeaks)}` : ""}`,
    );
  }
  const lead =
    verdict === "present"
      ? "Present"
      : verdict === "possible"
        ? "Possible"
        : "Absent (contradicted)";
  return `${lead}: ${parts.join("; ")}. Score ${entry.score.toFixed(2)}.`;
}

/** A species' seen lines: exact counts, and the evidence of the strongest ones. */
interface SeenTally {
  count: number;
  /** Seen lines whose relative intensity is at least strongLineFraction. */
  strongCount: number;
  /** Largest |Δλ/σ| of any seen line. */
  worstSigma: number;
  listed: SeenLineEvidence[];
}

/**
 * Counts every seen line but builds evidence only for the `maxListed` strongest (unrated last;
 * ties to the earlier line), kept by partial selection in a small buffer ordered weakest first,
 * and listed in peak and table order, the order of a call that lists them all.
 */
function tallySeen(
  groups: readonly SeenGroup[],
  candidates: FlatCandidates,
  relativeInSpecies: Float64Array,
  positionInSpecies: Uint32Array,
  strong: number,
  maxListed: number,
): SeenTally {
  let count = 0;
  let strongCount = 0;
  let worstSigma = -Infinity;
  // Chosen lines as [key, ordinal, group, candidate], the weakest (then the latest) first.
  const chosen: [number, number, SeenGroup, number][] = [];
  for (const group of groups) {
    for (const member of group.members) {
      const ordinal = count++;
      // NaN marks an unrated line: it counts as intensity 0 and is listed after every rated one.
      const relative = relativeInSpecies[positionInSpecies[candidates.lineIndex[member]]];
      if ((Number.isNaN(relative) ? 0 : relative) >= strong) strongCount++;
      worstSigma = Math.max(worstSigma, candidates.absSigma[member]);
      if (maxListed === 0) continue;
      const key = Number.isNaN(relative) ? -1 : relative;
      // A later line displaces a chosen one only when strictly stronger.
      if (chosen.length === maxListed && !(key > chosen[0][0])) continue;
      if (chosen.length === maxListed) chosen.shift();
      let at = 0;
      while (
        at < chosen.length &&
        (chosen[at][0] < key || (chosen[at][0] === key && chosen[at][1] > ordinal))
      )
        at++;
      chosen.splice(at, 0, [key, ordinal, group, member]);
    }
  }
  chosen.sort((a, b) => a[1] - b[1]);
  const listed = chosen.map(([key, , group, member]): SeenLineEvidence => {
    const columns = candidates.columns[candidates.matchOf[member]];
    const at = candidates.at[member];
    const lineIndex = columns.lineIndex[at];
    return {
      lineIndex,
      line: columns.lines[lineIndex],
      peakIndex: group.peakIndex,
      peakWavelengthNm: group.peak.wavelengthNm,
      referenceNm: columns.referenceNm[at],
      deltaNm: columns.deltaNm[at],
      deltaSigma: columns.deltaSigma[at],
      relativeIntensity: key < 0 ? null : key,
      snr: group.snr,
    };
  });
  return { count, strongCount, worstSigma, listed };
}

/**
 * Every candidate of `matches` numbered in one sequence, peak after peak in the columns' order, with
 * the fields every candidate is read for. Throws when a peak was matched against another table than
 * `index`: one line of each peak tells (a check of every candidate would read the table's rows at
 * random, one cache miss per line).
 */
function flattenCandidates(matches: readonly PeakMatch[], index: LineIndex): FlatCandidates {
  const count = matches.reduce((n, match) => n + match.columns.count, 0);
  const candidates: FlatCandidates = {
    matchOf: new Uint32Array(count),
    at: new Uint32Array(count),
    lineIndex: new Uint32Array(count),
    absSigma: new Float64Array(count),
    columns: matches.map((match) => match.columns),
  };
  let flat = 0;
  for (let m = 0; m < matches.length; m++) {
    const columns = matches[m].columns;
    const first = columns.lineIndex[0];
    if (columns.count > 0 && index.lines[first] !== columns.lines[first]) {
      throw new RangeError(
        `peak ${matches[m].peakIndex} was matched against a different line table than the one scored`,
      );
    }
    candidates.lineIndex.set(columns.lineIndex, flat);
    for (let c = 0; c < columns.count; c++, flat++) {
      candidates.matchOf[flat] = m;
      candidates.at[flat] = c;
      candidates.absSigma[flat] = Math.abs(columns.deltaSigma[c]);
    }
  }
  return candidates;
}

/** Whether a species' intensities come from another kind of source than the one judged. */
function borrowed(basis: SpeciesInfo["basis"], source: SourceKind): boolean {
  return basis !== "none" && basis !== source;
}

/** The shortest and longest peak wavelength, nm: the range judged when the caller gives none. */
function peakSpan(matches: readonly PeakMatch[]): [number, number] {
  if (matches.length === 0) return [0, 0];
  let low = Infinity;
  let high = -Infinity;
  for (const match of matches) {
    low = Math.min(low, match.peak.wavelengthNm);
    high = Math.max(high, match.peak.wavelengthNm);
  }
  return [low, high];
}

function formatNm(values: number[]): string {
  return values.map((v) => v.toFixed(2)).join(", ") + " nm";
}

/**
 * Keeps an absent call's `limit` strongest seen lines (in their listed order: by peak, then table
 * order) and its `limit` first missing lines (already strongest first).
 */
function trimAbsentEvidence(call: ElementCall, limit: number): void {
  if (call.seen.length > limit) {
    const strongest = new Set(
      call.seen
        .map((seen, i) => ({ i, relative: seen.relativeIntensity ?? -1 }))
        .sort((a, b) => b.relative - a.relative || a.i - b.i)
        .slice(0, limit)
        .map((entry) => entry.i),
    );
    call.seen = call.seen.filter((_, i) => strongest.has(i));
  }
  call.missing.splice(limit);
}

/** How many shared peaks, and species at each, a call's rationale names (its overlaps keep the credible ones). */
const SHARED_PEAKS_LISTED = 4;
const SHARING_SPECIES_LISTED = 5;

/** ", and N more" for what a capped list leaves out, nothing when it left nothing out. */
function andMore(count: number): string {
  return count > 0 ? `, and ${count} more` : "";
}

function plural(count: number): string {
  return count === 1 ? "" : "s";
}

function assertPositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a positive finite number, got ${value}`);
  }
}

function assertFraction(name: string, value: number): void {
  if (!(value >= 0 && value <= 1)) {
    throw new RangeError(`${name} must lie in [0, 1], got ${value}`);
  }
}
