// The JCAMP-DX files that once took the service down, and their relatives: a few bytes that ask for
// millions of points, absurd factors or axes. Each must be refused with a SpectrumParseError, after
// little work (counted by the decoder's work meter, not timed) and without much memory.
import { describe, expect, it } from "vitest";
import { SpectrumParseError, parseJcamp } from "../../../../lib/spectrum/io";
import { decodeJcampXyData } from "../../../../lib/spectrum/io/decode-jcamp-xy-data";
import { readJcampStructure } from "../../../../lib/spectrum/io/read-jcamp-structure";

/** The readers' default point limit, also the upload limit. */
const MAX_POINTS = 2_000_000;
const MB = 1024 * 1024;

function file(data: string[], labels: Record<string, string> = {}): string {
  const header: Record<string, string> = {
    TITLE: "bomb (invented)",
    "JCAMP-DX": "4.24",
    XUNITS: "NANOMETERS",
    XFACTOR: "1",
    YFACTOR: "1",
    FIRSTX: "1",
    LASTX: "16",
    ...labels,
  };
  const lines = Object.entries(header).map(([name, value]) => `##${name}=${value}`);
  return [...lines, "##XYDATA=(X++(Y..Y))", ...data, "##END="].join("\n") + "\n";
}

interface Bomb {
  name: string;
  text: string;
  /** "none": refused before expanding anything; "points": may decode up to the point limit first. */
  work: "none" | "points";
}

const BOMBS: Bomb[] = [
  // The repeat count: a SQZ value then s99999999, a DUP count of 999,999,999.
  {
    name: "SQZ then DUP 999,999,999 (s99999999, the issue's file)",
    text: file(["1E0s99999999"]),
    work: "none",
  },
  {
    name: "the same with NPOINTS=16",
    text: file(["1E0s99999999"], { NPOINTS: "16" }),
    work: "none",
  },
  { name: "a 30-digit DUP count", text: file([`1A${"s" + "9".repeat(30)}`]), work: "none" },
  { name: "DIF then DUP 999,999,999", text: file(["1AJs99999999"]), work: "none" },
  { name: "DIF zero then DUP 10^9", text: file(["1A%S000000000"]), work: "none" },
  { name: "AFFN then DUP 999,999,999", text: file(["1 5 s99999999"]), work: "none" },
  {
    name: "many lines each just within the limit (DUP 999,999 per line)",
    text: file(Array.from({ length: 1000 }, () => "1As99999")),
    work: "points",
  },
  {
    name: "many lines of DUP 99,999 with NPOINTS=16",
    text: file(
      Array.from({ length: 1000 }, () => "1As9999"),
      { NPOINTS: "16" },
    ),
    work: "none",
  },
  {
    name: "2,000,001 lines of one value each (no table of lines is kept)",
    text: file(Array.from({ length: MAX_POINTS + 1 }, () => "1A")),
    work: "points",
  },
  {
    name: "2,000,001 values on DIF lines each followed by a check-only line",
    text: file(Array.from({ length: MAX_POINTS + 2 }, (_, i) => (i % 2 === 0 ? "1AJ" : "2B"))),
    work: "points",
  },
  {
    name: "a run of 2,000,001 DIF characters",
    text: file([`1A${"J".repeat(MAX_POINTS + 1)}`]),
    work: "none",
  },
  { name: "a DUP after a DUP", text: file(["1ASs99999999"]), work: "none" },
  { name: "a DUP after the X", text: file(["1s99999999"]), work: "none" },
  { name: "a line of only DUP counts", text: file(["s99999999s99999999"]), work: "none" },
  {
    name: "differences that add up past the largest double",
    text: file([`1A J${"9".repeat(307)}S9`]),
    work: "points",
  },
  {
    name: "NPOINTS=99,999,999,999",
    text: file(["1 1 2"], { NPOINTS: "99999999999" }),
    work: "none",
  },
  { name: "NPOINTS=1e30", text: file(["1 1 2"], { NPOINTS: "1e30" }), work: "none" },
  {
    name: "NPOINTS=2,000,000 over 3 values",
    text: file(["1 1 2 3"], { NPOINTS: "2000000" }),
    work: "none",
  },
  { name: "XFACTOR=0", text: file(["1 1 2"], { XFACTOR: "0" }), work: "none" },
  { name: "YFACTOR=NaN", text: file(["1 1 2"], { YFACTOR: "NaN" }), work: "none" },
  { name: "YFACTOR=Infinity", text: file(["1 1 2"], { YFACTOR: "Infinity" }), work: "none" },
  { name: "YFACTOR=-Infinity", text: file(["1 1 2"], { YFACTOR: "-Infinity" }), work: "none" },
  { name: "YFACTOR=1e300", text: file(["1 1 2"], { YFACTOR: "1e300" }), work: "none" },
  { name: "XFACTOR=1e-300", text: file(["1 1 2"], { XFACTOR: "1e-300" }), work: "none" },
  {
    name: "FIRSTX and LASTX a whole double range apart",
    text: file([`1 ${"1 ".repeat(16)}`], { FIRSTX: "-1e308", LASTX: "1e308" }),
    work: "none",
  },
  {
    name: "negative wavelengths",
    text: file([`-500 ${"1 ".repeat(16)}`], { FIRSTX: "-500", LASTX: "-485" }),
    work: "none",
  },
  {
    name: "wavelengths past 1 m",
    text: file([`1000000000000 ${"1 ".repeat(16)}`], {
      FIRSTX: "1000000000000",
      LASTX: "1000000000015",
    }),
    work: "none",
  },
  {
    name: "a zero wavenumber",
    text: file([`0 ${"1 ".repeat(16)}`], { XUNITS: "1/CM", FIRSTX: "0", LASTX: "15" }),
    work: "none",
  },
  {
    name: "an infinite FIRSTX",
    text: file(["1 1 2"], { FIRSTX: "1e999" }),
    work: "none",
  },
];

