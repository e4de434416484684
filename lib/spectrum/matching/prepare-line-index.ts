// Sorts a reference line table once into typed arrays, and derives everything per species that
// depends on the table alone, so each analysis can binary-search it instead of scanning it.

import { SOURCE_KINDS, type ReferenceLine, type SourceKind, type WavelengthMedium } from "../types";
import { buildMaxTree } from "./build-max-tree";
import { buildSortedBlocks, type SortedBlocks } from "./build-sorted-blocks";
import { INTENSITY_FALLBACK_ORDER } from "./intensity-fallback-order";
import { wavelengthForMatchingNm } from "./wavelength-for-matching-nm";

export interface PrepareLineIndexOptions {
  /** Axis the peaks are calibrated on; see wavelengthForMatchingNm.
   * @default "air" */
  medium?: WavelengthMedium;
}

/** One species' relative intensities on one scale, aligned with SpeciesLines.order. */
export interface SpeciesBasis {
  /** The kind of source whose values are used; "none" when the table has none for the species. */
  basis: SourceKind | "none";
  /** relative[i] in (0, 1] for the line order[i], its strongest line being 1; NaN when unrated. */
  relative: Float64Array;
  /** Range-maximum tree over `relative` (see buildMaxTree), to find the strong lines in a range
   * without visiting the weak ones. */
  maxTree: Float64Array;
  /** `relative` in sorted blocks with prefix sums (see buildSortedBlocks), to sum or count the
   * lines above any threshold in a range without visiting them one by one. */
  blocks: SortedBlocks;
}

/** The lines of one species, in the order the whole table is searched by wavelength. */
export interface SpeciesLines {
  species: string;
  /** Element and ion stage of the species' first line in the table. */
  element: string;
  ionStage: number | null;
  /** Table positions: the atomic lines by matching wavelength, then the band heads by wavelength
   * (ties by table position), the same order as a scan of lineOrder then bandOrder. */
  order: Uint32Array;
  /** Matching wavelength in nm of lines[order[i]]. */
  nm: Float64Array;
  /** order[0 … atomicCount) are atomic lines, the rest band heads. */
  atomicCount: number;
  /** The scale used for each kind of source; sources falling back to the same basis share it. */
  bySource: Record<SourceKind, SpeciesBasis>;
}

/** A line table sorted for fast look-up; build it once per table release and reuse it. */
export interface LineIndex {
  /** The table as given (not copied, never changed); indices below point into it. */
  lines: readonly ReferenceLine[];
  medium: WavelengthMedium;
  /** Matching wavelengths in nm of the atomic lines (not band heads), ascending. */
  lineWavelengthNm: Float64Array;
  /** lines[lineOrder[i]] has wavelength lineWavelengthNm[i]. */
  lineOrder: Uint32Array;
  /** Tabulated uncertainty in nm of lines[lineOrder[i]], beside its wavelength so the search reads
   * neither the line's row nor its place in the table. */
  lineUncertaintyNm: Float64Array;
  /** Largest tabulated uncertainty among the atomic lines, in nm; bounds the search window. */
  maxLineUncertaintyNm: number;
  /** Band-head wavelengths in nm, ascending. */
  bandHeadNm: Float64Array;
  /** lines[bandOrder[i]] is the band with head bandHeadNm[i]. */
  bandOrder: Uint32Array;
  /** Largest band extent in nm; bounds the band search window. */
  maxBandExtentNm: number;
  /** Largest tabulated uncertainty among the band heads, in nm. */
  maxBandUncertaintyNm: number;
  /** Every species of the table, in order of first appearance. */
  species: SpeciesLines[];
  /** species[speciesOfLine[i]] holds lines[i]. */
  speciesOfLine: Uint32Array;
  /** lines[i] is species[speciesOfLine[i]].order[positionInSpecies[i]]. */
  positionInSpecies: Uint32Array;
}

/**
 * Splits the table into atomic lines and band heads and sorts each by matching wavelength
 * (ties broken by table position, so the order is deterministic). Groups the lines by species
 * and puts each species' lines on one intensity scale per kind of source: the source's own values
 * when any of its lines has one, else the first source in INTENSITY_FALLBACK_ORDER that has
 * values (scales are never mixed within a species), normalised to the species' strongest line
 * in the whole table.
 */
