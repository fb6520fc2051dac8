package regen

import (
	"math"

	"gonum.org/v1/gonum/integrate/quad"
)

// glNodes are Gauss–Legendre nodes and weights on [0, 1].
var glX, glW = func() ([]float64, []float64) {
	const n = 16
	x, w := make([]float64, n), make([]float64, n)
	quad.Legendre{}.FixedLocations(x, w, 0, 1)
	return x, w
}()

// MinimumSeparationEnergy returns the least work, per unit volume of
// product water (J/m³ = Pa), to recover a fraction r of the water of a
// solution of molality mDiluted as pure water, by a reversible process of
// infinite area (standard thermodynamics; e.g. Elimelech & Phillip 2011,
// Science 333:712; Mistry & Lienhard 2013, Entropy 15:2046):
//
//	W/V_p = (1/r) ∫₀ʳ π(m(r′)) dr′,   m(r′) = mDiluted/(1 − r′)
//
// where π(m) = −(R T/V̄_w) ln a_w(m) is the osmotic pressure of the
// remaining solution: removing one mole of water reversibly at water
// activity a_w costs −R T ln a_w, i.e. π·V̄_w. The molality follows exactly
// from the water balance because the solute stays behind. With the
// substitution u = −ln(1 − r′) the integrand π(m_d e^u)·e^{−u} is smooth
// and a 16-point Gauss–Legendre rule integrates it:
//
//	W/V_p = (1/r) ∫₀^{ln 1/(1−r)} π(m_d e^u) e^{−u} du.
//
// For π proportional to molality this is exactly π₀·ln[1/(1 − r)]/r with
// π₀ = π(mDiluted).
//
// Special cases are:
//
//	r = 0 (limit)        W/V_p = π(mDiluted)
//	mDiluted = 0         W/V_p = 0
//	r ≥ 1 or r < 0       0 (callers validate r)
func MinimumSeparationEnergy(pi func(mMolPerKg float64) float64, mDiluted, r float64) float64 {
	if !(mDiluted > 0) || !(r >= 0 && r < 1) {
		return 0
	}
	if r == 0 {
		return pi(mDiluted)
	}
	u := -math.Log1p(-r)
	s := 0.0
	for i, x := range glX {
		uu := x * u
		e := math.Exp(uu)
		s += glW[i] * pi(mDiluted*e) / e
	}
	return s * u / r
}