/** Bytes the process holds in the JS heap and in array buffers (typed arrays live outside the heap). */
function heldBytes(): number {
  const usage = process.memoryUsage();
  return usage.heapUsed + usage.arrayBuffers;
}

describe("JCAMP-DX bombs", () => {
  it.each(BOMBS)("$name: refused, with bounded work and memory", ({ text, work }) => {
    const heldBefore = heldBytes();
    const rssBefore = process.memoryUsage().rss;
    let caught: unknown;
    try {
      parseJcamp(text);
    } catch (error) {
      caught = error;
    }
    const heldGrowth = heldBytes() - heldBefore;
    const rssGrowth = process.memoryUsage().rss - rssBefore;
    expect(caught).toBeInstanceOf(SpectrumParseError);
    expect((caught as SpectrumParseError).message).toMatch(/^Line \d+(, column \d+)?: /);
    expect(heldGrowth).toBeLessThan(50 * MB);
    expect(rssGrowth).toBeLessThan(50 * MB);

    // The decoder alone on the same block, with a meter: refused before expanding, or by the point limit.
    const block = readJcampStructure(text).blocks[0];
    const stated = Number(block.labels.find((label) => label.key === "NPOINTS")?.value);
    const declaredPoints = Number.isInteger(stated) && stated <= MAX_POINTS ? stated : undefined;
    const meter = { units: 0 };
    try {
      decodeJcampXyData(text, {
        ...block,
        maxPoints: MAX_POINTS,
        declaredPoints,
        workMeter: meter,
      });
    } catch (error) {
      expect(error).toBeInstanceOf(SpectrumParseError);
    }
    const dataCharacters = block.end - block.start;
    const bound = work === "none" ? dataCharacters : dataCharacters + MAX_POINTS;
    expect(meter.units).toBeGreaterThan(0);
    expect(meter.units).toBeLessThanOrEqual(bound);
  });

  it("refuses a file of 100,000 label lines at the label limit, without much memory", () => {
    const text = `##TITLE=labels (invented)\n${"##$A=1\n".repeat(100_000)}`;
    const heldBefore = heldBytes();
    let caught: unknown;
    try {
      parseJcamp(text);
    } catch (error) {
      caught = error;
    }
    expect(heldBytes() - heldBefore).toBeLessThan(50 * MB);
    expect(caught).toBeInstanceOf(SpectrumParseError);
    expect((caught as SpectrumParseError).message).toBe(
      "Line 20001: more than 20000 labelled lines; this reader takes no more",
    );
  });

  it("stops at its work bound, counted in characters and repeated values", () => {
    // 200 lines of a few values and DUP repeats: some 2,400 units of work, far past the bound of 500.
    const text = Array.from({ length: 200 }, (_, i) => `${i * 9 + 1}AU%U`).join("\n");
    const meter = { units: 0 };
    let caught: unknown;
    try {
      decodeJcampXyData(text, { maxWorkUnits: 500, workMeter: meter });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(SpectrumParseError);
    expect((caught as SpectrumParseError).code).toBe("too-large");
    expect((caught as SpectrumParseError).message).toMatch(/units of work/);
    // It stops within one line (or one DUP count) of the bound.
    expect(meter.units).toBeGreaterThan(500);
    expect(meter.units).toBeLessThanOrEqual(500 + 20);
  });

  it("refuses a DUP count over maxDupCount even with room under the point limit", () => {
    let caught: unknown;
    try {
      decodeJcampXyData("1AS01", { maxDupCount: 100 });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(SpectrumParseError);
    expect((caught as SpectrumParseError).message).toMatch(
      /^Line 1, column 3: a DUP count of 101 /,
    );
  });
});
