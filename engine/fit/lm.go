package fit

import (
	"math"
)

// SolverStats describe one Levenberg–Marquardt run.
type SolverStats struct {
	Status      string  // "converged-gradient", "converged-step", "converged-cost", "max-iterations"
	Iterations  int     // accepted and rejected steps
	Evaluations int     // model evaluations (each solves every point)
	Gradient    float64 // ‖Jᵀr‖∞ at the end, in ln-parameter units
	Cost        float64 // ½Σr²
}

const (
	maxIterations = 200
	// jacStep is the central-difference step in ln p: its truncation error
	// (~h²) and rounding error (~1e-13/h) are both far below what the
	// covariance needs.
	jacStep = 1e-5
)

// lmWork holds a run's residuals (r), a scratch vector (rt) and the
// Jacobian of the weighted residuals (m × k, row major).
type lmWork struct {
	r, rt, jac []float64
}

func (p *Problem) newWork() *lmWork {
	m, k := p.observations, len(p.free)
	return &lmWork{r: make([]float64, m), rt: make([]float64, m), jac: make([]float64, m*k)}
}

// cost evaluates the residuals at theta into r.
func (p *Problem) cost(theta, y, r []float64) (float64, error) {
	v := p.full(theta)
	if err := p.residuals(&v, y, r); err != nil {
		return 0, err
	}
	s := 0.0
	for _, x := range r {
		s += x * x
	}
	return s / 2, nil
}

// jacobian fills w.jac by central differences in ln p.
func (p *Problem) jacobian(theta, y []float64, w *lmWork, st *SolverStats) error {
	m, k := p.observations, len(p.free)
	th := append([]float64(nil), theta...)
	for c := range k {
		th[c] = theta[c] + jacStep
		if _, err := p.cost(th, y, w.rt); err != nil {
			return err
		}
		th[c] = theta[c] - jacStep
		if _, err := p.cost(th, y, w.r); err != nil {
			return err
		}
		st.Evaluations += 2
		for i := range m {
			w.jac[i*k+c] = (w.rt[i] - w.r[i]) / (2 * jacStep)
		}
		th[c] = theta[c]
	}
	return nil
}

// minimise runs Levenberg–Marquardt on ½Σr² over theta (ln p of the free
// parameters, changed in place) within the bounds, for the measurements y
// (nil: the data's); it leaves the residuals and their Jacobian at the
// solution in w.
func (p *Problem) minimise(theta, y []float64, w *lmWork) (SolverStats, error) {
	k := len(p.free)
	var st SolverStats
	lo, hi := make([]float64, k), make([]float64, k)
	for i, j := range p.free {
		lo[i], hi[i] = math.Log(lowerBound[j]), math.Log(upperBound[j])
		theta[i] = min(max(theta[i], lo[i]), hi[i])
	}
	c, err := p.cost(theta, y, w.r)
	if err != nil {
		return st, err
	}
	st.Evaluations++
	lambda := 1e-3
	g := make([]float64, k)
	h := make([]float64, k*k)
	a := make([]float64, k*k)
	step := make([]float64, k)
	trial := make([]float64, k)
	r := make([]float64, len(w.r))
	st.Status = "max-iterations"
	fresh := true
	for st.Iterations < maxIterations {
		if fresh {
			copy(r, w.r)
			if err := p.jacobian(theta, y, w, &st); err != nil {
				return st, err
			}
			normal(w.jac, r, k, h, g)
			st.Gradient = infNorm(g)
			// A gradient at rounding level of the cost: nothing left to gain.
			if st.Gradient <= 1e-10*math.Max(c, 1e-20) || c < 1e-28 {
				st.Status = "converged-gradient"
				break
			}
			fresh = false
		}
		st.Iterations++
		for i := range k * k {
			a[i] = h[i]
		}
		for i := range k {
			a[i*k+i] += lambda * math.Max(h[i*k+i], 1e-12)
			step[i] = -g[i]
		}
		if !solveSPD(a, step, k) {
			lambda *= 10
			continue
		}
		maxStep := 0.0
		for i := range k {
			trial[i] = min(max(theta[i]+step[i], lo[i]), hi[i])
			maxStep = math.Max(maxStep, math.Abs(trial[i]-theta[i]))
		}
		ct, err := p.cost(trial, y, w.r)
		st.Evaluations++
		if err != nil {
			return st, err
		}
		if ct < c {
			copy(theta, trial)
			dc := c - ct
			c = ct
			lambda = math.Max(lambda/3, 1e-12)
			fresh = true
			if maxStep < 1e-12 || dc <= 1e-15*c {
				st.Status = "converged-step"
				if maxStep >= 1e-12 {
					st.Status = "converged-cost"
				}
				// Final Jacobian at the accepted point.
				copy(r, w.r)
				if err := p.jacobian(theta, y, w, &st); err != nil {
					return st, err
				}
				normal(w.jac, r, k, h, g)
				st.Gradient = infNorm(g)
				break
			}
			continue
		}
		copy(w.r, r)
		if maxStep < 1e-13 {
			st.Status = "converged-step"
			break
		}
		lambda *= 4
		if lambda > 1e16 {
			st.Status = "converged-step"
			break
		}
	}
	if st.Status == "max-iterations" && fresh {
		copy(r, w.r)
		if err := p.jacobian(theta, y, w, &st); err != nil {
			return st, err
		}
		normal(w.jac, r, k, h, g)
		st.Gradient = infNorm(g)
	}
	copy(w.r, r)
	st.Cost = c
	return st, nil
}

