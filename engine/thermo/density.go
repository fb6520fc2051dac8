package thermo

import (
	"errors"
	"math"

	"drawsift/engine/internal/roots"
	"drawsift/engine/library"
)

// Density-model kinds after preparation.
const (
	densWater = iota // no model: the solute takes the volume of an equal mass of water (flagged)
	densLaliberte
	densAMV
	densSeawater
	densMixture // the multicomponent rules (MixBlend)
)

// density is a solution-density model prepared at one temperature. It gives
// the specific volume V(w) (m³/kg of solution) as a function of the solute
// mass fraction w, and its derivative.
type density struct {
	kind int
	rhoW float64 // pure water, kg/m³
	tC   float64
	// Laliberté & Cooper: V = (1−w)/ρw + w(w+a)/((c0 w + c1)E)
	c0, c1, a, e float64
	// apparent molar volume: V_φ = v0 + v1 m, m³/mol and m³ kg/mol²
	v0, v1 float64
	mKg    float64 // solute molar mass, kg/mol
	blend  *MixBlend
}

func newDensity(s *library.Solute, rhoW, tC float64) density {
	d := density{kind: densWater, rhoW: rhoW, tC: tC, mKg: s.MolarMassKgPerMol()}
	if s.Osmotic.Kind == library.ModelSeawater {
		d.kind = densSeawater
		return d
	}
	m := s.Density
	if m == nil {
		return d
	}
	switch m.Kind {
	case library.DensityLaliberteCooper:
		d.kind = densLaliberte
		d.c0, d.c1 = m.C0, m.C1
		d.a = m.C2 + m.C3*tC
		d.e = math.Exp(1e-6 * (tC + m.C4) * (tC + m.C4))
	case library.DensityApparentMolarVolume:
		d.kind = densAMV
		d.v0, d.v1 = m.V0CM3PerMol*1e-6, m.V1*1e-6
	}
	return d
}

// specVol returns the solution's specific volume V (m³/kg) at solute mass
// fraction w and dV/dw.
func (d *density) specVol(w float64) (v, dv float64) {
	switch d.kind {
	case densLaliberte:
		// Laliberté & Cooper (2004) J. Chem. Eng. Data 49:1141, eqs. 12–14:
		// 1/ρ = w_w/ρ_w + w/ρ_app, ρ_app = (c0 w + c1) E / (w + c2 + c3 t).
		den := (d.c0*w + d.c1) * d.e
		v = (1-w)/d.rhoW + w*(w+d.a)/den
		dv = -1/d.rhoW + ((2*w+d.a)*(d.c0*w+d.c1)-d.c0*w*(w+d.a))/(den*(d.c0*w+d.c1))
	case densAMV:
		// V per kg of water = 1/ρw + m V_φ(m); mass per kg of water = 1 + mM.
		m := w / ((1 - w) * d.mKg)
		vol := 1/d.rhoW + m*(d.v0+d.v1*m)
		mass := 1 + m*d.mKg
		v = vol / mass
		dvdm := ((d.v0+2*d.v1*m)*mass - vol*d.mKg) / (mass * mass)
		dv = dvdm / (d.mKg * (1 - w) * (1 - w))
	case densSeawater:
		rho, drho := seawaterDensity(w, d.tC)
		v = 1 / rho
		dv = -drho / (rho * rho)
	case densMixture:
		rho, drho := d.blend.DensityKgPerM3(w)
		v = 1 / rho
		dv = -drho / (rho * rho)
	default:
		v = 1 / d.rhoW
	}
	return v, dv
}

// molarMassConc returns the solute's mass concentration K = ρ·w (kg/m³)
// at mass fraction w, and dK/dw.
func (d *density) massConc(w float64) (k, dk float64) {
	v, dv := d.specVol(w)
	return w / v, (v - w*dv) / (v * v)
}

// errAboveRange is massFraction's report that k exceeds ρ·w at wMax.
var errAboveRange = errors.New("mass concentration above the working range")

// massFraction inverts massConc: the mass fraction w at which ρ·w = k
// (kg/m³), searched in [0, wMax]. It returns errAboveRange (and wMax) if k
// exceeds ρ·w at wMax, and an *errs.ConvergenceError if the search fails
// (only possible for a density model that returns a non-finite value).
// For the Laliberté model the inversion is a quadratic in w, solved in
// closed form; other models use a safeguarded Newton iteration
// (roots.Newton: K(w) increases with w).
func (d *density) massFraction(k, wMax float64) (w float64, err error) {
	if k <= 0 {
		return 0, nil
	}
	if d.kind == densWater {
		w = k / d.rhoW
		if w > wMax {
			return w, errAboveRange
		}
		return w, nil
	}
	if d.kind == densLaliberte {
		// k[(1−w)(c0w+c1)E + ρw w(w+a)] = w(c0w+c1)E ρw, collected as
		// qa w² + qb w + qc = 0; the root that tends to k/ρw as k → 0.
		e, r := d.e, d.rhoW
		qa := -k*e*d.c0 + k*r - d.c0*e*r
		qb := k*e*d.c0 - k*e*d.c1 + k*r*d.a - d.c1*e*r
		qc := k * e * d.c1
		disc := qb*qb - 4*qa*qc
		if disc >= 0 && qb < 0 {
			w = 2 * qc / (-qb + math.Sqrt(disc))
			if w >= 0 && w <= wMax {
				return w, nil
			}
		}
	}
	kMax, _ := d.massConc(wMax)
	if k > kMax {
		return wMax, errAboveRange
	}
	f := func(w float64) (float64, float64) {
		kw, dk := d.massConc(w)
		return kw - k, dk
	}
	// K(0) = 0.
	br := roots.Bracket{Lo: 0, Hi: wMax, FLo: -k, FHi: kMax - k}
	r, err := roots.Newton(f, br, math.Min(k/d.rhoW, wMax), &roots.Settings{
		Solver: "density inverse", FAbsTol: 1e-13 * k, Scale: k})
	if err != nil {
		return 0, err
	}
	return r.X, nil
}
