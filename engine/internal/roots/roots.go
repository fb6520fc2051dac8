// Package roots finds a root of a continuous scalar function inside a
// bracket on which the function changes sign, and says how the search
// ended, in the manner of gonum's optimize.Result: the point, the
// function's value there, a Status, the iteration and evaluation counts
// and a residual. A search that stops without meeting its tolerance
// returns an *errs.ConvergenceError beside the Result, so no caller can
// take a last iterate for an answer.
//
// Two methods share the bracket, the settings and the result:
//
//   - Brent, for f alone: inverse quadratic interpolation and secant steps
//     with a bisection safeguard (Brent 1973). It needs no derivative and
//     converges for every continuous f with a sign change, in at most
//     about (log₂(width/tol))² evaluations and usually far fewer.
//   - Newton, for f with its derivative: Newton steps kept inside the
//     bracket, bisecting when a step would leave it or fails to halve the
//     step before last (rtsafe, Press et al. 2007 §9.4). Quadratic near a
//     simple root; linear on a multiple root.
//
// The caller passes the bracket together with f at its ends (it has
// usually evaluated them already, to check that a root exists), so a
// search spends no evaluations on them.
package roots

import (
	"errors"
	"math"

	"drawsift/engine/errs"
)

// Status says how a search ended.
type Status int

// Statuses. The first three are convergence; the rest are failures, for
// which the solvers also return an *errs.ConvergenceError.
const (
	NotTerminated Status = iota
	// FunctionConvergence: |f(X)| ≤ Settings.FAbsTol (an exact zero
	// included).
	FunctionConvergence
	// BracketConvergence: the bracket around X has shrunk below the x
	// tolerance (or to adjacent floats).
	BracketConvergence
	// StepConvergence: Newton's last step was below the x tolerance.
	StepConvergence
	// IterationLimit: Settings.MaxIterations evaluations did not meet the
	// tolerance.
	IterationLimit
	// NoSignChange: f has the same sign at both ends of the bracket.
	NoSignChange
	// InvalidBracket: the ends are not finite or not in increasing order.
	InvalidBracket
	// NotFinite: f returned NaN or ±Inf.
	NotFinite
)

var statusText = [...]string{
	NotTerminated:       "not terminated",
	FunctionConvergence: "function within tolerance",
	BracketConvergence:  "bracket within tolerance",
	StepConvergence:     "step within tolerance",
	IterationLimit:      "iteration limit",
	NoSignChange:        "no sign change",
	InvalidBracket:      "invalid bracket",
	NotFinite:           "function not finite",
}

// String returns the status in words, as used for
// errs.ConvergenceError.Reason.
func (s Status) String() string {
	if s >= 0 && int(s) < len(statusText) {
		return statusText[s]
	}
	return "unknown status"
}

// Converged reports whether s is one of the convergence statuses.
func (s Status) Converged() bool {
	return s == FunctionConvergence || s == BracketConvergence || s == StepConvergence
}

// Err returns nil for a convergence status and an error naming the status
// otherwise (as gonum's optimize.Status.Err).
func (s Status) Err() error {
	if s.Converged() {
		return nil
	}
	return errors.New("roots: " + s.String())
}

// Bracket is an interval [Lo, Hi] with f at its ends; FLo and FHi must be
// finite and differ in sign (or one be zero).
type Bracket struct {
	Lo, Hi   float64
	FLo, FHi float64
}

// Settings control a search. A nil *Settings, or a zero field, takes the
// default given with the field.
type Settings struct {
	// Solver names the search in a ConvergenceError (default "roots.Brent"
	// or "roots.Newton").
	Solver string
	// FAbsTol: converged when |f(x)| ≤ FAbsTol (default 0: an exact zero;
	// the bracket test still ends the search).
	FAbsTol float64
	// XAbsTol and XRelTol: converged when the bracket (Brent) or the
	// Newton step is no wider than XAbsTol + XRelTol·|x|. XRelTol is at
	// least, and by default, 4ε (2ε·|x| on each side of x, as in Brent's
	// zero); XAbsTol defaults to 0.
	XAbsTol, XRelTol float64
	// MaxIterations bounds the evaluations of f (default 100).
	MaxIterations int
	// Scale divides |F| to give Result.Residual and the error's Residual
	// (default 1; pass the size of the target for a relative residual).
	Scale float64
}

