package api

import (
	"context"
	"encoding/json"
	"fmt"
	"strings"
	"testing"
)

// Where solute moves from the feed into the draw, flux efficiency can
// exceed 1, SRSF turn negative and the flow run against the bulk
// difference (issue #15 item 6): each such answer carries a warning saying
// why. (MgCl2 draw, glucose feed with a permeable B — a neutral feed
// solute crosses on its own, where a feed salt sharing the draw's Cl⁻
// would be held back by it; our own cases.)
func TestFluxFeedToDrawAnomaliesWarn(t *testing.T) {
	flux := func(feedC float64, extra string) (map[string]any, []string) {
		body := fmt.Sprintf(`{"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500},"draw":{"solute":"MgCl2","concentration":0.35,"unit":"mol/L"},"feed":{"solute":"glucose","concentration":%g,"unit":"mol/L"}%s}`, 1.6*feedC, extra)
		out, e := Dispatch(context.Background(), OpFlux, []byte(body))
		if e != nil {
			t.Fatalf("%s: %v", body, e)
		}
		var m map[string]any
		if err := json.Unmarshal(out, &m); err != nil {
			t.Fatal(err)
		}
		var ws []string
		for _, w := range m["warnings"].([]any) {
			ws = append(ws, w.(string))
		}
		return m, ws
	}
	has := func(ws []string, parts ...string) bool {
		for _, w := range ws {
			ok := true
			for _, p := range parts {
				ok = ok && strings.Contains(w, p)
			}
			if ok {
				return true
			}
		}
		return false
	}
	m, ws := flux(0.5, `,"b_feed_lmh":50`)
	if eff := m["flux_efficiency"].(float64); !(eff > 1) || !has(ws, "flux_efficiency", "is above 1", "glucose crosses from the feed into the draw") {
		t.Errorf("flux efficiency %v: warnings %q", eff, ws)
	}
	m, ws = flux(0.56, `,"b_feed_lmh":50,"orientation":"AL-DS"`)
	if jw := m["water_flux_lmh"].(float64); !(jw > 0) || !has(ws, "water flows from feed to draw although the bulk feed's osmotic pressure", "glucose crossing") {
		t.Errorf("forward flow against the bulk difference (Jw %v): warnings %q", jw, ws)
	}
	m, ws = flux(0.3, `,"b_feed_lmh":1,"delta_p_bar":15`)
	if jw, srsf := m["water_flux_lmh"].(float64), m["specific_reverse_solute_flux_g_per_l"].(float64); !(jw < 0 && srsf < 0) ||
		!has(ws, "reverse flow although the bulk draw's osmotic pressure exceeds the feed's", "hydraulic pressure") || !has(ws, "specific reverse solute flux is negative") {
		t.Errorf("reverse flow (Jw %v, SRSF %v): warnings %q", jw, srsf, ws)
	}
	// An ordinary answer carries none of them.
	_, ws = flux(0.1, `,"b_feed_lmh":0.5`)
	if has(ws, "is above 1") || has(ws, "although") || has(ws, "is negative") {
		t.Errorf("an ordinary flux warns of an anomaly: %q", ws)
	}
}

// The screen says the same where a feed solute crossing into the draw
// puts a candidate's flux efficiency above 1 (a glucose feed through a
// membrane given a high glucose B; our own case).
func TestScreenFeedToDrawEfficiencyWarns(t *testing.T) {
	resp, e := Screen(context.Background(), mustScreenRequest(t, `{"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500,"b_by_solute_lmh":{"glucose":50}},"feed":{"solute":"glucose","concentration":0.8,"unit":"mol/L"},"candidates":["MgCl2"],"basis":{"kind":"osmotic-pressure","multiple_of_feed":1.1}}`), nil)
	if e != nil {
		t.Fatal(e)
	}
	c := resp.Candidates[0]
	found := false
	for _, w := range c.Warnings {
		found = found || strings.Contains(w, "flux_efficiency") && strings.Contains(w, "glucose crosses from the feed into the draw")
	}
	if !(c.FluxEfficiency > 1) || !found {
		t.Errorf("flux efficiency %v: warnings %q", c.FluxEfficiency, c.Warnings)
	}
}

func mustScreenRequest(t *testing.T, body string) *ScreenRequest {
	t.Helper()
	var r ScreenRequest
	if e := decode([]byte(body), &r); e != nil {
		t.Fatal(e)
	}
	return &r
}
