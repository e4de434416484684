// Maps character offsets in a text to 1-based line numbers, for errors that point into a file.
import { lowerBound } from "../spectrum/matching/lower-bound";

/** Line numbers from character offsets, by binary search over the offsets of "\n". */
export function lineLocator(text: string): (offset: number) => number {
  const newlines: number[] = [];
  for (let i = text.indexOf("\n"); i !== -1; i = text.indexOf("\n", i + 1)) newlines.push(i);
  return (offset) => lowerBound(newlines, offset) + 1;
}
