#!/usr/bin/python3
"""Independent SciPy solution of Drawsift's coupled multi-ion FO flux model.

Run with Debian's interpreter (python3-scipy):  /usr/bin/python3 testdata/ions_scipy.py
Writes testdata/ions_scipy.csv (versions of Python and SciPy in its header).

Model (engine/transport/ions.go and mixrule.go, written here again in the
plain, unscaled form). Four ions, Na+ (z=1), Mg2+ (2), Cl- (-1), SO4 2- (-2);
x runs from feed bulk to draw bulk, Jw > 0 feed -> draw, N_i > 0 feed -> draw.
Unstirred layers per ion, of resistances R_f, R_d (AL-FS: R_f = 1/k,
R_d = S/D_i + 1/k; AL-DS: R_f = S/D_i + 1/k, R_d = 1/k):

  c_f = cF e^{J R_f} - N (e^{J R_f} - 1)/J
  c_d = cD e^{-J R_d} + N (1 - e^{-J R_d})/J

Active layer: the Goldman constant-field flux with u = F(psi_f - psi_d)/RT,

  N = B [g(z u) c_f - g(-z u) c_d],   g(w) = w/(1 - e^{-w})

(Goldman 1943; Hodgkin & Katz 1949), so with the layers
  N = B (G+ cF E - G- cD e) / (1 + B (G+ (E-1)/J + G- (1-e)/J)),  E = e^{J R_f}, e = e^{-J R_d}.
Zero current: sum z_i N_i = 0 fixes u (brentq). Water:
  Jw = A (pi(c_d) - pi(c_f) - dP)
with pi by Young's rule over the draw's and the feed's solutions:
  pi = sum_g Q_g Pi_g(C/nu_g)/C,  C = sum_i c_i,  Q_g = sum_i s_gi c_i,
  Pi_g(c) = nu_g R T c (1 + a c + b c^2)   (a test law of our own, not data),
and s_gi the share of ion i in solution g (1 for an ion of one side only;
for an ion of both sides, the draw's share cD/(cD + cF)).
Draw: NaCl + y MgCl2 per formula unit (nu_D = 2 + 3y); feed: MgSO4 + x NaCl
(nu_F = 2 + 2x). Units: SI (c in mol/m3, pi in Pa, A in m/(s Pa), B, k in m/s).
"""

import csv
import itertools
import math
import os
import platform

import scipy
from scipy.optimize import brentq

R_GAS = 8.314462618
T_K = 298.15
RT = R_GAS * T_K
LMH = 1.0 / 3.6e6
LMH_PER_BAR = 1.0 / (3.6e6 * 1e5)
BAR = 1e5
NL_A, NL_B = 2e-5, 1e-8
Z = [1, 2, -1, -2]  # Na+, Mg2+, Cl-, SO4 2-


def law(nu, c):
    return nu * RT * c * (1.0 + NL_A * c + NL_B * c * c)


def g(w):
    if w == 0.0:
        return 1.0
    return w / (-math.expm1(-w))


def young(c, shares, nus):
    total = sum(c)
    if total <= 0:
        return 0.0
    pi = 0.0
    for s, nu in zip(shares, nus):
        q = sum(si * ci for si, ci in zip(s, c))
        pi += q * law(nu, total / nu) / total
    return pi


def species_at(j, u, sp):
    """N, c_f, c_d of one ion at water flux j and potential u."""
    b, z, cF, cD, rf, rd = sp
    gp, gm = b * g(z * u), b * g(-z * u)
    if j == 0.0:
        gf, hd = rf, rd
    else:
        gf = math.expm1(j * rf) / j
        hd = -math.expm1(-j * rd) / j
    E, e = math.exp(j * rf), math.exp(-j * rd)
    n = (gp * cF * E - gm * cD * e) / (1.0 + gp * gf + gm * hd)
    return n, cF * E - n * gf, cD * e + n * hd


def potential(j, sps):
    cur = lambda u: sum(z * species_at(j, u, sp)[0] for z, sp in zip(Z, sps))
    lo, hi = -60.0, 60.0
    if cur(lo) > 0 or cur(hi) < 0:
        raise RuntimeError("no potential")
    return brentq(cur, lo, hi, xtol=1e-15, rtol=1e-15, maxiter=500)


