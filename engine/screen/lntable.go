package screen

import (
	"context"
	"math"
)

// lnTable tabulates a smooth positive function of a positive variable
// for a robustness run, whose samples each ask for it at a slightly
// different point (the basis moves with the sampled π): a Chebyshev
// interpolant in ln x over [a, b] replaces the exact evaluation by one
// Clenshaw sum. A candidate has three (candidateTables): its
// regeneration energy (a 16-point quadrature of exact π) and its
// viscosity against molality, and its molality against the basis π (a
// Newton solve on the exact π).
//
// The table checks itself when it is built: at the 2N+1 points between
// and beside its nodes it must match the exact function to lnTableTol
// relative, else newLnTable returns nil and the run keeps the exact
// function (a π model with a kink, such as a bridge to a measured
// saturated solution, may fail it). Outside [a, b] the exact value is
// used.
type lnTable struct {
	lnA, lnB float64
	coef     [lnTableNodes]float64
}

const (
	lnTableNodes = 32
	// lnTableSpan: the tables cover the nominal molality ÷ and × this,
	// wider than a sampled π factor moves the basis (our own choice).
	lnTableSpan = 2.5
	// lnTableTol is the accepted relative error of the table: far below
	// any spread the robustness run samples (a few per cent), so ranks
	// move only where two candidates tie to 1e-8. Smooth single-salt π
	// models reach about 1e-14; seawater's mixture model 1.4e-9.
	lnTableTol = 1e-8
)

// newLnTable tabulates f over [a, b] (0 < a < b), or returns nil when
// the interpolant misses f by more than lnTableTol at a check point.
func newLnTable(f func(m float64) float64, a, b float64) *lnTable {
	if !(a > 0 && b > a) || math.IsInf(b, 0) {
		return nil
	}
	t := &lnTable{lnA: math.Log(a), lnB: math.Log(b)}
	const n = lnTableNodes
	var v [n]float64
	for k := 0; k < n; k++ {
		v[k] = f(t.m(math.Cos(math.Pi * (float64(k) + 0.5) / n)))
		if !(v[k] > 0) || math.IsInf(v[k], 0) {
			return nil
		}
	}
	for j := 0; j < n; j++ {
		s := 0.0
		for k := 0; k < n; k++ {
			s += v[k] * math.Cos(math.Pi*float64(j)*(float64(k)+0.5)/n)
		}
		t.coef[j] = 2 * s / n
	}
	if t.maxRelError(f) > lnTableTol {
		return nil
	}
	return t
}

// maxRelError is the table's largest relative error against f at the 2N+1
// points between and beside its nodes (+Inf where f is not finite).
func (t *lnTable) maxRelError(f func(m float64) float64) float64 {
	const n = lnTableNodes
	worst := 0.0
	for k := 0; k <= 2*n; k++ {
		m := t.m(math.Cos(math.Pi * float64(k) / (2 * n)))
		want := f(m)
		got, _ := t.at(m)
		d := math.Abs(got-want) / math.Abs(want)
		if !(d <= math.MaxFloat64) {
			return math.Inf(1)
		}
		worst = max(worst, d)
	}
	return worst
}

// m is the variable (a molality, or a π for the inverse) at u ∈ [−1, 1].
func (t *lnTable) m(u float64) float64 {
	return math.Exp(t.lnA + (u+1)/2*(t.lnB-t.lnA))
}

// at is the tabulated value at m; false outside the table.
func (t *lnTable) at(m float64) (float64, bool) {
	if !(m > 0) {
		return 0, false
	}
	u := 2*(math.Log(m)-t.lnA)/(t.lnB-t.lnA) - 1
	// The ends, computed back from a node's molality, may land a rounding
	// outside [−1, 1]: they are in.
	const edge = 1e-12
	if !(u >= -1-edge && u <= 1+edge) {
		return 0, false
	}
	u = min(max(u, -1), 1)
	// Clenshaw's recurrence for Σ' c_j T_j(u).
	var b1, b2 float64
	for j := lnTableNodes - 1; j >= 1; j-- {
		b1, b2 = 2*u*b1-b2+t.coef[j], b1
	}
	return u*b1 - b2 + t.coef[0]/2, true
}

// candidateTables are the tables of one candidate for a robustness run
// (each nil where refused: the exact function then runs).
type candidateTables struct {
	regen, visc *lnTable // against molality
	inv         *lnTable // molality against the basis π, Pa
}

// tabulateRanked builds the tables of the ranked candidates that have
// none (res.Ranked[k] is e.cands[ci[k]]), on up to workers goroutines:
// each candidate's tables are its own and read only the shared prepared
// solutions, so they are the same whichever goroutine builds them.
func (e *env) tabulateRanked(ctx context.Context, res *Result, ci []int, workers int) {
	var todo []int
	for k := range res.Ranked {
		if e.cands[ci[k]].tabs == nil && res.Ranked[k].Metrics.MolalityMolPerKg > 0 {
			todo = append(todo, k)
		}
	}
	claimEach(ctx, workers, len(todo), 1, func(_, i int) {
		k := todo[i]
		e.tabulate(&e.cands[ci[k]], res.Ranked[k].Metrics.MolalityMolPerKg)
	})
}

// tabulate builds c's tables around its nominal molality m0: over m0 ÷
// and × lnTableSpan within the π model's supported range (past it π may
// bend, a bridge or an extrapolation, which a table's check would refuse
// for the whole span), the inverse within the solubility too.
func (e *env) tabulate(c *candidate, m0 float64) {
	x := c.x
	lo, hi := m0/lnTableSpan, min(m0*lnTableSpan, max(m0, x.SupportedMolPerKg()))
	c.tabs = &candidateTables{
		regen: newLnTable(func(m float64) float64 { return e.regenEnergyExact(c, m) }, lo, hi),
		visc:  newLnTable(x.ViscosityPaS, lo, hi),
	}
	if e.sc.Basis.Kind == BasisOsmoticPressure && !e.sc.VantHoff {
		top := min(hi, x.SolubilityMolPerKg())
		inv := func(pi float64) float64 {
			m, err := x.MolalityForPi(pi)
			if err != nil {
				return math.NaN() // refuses the table
			}
			return m
		}
		c.tabs.inv = newLnTable(inv, x.OsmoticPressurePa(lo), x.OsmoticPressurePa(top))
	}
}

// viscosity is c's viscosity at m, from its table where it has one.
func (e *env) viscosity(c *candidate, m float64) float64 {
	if t := c.tabs; t != nil && t.visc != nil {
		if v, ok := t.visc.at(m); ok {
			return v
		}
	}
	return c.x.ViscosityPaS(m)
}
