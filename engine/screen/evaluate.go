package screen

import (
	"context"
	"drawsift/engine/regen"
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"

	"drawsift/engine/errs"
	"drawsift/engine/internal/roots"
	"drawsift/engine/library"
	"drawsift/engine/species"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
)

// Metrics are one candidate's results at its basis concentration in one
// orientation. All values are SI and finite.
type Metrics struct {
	Orientation transport.Orientation

	MolalityMolPerKg float64
	MolarityMolPerM3 float64
	MassConcKgPerM3  float64 // = g/L
	// SolubilityMolPerKg is +Inf for a miscible solute (reported as absent).
	SolubilityMolPerKg float64
	// SolubilityMargin is 1 − m/m_sat (1 for a miscible solute).
	SolubilityMargin float64

	PiPa, VantHoffPa, FeedPiPa float64

	JwMPerS      float64
	JsMolPerM2S  float64 // net reverse flux of the draw solute (formula units), draw → feed
	SRSFMolPerM3 float64 // Js/Jw
	SRSFKgPerM3  float64 // Js·M/Jw = g/L: the net draw loss per litre of water
	// GrossSRSFKgPerM3 counts the one-way flux of the draw's species toward
	// the feed (without what the feed's own ions bring back).
	GrossSRSFKgPerM3 float64
	// FeedGainKgPerM3: the feed's own species entering the draw, per m³ of
	// water.
	FeedGainKgPerM3      float64
	FluxEfficiency       float64 // Jw/(A·(π_D,b − π_F,b))
	HasCost              bool
	CostMinUSDPerM3      float64
	CostMaxUSDPerM3      float64
	ViscosityPaS         float64
	RegenJPerM3          float64
	Scaling              Scaling
	FeedFaceDrawMolPerM3 float64 // draw solute at the feed-side face of the active layer
	// Warnings raised while computing these metrics (nominal run only).
	Warnings []warn.Warning
}

// CostMidUSDPerM3 is the replenishment cost at the middle of the price range.
func (m *Metrics) CostMidUSDPerM3() float64 { return 0.5 * (m.CostMinUSDPerM3 + m.CostMaxUSDPerM3) }

// Objective returns the value of objective o (in the unit of o.Unit()) and
// whether it is known.
func (m *Metrics) Objective(o Objective) (float64, bool) {
	switch o {
	case ObjWaterFlux:
		return m.JwMPerS / thermo.MPerSPerLMH, true
	case ObjSRSF:
		// A draw that gains its own species net loses nothing to replace
		// (the feed's ions entering it are contamination, not a benefit).
		return math.Max(0, m.SRSFKgPerM3), true
	case ObjReplenishment:
		return m.CostMidUSDPerM3(), m.HasCost
	case ObjRegeneration:
		return m.RegenJPerM3 / JPerKWh, true
	case ObjViscosity:
		return m.ViscosityPaS * thermo.MPaSPerPaS, true
	case ObjSolubilityMargin:
		return m.SolubilityMargin, true
	case ObjScaling:
		if !m.Scaling.Any {
			return 0, true
		}
		return math.Max(0, m.Scaling.Max), true
	case ObjFluxEfficiency:
		return m.FluxEfficiency, true
	case ObjMassConcentration:
		return m.MassConcKgPerM3, true
	}
	return 0, false
}

// JPerKWh converts energy: 1 kWh = 3.6 MJ (thermo.JPerKWh, the engine's
// one conversion table).
const JPerKWh = thermo.JPerKWh

// Reasons a candidate is excluded.
const (
	ReasonInsoluble    = "insoluble at the needed concentration"
	ReasonValidity     = "outside model validity"
	ReasonHazard       = "hazard excluded by the user"
	ReasonUnreachable  = "cannot reach the basis target"
	ReasonNoFlux       = "no forward water flux"
	ReasonNotEvaluated = "could not be evaluated"
)

// exclusion is why a candidate cannot be ranked.
type exclusion struct {
	reason, detail string
}

func (e *exclusion) Error() string { return e.reason + ": " + e.detail }

