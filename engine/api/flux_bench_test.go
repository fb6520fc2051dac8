package api

import (
	"context"
	"testing"
)

// BenchmarkFluxRequest: one flux request, decoding to encoding (issue
// #16's target: at most 15 µs native). NaCl against deionised water; NaCl
// against seawater (the preset's 12 ions). "append" is the HTTP handler's
// path (AppendDispatch into a reused buffer); "dispatch" returns a fresh
// slice (the CLI's and the page's path).
func BenchmarkFluxRequest(b *testing.B) {
	for _, tc := range []struct{ name, body string }{
		{"NaCl-DI", `{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 1, "unit": "mol/L"}}`},
		{"NaCl-seawater", `{"membrane": {"preset": "tfc-standard"}, "orientation": "AL-FS", "draw": {"solute": "NaCl", "concentration": 1, "unit": "mol/L"}, "feed": {"preset": "seawater"}}`},
	} {
		body := []byte(tc.body)
		b.Run(tc.name+"/append", func(b *testing.B) {
			var buf []byte
			for b.Loop() {
				out, e := AppendDispatch(context.Background(), buf[:0], OpFlux, body, nil)
				if e != nil {
					b.Fatal(e)
				}
				buf = out
			}
		})
		b.Run(tc.name+"/dispatch", func(b *testing.B) {
			for b.Loop() {
				if _, e := Dispatch(context.Background(), OpFlux, body); e != nil {
					b.Fatal(e)
				}
			}
		})
	}
}
