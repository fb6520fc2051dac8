package screen

import (
	"math"
	"slices"
	"strings"

	"drawsift/engine/species"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// Mineral is a scalant checked at the feed-side membrane surface: the
// minerals of the mixed-electrolyte model (thermo.MineralName, in its
// order), then hydroxyapatite.
type Mineral int

// maxMinerals bounds the mineral list (the arrays of Scaling).
const maxMinerals = 24

// NumMinerals is the number of minerals checked; Hydroxyapatite is the
// last.
var (
	NumMinerals    = Mineral(thermo.MineralCount() + 1)
	Hydroxyapatite = Mineral(thermo.MineralCount())
)

func init() {
	if NumMinerals > maxMinerals {
		panic("screen: more minerals than Scaling holds")
	}
}

// Name returns the mineral's lower-case name.
func (m Mineral) Name() string {
	if m == Hydroxyapatite {
		return "hydroxyapatite"
	}
	n, _ := thermo.MineralName(int(m))
	return n
}

// Formula returns the mineral's formula.
func (m Mineral) Formula() string {
	if m == Hydroxyapatite {
		return "Ca5(PO4)3OH"
	}
	_, f := thermo.MineralName(int(m))
	return f
}

// MineralByName finds a mineral by its lower-case name.
func MineralByName(name string) (Mineral, bool) {
	for k := Mineral(0); k < NumMinerals; k++ {
		if k.Name() == name {
			return k, true
		}
	}
	return 0, false
}

// Source names the solubility product used.
func (m Mineral) Source() string {
	if m == Hydroxyapatite {
		return "phreeqc.dat, log_k −3.421 (from memory)"
	}
	return thermo.MineralSource(int(m))
}

// Hydroxyapatite lies outside the mixed-electrolyte model (no phosphate
// parameters): its index keeps the Davies (1962) activities, log K at 25 °C
// from the WATEQ4F data set as carried by PHREEQC's phreeqc.dat (Ball &
// Nordstrom 1991; Parkhurst & Appelo 2013; from memory), the phosphate
// speciated at the surface pH.
const (
	logKHydroxyapatite = -3.421 // Ca5(PO4)3OH + 4 H+ = H2O + 3 HPO4-2 + 5 Ca+2
	logK2Phosphate     = -7.20  // H2PO4- = HPO4-2 + H+
)

// ScalingMethod names the method of the scaling check.
const ScalingMethod = "Saturation index SI = log10(IAP/Ksp) at the feed-side face of the active layer and in the bulk feed. " +
	"Ion molalities at the face: the feed's ions times the feed-side concentration-polarization factor (the feed solute's face/bulk ratio " +
	"from the flux model, or exp(Jw·R) on the feed side), plus the reverse-fluxed draw ions at the draw solute's feed-face concentration, " +
	"per kg of water as in the bulk feed. Activities from the mixed-electrolyte Pitzer model (Harvie, Møller & Weare 1984) with the " +
	"carbonate system speciated at the feed's pH (Plummer & Busenberg 1982 constants; no carbonate ion pairs); solubility products " +
	"as each mineral's source names (HMW 1984 Table 3 at 25 °C with temperature functions where compiled; Plummer & Busenberg 1982 for " +
	"calcite and aragonite). Hydroxyapatite, outside the model, uses Davies (1962) activities and log K −3.421 (phreeqc.dat, from memory). " +
	"A screening flag, not a design check: no kinetics, no antiscalant."

// Scaling holds the saturation indices at the feed-side surface.
type Scaling struct {
	SI  [maxMinerals]float64
	Has [maxMinerals]bool // the ions of that mineral are present
	Any bool
	// Max is the highest SI among the minerals present.
	Max                  float64
	IonicStrengthMolPerL float64
}

// scalingSpeciateTol: the carbonate speciation of the scaling check stops
// at 1e-7 relative change (its error in SI is of that order, far below the
// solubility products' own uncertainty).
const scalingSpeciateTol = 1e-7

// scaleModel is the scenario's scaling model: one mixture over every ion
// the feed and the candidates bring (with the carbonate species), the
// feed's ions in mol per kg of water, and scratch for the evaluation (an
// env runs on one goroutine).
type scaleModel struct {
	mx        *thermo.Mixture
	feed      []ionAt // bulk feed, mol per kg of water
	waterPerL float64 // kg of water per litre at the feed
	pH        float64
	carbonate bool
	phosphate [3]int // HPO4-2, H2PO4-, PO4-3 indices (−1 absent)
	ca        int
	m, work   []float64
	si        []float64
	has       []bool
}

type ionAt struct {
	i int
	m float64
}

// prepareScaling builds e.scale from the feed's ions and the candidates'.
func (e *env) prepareScaling() {
	f := &e.sc.Feed
	index := map[string]int{}
	var ions []thermo.MixIon
	add := func(sym string, z int) int {
		if i, ok := index[sym]; ok {
			return i
		}
		index[sym] = len(ions)
		ions = append(ions, thermo.MixIon{Symbol: sym, Charge: z})
		return len(ions) - 1
	}
	for _, ion := range f.Ions {
		add(ion.Symbol, ion.Charge)
	}
	for i := range e.cands {
		for _, ion := range e.cands[i].ions {
			add(ion.symbol, ion.charge)
		}
	}
	if len(ions) == 0 {
		return
	}
	for _, c := range thermo.CarbonateIons() {
		add(c.Symbol, c.Charge)
	}
	mx, err := thermo.SharedIonMixture(ions, e.tK)
	if err != nil {
		e.warnings = append(e.warnings, warn.New(warn.ModelNote, "scaling", "scaling: no mixed-electrolyte model for these ions (%v); saturation indices are not computed", err))
		return
	}
	s := &scaleModel{mx: mx, pH: f.PH, ca: -1, phosphate: [3]int{-1, -1, -1}}
	n := len(mx.Ions())
	s.m, s.work = make([]float64, n), make([]float64, n)
	s.si, s.has = make([]float64, thermo.MineralCount()), make([]bool, thermo.MineralCount())
	// Feed ions per kg of water: per litre of feed divided by the kg of
	// water in a litre; per kg of feed divided by the water's mass fraction.
	s.waterPerL = water.Density(e.tK) / 1000
	wWater := 1.0
	if e.feedX != nil {
		rho := e.feedX.DensityKgPerM3(e.feedM)
		wWater = 1 - e.feedX.MassFraction(e.feedM)
		s.waterPerL = rho * wWater / 1000
	}
	for _, ion := range f.Ions {
		i, ok := mx.Index(ion.Symbol)
		if !ok {
			continue
		}
		m := ion.Mol / s.waterPerL
		if f.IonsPerKg {
			m = ion.Mol / wWater
		}
		s.feed = append(s.feed, ionAt{i, m})
		if ion.Symbol == "HCO3-" || ion.Symbol == "CO3-2" {
			s.carbonate = true
		}
	}
	for k, sym := range [3]string{"HPO4-2", "H2PO4-", "PO4-3"} {
		if i, ok := mx.Index(sym); ok {
			s.phosphate[k] = i
		}
	}
	if i, ok := mx.Index("Ca+2"); ok {
		s.ca = i
	}
	for i := range e.cands {
		c := &e.cands[i]
		c.ionIdx = slices.Grow(c.ionIdx[:0], len(c.ions))
		for _, ion := range c.ions {
			j, ok := mx.Index(ion.symbol)
			if !ok {
				j = -1
			}
			c.ionIdx = append(c.ionIdx, j)
		}
		c.speciesIdx = c.speciesIdx[:0]
		if c.layout != nil {
			c.speciesIdx = slices.Grow(c.speciesIdx, len(c.layout.Info))
			for _, in := range c.layout.Info {
				j, ok := mx.Index(in.Name)
				if !ok || in.Charge == 0 {
					j = -1
				}
				c.speciesIdx = append(c.speciesIdx, j)
			}
		}
	}
	e.scale = s
	// The model's notes once per scenario: missing parameters (named only
	// for the ions present in more than traces would need the amounts;
	// the count is enough here) and 25 °C data.
	if miss := mx.MissingPairs(); len(miss) > 0 {
		e.warnings = append(e.warnings, warn.New(warn.ModelNote, "scaling",
			"scaling: %d ion pairs have no Pitzer parameters and are taken as zero (%s)", len(miss), strings.Join(miss, ", ")))
	}
	seen := map[string]bool{}
	for k := 0; k < thermo.MineralCount(); k++ {
		for _, w := range mx.MineralWarnings(k) {
			if !seen[w.Text] {
				seen[w.Text] = true
				e.warnings = append(e.warnings, w.About("scaling"))
			}
		}
	}
	e.evalScaling(1, nil, nil, &e.feedScaling)
}

// scaling fills s from the converged flux result r of candidate c: each
// ion that is a transport species at its own feed-face concentration
// (species by identity: the feed's ions polarised, the draw's that
// crossed, a shared ion once); the feed's other ions (a feed that crosses
// as an equivalent NaCl) times the polarisation factor of the feed's
// solute.
func (e *env) scaling(c *candidate, ori transport.Orientation, r *transport.Result, s *Scaling) {
	if e.scale == nil {
		*s = Scaling{}
		return
	}
	cf := 1.0
	if e.feedSol != nil && e.feedC > 0 {
		cf = -1
		for i, in := range c.layout.Info {
			if in.Role != species.RoleDraw && in.FeedMolPerM3 > 0 && i < len(r.Species) {
				cf = r.Species[i].FeedFaceMolPerM3 / in.FeedMolPerM3
				break
			}
		}
		if !(cf >= 0) {
			rf := 0.0
			if !math.IsInf(e.kFeed, 1) && e.kFeed > 0 {
				rf = 1 / e.kFeed
			}
			if ori == transport.ALDS {
				rf += e.sc.Membrane.SM / e.feedD
			}
			cf = math.Exp(math.Min(r.JwMPerS*rf, 50))
		}
	}
	e.evalScaling(cf, c, r, s)
}

// evalScaling computes the indices with the feed's ions times cf and, for
// candidate c (nil: none), every ion that is a transport species at its
// feed-face concentration in r.
func (e *env) evalScaling(cf float64, c *candidate, r *transport.Result, s *Scaling) {
	*s = Scaling{}
	sm := e.scale
	for i := range sm.m {
		sm.m[i] = 0
	}
	for _, f := range sm.feed {
		sm.m[f.i] += f.m * cf
	}
	if c != nil && r != nil {
		for k, j := range c.speciesIdx {
			if j >= 0 && k < len(r.Species) {
				sm.m[j] = math.Max(0, r.Species[k].FeedFaceMolPerM3) / 1000 / sm.waterPerL
			}
		}
	}
	if err := sm.mx.SpeciateCarbonateInto(sm.m, sm.work, sm.pH, scalingSpeciateTol); err != nil {
		return
	}
	sm.mx.SaturationInto(sm.m, sm.work, sm.si, sm.has)
	set := func(k Mineral, si float64) {
		if math.IsNaN(si) || math.IsInf(si, 0) {
			return
		}
		s.SI[k], s.Has[k] = si, true
		if !s.Any || si > s.Max {
			s.Max = si
		}
		s.Any = true
	}
	for k := range sm.si {
		if sm.has[k] {
			set(Mineral(k), sm.si[k])
		}
	}
	iMolal := sm.mx.IonicStrength(sm.m)
	s.IonicStrengthMolPerL = iMolal * sm.waterPerL
	// Hydroxyapatite by the Davies equation at the molar ionic strength.
	pt := 0.0
	for _, i := range sm.phosphate {
		if i >= 0 {
			pt += sm.m[i]
		}
	}
	if sm.ca >= 0 && sm.m[sm.ca] > 0 && pt > 0 {
		is := s.IonicStrengthMolPerL
		g1 := math.Pow(10, daviesLogGamma(e.davies, 1, is))
		g2 := math.Pow(10, daviesLogGamma(e.davies, 2, is))
		aH := math.Pow(10, -sm.pH)
		rr := math.Pow(10, logK2Phosphate) * g1 / (g2 * aH) // [HPO4]/[H2PO4]
		hpo4 := pt * sm.waterPerL * rr / (1 + rr)
		logCa := math.Log10(g2 * sm.m[sm.ca] * sm.waterPerL)
		set(Hydroxyapatite, 5*logCa+3*math.Log10(g2*hpo4)+4*sm.pH-logKHydroxyapatite)
	}
}

// daviesA returns the Davies/Debye–Hückel constant A (log10 units, kg^½
// mol^−½) at tK:
//
//	A = 1.82483e6 · √ρ_w · (ε_r T)^(−3/2)
//
// with ρ_w in g/cm³ (e.g. Stumm & Morgan, Aquatic Chemistry, 3rd ed.,
// 1996, ch. 3; the constant 1.82483e6 from memory). About 0.509 at 25 °C.
func daviesA(tK float64) float64 {
	rho := water.Density(tK) / 1000
	eps := water.DielectricConstant(tK)
	return 1.82483e6 * math.Sqrt(rho) * math.Pow(eps*tK, -1.5)
}

// daviesLogGamma returns log10 γ of an ion of charge z at ionic strength I
// (mol/L) by the Davies (1962) equation:
//
//	log10 γ = −A z² (√I/(1 + √I) − 0.3 I)
//
// Valid to I ≈ 0.5 mol/L.
func daviesLogGamma(a float64, z int, i float64) float64 {
	s := math.Sqrt(i)
	return -a * float64(z*z) * (s/(1+s) - 0.3*i)
}
