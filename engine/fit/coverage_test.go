package fit

import (
	"math/rand/v2"
	"testing"
)

// TestCoverage: on 240 seeded noisy synthetic data sets (our own design:
// the stepped conditions, 3 % multiplicative normal noise on every flux),
// the 95 % intervals contain the true A, B and S in 90–99 % of the sets
// for each parameter (issue 13's coverage check; a t interval on a
// linearised model is only approximately exact, hence the band).
func TestCoverage(t *testing.T) {
	const sets = 240
	truth := [3]float64{1.8, 0.35, 550}
	clean := simulate(t, stepped, truth[0], truth[1], truth[2], "real")
	rng := rand.New(rand.NewPCG(13, 2026))
	var hits [3]int
	for range sets {
		rows := make([]Row, len(clean))
		for i, r := range clean {
			r.WaterFluxLMH = ptr(*r.WaterFluxLMH * (1 + 0.03*rng.NormFloat64()))
			r.ReverseSoluteFluxGMH = ptr(*r.ReverseSoluteFluxGMH * (1 + 0.03*rng.NormFloat64()))
			rows[i] = r
		}
		res := runFit(t, &Spec{Data: rows})
		for j := range nParams {
			e := res.Params[j]
			if !e.HasInterval {
				t.Fatalf("%s has no interval", ParamNames[j])
			}
			if e.Low <= truth[j] && truth[j] <= e.High {
				hits[j]++
			}
		}
	}
	for j := range nParams {
		f := float64(hits[j]) / sets
		t.Logf("%s: %d of %d intervals hold the truth (%.1f %%)", ParamNames[j], hits[j], sets, 100*f)
		if f < 0.90 || f > 0.99 {
			t.Errorf("%s: coverage %.3f outside 0.90–0.99", ParamNames[j], f)
		}
	}
}
