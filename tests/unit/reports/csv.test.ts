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

  it("refuses a row of the wrong width", () => {
    expect(() => formatCsv(["a", "b"], [["only one"]])).toThrow(RangeError);
  });
});

describe("formatPeaksCsv", () => {
  const run = sampleRun();
  const rows = parse(formatPeaksCsv(run.peaks, sampleMatches, run.calls, run.verdicts));

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
      formatNotebookCallsCsv([
        { run: sampleRun(), authorName: "Chris Chemist", instrumentName: "Grating bench" },
        { run: overridden, authorName: null, instrumentName: "Prism bench" },
        { run: empty, authorName: "Chris Chemist", instrumentName: "Grating bench" },
      ]),
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
