// Checks that the capped missing-line listing changes no verdict, rank or score: a plain scan over
// every line of a 30,000-line table (the reference below) must give the same calls.
import { describe, it, expect } from "vitest";
import {
  matchPeaksToLines,
  prepareLineIndex,
  scoreElements,
} from "../../../../lib/spectrum/matching";
import type { PeakMatch } from "../../../../lib/spectrum/matching";
import type { CalibratedPeak, ReferenceLine } from "../../../../lib/spectrum/types";
import { makeRandom } from "../../../../lib/spectrum/statistics";
import { twoLineDip } from "../../../../lib/spectrum/matching/two-line-dip";

const RANGE_NM: [number, number] = [400, 700];
const STRONG = 0.3;
const MISSING_SNR = 3 * 2;

/** Species, how many lines, on which scale, and how their intensities spread. */
const SPECIES = [
  { name: "Aa I", count: 8, scale: "flame", spread: (u: number) => 10 + 990 * u },
  // Mostly weak lines: a few strong ones stand out of thousands.
  { name: "Bb I", count: 12_000, scale: "flame", spread: (u: number) => 1 + 1000 * u ** 12 },
  { name: "Cc II", count: 9_000, scale: "arc", spread: (u: number) => 1 + 999 * u },
  { name: "Dd I", count: 8_972, scale: "flame", spread: (u: number) => 1 + 999 * u ** 3 },
  { name: "Ee I", count: 20, scale: "flame", spread: (u: number) => 100 + 900 * u },
] as const;

function syntheticTable(): ReferenceLine[] {
  const random = makeRandom(30);
  const table: ReferenceLine[] = [];
  for (const species of SPECIES) {
    for (let i = 0; i < species.count; i++) {
      // A few lines of every species lie outside the range, to be ignored.
      const airNm = 390 + 320 * random.uniform();
      table.push({
        id: `${species.name}-${i}`,
        species: species.name,
        element: species.name.split(" ")[0],
        ionStage: species.name.endsWith("II") ? 2 : 1,
        airNm,
        vacuumNm: airNm * 1.00028,
        uncertaintyNm: 0.002,
        intensities: { [species.scale]: species.spread(random.uniform()) },
        flags: {},
      });
    }
  }
  return table;
}

function peakAt(wavelengthNm: number, snr: number): CalibratedPeak {
  return {
    index: 0,
    x: wavelengthNm,
    xUncertainty: 0.01,
    height: 10 * snr,
    fwhm: 0.5,
    area: 5 * snr,
    snr,
    saturated: false,
    blended: false,
    wavelengthNm,
    wavelengthUncertaintyNm: 0.01,
    fwhmNm: 0.5,
  };
}

/** Peaks on Aa's lines, on Bb's strongest lines, and at random places, shuffled by wavelength. */
function syntheticPeaks(table: ReferenceLine[]): CalibratedPeak[] {
  const random = makeRandom(31);
  const inRange = (l: ReferenceLine) => l.airNm >= RANGE_NM[0] && l.airNm <= RANGE_NM[1];
  const peaks: CalibratedPeak[] = [];
  for (const line of table.filter((l) => l.species === "Aa I" && inRange(l))) {
    peaks.push(peakAt(line.airNm + 0.02, 2 * (line.intensities.flame ?? 0)));
  }
  const bb = table
    .filter((l) => l.species === "Bb I" && inRange(l))
    .sort((a, b) => b.intensities.flame! - a.intensities.flame!);
  for (const line of bb.slice(0, 6))
    peaks.push(peakAt(line.airNm - 0.03, 3 * line.intensities.flame!));
  for (let i = 0; i < 60; i++) {
    peaks.push(peakAt(RANGE_NM[0] + 300 * random.uniform(), 8 + 400 * random.uniform() ** 2));
  }
  return peaks.sort((a, b) => a.wavelengthNm - b.wavelengthNm);
}

interface ReferenceMissing {
  lineIndex: number;
  relative: number;
  nm: number;
  predictedSnr: number | null;
  hiddenByPeakIndex: number | null;
}

interface ReferenceCall {
  species: string;
  verdict: string;
  score: number;
  missing: ReferenceMissing[];
  strongMissing: number;
}

/**
 * docs/identification-scoring.md §4–7 as a straightforward loop over every line of the table
 * (no index, no trees, full missing lists), for flames with no ubiquitous species.
 */
