package module

import (
	"math"
	"testing"

	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// Units for the test problems.
const (
	lmh   = thermo.MPerSPerLMH
	lmhb  = thermo.MPerSPaPerLMHPerBar
	um    = thermo.MPerUM
	perLH = 1 / 3.6e6 // m³/s per L/h
	// rtK uses R = 8.314462618 J/(mol K), the value testdata/flux_scipy.py
	// and module_scipy.py make their tables with (the 2019 SI value
	// rounded to 10 figures).
	rtK = 8.314462618 * 298.15
)

// vantHoff is Π = ν·R·T·c at 25 °C.
func vantHoff(nu float64) transport.OsmoticFunc {
	return func(c float64) (float64, float64) { return nu * rtK * c, nu * rtK }
}

// nonlinear is the non-ideal test law of testdata/flux_scipy.py and
// testdata/module_scipy.py (a function of our own, not data for any
// real solute): Π = ν·R·T·c·(1 + a·c + b·c²).
func nonlinear(nu float64) transport.OsmoticFunc {
	const a, b = 2e-5, 1e-8
	return func(c float64) (float64, float64) {
		return nu * rtK * c * (1 + a*c + b*c*c), nu * rtK * (1 + 2*a*c + 3*b*c*c)
	}
}

// testProblem is a single-solute module: a 1 mol/L draw (ν = 2) against a
// feed of the same solute at feedC (mol/m³), a TFC-like membrane within
// the published ranges (A = 1 LMH/bar, B = 0.3 LMH, S = 500 µm; e.g.
// Coday et al. 2013, Environ. Sci. Technol., SI Table S1), 40 L/h each.
func testProblem(flow Flow, ori transport.Orientation, pi transport.OsmoticFunc, feedC float64) *Problem {
	return &Problem{
		Input: transport.Input{AMPerSPa: 1 * lmhb, SM: 500 * um, Orientation: ori, KDrawMPerS: 5e-5, KFeedMPerS: 5e-5,
			Species: []transport.Species{{Name: "s", DrawBulkMolPerM3: 1000, FeedBulkMolPerM3: feedC, BMPerS: 0.3 * lmh, DM2PerS: 1.5e-9, Pi: pi}}},
		Flow: flow, DrawInM3PerS: 40 * perLH, FeedInM3PerS: 40 * perLH,
	}
}

func closeTo(got, want, rel, abs float64) bool {
	return math.Abs(got-want) <= abs+rel*math.Abs(want)
}

func mustSolve(t *testing.T, p *Problem, area float64) *Result {
	t.Helper()
	r, err := Solve(p, area)
	if err != nil {
		t.Fatalf("Solve(%s, %g m²): %v", p.Flow, area, err)
	}
	return r
}
