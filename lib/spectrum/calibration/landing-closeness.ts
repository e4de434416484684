// How closely a lamp line lands on its peak, as the blind search weighs it: right pairs sit within a
// tenth of a pixel or so of a smooth curve, chance coincidences anywhere in the matching window.

/** A landing this many matching tolerances off counts about half (exp(−½)). */
export const CLOSE_TOLERANCES = 0.25;

/** exp(−½(offsetX / (CLOSE_TOLERANCES · toleranceX))²): 1 on the spot, about ½ a quarter tolerance off. */
export function landingCloseness(offsetX: number, toleranceX: number): number {
  return Math.exp(-0.5 * (offsetX / (CLOSE_TOLERANCES * toleranceX)) ** 2);
}
