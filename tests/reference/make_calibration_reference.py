# Makes calibration-reference.json: NumPy polyfit (with cov=True) and SciPy curve_fit of the Hartmann
# formula on deterministic pairs, so the TypeScript fits can be checked against an outside library;
# SciPy's least_squares on the prism model with a glass fitted from the pairs (fitted-glass.ts); and
# SciPy's bounded scalar minimiser on the summed Gaussian profile of blended lamp lines (where the one
# peak they make has its top); each pair's miss by a weighted polyfit of the others (held out); and how
# far a weighted polyfit moves when one pair is left out (pair influence).
# Run with Debian's interpreter: /usr/bin/python3 tests/reference/make_calibration_reference.py
import json
import os

import numpy as np
import scipy
from scipy.optimize import brentq, curve_fit, least_squares, minimize_scalar

HERE = os.path.dirname(os.path.abspath(__file__))

# Deterministic pairs: a grating-like cubic plus a fixed pseudo-random pattern of residuals (no RNG, so
# the inputs are the same on every machine).
DOMAIN = [0.0, 2047.0]
centre = (DOMAIN[0] + DOMAIN[1]) / 2
half = (DOMAIN[1] - DOMAIN[0]) / 2
x_grating = np.array([37.2, 140.8, 262.5, 401.1, 533.9, 689.4, 812.0, 955.7, 1103.3, 1260.6, 1398.2,
                      1544.9, 1690.1, 1822.4, 1960.8, 2011.5])
t_grating = (x_grating - centre) / half
wiggle = 0.01 * np.sin(7.3 * np.arange(len(x_grating)) + 0.4)
y_grating = 625.0 + 276.0 * t_grating - 1.8 * t_grating**2 + 0.9 * t_grating**3 + wiggle

polynomials = []
for degree in (1, 2, 3, 4):
    coefficients, covariance = np.polyfit(t_grating, y_grating, degree, cov=True)
    x_eval = np.array([0.0, 500.0, 1023.5, 1800.0, 2047.0])
    t_eval = (x_eval - centre) / half
    polynomials.append({
        "degree": degree,
        # numpy gives the highest power first; stored lowest first to match the TS parameters.
        "coefficientsAscending": coefficients[::-1].tolist(),
        "covarianceAscending": covariance[::-1, ::-1].tolist(),
        "evalX": x_eval.tolist(),
        "evalNm": np.polyval(coefficients, t_eval).tolist(),
    })

# Hartmann pairs: λ = λ0 + c/(t0 − t)^α with the pole above the array, plus a fixed residual pattern.
x_prism = np.array([20.0, 160.0, 330.0, 480.0, 640.0, 800.0, 950.0, 1120.0, 1290.0, 1450.0, 1600.0,
                    1760.0, 1900.0, 2030.0])
t_prism = (x_prism - centre) / half
true = (210.0, 400.0, 1.25, 0.9)


def hartmann(t, lambda0, c, t0, alpha):
    return lambda0 + c / (t0 - t) ** alpha


y_prism = hartmann(t_prism, *true) + 0.02 * np.cos(5.1 * np.arange(len(x_prism)) + 1.0)
parameters, covariance = curve_fit(hartmann, t_prism, y_prism, p0=(200.0, 380.0, 1.3, 1.0), maxfev=20000)

# A steep Hartmann curve (α = 2.5, pole just beyond the array's red end): the four parameters are
# strongly correlated here, the case in which a plain four-parameter Levenberg–Marquardt stalls.
# Tight tolerances so SciPy's answer is the least-squares minimum, not its stopping point.
steep_count = 12
t_steep = np.linspace(0.3, 0.98, steep_count) + 0.004 * np.sin(2.3 * np.arange(steep_count))
x_steep = centre + half * t_steep
y_steep = hartmann(t_steep, 400.0, 50.0, 1.05, 2.5) + 0.01 * np.cos(4.1 * np.arange(steep_count) + 0.7)
steep_parameters, steep_covariance = curve_fit(
    hartmann, t_steep, y_steep, p0=(350.0, 80.0, 1.155, 1.0), maxfev=100000, ftol=1e-15, xtol=1e-15, gtol=1e-15
)
steep_chi_square = float(np.sum((y_steep - hartmann(t_steep, *steep_parameters)) ** 2))

