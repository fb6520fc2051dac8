package api

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"reflect"
	"strings"
	"testing"

	"drawsift/engine/internal/jsonx"
	"drawsift/engine/screen"
)

func screenOp(t *testing.T, body string) (*ScreenResponse, *Error) {
	t.Helper()
	out, e := Dispatch(context.Background(), OpScreen, []byte(body))
	if e != nil {
		return nil, e
	}
	var r ScreenResponse
	if err := json.Unmarshal(out, &r); err != nil {
		t.Fatalf("response does not decode: %v", err)
	}
	return &r, nil
}

func TestScreenDefaultsWholeLibrary(t *testing.T) {
	r, e := screenOp(t, `{"feed": {"preset": "seawater"}}`)
	if e != nil {
		t.Fatal(e)
	}
	if len(r.Candidates) < 15 {
		t.Fatalf("only %d ranked", len(r.Candidates))
	}
	if r.Orientation != "AL-FS" || r.EngineVersion != EngineVersion || r.Scenario == nil || len(r.Sources) == 0 || len(r.ModelChoices) == 0 || len(r.Cautions) == 0 {
		t.Errorf("reproducibility record incomplete: %+v", r)
	}
	// 2 × the seawater feed's π by default.
	if got := *r.Basis.TargetOsmoticPressureBar; math.Abs(got-2*r.FeedOsmoticPressureBar) > 1e-9*got {
		t.Errorf("default basis %g bar, feed %g bar", got, r.FeedOsmoticPressureBar)
	}
	c := r.Candidates[0]
	if c.Rank != 1 || c.ConcentrationMolPerL <= 0 || c.WaterFluxLMH <= 0 || c.ReplenishmentCostUSDPerM3 == nil || len(c.Contributions) == 0 {
		t.Errorf("first candidate incomplete: %+v", c)
	}
	// Cost = SRSF × price arithmetic at both ends of the range; a draw
	// that gains its own species net (the feed's Na⁺ entering with Cl⁻
	// against a CaCl2 draw whose Ca²⁺ stays) needs no replenishment.
	for _, c := range r.Candidates {
		if c.PriceUSDPerKgMin == nil {
			continue
		}
		want := math.Max(0, c.SpecificReverseSoluteFluxGPerL) * *c.PriceUSDPerKgMin
		if math.Abs(*c.ReplenishmentCostMinUSDPerM3-want) > 1e-9*want || (want == 0 && *c.ReplenishmentCostMinUSDPerM3 != 0) {
			t.Errorf("%s: cost %g, want %g", c.Solute, *c.ReplenishmentCostMinUSDPerM3, want)
		}
	}
}

// The ranking does not depend on the units the scenario is written in.
func TestScreenUnitInvariance(t *testing.T) {
	a := `{"feed": {"solute": "seawater", "concentration": 35, "unit": "g/kg"}, "candidates": ["NaCl","MgCl2","KCl","Na2SO4","glucose"], "basis": {"kind": "osmotic-pressure", "value": 60, "unit": "bar"}}`
	b := `{"feed": {"solute": "seawater", "concentration": 3.5, "unit": "wt%"}, "candidates": ["NaCl","MgCl2","KCl","Na2SO4","glucose"], "basis": {"kind": "osmotic-pressure", "value": 6, "unit": "MPa"}}`
	c := `{"feed": {"solute": "seawater", "concentration": 3.5, "unit": "wt%"}, "candidates": ["NaCl","MgCl2","KCl","Na2SO4","glucose"], "basis": {"kind": "osmotic-pressure", "value": 6000, "unit": "kPa"}}`
	var ranks [][]string
	var scores [][]float64
	for _, body := range []string{a, b, c} {
		r, e := screenOp(t, body)
		if e != nil {
			t.Fatal(e)
		}
		var ids []string
		var sc []float64
		for _, x := range r.Candidates {
			ids = append(ids, x.Solute)
			sc = append(sc, x.Score)
		}
		ranks = append(ranks, ids)
		scores = append(scores, sc)
	}
	for i := 1; i < len(ranks); i++ {
		if !reflect.DeepEqual(ranks[0], ranks[i]) {
			t.Errorf("ranking %v differs from %v", ranks[i], ranks[0])
		}
		for j := range scores[0] {
			if math.Abs(scores[0][j]-scores[i][j]) > 1e-9 {
				t.Errorf("score %g differs from %g", scores[i][j], scores[0][j])
			}
		}
	}
}

