package thermo

import (
	"fmt"
	"math"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/water"
)

// Nu returns the van 't Hoff factor ν (ions per formula unit).
func (x *Solution) Nu() float64 { return x.nu }

// MolarMassKgPerMol is the solute's molar mass (for seawater the mean
// sea-salt molar mass).
func (x *Solution) MolarMassKgPerMol() float64 { return x.mKg }

// SolubilityMolPerKg is the saturation molality at the Solution's
// temperature (+Inf for a miscible solute).
func (x *Solution) SolubilityMolPerKg() float64 { return x.solMolal }

// ValidMolPerKg is the upper molality of the osmotic model's data.
func (x *Solution) ValidMolPerKg() float64 { return x.validMolal }

// CapMolPerKg is the top of the working range: max(solubility, validity).
func (x *Solution) CapMolPerKg() float64 { return x.capMolal }

// Kind returns the osmotic model kind of the solute.
func (x *Solution) Kind() string { return x.kind }

// mPhi returns g = m·φ(m) and dg/dm for the solute's model (ν·g is the
// total osmolality in osmol/kg). It is the kernel of every osmotic
// quantity; callers keep m within [0, capMolal]. Between the model's data
// limit and the solubility it is the bridge to the measured saturated
// solution where there is one (bridge.go).
func (x *Solution) mPhi(m float64) (g, dg float64) {
	if m <= 0 {
		return 0, 1
	}
	if x.br != nil && m > x.br.m0 {
		return x.br.eval(m)
	}
	switch x.kind {
	case library.ModelPitzer:
		return x.pz.mPhi(m)
	case library.ModelPhiPolynomial:
		// φ = 1 + Σ a_i m^i  ⇒  g = m + Σ a_i m^{i+1}.
		g, dg = m, 1
		mp := m // m^i
		for i, a := range x.Solute.Osmotic.PhiCoefficients {
			g += a * mp * m
			dg += float64(i+2) * a * mp
			mp *= m
		}
		return g, dg
	case library.ModelNorrish:
		// Norrish (1966): a_w = x_w exp(−K x_s²), so
		// g = −ln a_w / M_w = −[ln(1 − x_s) − K x_s²]/M_w.
		const mw = water.MolarMassKgPerMol
		k := x.Solute.Osmotic.NorrishK
		n := m + 1/mw
		xs := m / n
		dxs := (1 / mw) / (n * n)
		g = (-math.Log1p(-xs) + k*xs*xs) / mw
		dg = (1/(1-xs) + 2*k*xs) * dxs / mw
		return g, dg
	case library.ModelSeawater:
		w := m * x.mKg / (1 + m*x.mKg)
		s := 1000 * w
		phi := seawaterPhi(s, x.tC)
		t := x.tC
		dphids := -1.1445456438e-4 - 1.4783462366e-6*t - 1.3526263499e-11*t*t*t +
			2*s*(7.0132355546e-6+5.6960486681e-8*t-2.8624032584e-10*t*t)
		dsdm := 1000 * x.mKg / ((1 + m*x.mKg) * (1 + m*x.mKg))
		return m * phi, phi + m*dphids*dsdm
	case library.ModelMixture:
		return x.mixPhi(m)
	case library.ModelTable:
		// g such that π = piPerG·ν·g reproduces the table.
		mm := math.Min(m, x.tabMax)
		pi := x.table.Predict(mm) * x.tabScale
		dpi := x.table.PredictDerivative(mm) * x.tabScale
		if m > x.tabMax {
			pi += dpi * (m - x.tabMax)
		}
		k := 1 / (x.piPerG * x.nu)
		return pi * k, dpi * k
	default: // ModelNone: van 't Hoff in molarity, π = ν c R T.
		c := x.molarityFromMolality(m)
		k := x.rt / x.piPerG
		return c * k, x.dcdm(m) * k
	}
}

// piM returns π (Pa) and dπ/dm at molality m within the working range.
func (x *Solution) piM(m float64) (pi, dpdm float64) {
	g, dg := x.mPhi(m)
	return x.piPerG * x.nu * g, x.piPerG * x.nu * dg
}

// piMono returns π (Pa) and dπ/dm at any molality m ≥ 0: the model inside
// the working range and, beyond it, the linear-in-concentration extension
// of OsmoticFunc, so that π(m) is increasing everywhere.
func (x *Solution) piMono(m float64) (pi, dpdm float64) {
	if m <= x.capMolal {
		return x.piM(m)
	}
	c := x.molarityFromMolality(m)
	return x.capPi + x.capSlope*(c-x.capC), x.capSlope * x.dcdm(m)
}

