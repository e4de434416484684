// Property and fuzz tests of the JCAMP-DX reader: files written in every ASDF form by an encoder of the
// test's own read back their points; valid and damaged files alike give either a sound spectrum or a
// SpectrumParseError, never any other error. The seed is fixed by tests/support/fast-check-seed.ts.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { arraysUnsoundness, readOrRefused } from "../../../support/read-or-refused";
import { textMutations, type TextMutation } from "../../../support/text-mutations";
import { parseJcamp } from "../../../../lib/spectrum/io";
import type { Spectrum } from "../../../../lib/spectrum/types";

const FORMS = ["AFFN", "PAC", "SQZ", "SQZDUP", "DIF", "DIFDUP"] as const;
type Form = (typeof FORMS)[number];
const UNITS = ["NANOMETERS", "1/CM", "PIXELS", "MICROMETERS", "ANGSTROMS"] as const;
/** The point limit used here: small, so that a damaged DUP count cannot make a run slow. */
const MAX_POINTS = 5000;
const MIN_POINTS = 16;

// The ASDF alphabets of JCAMP-DX 4.24 (McDonald & Wilks 1988, Appl. Spectrosc. 42, 151; from memory):
// SQZ @A–I / a–i, DIF %J–R / j–r, DUP S–Z and s.
const SQZ_POSITIVE = "@ABCDEFGHI";
const SQZ_NEGATIVE = "@abcdefghi";
const DIF_POSITIVE = "%JKLMNOPQR";
const DIF_NEGATIVE = "%jklmnopqr";
const DUP = "STUVWXYZs";

function squeezed(value: number, positive: string, negative: string): string {
  const digits = String(Math.abs(value));
  return (value < 0 ? negative : positive)[Number(digits[0])] + digits.slice(1);
}
const sqz = (value: number) => squeezed(value, SQZ_POSITIVE, SQZ_NEGATIVE);
const dif = (value: number) => squeezed(value, DIF_POSITIVE, DIF_NEGATIVE);
const dup = (count: number) => DUP[Number(String(count)[0]) - 1] + String(count).slice(1);

/** Runs of the same token become the token and a DUP count of the run's length. */
function withDup(tokens: string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < tokens.length;) {
    let j = i + 1;
    while (j < tokens.length && tokens[j] === tokens[i]) j++;
    out.push(j - i > 1 ? tokens[i] + dup(j - i) : tokens[i]);
    i = j;
  }
  return out;
}

interface Generated {
  text: string;
  /** Y as written, and the x each point must read back to, in file order. */
  yRaw: number[];
  xExpected: number[];
  yFactor: number;
  unit: (typeof UNITS)[number];
}

/** XYDATA lines of `yRaw` in `form`, `perLine` values a line, each line opened by its X check value. */
function encode(
  form: Form,
  yRaw: number[],
  xRaw: number[],
  perLine: number,
  spaced: boolean,
): string[] {
  const join = (tokens: string[]) => tokens.join(spaced ? " " : "");
  const lines: string[] = [];
  const n = yRaw.length;
  if (form === "AFFN" || form === "PAC" || form === "SQZ" || form === "SQZDUP") {
    for (let a = 0; a < n; a += perLine) {
      const values = yRaw.slice(a, a + perLine);
      if (form === "AFFN") lines.push(`${xRaw[a]} ${values.join(" ")}`);
      else if (form === "PAC")
        lines.push(`${xRaw[a]}${values.map((v) => (v < 0 ? "-" : "+") + Math.abs(v)).join("")}`);
      else {
        const tokens = values.map(sqz);
        lines.push(
          `${xRaw[a]}${spaced ? " " : ""}${join(form === "SQZ" ? tokens : withDup(tokens))}`,
        );
      }
    }
    return lines;
  }
  // DIF forms: a line after one that ends in a difference repeats its last Y first (the Y check value),
  // and its X is that point's; a block that ends in a difference gets a last line of X and check only.
  let endedInDif = false;
  for (let a = 0; a < n; a += perLine) {
    const b = Math.min(n, a + perLine);
    const from: number = endedInDif ? a - 1 : a;
    const tokens = [sqz(yRaw[from])];
    for (let i = from + 1; i < b; i++) tokens.push(dif(yRaw[i] - yRaw[i - 1]));
    endedInDif = b - from > 1;
    lines.push(
      `${xRaw[from]}${spaced ? " " : ""}${join(form === "DIF" ? tokens : [tokens[0], ...withDup(tokens.slice(1))])}`,
    );
  }
  if (endedInDif) lines.push(`${xRaw[n - 1]}${spaced ? " " : ""}${sqz(yRaw[n - 1])}`);
  return lines;
}

