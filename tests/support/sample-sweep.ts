// Runs the real analysis (analyzeSample against the starter table) over realistic samples from
// tests/support/realistic-sample.ts and scores the element calls against the generator's truth:
// the measuring stick of issue 12, shared by `npm run sweep -- --samples` and the unit sweep test.
import { analyzeSample } from "@/lib/spectrum/analysis/analyze-sample";
import { prepareLineIndex } from "@/lib/spectrum/matching";
import type { SampleAnalysis } from "@/lib/spectrum/analysis/analyze-sample";
import type { ReferenceLine, SourceKind } from "@/lib/spectrum/types";
import { STARTER_TABLE } from "./realistic-lamp";
import {
  BAND_METAL,
  INTERFERENCE_CASES,
  realisticSample,
  SAMPLE_ELEMENTS,
  type RealisticSample,
} from "./realistic-sample";

const INDEX = prepareLineIndex(STARTER_TABLE);

export interface SampleSweepRecord {
  seed: number;
  source: string;
  instrument: string;
  axis: string;
  interference: string | null;
  truth: string[];
  principalInRange: Record<string, boolean>;
  /** Elements (metals; a band counts for its metal) called "present". */
  present: string[];
  /** "present" calls resting on one peak that a line of another element in the table also explains. */
  singleExplained: string[];
  exception: string | null;
  cpuMs: number;
}

const cpuMs = (start: NodeJS.CpuUsage) => {
  const used = process.cpuUsage(start);
  return (used.user + used.system) / 1000;
};

/** The metal a call stands for: its element, or a band molecule's metal. */
const metalOf = (element: string) => BAND_METAL[element] ?? element;

/** A share of a peak a rival must be able to make to explain it, and the SNR a line needs to show
 * (twice a detection limit of 3; common practice). */
const EXPLAINING_SHARE = 0.3;
const SHOWING_SNR = 6;
const SOURCES: SourceKind[] = ["arc", "spark", "plasma", "lamp", "flame"];

/**
 * "Present" calls resting on one peak that a line of another element in the table also explains,
 * judged from the table alone: a line of another species within half the peak's FWHM, which could
 * make 30 % of the peak given that species' strongest line in range (by the table's intensities for
 * the source, or for the first other source it rates where it rates none for this one; a line
 * without one counts as the species' faintest rated line): either that strongest
 * line would stay below SNR 6 at that share, or a peak stands at it bright enough to go with it. A
 * band four or more line widths long explains no peak as narrow as a line (1.5 line widths).
 */
function singleLinePresents(analysis: SampleAnalysis, source: SourceKind): string[] {
  const out: string[] = [];
  const [from, to] = analysis.rangeNm;
  const peakNear = (nm: number, halfNm: number) =>
    analysis.peaks.find((p) => Math.abs(p.wavelengthNm - nm) <= halfNm);
  for (const call of analysis.identification.calls) {
    if (call.verdict !== "present" || call.ionStage === null) continue;
    const peaks = new Set(call.seen.map((s) => s.peakIndex));
    if (call.seenCount === 0 || peaks.size !== 1) continue;
    const peak = analysis.peaks[call.seen[0].peakIndex];
    const halfNm = 0.5 * (peak.resolutionNm ?? peak.fwhmNm);
    const explains = (rival: ReferenceLine) => {
      if (rival.element === call.element || Math.abs(rival.airNm - peak.wavelengthNm) > halfNm) {
        return false;
      }
      // A band several line widths long shows as a feature wider than a line, never as a line.
      const band = rival.band;
      if (
        band &&
        peak.resolutionNm &&
        band.extentNm >= 4 * peak.resolutionNm &&
        peak.fwhmNm < 1.5 * peak.resolutionNm
      ) {
        return false;
      }
      const own = STARTER_TABLE.filter((l) => l.species === rival.species);
      const basis = [source, ...SOURCES].find((kind) =>
        own.some((l) => (l.intensities[kind] ?? 0) > 0),
      );
      if (basis === undefined) return true;
      const rated = own.filter(
        (l) => l.airNm >= from && l.airNm <= to && (l.intensities[basis] ?? 0) > 0,
      );
      if (rated.length === 0) return true;
      const strongest = rated.reduce((a, b) =>
        b.intensities[basis]! > a.intensities[basis]! ? b : a,
      );
      const here = rival.intensities[basis] ?? Math.min(...rated.map((l) => l.intensities[basis]!));
      const ratio = strongest.intensities[basis]! / here;
      if (EXPLAINING_SHARE * peak.snr * ratio < SHOWING_SNR) return true;
      const atStrongest = peakNear(strongest.airNm, halfNm);
      return atStrongest !== undefined && atStrongest.snr / ratio >= EXPLAINING_SHARE * peak.snr;
    };
    if (STARTER_TABLE.some(explains)) out.push(call.species);
  }
  return out;
}

