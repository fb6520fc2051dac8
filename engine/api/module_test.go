package api

import (
	"context"
	"math"
	"strings"
	"testing"

	"drawsift/engine/internal/jsonx"
)

const moduleBase = `"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 1, "unit": "mol/L", "flow_l_per_h": 40}`

// TestModuleSeawater: a counter-current module of NaCl against seawater
// (the feed preset's ions, each its own species) balances every species,
// reports the cap and draws less than the equilibrium allows; the designed
// area for the rated recovery is the rated area.
func TestModuleSeawater(t *testing.T) {
	out, e := Dispatch(context.Background(), OpModule, []byte(`{`+moduleBase+`, "feed": {"preset": "seawater", "flow_l_per_h": 80}, "area_m2": 5}`))
	if e != nil {
		t.Fatal(e)
	}
	var r ModuleResponse
	if err := jsonx.Unmarshal(out, &r); err != nil {
		t.Fatal(err)
	}
	if r.Solver.WaterBalance > 1e-8 || r.Solver.SpeciesBalance > 1e-8 {
		t.Errorf("balances: water %.2g, species %.2g", r.Solver.WaterBalance, r.Solver.SpeciesBalance)
	}
	if !(r.Recovery > 0 && r.Recovery < r.RecoveryCap && r.RecoveryCap < 1) {
		t.Errorf("recovery %g, cap %g", r.Recovery, r.RecoveryCap)
	}
	if len(r.Profiles.AreaM2) != 41 || r.Profiles.AreaM2[40] != 5 || len(r.Profiles.Species) != len(r.Exchange) {
		t.Errorf("profiles: %d points, last %g; %d species", len(r.Profiles.AreaM2), r.Profiles.AreaM2[len(r.Profiles.AreaM2)-1], len(r.Profiles.Species))
	}
	if !(r.ReverseSoluteMolPerH > 0) || !(r.ForwardSoluteGPerH > 0) {
		t.Errorf("exchange: reverse %g mol/h, forward %g g/h", r.ReverseSoluteMolPerH, r.ForwardSoluteGPerH)
	}
	// The reversible minimum of re-concentrating the leaving draw lies
	// between the leaving and the entering draw's π (the mean of a
	// monotone π over the water removed; Elimelech & Phillip 2011, Science
	// 333:712, for the integral), per m³ of water: 1 bar·m³ = 1e5 J.
	rm := r.RegenerationMinimum
	if rm == nil || !(rm.KWhPerM3Water*3.6e6 > r.DrawOut.OsmoticPressureBar*1e5*0.99 && rm.KWhPerM3Water*3.6e6 < rm.ConcentratePiBar*1e5) ||
		!(rm.KWhPerM3DilutedDraw < rm.KWhPerM3Water*rm.WaterRecovery*1.01) {
		t.Errorf("regeneration minimum %+v against π out %g bar", rm, r.DrawOut.OsmoticPressureBar)
	}
	// Regeneration per route for the same duty: every route reported,
	// RO (the draw's listed route, concentrate π ≈ 46 bar) the best, and
	// the make-up per m³ the reverse flux plus RO's loss.
	if len(r.Regeneration) != 6 || r.RegenerationBest != "ro" || r.DrawMakeUpGPerM3 == nil {
		t.Fatalf("regeneration: %d routes, best %q", len(r.Regeneration), r.RegenerationBest)
	}
	ro := r.Regeneration[0]
	if ro.Route != "ro" || !ro.Feasible || !(ro.EquivalentWorkKWhPerM3 > rm.KWhPerM3Water) || ro.RatioToMinimum <= 1 {
		t.Errorf("RO: %+v", ro)
	}
	// Make-up: NaCl restoring the more depleted of Na⁺ and Cl⁻ (both are
	// also in the feed, so one may be gained), per m³ of permeate; 58.4398
	// g/mol is the NaCl record's molar mass.
	lost := 0.0
	for _, x := range r.Exchange {
		if x.Species == "Na+" || x.Species == "Cl-" {
			lost = max(lost, -x.ToDrawMolPH)
		}
	}
	want := lost*58.4398/r.PermeateLPerH*1000 + ro.DrawLossGPerM3
	if got := *r.DrawMakeUpGPerM3; math.Abs(got-want) > 1e-9*want || !(ro.DrawLossGPerM3 > 0) {
		t.Errorf("make-up %g g/m³, want %g", got, want)
	}
	body := `{` + moduleBase + `, "feed": {"preset": "seawater", "flow_l_per_h": 80}, "target": {"recovery": ` + jsonNum(r.Recovery) + `}}`
	out, e = Dispatch(context.Background(), OpModule, []byte(body))
	if e != nil {
		t.Fatal(e)
	}
	var d ModuleResponse
	if err := jsonx.Unmarshal(out, &d); err != nil {
		t.Fatal(err)
	}
	if d.Mode != "design" || d.AreaM2 < 5*(1-1e-5) || d.AreaM2 > 5*(1+1e-5) {
		t.Errorf("design for recovery %g: %s %g m², want 5", r.Recovery, d.Mode, d.AreaM2)
	}
}

