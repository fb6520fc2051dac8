package screen

import (
	"context"
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

var sinkSeries []SweepSeries
var sinkResult *Result

// BenchmarkDefaultScreen: the whole library × 40 concentrations × both
// orientations, every metric (design budget: < 50 ms native).
func BenchmarkDefaultScreen(b *testing.B) {
	sc := baseScenario(b)
	sc.Feed = seawaterFeed(b)
	sc.Orientations = []transport.Orientation{transport.ALFS, transport.ALDS}
	l := lib(b)
	spec := SweepSpec{Variable: SweepConcentration, From: 0.05, To: 2, Points: 40, Unit: thermo.MolPerL}
	b.ReportAllocs()
	for b.Loop() {
		s, err := Sweep(context.Background(), sc, l, spec)
		if err != nil {
			b.Fatal(err)
		}
		sinkSeries = s
	}
}

// BenchmarkScreen: one ranked screen of the whole library at 2 × the
// seawater feed's π.
func BenchmarkScreen(b *testing.B) {
	sc := baseScenario(b)
	sc.Feed = seawaterFeed(b)
	sc.Basis = Basis{Kind: BasisOsmoticPressure, MultipleOfFeed: 2}
	benchRun(b, sc)
}

// BenchmarkScreenBlends: BenchmarkScreen with three blends added
// (issue #10's budget: < 50 ms native).
func BenchmarkScreenBlends(b *testing.B) {
	sc := baseScenario(b)
	sc.Feed = seawaterFeed(b)
	sc.Basis = Basis{Kind: BasisOsmoticPressure, MultipleOfFeed: 2}
	for _, bl := range []struct {
		ids []string
		x   []float64
	}{{[]string{"NaCl", "MgCl2"}, []float64{0.9, 0.1}}, {[]string{"KCl", "NH4NO3"}, []float64{0.5, 0.5}}, {[]string{"NaCl", "glucose", "KCl"}, []float64{0.6, 0.2, 0.2}}} {
		blend, err := library.NewBlend(library.BlendID(bl.ids, bl.x), solutes(b, bl.ids...), bl.x)
		if err != nil {
			b.Fatal(err)
		}
		sc.Candidates = append(sc.Candidates, blend)
	}
	benchRun(b, sc)
}

// BenchmarkRobustness: 1,000 Monte Carlo samples over 25 candidates
// (design budget: < 1 s native, < 2 s wasm).
func BenchmarkRobustness(b *testing.B) {
	sc := robustScenario(b, 1000)
	r, err := Run(context.Background(), sc, lib(b), nil)
	if err != nil {
		b.Fatal(err)
	}
	benchRun(b, sc)
	b.ReportMetric(float64(len(r.Ranked)), "candidates")
}

// BenchmarkWaterFluxBasis: one ranked screen of the whole library at an
// equal water flux of 5 LMH from seawater, both orientations: each
// candidate's molality comes from the bracketed flux-basis search
// (molalityForFlux), a transport solve per evaluation.
func BenchmarkWaterFluxBasis(b *testing.B) {
	sc := baseScenario(b)
	sc.Feed = seawaterFeed(b)
	sc.Orientations = []transport.Orientation{transport.ALFS, transport.ALDS}
	sc.Basis = Basis{Kind: BasisWaterFlux, JwMPerS: 5 * thermo.MPerSPerLMH}
	benchRun(b, sc)
}

// benchRun times whole screens of sc.
func benchRun(b *testing.B, sc *Scenario) {
	l := lib(b)
	b.ReportAllocs()
	for b.Loop() {
		r, err := Run(context.Background(), sc, l, nil)
		if err != nil {
			b.Fatal(err)
		}
		sinkResult = r
	}
}
