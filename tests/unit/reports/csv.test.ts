// The peaks CSV and the notebook calls CSV: RFC 4180 text that parses back with a CSV parser to one
// row per peak × candidate (or run × call), numbers kept as numbers, formula-like text neutralised.
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { formatCsv } from "@/lib/reports/csv-table";
import {
  formatNotebookCallsCsv,
  NOTEBOOK_CALLS_CSV_COLUMNS,
} from "@/lib/reports/notebook-calls-csv";
import { formatPeaksCsv, PEAKS_CSV_COLUMNS } from "@/lib/reports/peaks-csv";
import { NA_D1, NA_D2, sampleMatches, sampleRun } from "./fixtures";

function parse(text: string): Record<string, string>[] {
  const parsed = Papa.parse<Record<string, string>>(text, {
    header: true,
    skipEmptyLines: true,
    delimiter: ",",
    comments: "#",
  });
  expect(parsed.errors).toEqual([]);
  return parsed.data;
}

describe("formatCsv", () => {
  it("ends lines in CRLF and quotes commas, quotes and line breaks (RFC 4180)", () => {
    const text = formatCsv(
      ["a", "b"],
      [
        ["x, y", 'say "hi"'],
        ["two\nlines", 1.5],
      ],
    );
    expect(text).toBe('a,b\r\n"x, y","say ""hi"""\r\n"two\nlines",1.5\r\n');
  });

  it("prefixes text that a spreadsheet would run as a formula, and leaves numbers alone (common practice)", () => {
    const text = formatCsv(
      ["v"],
      [['=HYPERLINK("x")'], ["+1"], ["-2"], ["@SUM(A1)"], [-0.004], ["plain"]],
    );
    const cells = parse(text).map((r) => r.v);
    expect(cells).toEqual(['\'=HYPERLINK("x")', "'+1", "'-2", "'@SUM(A1)", "-0.004", "plain"]);
  });

  it("writes comment lines above the header, each one cell that no spreadsheet runs as a formula", () => {
    const text = formatCsv(["a"], [[1]], { comments: ["run x, release 3;\tthen\n=EVIL()"] });
    expect(text).toBe("# run x - release 3 - then =EVIL()\r\na\r\n1\r\n");
    expect(parse(text)).toEqual([{ a: "1" }]);
  });

  it("refuses a row of the wrong width", () => {
    expect(() => formatCsv(["a", "b"], [["only one"]])).toThrow(RangeError);
  });
});

