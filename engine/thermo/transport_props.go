package thermo

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/interp"

	"drawsift/engine/library"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// prepareViscosity builds the relative-viscosity table, if any, and
// decides whether Gordon's equation carries D to concentration (a neutral
// solute or a 1:1 electrolyte; DiffusivityM2PerS).
func (x *Solution) prepareViscosity() {
	x.gordon = x.kind != library.ModelMixture && x.kind != library.ModelSeawater
	for _, ion := range x.Solute.Ions {
		if ion.Charge != 1 && ion.Charge != -1 {
			x.gordon = false
		}
	}
	v := x.Solute.Viscosity
	if v == nil {
		if x.kind != library.ModelSeawater && x.kind != library.ModelMixture {
			x.warn(warn.ModelNote, "%s: no viscosity model; pure-water viscosity is reported", x.Solute.ID)
		}
		return
	}
	if x.tC < v.MinC || x.tC > v.MaxC {
		x.warn(warn.Extrapolated, "%s: viscosity model fitted %s; extrapolated to %s °C", x.Solute.ID, tempSpan(v.MinC, v.MaxC), trimFloat(x.tC))
	}
	if v.Kind == library.ViscosityRelativeTable {
		x.etaRT = relViscosityTable(v)
	}
}

// relViscosityTable fits a relative-viscosity record: η_r(0) = 1 and the
// points with strictly increasing mass fractions, linearly; nil if fewer
// than one point remains.
func relViscosityTable(v *library.ViscosityModel) *interp.PiecewiseLinear {
	xs, ys := []float64{0}, []float64{1}
	for _, p := range v.Points {
		if p.MassFraction > xs[len(xs)-1] {
			xs = append(xs, p.MassFraction)
			ys = append(ys, p.RelativeViscosity)
		}
	}
	if len(xs) < 2 {
		return nil
	}
	var f interp.PiecewiseLinear
	if f.Fit(xs, ys) != nil {
		return nil
	}
	return &f
}

// ViscosityPaS returns the solution's dynamic viscosity at m mol/kg.
//
// Laliberté (2007), J. Chem. Eng. Data 52:321, eqs. 9–10:
//
//	η_s = exp[(v1 (1−w_w)^v2 + v3)/(v4 t + 1)] / (v5 (1−w_w)^v6 + 1)   (mPa·s)
//	ln η = w_w ln η_w + (1 − w_w) ln η_s
//
// Seawater: Sharqawy et al. (2010) eqs. 22–23. Relative tables: linear
// interpolation in mass fraction, held flat past the last point. Without
// a model it returns the pure-water value (flagged by NewSolution).
func (x *Solution) ViscosityPaS(m float64) float64 {
	w := x.massFractionFromMolality(m)
	if x.kind == library.ModelMixture {
		return x.mixViscosity(w)
	}
	if x.kind == library.ModelSeawater {
		return x.muW * seawaterRelViscosity(w, x.tC)
	}
	v := x.Solute.Viscosity
	if v == nil {
		return x.muW
	}
	switch v.Kind {
	case library.ViscosityLaliberte2007:
		if w <= 0 {
			return x.muW
		}
		// Past the fit's mass-fraction range ln η continues along the
		// secant from pure water, so sparse fits cannot run away.
		wFit := w
		if v.MaxMassFraction > 0 && w > v.MaxMassFraction {
			wFit = v.MaxMassFraction
		}
		ln := x.lnEtaLaliberte(v, wFit)
		if wFit < w {
			lnW := math.Log(x.muW)
			ln = lnW + (ln-lnW)*w/wFit
		}
		if eta := math.Exp(ln); eta > 0 && !math.IsInf(eta, 0) {
			return eta
		}
		return x.muW
	case library.ViscosityRelativeTable:
		if x.etaRT != nil {
			return x.muW * x.etaRT.Predict(w)
		}
	}
	return x.muW
}

