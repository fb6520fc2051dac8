package api

import (
	"context"
	"drawsift/engine/limits"
	"encoding/json"
	"strings"
	"testing"
)

// The defaults operation lists every range of the table with its default,
// and the values a request gets when it omits them are those defaults.
func TestDefaultsOperation(t *testing.T) {
	out, e := Dispatch(context.Background(), OpDefaults, nil)
	if e != nil {
		t.Fatal(e)
	}
	var d DefaultsResponse
	if err := json.Unmarshal(out, &d); err != nil {
		t.Fatal(err)
	}
	if len(d.Limits) != len(limits.Ranges()) {
		t.Errorf("%d limits, want %d", len(d.Limits), len(limits.Ranges()))
	}
	tc := d.Limits["temperature_c"]
	if tc.Default == nil || *tc.Default != 25 || tc.Text != "0–100 °C" {
		t.Errorf("temperature_c: %+v", tc)
	}
	if r := d.Limits["regeneration_recovery"]; r.Default == nil || *r.Default != 0.5 || !r.MinExclusive || *r.Max != 0.95 {
		t.Errorf("regeneration_recovery: %+v", r)
	}
	if d.Weights["water_flux"] != 0.25 || len(d.ParetoObjectives) != 3 || d.MembranePreset != "tfc-standard" || len(d.HazardFlags) == 0 {
		t.Errorf("defaults: %+v", d)
	}
	// A screen that omits the recovery reports the energy at the default.
	resp, e := Screen(context.Background(), &ScreenRequest{Candidates: []Candidate{{ID: "NaCl"}}}, nil)
	if e != nil {
		t.Fatal(e)
	}
	if got := resp.ModelChoices["regeneration_energy"]; got == "" || !strings.Contains(got, "50 %") {
		t.Errorf("regeneration model choice %q, want the default 50 %%", got)
	}
}

// A batch answers each item, one failure not stopping the rest, and
// reports progress per item.
func TestBatchOperation(t *testing.T) {
	body := `[{"op":"osmotic","body":{"solute":"NaCl","concentration":1,"unit":"mol/kg"}},
		{"op":"screen","body":{}},
		{"op":"osmotic","body":{"solute":"NaCl","concentration":-1,"unit":"mol/kg"}}]`
	var calls int
	out, e := DispatchProgress(context.Background(), OpBatch, []byte(body), func(done, total int) { calls++ })
	if e != nil {
		t.Fatal(e)
	}
	var res []struct {
		OK     bool            `json:"ok"`
		Result json.RawMessage `json:"result"`
	}
	if err := json.Unmarshal(out, &res); err != nil {
		t.Fatal(err)
	}
	if len(res) != 3 || !res[0].OK || res[1].OK || res[2].OK || calls != 3 {
		t.Fatalf("batch: %s (progress calls %d)", out, calls)
	}
	var eb ErrorBody
	if err := json.Unmarshal(res[1].Result, &eb); err != nil || eb.Error.Field != "batch[1].op" {
		t.Errorf("item 1: %s", res[1].Result)
	}
	if _, e := Dispatch(context.Background(), OpBatch, []byte(`{"op":"osmotic"}`)); e == nil || e.Field != "batch" {
		t.Errorf("a batch that is not a list: %v", e)
	}
}
