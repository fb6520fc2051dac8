package api

import (
	"context"
	"strings"
	"testing"
)

// Decoding is strict under either JSON library (run also with -tags
// stdjson): a null body never screens the whole library, a repeated key
// is refused rather than the last one winning, and keys match exactly
// (no case-insensitive or Unicode-fold matching).
func TestDispatchStrictDecoding(t *testing.T) {
	for _, tc := range []struct{ op, body, field, msg string }{
		{OpScreen, `null`, "", "null"},
		{OpOsmotic, "\n null ", "", "null"},
		{OpBatch, `null`, "batch", "null"},
		{OpBatch, `[{"op":"osmotic","body":null}]`, "", ""}, // the item fails, the batch answers
		{OpScreen, `{"candidates":["NaCl"],"candidates":["KCl"]}`, "candidates", "duplicate key"},
		{OpScreen, `{"candidates":["NaCl"],"membrane":{"preset":"tfc-standard","preset":"cta"}}`, "membrane.preset", "duplicate key"},
		{OpScreen, `{"candidates":["NaCl"],"weights":{"water_flux":1,"water_flux":0}}`, "weights.water_flux", "duplicate key"},
		{OpScreen, `{"Candidates":["NaCl"]}`, "Candidates", `did you mean "candidates"`},
		{OpOsmotic, `{"ſolute":"NaCl","concentration":1,"unit":"mol/kg"}`, "ſolute", "unknown field"},
		{OpOsmotic, `{"solute":"NaCl","concentration":1,"UNIT":"mol/kg"}`, "UNIT", `did you mean "unit"`},
		{OpScreen, `{"candidates":[{"id":"b","blend":[{"solute":"NaCl","mole_fraction":0.5,"Mole_fraction":0.5}]}]}`, "candidates[0].blend[0].Mole_fraction", "did you mean"},
	} {
		out, e := Dispatch(context.Background(), tc.op, []byte(tc.body))
		if tc.op == OpBatch && tc.msg == "" {
			if e != nil || !strings.Contains(string(out), `"ok":false`) || !strings.Contains(string(out), "null") {
				t.Errorf("%s: %v %s", tc.body, e, out)
			}
			continue
		}
		if e == nil || e.Kind != KindInvalid || e.Field != tc.field || !strings.Contains(e.Message, tc.msg) {
			t.Errorf("%s %s: %+v, want an invalid-input error on %q saying %q (%.200s)", tc.op, tc.body, e, tc.field, tc.msg, out)
		}
	}
}
