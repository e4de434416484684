// Reads a JCAMP-DX spectrum with the project's own decoder: ##XYDATA=(X++(Y..Y)) in every ASDF form, and
// (XY..XY) under ##XYPOINTS= or ##PEAK TABLE=. Every limit is checked while decoding, every factor and
// axis value before it is used, and each refusal is a SpectrumParseError at its line.
import type { Spectrum } from "../types";
import { assertPhysicalAxis } from "./assert-physical-axis";
import { assertReadOptions } from "./assert-read-options";
import { assertTextWithinBytes } from "./assert-text-within-bytes";
import { decodeJcampXyData, type DecodeJcampXyDataOptions } from "./decode-jcamp-xy-data";
import { decodeJcampXyPoints } from "./decode-jcamp-xy-points";
import { describeBadCell } from "./describe-bad-cell";
import { orderPoints } from "./order-points";
import { parseNumberCell } from "./parse-number-cell";
import type { LabelUnit } from "./read-axis-label";
import { readJcampStructure, type JcampDataBlock, type JcampLabel } from "./read-jcamp-structure";
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
/** The variable lists this reader takes, blanks removed. */
const VARIABLES: Record<JcampDataBlock["form"], string> = {
  XYDATA: "(X++(Y..Y))",
  XYPOINTS: "(XY..XY)",
  PEAKTABLE: "(XY..XY)",
};
/** A scale factor further than 30 decades from 1 scales no measured spectrum; such a file is broken or hostile. */
const LARGEST_FACTOR = 1e30;
/** DELTAX is often written rounded; more than 1 % from the step FIRSTX, LASTX and NPOINTS give is a contradiction. */
const DELTAX_TOLERANCE = 0.01;
/** A line's X may sit this many steps (plus XFACTOR for its rounding) from its first Y before points are missing. */
const LINE_X_TOLERANCE_STEPS = 1.5;

/**
 * The spectrum in the JCAMP-DX `text`. XUNITS gives the x unit (MICROMETERS are scaled to nm); for
 * ARBITRARY UNITS or no XUNITS, `options.xUnit` (or the fallback and pixel-count options, as for text)
 * must say. The labels (TITLE, ORIGIN, OWNER, DATE, …)
 * go into `meta` as written; a user label ##$MEDIUM=AIR|VACUUM gives the medium.
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

  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const { blocks, hasLabelLines } = readJcampStructure(body);
  if (blocks.length === 0 && !hasLabelLines) {
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
  const labels = new Map<string, JcampLabel>();
  for (const label of block.labels) labels.set(label.key, label);

  const variables = block.variables.replace(/\s/g, "").toUpperCase();
  if (variables !== VARIABLES[block.form]) {
    throw new SpectrumParseError(
      "jcamp-structure",
      `##${block.form === "PEAKTABLE" ? "PEAK TABLE" : block.form}=${block.variables || "(nothing)"}: this reader takes only ${VARIABLES[block.form]}`,
      block.labelLine,
      null,
    );
  }
  const xFactor = readFactor(labels.get("XFACTOR"));
  const yFactor = readFactor(labels.get("YFACTOR"));
  const declared = readPointCount(labels.get("NPOINTS"), maxPoints);
  const decodeRange = {
    start: block.start,
    end: block.end,
    firstLineNumber: block.firstLineNumber,
    maxPoints,
    declaredPoints: declared,
  };

  let x: Float64Array;
  let y: Float64Array;
  let lineOf: (index: number) => number | null;
  if (block.form === "XYDATA") {
    const axis = readAxisLabels(labels, block);
    const lineX = lineXChecker(axis, xFactor, declared);
    const decoded = decodeJcampXyData(body, { ...decodeRange, onLine: lineX.check });
    checkPointCount(decoded.y.length, declared, minPoints, block);
    x = placeXyData(decoded.y.length, axis, block);
    lineX.checkLast(x);
    y = decoded.y;
    lineOf = (index) => lineOfXyDataValue(body, decodeRange, index);
  } else {
    const decoded = decodeJcampXyPoints(body, decodeRange);
    checkPointCount(decoded.x.length, declared, minPoints, block);
    x = decoded.x;
    y = decoded.y;
    if (xFactor !== 1) for (let i = 0; i < x.length; i++) x[i] *= xFactor;
    lineOf = (index) => decoded.lines[index] ?? null;
  }
  if (yFactor !== 1) for (let i = 0; i < y.length; i++) y[i] *= yFactor;
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

  const xUnitsLabel = labels.get("XUNITS");
  const xUnitsText = (xUnitsLabel?.value ?? "").trim();
  const xUnitsKey = xUnitsText.toUpperCase();
  const fileUnit = XUNITS[xUnitsKey];
  const xUnitsLine = xUnitsLabel?.line ?? null;
  if (fileUnit === undefined && !UNSTATED_XUNITS.has(xUnitsKey) && options.xUnit === undefined) {
    throw new SpectrumParseError(
      "unit-unknown",
      `XUNITS=${xUnitsText} is not a spectral axis this reader knows (nm, Å, µm, 1/cm, pixels); state the unit of the first column to read it anyway`,
      xUnitsLine,
      null,
    );
  }
  const mediumText = (labels.get("$MEDIUM")?.value ?? "").trim().toUpperCase();
  const resolved = resolveXUnit({
    fileUnit,
    fileMedium: mediumText === "AIR" ? "air" : mediumText === "VACUUM" ? "vacuum" : undefined,
    fileText: `XUNITS=${xUnitsText || "(none)"}`,
    line: xUnitsLine,
    statedUnit: options.xUnit,
    statedMedium: options.medium,
    fallbackUnit: options.fallbackXUnit,
    fallbackMedium: options.fallbackMedium,
    pixelCount: options.pixelCount,
    x,
  });
  if (resolved.scale !== 1) for (let i = 0; i < x.length; i++) x[i] *= resolved.scale;
  assertPhysicalAxis(x, resolved.xUnit, { lineOf });
  const ordered = orderPoints(x, y, { lineOf });

  const meta: Record<string, string> = {};
  for (const label of block.labels) {
    if (label.key === "END") continue;
    const name = label.key.startsWith("$") ? `$${label.name.slice(1).trim()}` : label.key;
    meta[name] = label.value;
  }
  meta.xUnitSource = resolved.source;
  if (resolved.unitInFile) meta.xUnitInFile = resolved.unitInFile;
  if (ordered.reversed) meta.xReversed = "true";
  const spectrum: Spectrum = { x: ordered.x, y: ordered.y, xUnit: resolved.xUnit, meta };
  if (resolved.medium !== undefined) spectrum.medium = resolved.medium;
  return spectrum;
}

/** The number a label holds, or a located error when it holds anything else. */
function readNumber(label: JcampLabel): number {
  const value = parseNumberCell(label.value, ".");
  if (!Number.isNaN(value)) return value;
  const bad = describeBadCell(label.value, label.line, 1, ".");
  const shown = label.value.length > 40 ? `${label.value.slice(0, 40)}…` : label.value;
  const problem = bad.code === "not-finite" ? "is not a finite number" : "is not a number";
  throw new SpectrumParseError(
    bad.code === "not-finite" ? "not-finite" : "non-numeric",
    `${label.name}=${shown} ${problem}`,
    label.line,
    null,
  );
}

