package module

import (
	"math"

	"drawsift/engine/errs"
	"drawsift/engine/internal/roots"
)

// Counter-current shooting. The unknowns are the draw's outlet state at
// x = 0, scaled: v[0] = P/Q_d,in (P the permeate, so Q_d(0) = Q_d,in + P)
// and v[1+i] = n_d,i(0)/n_i,tot (n_i,tot the species' inflow in both
// streams). The residual is the draw's state at x = A against its inlet,
// scaled alike: r[0] = (Q_d(A) − Q_d,in)/Q_d,in, r[1+i] = (n_d,i(A) −
// n_d,in,i)/n_i,tot.

// newtonMaxIter bounds the Newton iterations on one frozen step
// sequence; meshRounds the re-meshing rounds.
const (
	newtonMaxIter = 12
	meshRounds    = 4
	// fdStep is the relative finite-difference step of the Jacobian
	// (the frozen integration is smooth in the unknowns, so a step near
	// √ε·10 leaves ≈ 1e-7 relative error in each derivative).
	fdStep = 1e-7
)

// speciesScale is the scale of species i's unknown.
func (s *solver) speciesScale(i int) float64 {
	return max(s.scale[2+i], 1e-300)
}

// unknownsToY0 writes the state at x = 0 for unknowns v.
func (s *solver) unknownsToY0(v, y0 []float64) {
	s.inlet(y0)
	y0[0] = s.p.DrawInM3PerS * (1 + v[0])
	for i := 0; i < s.n; i++ {
		y0[2+i] = v[1+i] * s.speciesScale(i)
	}
}

// residual integrates from the unknowns v (frozen steps, or adaptive when
// frozen is nil) and writes the scaled boundary residual into r. It
// reports false when the integration could not reach x = A (a stream ran
// dry): r[0] then lies below −1, below every reachable value, so a
// bracketing search still sees the sign it needs.
func (s *solver) residual(v, r []float64, frozen []float64, y0, y1 []float64) (bool, error) {
	s.unknownsToY0(v, y0)
	in, err := s.integrate(y0, y1, frozen)
	if err != nil {
		return false, err
	}
	if !in.ok {
		r[0] = -1 - (s.area-in.reached)/s.area
		for i := 1; i < len(r); i++ {
			r[i] = 0
		}
		return false, nil
	}
	p := s.p
	r[0] = (y1[0] - p.DrawInM3PerS) / p.DrawInM3PerS
	for i := 0; i < s.n; i++ {
		r[1+i] = (y1[2+i] - p.Input.Species[i].DrawBulkMolPerM3*p.DrawInM3PerS) / s.speciesScale(i)
	}
	return true, nil
}

func normInf(r []float64) float64 {
	var m float64
	for _, v := range r {
		m = max(m, math.Abs(v))
	}
	return m
}

// bcTol is the accepted boundary residual: a few times the integrator's
// tolerance (the residual of a converged Newton on one step sequence,
// read on a fresh adaptive one, is the integration error).
func (s *solver) bcTol() float64 { return 10 * s.rtol }

// shoot solves the counter-current boundary-value problem at s.area and
// returns the unknowns and the path taken.
func (s *solver) shoot(warm []float64) ([]float64, string, error) {
	m := s.n + 1
	if warm != nil {
		v := append([]float64(nil), warm...)
		if ok, err := s.newton(v); err != nil {
			return nil, "", err
		} else if ok {
			return v, "shooting-newton", nil
		}
	}
	v := make([]float64, m)
	if err := s.start(v); err != nil {
		return nil, "", err
	}
	ok, err := s.newton(v)
	if err != nil {
		return nil, "", err
	}
	if ok {
		return v, "shooting-newton", nil
	}
	ok, err = s.continueInArea(v)
	if err != nil {
		return nil, "", err
	}
	if ok {
		return v, "shooting-newton+continuation", nil
	}
	return nil, "", &errs.ConvergenceError{Solver: "module counter-current shooting", Reason: "Newton's method did not converge, nor did continuation in area",
		Iterations: s.stats.NewtonIterations, Residual: s.stats.BoundaryResidual}
}

// continueInArea solves at s.area by continuation: from a small module,
// whose outlet state lies near the inlets, up to the whole in equal
// steps, each solution starting the next (4, then 16, then 64 steps). It
// leaves the unknowns in v and reports whether the whole converged.
func (s *solver) continueInArea(v []float64) (bool, error) {
	whole := s.area
	defer func() { s.area = whole }()
	for _, parts := range []int{4, 16, 64} {
		s.area = whole / float64(parts)
		if err := s.start(v); err != nil {
			return false, err
		}
		ok, err := s.newton(v)
		for k := 2; ok && err == nil && k <= parts; k++ {
			prev := s.area
			s.area = whole * float64(k) / float64(parts)
			v[0] *= s.area / prev // the permeate grows about in proportion
			ok, err = s.newton(v)
		}
		if err != nil || ok {
			return ok, err
		}
	}
	return false, nil
}