function referenceScoring(matches: PeakMatch[], table: ReferenceLine[]): ReferenceCall[] {
  const relative = new Map<number, number>();
  const basisOf = new Map<string, string>();
  for (const name of new Set(table.map((l) => l.species))) {
    const members = table.map((l, i) => [l, i] as const).filter(([l]) => l.species === name);
    const basis = (["flame", "arc", "plasma", "spark", "lamp"] as const).find((kind) =>
      members.some(([l]) => (l.intensities[kind] ?? 0) > 0),
    );
    if (!basis) continue;
    basisOf.set(name, basis);
    const strongest = Math.max(...members.map(([l]) => l.intensities[basis] ?? 0));
    for (const [l, i] of members) {
      if ((l.intensities[basis] ?? 0) > 0) relative.set(i, l.intensities[basis]! / strongest);
    }
  }
  const best = new Map<number, { match: PeakMatch; sigma: number }>();
  for (const match of matches) {
    for (const c of match.candidates) {
      const held = best.get(c.lineIndex);
      const sigma = Math.abs(c.deltaSigma);
      if (
        !held ||
        sigma < held.sigma ||
        (sigma === held.sigma && match.peakIndex < held.match.peakIndex)
      ) {
        best.set(c.lineIndex, { match, sigma });
      }
    }
  }
  type Group = {
    peakIndex: number;
    snr: number;
    weight: number;
    rated: number;
    quality: number;
    lines: number[];
  };
  const groups = new Map<string, Map<number, Group>>();
  for (const [lineIndex, { match, sigma }] of [...best].sort((a, b) => a[0] - b[0])) {
    const name = table[lineIndex].species;
    if (!groups.has(name)) groups.set(name, new Map());
    const bySpecies = groups.get(name)!;
    if (!bySpecies.has(match.peakIndex)) {
      bySpecies.set(match.peakIndex, {
        peakIndex: match.peakIndex,
        snr: match.peak.snr,
        weight: 0,
        rated: 0,
        quality: Infinity,
        lines: [],
      });
    }
    const group = bySpecies.get(match.peakIndex)!;
    group.lines.push(lineIndex);
    group.rated += relative.get(lineIndex) ?? 0;
    group.weight += relative.get(lineIndex) ?? 0.1;
    group.quality = Math.min(group.quality, sigma);
  }
  const byWavelength = [...matches].sort((a, b) => a.peak.wavelengthNm - b.peak.wavelengthNm);
  const inRange = (nm: number) => nm >= RANGE_NM[0] && nm <= RANGE_NM[1];
  const work = new Map<
    string,
    {
      groups: Group[];
      missing: ReferenceMissing[];
      missingWeight: number;
      strongInRange: number;
      anchor: Group | null;
    }
  >();
  for (const name of new Set(table.map((l) => l.species))) {
    const own = [...(groups.get(name)?.values() ?? [])].sort((a, b) => a.peakIndex - b.peakIndex);
    for (const g of own) {
      g.rated = Math.min(1, g.rated);
      g.weight = Math.min(1, g.weight);
      g.quality = Math.exp(-0.5 * (g.quality / 2) ** 2);
    }
    const lineIndices = table
      .map((l, i) => i)
      .filter((i) => table[i].species === name && inRange(table[i].airNm));
    const strongInRange = lineIndices.filter((i) => (relative.get(i) ?? 0) >= STRONG).length;
    if (own.length === 0 && strongInRange === 0) continue;
    let anchor: Group | null = null;
    for (const g of own) if (g.rated > 0 && (!anchor || g.snr > anchor.snr)) anchor = g;
    const scale = anchor ? anchor.snr / anchor.rated : null;
    const weight = basisOf.get(name) === "flame" ? 1 : 0.5;
    const missing: ReferenceMissing[] = [];
    let missingWeight = 0;
    for (const i of lineIndices) {
      const r = relative.get(i);
      if (r === undefined || best.has(i)) continue;
      const nm = table[i].airNm;
      if (scale === null) {
        if (r >= (own.length > 0 ? 0 : STRONG))
          missing.push({
            lineIndex: i,
            relative: r,
            nm,
            predictedSnr: null,
            hiddenByPeakIndex: null,
          });
        continue;
      }
      const predictedSnr = scale * r;
      if (predictedSnr < MISSING_SNR) continue;
      let hider: PeakMatch | null = null;
      for (const m of byWavelength) {
        const apartNm = Math.abs(m.peak.wavelengthNm - nm);
        // Outshone three times, or a companion too close to be resolved from the peak.
        const unresolved =
          predictedSnr <= m.peak.snr &&
          m.peak.snr *
            twoLineDip(
              apartNm / (m.peak.resolutionNm ?? m.peak.fwhmNm),
              predictedSnr / m.peak.snr,
            ) <
            6;
        if (apartNm > 1.5 * m.peak.fwhmNm || (m.peak.snr < 3 * predictedSnr && !unresolved))
          continue;
        if (!hider || m.peak.snr > hider.peak.snr) hider = m;
      }
      missing.push({
        lineIndex: i,
        relative: r,
        nm,
        predictedSnr,
        hiddenByPeakIndex: hider ? hider.peakIndex : null,
      });
      if (!hider) missingWeight += weight * r;
    }
    missing.sort((a, b) => b.relative - a.relative || a.nm - b.nm);
    work.set(name, { groups: own, missing, missingWeight, strongInRange, anchor });
  }
  const claimants = new Map<number, [string, Group][]>();
  for (const [name, w] of work)
    for (const g of w.groups)
      claimants.set(g.peakIndex, [...(claimants.get(g.peakIndex) ?? []), [name, g]]);
  const round = (credit: (name: string, g: Group) => number) =>
    new Map(
      [...work].map(([name, w]) => {
        const expected = w.missingWeight + w.groups.reduce((s, g) => s + g.weight, 0);
        const earned = w.groups.reduce((s, g) => s + g.weight * g.quality * credit(name, g), 0);
        return [name, expected > 0 ? earned / expected : 0];
      }),
    );
  const first = round(() => 1);
  const claim = (name: string, g: Group) => {
    const { anchor, missing } = work.get(name)!;
    if (!anchor || g.rated === 0 || g.snr <= 0) return 0.01;
    // Its strongest unhidden missing line caps its scale: brighter, that line would reach SNR 6.
    const counted = missing.filter((m) => m.hiddenByPeakIndex === null).map((m) => m.relative);
    const scale = Math.min(
      anchor.snr / anchor.rated,
      counted.length > 0 ? MISSING_SNR / Math.max(...counted) : Infinity,
    );
    return Math.max(0.01, Math.min(1, (scale * g.rated) / g.snr));
  };
  const weightOf = (name: string, g: Group) => claim(name, g) * Math.max(0.01, first.get(name)!);
  const final = round((name, g) => {
    const all = claimants.get(g.peakIndex)!;
    if (all.length === 1) return 1;
    return weightOf(name, g) / all.reduce((s, [other, og]) => s + weightOf(other, og), 0);
  });
  const calls: ReferenceCall[] = [];
  for (const [name, w] of work) {
    const strongMissing = w.missing.filter(
      (m) => m.relative >= STRONG && m.hiddenByPeakIndex === null,
    ).length;
    if (w.groups.length === 0) {
      calls.push({ species: name, verdict: "absent", score: 0, missing: w.missing, strongMissing });
      continue;
    }
    const score = final.get(name)!;
    const strongSeen = w.groups.some((g) => g.lines.some((i) => (relative.get(i) ?? 0) >= STRONG));
    const verdict =
      score >= 0.5 && strongSeen && strongMissing === 0
        ? "present"
        : score >= 0.2
          ? "possible"
          : "absent";
    calls.push({ species: name, verdict, score, missing: w.missing, strongMissing });
  }
  const rank = { present: 0, possible: 1, absent: 2 } as Record<string, number>;
  return calls.sort(
    (a, b) =>
      b.score - a.score || rank[a.verdict] - rank[b.verdict] || (a.species < b.species ? -1 : 1),
  );
}