/** XFACTOR or YFACTOR: 1 when absent; refused when zero, not finite, or absurdly large or small. */
function readFactor(label: JcampLabel | undefined): number {
  if (label === undefined) return 1;
  const factor = readNumber(label);
  const size = Math.abs(factor);
  if (size === 0 || size > LARGEST_FACTOR || size < 1 / LARGEST_FACTOR) {
    throw new SpectrumParseError(
      "out-of-range",
      `${label.name}=${factor} cannot scale a spectrum: a factor must be non-zero and between 1e-30 and 1e30 in size`,
      label.line,
      null,
    );
  }
  return factor;
}

/** NPOINTS as a whole number within the point limit, refused before any data is decoded; undefined when absent. */
function readPointCount(label: JcampLabel | undefined, maxPoints: number): number | undefined {
  if (label === undefined) return undefined;
  const count = readNumber(label);
  if (!Number.isInteger(count) || count < 0) {
    throw new SpectrumParseError(
      "jcamp-structure",
      `${label.name}=${count} is not a whole number of points`,
      label.line,
      null,
    );
  }
  if (count > maxPoints) {
    throw new SpectrumParseError(
      "too-large",
      `${label.name}=${count} is more than the limit of ${maxPoints} points`,
      label.line,
      null,
    );
  }
  return count;
}

function checkPointCount(
  count: number,
  declared: number | undefined,
  minPoints: number,
  block: JcampDataBlock,
): void {
  if (declared !== undefined && declared !== count) {
    throw new SpectrumParseError(
      "jcamp-structure",
      `NPOINTS says ${declared} but the ${block.form} block holds ${count} points`,
      block.labelLine,
      null,
    );
  }
  if (count < minPoints) {
    throw new SpectrumParseError(
      "too-few-points",
      `found ${count} points; at least ${minPoints} are needed`,
      block.labelLine,
      null,
    );
  }
}

interface AxisLabels {
  firstX: number;
  lastX?: number;
  deltaX?: number;
  lastLine: number | null;
  deltaLine: number | null;
}

/** FIRSTX and LASTX or DELTAX, read (and refused) before any data is decoded. */
function readAxisLabels(labels: Map<string, JcampLabel>, block: JcampDataBlock): AxisLabels {
  const firstLabel = labels.get("FIRSTX");
  const lastLabel = labels.get("LASTX");
  const deltaLabel = labels.get("DELTAX");
  if (firstLabel === undefined) {
    throw new SpectrumParseError(
      "jcamp-structure",
      "XYDATA needs ##FIRSTX= to place its points",
      block.labelLine,
      null,
    );
  }
  const firstX = readNumber(firstLabel);
  const lastX = lastLabel === undefined ? undefined : readNumber(lastLabel);
  const deltaX = deltaLabel === undefined ? undefined : readNumber(deltaLabel);
  if (lastX === undefined && deltaX === undefined) {
    throw new SpectrumParseError(
      "jcamp-structure",
      "XYDATA needs ##LASTX= or ##DELTAX= to place its points",
      block.labelLine,
      null,
    );
  }
  return {
    firstX,
    lastX,
    deltaX,
    lastLine: lastLabel?.line ?? null,
    deltaLine: deltaLabel?.line ?? null,
  };
}