// perturb holds the multiplicative factors of one Monte Carlo sample (all
// 1 for the nominal run) and the sampled price.
type perturb struct {
	fA, fB, fS, fPi, fD float64
	price               float64 // USD/kg; < 0 → the price range
}

var nominal = perturb{fA: 1, fB: 1, fS: 1, fPi: 1, fD: 1, price: -1}

// scaledPi multiplies a solution's π(c) by a factor (model uncertainty, or
// van 't Hoff mode). The real π comes from the Solution's tabulated
// FastOsmoticFunc (within 1e-8 of the model), since screens and robustness
// runs call it millions of times.
type scaledPi struct {
	x    *thermo.Solution
	f    float64
	vh   bool
	nuRT float64
	fast func(float64) (float64, float64)
}

func newScaledPi(x *thermo.Solution, vh bool, tK float64) scaledPi {
	s := scaledPi{x: x, f: 1, vh: vh, nuRT: x.Nu() * thermo.GasConstant * tK}
	if !vh {
		s.fast = x.FastOsmoticFunc()
	}
	return s
}

func (s *scaledPi) fn(c float64) (float64, float64) {
	if s.vh {
		return s.f * s.nuRT * c, s.f * s.nuRT
	}
	p, d := s.fast(c)
	return s.f * p, s.f * d
}

// candidate is one solute prepared at the scenario temperature.
type candidate struct {
	sol        *library.Solute
	x          *thermo.Solution
	bMPerS     float64
	bEstimated bool
	hasPrice   bool
	priceMin   float64
	priceMax   float64
	pi         scaledPi
	piFn       transport.OsmoticFunc
	basisM     float64 // concentration basis: molality
	ions       []ionCount
	ionIdx     []int // each ion's place in the scaling mixture (−1 none)
	// layout: the transport species of this draw against the feed;
	// facePi its face-π rule (bound once: a method value allocates).
	layout *species.Transport
	facePi transport.CompositionPi
	// speciesIdx: each transport species' place in the scaling mixture
	// (−1 none).
	speciesIdx []int
	warnings   []warn.Warning
	excl       *exclusion // set at preparation (hazard, bad temperature)
	osmRelSD   float64
	// tabs: the smooth functions a robustness run asks at every sample,
	// tabulated for it (nil: the exact functions).
	tabs *candidateTables
}

type ionCount struct {
	symbol string
	charge int
	count  float64
}

// env is a scenario prepared at one temperature.
type env struct {
	sc       *Scenario
	tK       float64
	feedX    *thermo.Solution
	feedSol  *library.Solute
	feedM    float64
	feedC    float64 // mol/m³
	feedPiPa float64
	feedD    float64
	feedB    float64
	feedPi   scaledPi
	feedFn   transport.OsmoticFunc
	feedIons []ionConc // bulk, mol/L
	// feedSide: the feed's transport species with their B, laid out once
	// for every candidate's layout.
	feedSide *species.Side
	kFeed    float64 // nominal, +Inf for none
	targetPi float64 // Pa, osmotic-pressure basis
	davies   float64 // Davies A at T (log10 units)
	scale    *scaleModel
	// feedScaling: the saturation indices of the bulk feed.
	feedScaling Scaling
	cands       []candidate
	warnings    []warn.Warning
	// kWarn holds the last solve's Sherwood-correlation warnings, draw side
	// then feed side (nil where k was given), for the nominal run.
	kWarn [2][]warn.Warning
	// lastIn is the last solve's problem (its species in lastSp).
	lastIn transport.Input
	lastSp [transport.MaxSpecies]transport.Species
	// quiet: a robustness worker's env, where an exclusion's reason counts
	// and its text is never shown, so a sample's unreachable target is
	// refused without building the text (no allocation per sample).
	quiet bool
}

type ionConc struct {
	symbol  string
	charge  int
	molPerL float64
}

