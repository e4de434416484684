// Fuzz test of the two-column text reader: valid texts in random layouts and texts damaged at random
// give either a sound spectrum or a SpectrumParseError, never any other error, with both row readers.
// The seed is fixed by tests/support/fast-check-seed.ts.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { arraysUnsoundness, readOrRefused } from "../../../support/read-or-refused";
import { TEXT_LAYOUTS, textMutations, type TextMutation } from "../../../support/text-mutations";
import { parseSpectrumText } from "../../../../lib/spectrum/io";
import type { Spectrum } from "../../../../lib/spectrum/types";

/** A small point limit, so that damage that multiplies rows cannot make a run slow. */
const MAX_POINTS = 5000;
const MIN_POINTS = 16;

const validText = fc
  .record({
    layout: fc.constantFrom(...TEXT_LAYOUTS),
    start: fc.integer({ min: -1000, max: 100_000 }),
    steps: fc.array(fc.integer({ min: 1, max: 5000 }), { minLength: MIN_POINTS, maxLength: 60 }),
    yMillis: fc.array(fc.integer({ min: -1_000_000, max: 100_000_000 }), {
      minLength: 60,
      maxLength: 60,
    }),
    header: fc.constantFrom(
      "",
      "wavelength (nm)",
      "# wavelength (nm)",
      "pixel",
      "wavenumber (cm-1)",
      "lambda/Å",
    ),
    thirdColumn: fc.boolean(),
    comments: fc.array(fc.constantFrom("# run 4", "% lamp", "// note", ""), { maxLength: 3 }),
    crlf: fc.boolean(),
    descending: fc.boolean(),
  })
  .map((g) => {
    const x: number[] = [];
    let xMillis = g.start;
    for (const step of g.steps) {
      xMillis += step;
      x.push(xMillis / 1000);
    }
    const cell = (value: number) =>
      g.layout.decimal === "," ? String(value).replace(".", ",") : String(value);
    const out: string[] = [...g.comments];
    if (g.header) out.push(`${g.header}${g.layout.separator}counts`);
    const order = x.map((_, i) => i);
    if (g.descending) order.reverse();
    for (const i of order) {
      const extra = g.thirdColumn ? `${g.layout.separator}${cell(i)}` : "";
      out.push(`${cell(x[i])}${g.layout.separator}${cell(g.yMillis[i] / 1000)}${extra}`);
    }
    return out.join(g.crlf ? "\r\n" : "\n") + "\n";
  });

const SNIPPETS = [
  "NaN",
  "Infinity",
  "-Infinity",
  "1e999",
  "-1e999",
  "9".repeat(400),
  "0x1F",
  '"',
  '"1,5"',
  ",",
  ";",
  "\t",
  " ",
  ".",
  "\n",
  "\r",
  "\r\n",
  "\u0000",
  "\uFEFF",
  "Å",
  "µm",
  "nm",
  "cm-1",
  "wavelength (Å)",
  "-",
  "+",
  "e",
  "1e5",
  "#",
  "//",
  "\uD800",
];

const damage = textMutations(SNIPPETS, 0xffff);
const mutation: fc.Arbitrary<TextMutation> = fc.oneof(
  damage.insertSnippet,
  damage.deleteSpan,
  damage.replaceCharacter,
  damage.swapLines,
  damage.duplicateLine,
  damage.truncate,
);

const anyText = fc.oneof(
  { weight: 2, arbitrary: validText },
  {
    weight: 3,
    arbitrary: fc
      .tuple(validText, fc.array(mutation, { minLength: 1, maxLength: 4 }))
      .map(([text, mutations]) => mutations.reduce((t, mutate) => mutate(t), text)),
  },
);

/** Why `spectrum` is not one the rest of the app can rely on, or "" when it is sound. */
const unsoundness = (spectrum: Spectrum) => arraysUnsoundness(spectrum, MIN_POINTS, MAX_POINTS);

describe("parseSpectrumText fuzz", () => {
  it("any text, valid or damaged, gives a sound spectrum or a SpectrumParseError", () => {
    let read = 0;
    let refused = 0;
    fc.assert(
      fc.property(
        anyText,
        fc.constantFrom("scan", "lines"),
        fc.constantFrom(undefined, "nm", "pixel"),
        (text, rowReader, xUnit) => {
          const outcome = readOrRefused(
            () => parseSpectrumText(text, { maxPoints: MAX_POINTS, rowReader, xUnit }),
            unsoundness,
          );
          if (outcome === "read") read++;
          else refused++;
        },
      ),
      { numRuns: 2500 },
    );
    // Both outcomes must really occur, or the property says little.
    expect(read).toBeGreaterThan(300);
    expect(refused).toBeGreaterThan(300);
  }, 120_000);
});
