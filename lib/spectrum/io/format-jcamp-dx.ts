// Writes a Spectrum as a JCAMP-DX 4.24 file: XYDATA=(X++(Y..Y)) for an evenly spaced x, XYPOINTS=(XY..XY) otherwise.
import type { AxisUnit, Spectrum } from "../types";

export interface FormatJcampDxOptions {
  /**
   * ##TITLE. Newlines are turned into spaces (a label value is one line here).
   * @default spectrum.meta.TITLE, else "Spectrum"
   */
  title?: string;
  /**
   * ##DATA TYPE. JCAMP-DX names spectra by region; emission in the UV and visible is a UV/VIS SPECTRUM.
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
   * ##DATE, written as given.
   * @default spectrum.meta.DATE, else left out
   */
  date?: string;
  /**
   * ##YUNITS.
   * @default spectrum.meta.YUNITS, else "ARBITRARY UNITS"
   */
  yUnits?: string;
  /**
   * Data form. "auto" writes XYDATA=(X++(Y..Y)) when x is evenly spaced (to 1e-9 of the step) and
   * XYPOINTS=(XY..XY) otherwise; XYDATA rebuilds x from FIRSTX, LASTX and NPOINTS.
   * @default "auto"
   */
  form?: "auto" | "XYDATA" | "XYPOINTS";
  /**
   * Significant digits kept for y in XYDATA, where y is written as integers times YFACTOR. Integer
   * counts that fit are written exactly with YFACTOR=1.
   * @default 10
   */
  yDigits?: number;
}

const XUNITS: Record<AxisUnit, string> = {
  nm: "NANOMETERS",
  angstrom: "ANGSTROMS",
  wavenumber: "1/CM",
  pixel: "PIXELS",
};
/** JCAMP-DX lines are at most 80 characters. */
const MAX_LINE = 80;
const EVEN_SPACING_TOLERANCE = 1e-9;

/** The JCAMP-DX 4.24 text of `spectrum` (lines end in "\n"); reads back through parseJcamp to the same points. */
export function formatJcampDx(spectrum: Spectrum, options: FormatJcampDxOptions = {}): string {
  const { x, y, meta } = spectrum;
  assertWritable(spectrum);
  const { form = "auto", yDigits = 10 } = options;
  if (!Number.isInteger(yDigits) || yDigits < 1 || yDigits > 15) {
    throw new RangeError(`yDigits must be an integer from 1 to 15, got ${String(yDigits)}`);
  }
  if (form !== "auto" && form !== "XYDATA" && form !== "XYPOINTS")
    throw new RangeError(`unknown form ${JSON.stringify(form)}`);
  const n = x.length;
  const useXyData = form === "XYDATA" || (form === "auto" && isEvenlySpaced(x));
  if (form === "XYDATA" && !isEvenlySpaced(x)) {
    throw new RangeError("XYDATA needs an evenly spaced x; use form XYPOINTS");
  }

  const out: string[] = [];
  const label = (name: string, value: string | number) =>
    out.push(`##${name}=${oneLine(String(value))}`);
  label("TITLE", options.title ?? meta.TITLE ?? "Spectrum");
  label("JCAMP-DX", "4.24");
  label("DATA TYPE", options.dataType ?? "UV/VIS SPECTRUM");
  label("ORIGIN", options.origin ?? meta.ORIGIN ?? "unknown");
  label("OWNER", options.owner ?? meta.OWNER ?? "unknown");
  const date = options.date ?? meta.DATE;
  if (date !== undefined) label("DATE", date);
  // A user-defined label (## followed by $) is the standard's place for what it has no label for.
  if (spectrum.medium !== undefined) label("$MEDIUM", spectrum.medium.toUpperCase());
  label("XUNITS", XUNITS[spectrum.xUnit]);
  label("YUNITS", options.yUnits ?? meta.YUNITS ?? "ARBITRARY UNITS");

  if (useXyData) {
    const yFactor = chooseYFactor(y, yDigits);
    const deltaX = (x[n - 1] - x[0]) / (n - 1);
    // X check values are written as x / XFACTOR; x itself is rebuilt from FIRSTX, LASTX and NPOINTS.
    label("XFACTOR", 1);
    label("YFACTOR", yFactor);
    label("FIRSTX", x[0]);
    label("LASTX", x[n - 1]);
    label("DELTAX", deltaX);
    label("FIRSTY", y[0]);
    label(
      "MAXY",
      y.reduce((a, b) => Math.max(a, b), -Infinity),
    );
    label(
      "MINY",
      y.reduce((a, b) => Math.min(a, b), Infinity),
    );
    label("NPOINTS", n);
    label("XYDATA", "(X++(Y..Y))");
    let line = "";
    for (let i = 0; i < n; i++) {
      const value = String(Math.round(y[i] / yFactor));
      if (line.length > 0 && line.length + 1 + value.length > MAX_LINE) {
        out.push(line);
        line = "";
      }
      line = line.length === 0 ? `${plainDecimal(x[i])} ${value}` : `${line} ${value}`;
    }
    out.push(line);
  } else {
    label("XFACTOR", 1);
    label("YFACTOR", 1);
    label("FIRSTX", x[0]);
    label("LASTX", x[n - 1]);
    label("FIRSTY", y[0]);
    label("NPOINTS", n);
    label("XYPOINTS", "(XY..XY)");
    for (let i = 0; i < n; i++) out.push(`${x[i]}, ${y[i]}`);
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
  if (!(spectrum.xUnit in XUNITS))
    throw new RangeError(`unknown xUnit ${JSON.stringify(spectrum.xUnit)}`);
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i]))
      throw new RangeError(`point ${i} is not finite`);
    if (Math.abs(x[i]) >= 1e21)
      throw new RangeError(`x[${i}] = ${x[i]} is too large for a JCAMP-DX X value`);
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

/** 1 when every y is an integer that fits in `digits`; else a power of ten giving `digits` significant digits of the largest |y|. */
function chooseYFactor(y: Float64Array, digits: number): number {
  let maxAbs = 0;
  let allIntegers = true;
  for (let i = 0; i < y.length; i++) {
    maxAbs = Math.max(maxAbs, Math.abs(y[i]));
    if (!Number.isInteger(y[i])) allIntegers = false;
  }
  if (maxAbs === 0 || (allIntegers && maxAbs < 10 ** digits)) return 1;
  const exponent = Math.ceil(Math.log10(maxAbs)) - digits;
  // Written as 1e-7 etc., which AFFN reads; the factor itself is then exact in the file.
  return Number(`1e${exponent}`);
}

/** x without an exponent: in XYDATA an "e" would be read as a SQZ digit. */
function plainDecimal(value: number): string {
  const text = String(value);
  return /e/i.test(text) ? value.toFixed(20).replace(/0+$/, "").replace(/\.$/, "") : text;
}

function oneLine(value: string): string {
  return value.replace(/[\r\n]+/g, " ");
}