def solve(a, dp, sps, shares, nus):
    def state(j):
        u = potential(j, sps)
        out = [species_at(j, u, sp) for sp in sps]
        cf = [o[1] for o in out]
        cd = [o[2] for o in out]
        return u, out, a * (young(cd, shares, nus) - young(cf, shares, nus) - dp) - j

    f0 = state(0.0)[2]
    step = abs(f0) if f0 != 0 else 1e-6
    lo, hi = (0.0, step) if f0 > 0 else (-step, 0.0)
    while state(hi)[2] > 0:
        lo, hi = hi, hi * 2
    while state(lo)[2] < 0:
        lo, hi = lo * 2, lo
    j = brentq(lambda x: state(x)[2], lo, hi, xtol=1e-22, rtol=1e-15, maxiter=500)
    u, out, _ = state(j)
    return j, u, [o[0] for o in out]


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    rows = []
    # Ion B (LMH): Na+, Mg2+, Cl-, SO4 2-; D (m2/s) per ion.
    b_sets = [(0.3, 0.3, 0.3, 0.3), (0.3, 0.005, 0.3, 0.05), (1.0, 0.02, 0.4, 0.01)]
    d_sets = [(1.5e-9, 1.5e-9, 1.5e-9, 1.5e-9), (1.33e-9, 0.71e-9, 2.03e-9, 1.07e-9)]
    for ori, ext, (bi, bs), (di, ds), cd, y, cf, x, dpbar, a_lmhb, s_um in itertools.product(
            ["AL-FS", "AL-DS"], [False, True], enumerate(b_sets), enumerate(d_sets),
            [500.0, 2000.0], [0.0, 0.3], [0.0, 300.0], [0.0, 0.5], [0.0, 8.0], [1.0], [500.0]):
        if cf == 0.0 and x > 0:
            continue
        k = 2e-5 if ext else math.inf
        a = a_lmhb * LMH_PER_BAR
        s = s_um * 1e-6
        cD = [cd, y * cd, cd * (1 + 2 * y), 0.0]
        cF = [x * cf, cf, x * cf, cf]
        nus = [2 + 3 * y, 2 + 2 * x]
        shares_d, shares_f = [], []
        for i in range(4):
            if cD[i] > 0 and cF[i] > 0:
                sd = cD[i] / (cD[i] + cF[i])
            else:
                sd = 1.0 if cD[i] > 0 else 0.0
            shares_d.append(sd)
            shares_f.append(1.0 - sd if (cD[i] > 0 or cF[i] > 0) else 0.0)
        if cf == 0.0:
            shares, nus_used = [shares_d], nus[:1]
        else:
            shares, nus_used = [shares_d, shares_f], nus
        sps = []
        for i in range(4):
            r_s = s / ds[i]
            inv = 0.0 if math.isinf(k) else 1.0 / k
            rf, rd = (inv, r_s + inv) if ori == "AL-FS" else (r_s + inv, inv)
            sps.append((bs[i] * LMH, Z[i], cF[i], cD[i], rf, rd))
        j, u, n = solve(a, dpbar * BAR, sps, shares, nus_used)
        rows.append([ori, int(ext), bi, di, repr(cd), repr(y), repr(cf), repr(x), repr(dpbar), repr(a_lmhb), repr(s_um),
                     repr(j), repr(u)] + [repr(v) for v in n])
    path = os.path.join(here, "ions_scipy.csv")
    with open(path, "w", newline="") as fh:
        fh.write("# made by testdata/ions_scipy.py with Python %s, SciPy %s\n" % (platform.python_version(), scipy.__version__))
        fh.write("# b sets (LMH, Na Mg Cl SO4): %s\n" % repr(b_sets))
        fh.write("# d sets (m2/s): %s\n" % repr(d_sets))
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["orientation", "external_cp", "b_set", "d_set", "draw_c_mol_m3", "draw_mgcl2_per_unit", "feed_c_mol_m3",
                    "feed_nacl_per_unit", "delta_p_bar", "a_lmh_per_bar", "s_um", "jw_m_per_s", "potential",
                    "n_na", "n_mg", "n_cl", "n_so4"])
        w.writerows(rows)


if __name__ == "__main__":
    main()
