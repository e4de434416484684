// A strict JCAMP-DX 4.24 validator for the tests, written from the standard's rules and sharing no code
// with lib/spectrum/io (neither its writer nor its reader), so that an export the app writes is checked by
// a second, independent reading. The standard: R. S. McDonald & P. A. Wilks, "JCAMP-DX: A Standard Form
// for Exchange of Infrared Spectra in Computer Readable Form", Appl. Spectrosc. 42(1), 151–162 (1988).
// Sections 5.2–5.10 and Table VII (the ASDF forms) were checked against a public copy of the paper's
// text; every other section number and list below is from memory and says so.

export interface StrictJcampResult {
  /** Every rule broken, "line N: rule: what" (empty when the file is valid). */
  problems: string[];
  /** The points as this validator decodes them (x × XFACTOR, y × YFACTOR), when it got that far. */
  points: { x: number[]; y: number[] } | null;
}

// From memory, sec. 3.1 / Table II: a label is "##", a name, "="; user-defined names start with "$".
const LABEL = /^##([^=]*)=(.*)$/;
// Sec. 5.3 (AFFN, as checked against the paper): a field of +, -, decimal point and digits; E followed by + or − and
// a two- or three-digit integer gives a power of ten.
const AFFN = /^[+-]?(\d+\.?\d*|\.\d+)(E[+-]\d{2,3})?$/;
// From memory, sec. 4 / Table II(a): the labels every 4.24 spectrum carries.
const REQUIRED = [
  "TITLE",
  "JCAMPDX",
  "DATATYPE",
  "ORIGIN",
  "OWNER",
  "XUNITS",
  "YUNITS",
  "XFACTOR",
  "YFACTOR",
  "FIRSTX",
  "LASTX",
  "NPOINTS",
  "FIRSTY",
];
// From memory, the standard's table of spectral parameters: its names for the axes' units.
const X_UNITS = new Set(["1/CM", "MICROMETERS", "NANOMETERS", "SECONDS"]);
const Y_UNITS = new Set([
  "TRANSMITTANCE",
  "REFLECTANCE",
  "ABSORBANCE",
  "KUBELKA-MUNK",
  "ARBITRARY UNITS",
]);
/** Common practice: readers decode ASDF ordinates into signed 32-bit integers. */
const INT32_MAX = 2 ** 31 - 1;

interface Label {
  key: string;
  name: string;
  value: string;
  line: number;
}

/** The label as the standard compares names (from memory, sec. 3.1: blanks, -, / and _ do not count). */
const keyOf = (name: string) => name.replace(/[\s_\-/]/g, "").toUpperCase();

