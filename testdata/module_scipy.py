#!/usr/bin/python3
"""Independent SciPy solution of the Drawsift module model, for the Go tests.

Run with Debian's interpreter (python3-scipy):  /usr/bin/python3 testdata/module_scipy.py
Writes testdata/module_scipy.csv.

Tools: Python 3 + SciPy: scipy.integrate.solve_ivp (DOP853, rtol 1e-12) for
the balances, scipy.optimize.brentq for the local flux (the equations of
testdata/flux_scipy.py, imported from it), scipy.optimize.root (hybr) for the
counter-current shooting. Versions are written into the CSV header.

Model (as engine/module, written here independently): steady plug flow
along the area x from the feed inlet; one neutral solute (nu particles) in
both streams; state Qd, Qf (m3/s), nd, nf (mol/s):
  dQf/dx = -Jw,  dnf/dx = -N          (feed flows +x)
  dQd/dx = +-Jw, dnd/dx = +-N         (+ co-current, - counter-current)
with Jw and N (feed -> draw) the local FO fluxes at the bulks nd/Qd, nf/Qf
(Tiraferri et al. 2011 J. Membr. Sci. 367:340 with ICP and ECP). Co-current
is an initial-value problem; counter-current shoots on the draw's outlet
state (Qd, nd at x = 0) so that the draw's state at x = A is its inlet.
Osmotic laws: van 't Hoff and the non-linear test function of
flux_scipy.py (our own, not data for any real solute). SI units.
"""

import csv
import itertools
import os
import platform

import numpy as np
import scipy
from scipy.integrate import solve_ivp
from scipy.optimize import root

from flux_scipy import LMH, LMH_PER_BAR, NL_A, NL_B, R_GAS, T_K, make_residual, solve, species_faces

UM = 1e-6
PER_LH = 1.0 / 3.6e6  # m3/s per L/h
RTOL = 1e-12


def local(case, cd, cf):
    """Jw and N at bulk concentrations cd, cf."""
    sp = dict(case["sp"], cD=cd, cF=cf)
    c = {"A": case["A"], "dP": 0.0, "species": [sp]}
    J = solve(c)
    N, _, _ = species_faces(J, sp["B"], cf, cd, sp["Rf"], sp["Rd"])
    return J, N


def rhs(case, sign):
    def f(x, y):
        qd, qf, nd, nf = y
        J, N = local(case, max(nd, 0.0) / qd, max(nf, 0.0) / qf)
        return [sign * J, -J, sign * N, -N]
    return f


def integrate(case, y0, sign):
    scale = np.array([case["Qd"], case["Qf"], case["ntot"], case["ntot"]])
    sol = solve_ivp(rhs(case, sign), (0.0, case["area"]), y0, method="DOP853", rtol=RTOL, atol=RTOL * scale)
    if not sol.success:
        raise RuntimeError(sol.message)
    return sol.y[:, -1]


def module(case):
    qd, qf, cd, cf = case["Qd"], case["Qf"], case["cD"], case["cF"]
    y_in = [qd, qf, cd * qd, cf * qf]
    if case["flow"] == "co":
        y = integrate(case, y_in, +1)
        return y[0], y[2], y[1], y[3]  # draw out, feed out
    # Counter-current: start from the co-current outlet, shoot on (P, nd0).
    yco = integrate(case, y_in, +1)
    ntot = case["ntot"]

    def resid(u):
        y = integrate(case, [qd * (1 + u[0]), qf, u[1] * ntot, cf * qf], -1)
        return [(y[0] - qd) / qd, (y[2] - cd * qd) / ntot]

    u0 = [(yco[0] - qd) / qd, yco[2] / ntot]
    r = root(resid, u0, method="hybr", options={"xtol": 1e-13})
    if not r.success or max(abs(v) for v in resid(r.x)) > 1e-11:
        raise RuntimeError(r.message)
    P, nd0 = r.x
    y = integrate(case, [qd * (1 + P), qf, nd0 * ntot, cf * qf], -1)
    return qd * (1 + P), nd0 * ntot, y[1], y[3]


def cases():
    A, B, S, D, k = 1.0 * LMH_PER_BAR, 0.3 * LMH, 500 * UM, 1.5e-9, 5e-5
    for flow, ori, model, area in itertools.product(["co", "counter"], ["AL-FS", "AL-DS"], ["linear", "nonlinear"], [2.0, 6.0]):
        Rf, Rd = (1 / k, S / D + 1 / k) if ori == "AL-FS" else (S / D + 1 / k, 1 / k)
        qd, qf, cd, cf = 40 * PER_LH, 40 * PER_LH, 1000.0, 100.0
        yield {"flow": flow, "ori": ori, "model": model, "area": area, "A": A, "S": S, "k": k,
               "Qd": qd, "Qf": qf, "cD": cd, "cF": cf, "ntot": cd * qd + cf * qf,
               "sp": {"model": model, "nu": 2, "B": B, "D": D, "Rf": Rf, "Rd": Rd}}


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    path = os.path.join(here, "module_scipy.csv")
    rows = []
    for c in cases():
        qdo, ndo, qfo, nfo = module(c)
        rows.append([c["flow"], c["ori"], c["model"], repr(c["area"]), repr(c["A"]), repr(c["sp"]["B"]), repr(c["S"]),
                     repr(c["sp"]["D"]), repr(c["k"]), repr(c["Qd"]), repr(c["Qf"]), repr(c["cD"]), repr(c["cF"]),
                     repr(float(qdo)), repr(float(ndo)), repr(float(qfo)), repr(float(nfo))])
    with open(path, "w", newline="") as fh:
        fh.write(f"# Produced by testdata/module_scipy.py with Python {platform.python_version()}, SciPy {scipy.__version__} "
                 f"(solve_ivp DOP853 rtol {RTOL}, optimize.root hybr, brentq fluxes).\n")
        fh.write(f"# One neutral solute (nu = 2) in both streams; osmotic test laws of flux_scipy.py (a = {NL_A}, b = {NL_B}); "
                 f"R = {R_GAS}, T = {T_K} K. SI units.\n")
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["flow", "orientation", "model", "area_m2", "a_m_per_s_pa", "b_m_per_s", "s_m", "d_m2_per_s", "k_m_per_s",
                    "draw_in_m3_per_s", "feed_in_m3_per_s", "draw_c_mol_m3", "feed_c_mol_m3",
                    "draw_out_m3_per_s", "draw_out_mol_per_s", "feed_out_m3_per_s", "feed_out_mol_per_s"])
        w.writerows(rows)
    print(f"wrote {len(rows)} rows to testdata/module_scipy.csv")


if __name__ == "__main__":
    main()
