package transport

import (
	"math"
	"math/rand/v2"
	"testing"
)

// expNeg against the standard library's math.Exp (the reference; the Go
// math package documents its error as < 1 ulp) over the whole range used.
func TestExpNeg(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	check := func(x float64) {
		got, want := expNeg(x), math.Exp(x)
		if want == 0 {
			if got != 0 {
				t.Fatalf("expNeg(%g) = %g, want 0", x, got)
			}
			return
		}
		// 4 ulp, and a relative bound for subnormal results
		if d := math.Abs(got - want); d > 4*(math.Nextafter(want, math.Inf(1))-want) && d > 1e-15*want {
			t.Fatalf("expNeg(%g) = %.17g, want %.17g", x, got, want)
		}
	}
	for _, x := range []float64{0, -0.0, 1e-300, -1e-300, -1e-10, -0.3465, -0.3466, -1, -708.3, -709, -740, -745, -746, -1e6, math.Inf(-1)} {
		check(x)
	}
	for i := 0; i < 200000; i++ {
		check(-750 * rng.Float64() * rng.Float64())
	}
}

func BenchmarkExpNeg(b *testing.B) {
	x := -0.3
	for b.Loop() {
		sinkF += expNeg(x)
		x -= 1e-9
	}
}

func BenchmarkMathExp(b *testing.B) {
	x := -0.3
	for b.Loop() {
		sinkF += math.Exp(x)
		x -= 1e-9
	}
}
