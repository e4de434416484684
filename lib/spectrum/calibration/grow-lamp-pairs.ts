// Grows a prism's lamp pairing outward from the pairs it is sure of: one line at a time, each accepted
// only when it falls inside the prediction interval of a model of the pairs so far, no comparably strong
// line could claim the same peak, no neighbour blends into it, and the peak is about as strong as the
// line should make it. Matching everything at once with a model that is off by a pixel or two in the
// far blue lets a wrong pair in, and every refit then agrees with it. The model is the physical prism of the catalogue glasses that fit
// (their spread is the model-form uncertainty), because a free-form curve extrapolated from the middle
// is off by tens of pixels in the blue; only when no glass fits as well as the glass-free Hartmann form
// (the instrument's glass is not in the catalogue) does Hartmann predict instead.
import { fitForwardHartmann, type ForwardHartmannFit } from "./fit-forward-hartmann";
import { fitGlassEnsemble } from "./fit-glass-ensemble";
import type { GlassName } from "./glass-catalogue";
import { informationCriteria } from "./information-criteria";
import { heightInBand, lampHeightBand } from "./lamp-height-band";
import { lampLineBlended } from "./lamp-line-blended";
import { toLampPair } from "./to-lamp-pair";
import type { LampPair } from "./lamp-pairing-types";
import type { PairingContext } from "./pairing-context";
import { weightedLeastSquares } from "./weighted-least-squares";

export interface GrowLampPairsOptions {
  /**
   * Half-width of the acceptance window in prediction σ (σ combines the fit's prediction interval and
   * the peak's own centre uncertainty).
   * @default 3
   */
  windowSigma?: number;
  /**
   * A line at least this fraction as strong as the one being placed counts as a rival for its peak.
   * Lamp intensities are rough and a strong line can be missing from a spectrum, so only a line much
   * weaker than its neighbour (under 1/20) is ruled out by strength alone.
   * @default 0.05
   */
  rivalIntensityRatio?: number;
  /**
   * At most this many prune-and-grow rounds.
   * @default 4
   */
  maxRounds?: number;
  /**
   * Glasses within this AICc of the best glass are kept, and their spread widens the window.
   * @default 4
   */
  maxDeltaAicc?: number;
  /**
   * A peak may be at most this many times fainter or stronger than the line's intensity predicts from
   * the pairs so far (their median height-to-intensity ratio), or 3 robust σ of that ratio if wider.
   * Lamp tables and detector responses disagree by a factor of a few, so the check is loose: it stops
   * a strong line from taking a faint stray peak, and a faint line from taking a strong peak that some
   * other light (a stray or unlisted line, a blend) must have made.
   * @default 10
   */
  heightTolerance?: number;
}

/** What pairing asks of a model of the pairs so far. */
type Predictor = Pick<ForwardHartmannFit, "predictX" | "predictionSigmaX">;

/** Leave-one-out tests per prune step: the two pairs at each end and this many worst-fitting ones. */
const WORST_SUSPECTS = 3;

/** Fewest pairs the growth starts from: the 4 parameters plus two degrees of freedom. */
const MIN_CORE = 6;

/** A pair's identity within one pairing: its peak and its line. */
const pairKey = (p: LampPair) => `${p.peakIndex}:${p.lineIndex}`;

/** One pair per peak and per line: a repeated peak or line keeps its first pair (forced pairs come first). */
function oneToOne(pairs: LampPair[]): LampPair[] {
  const peaks = new Set<number>();
  const lines = new Set<number>();
  return pairs.filter((p) => {
    if (peaks.has(p.peakIndex) || lines.has(p.lineIndex)) return false;
    peaks.add(p.peakIndex);
    lines.add(p.lineIndex);
    return true;
  });
}

/**
 * Grows `corePairs` (a first pairing, possibly with a few wrong pairs) into the final pairs of a prism.
 * Rounds of: prune (each pair, left out, must fall inside its own prediction window and have no rival)
 * then grow (the unpaired line nearest the paired range that passes the same test is added, refit,
 * repeat). Forced pairs are never removed. Returns the pairs sorted by x.
 */
