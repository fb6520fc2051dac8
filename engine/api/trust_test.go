package api

import (
	"slices"
	"testing"
)

func trustCodes(c ScreenCandidate) []string {
	var out []string
	for _, m := range c.Trust {
		out = append(out, m.Code)
	}
	return out
}

// TestScreenTrustMarks: each ranked row says what makes it less certain.
// NH4HCO3 has no non-ideal model in the library (a speciating system:
// van 't Hoff only, data/solutes.json); KCl and NaCl have measured B on
// the standard TFC preset and Pitzer models, so they carry none of those
// marks; a blend is transported as one solute; an ideal-model screen marks
// every row.
func TestScreenTrustMarks(t *testing.T) {
	r, e := screenOp(t, `{"feed": {"preset": "seawater"}, "membrane": {"preset": "tfc-standard"},
		"candidates": ["NaCl", "NH4HCO3", "glucose", {"id": "mix", "blend": [{"solute": "NaCl", "mole_fraction": 0.5}, {"solute": "KCl", "mole_fraction": 0.5}]}],
		"basis": {"kind": "osmotic-pressure", "value": 50, "unit": "bar"}}`)
	if e != nil {
		t.Fatal(e)
	}
	by := map[string][]string{}
	for _, c := range r.Candidates {
		if c.Trust == nil {
			t.Errorf("%s: trust is null, want a list", c.Solute)
		}
		for _, m := range c.Trust {
			if m.Text == "" {
				t.Errorf("%s: mark %s has no text", c.Solute, m.Code)
			}
		}
		by[c.Solute] = trustCodes(c)
	}
	if !slices.Contains(by["NH4HCO3"], "van-t-hoff") {
		t.Errorf("NH4HCO3 marks %v, want van-t-hoff", by["NH4HCO3"])
	}
	if slices.Contains(by["NaCl"], "van-t-hoff") || slices.Contains(by["NaCl"], "blend") || slices.Contains(by["NaCl"], "ideal-model") {
		t.Errorf("NaCl marks %v", by["NaCl"])
	}
	if !slices.Contains(by["mix"], "blend") {
		t.Errorf("blend marks %v, want blend", by["mix"])
	}
	for s, codes := range by {
		if hasB := slices.Contains(codes, "b-estimated"); hasB != rowBEstimated(r, s) {
			t.Errorf("%s: b-estimated mark %v, b_estimated %v", s, hasB, !hasB)
		}
	}
	v, e := screenOp(t, `{"feed": {"preset": "seawater"}, "candidates": ["NaCl", "KCl"], "osmotic_model": "van-t-hoff"}`)
	if e != nil {
		t.Fatal(e)
	}
	for _, c := range v.Candidates {
		if !slices.Contains(trustCodes(c), "ideal-model") {
			t.Errorf("van 't Hoff screen, %s marks %v", c.Solute, trustCodes(c))
		}
	}
	if len(TrustCodes()) == 0 {
		t.Error("no trust codes listed")
	}
}

func rowBEstimated(r *ScreenResponse, id string) bool {
	for _, c := range r.Candidates {
		if c.Solute == id {
			return c.BEstimated
		}
	}
	return false
}
