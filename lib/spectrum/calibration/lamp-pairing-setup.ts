// Preparation both pairing entry points share: option checks, candidate lines, tolerance, and the
// first-guess shape g(λ) in which the dispersion hypothesis x = A + B·g(λ) is a straight line.
import type { DispersionKind } from "../types";
import { assertDomain, assertFiniteArray } from "./assertions";
import { GLASS_CATALOGUE, GLASS_NAMES, type GlassName } from "./glass-catalogue";
import { glassesValidOver } from "./glasses-valid-over";
import type { LampLine, LampPairingOptions, LampPeak } from "./lamp-pairing-types";
import type { PairingContext } from "./pairing-context";
import { refractiveIndex } from "./refractive-index";
import { prismForward } from "./prism-forward";

/** Lines this far outside the nominal range (as a fraction of its span) are still considered. */
const RANGE_MARGIN = 0.1;

/**
 * λ₀ of the Hartmann form n(λ) ≈ n₀ + k/(λ − λ₀) (α = 1) fitted to a glass over a range. A prism puts a
 * wavelength at x ≈ a + b·n(λ) (the deviation is close to linear in n), so 1/(λ − λ₀) is the axis in
 * which its dispersion is a straight line — several times stronger in the blue than in the red.
 */
export function hartmannPoleOfGlass(glass: GlassName, rangeNm: [number, number]): number {
  const samples = Array.from(
    { length: 24 },
    (_, i) => rangeNm[0] + ((rangeNm[1] - rangeNm[0]) * i) / 23,
  );
  const n = samples.map((lambda) => refractiveIndex(GLASS_CATALOGUE[glass], lambda));
  let best = { pole: 0, error: Infinity };
  for (let i = 0; i < 200; i++) {
    const pole = (0.95 * rangeNm[0] * i) / 199;
    const g = samples.map((lambda) => 1 / (lambda - pole));
    const meanG = g.reduce((s, v) => s + v, 0) / g.length;
    const meanN = n.reduce((s, v) => s + v, 0) / n.length;
    let sgg = 0;
    let sgn = 0;
    for (let k = 0; k < g.length; k++) {
      sgg += (g[k] - meanG) ** 2;
      sgn += (g[k] - meanG) * (n[k] - meanN);
    }
    const slope = sgn / sgg;
    const error = n.reduce((s, v, k) => s + (v - meanN - slope * (g[k] - meanG)) ** 2, 0);
    if (error < best.error) best = { pole, error };
  }
  return best.pole;
}

/** Wavelengths a straightened axis remembers at most (the lamp lines of a range number a few hundred). */
const MAX_REMEMBERED = 20_000;

/**
 * x(λ) of a prism of `glass` in the usual arrangement (an equilateral prism at minimum deviation for
 * the middle of the range, a camera whose image is tan of the deviation): the axis in which a prism of
 * that glass is nearly straight, deviation's own curvature included (a dense flint's exit angle grows
 * steeply in the blue, which no n(λ)-only straightening follows).
 */
export function nominalPrismShape(
  glass: GlassName,
  rangeNm: [number, number],
): (lambda: number) => number {
  const apexRad = Math.PI / 3;
  const middle = Math.sqrt(rangeNm[0] * rangeNm[1]);
  const nMiddle = refractiveIndex(GLASS_CATALOGUE[glass], middle);
  const geometry = {
    glass,
    incidenceRad: Math.asin(Math.min(0.999, nMiddle * Math.sin(apexRad / 2))),
    apexRad,
    focalX: 1,
    axisX: 0,
    direction: 1 as const,
    referenceWavelengthNm: middle,
  };
  const forward = prismForward(geometry);
  // The searches ask the same line wavelengths again for every hypothesis: each is worked out once.
  const known = new Map<number, number>();
  return (lambda) => {
    let x = known.get(lambda);
    if (x === undefined) {
      x = forward(lambda);
      if (known.size < MAX_REMEMBERED) known.set(lambda, x);
    }
    return x;
  };
}