func jsonNum(v float64) string {
	b, _ := jsonx.Marshal(v)
	return string(b)
}

// TestModuleBadInput: every bad module request is the contract's error
// naming the field and its limit.
func TestModuleBadInput(t *testing.T) {
	feed := `"feed": {"preset": "seawater", "flow_l_per_h": 80}`
	for _, tc := range []struct{ body, field, limit string }{
		{`{` + moduleBase + `, ` + feed + `}`, "area_m2", ""},
		{`{` + moduleBase + `, ` + feed + `, "area_m2": 0}`, "area_m2", "> 0"},
		{`{` + moduleBase + `, ` + feed + `, "area_m2": -3}`, "area_m2", "> 0"},
		{`{` + moduleBase + `, ` + feed + `, "area_m2": 1, "target": {"recovery": 0.2}}`, "target", ""},
		{`{` + moduleBase + `, ` + feed + `, "target": {"recovery": 1.5}}`, "target.recovery", "< 1"},
		{`{` + moduleBase + `, ` + feed + `, "target": {"recovery": 0.6}}`, "target.recovery", "cap"},
		{`{` + moduleBase + `, ` + feed + `, "target": {}}`, "target", ""},
		{`{` + moduleBase + `, "feed": {"preset": "seawater", "flow_l_per_h": 0}, "area_m2": 1}`, "feed.flow_l_per_h", "> 0"},
		{`{` + moduleBase + `, "feed": {"preset": "seawater"}, "area_m2": 1}`, "feed.flow_l_per_h", "> 0"},
		{`{` + moduleBase + `, "area_m2": 1}`, "feed", ""},
		{`{` + moduleBase + `, ` + feed + `, "area_m2": 1, "flow": "sideways"}`, "flow", "counter"},
		{`{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 0.3, "unit": "mol/L", "flow_l_per_h": 40}, ` + feed + `, "area_m2": 1}`, "draw.concentration", "feed"},
		{`{` + moduleBase + `, ` + feed + `, "area_m2": 1, "draw_pressure_drop_bar_per_m2": -1}`, "draw_pressure_drop_bar_per_m2", "0"},
		{`{` + moduleBase + `, ` + feed + `, "area_m2": 1, "profile_points": 1}`, "profile_points", "2"},
		{`{` + moduleBase + `, ` + feed + `, "area_m2": 1, "regeneration": {"pump_efficiency": 0}}`, "regeneration.pump_efficiency", "0.1–1"},
		{`{` + moduleBase + `, ` + feed + `, "area_m2": 1, "regeneration": {"routes": ["ro", "freezing"]}}`, "regeneration.routes", "ro, "},
		{`{` + moduleBase + `, ` + feed + `, "area_m2": 1, "regeneration": {"nf_rejection_by_solute": {"NaCl": 1}}}`, "regeneration.nf_rejection_by_solute.NaCl", "< 1"},
	} {
		out, e := Dispatch(context.Background(), OpModule, []byte(tc.body))
		if e == nil {
			t.Errorf("%s: no error (%.200s)", tc.field, out)
			continue
		}
		lim, _ := e.Limit.(string)
		if e.Field != tc.field || !strings.Contains(lim, tc.limit) || e.Kind != KindInvalid {
			t.Errorf("%s: got field %q limit %q (%s)", tc.field, e.Field, lim, e.Message)
		}
	}
}
