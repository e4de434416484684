// Numbers as JCAMP-DX's ASCII free format numeric (AFFN): plain decimals, or a mantissa with "E", a sign
// and two or three exponent digits — JavaScript's own "1e-7" is not AFFN, and in XYDATA an "e" would even
// read as a SQZ digit.

/** The shortest text that reads back as exactly `value`, in AFFN. */
export function formatAffn(value: number): string {
  if (!Number.isFinite(value)) throw new RangeError(`${value} has no AFFN form`);
  if (value === 0) return "0";
  const text = String(value);
  if (!/e/i.test(text)) return text;
  // toExponential() without digits keeps as many as the value needs to read back exactly.
  const [mantissa, exponent] = value.toExponential().split("e");
  const sign = exponent.startsWith("-") ? "-" : "+";
  const digits = exponent.replace(/^[+-]/, "").padStart(2, "0");
  return `${mantissa}E${sign}${digits}`;
}