# The forward Hartmann form the prism pairing fits, x = a + b·((λ − λ0)/100 nm)^(−α), weighted by each
# pair's σ in x: a prism-like axis (x falling towards the red) with a fixed residual pattern.
forward_nm = np.array([404.66, 435.83, 467.8, 501.6, 546.07, 576.96, 611.4, 640.2, 667.73, 703.0, 738.4,
                       772.4, 811.53, 852.14])
forward_sigma = 0.05 + 0.02 * (np.arange(len(forward_nm)) % 3)


def forward_hartmann(nm, a, b, lambda0, alpha):
    return a + b * ((nm - lambda0) / 100.0) ** (-alpha)


forward_x = forward_hartmann(forward_nm, -900.0, 4200.0, 180.0, 0.8) + 0.3 * np.sin(3.7 * np.arange(len(forward_nm)) + 0.2)
forward_parameters, forward_covariance = curve_fit(
    forward_hartmann, forward_nm, forward_x, p0=(-800.0, 4000.0, 150.0, 1.0), sigma=forward_sigma,
    absolute_sigma=True, maxfev=100000, ftol=1e-15, xtol=1e-15, gtol=1e-15
)
forward_chi_square = float(np.sum(((forward_x - forward_hartmann(forward_nm, *forward_parameters)) / forward_sigma) ** 2))

# Blends: Gaussian lines of one FWHM summed; the top is the maximum of the sum, searched between the
# outermost members. Mercury's 365 nm group (Hg I 365.015 and 365.483 nm, NIST ASD air wavelengths, from
# memory; the starter table's lamp intensities 400 and 80) at several resolutions, and a three-line case.
FOUR_LN2 = 4 * np.log(2)
blend_cases = [
    ([365.015, 365.483], [400.0, 80.0], 1.0),
    ([365.015, 365.483], [400.0, 80.0], 0.6),
    ([365.015, 365.483], [400.0, 80.0], 3.0),
    ([500.0, 500.05], [100.0, 100.0], 1.0),
    ([600.0, 600.3, 600.7], [50.0, 100.0, 30.0], 1.2),
]
blends = []
for wavelengths, intensities, fwhm in blend_cases:
    def negative_profile(nm, wavelengths=wavelengths, intensities=intensities, fwhm=fwhm):
        return -sum(i * np.exp(-FOUR_LN2 * ((nm - w) / fwhm) ** 2) for w, i in zip(wavelengths, intensities))
    found = minimize_scalar(negative_profile, bounds=(min(wavelengths), max(wavelengths)),
                            method="bounded", options={"xatol": 1e-10})
    blends.append({"wavelengthsNm": wavelengths, "intensities": intensities, "fwhmNm": fwhm,
                   "topNm": float(found.x)})

# Held-out misses: each pair of a weighted cubic against NumPy polyfit of the other pairs (weights
# 1/σλ, covariance scaled by their χ² per degree of freedom), in σ of that prediction and of the pair's
# centre. One pair is pulled by 0.3 nm, about a pixel here.
held_sigma_x = 0.15 + 0.1 * np.abs(np.sin(3.1 * np.arange(len(x_grating))))
held_slope = (276.0 - 3.6 * t_grating + 2.7 * t_grating**2) / half  # dλ/dx of the cubic above
held_y = y_grating.copy()
HELD_PULLED = 8
held_y[HELD_PULLED] += 0.3
HELD_FLOOR_X = 0.12
held_sigmas = []
for i in range(len(x_grating)):
    rest = np.arange(len(x_grating)) != i
    held_coefficients, held_covariance = np.polyfit(t_grating[rest], held_y[rest], 3,
                                          w=1 / (held_sigma_x[rest] * held_slope[rest]), cov=True)
    powers = t_grating[i] ** np.arange(3, -1, -1)
    miss = held_y[i] - np.polyval(held_coefficients, t_grating[i])
    centre_nm = max(held_sigma_x[i], HELD_FLOOR_X) * held_slope[i]
    held_sigmas.append(float(abs(miss) / np.sqrt(powers @ held_covariance @ powers + centre_nm**2)))