export function growLampPairs(
  context: PairingContext,
  corePairs: LampPair[],
  options: GrowLampPairsOptions = {},
): LampPair[] {
  const {
    windowSigma = 3,
    rivalIntensityRatio = 0.05,
    maxRounds = 4,
    maxDeltaAicc = 4,
    heightTolerance = 10,
  } = options;
  if (!(windowSigma > 0)) throw new RangeError(`windowSigma must be positive, got ${windowSigma}`);
  if (!(rivalIntensityRatio >= 0))
    throw new RangeError(`rivalIntensityRatio must be ≥ 0, got ${rivalIntensityRatio}`);
  if (!(heightTolerance >= 1))
    throw new RangeError(`heightTolerance must be ≥ 1, got ${heightTolerance}`);
  const { peaks, lines, candidateLines, forced } = context;
  const forcedFirst = [
    ...corePairs.filter((p) => forced.get(p.peakIndex) === p.lineIndex),
    ...corePairs.filter((p) => forced.get(p.peakIndex) !== p.lineIndex),
  ];
  let pairs = oneToOne(forcedFirst);
  if (pairs.length < MIN_CORE) return pairs.sort((a, b) => a.x - b.x);
  const peakSigma = (p: number) => peaks[p].xUncertainty ?? 1;
  // Without a measured width a blend cannot be told from a line (the outlier rejection is then the guard).
  const peakFwhm = (p: number) => peaks[p].fwhm;
  const isForced = (pair: LampPair) => forced.get(pair.peakIndex) === pair.lineIndex;
  const bluestCandidateNm = Math.min(
    ...candidateLines.map((l) => lines[l].wavelengthNm),
    ...pairs.map((p) => p.wavelengthNm),
  );

  const [nominalLow, nominalHigh] = context.nominalRangeNm;
  const gLow = context.straighten(nominalLow);
  const gHigh = context.straighten(nominalHigh);
  const normalised = (lambda: number) =>
    (2 * (context.straighten(lambda) - gLow)) / (gHigh - gLow) - 1;
  /** x as a cubic in the straightened axis g(λ): a second, differently shaped model of the same pairs. */
  const cubicInStraightened = (subset: LampPair[]): ((lambda: number) => number) | null => {
    const design = subset.map((p) => [0, 1, 2, 3].map((k) => normalised(p.wavelengthNm) ** k));
    try {
      const { parameters } = weightedLeastSquares(
        design,
        subset.map((p) => p.x),
        subset.map((p) => p.xUncertainty ?? 1),
      );
      return (lambda) => parameters.reduce((sum, a, k) => sum + a * normalised(lambda) ** k, 0);
    } catch {
      return null;
    }
  };

  let start: number[] | undefined;
  // Each glass's χ² over each pair set fitted so far: floors of its χ² over any set that holds one and
  // spans the same wavelengths (the ensemble's camera looks along the ray of the range's middle, so a
  // set that reaches further is fitted by another model; see chiSquareFloors).
  type PairSet = { keys: Set<string>; referenceNm: number };
  const glassChiSquares: (PairSet & { chiSquares: Map<GlassName, number> })[] = [];
  const pairSetOf = (subset: LampPair[]): PairSet => {
    const wavelengths = subset.map((p) => p.wavelengthNm);
    return {
      keys: new Set(subset.map(pairKey)),
      referenceNm: (Math.min(...wavelengths) + Math.max(...wavelengths)) / 2,
    };
  };
  const chiSquareFloors = ({ keys, referenceNm }: PairSet): Map<GlassName, number> => {
    const floors = new Map<GlassName, number>();
    for (const earlier of glassChiSquares) {
      if (
        earlier.referenceNm !== referenceNm ||
        earlier.keys.size > keys.size ||
        ![...earlier.keys].every((k) => keys.has(k))
      )
        continue;
      for (const [glass, chiSquare] of earlier.chiSquares)
        floors.set(glass, Math.max(floors.get(glass) ?? 0, chiSquare));
    }
    return floors;
  };
  // Each glass's last incidence: growth refits nearly the same pairs, and its search starts there.
  const incidenceStarts = new Map<GlassName, number>();
  const glassFree = (
    subset: LampPair[],
  ): { fit: ForwardHartmannFit; predictor: Predictor } | null => {
    try {
      const result = fitForwardHartmann(subset, {
        poleBelowNm: bluestCandidateNm,
        ...(start ? { start } : {}),
      });
      start = result.parameters;
      const other = cubicInStraightened(subset);
      if (!other) return { fit: result, predictor: result };
      // The two forms agree where pairs pin them and part where they extrapolate; their difference is
      // the model-form part of the prediction's uncertainty, which the fit's covariance cannot show.
      return {
        fit: result,
        predictor: {
          predictX: result.predictX,
          predictionSigmaX: (lambda: number, peakSigmaX?: number) =>
            Math.hypot(
              result.predictionSigmaX(lambda, peakSigmaX),
              result.predictX(lambda) - other(lambda),
            ),
        },
      };
    } catch {
      return null;
    }
  };
  const computeFit = (subset: LampPair[]): Predictor | null => {
    const hartmann = glassFree(subset);
    // The camera stays centred on the pairs' middle ray while pairing: a growing pair set often covers
    // part of the range only, and a free axis angle then lets one far pair bend the model onto itself
    // (a stray peak 3 px from a missing far-blue line was fitted exactly) and widens the windows that
    // strays slip into. The centred form is stiffer, and its bias (about a pixel at the far ends) stays
    // inside windows that the glass spread and the glass-free σ widen anyway; the final calibration
    // fits the axis angle.
    const pairSet = pairSetOf(subset);
    const ensemble = fitGlassEnsemble(subset, {
      maxDeltaAicc,
      fitAxisAngle: false,
      incidenceStarts,
      chiSquareFloors: chiSquareFloors(pairSet),
    });
    if (!ensemble) return hartmann?.predictor ?? null;
    glassChiSquares.push({ ...pairSet, chiSquares: ensemble.chiSquares });
    // The centred physical model has one parameter fewer; when no glass fits the pairs as well as the
    // glass-free form does, the instrument's glass is not among them and Hartmann predicts instead.
    const hartmannAicc = hartmann
      ? informationCriteria(hartmann.fit.chiSquare, subset.length, 4).aicc
      : Infinity;
    if (ensemble.bestAicc > hartmannAicc + maxDeltaAicc) return hartmann!.predictor;
    const hartmannSigma = hartmann?.fit.predictionSigmaX;
    return {
      predictX: ensemble.predictX,
      predictionSigmaX: (lambda: number, peakSigmaX?: number) => {
        const glassFreeSigma = hartmannSigma ? hartmannSigma(lambda, peakSigmaX) : 0;
        return Math.hypot(
          ensemble.predictionSigmaX(lambda, peakSigmaX),
          Number.isFinite(glassFreeSigma) ? glassFreeSigma : 0,
        );
      },
    };
  };
  // Prune and grow ask about the same pair sets again and again (a pair left out, a round repeated).
  const fits = new Map<string, Predictor | null>();
  const fit = (subset: LampPair[]): Predictor | null => {
    const key = subset.map(pairKey).sort().join();
    if (!fits.has(key)) fits.set(key, computeFit(subset));
    return fits.get(key)!;
  };

  const heightBand = (current: LampPair[]) =>
    lampHeightBand(current, peaks, lines, heightTolerance);
  const plausibleHeight = (line: number, peak: number, band: [number, number]) =>
    heightInBand(peaks[peak].height, lines[line].intensity, band);

  /**
   * Whether `line` may take `peak` under `model`: the peak inside the line's window, no other free
   * peak inside it, no rival line whose own window holds the peak, no neighbour line blended into
   * the peak, and a peak about as strong as the line should make it.
   */
  const acceptable = (
    model: Predictor,
    line: number,
    peak: number,
    freePeaks: Set<number>,
    freeLines: Set<number>,
    band: [number, number],
  ) => {
    const lambda = lines[line].wavelengthNm;
    const predicted = model.predictX(lambda);
    const window = windowSigma * model.predictionSigmaX(lambda, peakSigma(peak));
    if (!(Math.abs(peaks[peak].x - predicted) <= window)) return false;
    if (!plausibleHeight(line, peak, band)) return false;
    const fwhmX = peakFwhm(peak);
    if (fwhmX !== undefined && lampLineBlended(lines, candidateLines, line, model.predictX, fwhmX))
      return false;
    for (const other of freePeaks) {
      if (other !== peak && Math.abs(peaks[other].x - predicted) <= window) return false;
    }
    for (const rival of freeLines) {
      if (rival === line || lines[rival].intensity < rivalIntensityRatio * lines[line].intensity)
        continue;
      const rivalLambda = lines[rival].wavelengthNm;
      const rivalX = model.predictX(rivalLambda);
      // A rival inside this line's window cannot be told from it by the model, whichever way the
      // model's bias runs; one whose own window holds the peak could have made it.
      if (Math.abs(rivalX - predicted) <= window) return false;
      const rivalWindow = windowSigma * model.predictionSigmaX(rivalLambda, peakSigma(peak));
      if (Math.abs(peaks[peak].x - rivalX) <= rivalWindow) return false;
    }
    return true;
  };
  const freeSets = (current: LampPair[]) => {
    const pairedPeaks = new Set(current.map((p) => p.peakIndex));
    const pairedLines = new Set(current.map((p) => p.lineIndex));
    const forcedLines = new Set(forced.values());
    return {
      freePeaks: new Set(
        peaks.map((_, i) => i).filter((i) => !pairedPeaks.has(i) && !forced.has(i)),
      ),
      freeLines: new Set(candidateLines.filter((l) => !pairedLines.has(l) && !forcedLines.has(l))),
    };
  };

  /**
   * Leaves suspects out in turn and drops the worst that fails its own test; repeats until all pass.
   * Suspects are the two pairs at each end (where a wrong pair bends the model least visibly) and the
   * worst-fitting ones; testing every pair costs a refit each and finds nothing more in practice.
   */
  const prune = () => {
    while (pairs.length > MIN_CORE) {
      const whole = fit(pairs);
      if (!whole) return;
      const free = pairs.map((_, i) => i).filter((i) => !isForced(pairs[i]));
      const byX = free.slice().sort((a, b) => pairs[a].x - pairs[b].x);
      const misfit = (i: number) =>
        Math.abs(pairs[i].x - whole.predictX(pairs[i].wavelengthNm)) /
        whole.predictionSigmaX(pairs[i].wavelengthNm, peakSigma(pairs[i].peakIndex));
      const worstFitting = free
        .slice()
        .sort((a, b) => misfit(b) - misfit(a) || a - b)
        .slice(0, WORST_SUSPECTS);
      const suspects = [...new Set([...byX.slice(0, 2), ...byX.slice(-2), ...worstFitting])].sort(
        (a, b) => a - b,
      );
      let worst: { index: number; z: number } | undefined;
      for (const i of suspects) {
        const rest = pairs.filter((_, k) => k !== i);
        const model = fit(rest);
        if (!model) continue;
        const { freePeaks, freeLines } = freeSets(rest);
        const pair = pairs[i];
        const sigma = model.predictionSigmaX(pair.wavelengthNm, peakSigma(pair.peakIndex));
        const z = Math.abs(pair.x - model.predictX(pair.wavelengthNm)) / sigma;
        // A pair with a rival is as doubtful as one far off: rank it just beyond the window.
        const passes =
          Number.isFinite(z) &&
          acceptable(model, pair.lineIndex, pair.peakIndex, freePeaks, freeLines, heightBand(rest));
        const score = !Number.isFinite(z) ? Infinity : passes ? z : Math.max(z, windowSigma + 1e-9);
        if (!(score <= windowSigma) && (!worst || score > worst.z)) worst = { index: i, z: score };
      }
      if (!worst) return;
      pairs = pairs.filter((_, k) => k !== worst!.index);
    }
  };

  /** Adds, one at a time, the passing line nearest the paired x range; refits after each. */
  const grow = (): number => {
    let added = 0;
    for (;;) {
      const model = fit(pairs);
      if (!model) return added;
      const xs = pairs.map((p) => p.x);
      const [covLow, covHigh] = [Math.min(...xs), Math.max(...xs)];
      const { freePeaks, freeLines } = freeSets(pairs);
      const band = heightBand(pairs);
      const order = [...freeLines]
        .map((line) => ({ line, x: model.predictX(lines[line].wavelengthNm) }))
        .filter((c) => c.x >= context.domain[0] && c.x <= context.domain[1])
        .map((c) => ({ ...c, distance: Math.max(0, covLow - c.x, c.x - covHigh) }))
        .sort((a, b) => a.distance - b.distance || a.line - b.line);
      let accepted: LampPair | undefined;
      for (const { line, x } of order) {
        let nearest = -1;
        for (const p of freePeaks)
          if (nearest < 0 || Math.abs(peaks[p].x - x) < Math.abs(peaks[nearest].x - x)) nearest = p;
        if (nearest >= 0 && acceptable(model, line, nearest, freePeaks, freeLines, band)) {
          accepted = toLampPair(context, nearest, line);
          break;
        }
      }
      if (!accepted) return added;
      pairs = [...pairs, accepted];
      added++;
    }
  };

  for (let round = 0; round < maxRounds; round++) {
    const before = pairs.map(pairKey).sort().join();
    prune();
    grow();
    if (pairs.map(pairKey).sort().join() === before) break;
  }
  return pairs.sort((a, b) => a.x - b.x);
}