const validFile: fc.Arbitrary<Generated> = fc
  .record({
    form: fc.constantFrom(...FORMS),
    // Runs of equal values, so that the DUP forms have something to compress.
    runs: fc.array(
      fc.tuple(fc.integer({ min: -30_000, max: 30_000 }), fc.integer({ min: 1, max: 4 })),
      {
        minLength: MIN_POINTS,
        maxLength: 50,
      },
    ),
    perLine: fc.integer({ min: 1, max: 14 }),
    spaced: fc.boolean(),
    unit: fc.constantFrom(...UNITS),
    x0Raw: fc.integer({ min: 100, max: 100_000 }),
    dxRaw: fc.integer({ min: 1, max: 40 }),
    descending: fc.boolean(),
    xFactor: fc.constantFrom(1, 0.5, 0.01, 0.001),
    yFactor: fc.constantFrom(1, 2, 0.5, 0.001, 1000),
    statesNpoints: fc.boolean(),
    statesDeltaX: fc.boolean(),
    statesLastX: fc.boolean(),
    crlf: fc.boolean(),
  })
  .map((g): Generated => {
    const yRaw = g.runs.flatMap(([value, times]) => Array<number>(times).fill(value));
    const n = yRaw.length;
    const xRaw = yRaw.map((_, i) => g.x0Raw + (g.descending ? n - 1 - i : i) * g.dxRaw);
    const xExpected = xRaw.map((v) => v * g.xFactor);
    const step = (xExpected[n - 1] - xExpected[0]) / (n - 1);
    const labels = [
      "##TITLE=generated (invented data)",
      "##JCAMP-DX=4.24",
      "##DATA TYPE=UV/VIS SPECTRUM",
      `##XUNITS=${g.unit}`,
      "##YUNITS=ARBITRARY UNITS",
      `##XFACTOR=${g.xFactor}`,
      `##YFACTOR=${g.yFactor}`,
      `##FIRSTX=${xExpected[0]}`,
    ];
    // FIRSTX and LASTX or DELTAX are needed to place the points.
    if (g.statesLastX || !g.statesDeltaX) labels.push(`##LASTX=${xExpected[n - 1]}`);
    if (g.statesDeltaX) labels.push(`##DELTAX=${step}`);
    if (g.statesNpoints) labels.push(`##NPOINTS=${n}`);
    labels.push("##XYDATA=(X++(Y..Y))");
    const lines = [...labels, ...encode(g.form, yRaw, xRaw, g.perLine, g.spaced), "##END="];
    return {
      text: lines.join(g.crlf ? "\r\n" : "\n") + "\n",
      yRaw,
      xExpected,
      yFactor: g.yFactor,
      unit: g.unit,
    };
  });

const HOSTILE_SNIPPETS = [
  "s99999999",
  "S",
  "Ss9",
  "J",
  "%",
  "@",
  "?",
  "e",
  "E5",
  "-",
  "+",
  ".",
  "..",
  "\n",
  "\r\n",
  "\r",
  "##",
  "##XYDATA=(X++(Y..Y))\n",
  "$$",
  "9".repeat(30),
  "1e999",
  " ",
  "\u0000",
  "Å",
  "NaN",
  "Infinity",
  "##NPOINTS=0\n",
  "##END=\n",
  "##TITLE=again\n",
  "\uFEFF",
];
const HOSTILE_VALUES = [
  "0",
  "-0",
  "NaN",
  "Infinity",
  "-1",
  "1e999",
  "1e-400",
  "99999999999",
  "",
  "abc",
  "1e30",
  "-500",
  "0.000001",
  "2000001",
  "1/CM",
  "MICROMETERS",
  "SECONDS",
  "(XY..XY)",
];
const LABELS = ["XFACTOR", "YFACTOR", "FIRSTX", "LASTX", "DELTAX", "NPOINTS", "XUNITS", "XYDATA"];