// prepare builds the env: solutions at temperature, feed state, B per
// candidate, basis target. It fails only on scenario-level errors, or
// with ctx.Err() when the caller has gone (checked per candidate: each
// costs a Solution and its tabulated π).
func prepare(ctx context.Context, sc *Scenario, lib *library.Library) (*env, error) {
	if err := sc.validate(); err != nil {
		return nil, err
	}
	e := &env{sc: sc, tK: sc.TemperatureK, davies: daviesA(sc.TemperatureK)}
	// Feed.
	f := sc.Feed
	if f.Solute != nil && f.Concentration > 0 {
		x, err := thermo.Prepared(f.Solute, e.tK)
		if err != nil {
			// The temperature passed its range already: what fails is the
			// feed's own composition ("feed.ions", …).
			var ie *errs.InputError
			if errors.As(err, &ie) {
				return nil, ie.Prefix("feed")
			}
			return nil, inputErr("feed", nil, "the feed cannot be modelled at %.4g °C: %v", e.tK-thermo.ZeroCelsiusK, err)
		}
		m, err := x.ToMolality(f.Concentration, f.Unit)
		if err != nil {
			return nil, inputErr("feed.concentration", nil, "%v", err)
		}
		if m > x.SolubilityMolPerKg() {
			return nil, inputErr("feed.concentration", nil, "the feed is beyond the solubility of %s", f.Solute.ID)
		}
		e.feedX, e.feedSol, e.feedM = x, f.Solute, m
		e.feedC = x.MolarityMolPerM3(m)
		e.feedD = x.DiffusivityM2PerS(m)
		e.feedPi = newScaledPi(x, sc.VantHoff, e.tK)
		e.feedFn = e.feedPi.fn
		e.feedPiPa, _ = e.feedFn(e.feedC)
		for _, w := range x.Warnings {
			e.warnings = append(e.warnings, w.About("feed"))
		}
		b, est := feedB(&sc.Membrane, f.Solute)
		e.feedB = b
		if est {
			e.warnings = append(e.warnings, warn.New(warn.BEstimated, "feed", "B for %s estimated from the NaCl value by diffusivity (%s)", f.Solute.ID, "B_j = B_NaCl·D_j/D_NaCl"))
		}
		rho := x.DensityKgPerM3(m)
		for _, ion := range f.Ions {
			c := ion.Mol
			if f.IonsPerKg {
				c *= rho / 1000 // per kg of solution → per litre
			}
			e.feedIons = append(e.feedIons, ionConc{ion.Symbol, ion.Charge, c})
		}
	} else {
		for _, ion := range f.Ions {
			e.feedIons = append(e.feedIons, ionConc{ion.Symbol, ion.Charge, ion.Mol})
		}
	}
	// Basis target.
	switch sc.Basis.Kind {
	case BasisOsmoticPressure:
		e.targetPi = sc.Basis.PiPa
		if sc.Basis.MultipleOfFeed > 0 {
			if !(e.feedPiPa > 0) {
				return nil, inputErr("basis.multiple_of_feed", nil, "the feed has no osmotic pressure; give the target in bar instead")
			}
			e.targetPi = sc.Basis.MultipleOfFeed * e.feedPiPa
		}
		if e.targetPi <= e.feedPiPa {
			return nil, inputErr("basis.value", fmt.Sprintf("> %.4g bar (the feed's osmotic pressure)", e.feedPiPa/thermo.PascalPerBar),
				"the target osmotic pressure must exceed the feed's")
		}
		// The regeneration energy assumes the draw was diluted by the
		// recovered water; FO cannot dilute it below the feed's π.
		if r := sc.RegenerationRecovery; e.feedPiPa > 0 && e.targetPi*(1-r) < e.feedPiPa {
			e.warnings = append(e.warnings, warn.New(warn.Regeneration, "regeneration",
				"regeneration: at %.0f %% recovery the diluted draw (about %.3g bar) would sit below the feed's %.3g bar, which forward osmosis cannot reach; the minimum energy shown is then a lower bound (lower the recovery to at most %.0f %%)",
				100*r, (1-r)*e.targetPi/thermo.PascalPerBar, e.feedPiPa/thermo.PascalPerBar, 100*(1-e.feedPiPa/e.targetPi)))
		}
	}
	// Feed-side mass transfer (feed properties, or the draw's for a
	// solute-free feed: computed per candidate then).
	e.kFeed = sc.KFeedMPerS
	if e.kFeed == 0 && e.feedX != nil {
		mt, err := channelK(sc.Channel, true, e.feedX.DensityKgPerM3(e.feedM), e.feedX.ViscosityPaS(e.feedM), e.feedD)
		if err != nil {
			return nil, err
		}
		e.kFeed = mt.KMPerS
		for _, w := range mt.Warnings {
			e.warnings = append(e.warnings, w.About("k_feed"))
		}
	}
	// Candidates.
	e.cands = make([]candidate, len(sc.Candidates))
	excl := hazardSet(sc.ExcludeHazards)
	for i, s := range sc.Candidates {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		c := &e.cands[i]
		c.sol = s
		x, err := thermo.Prepared(s, e.tK)
		if err != nil {
			c.excl = &exclusion{ReasonNotEvaluated, err.Error()}
			continue
		}
		c.x = x
		c.warnings = append(c.warnings, x.Warnings...)
		c.pi = newScaledPi(x, sc.VantHoff, e.tK)
		c.piFn = c.pi.fn
		c.osmRelSD = DefaultOsmoticRelSD
		if s.Osmotic.Kind == library.ModelNone {
			c.osmRelSD = DefaultVantHoffRelSD
		}
		c.bMPerS, c.bEstimated = drawB(&sc.Membrane, s)
		if err := e.layoutFor(c); err != nil {
			c.excl = &exclusion{ReasonNotEvaluated, err.Error()}
			continue
		}
		if p := s.Price; p != nil {
			c.hasPrice, c.priceMin, c.priceMax = true, p.USDPerKgMin, p.USDPerKgMax
		} else {
			c.warnings = append(c.warnings, warn.New(warn.NoPrice, s.ID, "%s: no price on record; scored as the worst on replenishment cost", s.ID))
		}
		shares := s.IonShares()
		c.ions = make([]ionCount, 0, len(shares))
		for _, ion := range shares {
			c.ions = append(c.ions, ionCount{ion.Symbol, ion.Charge, ion.PerUnit})
		}
		if h := hazardHit(s, excl); h != "" {
			c.excl = &exclusion{ReasonHazard, fmt.Sprintf("%s carries the hazard flag %q", s.ID, h)}
			continue
		}
		if sc.Basis.Kind == BasisConcentration {
			m, err := x.ToMolality(sc.Basis.Concentration, sc.Basis.Unit)
			if err != nil {
				c.excl = &exclusion{ReasonInsoluble, fmt.Sprintf("%s: %v", s.ID, err)}
				continue
			}
			c.basisM = m
		}
	}
	e.prepareScaling()
	return e, nil
}

