package api

import (
	"context"
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// nonFiniteCases are the inputs of issue #15 item 3 that once reached the
// encoder as ±Inf (a 500, "json: unsupported value: +Inf"): each now is an
// invalid-input error naming the field and its limit.
var nonFiniteCases = []struct {
	name, op, body, field, limit string
}{
	{"sweep to 1e308", OpScreen, `{"candidates":["NaCl"],"sweep":{"variable":"concentration","from":0.1,"to":1e308,"points":3,"unit":"mol/L"}}`,
		"sweep.to", "0–100000"},
	{"custom price 1e308", OpScreen, `{"candidates":["X"],"custom_solutes":[{"id":"X","molar_mass_g_per_mol":100,"diffusivity_m2_per_s":1e-9,"solubility_mol_per_kg":5,"price_usd_per_kg_min":1,"price_usd_per_kg_max":1e308}]}`,
		"custom_solutes[0].price_usd_per_kg_max", "0–1000000 USD/kg"},
	{"ion molar mass 5e-324", OpScreen, `{"candidates":["NaCl"],"feed":{"ions":[{"symbol":"Na+","charge":1,"molar_mass_g_per_mol":5e-324,"mg_per_l":1000},{"symbol":"Cl-","charge":-1,"molar_mass_g_per_mol":35.45,"mg_per_l":1542}]}}`,
		"feed.ions[0].molar_mass_g_per_mol", "1–10000 g/mol"},
	{"custom molar mass 1e-320", OpScreen, `{"candidates":["X"],"custom_solutes":[{"id":"X","molar_mass_g_per_mol":1e-320,"diffusivity_m2_per_s":1e-9,"solubility_mol_per_kg":5}]}`,
		"custom_solutes[0].molar_mass_g_per_mol", "≥ 1 and < 10000000 g/mol"},
	{"concentration 1e308", OpOsmotic, `{"solute":"NaCl","concentration":1e308,"unit":"g/L"}`, "concentration", "0–100000"},
	{"weight 1e308", OpScreen, `{"candidates":["NaCl","KCl"],"weights":{"water_flux":1e308,"replenishment_cost":1e308}}`, "weights.replenishment_cost", "0–1000000"},
	{"basis 1e308 bar", OpScreen, `{"candidates":["NaCl"],"basis":{"kind":"osmotic-pressure","value":1e308,"unit":"bar"}}`, "basis.value", "> 0 and ≤ 10000 bar"},
	{"pi table 1e308", OpScreen, `{"candidates":["X"],"custom_solutes":[{"id":"X","molar_mass_g_per_mol":100,"diffusivity_m2_per_s":1e-9,"solubility_mol_per_kg":5,"pi_table":{"temperature_c":25,"unit":"mol/kg","points":[{"concentration":1,"osmotic_pressure_bar":10},{"concentration":1e308,"osmotic_pressure_bar":20}]}}]}`,
		"custom_solutes[0].pi_table.points[1]", ""},
}

func TestNonFiniteInputsRefusedByField(t *testing.T) {
	for _, tc := range nonFiniteCases {
		t.Run(tc.name, func(t *testing.T) {
			out, e := Dispatch(context.Background(), tc.op, []byte(tc.body))
			if e == nil || e.Kind != KindInvalid || e.Field != tc.field {
				t.Fatalf("%+v, want an invalid-input error on %s (%.200s)", e, tc.field, out)
			}
			if lim, _ := e.Limit.(string); tc.limit != "" && lim != tc.limit || lim == "" {
				t.Errorf("limit %q, want %q", e.Limit, tc.limit)
			}
			var eb ErrorBody
			if err := json.Unmarshal(out, &eb); err != nil || eb.Error == nil || eb.Error.Field != tc.field {
				t.Errorf("not the contract's error: %s", out)
			}
		})
	}
}

// A response holding ±Inf or NaN becomes the contract's error naming the
// result field (not a failed encoding or an internal error).
func TestNonFiniteResponseGuard(t *testing.T) {
	resp := &ScreenResponse{Candidates: []ScreenCandidate{{}, {}}}
	resp.Candidates[1].WaterFluxLMH = math.Inf(1)
	out, e := encodeResponse(resp)
	if e == nil || e.Kind != KindInvalid || !strings.Contains(e.Message, "candidates[1].water_flux_lmh") {
		t.Fatalf("%+v: want an invalid-input error naming candidates[1].water_flux_lmh", e)
	}
	var eb ErrorBody
	if err := json.Unmarshal(out, &eb); err != nil || eb.Error == nil || eb.Error.Message != e.Message {
		t.Errorf("not the contract's error: %s", out)
	}
	nan := math.NaN()
	if p := nonFinitePath(map[string]any{"a": []float64{1, 2}, "b": &struct {
		X *float64 `json:"x_bar"`
	}{&nan}}); p != "b.x_bar" {
		t.Errorf("path %q, want b.x_bar", p)
	}
	if p := nonFinitePath(&OsmoticResponse{OsmoticPressureBar: 3}); p != "" {
		t.Errorf("a finite response flagged at %q", p)
	}
}
