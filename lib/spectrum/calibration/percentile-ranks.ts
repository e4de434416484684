// Percentile ranks of values, for the pairing searches that compare how strong a peak is among the
// peaks with how strong a line is among the lines.

/** Percentile ranks (0 weakest … 1 strongest); ties keep their input order. */
export function percentileRanks(values: readonly number[]): number[] {
  const order = values.map((_, i) => i).sort((a, b) => values[a] - values[b]);
  const result = new Array<number>(values.length);
  order.forEach((index, position) => {
    result[index] = values.length > 1 ? position / (values.length - 1) : 1;
  });
  return result;
}
