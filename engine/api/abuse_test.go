package api

import (
	"context"
	"encoding/json"
	"fmt"
	"strings"
	"testing"
)

// customWith is a screen of one custom solute X with the given extra
// fields (after the required ones).
func customWith(extra string) string {
	return `{"candidates":["X"],"custom_solutes":[{"id":"X","molar_mass_g_per_mol":100,"diffusivity_m2_per_s":1e-9,"solubility_mol_per_kg":5` + extra + `}]}`
}

// Ion counts and charges are bounded, so ν = Σ count and the
// electroneutrality sum Σ charge × count cannot overflow (issue #15 item 5:
// a count of 2,147,483,647 once gave ν = 4.3e9).
func TestCustomIonCountsBounded(t *testing.T) {
	for _, tc := range []struct{ ions, field, limit string }{
		{`[{"symbol":"A+","charge":1,"count":2147483647},{"symbol":"B-","charge":-1,"count":2147483647}]`, "custom_solutes[0].ions[0].count", "1–10 (whole number)"},
		// charge × count would wrap a 64-bit sum past zero: 2^62 · 4 − 2^62 · 4.
		{`[{"symbol":"A+","charge":4611686018427387904,"count":4},{"symbol":"B-","charge":-4611686018427387904,"count":4}]`, "custom_solutes[0].ions[0].charge", "-10–10 (whole number)"},
		{`[{"symbol":"A+","charge":0,"count":1},{"symbol":"B-","charge":-1,"count":1}]`, "custom_solutes[0].ions[0].charge", "-10–10 (whole number), not 0"},
		{`[{"symbol":"A+","charge":1,"count":0},{"symbol":"B-","charge":-1,"count":1}]`, "custom_solutes[0].ions[0].count", "1–10 (whole number)"},
		{`[{"symbol":"A+","charge":1,"count":6},{"symbol":"B-","charge":-1,"count":6}]`, "custom_solutes[0].ions", "Σ count ≤ 10"},
		{`[` + strings.Repeat(`{"symbol":"A+","charge":1,"count":1},`, 11) + `{"symbol":"B-","charge":-1,"count":1}]`, "custom_solutes[0].ions", "at most 10 entries"},
		{`[{"symbol":"A\u001b[31m","charge":1,"count":1},{"symbol":"B-","charge":-1,"count":1}]`, "custom_solutes[0].ions[0].symbol", ""},
	} {
		_, e := Dispatch(context.Background(), OpScreen, []byte(customWith(`,"ions":`+tc.ions)))
		if e == nil || e.Kind != KindInvalid || e.Field != tc.field {
			t.Errorf("%.80s: %+v, want an invalid-input error on %s", tc.ions, e, tc.field)
			continue
		}
		if lim, _ := e.Limit.(string); tc.limit != "" && lim != tc.limit {
			t.Errorf("%.80s: limit %q, want %q", tc.ions, e.Limit, tc.limit)
		}
	}
	// A real 2-1 salt within the bounds runs, with ν = 3.
	out, e := Dispatch(context.Background(), OpScreen, []byte(customWith(`,"ions":[{"symbol":"A+2","charge":2,"count":1},{"symbol":"B-","charge":-1,"count":2}]`)))
	if e != nil || !strings.Contains(string(out), `"solute": "X"`) && !strings.Contains(string(out), `"solute":"X"`) {
		t.Errorf("a 2-1 custom salt: %v %.300s", e, out)
	}
}

// Custom IDs, names and blend IDs refuse characters that hide or reorder
// what they show: NUL, ESC, the bidi override U+202E and the zero-width
// look-alikes ("Na\u200bCl" is not NaCl), naming the field.
func TestCustomIDsRefuseHiddenCharacters(t *testing.T) {
	for _, r := range []string{`\u0000`, `\u001b`, `\u007f`, `\u202e`, `\u2066`, `\u200b`, `\u200c`, `\u200d`, `\u2060`, `\ufeff`} {
		id := `Na` + r + `Cl`
		body := strings.Replace(customWith(""), `"X"`, `"`+id+`"`, -1)
		if _, e := Dispatch(context.Background(), OpScreen, []byte(body)); e == nil || e.Kind != KindInvalid || e.Field != "custom_solutes[0].id" || e.Limit == nil {
			t.Errorf("id %s: %+v, want an invalid-input error on custom_solutes[0].id with its rule", id, e)
		}
		body = customWith(`,"name":"X` + r + `"`)
		if _, e := Dispatch(context.Background(), OpScreen, []byte(body)); e == nil || e.Field != "custom_solutes[0].name" {
			t.Errorf("name with %s: %+v, want an error on custom_solutes[0].name", r, e)
		}
		body = `{"candidates":[{"id":"mix` + r + `","blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"KCl","mole_fraction":0.5}]}]}`
		if _, e := Dispatch(context.Background(), OpScreen, []byte(body)); e == nil || e.Field != "candidates[0].id" {
			t.Errorf("blend id with %s: %+v, want an error on candidates[0].id", r, e)
		}
	}
	// Ordinary non-ASCII stays fine: a name in Greek or with a middle dot.
	if _, e := Dispatch(context.Background(), OpScreen, []byte(customWith(`,"name":"άλας · δοκιμή"`))); e != nil {
		t.Errorf("a plain non-ASCII name: %v", e)
	}
}

// b_feed_lmh with the draw solute as the feed solute is not silently
// dropped: the flux answers with a warning saying which B applied; a
// b_feed_lmh outside its range is refused even when unused.
func TestFeedBWithDrawSoluteWarns(t *testing.T) {
	body := func(b string) string {
		return fmt.Sprintf(`{"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500},"draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"},"feed":{"solute":"NaCl","concentration":0.1,"unit":"mol/L"},"b_feed_lmh":%s}`, b)
	}
	out, e := Dispatch(context.Background(), OpFlux, []byte(body("5")))
	if e != nil {
		t.Fatal(e)
	}
	var r struct {
		Warnings []string `json:"warnings"`
	}
	if err := json.Unmarshal(out, &r); err != nil {
		t.Fatal(err)
	}
	found := false
	for _, w := range r.Warnings {
		found = found || strings.Contains(w, "b_feed_lmh (5 LMH) is not used") && strings.Contains(w, "feed solute is the draw solute (NaCl)") && strings.Contains(w, "0.3 LMH")
	}
	if !found {
		t.Errorf("no warning that b_feed_lmh is unused: %q", r.Warnings)
	}
	if _, e := Dispatch(context.Background(), OpFlux, []byte(body("1e308"))); e == nil || e.Field != "b_feed_lmh" {
		t.Errorf("b_feed_lmh 1e308 (unused): %+v, want an error on b_feed_lmh", e)
	}
}
