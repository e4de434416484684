// Checks the XYDATA decoder on hand-made files of each ASDF form (AFFN, PAC, SQZ, DIF, DUP), the Y check
// value of DIF lines, and the label checks (factors, FIRSTX/LASTX/DELTAX/NPOINTS, axes) that refuse a file.
import { describe, expect, it } from "vitest";
import {
  SpectrumParseError,
  parseJcamp,
  type SpectrumParseErrorCode,
} from "../../../../lib/spectrum/io";
import { decodeJcampXyData } from "../../../../lib/spectrum/io/decode-jcamp-xy-data";

interface Header {
  xUnits?: string;
  firstX?: string;
  lastX?: string;
  deltaX?: string;
  nPoints?: string;
  xFactor?: string;
  yFactor?: string;
}

/** A JCAMP-DX file around `data` lines; a header field set to "" is left out. Data start at line 13. */
function jdx(data: string[], header: Header = {}): string {
  const {
    xUnits = "NANOMETERS",
    firstX = "1",
    lastX = "10",
    deltaX = "1",
    nPoints = "10",
    xFactor = "1",
    yFactor = "1",
  } = header;
  const label = (name: string, value: string) =>
    value === "" ? "$$ (left out)" : `##${name}=${value}`;
  return [
    "##TITLE=ASDF form test (invented data)",
    "##JCAMP-DX=4.24",
    "##DATA TYPE=UV/VIS SPECTRUM",
    label("XUNITS", xUnits),
    "##YUNITS=ARBITRARY UNITS",
    label("XFACTOR", xFactor),
    label("YFACTOR", yFactor),
    label("FIRSTX", firstX),
    label("LASTX", lastX),
    label("DELTAX", deltaX),
    label("NPOINTS", nPoints),
    "##XYDATA=(X++(Y..Y))",
    ...data,
    "##END=",
  ].join("\n");
}

const read = (text: string) => parseJcamp(text, { minPoints: 4 });

function refusal(run: () => unknown): {
  code: SpectrumParseErrorCode;
  line: number | null;
  column: number | null;
  message: string;
} {
  try {
    run();
  } catch (error) {
    if (!(error instanceof SpectrumParseError)) throw error;
    return { code: error.code, line: error.line, column: error.column, message: error.message };
  }
  throw new Error("expected a SpectrumParseError");
}

// The ten ordinates 1 2 3 3 2 1 0 −1 −2 −3 written in each ASDF form, as JCAMP-DX 4.24's table of
// compression forms shows them (McDonald & Wilks 1988, Appl. Spectrosc. 42, 151, section on XYDATA
// compression; from memory).
const TEN = [1, 2, 3, 3, 2, 1, 0, -1, -2, -3];

