package scenario

import (
	"testing"

	"drawsift/engine/transport"
)

// BenchmarkFluxSeawaterBlend is one flux solve of a blended draw (NaCl and
// MgCl2, 3:1 by mole) against seawater: 13 ion species coupled by zero
// current, face π by the mixing rule over both solutions' tabulated
// models (issue #11 budget: ≤ 10 µs native).
func BenchmarkFluxSeawaterBlend(b *testing.B) {
	c, x1, x2 := 1.2, 0.75, 0.25
	f, err := ResolveFlux(&FluxSpec{Membrane: &MembraneSpec{Preset: "tfc-standard"}, Orientation: "AL-FS",
		Draw: &Concentration{Blend: []BlendPart{{Solute: "NaCl", MoleFraction: &x1}, {Solute: "MgCl2", MoleFraction: &x2}}, Concentration: &c, Unit: "mol/L"},
		Feed: &Concentration{Preset: "seawater"}})
	if err != nil {
		b.Fatal(err)
	}
	var r transport.Result
	if err := transport.SolveInto(&f.Input, &r); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if err := transport.SolveInto(&f.Input, &r); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(len(f.Input.Species)), "species")
	b.ReportMetric(float64(r.Stats.Evaluations), "evals")
	b.ReportMetric(float64(r.Stats.PotentialEvaluations), "u-evals")
}
