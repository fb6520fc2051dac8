package module

import (
	"errors"
	"fmt"
	"math"

	"drawsift/engine/errs"
	"drawsift/engine/internal/roots"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// MaxAreaM2 bounds a module's area (a unit-slip guard, and the design
// search's end): far above any single FO train (common practice).
const MaxAreaM2 = 1e6

// newSolver checks p and prepares its scratch.
func newSolver(p *Problem) (*solver, error) {
	if !(p.DrawInM3PerS > 0 && finite(p.DrawInM3PerS)) {
		return nil, errs.Invalid("draw.flow_l_per_h", p.DrawInM3PerS*lPerHPerM3PerS, "> 0 L/h", "the draw's inflow must be positive")
	}
	if !(p.FeedInM3PerS > 0 && finite(p.FeedInM3PerS)) {
		return nil, errs.Invalid("feed.flow_l_per_h", p.FeedInM3PerS*lPerHPerM3PerS, "> 0 L/h", "the feed's inflow must be positive")
	}
	n := len(p.Input.Species)
	if n < 1 || n > transport.MaxSpecies {
		return nil, errs.Invalid("species", float64(n), fmt.Sprintf("1 to %d", transport.MaxSpecies), "a module needs 1 to %d transport species", transport.MaxSpecies)
	}
	if p.Points != 0 && (p.Points < 2 || p.Points > MaxPoints) {
		return nil, errs.Invalid("profile_points", float64(p.Points), fmt.Sprintf("2–%d", MaxPoints), "profile points must be 2 to %d", MaxPoints)
	}
	s := &solver{p: p, in: p.Input, n: n, dim: 2 + 2*n, rtol: p.Tol}
	if !(s.rtol > 0) {
		s.rtol = DefaultTol
	}
	s.in.Species = append([]transport.Species(nil), p.Input.Species...)
	s.sign = -1
	if p.Flow == Co {
		s.sign = 1
	}
	for i := range s.k {
		s.k[i] = make([]float64, s.dim)
	}
	s.ytmp, s.ynew = make([]float64, s.dim), make([]float64, s.dim)
	s.grad, s.cbuf = make([]float64, n), make([]float64, n)
	s.scale = make([]float64, s.dim)
	s.scale[0], s.scale[1] = p.DrawInM3PerS, p.FeedInM3PerS
	for i, sp := range p.Input.Species {
		tot := sp.DrawBulkMolPerM3*p.DrawInM3PerS + sp.FeedBulkMolPerM3*p.FeedInM3PerS
		s.scale[2+i], s.scale[2+n+i] = tot, tot
	}
	return s, nil
}

// inlet writes the inlet state (the draw at its inlet values) into y.
func (s *solver) inlet(y []float64) {
	p, n := s.p, s.n
	y[0], y[1] = p.DrawInM3PerS, p.FeedInM3PerS
	for i, sp := range p.Input.Species {
		y[2+i] = sp.DrawBulkMolPerM3 * p.DrawInM3PerS
		y[2+n+i] = sp.FeedBulkMolPerM3 * p.FeedInM3PerS
	}
}

// streamPi is the bulk π of one stream's inlet composition diluted by
// its inflow over q (side 'd' or 'f').
func (s *solver) streamPi(side byte, q float64) float64 {
	p := s.p
	for i, sp := range p.Input.Species {
		if side == 'd' {
			s.cbuf[i] = sp.DrawBulkMolPerM3 * p.DrawInM3PerS / q
		} else {
			s.cbuf[i] = sp.FeedBulkMolPerM3 * p.FeedInM3PerS / q
		}
	}
	s.restoreShares()
	return piOf(&s.in, s.cbuf, s.grad)
}

// restoreShares sets the face rule's shares back to the inlet bulks.
func (s *solver) restoreShares() {
	if s.p.Layout != nil {
		s.p.Layout.SetShares(s.p.Input.Species)
	}
}

// Cap is the osmotic-equilibrium limit of recovery: the permeate (m³/s)
// at which the driving force vanishes, with no solute crossing, at the
// inlet ΔP and without the pressure drops, and the end that pinches.
type Cap struct {
	PermeateM3PerS, Recovery float64
	// Pinch: "outlet" (co-current: both outlets in equilibrium),
	// "feed-inlet" (counter-current: the draw leaving against the fresh
	// feed), "draw-inlet" (the fresh draw against the concentrated feed),
	// or "feed-exhausted" (no osmotic limit before the whole feed
	// permeates).
	Pinch string
}

// RecoveryCap returns the osmotic-equilibrium cap on recovery. It is an
// error when the draw's osmotic pressure at the inlets does not exceed
// the feed's plus ΔP (no forward driving force).
func RecoveryCap(p *Problem) (Cap, error) {
	s, err := newSolver(p)
	if err != nil {
		return Cap{}, err
	}
	return s.recoveryCap()
}

func (s *solver) recoveryCap() (Cap, error) {
	if s.capDone {
		return s.capVal, nil
	}
	c, err := s.computeCap()
	if err == nil {
		s.capVal, s.capDone = c, true
	}
	return c, err
}

// computeCap finds the cap (recoveryCap keeps it: it depends on the
// problem only, and every cold start of the shooting asks for it).
func (s *solver) computeCap() (Cap, error) {
	p := s.p
	qd, qf, dp := p.DrawInM3PerS, p.FeedInM3PerS, p.DeltaPPa
	piD0, piF0 := s.streamPi('d', qd), s.streamPi('f', qf)
	if !(piD0-piF0-dp > 0) {
		return Cap{}, &errs.InputError{Field: "draw.concentration", Value: piD0 / thermo.PascalPerBar,
			Limit: fmt.Sprintf("an osmotic pressure above the feed's %.4g bar plus ΔP %.4g bar", piF0/thermo.PascalPerBar, dp/thermo.PascalPerBar),
			Msg:   "the draw is not stronger than the feed: no water is drawn", Err: errs.ErrInvalidInput}
	}
	top := qf * (1 - 1e-9)
	// root of a decreasing driving force d(P) on [0, top]; ok false when
	// it stays positive to the end.
	root := func(d func(float64) float64) (float64, bool, error) {
		dTop := d(top)
		if dTop > 0 {
			return top, false, nil
		}
		r, err := roots.Brent(d, roots.Bracket{Lo: 0, Hi: top, FLo: d(0), FHi: dTop}, &roots.Settings{Solver: "module recovery cap", XRelTol: 1e-12})
		return r.X, true, err
	}
	if p.Flow == Co {
		x, ok, err := root(func(P float64) float64 { return s.streamPi('d', qd+P) - s.streamPi('f', qf-P) - dp })
		if err != nil {
			return Cap{}, err
		}
		c := Cap{PermeateM3PerS: x, Recovery: x / qf, Pinch: "outlet"}
		if !ok {
			c.Pinch, c.Recovery = "feed-exhausted", 1
		}
		return c, nil
	}
	x1, ok1, err := root(func(P float64) float64 { return s.streamPi('d', qd+P) - piF0 - dp })
	if err != nil {
		return Cap{}, err
	}
	x2, ok2, err := root(func(P float64) float64 { return piD0 - s.streamPi('f', qf-P) - dp })
	if err != nil {
		return Cap{}, err
	}
	switch {
	case !ok1 && !ok2:
		return Cap{PermeateM3PerS: top, Recovery: 1, Pinch: "feed-exhausted"}, nil
	case ok1 && (!ok2 || x1 <= x2):
		return Cap{PermeateM3PerS: x1, Recovery: x1 / qf, Pinch: "feed-inlet"}, nil
	}
	return Cap{PermeateM3PerS: x2, Recovery: x2 / qf, Pinch: "draw-inlet"}, nil
}

// ErrRunsDry is wrapped by the error of a module whose stream runs dry
// (its flow reaches zero) before the end of the area.
var ErrRunsDry = errors.New("a stream runs dry inside the module")

// Solve rates a module of area areaM2 (m²): outlets, permeate, recovery,
// profiles. Errors are *errs.InputError for bad input (naming the field
// and the limit) and *errs.ConvergenceError when the counter-current
// shooting does not converge.
func Solve(p *Problem, areaM2 float64) (*Result, error) {
	if !(areaM2 > 0 && areaM2 <= MaxAreaM2) {
		return nil, errs.Invalid("area_m2", areaM2, fmt.Sprintf("> 0 and ≤ %g m²", float64(MaxAreaM2)), "the membrane area must be positive")
	}
	s, err := newSolver(p)
	if err != nil {
		return nil, err
	}
	cp, err := s.recoveryCap()
	if err != nil {
		return nil, err
	}
	r, err := s.rate(areaM2, nil)
	if err != nil {
		return nil, err
	}
	return s.result(r, cp), nil
}

// rated is one rating's converged inlet state (x = 0) and end state.
type rated struct {
	area   float64
	y0, y1 []float64
	v      []float64 // counter-current shooting unknowns (scaled)
	method string
}

// rate solves the module at area a, recording the profiles. warm, when
// set, starts the counter-current shooting.
func (s *solver) rate(a float64, warm []float64) (*rated, error) {
	r, err := s.solveAt(a, warm, true)
	return r, err
}

// solveAt solves at area a; with record it fills s.profiles.
func (s *solver) solveAt(a float64, warm []float64, record bool) (*rated, error) {
	s.area = a
	r := &rated{area: a, y0: make([]float64, s.dim), y1: make([]float64, s.dim)}
	var warmV []float64
	if s.p.Flow == Co {
		s.inlet(r.y0)
		r.method = "dopri5"
	} else {
		v, method, err := s.shoot(warm)
		if err != nil {
			return nil, err
		}
		s.unknownsToY0(v, r.y0)
		warmV, r.method = v, method
	}
	s.startRecord(record)
	in, err := s.integrate(r.y0, r.y1, nil)
	s.record = false
	if err != nil {
		return nil, err
	}
	if !in.ok {
		return nil, s.dryError(in.reached)
	}
	r.v = warmV
	return r, nil
}

func (s *solver) startRecord(on bool) {
	s.record = on
	if !on {
		return
	}
	np := s.points()
	if len(s.profiles) != np {
		s.profiles = make([]Profile, np)
		for i := range s.profiles {
			pr := &s.profiles[i]
			pr.DrawMolPerM3, pr.FeedMolPerM3, pr.SpeciesFluxMolPerM2S = make([]float64, s.n), make([]float64, s.n), make([]float64, s.n)
		}
	}
}

func (s *solver) dryError(x float64) error {
	return &errs.InputError{Field: "area_m2", Value: s.area, Limit: fmt.Sprintf("less than the %.4g m² at which a stream runs dry", x),
		Msg: "a stream's flow reaches zero inside the module (the feed is wholly permeated or the draw is exhausted)", Err: ErrRunsDry}
}

// result assembles a Result from a rating.
func (s *solver) result(r *rated, cp Cap) *Result {
	p, n := s.p, s.n
	out := &Result{AreaM2: r.area, Flow: p.Flow, RecoveryCap: cp.Recovery, CapPinch: cp.Pinch, Stats: s.stats}
	out.Stats.Method = r.method
	yIn := make([]float64, s.dim)
	s.inlet(yIn)
	// The draw's outlet is at x = A (co) or x = 0 (counter).
	drawOut, feedOut := r.y1, r.y1
	if p.Flow == Counter {
		drawOut = r.y0
	}
	first, last := &s.profiles[0], &s.profiles[len(s.profiles)-1]
	drawInPi, drawOutPi := first.DrawPiPa, last.DrawPiPa
	if p.Flow == Counter {
		drawInPi, drawOutPi = last.DrawPiPa, first.DrawPiPa
	}
	out.DrawIn = s.stream(yIn, 'd', drawInPi)
	out.FeedIn = s.stream(yIn, 'f', first.FeedPiPa)
	out.DrawOut = s.stream(drawOut, 'd', drawOutPi)
	out.FeedOut = s.stream(feedOut, 'f', last.FeedPiPa)
	out.PermeateM3PerS = out.DrawOut.M3PerS - out.DrawIn.M3PerS
	out.Recovery = out.PermeateM3PerS / p.FeedInM3PerS
	out.ToDrawMolPerS = make([]float64, n)
	for i := 0; i < n; i++ {
		out.ToDrawMolPerS[i] = out.DrawOut.MolPerS[i] - out.DrawIn.MolPerS[i]
	}
	// Invariants: water and each species, in over out.
	out.WaterBalance = math.Abs((out.DrawOut.M3PerS+out.FeedOut.M3PerS)-(out.DrawIn.M3PerS+out.FeedIn.M3PerS)) / (out.DrawIn.M3PerS + out.FeedIn.M3PerS)
	for i := 0; i < n; i++ {
		tot := out.DrawIn.MolPerS[i] + out.FeedIn.MolPerS[i]
		if tot > 0 {
			out.SpeciesBalance = max(out.SpeciesBalance, math.Abs(out.DrawOut.MolPerS[i]+out.FeedOut.MolPerS[i]-tot)/tot)
		}
	}
	out.Profiles = append([]Profile(nil), s.profiles...)
	for i := range out.Profiles {
		pr := &out.Profiles[i]
		pr.DrawMolPerM3 = append([]float64(nil), pr.DrawMolPerM3...)
		pr.FeedMolPerM3 = append([]float64(nil), pr.FeedMolPerM3...)
		pr.SpeciesFluxMolPerM2S = append([]float64(nil), pr.SpeciesFluxMolPerM2S...)
	}
	return out
}

// stream reads one stream ('d' or 'f') from state y, with its bulk
// osmotic pressure piPa (the transport's, at the profile point).
func (s *solver) stream(y []float64, side byte, piPa float64) Stream {
	n := s.n
	off, q := 2, y[0]
	if side == 'f' {
		off, q = 2+n, y[1]
	}
	st := Stream{M3PerS: q, MolPerS: make([]float64, n), MolPerM3: make([]float64, n), PiPa: piPa}
	for i := 0; i < n; i++ {
		st.MolPerS[i] = max(y[off+i], 0)
		st.MolPerM3[i] = st.MolPerS[i] / q
	}
	return st
}
