// Whether another lamp line shares the peak a line makes: two lines closer than about one and a half
// FWHM make one peak (or a partly resolved pair) whose fitted centre lies between them, so pairing that
// peak with either line puts a biased pair into the calibration — tenths of a nm, far above the noise.
import { elementOfSpecies } from "./element-of-species";
import type { LampLine } from "./lamp-pairing-types";

export interface LampLineBlendedOptions {
  /**
   * Neighbours closer than this many FWHM pull the fitted centre (two equal Gaussians are cleanly
   * resolved only from about 1.5–2 FWHM apart; common practice).
   * @default 1.5
   */
  reachFwhm?: number;
  /**
   * A pull up to this fraction of the FWHM is tolerated: about how well a peak finder centres a
   * well-exposed line anyway (common practice). It keeps a pair like Ar I 772.376/772.421 nm, whose
   * centroid lies within 0.03 nm of either line.
   * @default 0.05
   */
  maxPullFwhm?: number;
  /**
   * Neighbours weaker than this fraction of the line are ignored.
   * @default 0.05
   */
  minIntensityRatio?: number;
}

/**
 * True when a neighbour among `candidates` would pull the centre of `line`'s peak by more than
 * maxPullFwhm·fwhmX, the pull taken as separation × I_neighbour / (I_line + I_neighbour) (the
 * intensity-weighted centroid of the two). Separations come from `predictX`; only they matter, so a
 * first guess of the dispersion is good enough.
 */
export function lampLineBlended(
  lines: readonly LampLine[],
  candidates: readonly number[],
  line: number,
  predictX: (wavelengthNm: number) => number,
  fwhmX: number,
  options: LampLineBlendedOptions = {},
): boolean {
  const { reachFwhm = 1.5, maxPullFwhm = 0.05, minIntensityRatio = 0.05 } = options;
  if (!(fwhmX > 0)) throw new RangeError(`fwhmX must be positive, got ${fwhmX}`);
  const own = lines[line];
  const ownX = predictX(own.wavelengthNm);
  for (const other of candidates) {
    if (other === line) continue;
    const neighbour = lines[other];
    // Table intensities compare lines of one element only; in a mixed lamp the gases' shares depend
    // on the lamp, so a neighbour of another element may be as strong as the line itself.
    const sameElement = elementOfSpecies(neighbour.species) === elementOfSpecies(own.species);
    if (sameElement && !(neighbour.intensity >= minIntensityRatio * own.intensity)) continue;
    const separation = Math.abs(predictX(neighbour.wavelengthNm) - ownX);
    if (!(separation < reachFwhm * fwhmX)) continue;
    const total = own.intensity + neighbour.intensity;
    const weight = !sameElement ? 0.5 : total > 0 ? neighbour.intensity / total : 0.5;
    if (separation * weight > maxPullFwhm * fwhmX) return true;
  }
  return false;
}