// hazardSet normalises the excluded flags once (library.Key), each to the
// position of its first entry, so that matching a candidate's flags costs
// one look-up per flag: linear in the flags, whatever the list lengths.
func hazardSet(excl []string) map[string]int {
	if len(excl) == 0 {
		return nil
	}
	set := make(map[string]int, len(excl))
	for i, h := range excl {
		k := library.Key(h)
		if _, ok := set[k]; !ok {
			set[k] = i
		}
	}
	return set
}

// hazardHit returns the flag of s matched by the earliest excluded entry
// ("" if none).
func hazardHit(s *library.Solute, excl map[string]int) string {
	hit, at := "", -1
	for _, f := range s.HazardFlags {
		if i, ok := excl[library.Key(f)]; ok && (at < 0 || i < at) {
			hit, at = f, i
		}
	}
	return hit
}

// drawB returns B (m/s) of the membrane for a draw solute: the
// scenario's B for every candidate when set, else feedB.
func drawB(m *Membrane, s *library.Solute) (float64, bool) {
	if m.BDrawSet {
		return m.BDrawMPerS, false
	}
	return feedB(m, s)
}

// feedB returns B (m/s) for solute s: measured, NaCl's own, or scaled
// from NaCl by diffusivity (library.SoluteB.For).
func feedB(m *Membrane, s *library.Solute) (float64, bool) { return m.B.For(s) }

