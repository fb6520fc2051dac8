package thermo

import (
	"fmt"
	"math"

	"drawsift/engine/errs"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// bridge carries the osmotic model from the top of its data to the
// measured water activity of the saturated solution, for a solute whose
// solubility lies above its model's data limit.
//
// The rule (ours, stated here): g = m·φ (so that ln a_w = −ν·M_w·g) is a
// cubic Hermite polynomial in m on [m0, m1], where m0 is the model's data
// limit and m1 the solubility at T, with
//
//	g(m0) = model,  g′(m0) = model            (π and dπ/dm continuous at the data limit)
//	g(m1) = −ln a_w,sat / (ν·M_w)             (the measured saturated solution)
//	g′(m1) = δ·max(2 − α, 1),  α = g′(m0)/δ,  δ = (g(m1) − g(m0))/(m1 − m0)
//
// For α ≤ 1 this is the quadratic through both ends with the model's
// slope (α + β = 2: monotone, no inflection); for 1 < α < 4 the end slope
// is the secant δ (β = 1), inside the region where a cubic Hermite is
// monotone (Fritsch & Carlson 1980, SIAM J. Numer. Anal. 17:238: for
// α + β > 2 it is monotone if α − (2α + β − 3)²/(3(α + β − 2)) ≥ 0, which
// at β = 1 reads (4 − α)/3 ≥ 0; TestBridgeMonotone checks it). We
// interpolate g (equivalently ln a_w) rather than φ because π is linear
// in g, so the monotonicity of the interpolant is the monotonicity of π.
// If the model rises more than 4× faster than the secant (α ≥ 4) no
// monotone C¹ cubic exists; the slope at m0 is then limited to 3δ, which
// keeps π continuous and increasing but puts a corner in dπ/dm at m0.
// The bridge is used only where the measurement exists (its temperature
// range) and is consistent with the model (δ > 0: the saturated solution's
// water activity lies below the model's at its data limit).
type bridge struct {
	m0, m1 float64 // data limit and solubility, mol/kg
	g0, g1 float64 // g = m·φ at the ends, mol/kg
	d0, d1 float64 // dg/dm at the ends
	awSat  float64 // measured water activity at saturation
	corner bool    // the model's slope at m0 was limited (α ≥ 4)
}

// eval returns g and dg/dm on [m0, m1].
func (b *bridge) eval(m float64) (g, dg float64) {
	h := b.m1 - b.m0
	t := (m - b.m0) / h
	t2 := t * t
	t3 := t2 * t
	m0, m1 := b.d0*h, b.d1*h
	g = (2*t3-3*t2+1)*b.g0 + (t3-2*t2+t)*m0 + (-2*t3+3*t2)*b.g1 + (t3-t2)*m1
	dgdt := (6*t2-6*t)*b.g0 + (3*t2-4*t+1)*m0 + (-6*t2+6*t)*b.g1 + (3*t2-2*t)*m1
	return g, dgdt / h
}

// prepareBridge sets x.br when the solute's solubility at T lies above its
// model's data limit and the record holds the saturated solution's
// measured water activity at T. It runs after validMolal and solMolal are
// set and before prepareCap.
func (x *Solution) prepareBridge() {
	m0, m1 := x.validMolal, x.solMolal
	if math.IsInf(m1, 0) || !(m1 > m0*(1+1e-9)) || !(m0 > 0) {
		return
	}
	aw, ok := x.Solute.Solubility.SaturatedWaterActivity.At(x.tC)
	if !ok {
		return
	}
	g0, d0 := x.mPhi(m0)
	g1 := -math.Log(aw) / (x.nu * water.MolarMassKgPerMol)
	delta := (g1 - g0) / (m1 - m0)
	if !(delta > 0) || !(d0 > 0) {
		return
	}
	b := &bridge{m0: m0, m1: m1, g0: g0, g1: g1, d0: d0, awSat: aw}
	alpha := d0 / delta
	if alpha >= 4 {
		alpha, b.d0, b.corner = 3, 3*delta, true
	}
	b.d1 = delta * math.Max(2-alpha, 1)
	x.br = b
}

// BridgeMolPerKg returns the molality range [from, to] over which the
// solution uses the bridge to the measured saturated water activity, and
// false if it has none.
func (x *Solution) BridgeMolPerKg() (from, to float64, ok bool) {
	if x.br == nil {
		return 0, 0, false
	}
	return x.br.m0, x.br.m1, true
}

// SupportedMolPerKg is the top of the range backed by data: the model's
// data limit, or the solubility where the bridge to the measured saturated
// solution carries the model there.
func (x *Solution) SupportedMolPerKg() float64 {
	if x.br != nil {
		return x.br.m1
	}
	return x.validMolal
}

// bridgeWarning is the warning of a result at molality m on the bridge.
func (x *Solution) bridgeWarning(m float64) warn.Warning {
	return warn.New(warn.Bridged, x.Solute.ID, "%s: %s mol/kg is above the %s model's data limit of %s mol/kg; π and a_w are interpolated to the measured saturated solution (a_w = %s at %s mol/kg, %s °C)",
		x.Solute.ID, trimFloat(m), x.kind, trimFloat(x.br.m0), trimFloat(x.br.awSat), trimFloat(x.br.m1), trimFloat(x.tC))
}

// CheckSupported returns nil if molality m lies within the range backed by
// data (SupportedMolPerKg), and otherwise an *errs.InputError for field
// "concentration" whose value and limit are in unit u. Hosts that compute
// past the data anyway (a request's allow_extrapolation) skip it; the
// State then carries the warn.Extrapolated warning.
func (x *Solution) CheckSupported(m float64, u Unit) error {
	top := x.SupportedMolPerKg()
	if !(m > top*(1+1e-9)) {
		return nil
	}
	if x.mix != nil && len(x.mix.parts) > 0 {
		return &errs.InputError{Field: "mixture", Value: x.FromMolality(m, u),
			Limit: trimFloat(x.FromMolality(top, u)) + " " + u.String() + " in total",
			Msg: fmt.Sprintf("%s: the mixture's total concentration is beyond its parts' data (each part within its own data and the ionic strength within the largest of theirs: %s %s in total at %s °C); set allow_extrapolation to compute it anyway (flagged)",
				x.Solute.ID, trimFloat(x.FromMolality(top, u)), u.String(), trimFloat(x.tC))}
	}
	return &errs.InputError{Field: "concentration", Value: x.FromMolality(m, u),
		Limit: trimFloat(x.FromMolality(top, u)) + " " + u.String(),
		Msg: fmt.Sprintf("%s: beyond the %s model's data limit of %s %s at %s °C, with no measured saturated-solution water activity to carry it further; set allow_extrapolation to compute it anyway (flagged)",
			x.Solute.ID, x.kind, trimFloat(x.FromMolality(top, u)), u.String(), trimFloat(x.tC))}
}
