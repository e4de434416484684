// Reads a JCAMP-DX spectrum through the jcampconverter package, adding the checks and error locations it lacks.
// The package decodes XYDATA=(X++(Y..Y)) in every compressed form and applies XFACTOR/YFACTOR/FIRSTX/LASTX;
// it reads (XY..XY) only as PEAK TABLE, and skips or zeroes bad values quietly, so we scan the data lines first.
import { convert } from "jcampconverter";
import type { Spectrum } from "../types";
import { assertReadOptions } from "./assert-read-options";
import { assertTextWithinBytes } from "./assert-text-within-bytes";
import { orderPoints } from "./order-points";
import { parseNumberCell } from "./parse-number-cell";
import type { LabelUnit } from "./read-axis-label";
import { resolveXUnit } from "./resolve-x-unit";
import { SpectrumParseError } from "./spectrum-parse-error";
import {
  DEFAULT_MAX_BYTES,
  DEFAULT_MAX_POINTS,
  DEFAULT_MIN_POINTS,
  type SpectrumReadOptions,
} from "./spectrum-read-options";

export interface ParseJcampOptions extends SpectrumReadOptions {
  /**
   * Which spectrum to read, 0-based, when the file (a LINK block) holds several.
   * @default 0
   */
  blockIndex?: number;
}

interface DataBlock {
  /** 1-based line of the ##XYDATA= / ##XYPOINTS= / ##PEAK TABLE= label. */
  labelLine: number;
  form: "XYDATA" | "XYPOINTS" | "PEAKTABLE";
  /** 0-based indexes of the lines that hold the block's numbers. */
  firstLine: number;
  endLine: number;
  /** For (XY..XY) blocks: the 1-based line of each point, as scanned by us. */
  pointLines?: number[];
}

/** Characters of the ASDF forms of XYDATA (AFFN, PAC, SQZ, DIF, DUP); anything else is a typing error. */
const ASDF_CHARACTER = /[^0-9 \t+\-.,;@%A-Za-s]/;
const PAIR_SEPARATOR = /[\s,;]+/;

const XUNITS: Record<string, LabelUnit> = {
  NANOMETERS: "nm",
  NANOMETRES: "nm",
  NM: "nm",
  "1/CM": "wavenumber",
  "CM-1": "wavenumber",
  "CM^-1": "wavenumber",
  MICROMETERS: "micrometre",
  MICROMETRES: "micrometre",
  MICRONS: "micrometre",
  UM: "micrometre",
  ANGSTROMS: "angstrom",
  ANGSTROM: "angstrom",
  A: "angstrom",
  PIXEL: "pixel",
  PIXELS: "pixel",
  CHANNEL: "pixel",
  CHANNELS: "pixel",
};
const UNSTATED_XUNITS = new Set(["", "ARBITRARY UNITS", "ARBITRARY", "AU", "A.U.", "NONE"]);
/** Labels whose values are the data themselves, not metadata. */
const DATA_LABELS = new Set(["XYDATA", "XYPOINTS", "PEAKTABLE", "END"]);

/**
 * The spectrum in the JCAMP-DX `text`. XUNITS gives the x unit (MICROMETERS are scaled to nm); for
 * ARBITRARY UNITS or no XUNITS, `options.xUnit` must say. The labels (TITLE, ORIGIN, OWNER, DATE, …)
 * go into `meta`; a user label ##$MEDIUM=AIR|VACUUM gives the medium.
 */
