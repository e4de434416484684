// Lamp pairs named in a sentence, as pairing's messages name the pairs they set aside.
import type { LampPair } from "./lamp-pairing-types";

/** "Ar I 416.418 nm, Ar I 418.188 nm" */
export function describePairs(pairs: readonly LampPair[]): string {
  return pairs.map((p) => `${p.species ?? ""} ${p.wavelengthNm.toFixed(3)} nm`.trim()).join(", ");
}
