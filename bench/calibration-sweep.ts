// `npm run sweep -- --seed N --n M [--previous [--realigned]] [--clean] [--dispersion prism|grating-curved|grating-straight]`:
// automatic lamp calibration over M realistic instruments from seed N (tests/support/realistic-lamp.ts),
// scored against the generator's truth. Prints success, silent wrong, exceptions, CPU and breakdowns.
// `--realigned` re-records each instrument after a realignment (beyond a day's drift) instead of a day later.
import { formatSweep, runSweep } from "../tests/support/calibration-sweep";
import type { RealisticDispersion } from "../tests/support/realistic-lamp";

// `--samples` is the element-identification sweep (bench/sample-sweep.ts), routed here so both
// sweeps share `npm run sweep`.
if (process.argv.includes("--samples")) {
  void import("./sample-sweep");
} else {
  runCalibrationSweep();
}

function runCalibrationSweep() {
  const args = process.argv.slice(2);
  const value = (name: string, fallback: string) => {
    const at = args.indexOf(`--${name}`);
    return at >= 0 && at + 1 < args.length ? args[at + 1] : fallback;
  };
  const seed = Number(value("seed", "1"));
  const n = Number(value("n", "100"));
  if (!Number.isInteger(seed) || !Number.isInteger(n) || n < 1) {
    console.error(
      "usage: npm run sweep -- --seed N --n M [--previous [--realigned]] [--clean] [--dispersion KIND]",
    );
    process.exit(2);
  }
  const realigned = args.includes("--realigned");
  const withPrevious = realigned || args.includes("--previous");
  const clean = args.includes("--clean");
  const dispersion = value("dispersion", "") as RealisticDispersion | "";
  const records = runSweep({
    seed,
    n,
    withPrevious,
    change: realigned ? "realignment" : "day",
    lamp: { clean, ...(dispersion ? { dispersion } : {}) },
  });
  const mode = [
    withPrevious
      ? `re-recorded ${realigned ? "after a realignment" : "a day later"}, starting from the previous calibration`
      : "blind",
    clean ? "clean lamps" : "realistic lamps",
  ].join(", ");
  console.log(formatSweep(records, `calibration sweep: seed ${seed}, n ${n} (${mode})`));
}