// Defaults.
const (
	DefaultMaxIterations = 100
	minXRelTol           = 4 * 0x1p-52
)

// Result is how a search ended (as gonum's optimize.Result: the point,
// the statistics, the status).
type Result struct {
	// X is the root found, or on failure the best point seen (smallest
	// |f|); F is f(X). F is NaN only when Status is NotFinite at an end of
	// the bracket.
	X, F   float64
	Status Status
	Stats
}

// Stats are a search's statistics.
type Stats struct {
	// Iterations and Evaluations: one evaluation of f per iteration; the
	// bracket's end values are the caller's and are not counted.
	Iterations, Evaluations int
	// Residual is |F|/Settings.Scale; finite (math.MaxFloat64 stands for a
	// non-finite F).
	Residual float64
}

// config is Settings with the defaults filled in. (Four fields, so that
// the compiler keeps it in registers; the solvers also keep their state in
// scalars and build the Result once, at the end: copying structs through
// memory cost a quarter of MolalityForPi's time.)
type config struct {
	fAbsTol, xAbsTol, xRelTol float64
	maxIter                   int
}

func newConfig(s *Settings) config {
	if s == nil {
		return config{xRelTol: minXRelTol, maxIter: DefaultMaxIterations}
	}
	c := config{fAbsTol: max(s.FAbsTol, 0), xAbsTol: max(s.XAbsTol, 0), xRelTol: max(s.XRelTol, minXRelTol), maxIter: s.MaxIterations}
	if c.maxIter <= 0 {
		c.maxIter = DefaultMaxIterations
	}
	return c
}

// end ends a search at x with f(x) = fx after it evaluations: it fills in
// *out and returns the *errs.ConvergenceError unless st is a convergence.
// (The solvers write their Result through a pointer and keep their state
// in scalars: building a Result by value and copying it out cost a tenth
// of MolalityForPi's time.)
func end(out *Result, s *Settings, method string, x, fx float64, st Status, it int) error {
	out.X, out.F, out.Status = x, fx, st
	out.Iterations, out.Evaluations, out.Residual = it, it, residual(s, fx)
	if st.Converged() {
		return nil
	}
	return fail(s, method, st, it, out.Residual)
}

// residual is |fx|/Settings.Scale, finite.
func residual(s *Settings, fx float64) float64 {
	scale := 1.0
	if s != nil && s.Scale > 0 && s.Scale <= math.MaxFloat64 {
		scale = s.Scale
	}
	if r := math.Abs(fx) / scale; r <= math.MaxFloat64 {
		return r
	}
	return math.MaxFloat64 // NaN or Inf
}

// fail returns the *errs.ConvergenceError of a search that ended with st.
//
//go:noinline
func fail(s *Settings, method string, st Status, it int, res float64) error {
	if s != nil && s.Solver != "" {
		method = s.Solver
	}
	return &errs.ConvergenceError{Solver: method, Iterations: it, Residual: res, Reason: st.String()}
}

// check returns the status that ends a search at the bracket before any
// evaluation (an invalid bracket, a non-finite or same-signed end, or an
// end that is already a root), or NotTerminated.
func (c config) check(b *Bracket) Status {
	switch {
	case !(b.Lo < b.Hi) || !finite(b.Lo) || !finite(b.Hi):
		return InvalidBracket
	case !finite(b.FLo) || !finite(b.FHi):
		return NotFinite
	case math.Abs(b.FLo) <= c.fAbsTol || math.Abs(b.FHi) <= c.fAbsTol:
		return FunctionConvergence
	case (b.FLo > 0) == (b.FHi > 0):
		return NoSignChange
	}
	return NotTerminated
}