# Pair influence: how far a weighted cubic moves, inside the span of the other pairs, when one pair is
# left out (NumPy polyfit with and without it; the shift in x through the full fit's slope, on 41 points
# evenly over the pairs' span). One pair stands alone in a wide gap and is pulled by 0.15 nm.
lone_x = np.array([30.5, 88.1, 151.7, 226.3, 302.9, 1104.2, 1702.6, 1788.4, 1861.0, 1937.3, 2015.8])
lone_t = (lone_x - centre) / half
lone_y = (625.0 + 276.0 * lone_t - 1.8 * lone_t**2 + 0.9 * lone_t**3
          + 0.01 * np.sin(5.1 * np.arange(len(lone_x)) + 0.2))
LONE_PULLED = 5
lone_y[LONE_PULLED] += 0.15
lone_sigma_x = np.full(len(lone_x), 0.15)
lone_slope = (276.0 - 3.6 * lone_t + 2.7 * lone_t**2) / half
lone_weights = 1 / (lone_sigma_x * lone_slope)
lone_full = np.polyfit(lone_t, lone_y, 3, w=lone_weights)
lone_grid = np.linspace(lone_x.min(), lone_x.max(), 41)
lone_grid_t = (lone_grid - centre) / half
lone_grid_slope = np.polyval(np.polyder(lone_full), lone_grid_t) / half
lone_shifts = []
for i in range(len(lone_x)):
    rest = np.arange(len(lone_x)) != i
    without = np.polyfit(lone_t[rest], lone_y[rest], 3, w=lone_weights[rest])
    inside = (lone_grid >= lone_x[rest].min()) & (lone_grid <= lone_x[rest].max())
    shift = np.abs(np.polyval(lone_full, lone_grid_t) - np.polyval(without, lone_grid_t)) / np.abs(
        lone_grid_slope)
    lone_shifts.append(float(shift[inside].max()))

# A prism of a glass outside the catalogue (N-LASF9: SCHOTT's published Sellmeier coefficients, from
# memory), 60° apex at minimum deviation for 600 nm, a camera on the tangent law with its axis 0.05 rad
# off the reference ray; pairs at lamp-like wavelengths with a fixed residual pattern. SciPy's
# least_squares fits the prism model whose glass is one ultraviolet resonance and an infrared strength
# at a fixed 100 µm² (fitted-glass.ts), from several starts, to the least-squares minimum.
APEX = np.pi / 3
LASF9_B = [2.00029547, 0.298926886, 1.80691843]
LASF9_C = [0.0121426017, 0.0538736236, 156.530829]


def sellmeier(nm, b, c):
    l2 = (nm / 1000.0) ** 2
    return np.sqrt(1 + sum(bi * l2 / (l2 - ci) for bi, ci in zip(b, c)))


def deviation(n, incidence):
    inside = np.arcsin(np.sin(incidence) / n)
    return incidence + np.arcsin(n * np.sin(APEX - inside)) - APEX


glass_nm = np.array([404.656, 435.833, 467.123, 501.568, 546.074, 587.562, 640.225, 667.728,
                     706.722, 750.387, 794.818, 842.465, 871.6, 912.297])
glass_reference_nm = (glass_nm.min() + glass_nm.max()) / 2
true_incidence = np.arcsin(sellmeier(600.0, LASF9_B, LASF9_C) * np.sin(APEX / 2))
true_n_ref = sellmeier(glass_reference_nm, LASF9_B, LASF9_C)


def camera(nm, incidence, b, a, phi, n_of, n_ref):
    angle = deviation(n_ref, incidence) - deviation(n_of(nm), incidence)
    return a + b * (np.tan(angle + phi) - np.tan(phi))


glass_x = camera(glass_nm, true_incidence, 9000.0, 1700.0, 0.05,
                 lambda nm: sellmeier(nm, LASF9_B, LASF9_C), true_n_ref)
glass_x = glass_x + 0.02 * np.sin(5.1 * np.arange(len(glass_nm)) + 0.7)
glass_sigma = np.full(len(glass_nm), 0.03)


def fitted_glass_x(p, nm):
    incidence, b, a, phi, b1, c1, b3 = p
    terms = ([b1, b3], [c1, 100.0])
    return camera(nm, incidence, b, a, phi, lambda w: sellmeier(w, *terms),
                  sellmeier(glass_reference_nm, *terms))