// The exclusions of a quiet env (robustness workers): the reason alone.
var (
	quietInsoluble   = &exclusion{ReasonInsoluble, "the target is beyond its solubility in this sample"}
	quietUnreachable = &exclusion{ReasonUnreachable, "the target is beyond its model's range in this sample"}
)

// basisMolality returns the draw molality that meets the basis, or an
// exclusion.
func (e *env) basisMolality(c *candidate, ori transport.Orientation, p *perturb, scratch *transport.Result) (float64, *exclusion) {
	x := c.x
	sol := x.SolubilityMolPerKg()
	switch e.sc.Basis.Kind {
	case BasisOsmoticPressure:
		target := e.targetPi / p.fPi
		if e.sc.VantHoff {
			cc := target / c.pi.nuRT
			m, ok := x.MolalityFromMolarity(cc)
			if !ok || m > sol*(1+1e-9) {
				return 0, &exclusion{ReasonInsoluble, fmt.Sprintf("%s would need %.4g mol/L (van 't Hoff) for %.4g bar, beyond its solubility",
					c.sol.ID, cc/1000, e.targetPi/thermo.PascalPerBar)}
			}
			return m, nil
		}
		if e.quiet && target > x.MaxPiPa() {
			if math.IsInf(sol, 1) {
				return 0, quietUnreachable
			}
			return 0, quietInsoluble
		}
		if t := c.tabs; t != nil && t.inv != nil {
			if m, ok := t.inv.at(target); ok {
				return m, nil
			}
		}
		m, err := x.MolalityForPi(target)
		if err == nil {
			return m, nil
		}
		if errors.Is(err, errs.ErrNotConverged) {
			return 0, &exclusion{ReasonNotEvaluated, fmt.Sprintf("%s: %v", c.sol.ID, err)}
		}
		// thermo refuses only a target above π at the top of the range:
		// the solubility, or for a miscible solute the model's data.
		top, where, reason := sol, "at its solubility", ReasonInsoluble
		if math.IsInf(top, 1) {
			top, where, reason = x.CapMolPerKg(), "at the top of its model's range (it is miscible)", ReasonUnreachable
		}
		return 0, &exclusion{reason, fmt.Sprintf("%s reaches only %.4g bar %s; %.4g bar is needed",
			c.sol.ID, x.OsmoticPressurePa(top)*p.fPi/thermo.PascalPerBar, where, e.targetPi/thermo.PascalPerBar)}
	case BasisConcentration:
		if c.basisM > sol*(1+1e-9) {
			return 0, &exclusion{ReasonInsoluble, fmt.Sprintf("%s: %.4g mol/kg is beyond its solubility of %.4g mol/kg", c.sol.ID, c.basisM, sol)}
		}
		return c.basisM, nil
	default:
		return e.molalityForFlux(c, ori, p, scratch)
	}
}

