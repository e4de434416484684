// Lamp lines as the spectrometer sees them: lines closer than about one resolution element make one
// peak, whose top lies where their summed profile peaks (their intensity-weighted centroid when they are
// far closer than the resolution, nearer the strongest line when they are most of a FWHM apart).
// Pairing such a peak with either line puts a biased pair into the calibration, and dropping it loses
// the lamp's strongest feature (mercury's 365.0 nm group), so lines of one gas that blend are merged
// into one line at that top, with its uncertainty; a blend whose top cannot be placed well (lines of
// two gases, whose shares depend on the lamp; members too far apart to trust their intensity ratio) is
// left out.
import { elementOfSpecies } from "./element-of-species";
import { brentMinimum } from "./brent-minimum";
import type { LampLine } from "./lamp-pairing-types";

const FOUR_LN2 = 4 * Math.LN2;
/** How far the FWHM a blend is judged with may be off, as a factor either way: it comes from the stated
 * resolution and range, or from a straightened axis whose glass may not be the instrument's. */
const FWHM_FACTOR = 1.5;

export interface GroupBlendedLampLinesOptions {
  /**
   * Lines closer than this many FWHM merge into one peak (two equal Gaussians are resolved from about
   * 1.5 FWHM apart, and their peak is a single centre only below about one; common practice).
   * @default 0.8
   */
  mergeFwhm?: number;
  /**
   * A line with a neighbour between mergeFwhm and this many FWHM is partly resolved: its peak's centre
   * is pulled towards the neighbour, so it is left out unless the neighbour is far weaker.
   * @default 1.6
   */
  reachFwhm?: number;
  /**
   * Largest uncertainty of a merged blend's top, in FWHM: table intensities are rough (a factor of two
   * either way, common practice), which moves the top of lines d apart by up to about d/4.
   * @default 0.08
   */
  maxTopSigmaFwhm?: number;
  /**
   * Neighbours of the same gas weaker than this fraction neither merge nor pull.
   * @default 0.05
   */
  minIntensityRatio?: number;
}

/** A line or a merged blend, as pairing uses it. */
export interface LampLineGroup extends LampLine {
  /** Indices (into the given lines) of the lines it stands for. */
  members: number[];
  /** 1σ uncertainty of the blend's top in nm (0 for a single line). */
  wavelengthSigmaNm: number;
}

/**
 * Groups `candidates` (indices into `lines`) for pairing, given the instrument's FWHM in nm at a
 * wavelength. Returns the lines that can be paired (single lines and merged blends), sorted by
 * wavelength; lines left out (pulled, or in a blend that cannot be placed) are not returned.
 */