// A scenario round-trips through JSON unchanged, and the response echoes it.
func TestScenarioRoundTrip(t *testing.T) {
	body := []byte(`{"feed":{"preset":"brackish-groundwater"},"membrane":{"preset":"cta-asymmetric"},"orientation":"AL-FS","orientations":["AL-DS"],"temperature_c":20,"channel":{"height_mm":2,"width_mm":30,"length_mm":100,"crossflow_velocity_m_per_s":0.2,"spacer":true},"candidates":["NaCl","MgCl2","myDraw"],"custom_solutes":[{"id":"myDraw","molar_mass_g_per_mol":150,"ions":[{"symbol":"X+","charge":1,"count":1},{"symbol":"Y-","charge":-1,"count":1}],"solubility_mol_per_kg":3,"diffusivity_m2_per_s":1e-9,"price_usd_per_kg_min":1,"price_usd_per_kg_max":2,"source":"our own test record"}],"basis":{"kind":"osmotic-pressure","value":20,"unit":"bar"},"osmotic_model":"real","weights":{"replenishment_cost":0.5,"water_flux":0.5},"pareto_objectives":["water_flux","replenishment_cost"],"exclude_hazards":["toxic"],"regeneration_recovery":0.4,"uncertainty":{"samples":50,"b_rel_sd":0.2},"seed":42}`)
	var req ScreenRequest
	if err := jsonx.DecodeStrict(body, &req); err != nil {
		t.Fatal(err)
	}
	again, err := jsonx.Marshal(&req)
	if err != nil {
		t.Fatal(err)
	}
	var x, y any
	json.Unmarshal(body, &x)
	json.Unmarshal(again, &y)
	if !reflect.DeepEqual(x, y) {
		t.Errorf("round trip changed the scenario:\n%s\n%s", body, again)
	}
	r, e := screenOp(t, string(body))
	if e != nil {
		t.Fatal(e)
	}
	echo, _ := jsonx.Marshal(r.Scenario)
	var z any
	json.Unmarshal(echo, &z)
	if !reflect.DeepEqual(x, z) {
		t.Errorf("echo differs from the scenario:\n%s", echo)
	}
	found := false
	for _, c := range r.Candidates {
		found = found || c.Solute == "myDraw"
		if c.Robustness == nil || len(c.OtherOrientations) != 1 {
			t.Errorf("%s: robustness or AL-DS missing", c.Solute)
		}
	}
	if !found {
		t.Error("custom solute not ranked")
	}
}

func TestScreenSameSeedSameRobustness(t *testing.T) {
	body := `{"feed": {"preset": "seawater"}, "candidates": ["NaCl","MgCl2","KCl","CaCl2"], "uncertainty": {"samples": 200}, "seed": 7}`
	a, e := Dispatch(context.Background(), OpScreen, []byte(body))
	if e != nil {
		t.Fatal(e)
	}
	b, _ := Dispatch(context.Background(), OpScreen, []byte(body))
	if !bytes.Equal(a, b) {
		t.Error("same scenario and seed gave different responses")
	}
}