// molalityForFlux finds the draw molality whose water flux equals the
// target: Jw rises monotonically with the draw concentration, so a
// bracketed search on [0, m_top] (Brent's method, roots.Brent) converges
// to |Jw − target| ≤ 1e-10·target or a bracket of 1e-13·m_top; m_top is
// the solubility, or the top of the working range for a miscible solute.
// A search that does not converge excludes the candidate as not evaluated,
// with the solver's error.
func (e *env) molalityForFlux(c *candidate, ori transport.Orientation, p *perturb, scratch *transport.Result) (float64, *exclusion) {
	target := e.sc.Basis.JwMPerS
	top := c.x.SolubilityMolPerKg()
	if math.IsInf(top, 1) {
		top = c.x.CapMolPerKg()
	}
	var solveErr error
	f := func(m float64) float64 {
		if err := e.solve(c, ori, m, p, scratch); err != nil {
			solveErr = err
			return math.NaN() // ends the search; solveErr says why
		}
		return scratch.JwMPerS - target
	}
	fhi := f(top)
	if solveErr != nil {
		return 0, &exclusion{ReasonNotEvaluated, solveErr.Error()}
	}
	if fhi < 0 {
		return 0, &exclusion{ReasonUnreachable, fmt.Sprintf("%s gives at most %.4g LMH at its solubility; %.4g LMH is needed",
			c.sol.ID, (fhi+target)/thermo.MPerSPerLMH, target/thermo.MPerSPerLMH)}
	}
	flo := f(0)
	if solveErr != nil {
		return 0, &exclusion{ReasonNotEvaluated, solveErr.Error()}
	}
	r, err := roots.Brent(f, roots.Bracket{Lo: 0, Hi: top, FLo: flo, FHi: fhi},
		&roots.Settings{Solver: "flux-basis search", FAbsTol: 1e-10 * target, XAbsTol: 1e-13 * top, Scale: target,
			MaxIterations: fluxBasisMaxIterations})
	if solveErr != nil {
		return 0, &exclusion{ReasonNotEvaluated, solveErr.Error()}
	}
	if err != nil {
		return 0, &exclusion{ReasonNotEvaluated, fmt.Sprintf("%s: %v", c.sol.ID, err)}
	}
	return r.X, nil
}

// solve runs the flux model for candidate c at draw molality m.
func (e *env) solve(c *candidate, ori transport.Orientation, m float64, p *perturb, out *transport.Result) error {
	sc := e.sc
	x := c.x
	cD := x.MolarityMolPerM3(m)
	d := x.DiffusivityM2PerS(m) * p.fD
	kD := sc.KDrawMPerS
	e.kWarn = [2][]warn.Warning{}
	if kD == 0 {
		mt, err := channelK(sc.Channel, false, x.DensityKgPerM3(m), e.viscosity(c, m), d)
		if err != nil {
			return err
		}
		kD, e.kWarn[0] = mt.KMPerS, mt.Warnings
	}
	kF := e.kFeed
	if kF == 0 { // solute-free feed: the reverse-fluxed draw solute sets k
		mt, err := channelK(sc.Channel, true, x.DensityKgPerM3(0), x.ViscosityPaS(0), x.DiffusivityM2PerS(0)*p.fD)
		if err != nil {
			return err
		}
		kF, e.kWarn[1] = mt.KMPerS, mt.Warnings
	}
	c.pi.f = p.fPi
	// The input lives in e.lastIn (kept for the crossing notes), so that
	// a solve allocates nothing.
	in := &e.lastIn
	*in = transport.Input{
		AMPerSPa: sc.Membrane.AMPerSPa * p.fA, SM: sc.Membrane.SM * p.fS, Orientation: ori,
		KDrawMPerS: kD, KFeedMPerS: kF, FacePi: c.facePi,
	}
	n := c.layout.N()
	c.layout.Fill(e.lastSp[:n], ori, cD, d, e.feedD, p.fB, c.piFn, e.feedFn)
	in.Species = e.lastSp[:n]
	return transport.SolveInto(in, out)
}

