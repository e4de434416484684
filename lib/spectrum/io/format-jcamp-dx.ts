// Writes a Spectrum as JCAMP-DX 4.24 that strict readers accept: printable ASCII lines of at most 80
// characters, the standard's units, ##DATE/##TIME in its form (and ##LONGDATE as 5.x writes it), an even
// axis as compressed ##XYDATA=(X++(Y..Y)) in DIFDUP form with 32-bit ordinates, an uneven one as
// ##XYPOINTS=(XY..XY) at full precision. Section numbers are of McDonald & Wilks, Appl. Spectrosc. 42(1),
// 151 (1988); tests/support/jcamp-strict-validator.ts checks the output independently.
import type { AxisUnit, Spectrum } from "../types";
import { encodeJcampDifDup } from "./encode-jcamp-dif-dup";
import { formatAffn } from "./format-affn";

/** ##YUNITS the standard names (from memory of its table of spectral parameters). */
export const JCAMP_Y_UNITS = [
  "ARBITRARY UNITS",
  "ABSORBANCE",
  "TRANSMITTANCE",
  "REFLECTANCE",
  "KUBELKA-MUNK",
] as const;
export type JcampYUnits = (typeof JCAMP_Y_UNITS)[number];

export interface FormatJcampDxOptions {
  /**
   * ##TITLE. A title longer than one line goes on over continuation lines.
   * @default spectrum.meta.TITLE, else "Spectrum"
   */
  title?: string;
  /**
   * ##DATA TYPE. Emission in the UV and visible is a UV/VIS SPECTRUM.
   * @default "UV/VIS SPECTRUM"
   */
  dataType?: string;
  /**
   * ##ORIGIN (required by JCAMP-DX 4.24): who made the data.
   * @default spectrum.meta.ORIGIN, else "unknown"
   */
  origin?: string;
  /**
   * ##OWNER (required by JCAMP-DX 4.24): who holds the rights, or "PUBLIC DOMAIN".
   * @default spectrum.meta.OWNER, else "unknown"
   */
  owner?: string;
  /**
   * When the data were made (an ISO 8601 text with its zone, or a Date), written in UTC as
   * ##DATE=YY/MM/DD and ##TIME=HH:MM:SS (4.24) and ##LONGDATE=YYYY/MM/DD HH:MM:SS +0000 (5.x).
   * @default left out
   */
  date?: string | Date;
  /**
   * ##YUNITS, one of the standard's names.
   * @default spectrum.meta.YUNITS when it is one of them, else "ARBITRARY UNITS"
   */
  yUnits?: JcampYUnits;
  /**
   * Data form. "auto" writes XYDATA=(X++(Y..Y)) when x is evenly spaced (to 1e-9 of the step) and
   * XYPOINTS=(XY..XY) otherwise; XYDATA rebuilds x from FIRSTX, LASTX and NPOINTS.
   * @default "auto"
   */
  form?: "auto" | "XYDATA" | "XYPOINTS";
  /**
   * The finest y step worth keeping in XYDATA, as a power of ten (0.001, 1, …): YFACTOR is never finer,
   * so interpolated or averaged counts do not carry nine digits of noise. YFACTOR is coarser still when
   * the ordinates would not fit 32 bits otherwise.
   * @default as fine as 32-bit ordinates allow
   */
  yResolution?: number;
  /**
   * User-defined labels (the name starts with "$"), written after the standard header labels. The
   * writer's own ##$MEDIUM may not be repeated here.
   * @default []
   */
  userLabels?: readonly { name: string; value: string }[];
  /**
   * "$$" comment lines written just before the data (a caveat, how the data were made).
   * @default []
   */
  comments?: readonly string[];
}

/** The standard's XUNITS (from memory: 1/CM, MICROMETERS, NANOMETERS, SECONDS); Å are written in nm. */
const XUNITS: Record<Exclude<AxisUnit, "pixel">, { name: string; scale: number }> = {
  nm: { name: "NANOMETERS", scale: 1 },
  angstrom: { name: "NANOMETERS", scale: 0.1 },
  wavenumber: { name: "1/CM", scale: 1 },
};
/** JCAMP-DX lines are at most 80 characters (from memory: section 4). */
const MAX_LINE = 80;
const EVEN_SPACING_TOLERANCE = 1e-9;
/**
 * Largest |ordinate| written in XYDATA: 2^30 − 1, so that the ordinates and their differences (up to
 * twice as large) both fit a signed 32-bit integer, which is what many readers decode into.
 */