export function sweepSample(sample: RealisticSample): SampleSweepRecord {
  const start = process.cpuUsage();
  const base = {
    seed: sample.seed,
    source: sample.source,
    instrument: sample.instrument,
    axis: sample.axis,
    interference: sample.truth.interference,
    truth: sample.truth.elements,
    principalInRange: sample.truth.principalInRange,
  };
  try {
    const analysis = analyzeSample(sample.x, sample.y, INDEX, {
      calibration: sample.calibration,
      source: sample.source,
      ...sample.resolution,
    });
    const present = new Set<string>();
    for (const call of analysis.identification.calls) {
      // Atomic species count for their element, the flame bands for their metal; other molecules
      // (OH, CH, CN, N₂, C₂: the flame's own gases) are no element call.
      if (call.verdict !== "present") continue;
      if (call.ionStage !== null || BAND_METAL[call.element]) present.add(metalOf(call.element));
    }
    return {
      ...base,
      present: [...present].sort(),
      singleExplained: singleLinePresents(analysis, sample.source),
      exception: null,
      cpuMs: cpuMs(start),
    };
  } catch (error) {
    return {
      ...base,
      present: [],
      singleExplained: [],
      exception: error instanceof Error ? `${error.name}: ${error.message}` : String(error),
      cpuMs: cpuMs(start),
    };
  }
}

export function runSampleSweep(options: { seed: number; n: number }): SampleSweepRecord[] {
  const records: SampleSweepRecord[] = [];
  for (let i = 0; i < options.n; i++) {
    records.push(sweepSample(realisticSample(options.seed * 100003 + i)));
  }
  return records;
}

/** hits / total with its counts. */
export interface Ratio {
  hits: number;
  total: number;
}
const ratio = (hits = 0, total = 0): Ratio => ({ hits, total });
const add = (map: Map<string, Ratio>, key: string, hit: boolean) => {
  const r = map.get(key) ?? ratio();
  r.total++;
  if (hit) r.hits++;
  map.set(key, r);
};

export interface SampleSweepSummary {
  samples: number;
  /** Present calls of the mix's elements over element–sample pairs of the mix. */
  recall: Ratio;
  /** The same where the element's principal line for the source is in range. */
  recallPrincipalInRange: Ratio;
  recallByElement: Map<string, Ratio>;
  /** Recall by element where its principal line is in range. */
  recallPrincipalByElement: Map<string, Ratio>;
  /** Per interference case: samples whose interfering element was called present, over the samples
   * built around the case (the Na D case has no interferer and counts none). */
  interferenceFalse: Map<string, Ratio>;
  recallBySource: Map<string, Ratio>;
  recallByInstrument: Map<string, Ratio>;
  /** False present over absent element–sample pairs: the sample elements not in the mix, plus any
   * other element of the table that was called. */
  falsePresent: Ratio;
  /** False present calls per element (inside the pool: over its absent pairs; outside it: count only). */
  falseByElement: Map<string, Ratio>;
  samplesWithFalsePresent: number;
  singleLineExplained: number;
  exceptions: number;
  cpuMedianMs: number;
  cpuP99Ms: number;
}