// start finds a first guess: the draw's outlet species at their inlet
// values (no exchange) and the permeate by a Brent search on r[0], which
// rises with P; then one fixed-point correction of the species.
func (s *solver) start(v []float64) error {
	m := s.n + 1
	r := make([]float64, m)
	y0, y1 := make([]float64, s.dim), make([]float64, s.dim)
	for i := 0; i < s.n; i++ {
		v[1+i] = s.p.Input.Species[i].DrawBulkMolPerM3 * s.p.DrawInM3PerS / s.speciesScale(i)
	}
	var fail error
	g := func(x float64) float64 {
		if fail != nil {
			return 0
		}
		v[0] = x
		if _, err := s.residual(v, r, nil, y0, y1); err != nil {
			fail = err
			return 0
		}
		return r[0]
	}
	cp, err := s.recoveryCap()
	if err != nil {
		return err
	}
	qd, qf := s.p.DrawInM3PerS, s.p.FeedInM3PerS
	top := qf * (1 - 1e-9) / qd
	gLo := g(0)
	if fail != nil {
		return fail
	}
	// The draw cannot leave more dilute than in equilibrium with the fresh
	// feed (without solute exchange): try just past that, then wider.
	hi, gHi := 0.0, math.Inf(-1)
	for _, x := range []float64{min(1.05*cp.PermeateM3PerS/qd, top), min(2*cp.PermeateM3PerS/qd, top), top} {
		if hi, gHi = x, g(x); fail != nil {
			return fail
		}
		if gHi > 0 {
			break
		}
	}
	if !(gLo < 0 && gHi > 0) {
		// No sign change: an exact zero at an end, or no solution.
		if gLo == 0 {
			v[0] = 0
			return nil
		}
		return &errs.ConvergenceError{Solver: "module counter-current start", Reason: "no bracket on the permeate", Residual: math.Min(math.Abs(gLo), math.Abs(gHi))}
	}
	res, err := roots.Brent(g, roots.Bracket{Lo: 0, Hi: hi, FLo: gLo, FHi: gHi}, &roots.Settings{Solver: "module counter-current start", XRelTol: 1e-7})
	if fail != nil {
		return fail
	}
	if err != nil && !res.Status.Converged() {
		return err
	}
	v[0] = res.X
	// One fixed-point step on the species: the draw leaves with what it
	// came with plus what it gained.
	if ok, err := s.residual(v, r, nil, y0, y1); err != nil {
		return err
	} else if ok {
		for i := 0; i < s.n; i++ {
			v[1+i] = max(v[1+i]-r[1+i], 0)
		}
	}
	return nil
}

// newton refines v in place by damped Newton steps on frozen step
// sequences. It reports whether the boundary residual met bcTol on a
// fresh adaptive integration.
//
// The Jacobian is a forward difference on the frozen steps, computed only
// when the kept one (the last computed, Broyden-updated after each step
// taken with it) fails to cut the residual at least in half: near a
// solution, and from one design area to the next, a kept Jacobian costs
// one integration per iteration instead of n + 2.
func (s *solver) newton(v []float64) (bool, error) {
	m := s.n + 1
	r, rt := make([]float64, m), make([]float64, m)
	vt, dv := make([]float64, m), make([]float64, m)
	work := make([]float64, m*m)
	if len(s.jac) != m*m {
		s.jac, s.jacOK = make([]float64, m*m), false
	}
	y0, y1 := make([]float64, s.dim), make([]float64, s.dim)
	for round := 0; round < meshRounds; round++ {
		ok, err := s.residual(v, r, nil, y0, y1)
		if err != nil {
			return false, err
		}
		if !ok {
			return false, nil
		}
		s.stats.BoundaryResidual = normInf(r)
		if s.stats.BoundaryResidual <= s.bcTol() {
			return true, nil
		}
		mesh := append([]float64(nil), s.steps...)
		for it := 0; it < newtonMaxIter; it++ {
			nr := normInf(r)
			if nr <= 1e-3*s.bcTol() {
				break
			}
			if s.jacOK {
				// Try the kept Jacobian: a full step that halves the
				// residual is taken, and the Jacobian updated (Broyden).
				ok, err := s.step(v, r, vt, rt, dv, work, mesh, y0, y1)
				if err != nil {
					return false, err
				}
				if ok && normInf(rt) <= 0.5*nr {
					s.broyden(v, vt, r, rt)
					copy(v, vt)
					copy(r, rt)
					s.stats.NewtonIterations++
					continue
				}
			}
			if err := s.jacobian(v, r, vt, rt, mesh, y0, y1); err != nil {
				return false, err
			}
			if !s.jacOK {
				return false, nil
			}
			ok, err := s.step(v, r, vt, rt, dv, work, mesh, y0, y1)
			if err != nil {
				return false, err
			}
			if !s.jacOK {
				return false, nil // singular
			}
			accepted := ok && normInf(rt) < (1-1e-4)*nr
			for lambda := 0.5; !accepted && lambda >= 1.0/64; lambda /= 2 {
				s.clampStep(v, dv, vt, lambda)
				ok, err := s.residual(vt, rt, mesh, y0, y1)
				if err != nil {
					return false, err
				}
				accepted = ok && normInf(rt) < (1-1e-4*lambda)*nr
			}
			if !accepted {
				break
			}
			s.stats.NewtonIterations++
			copy(v, vt)
			copy(r, rt)
		}
	}
	ok, err := s.residual(v, r, nil, y0, y1)
	if err != nil || !ok {
		return false, err
	}
	s.stats.BoundaryResidual = normInf(r)
	return s.stats.BoundaryResidual <= s.bcTol(), nil
}

