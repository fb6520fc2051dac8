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
	negZero := math.Copysign(0, -1) // the literal -0.0 is +0 in Go
	for _, x := range []float64{0, negZero, 1e-300, -1e-300, -1e-10, -0.3465, -0.3466, -1, -708.3, -709, -740, -745, -746, -1e6, math.Inf(-1)} {
		check(x)
	}
	// Signs: e^{±0} = 1 exactly, and an underflow is +0, never −0 (a −0
	// would flip the sign of a later division).
	for _, x := range []float64{0, negZero} {
		if got := expNeg(x); got != 1 {
			t.Errorf("expNeg(%v) = %v, want 1", x, got)
		}
	}
	for _, x := range []float64{-746, -1e6, math.Inf(-1)} {
		if got := expNeg(x); got != 0 || math.Signbit(got) {
			t.Errorf("expNeg(%v) = %v, want +0", x, got)
		}
	}
	if !math.Signbit(negZero) {
		t.Fatal("negZero is not negative zero")
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
