// Counts written the way a small spectrometer exports them: two-column "pixel,counts" text.

/** `y` as "pixel,counts" rows under a header, counts to two decimals. */
export function pixelCountsCsv(y: Float64Array): string {
  const rows = ["pixel,counts"];
  for (let i = 0; i < y.length; i++) rows.push(`${i},${y[i].toFixed(2)}`);
  return `${rows.join("\n")}\n`;
}