// jacobian computes the forward-difference Jacobian of the residual at v
// on the frozen mesh into s.jac; s.jacOK reports success.
func (s *solver) jacobian(v, r, vt, rt, mesh, y0, y1 []float64) error {
	m := s.n + 1
	s.jacOK = false
	for j := 0; j < m; j++ {
		copy(vt, v)
		h := fdStep * max(math.Abs(v[j]), 1e-4)
		vt[j] += h
		ok, err := s.residual(vt, rt, mesh, y0, y1)
		if err != nil {
			return err
		}
		if !ok {
			// Step the other way (the unknown sits near a dry state).
			h = -h
			vt[j] = v[j] + h
			if ok, err = s.residual(vt, rt, mesh, y0, y1); err != nil || !ok {
				return err
			}
		}
		for k := 0; k < m; k++ {
			s.jac[k*m+j] = (rt[k] - r[k]) / h
		}
	}
	s.jacOK = true
	return nil
}

// step solves s.jac·dv = −r and evaluates the full step's residual into
// rt at vt (clamped to physical unknowns). It reports whether the
// residual could be evaluated; a singular Jacobian drops it (s.jacOK).
func (s *solver) step(v, r, vt, rt, dv, work, mesh, y0, y1 []float64) (bool, error) {
	m := s.n + 1
	copy(work, s.jac)
	for k := range dv {
		dv[k] = -r[k]
	}
	if !luSolve(work, dv, m) {
		s.jacOK = false
		return false, nil
	}
	s.clampStep(v, dv, vt, 1)
	return s.residual(vt, rt, mesh, y0, y1)
}

// clampStep writes v + λ·dv into vt, keeping the draw's outlet flow
// positive and every species' amount non-negative.
func (s *solver) clampStep(v, dv, vt []float64, lambda float64) {
	for k := range vt {
		vt[k] = v[k] + lambda*dv[k]
	}
	vt[0] = max(vt[0], -0.999)
	for k := 1; k < len(vt); k++ {
		vt[k] = max(vt[k], 0)
	}
}

// broyden updates s.jac after the step from v to vt took the residual
// from r to rt: J += (Δr − J·Δv)·Δvᵀ/(Δvᵀ·Δv) (Broyden 1965, Math. Comp.
// 19:577, the "good" update).
func (s *solver) broyden(v, vt, r, rt []float64) {
	m := s.n + 1
	var dd float64
	for j := 0; j < m; j++ {
		dd += (vt[j] - v[j]) * (vt[j] - v[j])
	}
	if !(dd > 0) {
		return
	}
	for k := 0; k < m; k++ {
		u := rt[k] - r[k]
		for j := 0; j < m; j++ {
			u -= s.jac[k*m+j] * (vt[j] - v[j])
		}
		u /= dd
		for j := 0; j < m; j++ {
			s.jac[k*m+j] += u * (vt[j] - v[j])
		}
	}
}

// luSolve solves a·x = b in place (a is m×m, row-major; b becomes x) by
// Gaussian elimination with partial pivoting; false when a is singular.
func luSolve(a, b []float64, m int) bool {
	for c := 0; c < m; c++ {
		p := c
		for r := c + 1; r < m; r++ {
			if math.Abs(a[r*m+c]) > math.Abs(a[p*m+c]) {
				p = r
			}
		}
		if !(math.Abs(a[p*m+c]) > 0) {
			return false
		}
		if p != c {
			for k := 0; k < m; k++ {
				a[c*m+k], a[p*m+k] = a[p*m+k], a[c*m+k]
			}
			b[c], b[p] = b[p], b[c]
		}
		for r := c + 1; r < m; r++ {
			f := a[r*m+c] / a[c*m+c]
			if f == 0 {
				continue
			}
			for k := c; k < m; k++ {
				a[r*m+k] -= f * a[c*m+k]
			}
			b[r] -= f * b[c]
		}
	}
	for c := m - 1; c >= 0; c-- {
		v := b[c]
		for k := c + 1; k < m; k++ {
			v -= a[c*m+k] * b[k]
		}
		b[c] = v / a[c*m+c]
		if !finite(b[c]) {
			return false
		}
	}
	return true
}
