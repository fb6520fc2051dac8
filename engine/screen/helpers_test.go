package screen

import (
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

func lib(t testing.TB) *library.Library {
	t.Helper()
	l, err := library.Default()
	if err != nil {
		t.Fatal(err)
	}
	return l
}

func solutes(t testing.TB, ids ...string) []*library.Solute {
	t.Helper()
	l := lib(t)
	var out []*library.Solute
	for _, id := range ids {
		s, ok := l.Lookup(id)
		if !ok {
			t.Fatalf("no solute %q", id)
		}
		out = append(out, s)
	}
	return out
}

// baseScenario: the mid-permeability TFC preset, deionised-water feed,
// 25 °C, AL-FS, the default bench-scale channel, equal π of 28 bar.
func baseScenario(t testing.TB, ids ...string) *Scenario {
	t.Helper()
	m, ok := library.LookupMembrane("tfc-standard")
	if !ok {
		t.Fatal("no membrane preset")
	}
	if len(ids) == 0 {
		ids = lib(t).IDs()
	}
	return &Scenario{
		Feed: Feed{ID: "deionised-water", PH: 7},
		Membrane: Membrane{ID: m.ID, AMPerSPa: m.ALMHPerBar * thermo.MPerSPaPerLMHPerBar, SM: m.SUM * 1e-6,
			B: library.SoluteB{NaCl: m.BNaClLMH * thermo.MPerSPerLMH}, ARelSD: m.ARelSD, BRelSD: m.BRelSD, SRelSD: m.SRelSD},
		Orientations:         []transport.Orientation{transport.ALFS},
		TemperatureK:         thermo.ReferenceK,
		Channel:              transport.Channel{HeightM: 2e-3, WidthM: 26e-3, LengthM: 77e-3, VelocityMPerS: 0.25},
		Candidates:           solutes(t, ids...),
		Basis:                Basis{Kind: BasisOsmoticPressure, PiPa: 28e5},
		Weights:              DefaultWeights,
		Pareto:               DefaultPareto,
		RegenerationRecovery: 0.5,
		Seed:                 1,
	}
}

func seawaterFeed(t testing.TB) Feed {
	t.Helper()
	f, ok := library.LookupFeed("seawater")
	if !ok {
		t.Fatal("no seawater feed")
	}
	sw := solutes(t, "seawater")[0]
	feed := Feed{ID: f.ID, Solute: sw, Concentration: 35, Unit: thermo.GPerKg, PH: f.PH, IonsPerKg: true}
	feed.Ions = f.IonsAt(35)
	return feed
}

// robustScenario is the whole library against seawater at twice its π,
// with the stated uncertainties over samples Monte Carlo samples: the
// robustness benchmark's scenario, shared with its tests.
func robustScenario(t testing.TB, samples int) *Scenario {
	sc := baseScenario(t)
	sc.Feed = seawaterFeed(t)
	sc.Basis = Basis{Kind: BasisOsmoticPressure, MultipleOfFeed: 2}
	sc.AllowExtrapolation = true
	sc.Uncertainty = &Uncertainty{Samples: samples, ARelSD: .1, BRelSD: .3, SRelSD: .15, DefaultOsmotic: true, DiffusivityRelSD: .05, Prices: true}
	return sc
}
