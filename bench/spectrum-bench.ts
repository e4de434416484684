// `npm run bench`: medians of the numerical core's stages on synthetic spectra of 1,024 to 1,048,576
// points, with SciPy/NumPy doing the corresponding steps on the same data where python3-scipy exists.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { parseLineTableCsv, toReferenceLine } from "../lib/lines";
import { analyzeSample } from "../lib/spectrum/analysis/analyze-sample";
import { calibrateLamp } from "../lib/spectrum/analysis/calibrate-lamp";
import type { LampLine } from "../lib/spectrum/calibration/lamp-pairing-types";
import { parseSpectrumText } from "../lib/spectrum/io/parse-spectrum-text";
import { prepareLineIndex } from "../lib/spectrum/matching/prepare-line-index";
import { findPeaks } from "../lib/spectrum/peaks/find-peaks";
import { savitzkyGolay } from "../lib/spectrum/signal/savitzky-golay";
import { makeRandom } from "../lib/spectrum/statistics/make-random";
import { synthesizeSpectrum } from "../lib/spectrum/synthetic/synthesize-spectrum";
import type { ReferenceLine } from "../lib/spectrum/types";

const SIZES = [1024, 4096, 65_536, 1_048_576];
const TABLE_SIZES = [3_000, 30_000, 300_000];
const json = process.argv.includes("--json");
const root = path.resolve(__dirname, "..");

interface BenchCase {
  name: string;
  points: number;
  lines: number;
  medianMs: number;
  referenceMedianMs: number | null;
}

