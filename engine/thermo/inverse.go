package thermo

import (
	"math"

	"drawsift/engine/errs"
	"drawsift/engine/internal/roots"
)

// MolalityForPi returns the molality at which the solution's osmotic
// pressure reaches targetPa. It fails with an *errs.InputError (field
// "target") if the target is negative or lies above π at the solubility
// limit (or at the model's data limit for a miscible solute), and with an
// *errs.ConvergenceError if the search does not meet its tolerance within
// 100 iterations (not seen: over the library at 5–80 °C and targets from
// 1e-4 to 1 of π(top) it takes 3–6 iterations, at most 10; and
// bisection alone would reach the x tolerance in about 50).
//
// π(m) (with the monotone extension past the working range, see
// OsmoticFunc) is increasing, so a safeguarded Newton iteration
// (roots.Newton) inside the bracket [0, m_top], from the van 't Hoff-like
// guess with φ = 1, converges to |π − target| ≤ 1e-13·target in a few
// steps.
func (x *Solution) MolalityForPi(targetPa float64) (float64, error) {
	return x.molalityForPi(targetPa, roots.DefaultMaxIterations)
}

// MaxPiPa is the highest π MolalityForPi reaches (at the solubility, or
// at the top of a miscible solute's range); a higher target is refused.
func (x *Solution) MaxPiPa() float64 { return x.topPi * (1 + 1e-12) }

// molalityForPi is MolalityForPi with an iteration limit (tests lower it).
func (x *Solution) molalityForPi(targetPa float64, maxIter int) (float64, error) {
	if !(targetPa >= 0) || math.IsInf(targetPa, 0) {
		return 0, &errs.InputError{Field: "target", Value: targetPa / PascalPerBar, Limit: "≥ 0 bar", Msg: "target osmotic pressure must be a finite, non-negative number"}
	}
	if targetPa == 0 {
		return 0, nil
	}
	top, piTop := x.topMolal, x.topPi
	if targetPa > x.MaxPiPa() {
		return 0, &errs.InputError{Field: "target", Value: targetPa / PascalPerBar,
			Limit: formatBar(piTop), Msg: x.Solute.ID + " cannot reach this osmotic pressure below its solubility limit"}
	}
	f := func(m float64) (float64, float64) {
		pi, dp := x.piMono(m)
		return pi - targetPa, dp
	}
	// π(0) = 0. A target within the 1e-12 allowance above π(top) has
	// f(top) < 0 by at most that much: the end within FAbsTol, or the
	// search then reports no sign change.
	br := roots.Bracket{Lo: 0, Hi: top, FLo: -targetPa, FHi: piTop - targetPa}
	if br.FHi < 0 && br.FHi >= -1e-12*targetPa {
		return top, nil
	}
	guess := math.Min(targetPa/(x.piPerG*x.nu), top)
	r, err := roots.Newton(f, br, guess, &roots.Settings{
		Solver: "osmotic-pressure inverse", FAbsTol: 1e-13 * targetPa, Scale: targetPa,
		XRelTol: 1e-15, MaxIterations: maxIter})
	if err != nil {
		if ce, ok := err.(*errs.ConvergenceError); ok {
			ce.Solver += " for " + x.Solute.ID
		}
		return 0, err
	}
	return r.X, nil
}

func formatBar(pa float64) string {
	return trimFloat(pa/PascalPerBar) + " bar"
}
