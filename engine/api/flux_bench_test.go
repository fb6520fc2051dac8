package api

import (
	"context"
	"testing"
)

// BenchmarkFluxRequest: one flux request through Dispatch, decoding to
// encoding (issue #16's target: at most 15 µs native). NaCl against
// deionised water; NaCl against seawater (the preset's 12 ions).
func BenchmarkFluxRequest(b *testing.B) {
	for _, tc := range []struct{ name, body string }{
		{"NaCl-DI", `{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 1, "unit": "mol/L"}}`},
		{"NaCl-seawater", `{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 1, "unit": "mol/L"}, "feed": {"preset": "seawater"}}`},
	} {
		b.Run(tc.name, func(b *testing.B) {
			body := []byte(tc.body)
			for b.Loop() {
				if _, e := Dispatch(context.Background(), OpFlux, body); e != nil {
					b.Fatal(e)
				}
			}
		})
	}
}
