// Runs automatic lamp calibration over many realistic instruments (tests/support/realistic-lamp.ts)
// and scores each against the generator's truth. Shared by the unit-test sweep and `npm run sweep`.
import { calibrateLamp, type CalibrateLampOptions } from "@/lib/spectrum/analysis/calibrate-lamp";
import { evaluateCalibration, fitCalibration } from "@/lib/spectrum/calibration";
import type { CalibrationModel, FitCalibrationOptions } from "@/lib/spectrum/calibration";
import {
  realisticLamp,
  type RealisticLamp,
  type RealisticLampOptions,
  type RecordingChange,
} from "./realistic-lamp";

/** Probe pixels per calibration, evenly spread over its covered range (ends included). */
const PROBES = 5;

export type SweepOutcome = "success" | "silent-wrong" | "flagged" | "needs-manual" | "exception";

export interface SweepRecord {
  seed: number;
  dispersion: string;
  gases: string;
  glass: string;
  resolutionClass: string;
  tableLinesInRange: number;
  outcome: SweepOutcome;
  /** Status the calibration reported ("paired", "needs-manual", "check", …). */
  status: string;
  confidence: number;
  /** Largest |error| at the probes over the tolerance there (≤ 1 is right); NaN without a fit. */
  worstErrorRatio: number;
  worstErrorNm: number;
  /** For a fit that was not trusted ("check"): whether it was right after all. */
  candidateRight: boolean | null;
  /** Covered fraction of the array (0…1). */
  coveredFraction: number;
  cpuMs: number;
  message: string;
  /** The pairing checks' measures, "name=value" (for tuning their limits). */
  checkValues: string;
}

function resolutionClass(lamp: RealisticLamp): string {
  const r = lamp.resolutionNm;
  return r < 0.5 ? "<0.5 nm" : r < 1 ? "0.5–1 nm" : r < 2 ? "1–2 nm" : "≥2 nm";
}

/** Largest error at the probes relative to the tolerance: 0.05 nm grating / 0.15 nm prism, or FWHM/10 where larger. */
export function probeErrorRatio(
  lamp: RealisticLamp,
  model: CalibrationModel,
): { ratio: number; errorNm: number; coveredFraction: number } {
  const [c0, c1] = [Math.min(...model.coveredX), Math.max(...model.coveredX)];
  const probes = Float64Array.from(
    { length: PROBES },
    (_, i) => c0 + ((c1 - c0) * i) / (PROBES - 1),
  );
  const calibrated = evaluateCalibration(model, probes);
  let ratio = 0;
  let errorNm = 0;
  probes.forEach((px, i) => {
    const base = lamp.dispersion === "prism" ? 0.15 : 0.05;
    const tolerance = Math.max(base, lamp.fwhmNmAt(px) / 10);
    const error = Math.abs(calibrated[i] - lamp.wavelengthAt(px));
    const r = Number.isFinite(error) ? error / tolerance : Infinity;
    if (r > ratio) {
      ratio = r;
      errorNm = error;
    }
  });
  return { ratio, errorNm, coveredFraction: (c1 - c0) / (lamp.x.length - 1) };
}

export interface SweepOptions {
  seed: number;
  n: number;
  lamp?: RealisticLampOptions;
  /** Calibrate the re-recorded instrument starting from the first recording's calibration. */
  withPrevious?: boolean;
  /** What happened to the instrument between the two recordings. @default "day" */
  change?: RecordingChange;
  /** Extra calibration options. */
  calibrate?: Partial<CalibrateLampOptions>;
}

function cpuMs(start: NodeJS.CpuUsage): number {
  const used = process.cpuUsage(start);
  return (used.user + used.system) / 1000;
}

/** Calibrates a realistic instrument automatically, as the app would from its stated settings. */
export function calibrateRealisticLamp(
  lamp: RealisticLamp,
  extra: Partial<CalibrateLampOptions> = {},
): ReturnType<typeof calibrateLamp> {
  return calibrateLamp(lamp.x, lamp.y, lamp.lines, {
    nominalRangeNm: lamp.statedRangeNm,
    dispersion: lamp.dispersion === "prism" ? "prism" : "grating",
    resolutionNm: lamp.resolutionNm,
    ...extra,
  });
}