export function groupBlendedLampLines(
  lines: readonly LampLine[],
  candidates: readonly number[],
  fwhmNmAt: (wavelengthNm: number) => number,
  options: GroupBlendedLampLinesOptions = {},
): LampLineGroup[] {
  const {
    mergeFwhm = 0.8,
    reachFwhm = 1.6,
    maxTopSigmaFwhm = 0.08,
    minIntensityRatio = 0.05,
  } = options;
  const sorted = candidates.slice().sort((a, b) => lines[a].wavelengthNm - lines[b].wavelengthNm);
  // Single-linkage clusters of lines closer than mergeFwhm (a faint neighbour of the same gas is no link).
  const clusters: number[][] = [];
  for (const index of sorted) {
    const last = clusters[clusters.length - 1];
    const previous = last?.[last.length - 1];
    if (
      previous !== undefined &&
      lines[index].wavelengthNm - lines[previous].wavelengthNm <
        mergeFwhm * fwhmNmAt(lines[index].wavelengthNm)
    ) {
      last.push(index);
    } else {
      clusters.push([index]);
    }
  }
  const groups: LampLineGroup[] = [];
  for (const cluster of clusters) {
    const strongest = cluster.reduce((a, b) => (lines[b].intensity > lines[a].intensity ? b : a));
    const element = elementOfSpecies(lines[strongest].species);
    // Members that matter: every line of another gas, lines of this gas not far weaker than the strongest.
    const members = cluster.filter(
      (i) =>
        elementOfSpecies(lines[i].species) !== element ||
        lines[i].intensity >= minIntensityRatio * lines[strongest].intensity,
    );
    const fwhm = fwhmNmAt(lines[strongest].wavelengthNm);
    if (members.length === 1) {
      groups.push({ ...lines[strongest], members: [strongest], wavelengthSigmaNm: 0 });
      continue;
    }
    if (members.some((i) => elementOfSpecies(lines[i].species) !== element)) {
      // Two gases: their shares are the lamp's, not the table's. Only a blend far tighter than the
      // resolution has a centre that does not depend on them.
      const spread =
        lines[members[members.length - 1]].wavelengthNm - lines[members[0]].wavelengthNm;
      if (spread > 2 * maxTopSigmaFwhm * fwhm) continue;
    }
    const total = members.reduce((s, i) => s + Math.max(lines[i].intensity, 0), 0);
    if (!(total > 0)) continue;
    const wavelengths = members.map((i) => lines[i].wavelengthNm);
    const intensities = members.map((i) => Math.max(lines[i].intensity, 0));
    const top = blendTop(wavelengths, intensities, fwhm);
    // A factor of two in any member's intensity moves the top, and so does a factor of FWHM_FACTOR in
    // the FWHM; a third of the shift between the two ends of each factor is its share of the σ (in the
    // centroid limit: half a member's share of the intensity times its distance from the rest, and
    // nothing for the FWHM).
    const withIntensity = (k: number, factor: number) =>
      blendTop(
        wavelengths,
        intensities.map((value, j) => (j === k ? value * factor : value)),
        fwhm,
      );
    const shifts = [
      ...members.map((_, k) => withIntensity(k, 2) - withIntensity(k, 0.5)),
      blendTop(wavelengths, intensities, fwhm * FWHM_FACTOR) -
        blendTop(wavelengths, intensities, fwhm / FWHM_FACTOR),
    ];
    const sigma = Math.sqrt(shifts.reduce((sum, shift) => sum + (shift / 3) ** 2, 0));
    if (sigma > maxTopSigmaFwhm * fwhm) continue;
    groups.push({
      wavelengthNm: top,
      intensity: total,
      species: lines[strongest].species,
      id: lines[strongest].id,
      members,
      wavelengthSigmaNm: sigma,
    });
  }
  // A line (or blend) with a partly resolved neighbour has its centre pulled towards it.
  return groups.filter((group) => {
    const fwhm = fwhmNmAt(group.wavelengthNm);
    return !sorted.some((i) => {
      if (group.members.includes(i)) return false;
      if (!(Math.abs(lines[i].wavelengthNm - group.wavelengthNm) < reachFwhm * fwhm)) return false;
      const sameElement = elementOfSpecies(lines[i].species) === elementOfSpecies(group.species);
      return !(sameElement && lines[i].intensity < minIntensityRatio * group.intensity);
    });
  });
}

/** Steps per FWHM of the scan for the blend's top, and the bracket the search then narrows it to, in
 * FWHM. */
const TOP_SCAN_STEPS_PER_FWHM = 100;
const TOP_TOLERANCE_FWHM = 1e-9;

/**
 * Where the summed profile of lines at `wavelengths` with `intensities` (Gaussians of FWHM `fwhm`)
 * peaks: where a peak finder puts the top of the one peak they make. Lines far closer than the
 * resolution peak at their intensity-weighted centroid; lines most of a FWHM apart peak nearer the
 * strongest, whose own profile makes the top (mercury's 365.015 nm with 365.483 nm at a fifth of its
 * intensity, 0.78 FWHM apart, peaks 0.02 nm from 365.015 nm, not at the centroid 0.08 nm away). A
 * scan finds the highest point, Brent's method refines it.
 */
export function blendTop(wavelengths: number[], intensities: number[], fwhm: number): number {
  const profile = (nm: number) =>
    wavelengths.reduce((sum, centre, k) => {
      const u = (nm - centre) / fwhm;
      return sum + intensities[k] * Math.exp(-FOUR_LN2 * u * u);
    }, 0);
  const step = fwhm / TOP_SCAN_STEPS_PER_FWHM;
  const from = Math.min(...wavelengths) - fwhm / 2;
  const to = Math.max(...wavelengths) + fwhm / 2;
  let best = from;
  let bestValue = -Infinity;
  for (let nm = from; nm <= to; nm += step) {
    const value = profile(nm);
    if (value > bestValue) {
      best = nm;
      bestValue = value;
    }
  }
  // Searched as an offset from the best scanned point: Brent's method stops at √ε relative to the
  // answer, which at hundreds of nm would be 10⁻⁶ nm, where the profile's width sets the scale.
  return (
    best + brentMinimum((offset) => -profile(best + offset), -step, step, TOP_TOLERANCE_FWHM * fwhm)
  );
}
