package thermo

import (
	"math"

	"drawsift/engine/errs"
)

// MolalityForPi returns the molality at which the solution's osmotic
// pressure reaches targetPa. It fails with an *errs.InputError (field
// "target") if the target is negative or lies above π at the solubility
// limit (or at the model's data limit for a miscible solute).
//
// π(m) (with the monotone extension past the working range, see
// OsmoticFunc) is increasing, so a safeguarded Newton iteration inside the
// bracket [0, m_top] converges to 1e-13 relative in a few steps.
func (x *Solution) MolalityForPi(targetPa float64) (float64, error) {
	if !(targetPa >= 0) || math.IsInf(targetPa, 0) {
		return 0, &errs.InputError{Field: "target", Value: targetPa / PascalPerBar, Limit: "≥ 0 bar", Msg: "target osmotic pressure must be a finite, non-negative number"}
	}
	if targetPa == 0 {
		return 0, nil
	}
	top := x.solMolal
	if math.IsInf(top, 0) {
		top = x.capMolal
	}
	piTop, _ := x.piMono(top)
	if targetPa > piTop*(1+1e-12) {
		return 0, &errs.InputError{Field: "target", Value: targetPa / PascalPerBar,
			Limit: formatBar(piTop), Msg: x.Solute.ID + " cannot reach this osmotic pressure below its solubility limit"}
	}
	lo, hi := 0.0, top
	// Start from the van 't Hoff-like guess with φ = 1.
	m := math.Min(targetPa/(x.piPerG*x.nu), top)
	for i := 0; i < 100; i++ {
		pi, dp := x.piMono(m)
		f := pi - targetPa
		if f > 0 {
			hi = m
		} else {
			lo = m
		}
		if math.Abs(f) <= 1e-13*targetPa {
			return m, nil
		}
		next := m - f/dp
		if !(next > lo && next < hi) || !(dp > 0) {
			next = 0.5 * (lo + hi)
		}
		if next == m || hi-lo <= 1e-15*hi {
			return next, nil
		}
		m = next
	}
	return m, nil
}

func formatBar(pa float64) string {
	return trimFloat(pa/PascalPerBar) + " bar"
}