/** Calibrates one instrument and scores it. */
export function sweepOne(
  lamp: RealisticLamp,
  extra: Partial<CalibrateLampOptions> = {},
): SweepRecord {
  const base = {
    seed: lamp.seed,
    dispersion: lamp.dispersion,
    gases: lamp.gases.join("+"),
    glass: lamp.glass ?? "—",
    resolutionClass: resolutionClass(lamp),
    tableLinesInRange: lamp.tableLinesInRange,
  };
  const start = process.cpuUsage();
  try {
    const result = calibrateRealisticLamp(lamp, extra);
    const cpu = cpuMs(start);
    const status = result.pairing.status as string;
    const model = result.fit?.model ?? result.pairing.candidate?.model ?? null;
    const scored = model
      ? probeErrorRatio(lamp, model)
      : { ratio: Number.NaN, errorNm: Number.NaN, coveredFraction: 0 };
    const right = model !== null && scored.ratio <= 1;
    const outcome: SweepOutcome =
      status === "paired"
        ? right
          ? "success"
          : "silent-wrong"
        : model
          ? "flagged"
          : "needs-manual";
    return {
      ...base,
      outcome,
      status,
      confidence: result.pairing.confidence,
      worstErrorRatio: scored.ratio,
      worstErrorNm: scored.errorNm,
      candidateRight: status !== "paired" && model ? right : null,
      coveredFraction: scored.coveredFraction,
      cpuMs: cpu,
      message: result.pairing.message,
      checkValues: (result.pairing.checks ?? [])
        .map((c) => `${c.name}=${c.value.toFixed(2)}`)
        .join(" "),
    };
  } catch (error) {
    return {
      ...base,
      outcome: "exception",
      status: "exception",
      confidence: 0,
      worstErrorRatio: Number.NaN,
      worstErrorNm: Number.NaN,
      candidateRight: null,
      coveredFraction: 0,
      cpuMs: cpuMs(start),
      checkValues: "",
      message: error instanceof Error ? `${error.name}: ${error.message}` : String(error),
    };
  }
}

/** σ of yesterday's pair centres, px: a lamp's strong lines (common practice). */
const PREVIOUS_CENTRE_SIGMA_X = 0.03;

/**
 * Yesterday's calibration of `lamp`, as checked then: of the model families, the one closest to the
 * first recording's true axis (a quintic misses a prism's blue end by many resolutions; the physical
 * prism model does not), each fitted as the product fits it: a prism's glass from the catalogue, or
 * fitted from the pairs where none fits them within their σ. `fitGlass: false` keeps a prism to the
 * catalogue's glasses (loose when the instrument's glass is not in the catalogue).
 */
export function previousCalibrationOf(
  lamp: RealisticLamp,
  { fitGlass }: { fitGlass?: boolean } = {},
): CalibrationModel {
  const last = lamp.x.length - 1;
  const truthPairs = Array.from({ length: 41 }, (_, i) => {
    const x = (last * i) / 40;
    return { x, wavelengthNm: lamp.wavelengthAt(x), xUncertainty: PREVIOUS_CENTRE_SIGMA_X };
  });
  const families: FitCalibrationOptions[] =
    lamp.dispersion === "prism"
      ? [{ model: "prism", fitGlass }, { model: "hartmann" }, { model: "polynomial", degree: 5 }]
      : [{ model: "polynomial", degree: 5 }];
  const grid = Float64Array.from({ length: 401 }, (_, i) => (last * i) / 400);
  const truth = grid.map(lamp.wavelengthAt);
  let previous: CalibrationModel | undefined;
  let previousError = Infinity;
  for (const family of families) {
    try {
      const model = fitCalibration(truthPairs, {
        ...family,
        domain: [0, last],
        rejectOutliers: false,
      }).model;
      const calibrated = evaluateCalibration(model, grid);
      const error = Math.max(...truth.map((nm, i) => Math.abs(calibrated[i] - nm)));
      if (error < previousError) [previous, previousError] = [model, error];
    } catch {
      // A family that cannot fit this axis is simply not yesterday's calibration.
    }
  }
  if (!previous) throw new Error(`no model fits the true axis of instrument ${lamp.seed}`);
  return previous;
}

/** Instruments seed, seed+1, …, seed+n−1. */
export function runSweep(options: SweepOptions): SweepRecord[] {
  const records: SweepRecord[] = [];
  for (let k = 0; k < options.n; k++) {
    const lamp = realisticLamp(options.seed + k, options.lamp);
    if (options.withPrevious) {
      const previous = previousCalibrationOf(lamp);
      const again = lamp.rerecord(options.seed + k + 100_000, options.change);
      records.push(sweepOne(again, { ...options.calibrate, previous }));
    } else {
      records.push(sweepOne(lamp, options.calibrate));
    }
  }
  return records;
}

