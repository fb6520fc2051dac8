package module

import (
	"errors"
	"fmt"
	"math"

	"drawsift/engine/errs"
	"drawsift/engine/internal/roots"
)

// Target is a design target: the recovery (permeate over feed inflow)
// or the permeate flow (m³/s); exactly one is positive.
type Target struct {
	Recovery       float64
	PermeateM3PerS float64
}

// designRelTol: the design's area is found to this relative tolerance
// on the permeate, or to 100× the integrator's tolerance when that is
// looser (below it the permeate is noise and Brent's method only spins).
const designRelTol = 1e-8

// Design finds the area that meets the target (Brent's method on the
// area, between a module too small and one large enough, found by
// doubling from the inlet flux's estimate), then rates it. A target at
// or past the osmotic-equilibrium cap (RecoveryCap) is an
// *errs.InputError naming target.recovery or target.permeate_l_per_h with
// the cap; so is one the module cannot reach because solute crossing
// lowers its permeate below the cap (the greatest permeate found is
// given).
func Design(p *Problem, t Target) (*Result, error) {
	s, err := newSolver(p)
	if err != nil {
		return nil, err
	}
	field, want := "target.recovery", t.Recovery*p.FeedInM3PerS
	if t.PermeateM3PerS > 0 {
		field, want = "target.permeate_l_per_h", t.PermeateM3PerS
	}
	show := func(perm float64) float64 {
		if field == "target.recovery" {
			return perm / p.FeedInM3PerS
		}
		return perm * lPerHPerM3PerS
	}
	if !(want > 0) || (t.Recovery > 0 && t.PermeateM3PerS > 0) {
		return nil, errs.Invalid("target", 0, "one of recovery in (0, 1) or permeate_l_per_h > 0", "give one design target")
	}
	cp, err := s.recoveryCap()
	if err != nil {
		return nil, err
	}
	if want >= cp.PermeateM3PerS {
		return nil, errs.Invalid(field, show(want), fmt.Sprintf("< %.6g (the osmotic-equilibrium cap, %s pinch)", show(cp.PermeateM3PerS), cp.Pinch),
			"the target is at or beyond what osmotic equilibrium allows: recovery cap %.4g (permeate %.4g L/h)", cp.Recovery, cp.PermeateM3PerS*lPerHPerM3PerS)
	}
	// Estimate from the inlet flux: the flux only falls along the module,
	// so this area is too small.
	var jw0 float64
	{
		y := make([]float64, s.dim)
		s.inlet(y)
		s.area = 1
		if _, err := s.rhs(0, y, s.k[0]); err != nil {
			return nil, err
		}
		jw0 = s.res.JwMPerS
	}
	a := want / jw0
	if !(a > 0) || !finite(a) {
		return nil, errs.Invalid(field, show(want), "a target the inlet driving force can reach", "no water is drawn at the inlets")
	}
	a = min(a, MaxAreaM2)
	var warm []float64
	perm := func(area float64) (float64, error) {
		r, err := s.solveAt(area, warm, false)
		if err != nil {
			return 0, err
		}
		warm = r.v
		if p.Flow == Co {
			return r.y1[0] - p.DrawInM3PerS, nil
		}
		return r.y0[0] - p.DrawInM3PerS, nil
	}
	lo, pLo := 0.0, 0.0
	hi := a
	pHi, err := perm(hi)
	if err != nil {
		return nil, err
	}
	for pHi < want {
		if hi >= MaxAreaM2 {
			return nil, errs.Invalid(field, show(want), fmt.Sprintf("reachable within %g m²", float64(MaxAreaM2)), "the target needs more than %g m² of membrane", float64(MaxAreaM2))
		}
		next := min(2*hi, MaxAreaM2)
		pNext, err := perm(next)
		if errors.Is(err, ErrRunsDry) {
			break
		}
		if err != nil {
			return nil, err
		}
		if pNext <= pHi {
			// Solute crossing has turned the permeate down before the
			// target: the module's greatest permeate lies below it.
			return nil, errs.Invalid(field, show(want), fmt.Sprintf("< %.6g (the most this module reaches, near %.4g m²)", show(pHi), hi),
				"solute crossing the membrane caps the permeate below the target: at most recovery %.4g (permeate %.4g L/h)", pHi/p.FeedInM3PerS, pHi*lPerHPerM3PerS)
		}
		lo, pLo, hi, pHi = hi, pHi, next, pNext
	}
	ftol := max(designRelTol, 100*s.rtol)
	var fail error
	f := func(area float64) float64 {
		if fail != nil {
			return 0
		}
		v, err := perm(area)
		if err != nil {
			fail = err
			return 0
		}
		return (v - want) / want
	}
	res, err := roots.Brent(f, roots.Bracket{Lo: lo, Hi: hi, FLo: (pLo - want) / want, FHi: (pHi - want) / want},
		&roots.Settings{Solver: "module design (area)", FAbsTol: ftol, XRelTol: 1e-12})
	if fail != nil {
		return nil, fail
	}
	if err != nil {
		return nil, err
	}
	r, err := s.solveAt(res.X, warm, true)
	if err != nil {
		return nil, err
	}
	out := s.result(r, cp)
	out.Stats.DesignIterations = res.Iterations
	// The rating's permeate carries the integration's error (and, counter-
	// current, the boundary residual's), on the scale of the flows.
	if math.Abs(out.PermeateM3PerS-want) > 10*ftol*want+100*s.rtol*(p.DrawInM3PerS+p.FeedInM3PerS) {
		return nil, &errs.ConvergenceError{Solver: "module design (area)", Reason: "the rated permeate misses the target", Iterations: res.Iterations,
			Residual: math.Abs(out.PermeateM3PerS-want) / want}
	}
	return out, nil
}