# The bounds fit-glass-terms.ts holds its search to: incidence inside (1e-3, π/2 − 1e-3) rad, camera
# axis angle within ±0.5 rad, B1 in (1e-3, 10), C1 in (1e-5, 0.9·λmin²) µm², |B3| < 30.
GLASS_BOUNDS = ([1e-3, -np.inf, -np.inf, -0.5, 1e-3, 1e-5, -30.0],
                [np.pi / 2 - 1e-3, np.inf, np.inf, 0.5, 10.0, 0.9 * (glass_nm.min() / 1000) ** 2, 30.0])
best_glass = None
for b1, c1, b3 in [(2.05, 0.0207, 1.22), (2.3, 0.02, 1.4), (1.9, 0.025, 1.0)]:
    for incidence in (true_incidence - 0.05, true_incidence, true_incidence + 0.05):
        for phi in (0.0, 0.1):
            start = [incidence, 9000.0, 1700.0, phi, b1, c1, b3]
            try:
                fit = least_squares(lambda p: (fitted_glass_x(p, glass_nm) - glass_x) / glass_sigma,
                                    start, bounds=GLASS_BOUNDS, x_scale="jac", xtol=1e-15,
                                    ftol=1e-15, gtol=1e-15, max_nfev=20000)
            except ValueError:
                continue
            if np.all(np.isfinite(fit.fun)) and (best_glass is None or fit.cost < best_glass.cost):
                best_glass = fit
glass_eval_x = np.linspace(glass_x.min(), glass_x.max(), 9)
glass_eval_nm = [brentq(lambda nm: fitted_glass_x(best_glass.x, np.array([nm]))[0] - x,
                        glass_nm.min() - 1, glass_nm.max() + 1, xtol=1e-12) for x in glass_eval_x]

result = {
    "generator": "tests/reference/make_calibration_reference.py",
    "numpyVersion": np.__version__,
    "scipyVersion": scipy.__version__,
    "domain": DOMAIN,
    "polynomial": {"x": x_grating.tolist(), "wavelengthNm": y_grating.tolist(), "fits": polynomials},
    "hartmann": {
        "x": x_prism.tolist(),
        "wavelengthNm": y_prism.tolist(),
        "parameters": parameters.tolist(),
        "covariance": covariance.tolist(),
        "parameterNames": ["lambda0Nm", "cNm", "t0", "alpha"],
    },
    "hartmannSteep": {
        "x": x_steep.tolist(),
        "wavelengthNm": y_steep.tolist(),
        "parameters": steep_parameters.tolist(),
        "covariance": steep_covariance.tolist(),
        "chiSquare": steep_chi_square,
        "parameterNames": ["lambda0Nm", "cNm", "t0", "alpha"],
    },
    "forwardHartmann": {
        "wavelengthNm": forward_nm.tolist(),
        "x": forward_x.tolist(),
        "xUncertainty": forward_sigma.tolist(),
        "parameters": forward_parameters.tolist(),
        "covariance": forward_covariance.tolist(),
        "chiSquare": forward_chi_square,
        "parameterNames": ["a", "b", "lambda0Nm", "alpha"],
    },
    "blendTops": blends,
    "heldOut": {
        "x": x_grating.tolist(),
        "wavelengthNm": held_y.tolist(),
        "xUncertainty": held_sigma_x.tolist(),
        "centreFloorX": HELD_FLOOR_X,
        "pulledIndex": HELD_PULLED,
        "sigmas": held_sigmas,
    },
    "fittedGlassPrism": {
        "apexDeg": 60,
        "x": glass_x.tolist(),
        "wavelengthNm": glass_nm.tolist(),
        "xUncertainty": glass_sigma.tolist(),
        "chiSquare": float(2 * best_glass.cost),
        "parameters": best_glass.x.tolist(),
        "parameterNames": ["incidenceRad", "b", "a", "axisAngleRad", "B1", "C1Um2", "B3"],
        "status": int(best_glass.status),
        "nfev": int(best_glass.nfev),
        "evalX": glass_eval_x.tolist(),
        "evalNm": glass_eval_nm,
    },
    "pairInfluence": {
        "x": lone_x.tolist(),
        "wavelengthNm": lone_y.tolist(),
        "xUncertainty": lone_sigma_x.tolist(),
        "pulledIndex": LONE_PULLED,
        "shiftsX": lone_shifts,
    },
}
with open(os.path.join(HERE, "calibration-reference.json"), "w") as handle:
    json.dump(result, handle, indent=2)
    handle.write("\n")
print("wrote calibration-reference.json with numpy", np.__version__, "scipy", scipy.__version__)