// Bad scenarios give the contract's error naming the field.
func TestScreenBadScenarios(t *testing.T) {
	for _, tc := range []struct {
		name, body, field string
	}{
		{"unknown solute", `{"candidates": ["NaCl", "unobtainium"]}`, "candidates[1]"},
		{"empty candidates", `{"candidates": []}`, "candidates"},
		{"weights zero", `{"weights": {"water_flux": 0}}`, "weights"},
		{"weights negative", `{"weights": {"water_flux": -1}}`, "weights.water_flux"},
		{"weights unknown", `{"weights": {"beauty": 1}}`, "weights.beauty"},
		{"unreachable basis", `{"candidates": ["K2SO4", "NaHCO3"], "basis": {"kind": "osmotic-pressure", "value": 300, "unit": "bar"}}`, "basis.value"},
		{"basis kind", `{"basis": {"kind": "vibes", "value": 1}}`, "basis.kind"},
		{"channel height", `{"candidates": ["NaCl"], "channel": {"height_mm": 0, "width_mm": 26, "length_mm": 77, "crossflow_velocity_m_per_s": 0.25}}`, "channel.height_mm"},
		{"channel in metres", `{"candidates": ["NaCl"], "channel": {"height_mm": 0.002, "width_mm": 26, "length_mm": 77000000, "crossflow_velocity_m_per_s": 0.25}}`, "channel.length_mm"},
		{"channel velocity", `{"candidates": ["NaCl"], "channel": {"height_mm": 1, "width_mm": 26, "length_mm": 77, "crossflow_velocity_m_per_s": -1}}`, "channel.crossflow_velocity_m_per_s"},
		{"basis unit", `{"basis": {"kind": "osmotic-pressure", "value": 1, "unit": "furlong"}}`, "basis.unit"},
		{"multiple without feed π", `{"basis": {"kind": "osmotic-pressure", "multiple_of_feed": 2}}`, "basis.multiple_of_feed"},
		{"unknown field", `{"candidate": ["NaCl"]}`, "candidate"},
		{"feed preset", `{"feed": {"preset": "lake"}}`, "feed.preset"},
		{"membrane preset", `{"membrane": {"preset": "brandx"}}`, "membrane.preset"},
		{"orientation", `{"orientation": "sideways"}`, "orientation"},
		{"hazard", `{"exclude_hazards": ["spicy"]}`, "exclude_hazards[0]"},
		{"samples", `{"uncertainty": {"samples": 0}}`, "uncertainty.samples"},
		{"shard count", `{"uncertainty": {"samples": 10, "shard": {"index": 0, "count": 65}}}`, "uncertainty.shard.count"},
		{"shard count past samples", `{"uncertainty": {"samples": 3, "shard": {"index": 0, "count": 4}}}`, "uncertainty.shard.count"},
		{"shard index", `{"uncertainty": {"samples": 10, "shard": {"index": 2, "count": 2}}}`, "uncertainty.shard.index"},
		{"shard index negative", `{"uncertainty": {"samples": 10, "shard": {"index": -1, "count": 2}}}`, "uncertainty.shard.index"},
		{"temperature", `{"temperature_c": 150}`, "temperature_c"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out, e := Dispatch(context.Background(), OpScreen, []byte(tc.body))
			if e == nil {
				t.Fatalf("no error for %s", tc.body)
			}
			if e.Field != tc.field {
				t.Errorf("field %q, want %q (%s)", e.Field, tc.field, e.Message)
			}
			var eb ErrorBody
			if err := json.Unmarshal(out, &eb); err != nil || eb.Error == nil || eb.Error.Message == "" {
				t.Errorf("not the contract's error object: %s", out)
			}
		})
	}
	for _, body := range []string{`{"candidates": [`, `not json`, ``} {
		if _, e := Dispatch(context.Background(), OpScreen, []byte(body)); e == nil || e.Kind != KindInvalid {
			t.Errorf("malformed %q: %v", body, e)
		}
	}
}

// A candidate that cannot be evaluated is reported with its reason while
// the rest completes.
func TestScreenExcludedReported(t *testing.T) {
	r, e := screenOp(t, `{"candidates": ["NaCl", "K2SO4", "KBr"], "basis": {"kind": "osmotic-pressure", "value": 45, "unit": "bar"}, "exclude_hazards": ["toxic"]}`)
	if e != nil {
		t.Fatal(e)
	}
	if len(r.Candidates) != 1 || len(r.Excluded) != 2 {
		t.Fatalf("ranked %d, excluded %d", len(r.Candidates), len(r.Excluded))
	}
	for _, x := range r.Excluded {
		if x.Reason == "" || !strings.Contains(x.Detail, x.Solute) {
			t.Errorf("exclusion without reason: %+v", x)
		}
	}
}

