// The last step of an automatic pairing's claim: a trusted pairing's covered range, already ending at
// its outermost pairs whose centres are sound (claim-sound-ends.ts), steps one pair in at each end.
// Between the outermost pair and its inner neighbour the calibration rests on the outermost peak's
// centre alone, and a pull too small to widen the peak visibly (a weak unlisted line under it) is the
// calibration's error there, which no other pair can confirm: the checks ask whether an end pair is
// the right line, none whether its centre is right to a tenth of a line width. The pairs stepped over
// stay in the fit, where the pairs around them outvote them; only the claim ends sooner. It is taken
// after the two routes of the blind search have been compared, over what each claims as its sound
// ends: the pairs stepped over still shape the calibration inside the claim, so agreement must reach
// them (judged over the narrower claim, one fresh grating was "paired" 1.9 times the sweep's accuracy
// off, its blue end pair moving the axis by 0.29 of a line width between the others).
import { describePairs } from "./describe-pairs";
import { withClaimedRange } from "./with-claimed-range";
import type { LampPairingResult } from "./lamp-pairing-types";

/**
 * Fewest pairs inside the claim for it to step one pair in at each end (leaving three). Over 4,800
 * instruments (prisms of seeds 12100000, 12200000, 15100000, 15800000 and 16100000; the CLI's mix of
 * 1000, 12400000, 15000000, 15700000, 15900000 and 16000000; 2048-pixel arrays of 1000; curved
 * gratings of 15200000 and 16200000, straight ones of 15300000; recalibrations of 15400000 and
 * 16300000) it took the "paired" calibrations from 3,188 right and 30 silently wrong to 3,202 and 16:
 * 14 wrong ones are right within the narrower claim. On 1,500 fresh ones (the mix of 16600000,
 * 16700000 and 16900000, prisms of 17000000, curved gratings of 17100000) 954 and 9 became 956 and
 * 7; two right ones, at 0.998 and 0.999 of the accuracy, fell just beyond it as the sweep's probes
 * moved with the claim. The right calibrations' mean covered share of the array went from 61 % to
 * 55 %. Taken inside the refinement instead (so that the routes were compared over the narrower
 * claims), it gave 3,233 and 16 on the 4,800 but a wrong grating "paired" on the fresh ones.
 */
const MIN_PAIRS_TO_STEP_IN = 5;

/** `result` claimed from its second pair at each end (see the module comment), naming the pairs stepped over. */
export function claimFromSecondPairs(result: LampPairingResult): LampPairingResult {
  if (result.status !== "paired" || !result.model) return result;
  const model = result.model.model;
  const [low, high] = model.coveredX;
  const inside = result.pairs.filter((p) => p.x >= low && p.x <= high).sort((a, b) => a.x - b.x);
  if (inside.length < MIN_PAIRS_TO_STEP_IN) return result;
  const steppedOver = [inside[0], inside[inside.length - 1]];
  const claimed = inside.slice(1, -1);
  return withClaimedRange(
    { ...result, model: result.model },
    [claimed[0].x, claimed[claimed.length - 1].x],
    claimed.map((p) => p.wavelengthNm),
    `it is claimed from the second pair at each end on ` +
      `(${describePairs(steppedOver)} are fitted but not claimed: beyond its neighbour each would rest on its own peak's centre alone)`,
  );
}
