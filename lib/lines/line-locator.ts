// Maps character offsets in a text to 1-based line numbers, for errors that point into a file.

/** Line numbers from character offsets, by binary search over the offsets of "\n". */
export function lineLocator(text: string): (offset: number) => number {
  const newlines: number[] = [];
  for (let i = text.indexOf("\n"); i !== -1; i = text.indexOf("\n", i + 1)) newlines.push(i);
  return (offset) => {
    let low = 0;
    let high = newlines.length;
    while (low < high) {
      const mid = (low + high) >> 1;
      if (newlines[mid] < offset) low = mid + 1;
      else high = mid;
    }
    return low + 1;
  };
}
