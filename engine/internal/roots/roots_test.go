package roots

import (
	"errors"
	"math"
	"testing"

	"drawsift/engine/errs"
)

// problem is a named test function with a bracket and its root.
type problem struct {
	name   string
	f      func(float64) float64
	df     func(float64) float64
	lo, hi float64
	root   float64
	tol    float64 // relative tolerance on the root
	brent  *Settings
}

func (p problem) bracket() Bracket {
	return Bracket{Lo: p.lo, Hi: p.hi, FLo: p.f(p.lo), FHi: p.f(p.hi)}
}

func (p problem) fdf(x float64) (float64, float64) { return p.f(x), p.df(x) }

var problems = []problem{
	// Wallis's equation x³ − 2x − 5 = 0, the classic test of root finders
	// since Wallis used it to illustrate Newton's method (1685); Brent
	// (1973) ch. 4 and Forsythe, Malcolm & Moler (1977) §7.2 use it for
	// zero/zeroin. Root: OEIS A007493, 2.0945514815423265914823865405793…
	// (rounded to float64; also Python's decimal module at 50 digits).
	{name: "wallis", f: func(x float64) float64 { return x*x*x - 2*x - 5 }, df: func(x float64) float64 { return 3*x*x - 2 },
		lo: 2, hi: 3, root: 2.0945514815423265, tol: 4e-16},
	// cos x = x: the Dottie number, OEIS A003957,
	// 0.7390851332151606416553120876738734040134…
	{name: "dottie", f: func(x float64) float64 { return math.Cos(x) - x }, df: func(x float64) float64 { return -math.Sin(x) - 1 },
		lo: 0, hi: 1, root: 0.7390851332151607, tol: 4e-16},
	// e^x = 2 in a wide bracket: root ln 2 (math.Ln2).
	{name: "exp", f: func(x float64) float64 { return math.Exp(x) - 2 }, df: math.Exp,
		lo: -10, hi: 10, root: math.Ln2, tol: 4e-16},
	// A steep, decreasing function: 1/x − 3 on [0.01, 10], root 1/3.
	{name: "reciprocal", f: func(x float64) float64 { return 1/x - 3 }, df: func(x float64) float64 { return -1 / (x * x) },
		lo: 0.01, hi: 10, root: 1.0 / 3, tol: 4e-16},
	// A triple root, where Newton is only linear: (x − 1)³ on [0, 3]. f
	// is flat there, so float64 pins the root only to about ε^(1/3).
	// Brent's method is slow on it too (its guarantee is only about k²
	// evaluations for k bisections): 154 evaluations to the bracket
	// tolerance, so it gets a higher limit.
	{name: "triple", f: func(x float64) float64 { return (x - 1) * (x - 1) * (x - 1) }, df: func(x float64) float64 { return 3 * (x - 1) * (x - 1) },
		lo: 0, hi: 3, root: 1, tol: 1e-5, brent: &Settings{MaxIterations: 400}},
}

func TestKnownRoots(t *testing.T) {
	for _, p := range problems {
		t.Run("brent/"+p.name, func(t *testing.T) {
			r, err := Brent(p.f, p.bracket(), p.brent)
			check(t, p, r, err)
		})
		t.Run("newton/"+p.name, func(t *testing.T) {
			r, err := Newton(p.fdf, p.bracket(), p.lo, nil)
			check(t, p, r, err)
		})
	}
}

func check(t *testing.T, p problem, r Result, err error) {
	t.Helper()
	if err != nil {
		t.Fatalf("%v (result %+v)", err, r)
	}
	if !r.Status.Converged() || r.Status.Err() != nil {
		t.Errorf("status %v", r.Status)
	}
	if math.Abs(r.X-p.root) > p.tol*math.Abs(p.root) {
		t.Errorf("root %.17g, want %.17g (tol %g)", r.X, p.root, p.tol)
	}
	if r.F != p.f(r.X) || r.Residual != math.Abs(r.F) {
		t.Errorf("F = %g, Residual = %g at X = %.17g; f(X) = %g", r.F, r.Residual, r.X, p.f(r.X))
	}
	if r.Evaluations != r.Iterations || r.Iterations < 1 {
		t.Errorf("iterations %d, evaluations %d", r.Iterations, r.Evaluations)
	}
}