export function summariseSamples(records: SampleSweepRecord[]): SampleSweepSummary {
  const recall = ratio();
  const recallPrincipalInRange = ratio();
  const recallByElement = new Map<string, Ratio>();
  const recallPrincipalByElement = new Map<string, Ratio>();
  const interferenceFalse = new Map<string, Ratio>();
  const recallBySource = new Map<string, Ratio>();
  const recallByInstrument = new Map<string, Ratio>();
  const falsePresent = ratio();
  const falseByElement = new Map<string, Ratio>();
  let samplesWithFalsePresent = 0;
  let singleLineExplained = 0;
  let exceptions = 0;
  const pool: readonly string[] = SAMPLE_ELEMENTS;
  for (const r of records) {
    if (r.exception) exceptions++;
    singleLineExplained += r.singleExplained.length;
    for (const element of r.truth) {
      const hit = r.present.includes(element);
      recall.total++;
      if (hit) recall.hits++;
      if (r.principalInRange[element]) {
        recallPrincipalInRange.total++;
        if (hit) recallPrincipalInRange.hits++;
      }
      add(recallByElement, element, hit);
      if (r.principalInRange[element]) add(recallPrincipalByElement, element, hit);
      add(recallBySource, r.source, hit);
      add(recallByInstrument, `${r.instrument} on a ${r.axis} axis`, hit);
    }
    let anyFalse = false;
    for (const element of pool) {
      if (r.truth.includes(element)) continue;
      const hit = r.present.includes(element);
      falsePresent.total++;
      if (hit) {
        falsePresent.hits++;
        anyFalse = true;
      }
      add(falseByElement, element, hit);
    }
    // Elements outside the pool are never in a sample: each call of one is a false present.
    for (const element of r.present) {
      if (pool.includes(element)) continue;
      falsePresent.hits++;
      falsePresent.total++;
      anyFalse = true;
      add(falseByElement, element, true);
    }
    if (anyFalse) samplesWithFalsePresent++;
    if (r.interference) {
      const interferer = INTERFERENCE_CASES.find((c) => c.name === r.interference)?.interferer;
      add(interferenceFalse, r.interference, interferer ? r.present.includes(interferer) : false);
    }
  }
  const cpu = records.map((r) => r.cpuMs).sort((a, b) => a - b);
  const at = (q: number) =>
    cpu.length ? cpu[Math.min(cpu.length - 1, Math.floor(q * cpu.length))] : 0;
  return {
    samples: records.length,
    recall,
    recallPrincipalInRange,
    recallByElement,
    recallPrincipalByElement,
    interferenceFalse,
    recallBySource,
    recallByInstrument,
    falsePresent,
    falseByElement,
    samplesWithFalsePresent,
    singleLineExplained,
    exceptions,
    cpuMedianMs: at(0.5),
    cpuP99Ms: at(0.99),
  };
}

export const fraction = (r: Ratio) => (r.total ? r.hits / r.total : 0);
const percent = (r: Ratio) => `${(100 * fraction(r)).toFixed(1)} % (${r.hits}/${r.total})`;

export function formatSampleSweep(records: SampleSweepRecord[], title: string, worst = 10): string {
  const s = summariseSamples(records);
  const out: string[] = [title, ""];
  out.push(`recall of "present":            ${percent(s.recall)}`);
  out.push(`  principal line in range:      ${percent(s.recallPrincipalInRange)}`);
  out.push(`false "present" (absent pairs): ${percent(s.falsePresent)}`);
  out.push(`samples with a false present:   ${s.samplesWithFalsePresent}/${s.samples}`);
  out.push(`present on one line another species explains: ${s.singleLineExplained}`);
  out.push(`exceptions:                     ${s.exceptions}`);
  out.push(
    `CPU per sample:                 median ${s.cpuMedianMs.toFixed(0)} ms, p99 ${s.cpuP99Ms.toFixed(0)} ms`,
  );
  const table = (name: string, map: Map<string, Ratio>) => {
    out.push("", name);
    for (const [key, r] of [...map].sort((a, b) => a[0].localeCompare(b[0]))) {
      out.push(`  ${key.padEnd(24)} ${percent(r)}`);
    }
  };
  table("recall by element", s.recallByElement);
  table("recall by element, principal line in range", s.recallPrincipalByElement);
  table("recall by source", s.recallBySource);
  table("recall by instrument", s.recallByInstrument);
  table("false present by element (outside the pool: every call is false)", s.falseByElement);
  table("interference cases: interferer called present", s.interferenceFalse);
  const badness = (r: SampleSweepRecord) =>
    (r.exception ? 100 : 0) +
    r.truth.filter((e) => !r.present.includes(e)).length +
    r.present.filter((e) => !r.truth.includes(e)).length;
  const worstCases = [...records]
    .sort((a, b) => badness(b) - badness(a) || a.seed - b.seed)
    .slice(0, worst);
  out.push("", "worst cases");
  for (const r of worstCases) {
    if (badness(r) === 0) break;
    const missed = r.truth.filter((e) => !r.present.includes(e));
    const extra = r.present.filter((e) => !r.truth.includes(e));
    out.push(
      `  seed ${r.seed} ${r.source} ${r.instrument}/${r.axis}${r.interference ? ` [${r.interference}]` : ""}: ` +
        `mix ${r.truth.join(" ")}; missed ${missed.join(" ") || "-"}; false ${extra.join(" ") || "-"}` +
        (r.exception ? `; ${r.exception}` : ""),
    );
  }
  return out.join("\n");
}
