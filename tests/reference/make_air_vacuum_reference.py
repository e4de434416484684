#!/usr/bin/python3
# Makes air_vacuum_reference.json: worked air/vacuum pairs from the Morton (2000, ApJS 130, 403)
# formula after Edlen (1966), computed independently of the TypeScript code (the inverse with
# SciPy's brentq root finder rather than Newton). Run: /usr/bin/python3 make_air_vacuum_reference.py
import json
import os

from scipy.optimize import brentq


def refractive_index(vacuum_nm):
    s2 = (1e4 / (vacuum_nm * 10.0)) ** 2  # s = 10^4 / lambda_vac[Angstrom], in um^-1
    return 1 + 8.34254e-5 + 2.406147e-2 / (130 - s2) + 1.5998e-4 / (38.9 - s2)


def vacuum_to_air(vacuum_nm):
    return vacuum_nm / refractive_index(vacuum_nm)


def air_to_vacuum(air_nm):
    return brentq(lambda v: vacuum_to_air(v) - air_nm, air_nm, air_nm * 1.001, xtol=1e-14, rtol=1e-15)


vacuum_nm = [200.0, 250.0, 300.0, 404.77, 486.27, 589.158, 656.461, 800.0, 1000.0, 1500.0, 2000.0]
air_nm = [200.0, 253.652, 365.015, 435.833, 546.074, 587.562, 696.543, 763.511, 912.297, 1529.582, 1999.0]

out = {
    "source": "Morton (2000, ApJS 130, 403) eq. 3 after Edlen (1966), computed by make_air_vacuum_reference.py",
    "vacuumToAir": [{"vacuumNm": v, "airNm": vacuum_to_air(v), "n": refractive_index(v)} for v in vacuum_nm],
    "airToVacuum": [{"airNm": a, "vacuumNm": air_to_vacuum(a)} for a in air_nm],
}
path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "air_vacuum_reference.json")
with open(path, "w") as f:
    json.dump(out, f, indent=2)
    f.write("\n")
print(path)
