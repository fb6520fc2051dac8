#!/usr/bin/python3
"""Independent SciPy solution of the Drawsift FO flux model, for the Go tests.

Run with Debian's interpreter (python3-scipy):  /usr/bin/python3 testdata/flux_scipy.py
Writes testdata/flux_scipy.csv and prints how many brentq solves per second
this implementation manages (for the README's speed comparison).

Tools: Python 3 + SciPy (scipy.optimize.brentq); versions are written into
the CSV header when the script runs (this table was made with the versions
named there).

Model (same equations as engine/transport, written here independently in
their plain, unscaled form; sources: Tiraferri et al. 2011 J. Membr. Sci.
367:340 and 2013 J. Membr. Sci. 444:523; McCutcheon & Elimelech 2006
J. Membr. Sci. 284:237; Yip et al. 2011 Environ. Sci. Technol. 45:4360 for
the hydraulic pressure term). x runs from feed bulk to draw bulk, Jw > 0
feed -> draw. Per species, with layer resistances R_f (feed side of the
active layer) and R_d (draw side):

  AL-FS: R_f = 1/k_F,        R_d = S/D + 1/k_D
  AL-DS: R_f = S/D + 1/k_F,  R_d = 1/k_D
  N   = B (cF e^{J R_f} - cD e^{-J R_d}) / (1 + B [(e^{J R_f}-1)/J + (1-e^{-J R_d})/J])
  c_f = cF e^{J R_f} - N (e^{J R_f}-1)/J
  c_d = cD e^{-J R_d} + N (1-e^{-J R_d})/J
  (evaluated with N substituted, as sums of non-negative terms)
  Jw  = A (sum_j Pi_j(c_d) - sum_j Pi_j(c_f) - dP)

Osmotic models (test functions of our own, not data for any real solute):
  linear:     Pi(c) = nu R T c                       (van 't Hoff)
  nonlinear:  Pi(c) = nu R T c (1 + a c + b c^2),    a = 2e-5 m3/mol, b = 1e-8 m6/mol2
Units: SI throughout (c in mol/m3, Pi in Pa, A in m/(s Pa), B and k in m/s).
"""

import csv
import itertools
import math
import os
import platform
import sys
import time

import scipy
from scipy.optimize import brentq

R_GAS = 8.314462618  # J/(mol K): the exact 2019 SI value 8.31446261815324 rounded to 10 figures; the table is made with it
T_K = 298.15
RT = R_GAS * T_K
LMH = 1.0 / 3.6e6  # m/s
LMH_PER_BAR = 1.0 / (3.6e6 * 1e5)  # m/(s Pa)
BAR = 1e5

NL_A, NL_B = 2e-5, 1e-8


def osmotic(model, nu, c):
    if model == "linear":
        return nu * RT * c
    return nu * RT * c * (1.0 + NL_A * c + NL_B * c * c)


def rel_expm1(x, r):
    """(e^{x} - 1)/J with x = J r, i.e. r * expm1(x)/x, -> r as x -> 0."""
    if x == 0.0:
        return r
    return r * math.expm1(x) / x


def species_faces(J, B, cF, cD, Rf, Rd):
    ef = math.exp(J * Rf)
    ed = math.exp(-J * Rd)
    g = rel_expm1(J * Rf, Rf)  # (e^{J Rf} - 1)/J
    h = rel_expm1(-J * Rd, Rd)  # (1 - e^{-J Rd})/J
    V = 1.0 + B * (g + h)
    N = B * (cF * ef - cD * ed) / V
    # c_f = cF e^{J Rf} - N g and c_d = cD e^{-J Rd} + N h, with N substituted
    # so that each is a sum of non-negative terms (the subtracted forms cancel
    # catastrophically when |J R| is large).
    cf = (cF * ef * (1.0 + B * h) + B * g * cD * ed) / V
    cd = (cD * ed * (1.0 + B * g) + B * h * cF * ef) / V
    return N, cf, cd


def make_residual(case):
    A, dP = case["A"], case["dP"]
    sps = case["species"]

    def f(J):
        pid = pif = 0.0
        for sp in sps:
            _, cf, cd = species_faces(J, sp["B"], sp["cF"], sp["cD"], sp["Rf"], sp["Rd"])
            pid += osmotic(sp["model"], sp["nu"], cd)
            pif += osmotic(sp["model"], sp["nu"], cf)
        return A * (pid - pif - dP) - J

    return f