export function prepareLineIndex(
  lines: readonly ReferenceLine[],
  options: PrepareLineIndexOptions = {},
): LineIndex {
  const { medium = "air" } = options;
  if (medium !== "air" && medium !== "vacuum") {
    throw new RangeError(`medium must be "air" or "vacuum", got ${String(medium)}`);
  }
  const atomic: number[] = [];
  const bands: number[] = [];
  const wavelengthNm = new Float64Array(lines.length);
  let maxLineUncertaintyNm = 0;
  let maxBandExtentNm = 0;
  let maxBandUncertaintyNm = 0;
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    const nm = wavelengthForMatchingNm(line, medium);
    if (!(nm > 0) || !Number.isFinite(nm)) {
      throw new RangeError(`line ${line.id} (${line.species}) has no usable wavelength: ${nm}`);
    }
    if (!(line.uncertaintyNm >= 0) || !Number.isFinite(line.uncertaintyNm)) {
      throw new RangeError(`line ${line.id} has an invalid uncertaintyNm: ${line.uncertaintyNm}`);
    }
    wavelengthNm[i] = nm;
    if (line.flags.bandHead && line.band) {
      if (!(line.band.extentNm > 0)) {
        throw new RangeError(
          `band ${line.id} needs a positive extentNm, got ${line.band.extentNm}`,
        );
      }
      bands.push(i);
      maxBandExtentNm = Math.max(maxBandExtentNm, line.band.extentNm);
      maxBandUncertaintyNm = Math.max(maxBandUncertaintyNm, line.uncertaintyNm);
    } else {
      atomic.push(i);
      maxLineUncertaintyNm = Math.max(maxLineUncertaintyNm, line.uncertaintyNm);
    }
  }
  const byWavelength = (a: number, b: number) => wavelengthNm[a] - wavelengthNm[b] || a - b;
  atomic.sort(byWavelength);
  bands.sort(byWavelength);
  const lineOrder = Uint32Array.from(atomic);
  const bandOrder = Uint32Array.from(bands);
  return {
    lines,
    medium,
    lineWavelengthNm: Float64Array.from(atomic, (i) => wavelengthNm[i]),
    lineOrder,
    lineUncertaintyNm: Float64Array.from(atomic, (i) => lines[i].uncertaintyNm),
    maxLineUncertaintyNm,
    bandHeadNm: Float64Array.from(bands, (i) => wavelengthNm[i]),
    bandOrder,
    maxBandExtentNm,
    maxBandUncertaintyNm,
    ...groupBySpecies(lines, wavelengthNm, lineOrder, bandOrder),
  };
}

function groupBySpecies(
  lines: readonly ReferenceLine[],
  wavelengthNm: Float64Array,
  lineOrder: Uint32Array,
  bandOrder: Uint32Array,
): Pick<LineIndex, "species" | "speciesOfLine" | "positionInSpecies"> {
  const idOf = new Map<string, number>();
  const speciesOfLine = new Uint32Array(lines.length);
  const firstLine: number[] = [];
  for (let i = 0; i < lines.length; i++) {
    let id = idOf.get(lines[i].species);
    if (id === undefined) {
      id = firstLine.length;
      idOf.set(lines[i].species, id);
      firstLine.push(i);
    }
    speciesOfLine[i] = id;
  }
  const members: number[][] = firstLine.map(() => []);
  const atomicCounts = new Array<number>(firstLine.length).fill(0);
  for (const i of lineOrder) {
    members[speciesOfLine[i]].push(i);
    atomicCounts[speciesOfLine[i]]++;
  }
  for (const i of bandOrder) members[speciesOfLine[i]].push(i);

  const positionInSpecies = new Uint32Array(lines.length);
  const species = members.map((positions, id): SpeciesLines => {
    positions.forEach((lineIndex, position) => (positionInSpecies[lineIndex] = position));
    const first = lines[firstLine[id]];
    return {
      species: first.species,
      element: first.element,
      ionStage: first.ionStage,
      order: Uint32Array.from(positions),
      nm: Float64Array.from(positions, (i) => wavelengthNm[i]),
      atomicCount: atomicCounts[id],
      bySource: basesOf(lines, positions),
    };
  });
  return { species, speciesOfLine, positionInSpecies };
}

function basesOf(
  lines: readonly ReferenceLine[],
  positions: readonly number[],
): Record<SourceKind, SpeciesBasis> {
  const built = new Map<SourceKind | "none", SpeciesBasis>();
  const basisFor = (kind: SourceKind | "none"): SpeciesBasis => {
    let entry = built.get(kind);
    if (entry) return entry;
    const relative = new Float64Array(positions.length).fill(NaN);
    if (kind !== "none") {
      let strongest = 0;
      for (const i of positions) {
        const value = lines[i].intensities[kind];
        if (positive(value)) strongest = Math.max(strongest, value);
      }
      positions.forEach((i, position) => {
        const value = lines[i].intensities[kind];
        if (positive(value)) relative[position] = value / strongest;
      });
    }
    entry = {
      basis: kind,
      relative,
      maxTree: buildMaxTree(relative),
      blocks: buildSortedBlocks(relative),
    };
    built.set(kind, entry);
    return entry;
  };
  const rated = (kind: SourceKind) => positions.some((i) => positive(lines[i].intensities[kind]));
  const result = {} as Record<SourceKind, SpeciesBasis>;
  for (const source of SOURCE_KINDS) {
    result[source] = basisFor([source, ...INTENSITY_FALLBACK_ORDER[source]].find(rated) ?? "none");
  }
  return result;
}

function positive(value: number | undefined): value is number {
  return value !== undefined && Number.isFinite(value) && value > 0;
}
