package screen

import "math"

// regenTable tabulates one candidate's regeneration energy against its
// molality for a robustness run, whose samples each ask for it at a
// slightly different molality (the basis moves with the sampled π): a
// Chebyshev interpolant in ln m over [a, b] replaces the 16-point
// quadrature of 16 exact π evaluations by one Clenshaw sum.
//
// The table checks itself when it is built: at the 2N points between
// its nodes it must match the exact energy to regenTableTol relative,
// else newRegenTable returns nil and the run keeps the exact quadrature
// (a π model with a kink, such as a bridge to a measured saturated
// solution, may fail it). Outside [a, b] the exact value is used.
type regenTable struct {
	lnA, lnB float64
	coef     [regenTableNodes]float64
}

const (
	regenTableNodes = 32
	// regenTableSpan: the table covers the nominal molality ÷ and × this,
	// wider than a sampled π factor moves the basis (our own choice).
	regenTableSpan = 2.5
	// regenTableTol is the accepted relative error of the table: far below
	// any spread the robustness run samples (a few per cent), so ranks
	// move only where two candidates tie to 1e-8. Smooth single-salt π
	// models reach about 1e-14; seawater's mixture model 1.4e-9.
	regenTableTol = 1e-8
)

// newRegenTable tabulates f over [a, b] (0 < a < b), or returns nil when
// the interpolant misses f by more than regenTableTol at a check point.
func newRegenTable(f func(m float64) float64, a, b float64) *regenTable {
	if !(a > 0 && b > a) || math.IsInf(b, 0) {
		return nil
	}
	t := &regenTable{lnA: math.Log(a), lnB: math.Log(b)}
	const n = regenTableNodes
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
	if t.maxRelError(f) > regenTableTol {
		return nil
	}
	return t
}

// maxRelError is the table's largest relative error against f at the 2N+1
// points between and beside its nodes (+Inf where f is not finite).
func (t *regenTable) maxRelError(f func(m float64) float64) float64 {
	const n = regenTableNodes
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

// m is the molality at u ∈ [−1, 1].
func (t *regenTable) m(u float64) float64 {
	return math.Exp(t.lnA + (u+1)/2*(t.lnB-t.lnA))
}

// at is the tabulated energy at molality m; false outside the table.
func (t *regenTable) at(m float64) (float64, bool) {
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
	for j := regenTableNodes - 1; j >= 1; j-- {
		b1, b2 = 2*u*b1-b2+t.coef[j], b1
	}
	return u*b1 - b2 + t.coef[0]/2, true
}
