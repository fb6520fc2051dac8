package module

import (
	"math"

	"drawsift/engine/transport"
)

// Dormand–Prince 5(4) coefficients (Dormand & Prince 1980, Table 2; as
// printed in Hairer, Nørsett & Wanner 1993, Table II.5.2). The fifth-order
// solution propagates (local extrapolation); the seventh stage is the
// first of the next step (FSAL).
const (
	dpC2, dpC3, dpC4, dpC5 = 1.0 / 5, 3.0 / 10, 4.0 / 5, 8.0 / 9

	dpA21 = 1.0 / 5
	dpA31 = 3.0 / 40
	dpA32 = 9.0 / 40
	dpA41 = 44.0 / 45
	dpA42 = -56.0 / 15
	dpA43 = 32.0 / 9
	dpA51 = 19372.0 / 6561
	dpA52 = -25360.0 / 2187
	dpA53 = 64448.0 / 6561
	dpA54 = -212.0 / 729
	dpA61 = 9017.0 / 3168
	dpA62 = -355.0 / 33
	dpA63 = 46732.0 / 5247
	dpA64 = 49.0 / 176
	dpA65 = -5103.0 / 18656
	dpA71 = 35.0 / 384
	dpA73 = 500.0 / 1113
	dpA74 = 125.0 / 192
	dpA75 = -2187.0 / 6784
	dpA76 = 11.0 / 84

	// Error weights: fifth-order minus fourth-order weights.
	dpE1 = 71.0 / 57600
	dpE3 = -71.0 / 16695
	dpE4 = 71.0 / 1920
	dpE5 = -17253.0 / 339200
	dpE6 = 22.0 / 525
	dpE7 = -1.0 / 40
)

// Step-size control (Hairer, Nørsett & Wanner 1993, eq. II.4.13 with
// their safety factor and bounds).
const (
	stepSafety = 0.9
	stepMinFac = 0.2
	stepMaxFac = 5.0
	// stepMinRel: below this fraction of the area a step is refused and
	// the integration reports that it could not go on.
	stepMinRel = 1e-12
	// maxSteps bounds one integration.
	maxSteps = 20000
)

// dpStages are the stages after the first: the node and the row of A.
var dpStages = [...]struct {
	c float64
	a []float64
}{
	{dpC2, []float64{dpA21}},
	{dpC3, []float64{dpA31, dpA32}},
	{dpC4, []float64{dpA41, dpA42, dpA43}},
	{dpC5, []float64{dpA51, dpA52, dpA53, dpA54}},
	{1, []float64{dpA61, dpA62, dpA63, dpA64, dpA65}},
	{1, []float64{dpA71, 0, dpA73, dpA74, dpA75, dpA76}},
}

// solver holds one problem's scratch: a private copy of the transport
// input and every vector of the integrator, allocated once.
type solver struct {
	p     *Problem
	in    transport.Input
	res   transport.Result
	n     int // species
	dim   int // 2 + 2n
	area  float64
	sign  float64 // +1 co-current, −1 counter-current (draw derivatives)
	rtol  float64
	scale []float64 // absolute scale of each state component
	k     [7][]float64
	ytmp  []float64
	ynew  []float64
	grad  []float64
	cbuf  []float64
	stats Stats
	// steps is the last adaptive integration's accepted step sequence
	// (replayed by a frozen integration).
	steps []float64
	// record: fill profiles at the grid points during an integration.
	record   bool
	profiles []Profile
	// capVal is the recovery cap once found (capDone).
	capVal  Cap
	capDone bool
	// jac is the last boundary Jacobian (row-major, (n+1)²), kept across
	// Newton calls with Broyden updates (jacOK): a design's next area, or
	// the next iteration, tries it before paying for a new one.
	jac   []float64
	jacOK bool
}

// integration is how one integration ended.
type integration struct {
	// reached is the area the integration got to (the whole area unless
	// a stream ran dry or the step size collapsed).
	reached float64
	ok      bool
}