// endAtBracket ends a search that check stopped with st, at the end with
// the smaller |f| (the one that is not finite, for NotFinite; Lo for an
// invalid bracket).
func endAtBracket(out *Result, s *Settings, method string, b *Bracket, st Status) error {
	x, fx := b.Lo, b.FLo
	switch {
	case st == InvalidBracket:
	case st == NotFinite:
		if finite(b.FLo) {
			x, fx = b.Hi, b.FHi
		}
	case math.Abs(b.FHi) < math.Abs(b.FLo):
		x, fx = b.Hi, b.FHi
	}
	return end(out, s, method, x, fx, st, 0)
}

// Brent returns a root of f in the bracket b by Brent's method: at each
// step the inverse quadratic through the last three points, or the secant
// through the last two, when its step stays well inside the bracket and
// shrinks fast enough; bisection otherwise. The bracket [b, c] around the
// current best point b always holds a sign change, and the search stops
// when |f(b)| ≤ FAbsTol or |c − b|/2 ≤ (XAbsTol + XRelTol·|b|)/2.
//
// Written from the published algorithm: R. P. Brent, Algorithms for
// Minimization without Derivatives (Prentice-Hall 1973), ch. 4, procedure
// zero (also Forsythe, Malcolm & Moler 1977, §7.2, zeroin).
//
// Special cases are:
//
//	f(Lo) or f(Hi) within FAbsTol of 0: that end, FunctionConvergence, no evaluation
//	f(Lo), f(Hi) of one sign: NoSignChange (an error)
//	f returns NaN or ±Inf: NotFinite (an error), X the best point before it
//	Lo ≥ Hi, or an end not finite: InvalidBracket (an error)
func Brent(f func(float64) float64, br Bracket, s *Settings) (Result, error) {
	var r Result
	err := brent(f, &br, s, &r)
	return r, err
}

