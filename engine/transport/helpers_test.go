package transport

import (
	"math"
	"testing"

	"drawsift/engine/thermo"
)

// Test constants, T = 25 °C. R is a parameter of the test problems and
// must equal testdata/flux_scipy.py's R_GAS, with which the reference
// table was made: the CODATA 2018 value rounded to 10 figures (the exact
// value, thermo.GasConstant = 8.31446261815324, differs by 2e-11
// relative).
const (
	rGas  = 8.314462618
	tK    = 298.15
	rt    = rGas * tK
	lmh   = thermo.MPerSPerLMH
	lmhb  = thermo.MPerSPaPerLMHPerBar
	bar   = thermo.PascalPerBar
	um    = 1e-6
	dNaCl = 1.47e-9 // m²/s; a typical salt diffusivity, test input only
)

// Test osmotic functions. These are functions of our own for exercising the
// solver, not data for any real solute.

// vantHoff returns the van 't Hoff law π = ν·R·T·c.
func vantHoff(nu float64) OsmoticFunc {
	k := nu * rt
	return func(c float64) (float64, float64) { return k * c, k }
}

// Non-linear test law π = ν·R·T·c·(1 + a·c + b·c²); the same a, b are used
// in testdata/flux_scipy.py.
const (
	nlA = 2e-5 // m³/mol
	nlB = 1e-8 // m⁶/mol²
)

func nonlinear(nu float64) OsmoticFunc {
	k := nu * rt
	return func(c float64) (float64, float64) {
		return k * c * (1 + c*(nlA+nlB*c)), k * (1 + c*(2*nlA+3*nlB*c))
	}
}

// lambertW returns the principal branch W(x), x ≥ 0, by Halley's iteration
// on w·e^w − x (Corless et al. 1996, Adv. Comput. Math. 5:329, eq. 5.9).
// Written for the tests independently of the solver's own first guess.
func lambertW(x float64) float64 {
	w := math.Log1p(x) // start: W(x) ≤ ln(1 + x)
	for i := 0; i < 100; i++ {
		ew := math.Exp(w)
		f := w*ew - x
		wn := w - f/(ew*(w+1)-(w+2)*f/(2*w+2))
		if math.Abs(wn-w) <= 1e-15*math.Abs(wn) {
			return wn
		}
		w = wn
	}
	return w
}

// closeTo reports whether got is within tol of want, relative to |want|, or
// absolutely when |want| < abs (the stdlib/gonum abs-or-rel rule).
func closeTo(got, want, tol, abs float64) bool {
	d := math.Abs(got - want)
	if math.Abs(want) < abs {
		return d <= tol*abs
	}
	return d <= tol*math.Abs(want)
}

func mustSolve(t testing.TB, in *Input) Result {
	t.Helper()
	r, err := Solve(in)
	if err != nil {
		t.Fatalf("Solve: %v", err)
	}
	return r
}

// oneSpecies builds the common single-solute input.
func oneSpecies(aLMHbar, bLMH, sUM float64, ori Orientation, cDraw, cFeed float64, pi OsmoticFunc) *Input {
	return &Input{
		AMPerSPa: aLMHbar * lmhb, SM: sUM * um, Orientation: ori,
		KDrawMPerS: math.Inf(1), KFeedMPerS: math.Inf(1),
		Species: []Species{{Name: "draw", DrawBulkMolPerM3: cDraw, FeedBulkMolPerM3: cFeed,
			BMPerS: bLMH * lmh, DM2PerS: dNaCl, Pi: pi}},
	}
}