// layoutFor lays out candidate c's transport species against the feed
// (species.NewTransport): its ions (or itself, for a neutral solute) and
// the feed's, by identity, each with its B; a feed that stands in for its
// ions by an equivalent NaCl crosses as one species of its own.
func (e *env) layoutFor(c *candidate) error {
	sc := e.sc
	perm := species.Permeability{B: sc.Membrane.B, UserIon: sc.Membrane.UserIonB, UserSolute: sc.Membrane.UserSoluteB, Known: true}
	var over *float64
	if sc.Membrane.BDrawSet {
		b := sc.Membrane.BDrawMPerS
		over = &b
	}
	feed := species.TransportSide{}
	if e.feedSol != nil {
		feed = species.TransportSide{Solute: e.feedSol, Whole: sc.Feed.Surrogate, CMolPerM3: e.feedC, Nu: e.feedX.Nu()}
		if e.feedSide == nil {
			e.feedSide = species.PrepareSide(&perm, feed)
		}
		feed.Prepared = e.feedSide
	}
	t, err := species.NewTransport(&perm, species.TransportSide{Solute: c.sol, Nu: c.x.Nu(), BMPerS: over}, feed)
	if err != nil {
		return err
	}
	c.layout, c.facePi = t, t.Rule.Pi
	// The candidate's reported B: its species' one B when they share one
	// (a solute given one value, or a neutral solute), else the salt's
	// combined value (library.SoluteB.For).
	uniform, b0 := true, -1.0
	for _, in := range t.Info {
		if in.DrawPerUnit == 0 {
			continue
		}
		if in.BOrigin.Estimated() {
			c.bEstimated = true
		}
		if b0 < 0 {
			b0 = in.BMPerS
		} else if in.BMPerS != b0 {
			uniform = false
		}
	}
	if uniform && b0 >= 0 {
		c.bMPerS = b0
	}
	// The note on estimated B, joined by hand rather than through fmt:
	// every candidate of every screen has one.
	var est []byte
	for _, in := range t.Info {
		if in.BOrigin.Estimated() && in.Role != species.RoleFeed {
			if est == nil {
				est = append(make([]byte, 0, 160), c.sol.ID...)
				est = append(est, ": B estimated by hindered diffusion from the membrane's NaCl value ("...)
			} else {
				est = append(est, ", "...)
			}
			est = append(est, in.Name...)
			est = append(est, ' ')
			est = strconv.AppendFloat(est, in.BMPerS/thermo.MPerSPerLMH, 'g', 3, 64)
			est = append(est, " LMH"...)
		}
	}
	if est != nil {
		est = append(est, "); enter a measured B where known"...)
		c.warnings = append(c.warnings, warn.Warning{Code: warn.BEstimated, Subject: c.sol.ID, Text: string(est)})
	}
	return nil
}

// evaluate computes candidate c's metrics in orientation ori under
// perturbation p, or the exclusion that stops it.
func (e *env) evaluate(c *candidate, ori transport.Orientation, p *perturb, out *Metrics, scratch *transport.Result) *exclusion {
	if c.excl != nil {
		return c.excl
	}
	m, ex := e.basisMolality(c, ori, p, scratch)
	if ex != nil {
		return ex
	}
	return e.metricsAt(c, ori, m, p, out, scratch)
}

