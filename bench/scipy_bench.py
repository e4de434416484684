"""The SciPy/NumPy counterparts of Emberline's benchmark steps, on the same files, as medians in ms.

parse: numpy.loadtxt; smoothing: scipy.signal.savgol_filter(9, 4); peaks: savgol_filter +
an asymmetric-least-squares continuum (a banded solver) + find_peaks(prominence) + peak_widths;
auto-calibration: find_peaks on the lamp + numpy.polyfit (SciPy has no pairing, so this is a floor);
full-analysis: the peaks step + numpy.searchsorted of the peaks into the sorted line table.
"""
import json
import sys
import time

import numpy as np
import scipy
from scipy import sparse
from scipy.signal import find_peaks, peak_widths, savgol_filter
from scipy.linalg import solveh_banded


# The same warm-up rule as bench/spectrum-bench.ts: at least this many runs, and for at least this long.
WARM_UP_RUNS = 5
WARM_UP_SECONDS = 0.3


def median_ms(fn, reps):
    warm_until = time.perf_counter() + WARM_UP_SECONDS
    runs = 0
    while runs < min(WARM_UP_RUNS, reps) or time.perf_counter() < warm_until:
        fn()
        runs += 1
    samples = []
    for _ in range(reps):
        start = time.perf_counter()
        fn()
        samples.append((time.perf_counter() - start) * 1e3)
    return float(np.median(samples))


def als(y, lam=1e6, p=0.01, iterations=10):
    """The asymmetric-least-squares continuum with a banded solver: W + lam D^T D is symmetric
    pentadiagonal, so scipy.linalg.solveh_banded (LAPACK's banded Cholesky) is the fair counterpart
    of Emberline's own pentadiagonal solve (a general sparse LU overstated the ratio ~10x)."""
    n = len(y)
    d = sparse.diags([1.0, -2.0, 1.0], [0, -1, -2], shape=(n, n - 2))
    penalty = lam * d.dot(d.transpose())
    # Upper banded form: row 0 the second superdiagonal, row 1 the first, row 2 the main diagonal.
    bands = np.zeros((3, n))
    bands[0, 2:] = penalty.diagonal(2)
    bands[1, 1:] = penalty.diagonal(1)
    main = penalty.diagonal(0)
    w = np.ones(n)
    for _ in range(iterations):
        bands[2] = main + w
        z = solveh_banded(bands, w * y, check_finite=False)
        w = p * (y > z) + (1 - p) * (y < z)
    return z


def noise(y):
    d2 = np.diff(y, 2)
    return np.median(np.abs(d2 - np.median(d2))) / (0.6744897501960817 * np.sqrt(6))


def peaks(y):
    smoothed = savgol_filter(y, 9, 4)
    corrected = smoothed - als(smoothed)
    sigma = noise(y)
    found, _ = find_peaks(corrected, prominence=5 * sigma)
    peak_widths(corrected, found, rel_height=0.5)
    return found


def main():
    folder = sys.argv[1]
    manifest = json.load(open(f"{folder}/manifest.json"))
    out = {"versions": f"scipy {scipy.__version__}, numpy {np.__version__}"}
    table = None
    for case in manifest:
        n, reps = case["points"], case["reps"]
        lamp = np.fromfile(case["lamp"], dtype=np.float64)
        flame = np.fromfile(case["flame"], dtype=np.float64)
        if table is None:
            table = np.sort(np.fromfile(case["table"], dtype=np.float64))
        x = np.arange(n, dtype=np.float64)
        lines = np.array(case["lampLines"])
        out[f"parse:{n}"] = median_ms(lambda: np.loadtxt(case["text"], delimiter=",", skiprows=1), max(3, reps // 4))
        out[f"smoothing:{n}"] = median_ms(lambda: savgol_filter(flame, 9, 4), reps)
        out[f"peaks:{n}"] = median_ms(lambda: peaks(flame), reps)

        def calibrate():
            found = peaks(lamp)
            k = min(len(found), len(lines))
            if k >= 4:
                np.polyfit(x[found[:k]], lines[:k], 3)

        out[f"auto-calibration:{n}"] = median_ms(calibrate, min(reps, 15))

        def analyse():
            found = peaks(flame)
            wavelengths = 350 + 540 * found / (n - 1)
            np.searchsorted(table, wavelengths - 0.5)
            np.searchsorted(table, wavelengths + 0.5)

        out[f"full-analysis:{n}"] = median_ms(analyse, reps)
    json.dump(out, sys.stdout)


main()
