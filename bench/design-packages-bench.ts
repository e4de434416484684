// `npm run bench` (part): the packages the product's design names beside the project's own code where
// that code stays — the same inputs, medians of the time and how far the answers differ — so that the
// reason recorded in DEVELOPERS.md ("Design packages") is a measurement anyone can repeat.
//   Savitzky–Golay smoothing: ml-savitzky-golay against signal/savitzky-golay.ts (SciPy-style edges).
//   Modified-polynomial continuum: ml-regression-polynomial refitted per pass against our Legendre
//     basis built once (signal/modified-polynomial-baseline.ts).
//   Theil–Sen of the noise profile (256 blocks): ml-regression-theil-sen against the pairwise slopes
//     and xMedian of signal/theil-sen-line.ts (the noise profile's).
import mlSavitzkyGolay from "ml-savitzky-golay";
import { PolynomialRegression } from "ml-regression-polynomial";
import { TheilSenRegression } from "ml-regression-theil-sen";
import { makeRandom } from "../lib/spectrum/statistics/make-random";
import { modifiedPolynomialBaseline } from "../lib/spectrum/signal/modified-polynomial-baseline";
import { savitzkyGolay } from "../lib/spectrum/signal/savitzky-golay";
import { theilSenLine } from "../lib/spectrum/signal/theil-sen-line";

const json = process.argv.includes("--json");

function median(values: number[]): number {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

function time(run: () => unknown, reps: number): number {
  for (let i = 0; i < 3; i++) run();
  const samples: number[] = [];
  for (let i = 0; i < reps; i++) {
    const start = process.hrtime.bigint();
    run();
    samples.push(Number(process.hrtime.bigint() - start) / 1e6);
  }
  return median(samples);
}

/** A sample-like signal: a sloping continuum, a few lines, noise. */
function signal(points: number): { x: Float64Array; y: Float64Array } {
  const random = makeRandom(points);
  const x = new Float64Array(points);
  const y = new Float64Array(points);
  for (let i = 0; i < points; i++) {
    const u = i / (points - 1);
    x[i] = 350 + 550 * u;
    let value = 400 + 300 * u - 200 * u * u;
    for (const [centre, height] of [
      [0.2, 900],
      [0.45, 2500],
      [0.7, 600],
    ])
      value += height * Math.exp(-((((u - centre) * points) / 3) ** 2));
    y[i] = value + 5 * random.normal();
  }
  return { x, y };
}

/** The largest difference between two answers away from the first and last `edge` samples. */
function interiorDifference(a: ArrayLike<number>, b: ArrayLike<number>, edge: number): number {
  let worst = 0;
  for (let i = edge; i < a.length - edge; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
  return worst;
}

/** The modified-polynomial continuum with ml-regression-polynomial refitted on every pass. */
function modifiedPolynomialWithPackage(
  x: Float64Array,
  y: Float64Array,
  degree: number,
  maxIterations = 100,
  tolerance = 0.001,
): Float64Array {
  const n = x.length;
  // The same mapping to [−1, 1] as ours, so that raw powers stay well conditioned.
  const u = Array.from(x, (v) => (2 * (v - x[0])) / (x[n - 1] - x[0]) - 1);
  const working = Array.from(y);
  let fit = new Float64Array(n);
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    const model = new PolynomialRegression(u, working, degree);
    const next = new Float64Array(n);
    let changeSquares = 0;
    let fitSquares = 0;
    for (let i = 0; i < n; i++) {
      const value = model.predict(u[i]);
      next[i] = value;
      changeSquares += (value - fit[i]) ** 2;
      fitSquares += value * value;
      if (working[i] > value) working[i] = value;
    }
    fit = next;
    if (iteration > 0 && changeSquares <= tolerance * tolerance * fitSquares) break;
  }
  return fit;
}

interface Row {
  name: string;
  points: number;
  oursMs: number;
  packageMs: number;
  difference: string;
}

function main(): void {
  const rows: Row[] = [];
  for (const points of [4096, 65_536]) {
    const { x, y } = signal(points);
    const reps = points > 10_000 ? 20 : 100;
    const windowSize = 11;
    const ours = savitzkyGolay(y, { windowSize, polynomial: 2 });
    const theirs = mlSavitzkyGolay(Array.from(y), 1, {
      windowSize,
      derivative: 0,
      polynomial: 2,
      pad: "pre",
      padValue: "replicate",
    });
    rows.push({
      name: "Savitzky–Golay, window 11, quadratic",
      points,
      oursMs: time(() => savitzkyGolay(y, { windowSize, polynomial: 2 }), reps),
      packageMs: time(
        () =>
          mlSavitzkyGolay(Array.from(y), 1, {
            windowSize,
            derivative: 0,
            polynomial: 2,
            pad: "pre",
            padValue: "replicate",
          }),
        reps,
      ),
      difference: `interior ${interiorDifference(ours, theirs, windowSize).toExponential(1)}, edges ${interiorDifference(
        ours.subarray(0, windowSize),
        theirs.slice(0, windowSize),
        0,
      ).toFixed(2)} counts`,
    });

    const baseline = modifiedPolynomialBaseline(x, y, { degree: 3 });
    const packaged = modifiedPolynomialWithPackage(x, y, 3);
    rows.push({
      name: "modified-polynomial continuum, cubic",
      points,
      oursMs: time(() => modifiedPolynomialBaseline(x, y, { degree: 3 }), reps),
      packageMs: time(() => modifiedPolynomialWithPackage(x, y, 3), Math.max(5, reps / 4)),
      difference: `${interiorDifference(baseline, packaged, 0).toExponential(1)} counts`,
    });
  }

  // 256 blocks (the noise profile's most) of level and variance: shot noise on a continuum plus odd blocks.
  const random = makeRandom(256);
  const level = Float64Array.from({ length: 256 }, (_, b) => 200 + 20 * b + random.uniform());
  const variance = Float64Array.from(
    level,
    (l, b) => 25 + 1.1 * l * (1 + 0.1 * random.normal()) + (b % 17 === 0 ? 5000 : 0),
  );
  const ours = theilSenLine(level, variance)!;
  const theirs = new TheilSenRegression(Array.from(level), Array.from(variance));
  rows.push({
    name: "Theil–Sen of the noise profile, 256 blocks",
    points: 256,
    oursMs: time(() => theilSenLine(level, variance), 50),
    packageMs: time(() => new TheilSenRegression(Array.from(level), Array.from(variance)), 50),
    difference: `slope ${Math.abs(ours.slope - theirs.slope).toExponential(1)}, intercept ${Math.abs(
      ours.intercept - theirs.intercept,
    ).toExponential(
      1,
    )} (even count: the package takes the lower middle value, ours the mean of both)`,
  });

  if (json) {
    console.log(JSON.stringify({ designPackages: rows }));
    return;
  }
  console.log("\nThe design's packages beside our code (medians, ms):");
  console.log(
    `${"stage".padEnd(44)} ${"points".padStart(7)} ${"ours".padStart(8)} ${"package".padStart(8)}  difference`,
  );
  for (const r of rows)
    console.log(
      `${r.name.padEnd(44)} ${String(r.points).padStart(7)} ${r.oursMs.toFixed(3).padStart(8)} ${r.packageMs.toFixed(3).padStart(8)}  ${r.difference}`,
    );
}

main();
