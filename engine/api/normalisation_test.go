package api

import (
	"math"
	"strings"
	"testing"
)

// TestScoreReferenceNormalisation: with "score_normalisation": "reference"
// a candidate's score does not depend on which others are screened, NaCl
// (the reference draw) scores 0.5 on every metric, and the reference and
// its rule are recorded; the default stays the set's min–max and is
// recorded as "set".
func TestScoreReferenceNormalisation(t *testing.T) {
	const base = `{"feed": {"preset": "seawater"}, "membrane": {"preset": "tfc-standard"}, "basis": {"kind": "osmotic-pressure", "value": 50, "unit": "bar"}`
	full, e := screenOp(t, base+`, "score_normalisation": "reference", "candidates": ["NaCl", "KCl", "MgCl2", "CaCl2", "glucose", "sucrose", "Na2SO4"]}`)
	if e != nil {
		t.Fatal(e)
	}
	few, e := screenOp(t, base+`, "score_normalisation": "reference", "candidates": ["KCl", "MgCl2"]}`)
	if e != nil {
		t.Fatal(e)
	}
	if full.ScoreNormalisation != "reference" || full.ScoreReference == nil || full.ScoreReference.Solute != "NaCl" || len(full.ScoreReference.Values) == 0 {
		t.Fatalf("reference not recorded: %q %+v", full.ScoreNormalisation, full.ScoreReference)
	}
	if !strings.Contains(full.ModelChoices["normalisation"], "NaCl") {
		t.Errorf("model choice: %q", full.ModelChoices["normalisation"])
	}
	score := func(r *ScreenResponse, id string) float64 {
		for _, c := range r.Candidates {
			if c.Solute == id {
				return c.Score
			}
		}
		t.Fatalf("%s not ranked", id)
		return 0
	}
	for _, id := range []string{"KCl", "MgCl2"} {
		if a, b := score(full, id), score(few, id); math.Abs(a-b) > 1e-12 {
			t.Errorf("%s scores %.15g among seven, %.15g among two", id, a, b)
		}
	}
	for _, c := range full.Candidates {
		if c.Solute != "NaCl" {
			continue
		}
		for k, v := range c.Normalised {
			if math.Abs(v-0.5) > 1e-9 {
				t.Errorf("NaCl, the reference, normalised %s = %g, want 0.5", k, v)
			}
		}
		if math.Abs(c.Score-0.5) > 1e-9 {
			t.Errorf("NaCl scores %g, want 0.5", c.Score)
		}
	}
	// The default is the set's min–max, and says so; "set" is the same.
	def, e := screenOp(t, base+`, "candidates": ["NaCl", "KCl", "MgCl2"]}`)
	if e != nil {
		t.Fatal(e)
	}
	set, e := screenOp(t, base+`, "score_normalisation": "set", "candidates": ["NaCl", "KCl", "MgCl2"]}`)
	if e != nil {
		t.Fatal(e)
	}
	if def.ScoreNormalisation != "set" || def.ScoreReference != nil {
		t.Errorf("default normalisation %q, reference %+v", def.ScoreNormalisation, def.ScoreReference)
	}
	for i := range def.Candidates {
		if def.Candidates[i].Score != set.Candidates[i].Score || def.Candidates[i].Solute != set.Candidates[i].Solute {
			t.Errorf("row %d: default %+v, set %+v", i, def.Candidates[i].Solute, set.Candidates[i].Solute)
		}
	}
	if _, e := screenOp(t, base+`, "score_normalisation": "absolute"}`); e == nil || e.Field != "score_normalisation" {
		t.Errorf("an unknown normalisation: %+v", e)
	}
}
