package module

import (
	"testing"

	"drawsift/engine/transport"
)

// BenchmarkRating: one module rated at 2 m² (the test problem: a 1 mol/L
// draw against a tenth of it, 40 L/h each, non-linear π). Issue #12's
// budget: a counter-current rating under 5 ms native.
func BenchmarkRating(b *testing.B) {
	for _, fl := range flows {
		b.Run(fl.String(), func(b *testing.B) {
			for b.Loop() {
				if _, err := Solve(testProblem(fl, transport.ALFS, nonlinear(2), 100), 2); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkDesign: the area for 50 % recovery. Budget: under 50 ms.
func BenchmarkDesign(b *testing.B) {
	for _, fl := range flows {
		b.Run(fl.String(), func(b *testing.B) {
			for b.Loop() {
				if _, err := Design(testProblem(fl, transport.ALFS, nonlinear(2), 100), Target{Recovery: 0.5}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
