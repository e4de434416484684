// A trusted automatic pairing claims its covered range only between its outermost pairs whose peak
// centres are sound. An end pair whose peak a neighbour widens or splits, or the array's edge cuts, is
// off by a pull that the fit follows wherever that pair alone decides the calibration (a cubic meets a
// lone end pair however little it weighs), so beyond the last sound pair the calibration is as wrong
// as that pull. The pulled pairs stay in the fit, where the pairs around them outvote them; only the
// claim ends sooner.
import { soundCentres } from "./centre-uncertainty";
import { describePairs } from "./describe-pairs";
import { withClaimedRange } from "./with-claimed-range";
import type { LampPairingResult } from "./lamp-pairing-types";
import type { PairingContext } from "./pairing-context";

/** `result` with its model's covered range ending at the outermost sound pairs, saying which pairs it leaves outside. */
export function claimSoundEnds(
  context: PairingContext,
  result: LampPairingResult,
): LampPairingResult {
  // Pairs a person seeded are theirs to claim, as the end trimming leaves them too.
  if (result.status !== "paired" || !result.model || context.forced.size > 0) return result;
  const sound = result.pairs.filter(soundCentres(context.peaks, result.pairs));
  if (sound.length < 2) return result;
  const xs = sound.map((p) => p.x);
  const [low, high] = [Math.min(...xs), Math.max(...xs)];
  const model = result.model.model;
  if (low <= model.coveredX[0] && high >= model.coveredX[1]) return result;
  const outside = result.pairs.filter((p) => p.x < low || p.x > high);
  return withClaimedRange(
    { ...result, model: result.model },
    [Math.max(model.coveredX[0], low), Math.min(model.coveredX[1], high)],
    sound.map((p) => p.wavelengthNm),
    `the covered range ends at the outermost pairs whose peaks stand clear ` +
      `(${describePairs(outside)} ${outside.length > 1 ? "are" : "is"} fitted but not claimed: a neighbour or the array's edge pulls ${outside.length > 1 ? "their peaks" : "its peak"})`,
  );
}