func TestScreenSweepAndWaterFluxBasis(t *testing.T) {
	r, e := screenOp(t, `{"feed": {"preset": "wastewater-effluent"}, "candidates": ["NaCl", "MgCl2"], "basis": {"kind": "water-flux", "value": 6, "unit": "LMH"},
		"sweep": {"variable": "concentration", "from": 0.1, "to": 1.5, "points": 8, "unit": "mol/L"}}`)
	if e != nil {
		t.Fatal(e)
	}
	for _, c := range r.Candidates {
		if math.Abs(c.WaterFluxLMH-6) > 1e-6 {
			t.Errorf("%s: %g LMH, want 6", c.Solute, c.WaterFluxLMH)
		}
	}
	if len(r.Sweep) != 2 || len(r.Sweep[0].Points) != 8 || r.Sweep[0].Points[0].WaterFluxLMH == nil {
		t.Fatalf("sweep malformed: %+v", r.Sweep)
	}
}

// A custom solute with a pasted, measured π table is screened with the
// table's osmotic pressure (monotone interpolation), and a malformed table
// is an error naming the point.
func TestScreenCustomPiTable(t *testing.T) {
	body := `{"candidates":["NaCl","poly"],"basis":{"kind":"osmotic-pressure","value":20,"unit":"bar"},
		"custom_solutes":[{"id":"poly","molar_mass_g_per_mol":20000,"diffusivity_m2_per_s":1e-10,"solubility_mol_per_kg":0.05,
		"pi_table":{"temperature_c":25,"unit":"g/L","points":[{"concentration":100,"osmotic_pressure_bar":5},
		{"concentration":200,"osmotic_pressure_bar":15},{"concentration":300,"osmotic_pressure_bar":32}]}}]}`
	m, e := dispatch(t, OpScreen, body)
	if e != nil {
		t.Fatal(e)
	}
	found := false
	for _, c := range m["candidates"].([]any) {
		c := c.(map[string]any)
		if c["solute"] == "poly" {
			found = true
			if g := c["concentration_g_per_l"].(float64); !(g > 200 && g < 300) {
				t.Errorf("20 bar lies between the 200 and 300 g/L points; got %g g/L", g)
			}
		}
	}
	if !found {
		t.Errorf("custom table solute not ranked: %v", m["excluded"])
	}
	bad := strings.Replace(body, `"osmotic_pressure_bar":15`, `"osmotic_pressure_bar":3`, 1)
	_, e = dispatch(t, OpScreen, bad)
	if e == nil || e.Field != "custom_solutes[0].pi_table.points[1]" {
		t.Errorf("non-increasing table: %+v", e)
	}
}

// A candidate that fails a hard limit in some Monte Carlo samples is not
// counted as ranked in them: P(first) = 1 − failed fraction when it is
// alone (regression: failed samples once counted as first).
func TestRobustnessFailedSamples(t *testing.T) {
	// The target is 98 % of NaHCO3's π at its solubility, so every sample
	// whose π factor falls below 0.98 cannot reach it: with a 5 % spread
	// about a third of the samples fail by construction.
	sat, e := dispatch(t, OpOsmotic, `{"solute":"NaHCO3","concentration":0.1,"unit":"mol/kg"}`)
	if e != nil {
		t.Fatal(e)
	}
	// NaHCO3's Pitzer data end at 1 mol/kg, below its solubility, and no
	// saturated water activity is on record: the osmotic request needs the
	// same switch as the screen below.
	top, e := dispatch(t, OpOsmotic, fmt.Sprintf(`{"solute":"NaHCO3","concentration":%v,"unit":"mol/kg","allow_extrapolation":true}`, sat["solubility_mol_per_kg"]))
	if e != nil {
		t.Fatal(e)
	}
	target := 0.98 * top["osmotic_pressure_bar"].(float64)
	m, e := dispatch(t, OpScreen, fmt.Sprintf(`{"feed":{"preset":"seawater"},"candidates":["NaHCO3"],"allow_extrapolation":true,
		"basis":{"kind":"osmotic-pressure","value":%v,"unit":"bar"},"uncertainty":{"samples":300,"osmotic_rel_sd":0.05},"seed":7}`, target))
	if e != nil {
		t.Fatal(e)
	}
	c := m["candidates"].([]any)[0].(map[string]any)
	r := c["robustness"].(map[string]any)
	failed, first := r["failed_fraction"].(float64), r["probability_first"].(float64)
	if !(failed > 0.1 && failed < 0.7) {
		t.Fatalf("failed fraction %v; the construction should fail about a third of the samples", failed)
	}
	if math.Abs(first-(1-failed)) > 1e-12 {
		t.Errorf("P(first) = %v with %v of samples failed; want %v", first, failed, 1-failed)
	}
}

