package thermo

import (
	"math"
	"sync"
)

// fastPiIntervals is the number of cubic Hermite intervals of the
// tabulated π(c); with 512 the interpolant matches OsmoticFunc to within
// the accuracy stated on FastOsmoticFunc for every library solute
// (TestFastOsmoticFunc).
const fastPiIntervals = 512

// fastPiExact is the number of lowest intervals (c below (4h)², under a
// millimole per litre for the salts) evaluated exactly.
const fastPiExact = 4

// fastPiPiece is how many nodes of the table are built together, on first
// use: a solve reaches a few pieces, and the library's whole tables were
// a fifth of a cold screen in wasm.
const fastPiPiece = 32

// fastPi tabulates π and dπ/dc on a grid uniform in s = √c, where π is
// smooth (the Debye–Hückel term makes it a power series in √c).
type fastPi struct {
	h, invH float64   // grid step in s
	sTop    float64   // √capC
	p, dps  []float64 // π and dπ/ds at the nodes
	built   [fastPiIntervals/fastPiPiece + 1]sync.Once
	// bridgeI is the interval where a bridge to a measured saturated
	// solution starts (bridge.go): π is C¹ but not C² there and the bridge
	// can bend sharply over a short range, so from this interval up it is
	// evaluated exactly. Past the table without a bridge.
	bridgeI int
}

// FastOsmoticFunc returns a function with the contract of OsmoticFunc —
// π (Pa) and dπ/dc at molar concentration c, finite, monotone — that
// interpolates a table built once per Solution (about 500 evaluations of
// the model, made a piece of 32 nodes at a time on first use of the piece
// and shared by all callers). It serves
// solvers that evaluate π millions of times: one call costs about a fifth
// of OsmoticFunc. Accuracy against OsmoticFunc over the working range: the
// error in π is below 1e-8 of π plus 1e-10 of π at the top of the range,
// and dπ/dc is within 1e-4 relative (solvers use it for Newton steps
// only). Beyond the range it is exact (the same linear extension), and in
// the lowest intervals and on a bridge to a measured saturated solution
// (bridge.go) OsmoticFunc itself is called.
func (x *Solution) FastOsmoticFunc() func(c float64) (float64, float64) {
	x.fastOnce.Do(x.buildFastPi)
	f := x.fast
	return func(c float64) (float64, float64) {
		if c >= x.capC {
			return x.capPi + x.capSlope*(c-x.capC), x.capSlope
		}
		s := math.Sqrt(c)
		t := s * f.invH
		i := int(t)
		if i < fastPiExact || i >= f.bridgeI {
			// First intervals: dπ/dc = (dπ/ds)/(2s) is ill-conditioned
			// near s = 0; and the bridge's start: evaluate the model directly.
			return x.OsmoticFunc(c)
		}
		if i >= fastPiIntervals {
			i = fastPiIntervals - 1
		}
		f.node(x, i)
		if (i+1)%fastPiPiece == 0 {
			f.node(x, i+1)
		}
		u := t - float64(i)
		p0, p1 := f.p[i], f.p[i+1]
		m0, m1 := f.dps[i]*f.h, f.dps[i+1]*f.h
		// Cubic Hermite on [0, 1].
		u2 := u * u
		u3 := u2 * u
		pi := (2*u3-3*u2+1)*p0 + (u3-2*u2+u)*m0 + (-2*u3+3*u2)*p1 + (u3-u2)*m1
		dpdu := (6*u2-6*u)*p0 + (3*u2-4*u+1)*m0 + (-6*u2+6*u)*p1 + (3*u2-2*u)*m1
		// dπ/dc = (dπ/du)(du/ds)(ds/dc) = dpdu · (1/h) · 1/(2s).
		return pi, dpdu * f.invH / (2 * s)
	}
}

// buildFastPi lays out the table, run once through fastOnce; its nodes
// are filled a piece at a time by node.
func (x *Solution) buildFastPi() {
	f := &fastPi{sTop: math.Sqrt(x.capC), bridgeI: fastPiIntervals + 1}
	f.h = f.sTop / fastPiIntervals
	f.invH = 1 / f.h
	if x.br != nil {
		f.bridgeI = int(math.Sqrt(x.molarityFromMolality(x.br.m0)) * f.invH)
	}
	f.p = make([]float64, fastPiIntervals+1)
	f.dps = make([]float64, fastPiIntervals+1)
	x.fast = f
}

// node fills the piece of the table that holds node i (once).
func (f *fastPi) node(x *Solution, i int) {
	k := i / fastPiPiece
	f.built[k].Do(func() {
		for i := k * fastPiPiece; i < min((k+1)*fastPiPiece, fastPiIntervals+1); i++ {
			s := float64(i) * f.h
			if i == fastPiIntervals {
				s = f.sTop * (1 - 1e-15) // stay inside the model at the top node
			}
			p, d := x.OsmoticFunc(s * s)
			f.p[i], f.dps[i] = p, d*2*s
		}
	})
}

// fastState is embedded in Solution.
type fastState struct {
	fastOnce sync.Once
	fast     *fastPi
}