export interface SweepSummary {
  n: number;
  /** Instruments with ≥ 6 table lamp lines in range. */
  eligible: number;
  successRate: number;
  successRateEligible: number;
  silentWrongRate: number;
  flaggedRate: number;
  needsManualRate: number;
  exceptions: number;
  cpuMedianMs: number;
  cpuP99Ms: number;
}

const quantile = (values: number[], q: number) => {
  if (values.length === 0) return Number.NaN;
  const sorted = values.slice().sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
};

export function summarise(records: SweepRecord[]): SweepSummary {
  const n = records.length;
  const eligible = records.filter((r) => r.tableLinesInRange >= 6);
  const rate = (rs: SweepRecord[], outcome: SweepOutcome) =>
    rs.length ? rs.filter((r) => r.outcome === outcome).length / rs.length : Number.NaN;
  const cpu = records.map((r) => r.cpuMs);
  return {
    n,
    eligible: eligible.length,
    successRate: rate(records, "success"),
    successRateEligible: rate(eligible, "success"),
    silentWrongRate: rate(records, "silent-wrong"),
    flaggedRate: rate(records, "flagged"),
    needsManualRate: rate(records, "needs-manual"),
    exceptions: records.filter((r) => r.outcome === "exception").length,
    cpuMedianMs: quantile(cpu, 0.5),
    cpuP99Ms: quantile(cpu, 0.99),
  };
}

/** Printable report: the summary, breakdowns, the slowest and the silently wrong cases. */
export function formatSweep(records: SweepRecord[], title: string): string {
  const pct = (v: number) => (Number.isFinite(v) ? `${(100 * v).toFixed(1)} %` : "—");
  const s = summarise(records);
  const out: string[] = [];
  out.push(`${title}`);
  out.push(
    `instruments ${s.n} (≥6 table lamp lines in range: ${s.eligible})  success ${pct(s.successRate)} ` +
      `(eligible ${pct(s.successRateEligible)})  silent wrong ${pct(s.silentWrongRate)}  flagged ${pct(s.flaggedRate)}  ` +
      `needs-manual ${pct(s.needsManualRate)}  exceptions ${s.exceptions}  CPU median ${s.cpuMedianMs.toFixed(0)} ms p99 ${s.cpuP99Ms.toFixed(0)} ms`,
  );
  const paired = records.filter((r) => r.status === "paired");
  const right = paired.filter((r) => r.outcome === "success").length;
  out.push(
    `of ${paired.length} reported "paired", ${pct(paired.length ? right / paired.length : Number.NaN)} are right`,
  );
  for (const key of ["dispersion", "gases", "resolutionClass", "glass"] as const) {
    out.push(`by ${key}:`);
    const groups = new Map<string, SweepRecord[]>();
    for (const r of records) groups.set(r[key], [...(groups.get(r[key]) ?? []), r]);
    for (const [name, rs] of [...groups].sort()) {
      const g = summarise(rs);
      out.push(
        `  ${name.padEnd(18)} n=${String(g.n).padStart(4)}  success ${pct(g.successRate).padStart(7)} (eligible ${pct(g.successRateEligible).padStart(7)})  ` +
          `silent wrong ${pct(g.silentWrongRate).padStart(6)}  flagged ${pct(g.flaggedRate).padStart(6)}  exceptions ${g.exceptions}  CPU p50 ${g.cpuMedianMs.toFixed(0)} ms`,
      );
    }
  }
  const describe = (r: SweepRecord) =>
    `  seed ${r.seed} ${r.dispersion} ${r.gases} ${r.glass} ${r.resolutionClass} lines ${r.tableLinesInRange}: ${r.outcome} ` +
    `(conf ${r.confidence.toFixed(2)}, worst ${Number.isFinite(r.worstErrorNm) ? r.worstErrorNm.toFixed(3) : "—"} nm, ${r.cpuMs.toFixed(0)} ms) ${r.message} [${r.checkValues}]`;
  out.push("slowest:");
  for (const r of records
    .slice()
    .sort((a, b) => b.cpuMs - a.cpuMs)
    .slice(0, 5))
    out.push(describe(r));
  const wrong = records.filter((r) => r.outcome === "silent-wrong" || r.outcome === "exception");
  if (wrong.length) {
    out.push("silently wrong or exceptions:");
    for (const r of wrong.slice(0, 20)) out.push(describe(r));
  }
  return out.join("\n");
}
