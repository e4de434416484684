// Reads two-column spectrum text (CSV, TSV, semicolons or whitespace; point or comma decimals) into a Spectrum.
// Every refusal is a SpectrumParseError naming the line and column; nothing is guessed silently.
import Papa from "papaparse";
import type { Spectrum } from "../types";
import { assertReadOptions } from "./assert-read-options";
import { assertTextWithinBytes } from "./assert-text-within-bytes";
import { describeBadCell } from "./describe-bad-cell";
import { orderPoints } from "./order-points";
import { parseNumberCell } from "./parse-number-cell";
import { readAxisLabel, type AxisLabelReading } from "./read-axis-label";
import { resolveXUnit } from "./resolve-x-unit";
import { scanDataRows } from "./scan-data-rows";
import { SpectrumParseError } from "./spectrum-parse-error";
import type { TextDelimiter } from "./text-delimiter";
import {
  DEFAULT_MAX_BYTES,
  DEFAULT_MAX_POINTS,
  DEFAULT_MIN_POINTS,
  type SpectrumReadOptions,
} from "./spectrum-read-options";

export interface ParseSpectrumTextOptions extends SpectrumReadOptions {
  /**
   * 1-based column holding x (pixel, wavelength or wavenumber).
   * @default 1
   */
  xColumn?: number;
  /**
   * 1-based column holding the counts.
   * @default 2
   */
  yColumn?: number;
  /**
   * Column separator; detected from the data rows when left out.
   * @default undefined (detected)
   */
  delimiter?: TextDelimiter;
  /**
   * Decimal separator; detected from the data rows when left out.
   * @default undefined (detected)
   */
  decimalSeparator?: "." | ",";
  /**
   * Lines to skip at the top of the file before anything is read (an instrument's preamble).
   * @default 0
   */
  skipLines?: number;
  /**
   * How data rows are read: "scan" reads them straight from the text into typed arrays and hands any
   * file it finds unusual to "lines", which splits the text into lines and cells. Both give the same
   * spectrum and the same errors; "lines" exists so that tests can hold "scan" to it.
   * @default "scan"
   */
  rowReader?: "scan" | "lines";
}

const DELIMITER_CHARACTERS: Record<TextDelimiter, string> = {
  tab: "\t",
  semicolon: ";",
  comma: ",",
  whitespace: " ",
};
/** Tried in this order; the first of equally good layouts wins. */
const LAYOUTS: ReadonlyArray<readonly [TextDelimiter, "." | ","]> = [
  ["tab", "."],
  ["tab", ","],
  ["semicolon", "."],
  ["semicolon", ","],
  ["comma", "."],
  ["comma", ","],
  ["whitespace", "."],
  ["whitespace", ","],
];
const SAMPLE_ROWS = 64;
/** Rows above the data that hold no number at all are headers (names, then perhaps units). */
const MAX_HEADER_ROWS = 3;
const MAX_COMMENT_LINES_KEPT = 50;

const enum LineKind {
  Ignored = 0,
  Content = 1,
  /** Starts with ";": a comment unless ";" separates the columns. */
  SemicolonLead = 2,
  Comment = 3,
}

/**
 * The spectrum in `text`. The x unit comes from the header ("wavelength (nm)", "pixel", "1/cm", …),
 * from `options.xUnit`, from `options.fallbackXUnit`, or (with `options.pixelCount`) from values that
 * are exactly the detector's pixel indices; with none of these, it throws "unit-unknown" rather than
 * guess. A file whose x runs downward is returned reversed, so x is strictly increasing.
 */
