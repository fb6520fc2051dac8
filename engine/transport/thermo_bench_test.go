package transport_test

import (
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

var sinkJw float64

// BenchmarkSolveThermo times one AL-FS/AL-DS solve with the engine's real
// non-ideal π(c) (Pitzer + Laliberté density) for NaCl and MgSO4 draws
// against a brackish NaCl feed, ECP on both sides: the work a screen and
// a robustness run repeat.
func BenchmarkSolveThermo(b *testing.B) {
	lib := library.MustDefault()
	for _, tc := range []struct {
		draw string
		c    float64 // mol/m³
	}{{"NaCl", 1000}, {"MgSO4", 1000}} {
		ds, _ := lib.Lookup(tc.draw)
		fs, _ := lib.Lookup("NaCl")
		xd, err := thermo.NewSolution(ds, 298.15)
		if err != nil {
			b.Fatal(err)
		}
		xf, _ := thermo.NewSolution(fs, 298.15)
		for _, o := range []transport.Orientation{transport.ALFS, transport.ALDS} {
			in := &transport.Input{AMPerSPa: 2 * thermo.MPerSPaPerLMHPerBar, SM: 500e-6, Orientation: o,
				KDrawMPerS: 5e-5, KFeedMPerS: 5e-5,
				Species: []transport.Species{{Name: tc.draw, DrawBulkMolPerM3: tc.c, BMPerS: 0.4 * thermo.MPerSPerLMH, DM2PerS: 1.5e-9, Pi: xd.FastOsmoticFunc()}}}
			if tc.draw == "NaCl" {
				in.Species[0].FeedBulkMolPerM3 = 50
			} else {
				in.Species = append(in.Species, transport.Species{Name: "NaCl", FeedBulkMolPerM3: 50, BMPerS: 0.4 * thermo.MPerSPerLMH, DM2PerS: 1.5e-9, Pi: xf.FastOsmoticFunc()})
			}
			b.Run(tc.draw+"-"+o.String(), func(b *testing.B) {
				b.ReportAllocs()
				var r transport.Result
				for i := 0; i < b.N; i++ {
					if err := transport.SolveInto(in, &r); err != nil {
						b.Fatal(err)
					}
					sinkJw += r.JwMPerS
				}
			})
		}
	}
}