/** Checks `text` against the rules of JCAMP-DX 4.24 for one spectrum block (a simple file). */
export function validateStrictJcamp(text: string): StrictJcampResult {
  const problems: string[] = [];
  const problem = (line: number, rule: string, what: string) =>
    problems.push(`line ${line}: ${rule}: ${what}`);
  const lines = text.replace(/\r\n/g, "\n").split("\n");
  if (lines.at(-1) === "") lines.pop();

  // Abstract: "All data are stored as labeled fields ... using printable ASCII characters."
  lines.forEach((line, i) => {
    if (/[^\x20-\x7e]/.test(line))
      problem(i + 1, "printable ASCII (abstract)", JSON.stringify(line.slice(0, 40)));
    // From memory, sec. 4: a line holds at most 80 characters.
    if (line.length > 80)
      problem(i + 1, "80 characters a line (sec. 4, from memory)", `${line.length}`);
  });

  // Labels, their values over continuation lines, and where the data table starts and ends.
  const labels: Label[] = [];
  let dataLabel: Label | null = null;
  const dataLines: { text: string; line: number }[] = [];
  let endLine: number | null = null;
  lines.forEach((raw, i) => {
    const line = i + 1;
    if (endLine !== null) {
      if (raw.trim() !== "") problem(line, "nothing after ##END= (sec. 3.3.1, from memory)", raw);
      return;
    }
    // From memory, sec. 3.1: "$$" starts a comment that runs to the end of the line.
    const content = raw.replace(/\$\$.*$/, "");
    if (raw.startsWith("##")) {
      const match = LABEL.exec(content);
      if (!match) {
        problem(line, "label syntax ##NAME= (sec. 3.1, from memory)", raw);
        return;
      }
      const name = match[1].trim();
      if (!/^\$?[A-Z0-9][A-Z0-9 /._-]*$/.test(name))
        problem(line, "label names in capitals (sec. 3.1, from memory)", name);
      const label = { key: keyOf(name), name, value: match[2].trim(), line };
      labels.push(label);
      if (label.key === "XYDATA" || label.key === "XYPOINTS") dataLabel = label;
      if (label.key === "END") endLine = line;
      return;
    }
    if (dataLabel !== null && labels.at(-1) === dataLabel) {
      if (content.trim() !== "") dataLines.push({ text: content.trim(), line });
    } else if (labels.length > 0 && !raw.startsWith("$$")) {
      labels.at(-1)!.value += `\n${content.trim()}`;
    } else if (labels.length === 0 && raw.trim() !== "") {
      problem(line, "the file opens with ##TITLE= (sec. 3.3.1, from memory)", raw);
    }
  });

  // From memory, sec. 3.3.1: a simple file is ##TITLE=, ##JCAMP-DX=, its labels, and ##END= last.
  if (labels[0]?.key !== "TITLE") problem(1, "##TITLE= first (sec. 3.3.1, from memory)", "");
  if (labels[1]?.key !== "JCAMPDX" || labels[1].value !== "4.24")
    problem(labels[1]?.line ?? 1, "##JCAMP-DX=4.24 second (sec. 3.3.1, from memory)", "");
  if (endLine === null)
    problem(lines.length, "##END= closes the block (sec. 3.3.1, from memory)", "");

  // The paper's vocabulary (as quoted in several readers): a block is a set of LABEL=DATA pairs with
  // unique labels.
  const byKey = new Map<string, Label>();
  for (const label of labels) {
    if (byKey.has(label.key))
      problem(label.line, "each label once in a block (sec. 3.3, from memory)", label.name);
    else byKey.set(label.key, label);
  }
  for (const key of REQUIRED) {
    if (!byKey.has(key)) problem(1, "required labels (Table II, from memory)", key);
    else if (byKey.get(key)!.value.trim() === "" && key !== "END")
      problem(byKey.get(key)!.line, "required labels have a value (Table II, from memory)", key);
  }

  // From memory, the standard's optional labels: ##DATE=YY/MM/DD and ##TIME=HH:MM:SS; 5.x adds
  // ##LONG DATE=YYYY/MM/DD HH:MM:SS[.SSSS] [±UUUU] (Lampen et al., Appl. Spectrosc. 48, 1545 (1994)).
  const date = byKey.get("DATE");
  if (date && !/^\d\d\/(0[1-9]|1[0-2])\/(0[1-9]|[12]\d|3[01])$/.test(date.value))
    problem(date.line, "##DATE=YY/MM/DD (sec. 6, from memory)", date.value);
  const time = byKey.get("TIME");
  if (time && !/^([01]\d|2[0-3]):[0-5]\d:[0-5]\d$/.test(time.value))
    problem(time.line, "##TIME=HH:MM:SS (sec. 6, from memory)", time.value);
  const longDate = byKey.get("LONGDATE");
  if (
    longDate &&
    !/^\d{4}\/(0[1-9]|1[0-2])\/(0[1-9]|[12]\d|3[01])( ([01]\d|2[0-3]):[0-5]\d:[0-5]\d(\.\d{1,4})?( [+-]\d{4})?)?$/.test(
      longDate.value,
    )
  )
    problem(
      longDate.line,
      "##LONGDATE=YYYY/MM/DD HH:MM:SS (JCAMP-DX 5.x, from memory)",
      longDate.value,
    );

  const xUnits = byKey.get("XUNITS");
  if (xUnits && !X_UNITS.has(xUnits.value))
    problem(xUnits.line, "XUNITS from the standard's list (sec. 6, from memory)", xUnits.value);
  const yUnits = byKey.get("YUNITS");
  if (yUnits && !Y_UNITS.has(yUnits.value))
    problem(yUnits.line, "YUNITS from the standard's list (sec. 6, from memory)", yUnits.value);

  const numbers = new Map<string, number>();
  for (const key of [
    "XFACTOR",
    "YFACTOR",
    "FIRSTX",
    "LASTX",
    "DELTAX",
    "FIRSTY",
    "MAXY",
    "MINY",
    "NPOINTS",
  ]) {
    const label = byKey.get(key);
    if (!label) continue;
    if (!AFFN.test(label.value)) {
      problem(label.line, "numeric values in AFFN (sec. 5.3)", `${label.name}=${label.value}`);
      continue;
    }
    numbers.set(key, Number(label.value));
  }
  const npoints = numbers.get("NPOINTS");
  if (npoints !== undefined && !(Number.isInteger(npoints) && npoints > 0))
    problem(
      byKey.get("NPOINTS")!.line,
      "NPOINTS is a count (sec. 6.4, from memory)",
      String(npoints),
    );
  for (const key of ["XFACTOR", "YFACTOR"]) {
    if (numbers.get(key) === 0)
      problem(byKey.get(key)!.line, "factors are not zero (sec. 6.4, from memory)", key);
  }

  if (dataLabel === null) {
    problem(lines.length, "one data table, ##XYDATA= or ##XYPOINTS= (sec. 6.4, from memory)", "");
    return { problems, points: null };
  }
  const table: Label = dataLabel;
  const xFactor = numbers.get("XFACTOR") ?? 1;
  const yFactor = numbers.get("YFACTOR") ?? 1;
  let points: { x: number[]; y: number[] } | null = null;
  if (table.key === "XYDATA") {
    // Sec. 5.1.1 and 6.4.1 (section numbers from a reader's documentation): (X++(Y..Y)).
    if (table.value.replace(/\s/g, "") !== "(X++(Y..Y))")
      problem(table.line, "##XYDATA=(X++(Y..Y)) (sec. 6.4.1)", table.value);
    points = checkXyData(dataLines, numbers, xFactor, yFactor, problem);
  } else {
    // Sec. 6.4.2 (number from a reader's documentation): (XY..XY) pairs, in AFFN.
    if (table.value.replace(/\s/g, "") !== "(XY..XY)")
      problem(table.line, "##XYPOINTS=(XY..XY) (sec. 6.4.2)", table.value);
    points = checkXyPoints(dataLines, xFactor, yFactor, problem);
  }
  if (points !== null) {
    const n = points.y.length;
    if (npoints !== undefined && npoints !== n)
      problem(table.line, "NPOINTS counts the points (sec. 6.4, from memory)", `${npoints} ≠ ${n}`);
    const close = (a: number, b: number, slack: number) => Math.abs(a - b) <= slack;
    const firstX = numbers.get("FIRSTX");
    const lastX = numbers.get("LASTX");
    const step =
      n > 1 && firstX !== undefined && lastX !== undefined ? (lastX - firstX) / (n - 1) : 0;
    // XYDATA's FIRSTX and LASTX are checked by the X check of its first and last lines.
    if (
      table.key === "XYPOINTS" &&
      firstX !== undefined &&
      n > 0 &&
      !close(points.x[0], firstX, 1e-9 * Math.abs(firstX))
    )
      problem(
        byKey.get("FIRSTX")!.line,
        "FIRSTX is the first point's x (sec. 6.4, from memory)",
        `${firstX} vs ${points.x[0]}`,
      );
    if (
      table.key === "XYPOINTS" &&
      lastX !== undefined &&
      n > 0 &&
      !close(points.x[n - 1], lastX, 1e-9 * Math.abs(lastX))
    )
      problem(
        byKey.get("LASTX")!.line,
        "LASTX is the last point's x (sec. 6.4, from memory)",
        `${lastX} vs ${points.x[n - 1]}`,
      );
    const ySlack = Math.abs(yFactor) / 2 + 1e-9 * Math.max(...points.y.map(Math.abs), 0);
    const firstY = numbers.get("FIRSTY");
    if (firstY !== undefined && n > 0 && !close(points.y[0], firstY, ySlack))
      problem(
        byKey.get("FIRSTY")!.line,
        "FIRSTY is the first point's y (sec. 6.4, from memory)",
        `${firstY} vs ${points.y[0]}`,
      );
    const maxY = numbers.get("MAXY");
    if (maxY !== undefined && n > 0 && !close(Math.max(...points.y), maxY, ySlack))
      problem(
        byKey.get("MAXY")!.line,
        "MAXY is the largest y (sec. 6.4, from memory)",
        String(maxY),
      );
    const minY = numbers.get("MINY");
    if (minY !== undefined && n > 0 && !close(Math.min(...points.y), minY, ySlack))
      problem(
        byKey.get("MINY")!.line,
        "MINY is the smallest y (sec. 6.4, from memory)",
        String(minY),
      );
    // XYDATA places its points at FIRSTX + i·(LASTX − FIRSTX)/(NPOINTS − 1): rebuild them so.
    if (table.key === "XYDATA" && firstX !== undefined)
      points.x = points.y.map((_, i) => firstX + i * step);
  }
  return { problems, points };
}

