// Compares a draft's lines with a reference file's: pairs each reference line with one draft row of the
// same species, in the reference's own medium, and says whether they agree within the combined uncertainty.
import { vacuumToAirNm } from "../spectrum/units";
import { assertPositiveFinite } from "../spectrum/units/assert-positive-finite";
import type { WavelengthMedium } from "../spectrum/types";
import type { ReferenceFileLine } from "./parse-reference-csv";

/** What the comparison needs of a draft row. */
export interface DraftLineForCheck {
  id: string;
  species: string;
  /** Air wavelength, nm; null below 200 nm (vacuum). */
  airNm: number | null;
  vacuumNm: number;
  /** The row's one-sigma uncertainty, nm; null where the table states none. */
  uncertaintyNm: number | null;
  verified: boolean;
  retired: boolean;
}

export interface CompareWithReferenceOptions {
  /**
   * Agreement means |draft − reference| ≤ coverageFactor · √(u_draft² + u_reference²).
   * @default 1
   */
  coverageFactor?: number;
  /**
   * The smallest tolerance, nm: published lamp wavelengths differ by 0.001–0.002 nm between
   * conventions, so a check against them allows at least 0.002 nm (common practice).
   * @default 0.002
   */
  minToleranceNm?: number;
  /**
   * A reference line and a draft row of one species further apart than this are not the same line:
   * the reference line then has no draft row, and the draft row no reference.
   * @default 0.1
   */
  pairingWindowNm?: number;
}

/** One reference line paired with one draft row. */
export interface ReferencePairing {
  lineId: string;
  /** Index of the reference line in the array passed in. */
  referenceIndex: number;
  medium: WavelengthMedium;
  /** The draft row's wavelength in the reference's medium, nm. */
  draftNm: number;
  referenceNm: number;
  /** draftNm − referenceNm, nm. */
  differenceNm: number;
  /** √(u_draft² + u_reference²), nm (the draft's taken as 0 where it states none). */
  combinedUncertaintyNm: number;
  /** The largest difference that still agrees, nm. */
  toleranceNm: number;
  /** False where the draft row states no uncertainty. */
  draftUncertaintyStated: boolean;
}

export interface ReferenceComparison {
  /** Pairs that agree, of rows not verified yet: these are the rows to mark verified. */
  agreeing: ReferencePairing[];
  /** Pairs that agree, of rows already verified: left as they are. */
  alreadyVerified: ReferencePairing[];
  /** Pairs that disagree: listed for the lab lead's decision (verified rows included). */
  disagreeing: ReferencePairing[];
  /** Indexes of reference lines with no draft row of their species within the pairing window. */
  referenceOnly: number[];
  /** Ids of live draft rows, of a species the reference file covers, that no reference line paired with. */
  draftOnly: string[];
  /** Live draft rows of species the reference file does not mention (not compared). */
  otherSpeciesCount: number;
  /** Retired draft rows, left out of the comparison. */
  retiredCount: number;
}

/** The draft row's wavelength in the given medium (below 200 nm vacuum, air equals vacuum, as tables give it). */
function draftWavelengthIn(row: DraftLineForCheck, medium: WavelengthMedium): number {
  if (medium === "vacuum") return row.vacuumNm;
  return row.airNm ?? vacuumToAirNm(row.vacuumNm, { belowRange: "unchanged" });
}

/**
 * Pairs reference lines with the draft's live rows one to one (closest pairs first, within the pairing
 * window, same species), comparing in each reference line's own medium, and sorts the pairs into
 * agreeing, already verified and disagreeing; lists what stayed unpaired on either side.
 */
export function compareWithReference(
  draftRows: readonly DraftLineForCheck[],
  referenceLines: readonly ReferenceFileLine[],
  options: CompareWithReferenceOptions = {},
): ReferenceComparison {
  const { coverageFactor = 1, minToleranceNm = 0.002, pairingWindowNm = 0.1 } = options;
  assertPositiveFinite(coverageFactor, "coverageFactor");
  assertPositiveFinite(minToleranceNm, "minToleranceNm");
  assertPositiveFinite(pairingWindowNm, "pairingWindowNm");

  const live = draftRows.filter((row) => !row.retired);
  const bySpecies = new Map<string, DraftLineForCheck[]>();
  for (const row of live) {
    const list = bySpecies.get(row.species) ?? [];
    list.push(row);
    bySpecies.set(row.species, list);
  }
  const referenceSpecies = new Set(referenceLines.map((line) => line.species));

  // Every candidate pair within the window, closest first; ties keep file order, then draft order.
  const candidates: {
    distance: number;
    referenceIndex: number;
    order: number;
    row: DraftLineForCheck;
  }[] = [];
  referenceLines.forEach((reference, referenceIndex) => {
    const rows = bySpecies.get(reference.species) ?? [];
    rows.forEach((row, order) => {
      const distance = Math.abs(draftWavelengthIn(row, reference.medium) - reference.wavelengthNm);
      if (distance <= pairingWindowNm) candidates.push({ distance, referenceIndex, order, row });
    });
  });
  candidates.sort(
    (a, b) => a.distance - b.distance || a.referenceIndex - b.referenceIndex || a.order - b.order,
  );

  const pairedReference = new Set<number>();
  const pairedRow = new Set<string>();
  const result: ReferenceComparison = {
    agreeing: [],
    alreadyVerified: [],
    disagreeing: [],
    referenceOnly: [],
    draftOnly: [],
    otherSpeciesCount: live.filter((row) => !referenceSpecies.has(row.species)).length,
    retiredCount: draftRows.length - live.length,
  };
  const pairs: { pairing: ReferencePairing; row: DraftLineForCheck }[] = [];
  for (const { referenceIndex, row } of candidates) {
    if (pairedReference.has(referenceIndex) || pairedRow.has(row.id)) continue;
    pairedReference.add(referenceIndex);
    pairedRow.add(row.id);
    const reference = referenceLines[referenceIndex];
    const draftNm = draftWavelengthIn(row, reference.medium);
    const draftUncertainty = row.uncertaintyNm ?? 0;
    const combinedUncertaintyNm = Math.hypot(draftUncertainty, reference.uncertaintyNm);
    pairs.push({
      row,
      pairing: {
        lineId: row.id,
        referenceIndex,
        medium: reference.medium,
        draftNm,
        referenceNm: reference.wavelengthNm,
        differenceNm: draftNm - reference.wavelengthNm,
        combinedUncertaintyNm,
        toleranceNm: Math.max(coverageFactor * combinedUncertaintyNm, minToleranceNm),
        draftUncertaintyStated: row.uncertaintyNm !== null,
      },
    });
  }
  pairs.sort((a, b) => a.pairing.referenceIndex - b.pairing.referenceIndex);
  for (const { pairing, row } of pairs) {
    // A tiny allowance for the binary representation of decimal values exactly at the tolerance.
    const agrees = Math.abs(pairing.differenceNm) <= pairing.toleranceNm * (1 + 1e-9);
    if (!agrees) result.disagreeing.push(pairing);
    else if (row.verified) result.alreadyVerified.push(pairing);
    else result.agreeing.push(pairing);
  }
  referenceLines.forEach((_, index) => {
    if (!pairedReference.has(index)) result.referenceOnly.push(index);
  });
  for (const row of live) {
    if (referenceSpecies.has(row.species) && !pairedRow.has(row.id)) result.draftOnly.push(row.id);
  }
  return result;
}
