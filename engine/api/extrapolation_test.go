package api

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// No silent extrapolation (issue #10, item 5). NaHCO3's Pitzer data end at
// 1 mol/kg (the record's max_molality_mol_per_kg), below its solubility
// (1.22 mol/kg at 25 °C), and no saturated-solution water activity is on
// record: the osmotic and flux operations refuse a concentration there,
// naming the field and the limit in the request's unit, unless the request
// sets allow_extrapolation; then the result is computed and flagged.
func TestOsmoticRefusesPastData(t *testing.T) {
	for _, tc := range []struct {
		body, limit string
	}{
		{`{"solute":"NaHCO3","concentration":1.1,"unit":"mol/kg"}`, "1 mol/kg"},
		{`{"solute":"NaHCO3","concentration":8.5,"unit":"wt%"}`, "7.75 wt%"}, // 1 mol/kg at 84.0058 g/mol: 100·84.0058/1084.0058 = 7.7496, to 4 figures
	} {
		_, e := dispatch(t, OpOsmotic, tc.body)
		if e == nil || e.Field != "concentration" || e.Kind != KindInvalid || fmt.Sprint(e.Limit) != tc.limit {
			t.Errorf("%s: %+v, want a refusal on concentration with limit %s", tc.body, e, tc.limit)
			continue
		}
		if !strings.Contains(e.Message, "allow_extrapolation") {
			t.Errorf("%s: message %q does not name the switch", tc.body, e.Message)
		}
		on := strings.Replace(tc.body, "}", `,"allow_extrapolation":true}`, 1)
		m, e := dispatch(t, OpOsmotic, on)
		if e != nil {
			t.Errorf("%s: %v", on, e)
			continue
		}
		if !anyContains(m["warnings"], "extrapolated") {
			t.Errorf("%s: warnings %v, want the extrapolation flagged", on, m["warnings"])
		}
	}
}

// LiCl is bridged to the measured saturated solution (Greenspan 1977,
// 11.30 % RH at 25 °C, as the CRC Handbook's constant-humidity table
// gives it): accepted without the switch, flagged, and at saturation the
// water activity is the measurement's (± 0.0027, Greenspan's stated
// uncertainty, from memory).
func TestOsmoticBridged(t *testing.T) {
	m, e := dispatch(t, OpOsmotic, `{"solute":"LiCl","concentration":19.94,"unit":"mol/kg"}`)
	if e != nil {
		t.Fatal(e)
	}
	if aw := m["water_activity"].(float64); math.Abs(aw-0.1130) > 0.0027 {
		t.Errorf("LiCl saturated: a_w = %.4f, want 0.1130 ± 0.0027", aw)
	}
	if !anyContains(m["warnings"], "measured saturated solution") {
		t.Errorf("warnings %v, want the bridge flagged", m["warnings"])
	}
	if _, ok := m["mean_activity_coefficient"]; ok {
		t.Errorf("γ± reported on the bridge")
	}
}

func TestFluxRefusesPastData(t *testing.T) {
	const mem = `"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500}`
	for _, tc := range []struct {
		body, field, limit string
	}{
		{`{` + mem + `,"draw":{"solute":"NaHCO3","concentration":1.1,"unit":"mol/kg"}}`, "draw.concentration", "1 mol/kg"},
		{`{` + mem + `,"draw":{"solute":"MgCl2","concentration":1,"unit":"mol/L"},"feed":{"solute":"KHCO3","concentration":2,"unit":"mol/kg"},"b_feed_lmh":0.5}`, "feed.concentration", "1 mol/kg"},
	} {
		_, e := dispatch(t, OpFlux, tc.body)
		if e == nil || e.Field != tc.field || fmt.Sprint(e.Limit) != tc.limit {
			t.Errorf("%s: %+v, want a refusal on %s with limit %s", tc.body, e, tc.field, tc.limit)
		}
		on := strings.Replace(tc.body, "{"+mem, "{"+mem+`,"allow_extrapolation":true`, 1)
		m, e := dispatch(t, OpFlux, on)
		if e != nil {
			t.Errorf("%s: %v", on, e)
			continue
		}
		if jw, ok := m["water_flux_lmh"].(float64); !ok || math.IsNaN(jw) {
			t.Errorf("%s: water flux %v", on, m["water_flux_lmh"])
		}
		if !anyContains(m["warnings"], "extrapolated") {
			t.Errorf("%s: warnings %v, want the extrapolation flagged", on, m["warnings"])
		}
	}
	// The van 't Hoff model does not use the osmotic model's data.
	if _, e := dispatch(t, OpFlux, `{`+mem+`,"osmotic_model":"van-t-hoff","draw":{"solute":"NaHCO3","concentration":1.1,"unit":"mol/kg"}}`); e != nil {
		t.Errorf("van 't Hoff flux refused: %v", e)
	}
}

func anyContains(list any, sub string) bool {
	ws, _ := list.([]any)
	for _, w := range ws {
		if s, ok := w.(string); ok && strings.Contains(s, sub) {
			return true
		}
	}
	return false
}

// The screen's allow_extrapolation has the same meaning: a candidate
// needed on the bridge to its measured saturated solution is ranked
// (flagged) without the switch; one needed past its data with no
// measurement is excluded for validity.
func TestScreenBridge(t *testing.T) {
	m, e := dispatch(t, OpScreen, `{"feed":{"solute":"NaCl","concentration":0.1,"unit":"mol/L"},"candidates":["LiCl","NaHCO3"],
		"basis":{"kind":"concentration","value":1.1,"unit":"mol/kg"}}`)
	if e != nil {
		t.Fatal(e)
	}
	cs, _ := m["candidates"].([]any)
	ex, _ := m["excluded"].([]any)
	if len(cs) != 1 || cs[0].(map[string]any)["solute"] != "LiCl" || len(ex) != 1 || ex[0].(map[string]any)["solute"] != "NaHCO3" {
		t.Fatalf("candidates %v, excluded %v: want LiCl ranked (within its data) and NaHCO3 excluded", cs, ex)
	}
	m, e = dispatch(t, OpScreen, `{"feed":{"solute":"NaCl","concentration":0.1,"unit":"mol/L"},"candidates":["LiCl"],
		"basis":{"kind":"concentration","value":12,"unit":"mol/kg"}}`)
	if e != nil {
		t.Fatal(e)
	}
	cs, _ = m["candidates"].([]any)
	if len(cs) != 1 {
		t.Fatalf("LiCl at 12 mol/kg (on the bridge): candidates %v, excluded %v", cs, m["excluded"])
	}
	if !anyContains(cs[0].(map[string]any)["warnings"], "measured saturated solution") && !anyContains(m["warnings"], "measured saturated solution") {
		t.Errorf("LiCl on the bridge not flagged: %v / %v", cs[0].(map[string]any)["warnings"], m["warnings"])
	}
}
