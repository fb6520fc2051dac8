#!/usr/bin/python3
"""Independent SciPy fit of A, B and S to FO flux data, for the Go tests.

Run with Debian's interpreter (python3-scipy):  /usr/bin/python3 testdata/fit_scipy.py
Writes testdata/fit_scipy.csv: the synthetic data sets (rows "data") and,
for each set, the fitted parameters with their standard errors (rows "fit").

Tools: Python 3 + SciPy (scipy.optimize.least_squares, scipy.optimize.brentq)
and NumPy; versions are written into the CSV header.

Model (written here independently of engine/transport; sources: Tiraferri
et al. 2011 J. Membr. Sci. 367:340 and 2013 J. Membr. Sci. 444:523;
McCutcheon & Elimelech 2006 J. Membr. Sci. 284:237): one solute (NaCl,
nu = 2) in draw and feed, van 't Hoff pi = nu c R T with c the molar
concentration, k on both faces, D in the support and boundary layers.

  AL-FS: R_f = 1/k,        R_d = S/D + 1/k
  AL-DS: R_f = S/D + 1/k,  R_d = 1/k
  N   = B (cF e^{J R_f} - cD e^{-J R_d}) / (1 + B [(e^{J R_f}-1)/J + (1-e^{-J R_d})/J])
  c_f = cF e^{J R_f} - N (e^{J R_f}-1)/J,  c_d = cD e^{-J R_d} + N (1-e^{-J R_d})/J
  Jw  = A nu R T (c_d - c_f),  Js = -N (draw -> feed)

Fit: weighted least squares on ln A, ln B, ln S; residuals (model - measured)
/ (0.05 * measured) for Jw and Js; standard errors from s^2 (J^T J)^-1 at
the minimum, s^2 the reduced chi-square, carried to A, B, S by the delta
method (SE(p) = p SE(ln p)). The data are synthetic (a seeded NumPy
generator, 3 % multiplicative noise) on conditions of our own design.
"""

import csv
import math
import os
import platform

import numpy as np
import scipy
from scipy.optimize import brentq, least_squares

R_GAS = 8.31446261815324  # J/(mol K), exact (2019 SI: N_A k_B)
T_K = 298.15  # 25 degC
NU = 2.0
M_NACL = 58.4398e-3  # kg/mol, the library's NaCl molar mass
LMH = 1.0 / 3.6e6  # m/s
LMH_PER_BAR = LMH / 1e5  # m/(s Pa)
UM = 1e-6
D = 1.5e-9  # m2/s
REL = 0.05  # relative uncertainty of every measured flux


def fluxes(a_lmh_bar, b_lmh, s_um, orient, c_draw, c_feed, k):
    """Jw (LMH) and Js (gMH) for concentrations in mol/L."""
    A, B, S = a_lmh_bar * LMH_PER_BAR, b_lmh * LMH, s_um * UM
    cD, cF = c_draw * 1e3, c_feed * 1e3
    if orient == "AL-FS":
        rf, rd = 1 / k, S / D + 1 / k
    else:
        rf, rd = S / D + 1 / k, 1 / k

    def faces(j):
        ef, ed = math.exp(j * rf), math.exp(-j * rd)
        gf, gd = math.expm1(j * rf) / j, -math.expm1(-j * rd) / j
        n = B * (cF * ef - cD * ed) / (1 + B * (gf + gd))
        return cF * ef - n * gf, cD * ed + n * gd, n

    def resid(j):
        cf, cd, _ = faces(j)
        return A * NU * R_GAS * T_K * (cd - cf) - j

    hi = A * NU * R_GAS * T_K * (cD - cF)
    j = brentq(resid, 1e-3 * hi, hi, xtol=1e-30, rtol=4 * np.finfo(float).eps, maxiter=500)
    _, _, n = faces(j)
    return j / LMH, -n * M_NACL * 1e3 * 3600


# Data sets: (name, true A, B, S, conditions (orientation, draw M, feed M)).
K = 2e-5
SETS = [
    ("both", 2.2, 0.45, 480, [("AL-FS", 0.5, 0), ("AL-FS", 1, 0), ("AL-FS", 1.5, 0), ("AL-FS", 2, 0),
                              ("AL-DS", 0.5, 0.01), ("AL-DS", 1, 0.01), ("AL-DS", 2, 0.05), ("AL-FS", 1, 0.05)]),
    ("al-fs", 1.1, 0.25, 650, [("AL-FS", 0.25, 0), ("AL-FS", 0.5, 0), ("AL-FS", 1, 0), ("AL-FS", 2, 0), ("AL-FS", 3, 0)]),
]


def fit(rows):
    meas = np.array([[r[3], r[4]] for r in rows])

    def res(x):
        a, b, s = np.exp(x)
        out = []
        for (o, cd, cf, _, _), (jw, js) in zip(rows, meas):
            mw, ms = fluxes(a, b, s, o, cd, cf, K)
            out += [(mw - jw) / (REL * jw), (ms - js) / (REL * js)]
        return np.array(out)

    lo = np.log([1e-3, 1e-5, 1])
    hi = np.log([100, 100, 1e5])
    best = None
    for x0 in ([1, 0.3, 500], [3, 1, 200], [0.5, 0.1, 1500]):
        r = least_squares(res, np.log(x0), bounds=(lo, hi), jac="3-point", method="trf",
                          xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=5000, x_scale=1.0)
        if best is None or r.cost < best.cost:
            best = r
    J = best.jac
    dof = len(best.fun) - 3
    s2 = 2 * best.cost / dof
    cov = s2 * np.linalg.inv(J.T @ J)
    p = np.exp(best.x)
    return p, p * np.sqrt(np.diag(cov)), best


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    rng = np.random.default_rng(13)
    out = []
    for name, a, b, s, conds in SETS:
        rows = []
        for o, cd, cf in conds:
            jw, js = fluxes(a, b, s, o, cd, cf, K)
            jw *= 1 + 0.03 * rng.standard_normal()
            js *= 1 + 0.03 * rng.standard_normal()
            rows.append((o, cd, cf, jw, js))
        p, se, r = fit(rows)
        for o, cd, cf, jw, js in rows:
            out.append(["data", name, o, repr(float(cd)), repr(float(cf)), repr(K), repr(D), repr(float(jw)), repr(float(js)), "", "", ""])
        for i, pname in enumerate(("a", "b", "s")):
            out.append(["fit", name, "", "", "", "", "", "", "", pname, "%.12e" % p[i], "%.6e" % se[i]])
    with open(os.path.join(here, "fit_scipy.csv"), "w", newline="") as fh:
        fh.write("# Produced by testdata/fit_scipy.py with Python %s, SciPy %s, NumPy %s (scipy.optimize.least_squares, trf, 3-point Jacobian).\n"
                 % (platform.python_version(), scipy.__version__, np.__version__))
        fh.write("# Synthetic data (seeded NumPy generator, 3 %% noise), NaCl van 't Hoff at 25 degC, k = %g m/s both sides, D = %g m2/s; weights 1/(%g x measured).\n" % (K, D, REL))
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["kind", "set", "orientation", "draw_mol_per_l", "feed_mol_per_l", "k_m_per_s", "d_m2_per_s",
                    "water_flux_lmh", "reverse_solute_flux_gmh", "parameter", "value", "standard_error"])
        w.writerows(out)


if __name__ == "__main__":
    main()