// B = 0 is a valid input (an ideal, solute-tight membrane): with a preset
// it is taken as the NaCl B, with b_nacl_lmh beside it as every
// candidate's B; neither is replaced by an estimate.
func TestScreenZeroB(t *testing.T) {
	for _, body := range []string{
		`{"membrane":{"preset":"tfc-standard","b_lmh":0},"candidates":["NaCl","MgCl2"]}`,
		`{"membrane":{"a_lmh_per_bar":1,"s_um":500,"b_nacl_lmh":0.3,"b_lmh":0},"candidates":["NaCl","MgCl2"]}`,
	} {
		m, e := dispatch(t, OpScreen, body)
		if e != nil {
			t.Fatalf("%s: %v", body, e)
		}
		for _, c := range m["candidates"].([]any) {
			c := c.(map[string]any)
			if b := c["b_lmh"].(float64); b != 0 {
				t.Errorf("%s: %s has B = %v, want 0", body, c["solute"], b)
			}
			if srsf := c["specific_reverse_solute_flux_g_per_l"].(float64); srsf != 0 {
				t.Errorf("%s: %s SRSF = %v with B = 0", body, c["solute"], srsf)
			}
		}
	}
}

// A preset whose π comes from its ion list holds those ions for real
// (species by identity, issue #11): a NaCl draw's Na⁺ and Cl⁻ meet the
// feed's and partly come back, so its net SRSF lies between that against a
// NaCl feed of the same π (all of its salt shared) and that against a
// foreign solute of the same π and B (glucose given the membrane's NaCl B:
// nothing shared). Our own cases.
func TestScreenSurrogateFeed(t *testing.T) {
	srsf := func(feed string) (float64, float64) {
		m, e := dispatch(t, OpScreen, `{"membrane":{"preset":"tfc-standard","b_by_solute_lmh":{"glucose":0.2988}},"feed":`+feed+`,"candidates":["NaCl"]}`)
		if e != nil {
			t.Fatal(e)
		}
		c := m["candidates"].([]any)[0].(map[string]any)
		return c["specific_reverse_solute_flux_g_per_l"].(float64), m["feed_osmotic_pressure_bar"].(float64)
	}
	preset, piP := srsf(`{"preset":"brackish-groundwater"}`)
	kcl, piK := srsf(`{"solute":"glucose","concentration":0.0655,"unit":"mol/L"}`)
	same, _ := srsf(`{"solute":"NaCl","concentration":0.0352,"unit":"mol/L"}`)
	if math.Abs(piP/piK-1) > 0.03 {
		t.Fatalf("feeds differ in π: %g vs %g bar", piP, piK)
	}
	if !(same < preset && preset < kcl) {
		t.Errorf("NaCl SRSF: preset feed %g, glucose feed %g, NaCl feed %g g/L", preset, kcl, same)
	}
}

// With van 't Hoff π the Pitzer data limit does not exclude a candidate
// (its model is not used for π); a miscible solute that cannot reach the
// target is "cannot reach", not "insoluble".
func TestScreenExclusionReasons(t *testing.T) {
	m, e := dispatch(t, OpScreen, `{"candidates":["KHCO3","NaCl"],"osmotic_model":"van-t-hoff","basis":{"kind":"osmotic-pressure","value":60,"unit":"bar"}}`)
	if e != nil {
		t.Fatal(e)
	}
	for _, x := range m["excluded"].([]any) {
		if x := x.(map[string]any); x["solute"] == "KHCO3" && strings.Contains(fmt.Sprint(x["reason"]), "validity") {
			t.Errorf("KHCO3 excluded on model validity in van 't Hoff mode: %v", x)
		}
	}
	m, e = dispatch(t, OpScreen, `{"candidates":["glycerol","NaCl"],"basis":{"kind":"osmotic-pressure","value":900,"unit":"bar"},"allow_extrapolation":true}`)
	if e != nil {
		// every candidate failed: the error lists the reasons
		if !strings.Contains(e.Message, "glycerol: cannot reach the basis target") {
			t.Errorf("miscible solute's reason: %v", e)
		}
		return
	}
	for _, x := range m["excluded"].([]any) {
		if x := x.(map[string]any); x["solute"] == "glycerol" && x["reason"] != "cannot reach the basis target" {
			t.Errorf("glycerol excluded as %v", x["reason"])
		}
	}
}

