package fit

import (
	"context"
	"math"
	"testing"

	"drawsift/engine/scenario"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

func ptr(v float64) *float64 { return &v }

// cond is a test condition: orientation, NaCl draw and feed (mol/L).
type cond struct {
	orient     string
	draw, feed float64
}

// stepped is a characterisation of our own design (common practice after
// Tiraferri et al. 2013: four draw concentrations, DI feed, AL-FS), with
// two AL-DS stages at a brackish feed so that S and B are both seen.
var stepped = []cond{
	{"AL-FS", 0.5, 0}, {"AL-FS", 1, 0}, {"AL-FS", 1.5, 0}, {"AL-FS", 2, 0},
	{"AL-DS", 0.5, 0.01}, {"AL-DS", 1, 0.01}, {"AL-DS", 2, 0.05}, {"AL-FS", 1, 0.05},
}

// simulate gives each condition's fluxes for membrane (a, b, s) through
// the flux operation's own resolution (scenario.ResolveFlux and
// transport.Solve), k = 2e-5 m/s both sides, 25 °C.
func simulate(t testing.TB, conds []cond, a, b, s float64, model string) []Row {
	t.Helper()
	var rows []Row
	for _, c := range conds {
		r := Row{Orientation: c.orient, TemperatureC: ptr(25), KDrawMPerS: ptr(2e-5), KFeedMPerS: ptr(2e-5),
			Draw: &scenario.Concentration{Solute: "NaCl", Concentration: ptr(c.draw), Unit: "mol/L"}}
		if c.feed > 0 {
			r.Feed = &scenario.Concentration{Solute: "NaCl", Concentration: ptr(c.feed), Unit: "mol/L"}
		}
		f, err := scenario.ResolveFlux(&scenario.FluxSpec{
			Membrane:    &scenario.MembraneSpec{ALMHPerBar: ptr(a), BLMH: ptr(b), SUM: ptr(s)},
			Orientation: r.Orientation, Draw: r.Draw, Feed: r.Feed, TemperatureC: r.TemperatureC,
			KDrawMPerS: r.KDrawMPerS, KFeedMPerS: r.KFeedMPerS, OsmoticModel: model})
		if err != nil {
			t.Fatal(err)
		}
		res, err := transport.Solve(&f.Input)
		if err != nil {
			t.Fatal(err)
		}
		r.WaterFluxLMH = ptr(res.JwMPerS / thermo.MPerSPerLMH)
		r.ReverseSoluteFluxGMH = ptr(netLossGMH(f, &res))
		rows = append(rows, r)
	}
	return rows
}

// runFit resolves and runs spec.
func runFit(t testing.TB, spec *Spec) *Result {
	t.Helper()
	p, err := Resolve(spec)
	if err != nil {
		t.Fatal(err)
	}
	res, err := Run(context.Background(), p, nil)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// fill sets each row's measured fluxes to what the flux operation's
// resolution and transport.Solve give with membrane mem.
func fill(t testing.TB, rows []Row, mem scenario.MembraneSpec) {
	t.Helper()
	for i := range rows {
		r := &rows[i]
		f, err := scenario.ResolveFlux(&scenario.FluxSpec{Membrane: &mem, Orientation: r.Orientation, Draw: r.Draw, Feed: r.Feed,
			TemperatureC: r.TemperatureC, KDrawMPerS: r.KDrawMPerS, KFeedMPerS: r.KFeedMPerS})
		if err != nil {
			t.Fatal(err)
		}
		res, err := transport.Solve(&f.Input)
		if err != nil {
			t.Fatal(err)
		}
		r.WaterFluxLMH = ptr(res.JwMPerS / thermo.MPerSPerLMH)
		r.ReverseSoluteFluxGMH = ptr(netLossGMH(f, &res))
	}
}

// netLossGMH is the draw's net loss at a solution of f's problem, in gMH
// (the reverse solute flux the flux operation reports).
func netLossGMH(f *scenario.Flux, res *transport.Result) float64 {
	return f.Layout.LossesAt(&f.Input, res, 0).NetKgPerM2S * thermo.GPerM2HPerKgPerM2S
}