// FAbsTol stops early, and Scale makes the residual relative.
func TestFunctionTolerance(t *testing.T) {
	p := problems[0]
	full, _ := Brent(p.f, p.bracket(), nil)
	r, err := Brent(p.f, p.bracket(), &Settings{FAbsTol: 1e-3, Scale: 5})
	if err != nil || r.Status != FunctionConvergence {
		t.Fatalf("%v, %v", r.Status, err)
	}
	if !(math.Abs(r.F) <= 1e-3) || r.Residual != math.Abs(r.F)/5 || r.Iterations >= full.Iterations {
		t.Errorf("got %+v; without FAbsTol %d iterations", r, full.Iterations)
	}
}

// An end of the bracket that is a root ends the search at once.
func TestRootAtEnd(t *testing.T) {
	f := func(x float64) float64 { return x - 2 }
	for _, b := range []Bracket{{Lo: 2, Hi: 3, FLo: 0, FHi: 1}, {Lo: 1, Hi: 2, FLo: -1, FHi: 0}} {
		r, err := Brent(f, b, nil)
		if err != nil || r.X != 2 || r.Iterations != 0 || r.Status != FunctionConvergence {
			t.Errorf("%+v: %+v, %v", b, r, err)
		}
	}
}

// wantConvergenceError checks that err is an *errs.ConvergenceError with
// the given reason, the solver's name and a finite residual.
func wantConvergenceError(t *testing.T, r Result, err error, want Status, solver string) {
	t.Helper()
	var ce *errs.ConvergenceError
	if !errors.As(err, &ce) {
		t.Fatalf("got %v (%+v), want a *errs.ConvergenceError", err, r)
	}
	if !errors.Is(err, errs.ErrNotConverged) {
		t.Errorf("%v does not unwrap to ErrNotConverged", err)
	}
	if r.Status != want || ce.Reason != want.String() || r.Status.Err() == nil {
		t.Errorf("status %v, reason %q, want %v", r.Status, ce.Reason, want)
	}
	if ce.Solver != solver || ce.Iterations != r.Iterations {
		t.Errorf("error %+v, result %+v", ce, r)
	}
	if math.IsNaN(ce.Residual) || math.IsInf(ce.Residual, 0) || ce.Residual < 0 {
		t.Errorf("residual %g is not finite", ce.Residual)
	}
}

// A function that cannot converge within the iteration limit reports it:
// a sign change without a root (a step at 0) makes the bracket shrink
// towards 0 by halving, about 1,075 times before it reaches the x
// tolerance there; and the cubic with a limit of two evaluations.
func TestIterationLimit(t *testing.T) {
	step := func(x float64) float64 {
		if x < 0 {
			return -1
		}
		return 1
	}
	r, err := Brent(step, Bracket{Lo: -1, Hi: 2, FLo: -1, FHi: 1}, &Settings{Solver: "step"})
	wantConvergenceError(t, r, err, IterationLimit, "step")
	if r.Residual != 1 || r.Iterations != DefaultMaxIterations {
		t.Errorf("residual %g after %d iterations", r.Residual, r.Iterations)
	}
	stepD := func(x float64) (float64, float64) { return step(x), 0 }
	r, err = Newton(stepD, Bracket{Lo: -1, Hi: 2, FLo: -1, FHi: 1}, 0.5, nil)
	wantConvergenceError(t, r, err, IterationLimit, "roots.Newton")

	p := problems[0]
	r, err = Brent(p.f, p.bracket(), &Settings{MaxIterations: 2})
	wantConvergenceError(t, r, err, IterationLimit, "roots.Brent")
	if r.Iterations != 2 || r.F != p.f(r.X) {
		t.Errorf("%+v", r)
	}
	r, err = Newton(p.fdf, p.bracket(), 3, &Settings{MaxIterations: 2})
	wantConvergenceError(t, r, err, IterationLimit, "roots.Newton")
}

