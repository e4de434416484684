// planImport finds each file row's draft line through a grid one tolerance wide; it must pick exactly
// what a scan of the species' rows in order picks (nearest within 0.002 nm, the earlier row on a tie),
// reject a second file row matching the same line, and reject a twin of a row the file already adds.
import { describe, expect, it } from "vitest";
import { MATCH_TOLERANCE_NM, planImport } from "@/lib/services/line-import-plan";
import type { LineDbRow } from "@/lib/services/line-library-rows";

const SPECIES = ["Fe I", "Ni I"];

function draftRow(i: number, species: string, vacuumNm: number): LineDbRow {
  return {
    id: `00000000-0000-4000-8000-${String(i).padStart(12, "0")}`,
    release_id: "r",
    line_key: `10000000-0000-4000-8000-${String(i).padStart(12, "0")}`,
    species,
    element: species.split(" ")[0],
    ion_stage: 1,
    air_nm: null,
    vacuum_nm: vacuumNm,
    uncertainty_nm: null,
    intensity_flame: null,
    intensity_arc: null,
    intensity_spark: null,
    intensity_plasma: null,
    intensity_lamp: null,
    lower_ev: null,
    upper_ev: null,
    g_upper: null,
    a_per_s: null,
    flags: [],
    band_extent_nm: null,
    band_degrades_to: null,
    source: "test source",
    note: "",
    verified_by_id: null,
    verified_by_name: null,
    verified_at: null,
    verified_citation: null,
    retired: false,
    version: 1,
  };
}

/** The old matching: scan every candidate in order, keep the strictly nearest within the tolerance. */
function scanNearest<T extends { vacuumNm: number }>(pool: T[], vacuumNm: number): T | null {
  let best: T | null = null;
  for (const c of pool) {
    const d = Math.abs(c.vacuumNm - vacuumNm);
    if (d <= MATCH_TOLERANCE_NM && (best === null || d < Math.abs(best.vacuumNm - vacuumNm)))
      best = c;
  }
  return best;
}

describe("planImport's grid", () => {
  for (const seed of [1, 2, 3, 4, 5]) {
    it(`matches as a scan in order does (seed ${seed})`, () => {
      let state = seed;
      const random = () => (state = (state * 1103515245 + 12345) % 2147483648) / 2147483648;
      // Vacuum-ultraviolet wavelengths (tables give vacuum there), spaced about the tolerance apart.
      const draft = Array.from({ length: 300 }, (_, i) =>
        draftRow(i, SPECIES[i % 2], Number((180 + random() * 0.3).toFixed(4))),
      );
      const fileRows = Array.from({ length: 300 }, () => ({
        species: SPECIES[Math.floor(random() * 2)],
        vacuumNm: Number((180 + random() * 0.32).toFixed(4)),
      }));
      const csv = [
        "species,vacuum_nm,source,note",
        ...fileRows.map((r) => `${r.species},${r.vacuumNm.toFixed(4)},test source,from the file`),
      ].join("\n");
      const { preview } = planImport("r", csv, draft);

      const matched = new Set<string>();
      const added: { species: string; vacuumNm: number }[] = [];
      const expected = {
        changes: [] as [number, string][],
        errors: [] as number[],
        adds: [] as number[],
      };
      fileRows.forEach((row, i) => {
        const csvLine = i + 2;
        const pool = draft
          .filter((d) => d.species === row.species)
          .map((d) => ({ vacuumNm: d.vacuum_nm, id: d.id }));
        const hit = scanNearest(pool, row.vacuumNm);
        if (hit) {
          if (matched.has(hit.id)) expected.errors.push(csvLine);
          else {
            matched.add(hit.id);
            expected.changes.push([csvLine, hit.id]);
          }
          return;
        }
        if (
          scanNearest(
            added.filter((a) => a.species === row.species),
            row.vacuumNm,
          )
        )
          expected.errors.push(csvLine);
        else {
          added.push(row);
          expected.adds.push(csvLine);
        }
      });
      expect(preview.changes.map((c) => [c.csvLine, c.lineId])).toEqual(expected.changes);
      expect(preview.errors.map((e) => e.line)).toEqual(expected.errors);
      expect(preview.adds.map((a) => a.csvLine)).toEqual(expected.adds);
      // Not a vacuous comparison: the data has matches, duplicates and adds.
      expect(expected.changes.length).toBeGreaterThan(20);
      expect(expected.errors.length).toBeGreaterThan(5);
      expect(expected.adds.length).toBeGreaterThan(5);
    });
  }
});

describe("planImport's line keys", () => {
  it("matches a keyed row by its key, not its wavelength, and locates a bad key in its column", () => {
    const draft = [draftRow(1, "Fe I", 180.1), draftRow(2, "Fe I", 180.5)];
    const csv = [
      "# an export, edited",
      "species,vacuum_nm,line_key,source,note",
      // Line 3 sits at the first line's wavelength but names the second line: the key wins.
      `Fe I,180.1,${draft[1].line_key},test source,moved`,
      "Fe I,180.3,not-a-key,test source,",
      "Fe I,180.7,10000000-0000-4000-8000-999999999999,test source,",
    ].join("\n");
    const { preview } = planImport("r", csv, draft);
    expect(preview.changes.map((c) => [c.csvLine, c.lineKey, c.fields])).toEqual([
      [3, draft[1].line_key, ["vacuumNm", "note"]],
    ]);
    expect(preview.errors.map((e) => [e.line, e.column, e.field])).toEqual([
      [4, 3, "line_key"],
      [5, 3, "line_key"],
    ]);
  });
});