export function parseSpectrumText(text: string, options: ParseSpectrumTextOptions = {}): Spectrum {
  const {
    xColumn = 1,
    yColumn = 2,
    skipLines = 0,
    maxBytes = DEFAULT_MAX_BYTES,
    maxPoints = DEFAULT_MAX_POINTS,
    minPoints = DEFAULT_MIN_POINTS,
  } = options;
  assertReadOptions(options);
  assertColumn(xColumn, "xColumn");
  assertColumn(yColumn, "yColumn");
  if (xColumn === yColumn) throw new RangeError(`xColumn and yColumn are both ${xColumn}`);
  if (!Number.isInteger(skipLines) || skipLines < 0) {
    throw new RangeError(`skipLines must be a non-negative integer, got ${String(skipLines)}`);
  }
  if (options.delimiter !== undefined && !(options.delimiter in DELIMITER_CHARACTERS)) {
    throw new RangeError(`unknown delimiter ${JSON.stringify(options.delimiter)}`);
  }
  if (
    options.decimalSeparator !== undefined &&
    options.decimalSeparator !== "." &&
    options.decimalSeparator !== ","
  ) {
    throw new RangeError(
      `decimalSeparator must be "." or ",", got ${JSON.stringify(options.decimalSeparator)}`,
    );
  }
  if (typeof text !== "string") throw new RangeError("text must be a string");
  const { rowReader = "scan" } = options;
  if (rowReader !== "scan" && rowReader !== "lines") {
    throw new RangeError(`rowReader must be "scan" or "lines", got ${JSON.stringify(rowReader)}`);
  }
  assertTextWithinBytes(text, maxBytes);

  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const settings: ReadSettings = {
    xIndex: xColumn - 1,
    yIndex: yColumn - 1,
    skipLines,
    maxPoints,
    minPoints,
    options,
  };
  if (rowReader === "scan") {
    const scanned = readByScanning(body, settings);
    if (scanned) return scanned;
  }
  const lines = body.split(/\r\n|\r|\n/);
  const layout = readLayout(lines, settings);
  return finish(lines, layout, readRowsByLines(lines, layout, settings), settings);
}

interface ReadSettings {
  xIndex: number;
  yIndex: number;
  skipLines: number;
  maxPoints: number;
  minPoints: number;
  options: ParseSpectrumTextOptions;
}

/** What the lines above and at the first data row say about the whole file. */
interface TextLayout {
  kinds: Uint8Array;
  delimiter: TextDelimiter;
  decimal: "." | ",";
  split: Splitter;
  headerLines: number[];
  firstDataLine: number;
  columnCount: number;
}

interface DataRows {
  x: Float64Array;
  y: Float64Array;
  /** 1-based file line of each row. */
  lines: Int32Array;
}

/**
 * The spectrum read with the row scanner after the layout is taken from the first lines, or null when
 * anything is unusual; the line reader then reads the file again and names the problem.
 */
function readByScanning(body: string, settings: ReadSettings): Spectrum | null {
  const head = splitHead(body, settings.skipLines);
  let layout: TextLayout;
  try {
    layout = readLayout(head.lines, settings);
  } catch (error) {
    if (error instanceof SpectrumParseError) return null;
    throw error;
  }
  const rows = scanDataRows(body, {
    start: head.starts[layout.firstDataLine],
    firstLine: layout.firstDataLine + 1,
    delimiter: layout.delimiter,
    decimalSeparator: layout.decimal,
    columnCount: layout.columnCount,
    xIndex: settings.xIndex,
    yIndex: settings.yIndex,
    maxRows: settings.maxPoints,
  });
  // Errors after the rows (too few points, units, order) come out the same from either reader.
  return rows && finish(head.lines, layout, rows, settings);
}

/**
 * The first lines of `body`, split as the line reader splits them, up to the line that completes the
 * layout sample (which also holds the header rows and the first data row), with each line's offset.
 */
function splitHead(body: string, skipLines: number): { lines: string[]; starts: number[] } {
  const lines: string[] = [];
  const starts: number[] = [];
  let contentLines = 0;
  let position = 0;
  for (;;) {
    let end = position;
    let code = body.charCodeAt(end);
    while (end < body.length && code !== 10 && code !== 13) code = body.charCodeAt(++end);
    const line = body.slice(position, end);
    if (lines.length >= skipLines && classifyLine(line) === LineKind.Content) contentLines++;
    lines.push(line);
    starts.push(position);
    if (end >= body.length || contentLines > SAMPLE_ROWS) return { lines, starts };
    position = end + (code === 13 && body.charCodeAt(end + 1) === 10 ? 2 : 1);
  }
}