// metricsAt computes every metric at draw molality m.
func (e *env) metricsAt(c *candidate, ori transport.Orientation, m float64, p *perturb, out *Metrics, scratch *transport.Result) *exclusion {
	x := c.x
	sc := e.sc
	sol := x.SolubilityMolPerKg()
	if m > sol*(1+1e-9) {
		return &exclusion{ReasonInsoluble, fmt.Sprintf("%s: %.4g mol/kg is beyond its solubility of %.4g mol/kg", c.sol.ID, m, sol)}
	}
	// The osmotic model's data limit matters only when that model gives π;
	// a bridge to the measured saturated solution carries it to solubility.
	if !sc.AllowExtrapolation && !sc.VantHoff && m > x.SupportedMolPerKg()*(1+1e-9) {
		return &exclusion{ReasonValidity, fmt.Sprintf("%s: %.4g mol/kg is above the %s model's data limit of %.4g mol/kg (set allow_extrapolation to keep it, flagged)",
			c.sol.ID, m, c.sol.Osmotic.Kind, x.SupportedMolPerKg())}
	}
	if err := e.solve(c, ori, m, p, scratch); err != nil {
		return &exclusion{ReasonNotEvaluated, err.Error()}
	}
	r := scratch
	*out = Metrics{Orientation: ori, MolalityMolPerKg: m, SolubilityMolPerKg: sol, FeedPiPa: e.feedPiPa}
	if p == &nominal {
		// The channel's regime and the correlation's caveats reach every
		// host with the candidate (only on the nominal run: the Monte
		// Carlo samples would repeat them).
		out.Warnings = slices.Grow(out.Warnings, len(e.kWarn[0])+len(e.kWarn[1]))
		for i, side := range [2]string{"k_draw", "k_feed"} {
			if len(e.kWarn[i]) == 0 {
				continue
			}
			about := c.sol.ID + " " + side
			for _, w := range e.kWarn[i] {
				out.Warnings = append(out.Warnings, w.About(about))
			}
		}
	}
	out.MolarityMolPerM3 = x.MolarityMolPerM3(m)
	out.MassConcKgPerM3 = out.MolarityMolPerM3 * x.MolarMassKgPerMol()
	out.SolubilityMargin = 1
	if !math.IsInf(sol, 1) {
		out.SolubilityMargin = 1 - m/sol
	}
	out.PiPa, _ = c.piFn(out.MolarityMolPerM3)
	out.VantHoffPa = x.VantHoffPa(out.MolarityMolPerM3)
	out.JwMPerS = r.JwMPerS
	loss := c.layout.LossesAt(&e.lastIn, r, x.MolarMassKgPerMol())
	out.JsMolPerM2S = loss.NetFormulaMolPerM2S
	if !(r.JwMPerS > 0) {
		return &exclusion{ReasonNoFlux, fmt.Sprintf("%s: water flux %.4g LMH at %.4g mol/L (the feed's osmotic pressure is not overcome)",
			c.sol.ID, r.JwMPerS/thermo.MPerSPerLMH, out.MolarityMolPerM3/1000)}
	}
	out.SRSFMolPerM3 = out.JsMolPerM2S / r.JwMPerS
	out.SRSFKgPerM3 = loss.NetKgPerM2S / r.JwMPerS
	out.GrossSRSFKgPerM3 = loss.GrossKgPerM2S / r.JwMPerS
	out.FeedGainKgPerM3 = loss.FeedGainKgPerM2S / r.JwMPerS
	if r.PiDrawBulkPa > r.PiFeedBulkPa {
		out.FluxEfficiency = r.FluxEfficiency(sc.Membrane.AMPerSPa*p.fA, 0)
	}
	if c.hasPrice {
		lo, hi := c.priceMin, c.priceMax
		if p.price >= 0 {
			lo, hi = p.price, p.price
		}
		// SRSF in kg/m³ times USD/kg is USD per m³ of product water.
		out.HasCost = true
		out.CostMinUSDPerM3 = math.Max(0, out.SRSFKgPerM3) * lo
		out.CostMaxUSDPerM3 = math.Max(0, out.SRSFKgPerM3) * hi
	}
	out.ViscosityPaS = e.viscosity(c, m)
	out.RegenJPerM3 = p.fPi * e.regenEnergy(c, m)
	out.FeedFaceDrawMolPerM3 = c.layout.DrawFeedFace(r)
	if p == &nominal {
		// Say why where feed solute crossing into the draw puts a metric
		// outside its usual range (flux efficiency above 1, …).
		in := e.lastIn
		in.Species = append([]transport.Species(nil), in.Species...)
		out.Warnings = append(out.Warnings, transport.CrossingWarnings(&in, r, c.sol.ID, out.JsMolPerM2S)...)
	}
	e.scaling(c, ori, r, &out.Scaling)
	return nil
}

// regenEnergy is the minimum work per m³ of product to bring the draw,
// diluted so that a fraction r of its water is the product, back to
// molality m.
func (e *env) regenEnergy(c *candidate, m float64) float64 {
	if t := c.tabs; t != nil && t.regen != nil {
		if v, ok := t.regen.at(m); ok {
			return v
		}
	}
	return e.regenEnergyExact(c, m)
}

// regenEnergyExact is regenEnergy by the quadrature on the exact π.
func (e *env) regenEnergyExact(c *candidate, m float64) float64 {
	r := e.sc.RegenerationRecovery
	mDil := m * (1 - r)
	if e.sc.VantHoff {
		x := c.x
		return regen.MinimumSeparationEnergy(func(mm float64) float64 { return x.VantHoffPa(x.MolarityMolPerM3(mm)) }, mDil, r)
	}
	return regen.MinimumSeparationEnergy(c.x.OsmoticPressurePa, mDil, r)
}
