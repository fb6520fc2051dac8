package api

import (
	"context"
	"fmt"
	"strings"
	"testing"

	"drawsift/engine/library"
)

// hazardFloodBody is a screen with n exclude_hazards entries and one custom
// solute carrying m hazard_flags (each cycling the known flags).
func hazardFloodBody(n, m int) string {
	list := func(k int) string {
		q := make([]string, k)
		for i := range q {
			q[i] = fmt.Sprintf("%q", library.HazardFlags[i%len(library.HazardFlags)])
		}
		return "[" + strings.Join(q, ",") + "]"
	}
	return fmt.Sprintf(`{"candidates":["NaCl","X"],"exclude_hazards":%s,"custom_solutes":[{"id":"X","molar_mass_g_per_mol":100,"diffusivity_m2_per_s":1e-9,"solubility_mol_per_kg":5,"hazard_flags":%s}]}`,
		list(n), list(m))
}

// The 1,000 × 1,000 hazard-flag request of issue #15 is refused at once,
// naming the list and its cap; at the caps the request runs and the
// repeated flags are reported once.
func TestHazardFlagFloodRefused(t *testing.T) {
	for _, tc := range []struct {
		n, m  int
		field string
	}{
		{1000, 1000, "custom_solutes[0].hazard_flags"},
		{1000, 1, "exclude_hazards"},
	} {
		_, e := Dispatch(context.Background(), OpScreen, []byte(hazardFloodBody(tc.n, tc.m)))
		if e == nil || e.Kind != KindInvalid || e.Field != tc.field || e.Limit != "at most 32 entries" || !strings.Contains(e.Message, "1000 entries") {
			t.Errorf("%d × %d: %+v, want an invalid-input error on %s with its cap", tc.n, tc.m, e, tc.field)
		}
	}
	// At the caps: "nutrient" is not excluded by the first three flags.
	body := strings.Replace(hazardFloodBody(0, 32), `"candidates"`, `"exclude_hazards":["oxidizer","toxic","oxidizer"],"candidates"`, 1)
	body = strings.Replace(body, `"exclude_hazards":[],`, ``, 1)
	resp, e := Dispatch(context.Background(), OpScreen, []byte(body))
	if e != nil {
		t.Fatalf("at the caps: %v", e)
	}
	if !strings.Contains(string(resp), `carries the hazard flag \"oxidizer\"`) {
		t.Errorf("custom solute not excluded by its first excluded flag: %.400s", resp)
	}
}

// BenchmarkHazardFloodRequest: the refused 1,000 × 1,000 request through
// Dispatch (decoding and the cap), and the largest accepted (32 × 32).
func BenchmarkHazardFloodRequest(b *testing.B) {
	for _, n := range []int{32, 1000, 10000} {
		body := []byte(hazardFloodBody(n, n))
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			for b.Loop() {
				_, _ = Dispatch(context.Background(), OpScreen, body)
			}
		})
	}
}