/** Layout, header rows and first data row; throws the located errors these can raise. */
function readLayout(lines: string[], settings: ReadSettings): TextLayout {
  const { xIndex, yIndex, skipLines, options } = settings;
  const kinds = classifyLines(lines, skipLines);
  const content: number[] = [];
  for (let i = 0; i < lines.length; i++) if (kinds[i] === LineKind.Content) content.push(i);
  if (content.length === 0) throw new SpectrumParseError("empty", "the text holds no data rows");

  const sample = content.slice(content.length > 1 ? 1 : 0, SAMPLE_ROWS + 1).map((i) => lines[i]);
  const [delimiter, decimal] = chooseLayout(
    sample,
    [xIndex, yIndex],
    options.delimiter,
    options.decimalSeparator,
  );
  const split = splitterFor(delimiter);
  if (delimiter === "semicolon") {
    for (let i = 0; i < lines.length; i++)
      if (kinds[i] === LineKind.SemicolonLead) kinds[i] = LineKind.Content;
  }

  // Header rows: the leading content rows in which not one cell is a number.
  const headerLines: number[] = [];
  let firstDataLine = -1;
  for (let i = 0; i < lines.length; i++) {
    if (kinds[i] !== LineKind.Content) continue;
    if (
      headerLines.length < MAX_HEADER_ROWS &&
      split(lines[i]).every((cell) => Number.isNaN(parseNumberCell(cell, decimal)))
    ) {
      headerLines.push(i);
      continue;
    }
    firstDataLine = i;
    break;
  }
  if (firstDataLine < 0)
    throw new SpectrumParseError("empty", "the text holds a header but no data rows");

  const columnCount = split(lines[firstDataLine]).length;
  if (columnCount < 2) {
    throw new SpectrumParseError(
      "column-count",
      `only one column found (separator ${delimiter}); a spectrum needs x and y columns`,
      firstDataLine + 1,
      null,
    );
  }
  if (columnCount <= Math.max(xIndex, yIndex)) {
    throw new SpectrumParseError(
      "column-count",
      `found ${columnCount} columns but column ${Math.max(xIndex, yIndex) + 1} was asked for`,
      firstDataLine + 1,
      null,
    );
  }
  return { kinds, delimiter, decimal, split, headerLines, firstDataLine, columnCount };
}

/** Every data row, cell by cell; the reference reader, and the one that locates every refusal. */
function readRowsByLines(lines: string[], layout: TextLayout, settings: ReadSettings): DataRows {
  const { kinds, split, decimal, firstDataLine, columnCount } = layout;
  const { xIndex, yIndex, maxPoints } = settings;
  let rowCount = 0;
  for (let i = firstDataLine; i < lines.length; i++) {
    if (kinds[i] !== LineKind.Content) continue;
    if (++rowCount > maxPoints) {
      throw new SpectrumParseError(
        "too-large",
        `more than the limit of ${maxPoints} data rows`,
        i + 1,
        null,
      );
    }
  }

  const xs = new Float64Array(rowCount);
  const ys = new Float64Array(rowCount);
  const lineNumbers = new Int32Array(rowCount);
  let n = 0;
  for (let i = firstDataLine; i < lines.length; i++) {
    if (kinds[i] !== LineKind.Content) continue;
    const cells = split(lines[i]);
    if (cells.length !== columnCount) {
      const hint = lines[i].trimStart().startsWith(";")
        ? ` (a line starting with ";" is a comment only when ";" does not separate the columns)`
        : "";
      throw new SpectrumParseError(
        "column-count",
        `expected ${columnCount} columns as on line ${firstDataLine + 1}, found ${cells.length}${hint}`,
        i + 1,
        cells.length < columnCount ? cells.length + 1 : columnCount + 1,
      );
    }
    const x = parseNumberCell(cells[xIndex], decimal);
    if (Number.isNaN(x)) {
      if (cells[xIndex] === "" && lines[i].trimStart().startsWith(";")) {
        throw new SpectrumParseError(
          "empty-cell",
          `the cell is empty (a line starting with ";" is a comment only when ";" does not separate the columns)`,
          i + 1,
          xIndex + 1,
        );
      }
      throw describeBadCell(cells[xIndex], i + 1, xIndex + 1, decimal);
    }
    const y = parseNumberCell(cells[yIndex], decimal);
    if (Number.isNaN(y)) throw describeBadCell(cells[yIndex], i + 1, yIndex + 1, decimal);
    xs[n] = x;
    ys[n] = y;
    lineNumbers[n] = i + 1;
    n++;
  }
  return { x: xs, y: ys, lines: lineNumbers };
}