const LARGEST_ORDINATE = 2 ** 30 - 1;
/** YFACTOR stays within 1e±30, as readers (ours among them) refuse larger or smaller scale factors. */
const YFACTOR_DECADES = 30;

/**
 * The JCAMP-DX 4.24 text of `spectrum` (lines end in "\n"); reads back through parseJcamp to the same
 * points (XYPOINTS exactly, XYDATA within half of YFACTOR).
 */
export function formatJcampDx(spectrum: Spectrum, options: FormatJcampDxOptions = {}): string {
  const { meta } = spectrum;
  assertWritable(spectrum);
  const { form = "auto", userLabels = [], comments = [], yResolution } = options;
  const finestExponent = yResolution === undefined ? -Infinity : Math.log10(yResolution);
  if (yResolution !== undefined && !Number.isInteger(finestExponent))
    throw new RangeError(`yResolution must be a power of ten, got ${String(yResolution)}`);
  if (form !== "auto" && form !== "XYDATA" && form !== "XYPOINTS")
    throw new RangeError(`unknown form ${JSON.stringify(form)}`);
  const unit = XUNITS[spectrum.xUnit as Exclude<AxisUnit, "pixel">];
  const x =
    unit.scale === 1 ? spectrum.x : Float64Array.from(spectrum.x, (value) => value * unit.scale);
  const { y } = spectrum;
  const n = x.length;
  const even = isEvenlySpaced(x);
  if (form === "XYDATA" && !even)
    throw new RangeError("XYDATA needs an evenly spaced x; use form XYPOINTS");
  const useXyData = form === "XYDATA" || (form === "auto" && even);
  const yUnits = options.yUnits ?? defaultYUnits(meta.YUNITS);
  if (!(JCAMP_Y_UNITS as readonly string[]).includes(yUnits))
    throw new RangeError(
      `YUNITS ${JSON.stringify(yUnits)} is not one of the standard's: ${JCAMP_Y_UNITS.join(", ")}`,
    );

  const out: string[] = [];
  const written = new Set<string>();
  const label = (name: string, value: string) => {
    const key = name.replace(/[\s_-]/g, "").toUpperCase();
    if (written.has(key)) throw new RangeError(`the label ##${name}= would be written twice`);
    written.add(key);
    out.push(...labelLines(name, value));
  };
  label("TITLE", options.title ?? meta.TITLE ?? "Spectrum");
  label("JCAMP-DX", "4.24");
  label("DATA TYPE", options.dataType ?? "UV/VIS SPECTRUM");
  label("ORIGIN", options.origin ?? meta.ORIGIN ?? "unknown");
  label("OWNER", options.owner ?? meta.OWNER ?? "unknown");
  if (options.date !== undefined) {
    const when = utcParts(options.date);
    label("DATE", `${when.year.slice(2)}/${when.month}/${when.day}`);
    label("TIME", when.time);
    label("LONGDATE", `${when.year}/${when.month}/${when.day} ${when.time} +0000`);
  }
  // A user-defined label (## followed by $) is the standard's place for what it has no label for.
  if (spectrum.medium !== undefined && spectrum.xUnit !== "wavenumber")
    label("$MEDIUM", spectrum.medium.toUpperCase());
  for (const { name, value } of userLabels) {
    if (!/^\$[A-Z0-9][A-Z0-9 /._-]*$/.test(name))
      throw new RangeError(
        `a user label's name starts with "$" and holds capitals, digits, spaces and / . _ -: ${JSON.stringify(name)}`,
      );
    label(name, value);
  }
  label("XUNITS", unit.name);
  label("YUNITS", yUnits);
  for (const comment of comments) out.push(...commentLines(comment));

  if (useXyData) {
    const { ordinates, exponent } = toOrdinates(y, finestExponent);
    const yFactor = Number(`1e${exponent}`);
    const actual = (i: number) => scaledDecimal(ordinates[i], exponent);
    let largest = 0;
    let smallest = 0;
    for (let i = 1; i < n; i++) {
      if (ordinates[i] > ordinates[largest]) largest = i;
      if (ordinates[i] < ordinates[smallest]) smallest = i;
    }
    const step = (x[n - 1] - x[0]) / (n - 1);
    // A line's X needs a thousandth of a step, no more: a reader rebuilds x from FIRSTX and LASTX.
    const xDecimals = Math.max(0, Math.min(20, Math.ceil(-Math.log10(Math.abs(step))) + 3));
    label("XFACTOR", "1");
    label("YFACTOR", formatAffn(yFactor));
    label("FIRSTX", formatAffn(x[0]));
    label("LASTX", formatAffn(x[n - 1]));
    // 12 digits: DELTAX is informative (readers place x from FIRSTX, LASTX and NPOINTS).
    label("DELTAX", formatAffn(Number(step.toPrecision(12))));
    label("MAXY", actual(largest));
    label("MINY", actual(smallest));
    label("FIRSTY", actual(0));
    label("NPOINTS", String(n));
    label("XYDATA", "(X++(Y..Y))");
    out.push(
      ...encodeJcampDifDup(ordinates, (i) => fixedDecimal(x[i], xDecimals), {
        maxLineLength: MAX_LINE,
      }),
    );
  } else {
    let largest = 0;
    let smallest = 0;
    for (let i = 1; i < n; i++) {
      if (y[i] > y[largest]) largest = i;
      if (y[i] < y[smallest]) smallest = i;
    }
    label("XFACTOR", "1");
    label("YFACTOR", "1");
    label("FIRSTX", formatAffn(x[0]));
    label("LASTX", formatAffn(x[n - 1]));
    label("MAXY", formatAffn(y[largest]));
    label("MINY", formatAffn(y[smallest]));
    label("FIRSTY", formatAffn(y[0]));
    label("NPOINTS", String(n));
    label("XYPOINTS", "(XY..XY)");
    for (let i = 0; i < n; i++) out.push(`${formatAffn(x[i])}, ${formatAffn(y[i])}`);
  }
  label("END", "");
  return out.join("\n") + "\n";
}