const damage = textMutations(HOSTILE_SNIPPETS, 127);
const mutation: fc.Arbitrary<TextMutation> = fc.oneof(
  damage.insertSnippet,
  damage.deleteSpan,
  damage.replaceCharacter,
  fc.tuple(fc.constantFrom(...LABELS), fc.constantFrom(...HOSTILE_VALUES)).map(
    ([label, value]) =>
      (text: string) =>
        text.replace(new RegExp(`##${label}=[^\\r\\n]*`), () => `##${label}=${value}`),
  ),
  damage.swapLines,
  damage.duplicateLine,
  damage.truncate,
);

/** A valid file, or one damaged by one to four mutations. */
const anyFile = fc.oneof(
  { weight: 2, arbitrary: validFile.map((g) => g.text) },
  {
    weight: 3,
    arbitrary: fc
      .tuple(validFile, fc.array(mutation, { minLength: 1, maxLength: 4 }))
      .map(([g, mutations]) => mutations.reduce((text, mutate) => mutate(text), g.text)),
  },
);

const LARGEST_X: Record<Spectrum["xUnit"], number> = {
  nm: 1e9,
  angstrom: 1e10,
  pixel: 1e9,
  wavenumber: Infinity,
};

/** Why `spectrum` is not one the rest of the app can rely on, or "" when it is sound. */
function unsoundness(spectrum: Spectrum): string {
  const arrays = arraysUnsoundness(spectrum, MIN_POINTS, MAX_POINTS);
  if (arrays) return arrays;
  const { x, xUnit } = spectrum;
  const first = x[0];
  const physical =
    xUnit === "wavenumber" ? first >= 0.01 : xUnit === "pixel" ? first >= 0 : first > 0;
  if (!physical || x[x.length - 1] > LARGEST_X[xUnit]) return `x from ${first} ${xUnit}`;
  return "";
}

describe("parseJcamp properties", () => {
  it("files in every ASDF form read back their points", () => {
    fc.assert(
      fc.property(validFile, (g) => {
        const spectrum = parseJcamp(g.text, { maxPoints: MAX_POINTS });
        const n = g.yRaw.length;
        const scale = g.unit === "MICROMETERS" ? 1000 : 1;
        // The reader returns x increasing: a descending file comes back reversed.
        const order =
          g.xExpected[n - 1] > g.xExpected[0]
            ? g.yRaw.map((_, i) => i)
            : g.yRaw.map((_, i) => n - 1 - i);
        expect(Array.from(spectrum.y)).toEqual(order.map((i) => g.yRaw[i] * g.yFactor));
        const span = Math.abs(g.xExpected[n - 1] - g.xExpected[0]) * scale;
        const worstX = Math.max(
          ...order.map((i, k) => Math.abs(spectrum.x[k] - g.xExpected[i] * scale)),
        );
        expect(worstX).toBeLessThanOrEqual(1e-9 * span);
      }),
      { numRuns: 600 },
    );
    // A fixed number of small files; the time limit only allows for a loaded machine.
  }, 120_000);

  it("any file, valid or damaged, gives a sound spectrum or a SpectrumParseError", () => {
    let read = 0;
    let refused = 0;
    fc.assert(
      fc.property(anyFile, (text) => {
        if (
          readOrRefused(() => parseJcamp(text, { maxPoints: MAX_POINTS }), unsoundness) === "read"
        )
          read++;
        else refused++;
      }),
      { numRuns: 2500 },
    );
    // Both outcomes must really occur, or the property says little.
    expect(read).toBeGreaterThan(500);
    expect(refused).toBeGreaterThan(500);
  }, 120_000);
});
