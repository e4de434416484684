// A trusted pairing whose model claims a narrower covered range than its pairs span, saying why: the
// claim's steps (claim-sound-ends.ts, claim-from-second-pairs.ts) share it.
import type { LampPairingResult } from "./lamp-pairing-types";

/**
 * `result` (a trusted one, with its model) claiming `coveredX`, in wavelength the extent of the
 * claimed pairs' `wavelengths`, and `note` added to its message.
 */
export function withClaimedRange(
  result: LampPairingResult & { model: NonNullable<LampPairingResult["model"]> },
  coveredX: [number, number],
  wavelengths: readonly number[],
  note: string,
): LampPairingResult {
  return {
    ...result,
    model: {
      ...result.model,
      model: {
        ...result.model.model,
        coveredX,
        coveredNm: [Math.min(...wavelengths), Math.max(...wavelengths)],
      },
    },
    message: `${result.message}; ${note}`,
  };
}