// normal forms h = JᵀJ (k × k) and g = Jᵀr.
func normal(jac, r []float64, k int, h, g []float64) {
	for i := range k * k {
		h[i] = 0
	}
	for i := range k {
		g[i] = 0
	}
	for row := range len(r) {
		jr := jac[row*k : row*k+k]
		for a := range k {
			g[a] += jr[a] * r[row]
			for b := range k {
				h[a*k+b] += jr[a] * jr[b]
			}
		}
	}
}

func infNorm(v []float64) float64 {
	m := 0.0
	for _, x := range v {
		m = math.Max(m, math.Abs(x))
	}
	return m
}

// solveSPD solves a·x = b in place (b becomes x) by Cholesky; false when
// a is not positive definite.
func solveSPD(a, b []float64, k int) bool {
	l := make([]float64, k*k)
	for i := range k {
		for j := 0; j <= i; j++ {
			s := a[i*k+j]
			for q := range j {
				s -= l[i*k+q] * l[j*k+q]
			}
			if i == j {
				if !(s > 0) {
					return false
				}
				l[i*k+i] = math.Sqrt(s)
			} else {
				l[i*k+j] = s / l[j*k+j]
			}
		}
	}
	for i := range k {
		s := b[i]
		for q := range i {
			s -= l[i*k+q] * b[q]
		}
		b[i] = s / l[i*k+i]
	}
	for i := k - 1; i >= 0; i-- {
		s := b[i]
		for q := i + 1; q < k; q++ {
			s -= l[q*k+i] * b[q]
		}
		b[i] = s / l[i*k+i]
	}
	return true
}

// symInverse inverts the symmetric k × k matrix h through its
// eigen-decomposition (cyclic Jacobi rotations), returning the inverse and
// the ratio of the smallest to the largest eigenvalue; eigenvalues below
// 1e-14 of the largest are treated as zero (ok false).
func symInverse(h []float64, k int) (inv []float64, rcond float64, ok bool) {
	a := append([]float64(nil), h...)
	v := make([]float64, k*k)
	for i := range k {
		v[i*k+i] = 1
	}
	for sweep := 0; sweep < 60; sweep++ {
		off := 0.0
		for i := range k {
			for j := i + 1; j < k; j++ {
				off += a[i*k+j] * a[i*k+j]
			}
		}
		if off < 1e-300 {
			break
		}
		for pI := range k {
			for q := pI + 1; q < k; q++ {
				apq := a[pI*k+q]
				if apq == 0 {
					continue
				}
				theta := (a[q*k+q] - a[pI*k+pI]) / (2 * apq)
				t := math.Copysign(1, theta) / (math.Abs(theta) + math.Sqrt(theta*theta+1))
				c := 1 / math.Sqrt(t*t+1)
				s := t * c
				for r := range k {
					arp, arq := a[r*k+pI], a[r*k+q]
					a[r*k+pI], a[r*k+q] = c*arp-s*arq, s*arp+c*arq
				}
				for r := range k {
					apr, aqr := a[pI*k+r], a[q*k+r]
					a[pI*k+r], a[q*k+r] = c*apr-s*aqr, s*apr+c*aqr
				}
				for r := range k {
					vrp, vrq := v[r*k+pI], v[r*k+q]
					v[r*k+pI], v[r*k+q] = c*vrp-s*vrq, s*vrp+c*vrq
				}
			}
		}
	}
	maxE, minE := 0.0, math.Inf(1)
	for i := range k {
		maxE = math.Max(maxE, a[i*k+i])
		minE = math.Min(minE, a[i*k+i])
	}
	if !(maxE > 0) {
		return nil, 0, false
	}
	rcond = math.Max(minE, 0) / maxE
	if minE <= 1e-14*maxE {
		return nil, rcond, false
	}
	inv = make([]float64, k*k)
	for i := range k {
		for j := range k {
			s := 0.0
			for e := range k {
				s += v[i*k+e] * v[j*k+e] / a[e*k+e]
			}
			inv[i*k+j] = s
		}
	}
	return inv, rcond, true
}