// OsmoticCoefficient returns the molal osmotic coefficient φ at m mol/kg
// (φ = 1 at m = 0).
func (x *Solution) OsmoticCoefficient(m float64) float64 {
	if m <= 0 {
		return 1
	}
	if x.kind == library.ModelPitzer && !x.bridged(m) {
		return x.pz.phi(m)
	}
	g, _ := x.mPhi(m)
	return g / m
}

// bridged reports whether m lies on the bridge to the measured saturated
// solution.
func (x *Solution) bridged(m float64) bool { return x.br != nil && m > x.br.m0 }

// LnActivityCoefficient returns ln γ±, the mean molal activity
// coefficient's logarithm, where the model defines it (Pitzer salts, within
// the model's range: the bridge gives the water activity only).
func (x *Solution) LnActivityCoefficient(m float64) (float64, bool) {
	if x.kind != library.ModelPitzer || x.bridged(m) {
		return 0, false
	}
	return x.pz.lnGamma(m), true
}

// WaterActivity returns a_w = exp(−ν m M_w φ).
func (x *Solution) WaterActivity(m float64) float64 {
	g, _ := x.mPhi(m)
	return math.Exp(-x.nu * g * water.MolarMassKgPerMol)
}

// OsmoticPressurePa returns the osmotic pressure at m mol/kg:
//
//	π = −(R T / V̄_w) ln a_w = (R T M_w / V̄_w) · ν m φ
//
// with V̄_w the molar volume of pure water at T (the usual approximation of
// water's partial molar volume). Standard thermodynamics (e.g. Robinson &
// Stokes, Electrolyte Solutions, 1959, ch. 2). Above the working range
// it continues linearly in concentration (see OsmoticFunc).
func (x *Solution) OsmoticPressurePa(m float64) float64 {
	pi, _ := x.piMono(m)
	return pi
}

// VantHoffPa returns the ideal dilute value π = ν c R T with c the molar
// concentration (mol/m³).
func (x *Solution) VantHoffPa(cMolPerM3 float64) float64 { return x.nu * cMolPerM3 * x.rt }

// massFractionFromMolality: w = mM/(1 + mM).
func (x *Solution) massFractionFromMolality(m float64) float64 {
	return m * x.mKg / (1 + m*x.mKg)
}

// molalityFromMassFraction: m = w/((1 − w) M).
func (x *Solution) molalityFromMassFraction(w float64) float64 {
	return w / ((1 - w) * x.mKg)
}

// molarityFromMolality returns c (mol/m³) at m (mol/kg).
func (x *Solution) molarityFromMolality(m float64) float64 {
	w := x.massFractionFromMolality(m)
	k, _ := x.dens.massConc(w)
	return k / x.mKg
}

// dcdm returns dc/dm (kg/m³) at m.
func (x *Solution) dcdm(m float64) float64 {
	w := x.massFractionFromMolality(m)
	_, dk := x.dens.massConc(w)
	dwdm := x.mKg / ((1 + m*x.mKg) * (1 + m*x.mKg))
	return dk * dwdm / x.mKg
}

// DensityKgPerM3 returns the solution density at m mol/kg.
func (x *Solution) DensityKgPerM3(m float64) float64 {
	v, _ := x.dens.specVol(x.massFractionFromMolality(m))
	return 1 / v
}

// MolalityFromMolarity converts c (mol/m³) to molality; ok is false if c
// lies above the working range (beyond solubility and the model's data),
// and also, with m = 0, if the density inversion fails (see ToMolality,
// which returns that error).
func (x *Solution) MolalityFromMolarity(c float64) (m float64, ok bool) {
	w, err := x.dens.massFraction(c*x.mKg, x.wCap)
	if err != nil && err != errAboveRange {
		return 0, false
	}
	return x.molalityFromMassFraction(w), err == nil
}

// PiOfMolarity returns π (Pa) at molar concentration c (mol/m³). It is
// finite, non-negative and non-decreasing for every c ≥ 0: above the
// working range (max of solubility and the model's data limit) it
// continues linearly with the slope at the top of the range, so solvers
// that probe far outside stay well behaved. Callers flag results there.
func (x *Solution) PiOfMolarity(c float64) float64 {
	pi, _ := x.OsmoticFunc(c)
	return pi
}