type Problem = (line: number, rule: string, what: string) => void;

interface Token {
  kind: "affn" | "sqz" | "dif" | "dup";
  value: number;
}

// Table VII (as checked against the paper): the pseudo-digits of SQZ (@ A–I, a–i), DIF (% J–R, j–r) and DUP (S–Z, s).
const SQZ = "ihgfedcba@ABCDEFGHI";
const DIF = "rqponmlkj%JKLMNOPQR";
const DUP = "STUVWXYZs";

/** The ASDF fields of one data line (sec. 5.2–5.10: AFFN, PAC, SQZ, DIF, DUP), or a reason it has none. */
function tokenize(text: string): Token[] | string {
  const tokens: Token[] = [];
  let i = 0;
  while (i < text.length) {
    const c = text[i];
    if (c === " " || c === ",") {
      i++;
      continue;
    }
    // Sec. 5.3/5.4: AFFN and PAC values start with a sign, a digit or a decimal point.
    const affn = /^[+-]?(\d+\.?\d*|\.\d+)(E[+-]\d{2,3})?/.exec(text.slice(i));
    if (/[+\-.\d]/.test(c) && affn) {
      tokens.push({ kind: "affn", value: Number(affn[0]) });
      i += affn[0].length;
      continue;
    }
    const rest = /^[\d.]*/.exec(text.slice(i + 1))![0];
    let kind: Token["kind"];
    let digit: number;
    if (SQZ.includes(c)) [kind, digit] = ["sqz", SQZ.indexOf(c) - 9];
    else if (DIF.includes(c)) [kind, digit] = ["dif", DIF.indexOf(c) - 9];
    else if (DUP.includes(c)) [kind, digit] = ["dup", DUP.indexOf(c) + 1];
    else return `"${c}" is no ASDF character (Table VII)`;
    const magnitude = Number(`${Math.abs(digit)}${rest}`);
    tokens.push({ kind, value: digit < 0 ? -magnitude : magnitude });
    i += 1 + rest.length;
  }
  return tokens;
}