export function parseJcamp(text: string, options: ParseJcampOptions = {}): Spectrum {
  const {
    blockIndex = 0,
    maxBytes = DEFAULT_MAX_BYTES,
    maxPoints = DEFAULT_MAX_POINTS,
    minPoints = DEFAULT_MIN_POINTS,
  } = options;
  assertReadOptions(options);
  if (!Number.isInteger(blockIndex) || blockIndex < 0) {
    throw new RangeError(`blockIndex must be a non-negative integer, got ${String(blockIndex)}`);
  }
  if (typeof text !== "string") throw new RangeError("text must be a string");
  assertTextWithinBytes(text, maxBytes);

  const lines = (text.charCodeAt(0) === 0xfeff ? text.slice(1) : text).split(/\r\n|\r|\n/);
  const blocks = findDataBlocks(lines);
  if (blocks.length === 0 && !lines.some((line) => line.trimStart().startsWith("##"))) {
    throw new SpectrumParseError("jcamp-structure", "not a JCAMP-DX file: no ##LABEL= lines");
  }
  const block = blocks[blockIndex];
  if (block === undefined) {
    const found =
      blocks.length === 0
        ? "no ##XYDATA=, ##XYPOINTS= or ##PEAK TABLE= block"
        : `only ${blocks.length} data blocks`;
    throw new SpectrumParseError("jcamp-structure", `the file has ${found}`);
  }
  for (const each of blocks) scanDataBlock(lines, each);

  // jcampconverter reads (XY..XY) data only under PEAK TABLE; the layout is the same, so relabel (same line count).
  const forPackage = lines.map((line, i) =>
    blocks.some((b) => b.form === "XYPOINTS" && b.labelLine === i + 1)
      ? line.replace(/XY[ _-]*POINTS/i, "PEAK TABLE")
      : line,
  );
  let converted;
  try {
    converted = convert(forPackage.join("\n"), { keepRecordsRegExp: /.*/ });
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    throw new SpectrumParseError("jcamp-structure", `the JCAMP-DX reader failed: ${reason}`);
  }
  const found = converted.flatten.flatMap((entry) =>
    entry.spectra.map((spectrum) => ({ entry, spectrum })),
  );
  const chosen = found[blockIndex];
  if (chosen === undefined) {
    throw new SpectrumParseError(
      "jcamp-structure",
      "the data block could not be decoded",
      block.labelLine,
      null,
    );
  }
  const { entry, spectrum: decoded } = chosen;
  const xValues = decoded.data?.x ?? [];
  const yValues = decoded.data?.y ?? [];
  const declared = numberLabel(entry.info.NPOINTS);
  if (xValues.length !== yValues.length) {
    throw new SpectrumParseError(
      "jcamp-structure",
      `the block decodes to ${xValues.length} x but ${yValues.length} y values`,
      block.labelLine,
      null,
    );
  }
  if (declared !== undefined && declared !== xValues.length) {
    throw new SpectrumParseError(
      "jcamp-structure",
      `NPOINTS says ${declared} but the ${block.form} block holds ${xValues.length} points`,
      block.labelLine,
      null,
    );
  }
  if (xValues.length > maxPoints) {
    throw new SpectrumParseError(
      "too-large",
      `${xValues.length} points is more than the limit of ${maxPoints}`,
      block.labelLine,
      null,
    );
  }
  if (xValues.length < minPoints) {
    throw new SpectrumParseError(
      "too-few-points",
      `found ${xValues.length} points; at least ${minPoints} are needed`,
      block.labelLine,
      null,
    );
  }
  const x = Float64Array.from(xValues);
  const y = Float64Array.from(yValues);
  const lineOf = (index: number): number | null => block.pointLines?.[index] ?? null;
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) {
      throw new SpectrumParseError(
        "not-finite",
        `point ${i + 1} decodes to x = ${x[i]}, y = ${y[i]}`,
        lineOf(i) ?? block.labelLine,
        null,
      );
    }
  }
  if (block.form === "XYDATA") checkFirstX(lines, block, decoded.xFactor ?? 1, x[0]);

  const xUnitsText = String(decoded.xUnits ?? entry.info.XUNITS ?? "").trim();
  const xUnitsKey = xUnitsText.toUpperCase();
  const fileUnit = XUNITS[xUnitsKey];
  if (fileUnit === undefined && !UNSTATED_XUNITS.has(xUnitsKey) && options.xUnit === undefined) {
    throw new SpectrumParseError(
      "unit-unknown",
      `XUNITS=${xUnitsText} is not a spectral axis this reader knows (nm, Å, µm, 1/cm, pixels); state options.xUnit to read it anyway`,
      labelLine(lines, "XUNITS"),
      null,
    );
  }
  const mediumText = String(entry.meta.MEDIUM ?? "")
    .trim()
    .toUpperCase();
  const resolved = resolveXUnit({
    fileUnit,
    fileMedium: mediumText === "AIR" ? "air" : mediumText === "VACUUM" ? "vacuum" : undefined,
    fileText: `XUNITS=${xUnitsText || "(none)"}`,
    line: labelLine(lines, "XUNITS"),
    statedUnit: options.xUnit,
    statedMedium: options.medium,
    x,
  });
  const ordered = orderPoints(x, y, { lineOf });
  if (resolved.scale !== 1)
    for (let i = 0; i < ordered.x.length; i++) ordered.x[i] *= resolved.scale;

  const meta: Record<string, string> = {};
  for (const [label, value] of Object.entries(entry.info)) {
    if (!DATA_LABELS.has(label) && value !== undefined) meta[label] = String(value);
  }
  for (const [label, value] of Object.entries(entry.meta)) {
    if (value !== undefined) meta[`$${label}`] = String(value);
  }
  meta.xUnitSource = resolved.source;
  if (resolved.unitInFile) meta.xUnitInFile = resolved.unitInFile;
  if (ordered.reversed) meta.xReversed = "true";
  const spectrum: Spectrum = { x: ordered.x, y: ordered.y, xUnit: resolved.xUnit, meta };
  if (resolved.medium !== undefined) spectrum.medium = resolved.medium;
  return spectrum;
}