describe("the ASDF forms", () => {
  it.each([
    // AFFN: free-format numbers separated by blanks (JCAMP-DX 4.24, ASDF forms; from memory)
    ["AFFN", "1 1 2 3 3 2 1 0 -1 -2 -3"],
    // PAC: a + or − sign is the separator (JCAMP-DX 4.24, ASDF forms; from memory)
    ["PAC", "1+1+2+3+3+2+1+0-1-2-3"],
    // SQZ: the sign and first digit in one letter, @ A–I for 0 to +9, a–i for −1 to −9 (JCAMP-DX 4.24; from memory)
    ["SQZ", "1ABCCBA@abc"],
    // DIF: differences, % J–R for 0 to +9, j–r for −1 to −9, after a SQZ start (JCAMP-DX 4.24; from memory)
    ["DIF", "1AJJ%jjjjjj"],
    // DIFDUP: S–Z and s repeat the previous value or difference 1–9 times in all (JCAMP-DX 4.24; from memory)
    ["DIFDUP", "1AJT%jX"],
    // SQZDUP: a DUP count after a SQZ value repeats the value (JCAMP-DX 4.24; from memory)
    ["SQZDUP", "1ABCTBA@abc"],
  ])("%s decodes to the ten ordinates", (_, line) => {
    const spectrum = read(jdx([line]));
    expect(Array.from(spectrum.y)).toEqual(TEN);
    expect(Array.from(spectrum.x)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
  });

  it("reads multi-digit SQZ, DIF and DUP values and decimal points", () => {
    // SQZ A23 = +123, DIF J0 = +10, DUP S2 = 12 in all; a decimal point may follow the first digit
    // (JCAMP-DX 4.24, ASDF forms; from memory)
    // The second line opens with the Y check B43 = 243 (the last Y repeated), then j.5, a difference of −1.5.
    const lines: number[][] = [];
    const decoded = decodeJcampXyData("1A23J0S2\n13B43j.5", {
      onLine: (...line) => lines.push(line),
    });
    const expected = Array.from({ length: 13 }, (_, i) => 123 + 10 * i);
    expect(Array.from(decoded.y)).toEqual([...expected, 241.5]);
    // [line, X, index of the X's ordinate, index of the first value the line adds]
    expect(lines).toEqual([
      [1, 1, 0, 0],
      [2, 13, 12, 13],
    ]);
    expect(decoded.lineCount).toBe(2);
  });
});

describe("the Y check value of DIF lines", () => {
  // In DIF form the last ordinate of a line is repeated as the first ordinate of the next, and the
  // line's X is that ordinate's abscissa (JCAMP-DX 4.24, Y-value check; from memory). The last line
  // of such a block holds only the X and the check value.
  const lines = ["1AJJ%j", "5Bjj", "7@jjj", "10c"];

  it("drops the check values and keeps each point once", () => {
    const spectrum = read(jdx(lines));
    expect(Array.from(spectrum.y)).toEqual(TEN);
  });

  it("refuses a check value that differs from the last Y, at its line and column", () => {
    const bad = [...lines];
    bad[1] = "5Cjj";
    expect(refusal(() => read(jdx(bad)))).toMatchObject({
      code: "jcamp-structure",
      line: 14,
      column: 2,
    });
  });

  it("refuses a line after a DIF line that does not open with the check value", () => {
    const bad = [...lines];
    bad[1] = "6jj";
    expect(refusal(() => read(jdx(bad)))).toMatchObject({ code: "jcamp-structure", line: 14 });
  });

  it("does not look for a check value after a line that ends in SQZ form", () => {
    const spectrum = read(jdx(["1ABCC", "5BA@ab", "10c"]));
    expect(Array.from(spectrum.y)).toEqual(TEN);
  });
});

describe("labels and axes", () => {
  it("applies XFACTOR and YFACTOR, and takes DELTAX when LASTX is absent", () => {
    const spectrum = read(
      jdx(["1000AJJ%jjjjjj"], {
        xFactor: "0.5",
        yFactor: "0.25",
        firstX: "500",
        lastX: "",
        deltaX: "0.5",
      }),
    );
    expect(Array.from(spectrum.y)).toEqual(TEN.map((v) => v * 0.25));
    expect(spectrum.x[9]).toBe(504.5);
  });

  it("reads a descending axis and returns it increasing", () => {
    const spectrum = read(
      jdx(["10 1 2 3 3 2 1 0 -1 -2 -3"], { firstX: "10", lastX: "1", deltaX: "-1" }),
    );
    expect(Array.from(spectrum.x)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(Array.from(spectrum.y)).toEqual([...TEN].reverse());
  });

  it.each([
    ["0", "out-of-range"],
    ["-0", "out-of-range"],
    ["NaN", "not-finite"],
    ["Infinity", "not-finite"],
    ["1e999", "not-finite"],
    ["1e31", "out-of-range"],
    ["1e-31", "out-of-range"],
    ["abc", "non-numeric"],
  ])("refuses the factor %s at its label line", (factor, code) => {
    expect(
      refusal(() => read(jdx(["1 1 2 3 3 2 1 0 -1 -2 -3"], { yFactor: factor }))),
    ).toMatchObject({
      code,
      line: 7,
      column: null,
    });
    expect(
      refusal(() => read(jdx(["1 1 2 3 3 2 1 0 -1 -2 -3"], { xFactor: factor }))),
    ).toMatchObject({
      code,
      line: 6,
    });
  });

  it("says where a refusal is, in the message", () => {
    expect(refusal(() => read(jdx(["1 1 2 3"], { yFactor: "0" }))).message).toMatch(
      /^Line 7: YFACTOR=0 /,
    );
  });

  it("checks FIRSTX, LASTX, DELTAX and NPOINTS against each other and the data", () => {
    const data = ["1 1 2 3 3 2 1 0 -1 -2 -3"];
    // DELTAX 2 where (LASTX − FIRSTX)/(NPOINTS − 1) is 1
    expect(refusal(() => read(jdx(data, { deltaX: "2" })))).toMatchObject({
      code: "jcamp-structure",
      line: 10,
    });
    // FIRSTX = LASTX: every point at one x
    expect(refusal(() => read(jdx(data, { lastX: "1", deltaX: "" })))).toMatchObject({
      code: "jcamp-structure",
      line: 9,
    });
    // No FIRSTX, or neither LASTX nor DELTAX
    expect(refusal(() => read(jdx(data, { firstX: "" })))).toMatchObject({
      code: "jcamp-structure",
      line: 12,
    });
    expect(refusal(() => read(jdx(data, { lastX: "", deltaX: "" })))).toMatchObject({
      code: "jcamp-structure",
      line: 12,
    });
    // NPOINTS that is not a whole number, or fewer than the data hold (stopped at the extra value)
    expect(refusal(() => read(jdx(data, { nPoints: "9.5" })))).toMatchObject({
      code: "jcamp-structure",
      line: 11,
    });
    expect(refusal(() => read(jdx(data, { nPoints: "9" })))).toMatchObject({
      code: "jcamp-structure",
      line: 13,
      column: 23,
    });
    // A later line's X far from where its first Y falls: points lost between lines
    expect(refusal(() => read(jdx(["1 1 2 3 3 2", "9 1 0 -1 -2 -3"])))).toMatchObject({
      code: "jcamp-structure",
      line: 14,
      column: 1,
    });
  });

  it.each([
    ["a negative wavelength", { firstX: "-5", lastX: "4", deltaX: "" }, "NANOMETERS"],
    ["a zero wavelength", { firstX: "0", lastX: "9", deltaX: "" }, "NANOMETERS"],
    [
      "a wavelength over 1 m",
      { firstX: "1000000000", lastX: "2000000000", deltaX: "" },
      "NANOMETERS",
    ],
    ["micrometres over 1 m", { firstX: "1000000", lastX: "2000000", deltaX: "" }, "MICROMETERS"],
    ["a zero wavenumber", { firstX: "0", lastX: "9", deltaX: "" }, "1/CM"],
    ["a negative pixel", { firstX: "-1", lastX: "8", deltaX: "" }, "PIXELS"],
  ])("refuses %s", (_, header, xUnits) => {
    const line = `${header.firstX} 1 2 3 3 2 1 0 -1 -2 -3`;
    expect(refusal(() => read(jdx([line], { ...header, xUnits }))).code).toBe("out-of-range");
  });

  it("refuses non-finite axis labels", () => {
    expect(refusal(() => read(jdx(["1 1 2 3"], { firstX: "1e400" })))).toMatchObject({
      code: "not-finite",
      line: 8,
    });
  });

  it("refuses a data form it does not read, and a DUP or DIF with nothing to repeat", () => {
    expect(
      refusal(() => read(jdx(["1 1 2 3"]).replace("(X++(Y..Y))", "(X++(R..R))"))),
    ).toMatchObject({
      code: "jcamp-structure",
      line: 12,
    });
    expect(refusal(() => read(jdx(["1S3"])))).toMatchObject({
      code: "jcamp-structure",
      line: 13,
      column: 2,
    });
    expect(refusal(() => read(jdx(["1J"])))).toMatchObject({
      code: "jcamp-structure",
      line: 13,
      column: 2,
    });
    expect(refusal(() => read(jdx(["1ATT"])))).toMatchObject({
      code: "jcamp-structure",
      line: 13,
      column: 4,
    });
    expect(refusal(() => read(jdx(["S 1 2"])))).toMatchObject({
      code: "jcamp-structure",
      line: 13,
      column: 1,
    });
    expect(refusal(() => read(jdx(["1AT.5"])))).toMatchObject({
      code: "non-numeric",
      line: 13,
      column: 3,
    });
    expect(refusal(() => read(jdx(["1 1.2.3"])))).toMatchObject({
      code: "non-numeric",
      line: 13,
      column: 3,
    });
    expect(refusal(() => read(jdx(["1 ?"])))).toMatchObject({
      code: "non-numeric",
      line: 13,
      column: 3,
    });
  });

  it("keeps labels as written in meta, without $$ comments, continuation lines joined", () => {
    const text = jdx(["1 1 2 3 3 2 1 0 -1 -2 -3"])
      .replace(
        "##TITLE=ASDF form test (invented data)",
        () => "##TITLE=first line $$ a comment\nsecond line",
      )
      .replace("##JCAMP-DX=4.24", () => "##JCAMP-DX=4.24\n##$Lamp Gas=Ne");
    const spectrum = read(text);
    expect(spectrum.meta.TITLE).toBe("first line\nsecond line");
    expect(spectrum.meta["$Lamp Gas"]).toBe("Ne");
    expect(spectrum.meta.DATATYPE).toBe("UV/VIS SPECTRUM");
    expect(spectrum.meta.NPOINTS).toBe("10");
  });

  it("reads the chosen block of a LINK file with its own labels", () => {
    const one = jdx(["1 1 2 3 3 2 1 0 -1 -2 -3"]);
    const two = jdx(["5 5 5 5 5 5"], { firstX: "5", lastX: "9", nPoints: "5", xUnits: "1/CM" });
    const link = `##TITLE=link\n##JCAMP-DX=4.24\n##BLOCKS=2\n${one}\n${two}\n##END=\n`;
    expect(Array.from(read(link).y)).toEqual(TEN);
    const second = parseJcamp(link, { blockIndex: 1, minPoints: 4 });
    expect(second.xUnit).toBe("wavenumber");
    expect(Array.from(second.y)).toEqual([5, 5, 5, 5, 5]);
    expect(refusal(() => parseJcamp(link, { blockIndex: 2 })).message).toMatch(
      /only 2 data blocks/,
    );
  });
});