function checkXyData(
  dataLines: { text: string; line: number }[],
  numbers: Map<string, number>,
  xFactor: number,
  yFactor: number,
  problem: Problem,
): { x: number[]; y: number[] } | null {
  const ordinates: number[] = [];
  const lineStarts: { line: number; x: number; index: number }[] = [];
  let previousEndedInDif = false;
  let ok = true;
  for (const { text, line } of dataLines) {
    const tokens = tokenize(text);
    if (typeof tokens === "string") {
      problem(line, "ASDF characters only (Table VII)", tokens);
      ok = false;
      continue;
    }
    // Sec. 5.6: the abscissa at the start of each line is in AFFN form.
    if (tokens[0]?.kind !== "affn") {
      problem(line, "each line opens with its X in AFFN (sec. 5.6)", text.slice(0, 20));
      ok = false;
      continue;
    }
    const values: number[] = [];
    let last: Token | null = null;
    let endsInDif = false;
    for (const token of tokens.slice(1)) {
      if (token.kind === "dup") {
        // Sec. 5.9: the count includes the first occurrence; 5.10: in DIF form it repeats the difference.
        if (last === null || token.value < 1 || !Number.isInteger(token.value)) {
          problem(line, "a DUP count follows a value (sec. 5.9)", text.slice(0, 20));
          ok = false;
          break;
        }
        for (let k = 1; k < token.value; k++)
          values.push(last.kind === "dif" ? values.at(-1)! + last.value : values.at(-1)!);
        continue;
      }
      if (token.kind === "dif") {
        // Sec. 5.6: the first ordinate is an actual value; the remaining ones are differences.
        if (values.length === 0) {
          problem(line, "a line's first ordinate is an actual value (sec. 5.6)", text.slice(0, 20));
          ok = false;
          break;
        }
        values.push(values.at(-1)! + token.value);
      } else values.push(token.value);
      endsInDif = token.kind === "dif";
      last = token;
    }
    if (!ok) continue;
    if (values.length === 0) {
      problem(line, "a data line holds ordinates (sec. 5.1.1, from memory)", text);
      ok = false;
      continue;
    }
    for (const v of values) {
      if (!Number.isInteger(v) || Math.abs(v) > INT32_MAX) {
        problem(line, "ordinates are integers within 32 bits (common practice)", String(v));
        ok = false;
      }
    }
    let start = ordinates.length;
    if (previousEndedInDif) {
      // The Y check (sec. 5.6–5.8, from memory): after a line in DIF form the next repeats its last ordinate.
      if (values[0] !== ordinates.at(-1))
        problem(
          line,
          "Y check: the line repeats the last ordinate (sec. 5.8, from memory)",
          `${values[0]} ≠ ${ordinates.at(-1)}`,
        );
      values.shift();
      start -= 1;
    }
    lineStarts.push({ line, x: tokens[0].value, index: start });
    ordinates.push(...values);
    previousEndedInDif = endsInDif;
  }
  if (!ok) return null;
  const n = ordinates.length;
  const firstX = numbers.get("FIRSTX");
  const lastX = numbers.get("LASTX");
  if (firstX !== undefined && lastX !== undefined && n > 1) {
    const step = (lastX - firstX) / (n - 1);
    // Sec. 6.4.1 (from memory): each line's X, times XFACTOR, is the abscissa of its first ordinate.
    for (const start of lineStarts) {
      const expected = firstX + start.index * step;
      if (Math.abs(start.x * xFactor - expected) > Math.abs(step) / 2)
        problem(
          start.line,
          "X check: a line's X is its first ordinate's abscissa (sec. 6.4.1, from memory)",
          `${start.x * xFactor} vs ${expected}`,
        );
    }
  }
  return { x: ordinates.map(() => 0), y: ordinates.map((v) => v * yFactor) };
}

function checkXyPoints(
  dataLines: { text: string; line: number }[],
  xFactor: number,
  yFactor: number,
  problem: Problem,
): { x: number[]; y: number[] } | null {
  const x: number[] = [];
  const y: number[] = [];
  let ok = true;
  for (const { text, line } of dataLines) {
    // Sec. 6.4.2 (from memory): pairs in AFFN, separated by a comma or blanks; ";" ends a pair too.
    const fields = text.split(/[\s,;]+/).filter((f) => f !== "");
    if (fields.length % 2 !== 0 || fields.some((f) => !AFFN.test(f))) {
      problem(line, "(XY..XY) pairs in AFFN (sec. 6.4.2)", text.slice(0, 40));
      ok = false;
      continue;
    }
    for (let i = 0; i < fields.length; i += 2) {
      x.push(Number(fields[i]) * xFactor);
      y.push(Number(fields[i + 1]) * yFactor);
    }
  }
  return ok ? { x, y } : null;
}
