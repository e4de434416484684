// A count with its noun in the right number, for sentences users read: "1 row", "2 rows", "1,024 lines".

/** `n` written with thousands separators and the noun singular for exactly 1, else plural. */
export function countOf(n: number, singular: string, plural = `${singular}s`): string {
  return `${n.toLocaleString("en")} ${n === 1 ? singular : plural}`;
}