/**
 * The x of each XYDATA point from FIRSTX and LASTX (or DELTAX), after checking that they agree with each
 * other and with the number of points.
 */
function placeXyData(n: number, axis: AxisLabels, block: JcampDataBlock): Float64Array {
  const { firstX, lastX, deltaX } = axis;
  let step: number;
  if (lastX !== undefined) {
    step = (lastX - firstX) / (n - 1);
    if (!(step !== 0) || !Number.isFinite(step)) {
      throw new SpectrumParseError(
        "jcamp-structure",
        `FIRSTX=${firstX} and LASTX=${lastX} cannot place ${n} distinct points`,
        axis.lastLine ?? block.labelLine,
        null,
      );
    }
    if (deltaX !== undefined && !(Math.abs(deltaX - step) <= DELTAX_TOLERANCE * Math.abs(step))) {
      throw new SpectrumParseError(
        "jcamp-structure",
        `DELTAX=${deltaX} disagrees with (LASTX − FIRSTX)/(NPOINTS − 1) = ${step}`,
        axis.deltaLine ?? block.labelLine,
        null,
      );
    }
  } else {
    step = deltaX ?? 0;
    if (step === 0) {
      throw new SpectrumParseError(
        "jcamp-structure",
        "DELTAX=0 would put every point at the same x",
        axis.deltaLine ?? block.labelLine,
        null,
      );
    }
  }
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = firstX + i * step;
  if (lastX !== undefined) x[n - 1] = lastX;
  return x;
}

/**
 * JCAMP-DX's abscissa check, line by line as the decoder reads: the X that opens a line, times XFACTOR,
 * is the x of its first ordinate. The first line must match FIRSTX to within XFACTOR (the X is rounded
 * to it); later lines may sit LINE_X_TOLERANCE_STEPS steps off before points are counted as lost. When
 * the step is known only once the points are counted (LASTX without NPOINTS or DELTAX), the last line
 * is checked then.
 */
function lineXChecker(axis: AxisLabels, xFactor: number, declared: number | undefined) {
  const { firstX, lastX, deltaX } = axis;
  const knownStep =
    deltaX !== undefined && deltaX !== 0
      ? deltaX
      : lastX !== undefined && declared !== undefined && declared > 1
        ? (lastX - firstX) / (declared - 1)
        : undefined;
  let lines = 0;
  // The last line, in plain variables: an object a line would be millions of objects for a hostile file.
  let lastLineNumber = 0;
  let lastLineX = 0;
  let lastPointIndex = 0;
  const verify = (lineNumber: number, checkX: number, expected: number, step: number) => {
    const first = lines === 1;
    const slack =
      Math.abs(xFactor) +
      1e-6 * Math.abs(expected) +
      (first ? 0 : LINE_X_TOLERANCE_STEPS * Math.abs(step));
    if (Number.isFinite(checkX) && Math.abs(checkX - expected) <= slack) return;
    throw new SpectrumParseError(
      "jcamp-structure",
      first
        ? `the first X value (${checkX}) does not match FIRSTX (${firstX})`
        : `the line's X value (${checkX}) is not where its first Y falls (x = ${expected}); points are missing or extra`,
      lineNumber,
      1,
    );
  };
  return {
    check: (lineNumber: number, x: number, pointIndex: number) => {
      lines++;
      lastLineNumber = lineNumber;
      lastLineX = x;
      lastPointIndex = pointIndex;
      if (lines === 1) verify(lineNumber, x * xFactor, firstX, 0);
      else if (knownStep !== undefined)
        verify(lineNumber, x * xFactor, firstX + pointIndex * knownStep, knownStep);
    },
    checkLast: (placed: Float64Array) => {
      if (lines < 2 || knownStep !== undefined) return;
      const step = (placed[placed.length - 1] - placed[0]) / (placed.length - 1);
      const index = Math.min(lastPointIndex, placed.length - 1);
      verify(lastLineNumber, lastLineX * xFactor, placed[index], step);
    },
  };
}

const FOUND = new Error("found");

/** The file line that holds value `index` of an XYDATA block, found by reading it again (on refusals only). */
function lineOfXyDataValue(
  body: string,
  range: DecodeJcampXyDataOptions,
  index: number,
): number | null {
  let found: number | null = null;
  try {
    decodeJcampXyData(body, {
      ...range,
      onLine: (lineNumber, _x, _pointIndex, firstValueIndex) => {
        if (firstValueIndex > index) throw FOUND;
        found = lineNumber;
      },
    });
  } catch (error) {
    if (error !== FOUND && !(error instanceof SpectrumParseError)) throw error;
  }
  return found;
}
