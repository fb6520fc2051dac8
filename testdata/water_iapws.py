"""Reference table of pure-water properties at 0.101325 MPa, 0-100 degC.

Run with Debian's interpreter (a pyenv python3 cannot import Debian's packages):

    /usr/bin/python3 testdata/water_iapws.py

Tool: python3-iapws (Debian package 1.5.3-1; the module reports
iapws.__version__ = 1.5.2), which implements
  - IAPWS-95 (Wagner & Pruss 2002, J. Phys. Chem. Ref. Data 31:387) for density,
  - the IAPWS 2008 viscosity formulation (Huber et al. 2009,
    J. Phys. Chem. Ref. Data 38:101), including its critical enhancement,
  - the IAPWS 1997 release on the static dielectric constant
    (Fernandez et al. 1997, J. Phys. Chem. Ref. Data 26:1125).
Other packages: none (standard library only).

Writes testdata/water_iapws95.csv next to this script.

At 0.101325 MPa water boils at about 99.97 degC, so IAPWS95(T, P) returns the
vapour at 100 degC. For that row (and any other where the library reports a
non-liquid state) the liquid-branch density at exactly 0.101325 MPa is found
by a secant iteration on IAPWS95(T=..., rho=...).P, started from the
saturated-liquid density; this is the slightly superheated (metastable)
liquid, which IAPWS-95 covers.
"""

import os
import subprocess
import sys

import iapws
from iapws import IAPWS95
from iapws._iapws import _Viscosity

P_MPA = 0.101325
# Molar mass used by IAPWS-95 (Wagner & Pruss 2002), kg/mol.
MOLAR_MASS_KG_PER_MOL = 0.018015268


def debian_version():
    """Version of the installed Debian package python3-iapws."""
    try:
        out = subprocess.run(
            ["dpkg-query", "-W", "-f=${Version}", "python3-iapws"],
            capture_output=True, text=True, check=True)
        return out.stdout.strip() or "unknown"
    except (OSError, subprocess.CalledProcessError):
        return "unknown"


def liquid_state(tk):
    """IAPWS95 liquid state at tk and P_MPA."""
    w = IAPWS95(T=tk, P=P_MPA)
    if w.phase == "Liquid" and w.rho > 900:
        return w
    # Metastable liquid: secant on pressure along the isotherm.
    sat = IAPWS95(T=tk, x=0)
    r0, r1 = sat.rho, sat.rho + 0.01
    p0 = IAPWS95(T=tk, rho=r0).P - P_MPA
    p1 = IAPWS95(T=tk, rho=r1).P - P_MPA
    for _ in range(50):
        r2 = r1 - p1 * (r1 - r0) / (p1 - p0)
        r0, p0 = r1, p1
        r1 = r2
        p1 = IAPWS95(T=tk, rho=r1).P - P_MPA
        if abs(p1) < 1e-12:
            break
    w = IAPWS95(T=tk, rho=r1)
    if abs(w.P - P_MPA) > 1e-9 or w.rho < 900:
        sys.exit("no liquid state at T = %g K" % tk)
    return w


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = os.path.join(here, "water_iapws95.csv")
    rows = []
    max_mu2 = 0.0
    for i in range(21):
        tc = 5.0 * i
        tk = 273.15 + tc
        w = liquid_state(tk)
        # Size of the IAPWS 2008 critical enhancement mu2 here: ratio of the
        # full viscosity to mu0*mu1 at the same state.
        max_mu2 = max(max_mu2, abs(w.mu / _Viscosity(w.rho, tk) - 1))
        rows.append((tc, w.rho, MOLAR_MASS_KG_PER_MOL / w.rho, w.mu, w.epsilon))
    with open(out, "w", encoding="utf-8", newline="\n") as f:
        f.write("# Pure water at 0.101325 MPa, computed with python3-iapws %s "
                "(Debian package; iapws.__version__ %s) by testdata/water_iapws.py\n"
                % (debian_version(), iapws.__version__))
        f.write("# density: IAPWS-95; viscosity: IAPWS 2008 (incl. critical "
                "enhancement, max |mu2-1| here = %.1e); dielectric: IAPWS 1997 "
                "static dielectric constant release\n" % max_mu2)
        f.write("# molar volume = 0.018015268 kg/mol (IAPWS-95 molar mass) / density; "
                "100 degC row is the metastable liquid at 0.101325 MPa\n")
        f.write("t_c,density_kg_per_m3,molar_volume_m3_per_mol,viscosity_pa_s,dielectric\n")
        for r in rows:
            f.write("%.2f,%.6f,%.9e,%.9e,%.6f\n" % r)
    print("wrote %s (%d rows); max |mu2-1| = %.1e" % (out, len(rows), max_mu2))


if __name__ == "__main__":
    main()
