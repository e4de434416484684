// Whether a species is weighed on intensities the table gives for another kind of source.

import type { SourceKind } from "../types";
import type { SpeciesInfo } from "./score-elements-stage-types";

/** Whether a species' intensities come from another kind of source than the one judged. */
export function borrowed(basis: SpeciesInfo["basis"], source: SourceKind): boolean {
  return basis !== "none" && basis !== source;
}