/** Point count, x unit, order and metadata: the same for whichever reader produced the rows. */
function finish(
  lines: string[],
  layout: TextLayout,
  rows: DataRows,
  settings: ReadSettings,
): Spectrum {
  const { kinds, delimiter, decimal, split, headerLines, firstDataLine, columnCount } = layout;
  const { xIndex, yIndex, minPoints, options } = settings;
  const n = rows.x.length;
  if (n < minPoints) {
    throw new SpectrumParseError(
      "too-few-points",
      `found ${n} data rows; at least ${minPoints} are needed`,
    );
  }

  const {
    reading,
    line: unitLine,
    column: unitColumn,
  } = readHeaderUnit(lines, kinds, headerLines, firstDataLine, split, xIndex, columnCount);
  const resolved = resolveXUnit({
    fileUnit: reading?.unit,
    conflicting: reading?.conflicting,
    wavelengthWithoutUnit: reading?.wavelengthWithoutUnit,
    fileMedium: reading?.medium,
    line: unitLine,
    column: unitColumn,
    statedUnit: options.xUnit,
    statedMedium: options.medium,
    fallbackUnit: options.fallbackXUnit,
    fallbackMedium: options.fallbackMedium,
    pixelCount: options.pixelCount,
    x: rows.x,
  });
  const lineNumbers = rows.lines;
  const ordered = orderPoints(rows.x, rows.y, {
    lineOf: (index) => lineNumbers[index],
    column: xIndex + 1,
  });
  if (resolved.scale !== 1)
    for (let i = 0; i < ordered.x.length; i++) ordered.x[i] *= resolved.scale;

  const meta = buildMeta(lines, kinds, headerLines, firstDataLine, split, xIndex, yIndex);
  meta.delimiter = delimiter;
  meta.decimalSeparator = decimal;
  meta.xUnitSource = resolved.source;
  if (resolved.unitInFile) meta.xUnitInFile = resolved.unitInFile;
  if (ordered.reversed) meta.xReversed = "true";
  const spectrum: Spectrum = { x: ordered.x, y: ordered.y, xUnit: resolved.xUnit, meta };
  if (resolved.medium !== undefined) spectrum.medium = resolved.medium;
  return spectrum;
}

function assertColumn(column: number, name: string): void {
  if (!Number.isInteger(column) || column < 1)
    throw new RangeError(`${name} must be a 1-based integer, got ${String(column)}`);
}

function classifyLines(lines: string[], skipLines: number): Uint8Array {
  const kinds = new Uint8Array(lines.length);
  for (let i = skipLines; i < lines.length; i++) kinds[i] = classifyLine(lines[i]);
  return kinds;
}

function classifyLine(line: string): LineKind {
  let start = 0;
  let code = line.charCodeAt(0);
  while (code === 32 || code === 9) code = line.charCodeAt(++start);
  if (start >= line.length) return LineKind.Ignored;
  if (code === 35 || code === 37) return LineKind.Comment; // # %
  if (code === 47 && line.charCodeAt(start + 1) === 47) return LineKind.Comment; // //
  if (code === 59) return LineKind.SemicolonLead; // ;
  return LineKind.Content;
}

type Splitter = (line: string) => string[];

function splitterFor(delimiter: TextDelimiter): Splitter {
  if (delimiter === "whitespace") {
    return (line) => {
      const trimmed = line.trim();
      return trimmed.length === 0 ? [] : trimmed.split(/[ \t]+/);
    };
  }
  const separator = DELIMITER_CHARACTERS[delimiter];
  return (line) => {
    // Quoted cells ("400,12";"1532") need a real CSV reader; plain rows take the fast path.
    const raw = line.includes('"')
      ? ((Papa.parse<string[]>(line, { delimiter: separator, quoteChar: '"', header: false })
          .data[0] ?? []) as string[])
      : line.split(separator);
    let end = raw.length;
    const cells = new Array<string>(end);
    for (let i = 0; i < end; i++) cells[i] = raw[i].trim();
    // Spreadsheets often end every row with a separator; the empty cell after it is not a column.
    while (end > 0 && cells[end - 1].length === 0) end--;
    cells.length = end;
    return cells;
  };
}