// OsmoticFunc returns π (Pa) and dπ/dc (Pa·m³/mol) at molar concentration
// c (mol/m³); see PiOfMolarity. It has the signature of
// transport.OsmoticFunc.
//
// Special case: if the inversion of the density model fails (possible only
// for a model that returns a non-finite density, which library validation
// rules out) it returns NaN, which transport.Solve reports as an
// *errs.InputError naming the species, rather than a π at an unconverged
// concentration.
func (x *Solution) OsmoticFunc(c float64) (pi, dpdc float64) {
	if c <= 0 {
		_, dg := x.mPhi(0)
		return 0, x.piPerG * x.nu * dg / x.dcdm(0)
	}
	if c >= x.capC {
		return x.capPi + x.capSlope*(c-x.capC), x.capSlope
	}
	if x.kind == library.ModelNone {
		return x.nu * c * x.rt, x.nu * x.rt
	}
	w, err := x.dens.massFraction(c*x.mKg, x.wCap)
	if err != nil && err != errAboveRange { // c < capC: never above the range
		return math.NaN(), math.NaN()
	}
	m := x.molalityFromMassFraction(w)
	pi, dpdm := x.piM(m)
	_, dk := x.dens.massConc(w)
	// dm/dc = (dm/dw)(dw/dK)(dK/dc) = [1/(M(1−w)²)]·(1/K′)·M.
	dmdc := 1 / ((1 - w) * (1 - w) * dk)
	return pi, dpdm * dmdc
}

// ToMolality converts a concentration in unit u to molality (mol/kg). It
// fails with an *errs.InputError for negative or non-finite values, for
// concentrations beyond the working range and for mass fractions ≥ 1, and
// with an *errs.ConvergenceError if the inversion of π (osmol/kg) or of
// the density model (mol/L, g/L) does not converge.
func (x *Solution) ToMolality(v float64, u Unit) (float64, error) {
	if !(v >= 0) || math.IsInf(v, 0) {
		return 0, &errs.InputError{Field: "concentration", Value: v, Limit: "≥ 0 and finite", Msg: "concentration must be a finite, non-negative number"}
	}
	var w float64
	switch u {
	case MolPerKg:
		return v, nil
	case WtPercent:
		w = v / 100
	case GPerKg:
		w = v / 1000
	case OsmolPerKg:
		// ν·m·φ = v ⇔ π = (R T M_w/V̄_w)·v: invert π(m).
		m, err := x.MolalityForPi(v * x.piPerG)
		if _, ok := err.(*errs.ConvergenceError); ok {
			return 0, err
		}
		if err != nil {
			lim := x.FromMolality(x.solMolal, u)
			return 0, &errs.InputError{Field: "concentration", Value: v, Limit: trimFloat(lim) + " " + u.String(),
				Msg: fmt.Sprintf("%s cannot reach this osmolality below its solubility at %s °C", x.Solute.ID, trimFloat(x.tC))}
		}
		return m, nil
	case MolPerL, GPerL:
		k := v * x.mKg * 1000 // kg/m³
		if u == GPerL {
			k = v
		}
		ww, err := x.dens.massFraction(k, x.wCap)
		if err != nil && err != errAboveRange {
			return 0, err
		}
		if err == errAboveRange {
			lim := math.Min(x.solMolal, x.capMolal)
			return 0, &errs.InputError{Field: "concentration", Value: v, Limit: trimFloat(x.FromMolality(lim, u)) + " " + u.String(),
				Msg: fmt.Sprintf("%s is beyond its solubility at %s °C", x.Solute.ID, trimFloat(x.tC))}
		}
		w = ww
	default:
		return 0, &errs.InputError{Field: "unit", Msg: "unknown unit"}
	}
	if w >= 1 {
		return 0, &errs.InputError{Field: "concentration", Value: v, Limit: "mass fraction < 1", Msg: "concentration implies no water"}
	}
	return x.molalityFromMassFraction(w), nil
}

// FromMolality converts molality m to unit u.
func (x *Solution) FromMolality(m float64, u Unit) float64 {
	switch u {
	case MolPerL:
		return x.molarityFromMolality(m) / 1000
	case GPerL:
		return x.molarityFromMolality(m) * x.mKg
	case GPerKg:
		return 1000 * x.massFractionFromMolality(m)
	case WtPercent:
		return 100 * x.massFractionFromMolality(m)
	case OsmolPerKg:
		pi, _ := x.piMono(m)
		return pi / x.piPerG
	}
	return m
}

// MassFraction returns the solute mass fraction at m.
func (x *Solution) MassFraction(m float64) float64 { return x.massFractionFromMolality(m) }

// MolarityMolPerM3 returns the molar concentration at m.
func (x *Solution) MolarityMolPerM3(m float64) float64 { return x.molarityFromMolality(m) }