function canonicalLabel(line: string): string | undefined {
  const trimmed = line.trimStart();
  if (!trimmed.startsWith("##")) return undefined;
  const equals = trimmed.indexOf("=");
  if (equals < 0) return undefined;
  return trimmed
    .slice(2, equals)
    .replace(/[\s_-]/g, "")
    .toUpperCase();
}

function labelLine(lines: string[], label: string): number | null {
  const index = lines.findIndex((line) => canonicalLabel(line) === label);
  return index < 0 ? null : index + 1;
}

function findDataBlocks(lines: string[]): DataBlock[] {
  const blocks: DataBlock[] = [];
  for (let i = 0; i < lines.length; i++) {
    const label = canonicalLabel(lines[i]);
    if (label !== "XYDATA" && label !== "XYPOINTS" && label !== "PEAKTABLE") continue;
    let end = i + 1;
    while (end < lines.length && !lines[end].trimStart().startsWith("##")) end++;
    blocks.push({ labelLine: i + 1, form: label, firstLine: i + 1, endLine: end });
  }
  return blocks;
}

/** Refuses characters that no ASDF form allows, and (XY..XY) values that are not numbers, at their line. */
function scanDataBlock(lines: string[], block: DataBlock): void {
  const pointLines: number[] = [];
  for (let i = block.firstLine; i < block.endLine; i++) {
    const line = stripComment(lines[i]);
    if (block.form === "XYDATA") {
      const bad = ASDF_CHARACTER.exec(line);
      if (bad) {
        throw new SpectrumParseError(
          "non-numeric",
          `"${bad[0]}" cannot appear in XYDATA`,
          i + 1,
          bad.index + 1,
        );
      }
      continue;
    }
    const tokens = line
      .trim()
      .split(PAIR_SEPARATOR)
      .filter((token) => token.length > 0);
    let column = 0;
    for (const token of tokens) {
      column = line.indexOf(token, column);
      if (Number.isNaN(parseNumberCell(token, "."))) {
        throw new SpectrumParseError(
          "non-numeric",
          `"${token}" is not a number`,
          i + 1,
          column + 1,
        );
      }
      column += token.length;
    }
    if (tokens.length % 2 !== 0) {
      throw new SpectrumParseError(
        "column-count",
        `an x without its y (${tokens.length} values on the line)`,
        i + 1,
        null,
      );
    }
    for (let t = 0; t < tokens.length; t += 2) pointLines.push(i + 1);
  }
  if (block.form !== "XYDATA") block.pointLines = pointLines;
}

function stripComment(line: string): string {
  const comment = line.indexOf("$$");
  return comment < 0 ? line : line.slice(0, comment);
}

/** The X that opens the first XYDATA line, times XFACTOR, must be FIRSTX (JCAMP-DX's own abscissa check). */
function checkFirstX(lines: string[], block: DataBlock, xFactor: number, firstX: number): void {
  for (let i = block.firstLine; i < block.endLine; i++) {
    const line = stripComment(lines[i]).trim();
    if (line.length === 0) continue;
    let end = 0;
    while (
      end < line.length &&
      /[0-9+\-.]/.test(line[end]) &&
      (end === 0 || (line[end] !== "+" && line[end] !== "-"))
    )
      end++;
    const checkX = Number(line.slice(0, end)) * xFactor;
    if (
      end > 0 &&
      Number.isFinite(checkX) &&
      Math.abs(checkX - firstX) > Math.abs(xFactor) + 1e-6 * Math.abs(firstX)
    ) {
      throw new SpectrumParseError(
        "jcamp-structure",
        `the first X value (${checkX}) does not match FIRSTX (${firstX})`,
        i + 1,
        1,
      );
    }
    return;
  }
}

function numberLabel(value: unknown): number | undefined {
  const number =
    typeof value === "number" ? value : typeof value === "string" ? Number(value) : NaN;
  return Number.isFinite(number) ? number : undefined;
}