describe("scoreElements against a plain scan of a 30,000-line table", () => {
  const table = syntheticTable();
  const index = prepareLineIndex(table);
  const matches = matchPeaksToLines(syntheticPeaks(table), index, { resolutionNm: 0.5 });
  const reference = referenceScoring(matches, table);

  for (const maxMissingListed of [25, 3]) {
    it(`gives the same verdicts, ranks, scores, counts and first ${maxMissingListed} missing lines`, () => {
      const { calls } = scoreElements(matches, index, {
        source: "flame",
        rangeNm: RANGE_NM,
        ubiquitousSpecies: [],
        maxMissingListed,
        // Absent calls' own, shorter cap is tested in seen-lines.test.ts.
        maxListedWhenAbsent: 100_000,
      });
      expect(calls.map((c) => c.species)).toEqual(reference.map((c) => c.species));
      calls.forEach((call, i) => {
        const expected = reference[i];
        expect(call.verdict, call.species).toBe(expected.verdict);
        // Sums taken in another order differ in the last bits only.
        expect(Math.abs(call.score - expected.score), call.species).toBeLessThanOrEqual(
          1e-9 * expected.score,
        );
        expect(call.missingCount, call.species).toBe(expected.missing.length);
        expect(call.missingStrongCount, call.species).toBe(expected.strongMissing);
        const hidden = expected.missing.filter((m) => m.hiddenByPeakIndex !== null).length;
        const unhidden = expected.missing.length - hidden;
        const listedUnhidden = call.missing.filter((m) => m.hiddenByPeakIndex === null).length;
        expect(listedUnhidden, call.species).toBe(Math.min(unhidden, maxMissingListed));
        const head = Math.min(maxMissingListed, expected.missing.length);
        expect(call.missing.slice(0, head).map((m) => [m.lineIndex, m.hiddenByPeakIndex])).toEqual(
          expected.missing.slice(0, head).map((m) => [m.lineIndex, m.hiddenByPeakIndex]),
        );
        call.missing.slice(0, head).forEach((m, j) => {
          const predicted = expected.missing[j].predictedSnr;
          if (predicted === null) expect(m.predictedSnr).toBeNull();
          else expect(Math.abs(m.predictedSnr! - predicted)).toBeLessThanOrEqual(1e-9 * predicted);
        });
      });
    });
  }

  it("exercises long capped lists, hidden lines, and present, possible and absent calls", () => {
    expect(Math.max(...reference.map((c) => c.missing.length))).toBeGreaterThan(1000);
    expect(reference.some((c) => c.missing.some((m) => m.hiddenByPeakIndex !== null))).toBe(true);
    expect(reference.some((c) => c.missing.length > 0 && c.missing.length <= 25)).toBe(true);
    expect(new Set(reference.map((c) => c.verdict)).size).toBeGreaterThanOrEqual(2);
  });
});
