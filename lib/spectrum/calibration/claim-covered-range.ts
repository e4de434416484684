// A trusted automatic pairing claims its covered range only where more than one peak's centre holds
// the calibration. The claim first ends at the outermost pairs whose peak centres are sound: an end
// pair whose peak a neighbour widens or splits, or the array's edge cuts, is off by a pull that the fit
// follows wherever that pair alone decides the calibration (a cubic meets a lone end pair however
// little it weighs), so beyond the last sound pair the calibration is as wrong as that pull. Then it
// steps one pair in at each end: between the outermost pair and its inner neighbour the calibration
// rests on the outermost peak's centre alone, and a pull too small to widen the peak visibly (a weak
// unlisted line under it) is the calibration's error there, which no other pair can confirm. The
// checks before ask whether an end pair is the right line; none can ask whether its centre is right
// to a tenth of a line width. The pairs stepped over stay in the fit, where the pairs around them
// outvote them; only the claim ends sooner.
import { soundCentres } from "./centre-uncertainty";
import { describePairs } from "./describe-pairs";
import type { LampPairingResult } from "./lamp-pairing-types";
import type { PairingContext } from "./pairing-context";

/**
 * Fewest pairs inside the sound ends for the claim to step one pair in at each end (leaving three).
 * Over 4,800 instruments (prisms of seeds 12100000, 12200000, 15100000, 15800000 and 16100000; the
 * CLI's mix of 1000, 12400000, 15000000, 15700000, 15900000 and 16000000; 2048-pixel arrays of 1000;
 * curved gratings of 15200000 and 16200000, straight ones of 15300000; recalibrations of 15400000 and
 * 16300000) stepping in took the "paired" calibrations from 3,188 right and 30 silently wrong to
 * 3,233 and 16: 14 wrong ones are right within the narrower claim, and 31 "check" results are paired
 * right, a second route now agreeing over the whole claim. The right ones' mean covered share of the
 * array went from 61 % to 55 %. On fresh seeds (the mix of 16600000 and 16700000, n 300 each) 388
 * right and 4 wrong became 393 and 2. Stepping in only where the other pairs did not foretell the end
 * pair to a tenth of a line width kept 57 % covered but gave 3,220 and 19.
 */
const MIN_PAIRS_TO_STEP_IN = 5;

/** `result` with its model's covered range claimed as the module comment says, naming the pairs it leaves outside. */
export function claimCoveredRange(
  context: PairingContext,
  result: LampPairingResult,
): LampPairingResult {
  // Pairs a person seeded are theirs to claim, as the end trimming leaves them too.
  if (result.status !== "paired" || !result.model || context.forced.size > 0) return result;
  const model = result.model.model;
  let [low, high] = model.coveredX;
  const sound = result.pairs.filter(soundCentres(context.peaks, result.pairs));
  if (sound.length >= 2) {
    const xs = sound.map((p) => p.x);
    [low, high] = [Math.max(low, Math.min(...xs)), Math.min(high, Math.max(...xs))];
  }
  const pulled = result.pairs.filter((p) => p.x < low || p.x > high);
  const inside = result.pairs.filter((p) => p.x >= low && p.x <= high).sort((a, b) => a.x - b.x);
  const steppedOver =
    inside.length >= MIN_PAIRS_TO_STEP_IN ? [inside[0], inside[inside.length - 1]] : [];
  const claimed = steppedOver.length > 0 ? inside.slice(1, -1) : inside;
  if (pulled.length === 0 && steppedOver.length === 0) return result;
  const wavelengths = claimed.map((p) => p.wavelengthNm);
  const notes = [
    ...(pulled.length > 0
      ? [
          `the covered range ends at the outermost pairs whose peaks stand clear ` +
            `(${describePairs(pulled)} ${pulled.length > 1 ? "are" : "is"} fitted but not claimed: a neighbour or the array's edge pulls ${pulled.length > 1 ? "their peaks" : "its peak"})`,
        ]
      : []),
    ...(steppedOver.length > 0
      ? [
          `it is claimed from the second pair at each end on (${describePairs(steppedOver)} are fitted but not claimed: ` +
            `beyond its neighbour each would rest on its own peak's centre alone)`,
        ]
      : []),
  ];
  return {
    ...result,
    model: {
      ...result.model,
      model: {
        ...model,
        coveredX: [claimed[0].x, claimed[claimed.length - 1].x],
        coveredNm: [Math.min(...wavelengths), Math.max(...wavelengths)],
      },
    },
    message: `${result.message}; ${notes.join("; ")}`,
  };
}