func brent(f func(float64) float64, br *Bracket, s *Settings, out *Result) error {
	const method = "roots.Brent"
	cfg := newConfig(s)
	if st := cfg.check(br); st != NotTerminated {
		return endAtBracket(out, s, method, br, st)
	}
	a, b, fa, fb := br.Lo, br.Hi, br.FLo, br.FHi
	c, fc := a, fa
	d := b - a
	e := d
	for it := 0; ; {
		if (fb > 0) == (fc > 0) {
			// The sign change lies between a and b: restart c there.
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			// Keep b the best point.
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol := 0.5 * (cfg.xAbsTol + cfg.xRelTol*math.Abs(b))
		if tol == 0 {
			tol = math.SmallestNonzeroFloat64
		}
		m := 0.5 * (c - b)
		switch {
		case math.Abs(fb) <= cfg.fAbsTol:
			return end(out, s, method, b, fb, FunctionConvergence, it)
		case math.Abs(m) <= tol:
			return end(out, s, method, b, fb, BracketConvergence, it)
		case it >= cfg.maxIter:
			return end(out, s, method, b, fb, IterationLimit, it)
		}
		if math.Abs(e) >= tol && math.Abs(fa) > math.Abs(fb) {
			// Interpolate: secant if only two distinct points, else
			// inverse quadratic (Brent 1973, ch. 4, §4.2–4.3).
			sr := fb / fa
			var p, q float64
			if a == c {
				p = 2 * m * sr
				q = 1 - sr
			} else {
				qa, rb := fa/fc, fb/fc
				p = sr * (2*m*qa*(qa-rb) - (b-a)*(rb-1))
				q = (qa - 1) * (rb - 1) * (sr - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			// Accept the step if it falls inside 3/4 of the bracket and is
			// less than half the step before last.
			if lim := 3*m*q - math.Abs(tol*q); 2*p < lim && 2*p < math.Abs(e*q) {
				e = d
				d = p / q
			} else {
				d, e = m, m
			}
		} else {
			d, e = m, m
		}
		a, fa = b, fb
		switch {
		case math.Abs(d) > tol:
			b += d
		case m > 0:
			b += tol
		default:
			b -= tol
		}
		fb = f(b)
		it++
		if !finite(fb) {
			return end(out, s, method, a, fa, NotFinite, it)
		}
	}
}

// Newton returns a root of f in the bracket b by Newton's method with a
// bisection safeguard, starting from x0 (the bracket's midpoint if x0 is
// not strictly inside). f returns the function and its derivative. A
// Newton step that would leave the current bracket, or that is more than
// half the step before last, is replaced by bisection; each evaluation
// narrows the bracket by the sign of f. The search stops when
// |f(x)| ≤ FAbsTol, or when the Newton step or the bracket is no wider
// than XAbsTol + XRelTol·|x|.
//
// Source: the rtsafe routine of W. H. Press, S. A. Teukolsky, W. T.
// Vetterling & B. P. Flannery, Numerical Recipes, 3rd ed. (Cambridge
// 2007), §9.4 (the algorithm, written here anew).
//
// Special cases are as for Brent; a zero or non-finite derivative gives a
// bisection step, not an error.
func Newton(f func(float64) (float64, float64), br Bracket, x0 float64, s *Settings) (Result, error) {
	var r Result
	err := newton(f, &br, x0, s, &r)
	return r, err
}

func newton(f func(float64) (float64, float64), br *Bracket, x0 float64, s *Settings, out *Result) error {
	const method = "roots.Newton"
	cfg := newConfig(s)
	if st := cfg.check(br); st != NotTerminated {
		return endAtBracket(out, s, method, br, st)
	}
	best, fbest := br.Lo, br.FLo
	if math.Abs(br.FHi) < math.Abs(br.FLo) {
		best, fbest = br.Hi, br.FHi
	}
	lo, hi := br.Lo, br.Hi
	rising := br.FLo < 0 // f(lo) < 0 < f(hi); else f(lo) > 0 > f(hi)
	x := x0
	if !(x > br.Lo && x < br.Hi) {
		x = br.Lo + 0.5*(br.Hi-br.Lo)
	}
	dxOld := br.Hi - br.Lo // step before last
	dx := dxOld            // last step
	it := 0
	for it < cfg.maxIter {
		fx, dfx := f(x)
		it++
		if !finite(fx) {
			return end(out, s, method, best, fbest, NotFinite, it)
		}
		afx := math.Abs(fx)
		if afx <= cfg.fAbsTol {
			return end(out, s, method, x, fx, FunctionConvergence, it)
		}
		if afx < math.Abs(fbest) {
			best, fbest = x, fx
		}
		if (fx < 0) == rising {
			lo = x
		} else {
			hi = x
		}
		tol := cfg.xAbsTol + cfg.xRelTol*math.Abs(x)
		if hi-lo <= tol {
			return end(out, s, method, best, fbest, BracketConvergence, it)
		}
		step := fx / dfx
		next := x - step
		if math.Abs(step) <= tol && next >= lo && next <= hi {
			// A step into the bracket below the x tolerance (possibly below
			// the resolution of x): x is the root.
			return end(out, s, method, x, fx, StepConvergence, it)
		}
		if !(next > lo && next < hi) || math.Abs(step) > 0.5*math.Abs(dxOld) {
			next = lo + 0.5*(hi-lo)
			if next == lo || next == hi {
				// lo and hi are adjacent floats.
				return end(out, s, method, best, fbest, BracketConvergence, it)
			}
			step = x - next
		}
		dxOld, dx = dx, step
		x = next
	}
	return end(out, s, method, best, fbest, IterationLimit, it)
}

// finite reports whether v is neither NaN nor ±Inf (v − v is NaN for both).
func finite(v float64) bool { return v-v == 0 }