describe("formatPeaksCsv", () => {
  const run = sampleRun();
  const text = formatPeaksCsv(run, sampleMatches);
  const rows = parse(text);

  it("opens with comments naming the run, the release and the caveat", () => {
    const comments = text.split("\r\n").filter((line) => line.startsWith("# "));
    expect(comments[0]).toBe(`# Emberline peaks and candidate lines of run ${run.id} version 1`);
    expect(comments[1]).toBe(
      `# Line-table release 3 (${run.lineReleaseId}) - software ${run.softwareVersion}`,
    );
    expect(comments[2]).toMatch(/^# Qualitative screening result only - not a certified analysis/);
    expect(text.split("\r\n")[comments.length]).toBe(PEAKS_CSV_COLUMNS.join(","));
  });

  it("writes each number with the digits its uncertainty supports", () => {
    const noisy = sampleRun({
      peaks: [
        {
          x: 1000.123456789,
          wavelengthNm: 589.0012345678901,
          uncertaintyNm: 0.0031234567,
          fwhmNm: 0.512345678901,
          height: 12345.6789,
          snr: 153.456789,
          saturated: false,
          blended: false,
        },
        {
          x: 1500.5,
          wavelengthNm: 670.79123456,
          uncertaintyNm: 0.0456789,
          fwhmNm: 0.8765432,
          height: 31.23456,
          snr: 4.56789,
          saturated: false,
          blended: false,
        },
      ],
    });
    const matches = [
      {
        peakIndex: 0,
        candidates: [
          {
            lineId: "line-na-d2",
            species: "Na I",
            kind: "line",
            referenceNm: 588.9950000000001,
            deltaNm: 0.0062345678901,
            sigmaNm: 0.012345678,
            deltaSigma: 0.50501234,
          },
        ],
      },
    ];
    const [na, li] = parse(formatPeaksCsv(noisy, matches));
    // GUM 7.2.6 (from memory): the uncertainty to two significant digits, the value to its last place.
    expect(na).toMatchObject({
      peak_nm: "589.0012",
      peak_uncertainty_nm: "0.0031",
      fwhm_nm: "0.5123",
      // Noise = height/snr = 80.4 counts: its two significant digits end at the units.
      height_counts: "12346",
      snr: "153",
      reference_nm: "588.995",
      // sigma 0.012 nm (two digits): Δλ to the thousandth.
      delta_nm: "0.006",
      delta_over_sigma: "0.51",
    });
    expect(li).toMatchObject({
      peak_nm: "670.791",
      peak_uncertainty_nm: "0.046",
      fwhm_nm: "0.877",
      height_counts: "31.2",
      snr: "4.6",
    });
    // No cell carries the 15–17 digits of a double.
    for (const row of [na, li]) {
      for (const value of Object.values(row)) expect(value).not.toMatch(/\d{9,}|\.\d{7,}/);
    }
  });

  it("has one row per peak and candidate, and one for a peak without any", () => {
    expect(Object.keys(rows[0])).toEqual([...PEAKS_CSV_COLUMNS]);
    // Peak 0 has two candidates, peaks 1 and 2 one each, peak 3 none.
    expect(rows).toHaveLength(5);
    expect(rows.map((r) => r.candidate_species)).toEqual(["Na I", "Ba I", "Na I", "K I", ""]);
    expect(Number(rows[4].peak_nm)).toBe(701.2);
  });

  it("says which candidate the calls used and who took the peak", () => {
    expect(rows[0]).toMatchObject({
      candidate_used_by_call: "yes",
      candidate_standing_verdict: "present",
      peak_assigned_to: "Na I",
    });
    expect(rows[1]).toMatchObject({
      candidate_used_by_call: "no",
      candidate_standing_verdict: "absent",
      peak_assigned_to: "Na I",
    });
    expect(rows[0].flags).toBe("blended");
    expect(Number(rows[0].reference_nm)).toBe(NA_D2);
    expect(Number(rows[2].reference_nm)).toBe(NA_D1);
    // A negative Δλ is a number, not an escaped text.
    expect(rows[2].delta_nm).toBe("-0.004");
    expect(Number(rows[2].delta_over_sigma)).toBe(-0.4);
  });
});

describe("formatNotebookCallsCsv", () => {
  it("lists every run's calls with the standing and computed verdicts and the override reason", () => {
    const overridden = sampleRun({
      id: "99999999-8888-4777-8666-555555555555",
      versionNumber: 2,
      status: "signed",
      overrides: [
        {
          id: "o",
          species: "K I",
          computedVerdict: "possible",
          verdict: "present",
          reason: "=also seen at 769.9 nm",
          byName: "C",
          at: "2026-03-01T11:00:00.000Z",
        },
      ],
      verdicts: { "Na I": "present", "K I": "present", "Ba I": "absent" },
    });
    const empty = sampleRun({
      id: "aaaaaaaa-8888-4777-8666-555555555555",
      calls: [],
      verdicts: {},
    });
    const rows = parse(
      formatNotebookCallsCsv(
        [
          { run: sampleRun(), authorName: "Chris Chemist", instrumentName: "Grating bench" },
          { run: overridden, authorName: null, instrumentName: "Prism bench" },
          { run: empty, authorName: "Chris Chemist", instrumentName: "Grating bench" },
        ],
        { notebookId: "11111111-2222-4333-8444-555555555555" },
      ),
    );
    expect(Object.keys(rows[0])).toEqual([...NOTEBOOK_CALLS_CSV_COLUMNS]);
    expect(rows).toHaveLength(3 + 3 + 1);
    const k = rows.find((r) => r.run_id === overridden.id && r.species === "K I")!;
    expect(k).toMatchObject({
      version: "2",
      status: "signed",
      standing_verdict: "present",
      computed_verdict: "possible",
      instrument: "Prism bench",
    });
    expect(k.override_reason).toBe("'=also seen at 769.9 nm");
    expect(rows.filter((r) => r.run_id === empty.id)).toEqual([
      expect.objectContaining({ species: "", standing_verdict: "" }),
    ]);
    expect(rows.find((r) => r.species === "Na I")).toMatchObject({
      lines_seen: "2",
      lines_missing: "0",
      author: "Chris Chemist",
    });
    // An absent call carries its detection limit; a present one leaves the cells empty.
    expect(rows.find((r) => r.species === "Ba I")).toMatchObject({
      detection_limit_nm: "553.548",
      detection_limit_counts: "48",
      detection_limit_of_strongest: "0.004",
    });
    expect(rows.find((r) => r.species === "Na I")).toMatchObject({
      detection_limit_nm: "",
      detection_limit_counts: "",
    });
  });
});
