// The prepared line index with one source's intensities replaced by the LTE prediction at an assumed
// excitation temperature, kept beside the index it was made from: building it anew for every run that
// assumes a temperature cost 1.8 s against a 300,000-line table where the analysis itself took 46 ms.
import { prepareLineIndex, type LineIndex } from "../matching/prepare-line-index";
import type { SourceKind } from "../types";
import { lteReferenceLines } from "./lte-reference-lines";

/** Temperature indexes kept per base index: a lab assumes one or two temperatures at a time. */
const KEPT_PER_INDEX = 2;

const kept = new WeakMap<LineIndex, Map<string, LineIndex>>();

/** The index of `index`'s lines under LTE intensities for `source` at `temperatureK`; the same object for the same three. */
export function lteLineIndex(
  index: LineIndex,
  source: SourceKind,
  temperatureK: number,
): LineIndex {
  const key = `${source}:${temperatureK}`;
  let forIndex = kept.get(index);
  const found = forIndex?.get(key);
  if (found) return found;
  const built = prepareLineIndex(lteReferenceLines(index.lines, source, temperatureK), {
    medium: index.medium,
  });
  if (!forIndex) kept.set(index, (forIndex = new Map()));
  if (forIndex.size >= KEPT_PER_INDEX) forIndex.delete(forIndex.keys().next().value!);
  forIndex.set(key, built);
  return built;
}
