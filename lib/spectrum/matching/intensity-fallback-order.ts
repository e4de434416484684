// The order in which other kinds of source lend their relative intensities to a species that has
// none for the chosen one.

import type { SourceKind } from "../types";

/** Where a species' intensities came from when the chosen source has none. */
export const INTENSITY_FALLBACK_ORDER: Readonly<Record<SourceKind, readonly SourceKind[]>> = {
  flame: ["arc", "plasma", "spark", "lamp"],
  arc: ["spark", "plasma", "flame", "lamp"],
  spark: ["arc", "plasma", "flame", "lamp"],
  plasma: ["arc", "spark", "flame", "lamp"],
  lamp: ["arc", "spark", "plasma", "flame"],
};
