package transport_test

import (
	"fmt"
	"math"

	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// A 1 mol/L van 't Hoff draw (ν = 2) against pure water through a membrane
// with A = 1 LMH/bar, B = 0.3 LMH and S = 500 µm, both orientations, with
// external CP on both faces. Js/Jw = B/(A·ν·R·T) = 6.05 mol/m³ either way
// (Phillip et al. 2010).
func ExampleSolve() {
	const rt = thermo.GasConstant * 298.15 // J/mol at 25 °C
	vantHoff := func(c float64) (float64, float64) { return 2 * rt * c, 2 * rt }
	for _, ori := range []transport.Orientation{transport.ALFS, transport.ALDS} {
		in := &transport.Input{
			AMPerSPa:    1 * thermo.MPerSPaPerLMHPerBar,
			SM:          500e-6,
			Orientation: ori,
			KDrawMPerS:  5e-5, KFeedMPerS: 5e-5,
			Species: []transport.Species{{Name: "NaCl-like", DrawBulkMolPerM3: 1000,
				BMPerS: 0.3 * thermo.MPerSPerLMH, DM2PerS: 1.47e-9, Pi: vantHoff}},
		}
		r, err := transport.Solve(in)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%v: Jw = %.4g LMH, Js = %.4g mmol/(m² h), Js/Jw = %.4g mol/m³\n", ori,
			r.JwMPerS/thermo.MPerSPerLMH, r.JsMolPerM2S*thermo.MmolPerM2HPerMolPerM2S, r.JsMolPerM2S/r.JwMPerS)
	}
	_, err := transport.Solve(&transport.Input{AMPerSPa: -1, SM: 1e-4, KDrawMPerS: math.Inf(1), KFeedMPerS: math.Inf(1)})
	fmt.Println(err)
	// Output:
	// AL-FS: Jw = 13.11 LMH, Js = 79.34 mmol/(m² h), Js/Jw = 6.051 mol/m³
	// AL-DS: Jw = 33.19 LMH, Js = 200.8 mmol/(m² h), Js/Jw = 6.051 mol/m³
	// membrane.a_lmh_per_bar = -3.6e+11: must be > 0 and ≤ 360 LMH/bar
}
