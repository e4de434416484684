// Writes integer ordinates as JCAMP-DX DIFDUP lines: each line an abscissa, its first ordinate in SQZ
// form, then differences in DIF form with runs of equal differences in DUP form; a line that ends in
// DIF form is followed by one that repeats its last ordinate (the Y check), so a reader can tell a lost
// or changed character. JCAMP-DX 4.24 (McDonald & Wilks 1988), sections 5.5, 5.6, 5.9 and 5.10, Table VII.

export interface EncodeJcampDifDupOptions {
  /**
   * Longest line written, in characters (JCAMP-DX lines are at most 80).
   * @default 80
   */
  maxLineLength?: number;
}

/** SQZ pseudo-digits: sign and first digit in one character, @ A–I for 0…9, a–i for −1…−9. */
const SQZ_POSITIVE = "@ABCDEFGHI";
const SQZ_NEGATIVE = "abcdefghi";
/** DIF pseudo-digits: % J–R for 0…9, j–r for −1…−9. */
const DIF_POSITIVE = "%JKLMNOPQR";
const DIF_NEGATIVE = "jklmnopqr";
/** DUP pseudo-digits: S–Z and s for a count of 1…9 (the count includes the first of the run). */
const DUP = "STUVWXYZs";

function pseudo(value: number, positive: string, negative: string): string {
  const digits = String(Math.abs(value));
  const first = Number(digits[0]);
  return (value < 0 ? negative[first - 1] : positive[first]) + digits.slice(1);
}

const sqz = (value: number) => pseudo(value, SQZ_POSITIVE, SQZ_NEGATIVE);
const dif = (value: number) => pseudo(value, DIF_POSITIVE, DIF_NEGATIVE);
/** A DUP count of 1 is written as nothing: the value itself is the one occurrence. */
const dup = (count: number) =>
  count === 1 ? "" : DUP[Number(String(count)[0]) - 1] + String(count).slice(1);

/**
 * The data lines of `##XYDATA=(X++(Y..Y))` for `ordinates` (safe integers), where `abscissa(i)` is the
 * text of the X that opens a line whose first ordinate is point i. Points are never split across
 * lines; every line is at most `maxLineLength` characters.
 */
export function encodeJcampDifDup(
  ordinates: ArrayLike<number>,
  abscissa: (index: number) => string,
  options: EncodeJcampDifDupOptions = {},
): string[] {
  const { maxLineLength = 80 } = options;
  const n = ordinates.length;
  if (n < 1) throw new RangeError("there are no ordinates to write");
  for (let i = 0; i < n; i++) {
    if (!Number.isSafeInteger(ordinates[i]))
      throw new RangeError(`ordinate ${i} (${ordinates[i]}) is not a safe integer`);
  }
  const lines: string[] = [];
  // The line being built: its opening (X and the SQZ ordinate), then runs of equal differences.
  let opening = "";
  let runs: { difference: number; count: number }[] = [];
  let length = 0;
  const open = (index: number) => {
    opening = abscissa(index) + sqz(ordinates[index]);
    runs = [];
    length = opening.length;
    if (length > maxLineLength)
      throw new RangeError(`point ${index} alone needs ${length} characters on its line`);
  };
  const close = () =>
    lines.push(opening + runs.map((r) => dif(r.difference) + dup(r.count)).join(""));

  open(0);
  for (let i = 1; i < n; i++) {
    const difference = ordinates[i] - ordinates[i - 1];
    const last = runs.at(-1);
    const grows =
      last?.difference === difference
        ? dup(last.count + 1).length - dup(last.count).length
        : dif(difference).length;
    if (length + grows > maxLineLength) {
      close();
      // The next line repeats point i − 1 as its Y check and goes on from there.
      open(i - 1);
      runs.push({ difference, count: 1 });
      length += dif(difference).length;
      if (length > maxLineLength)
        throw new RangeError(`point ${i} does not fit on a line of ${maxLineLength} characters`);
    } else if (last?.difference === difference) {
      last.count++;
      length += grows;
    } else {
      runs.push({ difference, count: 1 });
      length += grows;
    }
  }
  close();
  // The last line ends in DIF form when it holds a difference: its check line closes the block.
  if (runs.length > 0) {
    open(n - 1);
    close();
  }
  return lines;
}