/** The straightening axes g(λ) to try for a dispersion kind (or a forced straight line). */
export function hypothesisShapes(
  dispersion: DispersionKind | "linear",
  rangeNm: [number, number],
): ((lambda: number) => number)[] {
  if (dispersion !== "prism") return [(lambda) => lambda];
  // A glass is evaluated only where it has no resonance (N-SF11's lies near 249.6 nm): a range reaching
  // further into the ultraviolet is served by the glasses that do.
  const [low, high] = [Math.min(...rangeNm), Math.max(...rangeNm)];
  const evaluated: [number, number] = [0.9 * low, high];
  const valid = glassesValidOver(evaluated, GLASS_NAMES, true);
  if (valid.length === 0) {
    // No catalogue glass reaches this far into the ultraviolet: a pole well below the range still
    // spreads the blue more than the red, which is all a first guess needs.
    const pole = 0.5 * low;
    return [(lambda: number) => 1 / (lambda - pole)];
  }
  const strength = (glass: GlassName) => {
    const nLow = refractiveIndex(GLASS_CATALOGUE[glass], evaluated[0]);
    const nHigh = refractiveIndex(GLASS_CATALOGUE[glass], evaluated[1]);
    return (nLow - nHigh) / (nHigh - 1);
  };
  // One axis per catalogue glass that serves, crown first: each straightens a prism of its own glass
  // in the usual arrangement to about a tolerance (the n(λ)-only Hartmann axis of a dense flint left
  // 50–90 tolerances of curvature: seen on N-SF11 in the sweep), and the nearest glass is the best
  // first guess for one outside the catalogue.
  const byStrength = valid.slice().sort((a, b) => strength(a) - strength(b));
  const ordered = valid.includes("N-BK7")
    ? ["N-BK7" as GlassName, ...byStrength.filter((g) => g !== "N-BK7")]
    : byStrength;
  const sampled = Array.from(
    { length: 33 },
    (_, i) => evaluated[0] + ((1.1 * high - evaluated[0]) * i) / 32,
  );
  const shapes = ordered
    .map((glass) => nominalPrismShape(glass, [low, high]))
    .filter((shape) => sampled.every((lambda) => Number.isFinite(shape(lambda))));
  if (shapes.length > 0) return shapes;
  // No glass's ray leaves the prism over the whole range in that arrangement: the Hartmann axes of a
  // crown and a dense flint bracket the usual curvature.
  const bracket =
    valid.includes("N-BK7") && valid.includes("N-SF11")
      ? (["N-BK7", "N-SF11"] as GlassName[])
      : [...new Set([byStrength[0], byStrength[byStrength.length - 1]])];
  return bracket.map((glass) => {
    const pole = hartmannPoleOfGlass(glass, [low, high]);
    return (lambda: number) => 1 / (lambda - pole);
  });
}

/** Checks the inputs and builds the refinement context. */
export function pairingContext(
  peaks: LampPeak[],
  lines: LampLine[],
  options: LampPairingOptions,
  forced: Map<number, number> = new Map(),
): PairingContext {
  if (!Array.isArray(peaks) || !Array.isArray(lines))
    throw new RangeError("peaks and lines must be arrays");
  assertFiniteArray(
    peaks.map((p) => p.x),
    "peaks.x",
  );
  assertFiniteArray(
    peaks.map((p) => p.height),
    "peaks.height",
  );
  assertFiniteArray(
    lines.map((l) => l.wavelengthNm),
    "lines.wavelengthNm",
  );
  assertFiniteArray(
    lines.map((l) => l.intensity),
    "lines.intensity",
  );
  assertDomain(options.domain, "options.domain");
  assertDomain(options.nominalRangeNm, "options.nominalRangeNm");
  if (options.dispersion !== "grating" && options.dispersion !== "prism") {
    throw new RangeError(
      `options.dispersion must be "grating" or "prism", got ${String(options.dispersion)}`,
    );
  }
  const [low, high] = options.nominalRangeNm;
  const span = high - low;
  const resolutionNm = options.resolutionNm ?? span / 500;
  if (!(resolutionNm > 0))
    throw new RangeError(`options.resolutionNm must be positive, got ${resolutionNm}`);
  const minConfidence = options.minConfidence ?? 0.35;
  const candidateLines = lines
    .map((_, i) => i)
    .filter(
      (i) =>
        lines[i].wavelengthNm >= low - RANGE_MARGIN * span &&
        lines[i].wavelengthNm <= high + RANGE_MARGIN * span,
    );
  const meanDispersion = span / (options.domain[1] - options.domain[0]);
  return {
    peaks,
    lines,
    candidateLines,
    dispersion: options.dispersion,
    domain: [options.domain[0], options.domain[1]],
    // Half the resolution element: two lines closer than that are one peak anyway.
    toleranceX: (0.5 * resolutionNm) / meanDispersion,
    minConfidence,
    forced,
    nominalRangeNm: [low, high],
    straighten: hypothesisShapes(options.dispersion, [low, high])[0],
  };
}
