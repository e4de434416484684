// Public API of the statistics every stage shares.
export { makeRandom } from "./make-random";
export type { SeededRandom } from "./make-random";