def solve(case):
    f = make_residual(case)
    drive = sum(osmotic(sp["model"], sp["nu"], sp["cD"]) + osmotic(sp["model"], sp["nu"], sp["cF"])
                for sp in case["species"]) + abs(case["dP"])
    x = 1.1 * case["A"] * drive + 1e-15
    lo, hi = -x, x
    for _ in range(60):  # f is strictly decreasing: widen until it changes sign
        if f(lo) > 0 and f(hi) < 0:
            break
        lo, hi = 2 * lo, 2 * hi
    return brentq(f, lo, hi, xtol=1e-24, rtol=4 * sys.float_info.epsilon, maxiter=500)


def cases():
    out = []
    grid = itertools.product(
        ["AL-FS", "AL-DS"],
        [math.inf, 3e-5],  # k, both sides (inf = no external CP)
        [0.0, 0.3, 2.0],  # B of the draw solute, LMH
        [200e-6, 800e-6],  # S, m
        [0.0, 5.0, 40.0, -3.0],  # dP, bar (40 bar exceeds some osmotic differences: reverse flow)
        ["linear", "nonlinear"],
        ["none", "same", "other"],  # feed: pure water, draw solute, a second solute
        [500.0, 2000.0],  # draw, mol/m3
        [1.0, 3.0],  # A, LMH/bar
    )
    for ori, k, b_lmh, s_m, dp_bar, model, feed, c_draw, a_lmhbar in grid:
        D = 1.5e-9
        inv_k = 0.0 if math.isinf(k) else 1.0 / k
        def res(Dj):
            if ori == "AL-FS":
                return inv_k, s_m / Dj + inv_k
            return s_m / Dj + inv_k, inv_k
        rf, rd = res(D)
        draw = dict(model=model, nu=2.0, B=b_lmh * LMH, D=D, cD=c_draw,
                    cF=100.0 if feed == "same" else 0.0, Rf=rf, Rd=rd)
        sps = [draw]
        if feed == "other":
            D2 = 1.1e-9
            rf2, rd2 = res(D2)
            # a second solute, only in the feed: nu = 3, nonlinear, its own B
            sps.append(dict(model="nonlinear", nu=3.0, B=0.1 * LMH, D=D2, cD=0.0, cF=50.0,
                            Rf=rf2, Rd=rd2))
        out.append(dict(ori=ori, A=a_lmhbar * LMH_PER_BAR, S=s_m, k=k, dP=dp_bar * BAR,
                        feed=feed, species=sps))
    return out


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    all_cases = cases()
    t0 = time.perf_counter()
    roots = [solve(c) for c in all_cases]
    elapsed = time.perf_counter() - t0
    rate = len(all_cases) / elapsed
    print(f"scipy {scipy.__version__} brentq: {len(all_cases)} solves in {elapsed:.3f} s "
          f"= {rate:.0f} solves/s (python {platform.python_version()})")

    path = os.path.join(here, "flux_scipy.csv")
    with open(path, "w", newline="") as fh:
        fh.write(f"# Produced by testdata/flux_scipy.py with Python {platform.python_version()}, "
                 f"SciPy {scipy.__version__} (scipy.optimize.brentq, rtol=4*eps).\n")
        fh.write(f"# Model and osmotic test functions: see the script. R = {R_GAS} J/(mol K), T = {T_K} K; "
                 f"nonlinear a = {NL_A} m3/mol, b = {NL_B} m6/mol2. SI units.\n")
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["orientation", "a_m_per_s_pa", "s_m", "k_m_per_s", "delta_p_pa",
                    "draw_model", "draw_nu", "draw_b_m_per_s", "draw_d_m2_per_s", "draw_c_mol_m3",
                    "feed_kind", "feed_same_c_mol_m3",
                    "other_model", "other_nu", "other_b_m_per_s", "other_d_m2_per_s", "other_feed_c_mol_m3",
                    "jw_m_per_s", "js_mol_per_m2_s", "n_other_mol_per_m2_s"])
        for c, J in zip(all_cases, roots):
            d = c["species"][0]
            N0, _, _ = species_faces(J, d["B"], d["cF"], d["cD"], d["Rf"], d["Rd"])
            if c["feed"] == "other":
                o = c["species"][1]
                N1, _, _ = species_faces(J, o["B"], o["cF"], o["cD"], o["Rf"], o["Rd"])
                other = [o["model"], o["nu"], repr(o["B"]), repr(o["D"]), repr(o["cF"])]
            else:
                N1 = 0.0
                other = ["", 0, 0, 0, 0]
            w.writerow([c["ori"], repr(c["A"]), repr(c["S"]), repr(c["k"]), repr(c["dP"]),
                        d["model"], d["nu"], repr(d["B"]), repr(d["D"]), repr(d["cD"]),
                        c["feed"], repr(d["cF"])] + other + [repr(J), repr(-N0), repr(N1)])
    print(f"wrote {len(all_cases)} rows to testdata/flux_scipy.csv")


if __name__ == "__main__":
    main()
