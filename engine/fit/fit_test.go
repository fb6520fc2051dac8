package fit

import (
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/scenario"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// TestRecoversNoiseFree: fit(simulate(p)) returns p to 1e-6 on noise-free
// data, in both orientations (each alone and mixed) and under both
// osmotic models (issue 13's first check; the data are our own synthetic
// set, simulated by the flux operation's path).
func TestRecoversNoiseFree(t *testing.T) {
	want := [3]float64{2.2, 0.45, 480}
	sets := map[string][]cond{
		"AL-FS": {{"AL-FS", 0.5, 0}, {"AL-FS", 1, 0}, {"AL-FS", 1.5, 0}, {"AL-FS", 2, 0}},
		"AL-DS": {{"AL-DS", 0.5, 0.02}, {"AL-DS", 1, 0.02}, {"AL-DS", 1.5, 0.1}, {"AL-DS", 2, 0.1}},
		"both":  stepped,
	}
	for name, conds := range sets {
		for _, model := range []string{"real", "van-t-hoff"} {
			rows := simulate(t, conds, want[0], want[1], want[2], model)
			res := runFit(t, &Spec{Data: rows, OsmoticModel: model})
			t.Logf("%s %s: %v after %d iterations, %d evaluations, %d starts", name, model, res.Solver.Status, res.Solver.Iterations, res.Solver.Evaluations, res.Starts)
			for j := range nParams {
				if e := relErr(res.Params[j].Value, want[j]); e > 1e-6 {
					t.Errorf("%s %s: %s = %.9g, want %g (rel %.2g; %s after %d iterations)", name, model, ParamNames[j], res.Params[j].Value, want[j], e, res.Solver.Status, res.Solver.Iterations)
				}
			}
		}
	}
}

// TestRecoversOtherSolutes: a MgCl2 draw against a Na2SO4 feed (four ions,
// none shared, so the reverse solute flux is the draw's own loss; the
// feed's ions' B follow the fitted B by library.BEstimateRule) is
// recovered to 1e-6 from noise-free data simulated by the flux operation
// with the same rule (membrane b_nacl_lmh = B / the rule's MgCl2 ratio).
func TestRecoversOtherSolutes(t *testing.T) {
	want := [3]float64{1.6, 0.3, 700}
	base := library.SoluteB{NaCl: 1}
	lib, err := library.Default()
	if err != nil {
		t.Fatal(err)
	}
	mg, ok := lib.Lookup("MgCl2")
	if !ok {
		t.Fatal("no MgCl2")
	}
	r, _ := base.For(mg)
	var rows []Row
	for _, c := range []struct {
		orient     string
		draw, feed float64
	}{{"AL-FS", 0.5, 0.05}, {"AL-FS", 1, 0.05}, {"AL-FS", 2, 0.05}, {"AL-DS", 0.5, 0.05}, {"AL-DS", 1, 0.1}, {"AL-DS", 2, 0.1}} {
		row := Row{Orientation: c.orient, TemperatureC: ptr(30), KDrawMPerS: ptr(3e-5), KFeedMPerS: ptr(3e-5),
			Draw: &scenario.Concentration{Solute: "MgCl2", Concentration: ptr(c.draw), Unit: "mol/L"},
			Feed: &scenario.Concentration{Solute: "Na2SO4", Concentration: ptr(c.feed), Unit: "mol/L"}}
		f, err := scenario.ResolveFlux(&scenario.FluxSpec{
			Membrane:    &scenario.MembraneSpec{ALMHPerBar: ptr(want[0]), BLMH: ptr(want[1]), BNaClLMH: ptr(want[1] / r), SUM: ptr(want[2])},
			Orientation: row.Orientation, Draw: row.Draw, Feed: row.Feed, TemperatureC: row.TemperatureC,
			KDrawMPerS: row.KDrawMPerS, KFeedMPerS: row.KFeedMPerS})
		if err != nil {
			t.Fatal(err)
		}
		res, err := transport.Solve(&f.Input)
		if err != nil {
			t.Fatal(err)
		}
		row.WaterFluxLMH = ptr(res.JwMPerS / thermo.MPerSPerLMH)
		row.ReverseSoluteFluxGMH = ptr(netLossGMH(f, &res))
		rows = append(rows, row)
	}
	res := runFit(t, &Spec{Data: rows})
	for j := range nParams {
		if e := relErr(res.Params[j].Value, want[j]); e > 1e-6 {
			t.Errorf("%s = %.9g, want %g (%s)", ParamNames[j], res.Params[j].Value, want[j], res.Solver.Status)
		}
	}
}

// TestRecoversAcrossTemperatures: rows at 15, 25 and 35 °C, simulated
// with a membrane whose A and B hold at 25 °C and are carried to each
// row's temperature (scenario.Membrane.AtTemperature), give back the 25 °C
// values when the fit's reference temperature is 25 °C.
func TestRecoversAcrossTemperatures(t *testing.T) {
	var rows []Row
	for i, c := range stepped {
		tc := []float64{15, 25, 35}[i%3]
		r := Row{Orientation: c.orient, TemperatureC: ptr(tc), KDrawMPerS: ptr(2e-5), KFeedMPerS: ptr(2e-5),
			Draw: &scenario.Concentration{Solute: "NaCl", Concentration: ptr(c.draw), Unit: "mol/L"}}
		if c.feed > 0 {
			r.Feed = &scenario.Concentration{Solute: "NaCl", Concentration: ptr(c.feed), Unit: "mol/L"}
		}
		rows = append(rows, r)
	}
	fill(t, rows, scenario.MembraneSpec{ALMHPerBar: ptr(2.4), BLMH: ptr(0.5), SUM: ptr(420), ReferenceTemperatureC: ptr(25)})
	res := runFit(t, &Spec{Data: rows, Membrane: &scenario.MembraneSpec{ReferenceTemperatureC: ptr(25)}})
	for j, w := range []float64{2.4, 0.5, 420} {
		if e := relErr(res.Params[j].Value, w); e > 1e-6 {
			t.Errorf("%s = %.9g, want %g", ParamNames[j], res.Params[j].Value, w)
		}
	}
}
