// A peak's candidate lines held as columns, one typed array per field. Against a dense table a peak
// has hundreds of candidates; scoring reads every one of them, and an object per candidate was most of
// an analysis's allocation (6,899 objects for 19 peaks at 300,000 lines). The objects a caller reads
// (PeakMatch.candidates) are built from the columns only when read.
import type { ReferenceLine } from "../types";

/** One reference line (or band) that could explain a peak. */
export interface LineCandidate {
  /** Position of the line in the table given to prepareLineIndex. */
  lineIndex: number;
  line: ReferenceLine;
  kind: "line" | "band";
  /** Tabulated wavelength used for the comparison (the band head for bands), in nm. */
  referenceNm: number;
  /** Observed minus tabulated wavelength, in nm. */
  deltaNm: number;
  /** Combined one-sigma tolerance for this pair, in nm. */
  sigmaNm: number;
  /** For lines deltaNm/sigmaNm; for bands the distance outside the head zone over sigmaNm
   * (0 inside it, negative on the head's open side). |deltaSigma| ≤ k always holds. */
  deltaSigma: number;
}

/** Candidates field by field: entry i of each array is candidate i (see LineCandidate). */
interface CandidateFields {
  count: number;
  lineIndex: Uint32Array;
  /** 1 for a band, 0 for a line. */
  band: Uint8Array;
  referenceNm: Float64Array;
  deltaNm: Float64Array;
  sigmaNm: Float64Array;
  deltaSigma: Float64Array;
}

/** A peak's candidates, in the order the search met them: lines in table wavelength order, then
 * bands. */
export interface CandidateColumns extends CandidateFields {
  /** The table the line indices point into (the prepared index's lines). */
  lines: readonly ReferenceLine[];
}

/** The positions of `columns`' candidates closest first (smallest |deltaSigma|), ties by line index:
 * the order PeakMatch.candidates promises. */
export function closestFirstOrder(columns: CandidateColumns): Uint32Array {
  const { deltaSigma, lineIndex } = columns;
  return new Uint32Array(columns.count)
    .map((_, i) => i)
    .sort(
      (a, b) => Math.abs(deltaSigma[a]) - Math.abs(deltaSigma[b]) || lineIndex[a] - lineIndex[b],
    );
}

/** The candidates of `columns` as objects, closest first. */
export function candidatesFromColumns(columns: CandidateColumns): LineCandidate[] {
  return Array.from(closestFirstOrder(columns), (i) => {
    const lineIndex = columns.lineIndex[i];
    return {
      lineIndex,
      line: columns.lines[lineIndex],
      kind: columns.band[i] === 1 ? "band" : "line",
      referenceNm: columns.referenceNm[i],
      deltaNm: columns.deltaNm[i],
      sigmaNm: columns.sigmaNm[i],
      deltaSigma: columns.deltaSigma[i],
    };
  });
}

/**
 * Growing columns that gather the candidates of many peaks, one peak after another. One set is
 * reused from search to search (a search runs to its end before another starts; nothing in it
 * waits), so a search allocates only its result.
 */
export type CandidateScratch = CandidateFields;

/** Columns up to this long are kept from search to search; longer ones (a huge spectrum against a
 * dense table grew them) are swapped for short ones when the next search starts, so the process does
 * not keep that memory for good. */
const KEPT_CAPACITY = 65_536;

function emptyScratch(capacity: number): CandidateScratch {
  return {
    count: 0,
    lineIndex: new Uint32Array(capacity),
    band: new Uint8Array(capacity),
    referenceNm: new Float64Array(capacity),
    deltaNm: new Float64Array(capacity),
    sigmaNm: new Float64Array(capacity),
    deltaSigma: new Float64Array(capacity),
  };
}

let shared = emptyScratch(1024);

/** `array` copied into one twice as long. */
function doubled<T extends Uint32Array | Uint8Array | Float64Array>(array: T): T {
  const longer = new (array.constructor as new (length: number) => T)(2 * array.length);
  longer.set(array);
  return longer;
}

/** The shared columns, emptied. */
export function startCandidates(): CandidateScratch {
  if (shared.lineIndex.length > KEPT_CAPACITY) shared = emptyScratch(1024);
  shared.count = 0;
  return shared;
}

/** Appends one candidate to `scratch`, growing its columns when full. */
export function pushCandidate(
  scratch: CandidateScratch,
  lineIndex: number,
  band: boolean,
  referenceNm: number,
  deltaNm: number,
  sigmaNm: number,
  deltaSigma: number,
): void {
  if (scratch.count === scratch.lineIndex.length) {
    scratch.lineIndex = doubled(scratch.lineIndex);
    scratch.band = doubled(scratch.band);
    scratch.referenceNm = doubled(scratch.referenceNm);
    scratch.deltaNm = doubled(scratch.deltaNm);
    scratch.sigmaNm = doubled(scratch.sigmaNm);
    scratch.deltaSigma = doubled(scratch.deltaSigma);
  }
  const at = scratch.count++;
  scratch.lineIndex[at] = lineIndex;
  scratch.band[at] = band ? 1 : 0;
  scratch.referenceNm[at] = referenceNm;
  scratch.deltaNm[at] = deltaNm;
  scratch.sigmaNm[at] = sigmaNm;
  scratch.deltaSigma[at] = deltaSigma;
}

/**
 * Each peak's columns, copied out of `scratch`: peak k holds the candidates from ends[k − 1] (0 for
 * the first) to ends[k], as views of one set of typed arrays.
 */
export function finishCandidates(
  scratch: CandidateScratch,
  lines: readonly ReferenceLine[],
  ends: readonly number[],
): CandidateColumns[] {
  const n = scratch.count;
  const lineIndex = scratch.lineIndex.slice(0, n);
  const band = scratch.band.slice(0, n);
  const referenceNm = scratch.referenceNm.slice(0, n);
  const deltaNm = scratch.deltaNm.slice(0, n);
  const sigmaNm = scratch.sigmaNm.slice(0, n);
  const deltaSigma = scratch.deltaSigma.slice(0, n);
  return ends.map((end, k) => {
    const start = k === 0 ? 0 : ends[k - 1];
    return {
      lines,
      count: end - start,
      lineIndex: lineIndex.subarray(start, end),
      band: band.subarray(start, end),
      referenceNm: referenceNm.subarray(start, end),
      deltaNm: deltaNm.subarray(start, end),
      sigmaNm: sigmaNm.subarray(start, end),
      deltaSigma: deltaSigma.subarray(start, end),
    };
  });
}