// rhs evaluates the balances at x for state y into dy. It reports false
// when the state is outside the model (a stream's flow at or below zero,
// a concentration past the transport's bounds): the step is refused.
func (s *solver) rhs(x float64, y, dy []float64) (bool, error) {
	qd, qf := y[0], y[1]
	if !(qd > 0 && qf > 0) {
		return false, nil
	}
	n := s.n
	sp := s.in.Species
	for i := 0; i < n; i++ {
		cd, cf := max(y[2+i], 0)/qd, max(y[2+n+i], 0)/qf
		if !(cd <= maxBulkMolPerM3 && cf <= maxBulkMolPerM3) {
			return false, nil
		}
		sp[i].DrawBulkMolPerM3, sp[i].FeedBulkMolPerM3 = cd, cf
	}
	if s.p.Layout != nil {
		s.p.Layout.SetShares(sp)
	}
	s.in.DeltaPPa = s.deltaP(x)
	s.stats.FluxSolves++
	if err := transport.SolveInto(&s.in, &s.res); err != nil {
		return false, err
	}
	jw := s.res.JwMPerS
	dy[0], dy[1] = s.sign*jw, -jw
	for i := 0; i < n; i++ {
		f := s.res.Species[i].FluxMolPerM2S
		dy[2+i], dy[2+n+i] = s.sign*f, -f
	}
	return true, nil
}

// maxBulkMolPerM3 is the transport's bound on a bulk concentration
// (100 mol/L): a stream concentrated past it has run dry in the model.
const maxBulkMolPerM3 = 1e5

// deltaP is the local hydraulic pressure of the draw over the feed.
func (s *solver) deltaP(x float64) float64 {
	p := s.p
	if s.sign > 0 {
		return p.DeltaPPa - (p.DrawDropPaPerM2-p.FeedDropPaPerM2)*x
	}
	return p.DeltaPPa - p.DrawDropPaPerM2*(s.area-x) + p.FeedDropPaPerM2*x
}

// integrate carries y0 from x = 0 to the area into yEnd. With frozen
// nil it controls the error and records its accepted steps in s.steps;
// otherwise it takes exactly the steps of frozen (no error control), so
// that the end state is a smooth function of y0 for a finite-difference
// Jacobian. When recording, steps end on the profile grid; otherwise
// only the last ends exactly at x = A.
func (s *solver) integrate(y0, yEnd []float64, frozen []float64) (integration, error) {
	s.stats.Integrations++
	if s.p.Stop != nil {
		if err := s.p.Stop(); err != nil {
			return integration{}, err
		}
	}
	copy(yEnd, y0)
	y := yEnd
	x := 0.0
	if frozen == nil {
		s.steps = s.steps[:0]
	}
	npts := s.points()
	grid := 1
	nextGrid := func() float64 {
		if grid >= npts-1 {
			return s.area // exactly (area·k/(n−1) may round below it)
		}
		return s.area * float64(grid) / float64(npts-1)
	}
	ok, err := s.rhs(0, y, s.k[0])
	if err != nil || !ok {
		return integration{reached: 0}, err
	}
	if s.record {
		s.recordAt(0, y)
	}
	var h float64
	if frozen == nil {
		h = s.initialStep(y)
	}
	for step := 0; x < s.area; step++ {
		if frozen != nil {
			if step >= len(frozen) {
				break
			}
			h = frozen[step]
		} else if step > maxSteps {
			return integration{reached: x}, nil
		}
		target := nextGrid()
		hitGrid := false
		if !s.record {
			target = s.area
		}
		if frozen == nil && x+h >= target*(1-1e-13) {
			h, hitGrid = target-x, true
		}
		if frozen != nil && math.Abs(x+h-target) <= 1e-12*s.area {
			hitGrid = true
		}
		errNorm, okStep, err := s.trial(x, y, h)
		if err != nil {
			return integration{reached: x}, err
		}
		if frozen != nil {
			if !okStep {
				return integration{reached: x}, nil
			}
		} else if !okStep || errNorm > 1 {
			s.stats.Rejected++
			fac := stepMinFac
			if okStep {
				fac = max(stepMinFac, stepSafety*math.Pow(errNorm, -0.2))
			}
			h *= fac
			if h < stepMinRel*s.area {
				return integration{reached: x}, nil
			}
			continue
		}
		s.stats.Steps++
		if frozen == nil {
			s.steps = append(s.steps, h)
		}
		copy(y, s.ynew)
		copy(s.k[0], s.k[6]) // FSAL
		if hitGrid {
			x = target
			if s.record {
				s.recordAt(grid, y)
			}
			grid++
		} else {
			x += h
		}
		if frozen == nil {
			fac := stepMaxFac
			if errNorm > 0 {
				fac = min(stepMaxFac, max(stepMinFac, stepSafety*math.Pow(errNorm, -0.2)))
			}
			h *= fac
		}
	}
	return integration{reached: x, ok: x >= s.area*(1-1e-12)}, nil
}

