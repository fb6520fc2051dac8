package limits

import (
	"errors"
	"math"
	"strings"
	"testing"

	"drawsift/engine/errs"
)

// Every range is well formed and its default lies inside it, so the
// defaults the page shows are values the engine accepts.
func TestRangesConsistent(t *testing.T) {
	seen := map[string]bool{}
	for _, r := range Ranges() {
		if seen[r.ID()] {
			t.Errorf("%s listed twice", r.ID())
		}
		seen[r.ID()] = true
		if !(r.Min < r.Max) {
			t.Errorf("%s: min %g ≥ max %g", r.ID(), r.Min, r.Max)
		}
		if r.HasDefault && !r.Contains(r.Default) {
			t.Errorf("%s: default %g outside %s", r.ID(), r.Default, r.Text())
		}
		if r.Text() == "" || strings.Contains(r.Text(), "e-0") {
			t.Errorf("%s: limit text %q", r.ID(), r.Text())
		}
	}
}

func TestRangeCheck(t *testing.T) {
	for _, tc := range []struct {
		r    *Range
		v    float64
		ok   bool
		text string
	}{
		{&TemperatureC, 100, true, "0–100 °C"},
		{&TemperatureC, 100.001, false, "0–100 °C"},
		{&KDraw, 1e-8, true, "1e-8–1 m/s"},
		{&KDraw, 5, false, "1e-8–1 m/s"},
		{&RegenerationRecovery, 0, false, "> 0 and ≤ 0.95"},
		{&RegenerationRecovery, 0.95, true, "> 0 and ≤ 0.95"},
		{&Samples, 10.5, false, "1–100000 (whole number)"},
		{&Samples, 1, true, "1–100000 (whole number)"},
		{&BasisFlux, 3600, false, "> 0 and < 3600 LMH"},
		{&MembraneA, math.NaN(), false, "0.001–100 LMH/bar"},
		{&BasisValue, math.Inf(1), false, "> 0 and ≤ 100000"}, // every input must be finite
		{&Weight, 0, true, "0–1000000"},
		{&Weight, 1e308, false, "0–1000000"},
		{&CustomMolarMass, 1e-320, false, "≥ 1 and < 10000000 g/mol"},
		{&Seed, 1 << 53, false, "0–9007199254740991 (whole number)"},
	} {
		err := tc.r.Check(tc.v)
		if (err == nil) != tc.ok {
			t.Errorf("%s = %g: err %v, want ok %v", tc.r.Field, tc.v, err, tc.ok)
		}
		if tc.r.Text() != tc.text {
			t.Errorf("%s: text %q, want %q", tc.r.Field, tc.r.Text(), tc.text)
		}
		var ie *errs.InputError
		if err != nil && (!errors.As(err, &ie) || ie.Field != tc.r.Field || ie.Limit != tc.text || !errors.Is(err, errs.ErrInvalidInput)) {
			t.Errorf("%s = %g: error %#v does not name the field and limit", tc.r.Field, tc.v, err)
		}
		if ie != nil && (math.IsNaN(ie.Value) || math.IsInf(ie.Value, 0)) {
			t.Errorf("%s: the error carries a non-finite value", tc.r.Field)
		}
	}
}

func TestLookup(t *testing.T) {
	if r := Lookup("regeneration_recovery"); r != &RegenerationRecovery {
		t.Errorf("Lookup(regeneration_recovery) = %v", r)
	}
	if r := Lookup("custom_solutes[12].molar_mass_g_per_mol"); r != &CustomMolarMass {
		t.Errorf("Lookup with an index = %v", r)
	}
	if r := Lookup("no_such_field"); r != nil {
		t.Errorf("Lookup(no_such_field) = %v", r)
	}
}
