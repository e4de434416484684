#!/usr/bin/python3
"""Reference values for the signal and peak stages, made with Debian's SciPy/NumPy.

Run:  /usr/bin/python3 tests/reference/make_signal_reference.py
Writes tests/reference/signal-reference.json beside this script. The synthetic signals are
defined by closed formulas (no random numbers) and are stored in the JSON as well, so the
TypeScript tests read exactly the data SciPy saw.
"""
import json
import os

import numpy as np
import scipy
from scipy.signal import find_peaks, peak_widths, savgol_coeffs, savgol_filter

here = os.path.dirname(os.path.abspath(__file__))

coeffs = []
for window in (5, 7, 9, 11):
    for polyorder in (2, 3, 4):
        for deriv in (0, 1, 2):
            # use="dot": weight j multiplies the j-th sample of the window (our order).
            c = savgol_coeffs(window, polyorder, deriv=deriv, delta=1.0, use="dot")
            coeffs.append({"windowSize": window, "polynomial": polyorder, "derivative": deriv,
                           "coefficients": [float(v) for v in c]})

# Deterministic "noisy" signal: a Gaussian, a slope, a slow wave and a fast pseudo-noise term.
n = 64
i = np.arange(n, dtype=float)
signal = (50.0 * np.exp(-0.5 * ((i - 30.3) / 3.0) ** 2) + 0.4 * i + 10.0 * np.sin(i / 9.0)
          + 2.0 * np.sin(1.7 * i * i))
filters = []
for window, polyorder, deriv, delta in ((5, 2, 0, 1.0), (7, 2, 0, 1.0), (9, 4, 0, 1.0), (7, 3, 1, 0.5),
                                         (11, 4, 2, 0.25)):
    for mode in ("interp", "nearest"):
        out = savgol_filter(signal, window, polyorder, deriv=deriv, delta=delta, mode=mode)
        filters.append({"windowSize": window, "polynomial": polyorder, "derivative": deriv,
                        "spacing": delta, "mode": mode, "output": [float(v) for v in out]})

# Deterministic spectrum for find_peaks: flat zero continuum, well separated Gaussians, and a
# small deterministic ripple so a noise estimate is non-zero.
m = 400
j = np.arange(m, dtype=float)
lines = [(40.2, 80.0, 2.0), (110.7, 30.0, 3.5), (190.0, 120.0, 1.5), (260.4, 15.0, 5.0), (340.9, 60.0, 2.5)]
spectrum = 0.05 * np.sin(2.3 * j * j)
for centre, height, sigma in lines:
    spectrum = spectrum + height * np.exp(-0.5 * ((j - centre) / sigma) ** 2)
peaks, props = find_peaks(spectrum, height=3.0, prominence=3.0, width=0.0, rel_height=0.5)
widths = peak_widths(spectrum, peaks, rel_height=0.5)

out = {
    "generator": "tests/reference/make_signal_reference.py",
    "versions": {"scipy": scipy.__version__, "numpy": np.__version__},
    "savgolCoeffs": coeffs,
    "savgolFilter": {"signal": [float(v) for v in signal], "cases": filters},
    "findPeaks": {
        "spectrum": [float(v) for v in spectrum],
        "lines": [{"centre": c, "height": h, "sigma": s} for c, h, s in lines],
        "peaks": [int(p) for p in peaks],
        "peakHeights": [float(v) for v in props["peak_heights"]],
        "prominences": [float(v) for v in props["prominences"]],
        "widths": [float(v) for v in widths[0]],
        "leftIps": [float(v) for v in widths[2]],
        "rightIps": [float(v) for v in widths[3]],
    },
}
with open(os.path.join(here, "signal-reference.json"), "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("wrote signal-reference.json with scipy", scipy.__version__, "numpy", np.__version__, "peaks", list(peaks))