// Regeneration at a recovery that would dilute the draw below the feed's π
// is flagged (FO cannot get there); at 2.5 × the feed's π and 50 % it is not.
func TestScreenRegenerationBelowFeedWarning(t *testing.T) {
	has := func(body string) bool {
		m, e := dispatch(t, OpScreen, body)
		if e != nil {
			t.Fatal(e)
		}
		return strings.Contains(fmt.Sprint(m["warnings"]), "regeneration: at 50 % recovery")
	}
	if !has(`{"feed":{"preset":"seawater"},"candidates":["NaCl"],"basis":{"kind":"osmotic-pressure","value":40,"unit":"bar"}}`) {
		t.Error("no warning for a draw diluted below the feed's π")
	}
	if has(`{"feed":{"preset":"seawater"},"candidates":["NaCl"],"basis":{"kind":"osmotic-pressure","multiple_of_feed":2.5}}`) {
		t.Error("warning where the diluted draw stays above the feed's π")
	}
}

// Estimated B values carry their own error in the robustness run: with the
// default spread the ranks mix clearly more than with none (the membrane's
// shared B factor alone cannot reorder candidates; seeded, so the counts
// are fixed).
func TestRobustnessEstimatedB(t *testing.T) {
	width := func(sd string) int {
		m, e := dispatch(t, OpScreen, `{"feed":{"preset":"brackish-groundwater"},"candidates":["NaCl","KCl","MgCl2","CaCl2","Na2SO4","NH4Cl"],
			"uncertainty":{"samples":400`+sd+`},"seed":3}`)
		if e != nil {
			t.Fatal(e)
		}
		w := 0
		for _, c := range m["candidates"].([]any) {
			r := c.(map[string]any)["robustness"].(map[string]any)
			w += int(r["rank_p95"].(float64) - r["rank_p05"].(float64))
		}
		return w
	}
	if none, dflt := width(`,"estimated_b_rel_sd":0`), width(``); !(2*dflt > 3*none) {
		t.Errorf("summed 5–95 %% rank widths: %d with the default estimated-B spread, %d without", dflt, none)
	}
}

// A robustness run past its work budget (ranked candidates × samples) is
// refused before it starts, naming uncertainty.samples and the most
// samples the scenario's candidates allow.
func TestRobustnessWorkBudget(t *testing.T) {
	var cs, ids []string
	for i := 0; i < 45; i++ {
		id := fmt.Sprintf("X%d", i)
		cs = append(cs, fmt.Sprintf(`{"id":%q,"molar_mass_g_per_mol":%d,"van_t_hoff_factor":2,"diffusivity_m2_per_s":1e-9,"miscible":true}`, id, 60+i))
		ids = append(ids, fmt.Sprintf("%q", id))
	}
	body := `{"custom_solutes":[` + strings.Join(cs, ",") + `],"candidates":["NaCl","KCl","MgCl2",` + strings.Join(ids, ",") + `],
		"uncertainty":{"samples":100000}}`
	_, e := dispatch(t, OpScreen, body)
	if e == nil || e.Field != "uncertainty.samples" || !strings.Contains(fmt.Sprint(e.Limit), "candidates × samples") {
		t.Fatalf("%+v, want the work budget on uncertainty.samples", e)
	}
	var most int
	fmt.Sscanf(fmt.Sprint(e.Limit), "≤ %d", &most)
	if most != screen.MaxRobustWork/48 {
		t.Errorf("limit %v, want ≤ %d for 48 candidates", e.Limit, screen.MaxRobustWork/48)
	}
}