function chooseLayout(
  sample: string[],
  usedColumns: number[],
  statedDelimiter: TextDelimiter | undefined,
  statedDecimal: "." | "," | undefined,
): readonly [TextDelimiter, "." | ","] {
  const candidates = LAYOUTS.filter(
    ([delimiter, decimal]) =>
      (statedDelimiter === undefined || delimiter === statedDelimiter) &&
      (statedDecimal === undefined || decimal === statedDecimal),
  );
  if (candidates.length === 1) return candidates[0];
  let best: readonly [TextDelimiter, "." | ","] | undefined;
  let bestScore = 0;
  for (const layout of candidates) {
    const [delimiter, decimal] = layout;
    const character = DELIMITER_CHARACTERS[delimiter];
    const present =
      delimiter === "whitespace"
        ? sample.some((line) => /\S[ \t]+\S/.test(line))
        : sample.some((line) => line.includes(character));
    if (!present) continue;
    const split = splitterFor(delimiter);
    const countsOfGoodRows = new Map<number, number>();
    for (const line of sample) {
      const cells = split(line);
      if (cells.length < 2) continue;
      const good = usedColumns.every(
        (c) => c < cells.length && !Number.isNaN(parseNumberCell(cells[c], decimal)),
      );
      if (good) countsOfGoodRows.set(cells.length, (countsOfGoodRows.get(cells.length) ?? 0) + 1);
    }
    const score = Math.max(0, ...countsOfGoodRows.values());
    if (score > bestScore) {
      best = layout;
      bestScore = score;
    }
  }
  if (best) return best;
  // Nothing reads cleanly: take the first separator the rows contain, so that the full pass names the bad cell.
  const fallback = candidates.find(([delimiter]) => {
    const character = DELIMITER_CHARACTERS[delimiter];
    return delimiter !== "whitespace" && sample.some((line) => line.includes(character));
  });
  return fallback ?? candidates.find(([delimiter]) => delimiter === "whitespace") ?? candidates[0];
}

interface HeaderUnit {
  reading?: AxisLabelReading;
  line: number | null;
  column: number | null;
}

/**
 * The unit named by the header rows, read from the x column's cell when the cells line up with the
 * data, else from the whole row. Without a header row, a comment line directly above the data
 * ("# pixel  counts") is read the same way.
 */
function readHeaderUnit(
  lines: string[],
  kinds: Uint8Array,
  headerLines: number[],
  firstDataLine: number,
  split: Splitter,
  xIndex: number,
  columnCount: number,
): HeaderUnit {
  let candidates = headerLines.map((i) => ({ index: i, text: lines[i] }));
  if (candidates.length === 0) {
    let i = firstDataLine - 1;
    while (i >= 0 && kinds[i] === LineKind.Ignored && lines[i].trim().length === 0) i--;
    if (i >= 0 && (kinds[i] === LineKind.Comment || kinds[i] === LineKind.SemicolonLead)) {
      candidates = [{ index: i, text: lines[i].trim().replace(/^(?:#+|%+|\/\/+|;+)/, "") }];
    }
  }
  if (candidates.length === 0) return { line: null, column: null };
  const readings: { reading: AxisLabelReading; line: number; column: number | null }[] = [];
  for (const { index, text } of candidates) {
    const cells = split(text);
    const aligned = cells.length === columnCount;
    const reading = readAxisLabel(aligned ? cells[xIndex] : text);
    readings.push({ reading, line: index + 1, column: aligned ? xIndex + 1 : null });
  }
  const withUnit = readings.filter(
    (r) => r.reading.unit !== undefined || r.reading.conflicting !== undefined,
  );
  const chosen = withUnit[0] ?? readings[0];
  const medium = readings.map((r) => r.reading.medium).find((m) => m !== undefined);
  const wavelengthWithoutUnit =
    withUnit.length === 0 && readings.some((r) => r.reading.wavelengthWithoutUnit);
  return {
    reading: { ...chosen.reading, medium: chosen.reading.medium ?? medium, wavelengthWithoutUnit },
    line: chosen.line,
    column: chosen.column,
  };
}

function buildMeta(
  lines: string[],
  kinds: Uint8Array,
  headerLines: number[],
  firstDataLine: number,
  split: Splitter,
  xIndex: number,
  yIndex: number,
): Record<string, string> {
  const meta: Record<string, string> = {};
  if (headerLines.length > 0) {
    meta.header = headerLines.map((i) => lines[i].trim()).join("\n");
    const labels = headerLines.map((i) => split(lines[i]));
    const columnLabel = (index: number) =>
      labels
        .map((cells) => cells[index])
        .filter((cell) => cell !== undefined && cell.length > 0)
        .join(" ");
    meta.xLabel = columnLabel(xIndex);
    meta.yLabel = columnLabel(yIndex);
  }
  const comments: string[] = [];
  for (let i = 0; i < firstDataLine && comments.length < MAX_COMMENT_LINES_KEPT; i++) {
    if (kinds[i] === LineKind.Comment || kinds[i] === LineKind.SemicolonLead)
      comments.push(lines[i].trim());
  }
  if (comments.length > 0) meta.comments = comments.join("\n");
  return meta;
}