function assertWritable(spectrum: Spectrum): void {
  const { x, y } = spectrum;
  if (!(x instanceof Float64Array) || !(y instanceof Float64Array))
    throw new RangeError("x and y must be Float64Arrays");
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values but y has ${y.length}`);
  if (x.length < 2) throw new RangeError("a spectrum needs at least 2 points");
  if (spectrum.xUnit === "pixel")
    throw new RangeError(
      "JCAMP-DX 4.24 has no unit for detector pixels (its XUNITS are 1/CM, MICROMETERS, NANOMETERS and SECONDS): write a calibrated spectrum",
    );
  if (!(spectrum.xUnit in XUNITS))
    throw new RangeError(`unknown xUnit ${JSON.stringify(spectrum.xUnit)}`);
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i]))
      throw new RangeError(`point ${i} is not finite`);
    if (i > 0 && !(x[i] > x[i - 1]))
      throw new RangeError(`x must be strictly increasing (index ${i})`);
  }
}

function isEvenlySpaced(x: Float64Array): boolean {
  const n = x.length;
  const step = (x[n - 1] - x[0]) / (n - 1);
  for (let i = 1; i < n; i++) {
    if (Math.abs(x[i] - (x[0] + i * step)) > EVEN_SPACING_TOLERANCE * Math.abs(step)) return false;
  }
  return true;
}

function defaultYUnits(fromFile: string | undefined): JcampYUnits {
  const named = (fromFile ?? "").trim().toUpperCase();
  return (JCAMP_Y_UNITS as readonly string[]).includes(named)
    ? (named as JcampYUnits)
    : "ARBITRARY UNITS";
}

/**
 * y as integers times YFACTOR = 10^exponent: exponent 0 (the counts themselves) when every y is an
 * integer within LARGEST_ORDINATE, else the finest power of ten (not finer than 10^finestExponent)
 * that keeps every ordinate within it.
 */
function toOrdinates(
  y: Float64Array,
  finestExponent: number,
): { ordinates: Float64Array; exponent: number } {
  let largest = 0;
  let integers = true;
  for (let i = 0; i < y.length; i++) {
    largest = Math.max(largest, Math.abs(y[i]));
    if (!Number.isInteger(y[i])) integers = false;
  }
  let exponent = 0;
  if (largest > 0 && !(integers && largest <= LARGEST_ORDINATE)) {
    // Readers refuse factors beyond 1e±30 (ours does): values below 1e-21 then write as 0.
    exponent = Math.max(-YFACTOR_DECADES, Math.ceil(Math.log10(largest / LARGEST_ORDINATE)));
    // log10 is not exact at the edges: settle on the finest exponent whose ordinates still fit.
    while (Math.round(largest / Number(`1e${exponent}`)) > LARGEST_ORDINATE) exponent++;
    while (
      exponent - 1 >= Math.max(finestExponent, -YFACTOR_DECADES) &&
      Math.round(largest / Number(`1e${exponent - 1}`)) <= LARGEST_ORDINATE
    )
      exponent--;
  }
  exponent = Math.max(exponent, finestExponent);
  if (exponent > YFACTOR_DECADES)
    throw new RangeError(
      `|y| up to ${largest} needs a YFACTOR above 1e${YFACTOR_DECADES}, which readers refuse`,
    );
  const factor = Number(`1e${exponent}`);
  // Dividing by 1e-5 and multiplying by 1e5 round differently; divide for exponents ≥ 0, multiply below.
  const ordinates = Float64Array.from(y, (value) =>
    Math.round(exponent >= 0 ? value / factor : value * Number(`1e${-exponent}`)),
  );
  return { ordinates, exponent };
}

/** integer × 10^exponent as an exact decimal (AFFN), with no float rounding on the way. */
function scaledDecimal(integer: number, exponent: number): string {
  if (integer === 0) return "0";
  const sign = integer < 0 ? "-" : "";
  const digits = String(Math.abs(integer));
  if (exponent >= 0) return sign + digits + "0".repeat(exponent);
  const padded = digits.padStart(-exponent + 1, "0");
  const whole = padded.slice(0, padded.length + exponent);
  const fraction = padded.slice(padded.length + exponent).replace(/0+$/, "");
  return sign + whole + (fraction ? `.${fraction}` : "");
}

/** `value` rounded to `decimals` places, without trailing zeros or an exponent. */
function fixedDecimal(value: number, decimals: number): string {
  const text = value.toFixed(decimals);
  const trimmed = text.includes(".") ? text.replace(/0+$/, "").replace(/\.$/, "") : text;
  return trimmed === "-0" ? "0" : trimmed;
}

function utcParts(date: string | Date): {
  year: string;
  month: string;
  day: string;
  time: string;
} {
  const when = date instanceof Date ? date : new Date(date);
  if (Number.isNaN(when.getTime()))
    throw new RangeError(`date ${JSON.stringify(String(date))} is not a date`);
  const iso = when.toISOString();
  return {
    year: iso.slice(0, 4),
    month: iso.slice(5, 7),
    day: iso.slice(8, 10),
    time: iso.slice(11, 19),
  };
}

/**
 * Printable ASCII only (the standard's character set): accents dropped (é → e), anything else
 * outside it becomes "?", and line breaks become spaces.
 */
function printableAscii(value: string): string {
  return value
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .replace(/[\r\n\t]+/g, " ")
    .replace(/[^\x20-\x7e]/g, "?");
}

/**
 * "##NAME=value" over as many lines as it needs, each at most MAX_LINE characters, broken at spaces
 * where it can. A continuation line never opens with "##" or "$$", which would start a label or comment.
 */
function labelLines(name: string, value: string): string[] {
  const head = `##${name}=`;
  const text = printableAscii(value).trim();
  if (head.length + text.length <= MAX_LINE) return [head + text];
  const lines: string[] = [];
  let rest = text;
  let prefix = head;
  while (rest.length > 0) {
    const room = MAX_LINE - prefix.length;
    let cut = rest.length <= room ? rest.length : rest.lastIndexOf(" ", room);
    if (cut <= 0) cut = Math.min(room, rest.length);
    lines.push(prefix + rest.slice(0, cut).trimEnd());
    rest = rest.slice(cut).trimStart();
    prefix = /^(##|\$\$)/.test(rest) ? " " : "";
  }
  return lines;
}

function commentLines(comment: string): string[] {
  const lines: string[] = [];
  let rest = printableAscii(comment).trim();
  const room = MAX_LINE - 3;
  while (rest.length > 0) {
    let cut = rest.length <= room ? rest.length : rest.lastIndexOf(" ", room);
    if (cut <= 0) cut = Math.min(room, rest.length);
    lines.push(`$$ ${rest.slice(0, cut).trimEnd()}`);
    rest = rest.slice(cut).trimStart();
  }
  return lines.length > 0 ? lines : ["$$"];
}