// trial takes one Dormand–Prince step of size h from (x, y) with k[0] =
// f(x, y), leaving the fifth-order solution in s.ynew and f there in
// k[6]; it returns the scaled error norm (max over components of
// |err|/(atol + rtol·|y|)).
func (s *solver) trial(x float64, y []float64, h float64) (float64, bool, error) {
	k, yt := &s.k, s.ytmp
	for st, sg := range &dpStages {
		for j := range yt {
			v := y[j]
			for m, a := range sg.a {
				if a != 0 {
					v += h * a * k[m][j]
				}
			}
			yt[j] = v
		}
		ok, err := s.rhs(x+sg.c*h, yt, k[st+1])
		if err != nil || !ok {
			return 0, false, err
		}
	}
	copy(s.ynew, yt) // the seventh stage's point is the fifth-order solution
	var e float64
	for j := range y {
		d := h * (dpE1*k[0][j] + dpE3*k[2][j] + dpE4*k[3][j] + dpE5*k[4][j] + dpE6*k[5][j] + dpE7*k[6][j])
		w := s.rtol * (s.scale[j] + max(math.Abs(y[j]), math.Abs(s.ynew[j])))
		e = max(e, math.Abs(d)/w)
	}
	if !finite(e) {
		return 0, false, nil
	}
	return e, true, nil
}

// initialStep guesses a first step from the size of the derivatives
// (Hairer, Nørsett & Wanner 1993, §II.4, the starting step size: h such
// that h·|f|/|y| ≈ tol^{1/5}), at most one profile interval.
func (s *solver) initialStep(y []float64) float64 {
	var d float64
	for j := range y {
		d = max(d, math.Abs(s.k[0][j])/(s.scale[j]+math.Abs(y[j])))
	}
	h := s.area
	if s.record {
		h /= float64(s.points() - 1)
	}
	if d > 0 {
		h = min(h, 0.1*math.Pow(s.rtol, 0.2)/d)
	}
	return max(h, 1e-6*s.area)
}

func (s *solver) points() int {
	if s.p.Points >= 2 {
		return s.p.Points
	}
	return DefaultPoints
}

// recordAt stores profile point g: state y with the local solution in
// s.res (just evaluated there).
func (s *solver) recordAt(g int, y []float64) {
	n := s.n
	pr := &s.profiles[g]
	pr.AreaM2 = s.area * float64(g) / float64(s.points()-1)
	pr.DrawM3PerS, pr.FeedM3PerS = y[0], y[1]
	for i := 0; i < n; i++ {
		pr.DrawMolPerM3[i] = s.in.Species[i].DrawBulkMolPerM3
		pr.FeedMolPerM3[i] = s.in.Species[i].FeedBulkMolPerM3
		pr.SpeciesFluxMolPerM2S[i] = s.res.Species[i].FluxMolPerM2S
	}
	pr.WaterFluxMPerS = s.res.JwMPerS
	pr.DrawPiPa, pr.FeedPiPa = s.res.PiDrawBulkPa, s.res.PiFeedBulkPa
	pr.DrawFacePiPa, pr.FeedFacePiPa = s.res.PiDrawFacePa, s.res.PiFeedFacePa
	pr.DeltaPPa = s.in.DeltaPPa
}