// DiffusivityM2PerS returns the solute's binary diffusion coefficient at
// m mol/kg and the Solution's temperature.
//
// Where the record has measured finite-concentration values (25 °C) they
// are interpolated linearly in molarity (from D⁰ at c = 0; held flat beyond
// the last point) and scaled to T by Stokes–Einstein with water's viscosity,
//
//	D(c, T) = D(c, 25 °C) · (T/298.15 K) · η_w(25 °C)/η_w(T)
//
// (the usual scaling, e.g. Miller et al. 1994 observed D(35 °C)/D(25 °C)
// close to water's fluidity ratio). Without them, for a neutral solute or
// a 1:1 electrolyte, Gordon's equation
// (Gordon 1937, J. Chem. Phys. 5:522; Robinson & Stokes, Electrolyte
// Solutions, 2nd ed. 1959, ch. 11) carries D⁰ to concentration through
// the solution's own viscosity and the thermodynamic factor,
//
//	D(c, T) = D⁰(25 °C) · (T/298.15 K) · η_w(25 °C)/η(c, T) · (1 + m ∂ln γ/∂m)
//
// with 1 + m ∂ln γ/∂m = d(mφ)/dm from the osmotic model (Gibbs–Duhem), so
// a viscous draw (sucrose, glycerol) loses the diffusivity its internal
// polarisation depends on. The tests check Gordon against the measured
// points of NaCl, KCl and LiCl (within 7 % to 1–3 mol/L). Multivalent salts
// keep D⁰ scaled by water's fluidity: with their ion association the
// equation is known to fail (Robinson & Stokes 1959, ch. 11, from memory),
// and no D(c) data of them are in the library.
func (x *Solution) DiffusivityM2PerS(m float64) float64 {
	if d, ok := x.mixDiffusivity(m); ok {
		return d
	}
	d := x.Solute.Diffusivity
	d25 := d.D0M2PerS
	if len(d.Points) == 0 {
		f := 1.0
		if x.gordon {
			f = x.GordonFactor(m)
		}
		return d25 * (x.TK / ReferenceK) * water.Viscosity(ReferenceK) / x.muW * f
	}
	c := x.molarityFromMolality(m) / 1000
	p := d.Points
	i := sort.Search(len(p), func(i int) bool { return p[i].MolarityMolPerL >= c })
	switch {
	case i == len(p):
		d25 = p[len(p)-1].DM2PerS
	case i == 0:
		f := c / p[0].MolarityMolPerL
		d25 = d.D0M2PerS + f*(p[0].DM2PerS-d.D0M2PerS)
	default:
		a, b := p[i-1], p[i]
		f := (c - a.MolarityMolPerL) / (b.MolarityMolPerL - a.MolarityMolPerL)
		d25 = a.DM2PerS + f*(b.DM2PerS-a.DM2PerS)
	}
	return d25 * (x.TK / ReferenceK) * water.Viscosity(ReferenceK) / x.muW
}

// GordonFactor is D(c)/D(0) at m mol/kg by Gordon's equation at the
// Solution's temperature: η_w/η(m) · d(mφ)/dm (1 at m = 0; a
// non-positive slope, which no model here gives, counts as 1).
func (x *Solution) GordonFactor(m float64) float64 {
	if !(m > 0) {
		return 1
	}
	_, tf := x.mPhi(math.Min(m, x.capMolal))
	if !(tf > 0) || math.IsInf(tf, 0) {
		tf = 1
	}
	return tf * x.muW / x.ViscosityPaS(m)
}

// lnEtaLaliberte returns ln η (η in Pa·s) of Laliberté's (2007) mixing
// rule at solute mass fraction w > 0.
func (x *Solution) lnEtaLaliberte(v *library.ViscosityModel, w float64) float64 {
	etaW := x.muW * 1e3 // mPa·s
	etaS := math.Exp((v.V1*math.Pow(w, v.V2)+v.V3)/(v.V4*x.tC+1)) / (v.V5*math.Pow(w, v.V6) + 1)
	return (1-w)*math.Log(etaW) + w*math.Log(etaS) + math.Log(1e-3)
}

// viscosityWarning reports when the viscosity at mass fraction w rests on
// an extrapolation.
func (x *Solution) viscosityWarning(w float64) string {
	v := x.Solute.Viscosity
	if v == nil || v.MaxMassFraction <= 0 || w <= v.MaxMassFraction {
		return ""
	}
	return fmt.Sprintf("%s: viscosity fitted up to %s wt%%; extrapolated to %s wt%%", x.Solute.ID, trimFloat(100*v.MaxMassFraction), trimFloat(100*w))
}