function median(values: number[]): number {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** Enough repetitions for a stable median without spending minutes on the largest spectra. */
function repetitions(points: number): number {
  if (points >= 1_000_000) return 5;
  if (points >= 65_536) return 15;
  return 60;
}

/** Warm-up before timing (JIT, caches): at least this many runs, and runs for at least WARM_UP_MS, so
 * each case is timed in the steady state a running server reaches. Five runs alone left a 1,024-point
 * parse (0.1 ms a run) in V8's unoptimised tiers: 0.56 ms against 0.10 ms once warm. SciPy's side warms
 * up by the same rule (bench/scipy_bench.py). */
const WARM_UP_RUNS = 5;
const WARM_UP_MS = 300;

function time(run: () => unknown, reps: number): number {
  const warmUntil = performance.now() + WARM_UP_MS;
  for (let i = 0; i < Math.min(WARM_UP_RUNS, reps) || performance.now() < warmUntil; i++) run();
  const samples: number[] = [];
  for (let i = 0; i < reps; i++) {
    const start = process.hrtime.bigint();
    run();
    samples.push(Number(process.hrtime.bigint() - start) / 1e6);
  }
  return median(samples);
}

// The project's starter table: real lamp and flame lines (each with its source in the CSV).
const starter = parseLineTableCsv(
  fs.readFileSync(path.join(root, "db/lines/starter-lines.csv"), "utf8"),
);
const starterLines: ReferenceLine[] = starter.rows.map((row, i) =>
  toReferenceLine(row, `starter-${i}`),
);
const lampLines: LampLine[] = starterLines
  .filter((l) => l.flags.lamp && /^(Hg|Ar) I$/.test(l.species) && l.airNm > 350 && l.airNm < 900)
  .map((l) => ({
    wavelengthNm: l.airNm,
    intensity: l.intensities.lamp ?? 1,
    species: l.species,
    id: l.id,
  }));

/** A large table: the starter lines plus invented filler lines, for timing only; in wavelength order,
 * as the app loads a release (lineIndexOf in lib/services/runs.ts). */
function syntheticTable(size: number): ReferenceLine[] {
  const random = makeRandom(size);
  const table = starterLines.slice();
  const species = ["Fe I", "Ti I", "Cr I", "Ni I", "Co I", "V I", "Mn I", "Fe II", "Ti II"];
  for (let i = table.length; i < size; i++) {
    const airNm = 200 + random.uniform() * 800;
    const name = species[i % species.length];
    table.push({
      id: `filler-${i}`,
      species: name,
      element: name.split(" ")[0],
      ionStage: name.endsWith("II") ? 2 : 1,
      airNm,
      vacuumNm: airNm * 1.00028,
      uncertaintyNm: 0.001,
      intensities: { arc: 1 + random.uniform() * 999 },
      flags: {},
    });
  }
  return table.sort((a, b) => a.airNm - b.airNm);
}

// Resolution of the benchmark's samples: lines about 6 pixels wide at every array length, as a
// spectrometer's optics are matched to its detector (common practice). A fixed 1 nm made the lines of
// the 1,048,576-point array 1,900 pixels wide, where no peak finder (ours or SciPy's) finds a line,
// so that case timed an empty answer.
const resolutionFor = (points: number) => (6 * 540) / points;
// The lamp keeps 1 nm (4 pixels on the coarsest array): calibrating a 1,048,576-pixel lamp of
// 6-pixel lines fails (no detector of that size exists to tune it on), and only its model is needed.
const lampResolutionFor = (points: number) => Math.max(1, (4 * 540) / points);

// A grating with a gentle cubic dispersion over 350–900 nm.
const dispersionFor = (points: number) => (px: number) => {
  const u = px / (points - 1);
  return 350 + 540 * u + 14 * u * u - 4 * u * u * u;
};

function lampSpectrum(points: number) {
  return synthesizeSpectrum({
    pixelCount: points,
    wavelengthOfPixel: dispersionFor(points),
    resolutionNm: lampResolutionFor(points),
    lines: lampLines.map((l) => ({
      wavelengthNm: l.wavelengthNm,
      amplitude: 200 + 30 * Math.sqrt(l.intensity),
    })),
    readNoiseCounts: 4,
    darkCounts: 100,
    seed: 7,
  });
}

function flameSpectrum(points: number) {
  const flame = starterLines.filter((l) =>
    ["Na I", "K I", "Li I", "Ca I", "Sr I"].includes(l.species),
  );
  return synthesizeSpectrum({
    pixelCount: points,
    wavelengthOfPixel: dispersionFor(points),
    resolutionNm: resolutionFor(points),
    lines: flame.map((l) => ({
      wavelengthNm: l.airNm,
      amplitude: 20 + 2 * (l.intensities.flame ?? 10),
    })),
    continuum: { shape: "planck", temperatureK: 2300, peakCounts: 600 },
    readNoiseCounts: 5,
    shotNoise: true,
    darkCounts: 100,
    seed: 11,
  });
}

function toText(x: Float64Array, y: Float64Array): string {
  const rows = ["pixel,counts"];
  for (let i = 0; i < x.length; i++) rows.push(`${x[i]},${y[i].toFixed(2)}`);
  return rows.join("\n");
}

function scipyAvailable(): boolean {
  try {
    execFileSync("python3", ["-c", "import scipy, numpy"], { stdio: "ignore" });
    return true;
  } catch {
    return false;
  }
}

/** Runs bench/scipy_bench.py on the same files; returns medians in ms keyed by case name. */
function scipyMedians(dir: string, manifest: unknown): Record<string, number> {
  fs.writeFileSync(path.join(dir, "manifest.json"), JSON.stringify(manifest));
  const out = execFileSync("python3", [path.join(root, "bench/scipy_bench.py"), dir], {
    encoding: "utf8",
    maxBuffer: 64 * 1024 * 1024,
  });
  return JSON.parse(out) as Record<string, number>;
}

function main() {
  const cases: BenchCase[] = [];
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "emberline-bench-"));
  const manifest: {
    points: number;
    reps: number;
    text: string;
    lamp: string;
    flame: string;
    table: string;
    tableSize: number;
    lampLines: number[];
  }[] = [];
  const bigTable = syntheticTable(300_000);
  const bigIndex = prepareLineIndex(bigTable);
  const tableFile = path.join(dir, "table-300000.f64");
  fs.writeFileSync(tableFile, Buffer.from(Float64Array.from(bigTable, (l) => l.airNm).buffer));

  for (const points of SIZES) {
    const reps = repetitions(points);
    const lamp = lampSpectrum(points);
    const flame = flameSpectrum(points);
    const text = toText(flame.x, flame.y);
    const lampFile = path.join(dir, `lamp-${points}.f64`);
    const flameFile = path.join(dir, `flame-${points}.f64`);
    const textFile = path.join(dir, `flame-${points}.csv`);
    fs.writeFileSync(lampFile, Buffer.from(lamp.y.buffer));
    fs.writeFileSync(flameFile, Buffer.from(flame.y.buffer));
    fs.writeFileSync(textFile, text);
    manifest.push({
      points,
      reps,
      text: textFile,
      lamp: lampFile,
      flame: flameFile,
      table: tableFile,
      tableSize: bigTable.length,
      lampLines: lampLines.map((l) => l.wavelengthNm),
    });

    const calibrate = () =>
      calibrateLamp(lamp.x, lamp.y, lampLines, {
        nominalRangeNm: [350, 900],
        dispersion: "grating",
        resolutionNm: lampResolutionFor(points),
      });
    const calibration = calibrate();
    if (!calibration.fit)
      throw new Error(`the benchmark lamp did not calibrate at ${points} points`);
    const model = calibration.fit.model;

    cases.push({
      name: "parse",
      points,
      lines: 0,
      medianMs: time(() => parseSpectrumText(text), reps),
      referenceMedianMs: null,
    });
    cases.push({
      name: "smoothing",
      points,
      lines: 0,
      medianMs: time(() => savitzkyGolay(flame.y, { windowSize: 9, polynomial: 4 }), reps),
      referenceMedianMs: null,
    });
    cases.push({
      name: "peaks",
      points,
      lines: 0,
      medianMs: time(() => findPeaks(flame.x, flame.y, { source: "flame" }), reps),
      referenceMedianMs: null,
    });
    cases.push({
      name: "auto-calibration",
      points,
      lines: lampLines.length,
      medianMs: time(calibrate, Math.min(reps, 15)),
      referenceMedianMs: null,
    });
    cases.push({
      name: "full-analysis",
      points,
      lines: bigTable.length,
      medianMs: time(
        () =>
          analyzeSample(flame.x, flame.y, bigIndex, {
            calibration: model,
            source: "flame",
            resolutionNm: resolutionFor(points),
          }),
        reps,
      ),
      referenceMedianMs: null,
    });
  }

  // Growth in table size at a fixed 4,096-point spectrum: matching should grow like log n.
  const lamp4k = lampSpectrum(4096);
  const model4k = calibrateLamp(lamp4k.x, lamp4k.y, lampLines, {
    nominalRangeNm: [350, 900],
    dispersion: "grating",
    resolutionNm: 1,
  }).fit!.model;
  const flame4k = flameSpectrum(4096);
  for (const size of TABLE_SIZES) {
    const index = prepareLineIndex(syntheticTable(size));
    cases.push({
      name: "full-analysis-by-table",
      points: 4096,
      lines: size,
      medianMs: time(
        () =>
          analyzeSample(flame4k.x, flame4k.y, index, {
            calibration: model4k,
            source: "flame",
            resolutionNm: 1,
          }),
        60,
      ),
      referenceMedianMs: null,
    });
  }

  let referenceNote = "SciPy/NumPy: not found (install Debian's python3-scipy for the comparison)";
  if (scipyAvailable()) {
    const reference = scipyMedians(dir, manifest);
    for (const c of cases) {
      const key = `${c.name}:${c.points}`;
      if (key in reference) c.referenceMedianMs = reference[key];
    }
    referenceNote = `SciPy/NumPy: ${reference.versions ?? "present"}`;
  }
  fs.rmSync(dir, { recursive: true, force: true });

  if (json) {
    process.stdout.write(
      JSON.stringify({ node: process.version, reference: referenceNote, cases }, null, 2) + "\n",
    );
    return;
  }
  const pad = (s: string, n: number) => s.padStart(n);
  console.log(
    `Emberline numerical core — medians on ${os.cpus().length} cores after a warm-up of ${WARM_UP_RUNS} runs and ${WARM_UP_MS} ms per case, Node ${process.version}; ${referenceNote}`,
  );
  console.log(
    `${"step".padEnd(24)}${pad("points", 10)}${pad("lines", 9)}${pad("median ms", 12)}${pad("SciPy ms", 11)}${pad("ratio", 8)}`,
  );
  for (const c of cases) {
    const ratio = c.referenceMedianMs ? (c.medianMs / c.referenceMedianMs).toFixed(2) : "—";
    console.log(
      `${c.name.padEnd(24)}${pad(String(c.points), 10)}${pad(String(c.lines), 9)}${pad(c.medianMs.toFixed(3), 12)}` +
        `${pad(c.referenceMedianMs ? c.referenceMedianMs.toFixed(3) : "—", 11)}${pad(ratio, 8)}`,
    );
  }
}

main();