func TestNoSignChange(t *testing.T) {
	f := func(x float64) float64 { return x*x + 1 }
	b := Bracket{Lo: -1, Hi: 2, FLo: f(-1), FHi: f(2)}
	r, err := Brent(f, b, nil)
	wantConvergenceError(t, r, err, NoSignChange, "roots.Brent")
	if r.X != -1 || r.Evaluations != 0 || r.Residual != 2 {
		t.Errorf("%+v", r)
	}
	r, err = Newton(func(x float64) (float64, float64) { return f(x), 2 * x }, b, 0, nil)
	wantConvergenceError(t, r, err, NoSignChange, "roots.Newton")
}

// NaN from f, inside the bracket or at an end, is an error, never a root.
func TestNotFinite(t *testing.T) {
	f := func(x float64) float64 {
		if x > 2.05 {
			return math.NaN()
		}
		return x*x*x - 2*x - 5
	}
	r, err := Brent(f, Bracket{Lo: 2, Hi: 3, FLo: f(2), FHi: 16}, nil)
	wantConvergenceError(t, r, err, NotFinite, "roots.Brent")
	if !(r.X <= 2.05) || r.F != f(r.X) {
		t.Errorf("X = %g, F = %g: want the best finite point", r.X, r.F)
	}
	fdf := func(x float64) (float64, float64) { return f(x), 3*x*x - 2 }
	r, err = Newton(fdf, Bracket{Lo: 2, Hi: 3, FLo: f(2), FHi: 16}, 2.5, nil)
	wantConvergenceError(t, r, err, NotFinite, "roots.Newton")
	r, err = Brent(f, Bracket{Lo: 2, Hi: 3, FLo: -1, FHi: math.NaN()}, nil)
	wantConvergenceError(t, r, err, NotFinite, "roots.Brent")
	if r.Residual != math.MaxFloat64 {
		t.Errorf("residual %g for a NaN end", r.Residual)
	}
}

func TestInvalidBracket(t *testing.T) {
	f := func(x float64) float64 { return x }
	for _, b := range []Bracket{
		{Lo: 1, Hi: -1, FLo: 1, FHi: -1},
		{Lo: 1, Hi: 1, FLo: -1, FHi: 1},
		{Lo: math.NaN(), Hi: 1, FLo: -1, FHi: 1},
		{Lo: math.Inf(-1), Hi: 1, FLo: -1, FHi: 1},
	} {
		r, err := Brent(f, b, nil)
		wantConvergenceError(t, r, err, InvalidBracket, "roots.Brent")
	}
}

// Newton from a poor start on a function whose Newton steps overshoot
// (arctan: from |x| > 1.39 plain Newton diverges) still converges,
// through the bisection safeguard.
func TestNewtonSafeguard(t *testing.T) {
	fdf := func(x float64) (float64, float64) { return math.Atan(x), 1 / (1 + x*x) }
	r, err := Newton(fdf, Bracket{Lo: -5, Hi: 20, FLo: math.Atan(-5), FHi: math.Atan(20)}, 15, nil)
	if err != nil || math.Abs(r.X) > 1e-15 {
		t.Errorf("%+v, %v", r, err)
	}
}

func TestStatusText(t *testing.T) {
	for s := NotTerminated; s <= NotFinite; s++ {
		if s.String() == "" || s.String() == "unknown status" {
			t.Errorf("status %d has no text", int(s))
		}
		if (s.Err() == nil) != s.Converged() {
			t.Errorf("%v: Err() = %v, Converged() = %v", s, s.Err(), s.Converged())
		}
	}
	if Status(99).String() != "unknown status" {
		t.Error("out-of-range status")
	}
}

var sink float64

func BenchmarkBrent(b *testing.B) {
	for _, p := range problems {
		br := p.bracket()
		b.Run(p.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				r, _ := Brent(p.f, br, p.brent)
				sink += r.X
			}
		})
	}
}

func BenchmarkNewton(b *testing.B) {
	for _, p := range problems {
		br := p.bracket()
		b.Run(p.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				r, _ := Newton(p.fdf, br, p.lo, nil)
				sink += r.X
			}
		})
	}
}
