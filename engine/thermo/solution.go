package thermo

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"gonum.org/v1/gonum/interp"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// Temperature range accepted by every model, °C: the range of the
// pure-water correlations (package water).
const (
	MinTemperatureC = 0
	MaxTemperatureC = 100
)

// Solution is one solute prepared at one temperature: the parameters that
// depend only on temperature are evaluated once, so that each evaluation
// at a concentration is cheap. A Solution is immutable and safe for
// concurrent use.
type Solution struct {
	Solute *library.Solute
	TK     float64

	kind   string
	nu     float64 // van 't Hoff factor
	mKg    float64 // solute molar mass, kg/mol
	tC     float64
	rt     float64 // R·T, J/mol
	vw     float64 // molar volume of pure water, m³/mol
	piPerG float64 // π = piPerG · ν · g with g = m·φ: R·T·M_w/V̄_w (Pa·kg/mol)

	pz               pitzer
	table            *interp.FritschButland // π_ref(m) for ModelTable, Pa
	tabMax, tabScale float64                // last table molality; π(T)/π(T_ref) scaling

	dens  density
	muW   float64 // pure-water viscosity, Pa·s
	etaRT *interp.PiecewiseLinear

	br *bridge // model → measured saturated solution, between validMolal and solMolal; nil if none

	solMolal   float64 // solubility at T, mol/kg (+Inf if miscible)
	validMolal float64 // upper limit of the model's data, mol/kg
	capMolal   float64 // top of the solver's working range (monotone extension beyond)
	gordon     bool    // D(c) by Gordon's equation (transport_props.go)
	capC       float64 // molarity at capMolal, mol/m³
	capPi      float64 // π at capC, Pa
	capSlope   float64 // dπ/dc at capC, Pa·m³/mol
	wCap       float64 // mass fraction at capMolal
	topMolal   float64 // top of MolalityForPi's bracket: solMolal, or capMolal if miscible
	topPi      float64 // π at topMolal, Pa

	// Warnings that hold for every concentration at this temperature.
	Warnings []warn.Warning

	mix *mixModel // ModelMixture: the mixed-electrolyte model

	fastState // the table behind FastOsmoticFunc, built on first use
}

// NewSolution prepares s at tK kelvin. It fails with an *errs.InputError if tK
// lies outside 0–100 °C; a temperature outside the solute's parameter data
// gives a Solution with a warning.
func NewSolution(s *library.Solute, tK float64) (*Solution, error) {
	tC := tK - ZeroCelsiusK
	if !(tC >= MinTemperatureC && tC <= MaxTemperatureC) {
		return nil, &errs.InputError{Field: "temperature_c", Value: tC, Limit: "0–100 °C",
			Msg: "temperature outside the range of the water property correlations"}
	}
	x := &Solution{Solute: s, TK: tK, tC: tC, kind: s.Osmotic.Kind, nu: s.Nu(), mKg: s.MolarMassKgPerMol()}
	x.rt = GasConstant * tK
	x.vw = water.MolarVolume(tK)
	x.piPerG = x.rt * water.MolarMassKgPerMol / x.vw
	rhoW := water.Density(tK)
	x.muW = water.Viscosity(tK)
	x.dens = newDensity(s, rhoW, tC)
	if s.Density == nil && x.kind != library.ModelSeawater && x.kind != library.ModelMixture {
		x.warn(warn.ModelNote, "%s: no density model; the solute is taken to occupy the volume of an equal mass of water, so mol/L and g/L conversions are approximate", s.ID)
	} else if d := s.Density; d != nil && (tC < d.MinC || tC > d.MaxC) {
		x.warn(warn.Extrapolated, "%s: density model fitted %s; extrapolated to %s °C", s.ID, tempSpan(d.MinC, d.MaxC), trimFloat(tC))
	}

	m := s.Osmotic
	x.validMolal = m.MaxMolalityMolPerKg
	switch x.kind {
	case library.ModelPitzer:
		var in bool
		x.pz, in = pitzerParams(s, tK)
		if t := m.Temperature; t == nil && !in {
			x.warn(warn.Temperature25C, "%s: Pitzer parameters are 25 °C data; used unchanged at %g °C", s.ID, tC)
		} else if t != nil && !in {
			x.warn(warn.Extrapolated, "%s: Pitzer temperature fit covers %s; extrapolated to %s °C", s.ID, tempSpan(t.MinC, t.MaxC), trimFloat(tC))
		}
		if t := m.Temperature; t != nil && t.MaxMolalityMolPerKg > 0 && math.Abs(tK-ReferenceK) > 5 && t.MaxMolalityMolPerKg < x.validMolal {
			x.validMolal = t.MaxMolalityMolPerKg
		}
	case library.ModelSeawater:
		// Sharqawy et al. (2010): fitted 10–120 g/kg; extended below 10 g/kg.
		x.validMolal = 120.0 / (1000 - 120) / seawaterMolarMass
		x.mKg = seawaterMolarMass
		x.dens.mKg = seawaterMolarMass
	case library.ModelTable:
		if err := x.prepareTable(); err != nil {
			return nil, err
		}
	case library.ModelMixture:
		if err := x.prepareMixture(); err != nil {
			return nil, err
		}
		d, err := x.mixDensity(rhoW, tC)
		if err != nil {
			return nil, err
		}
		x.dens = d
	case library.ModelNone:
		x.warn(warn.NoModel, "%s: %s; osmotic pressure is the van 't Hoff estimate only", s.ID, strings.TrimRight(m.Reason, ". "))
		x.validMolal = math.Inf(1)
	case library.ModelPhiPolynomial, library.ModelNorrish:
		if math.Abs(tK-ReferenceK) > 5 {
			x.warn(warn.Temperature25C, "%s: osmotic-coefficient data at 25 °C; used unchanged at %g °C", s.ID, tC)
		}
	}
	x.prepareViscosity()
	x.solMolal = x.solubilityAt(tC)
	if x.mix != nil && len(x.mix.parts) == 0 {
		// An ion composition (seawater): the mixed-electrolyte model holds
		// up to the solid's saturation.
		x.validMolal = x.solMolal
	}
	x.prepareBridge()
	x.prepareCap()
	x.topMolal = x.solMolal
	if math.IsInf(x.topMolal, 0) {
		x.topMolal = x.capMolal
	}
	x.topPi, _ = x.piMono(x.topMolal)
	// Callers append to copies of the warnings; a shared Solution
	// (Prepared) must never have them write into its array.
	x.Warnings = slices.Clip(x.Warnings)
	return x, nil
}

func (x *Solution) warn(code warn.Code, format string, a ...any) {
	x.Warnings = append(x.Warnings, warn.New(code, x.Solute.ID, format, a...))
}

// prepareTable converts a measured π table to (molality, π) at its own
// temperature and fits a monotone interpolant through the origin.
func (x *Solution) prepareTable() error {
	t := x.Solute.Osmotic.Table
	u, err := ParseUnit(t.Unit)
	if err != nil {
		return &errs.InputError{Field: "osmotic_model.table.unit", Msg: err.Error()}
	}
	// Concentration conversions use the density model at the table's
	// own temperature.
	ref := &Solution{Solute: x.Solute, mKg: x.mKg, kind: library.ModelNone, validMolal: math.Inf(1), solMolal: math.Inf(1)}
	tRefK := t.TemperatureC + ZeroCelsiusK
	ref.dens = newDensity(x.Solute, water.Density(tRefK), t.TemperatureC)
	ref.wCap = 0.999
	xs, ys := []float64{0}, []float64{0}
	for i, p := range t.Points {
		m, err := ref.ToMolality(p.Concentration, u)
		if err != nil || !(m > xs[len(xs)-1]) {
			return &errs.InputError{Field: fmt.Sprintf("osmotic_model.table.points[%d].concentration", i), Value: p.Concentration,
				Msg: "table concentration cannot be converted to an increasing molality"}
		}
		xs = append(xs, m)
		ys = append(ys, p.OsmoticPressureBar*PascalPerBar)
	}
	var f interp.FritschButland
	if err := f.Fit(xs, ys); err != nil {
		return &errs.InputError{Field: "osmotic_model.table", Msg: err.Error()}
	}
	x.table = &f
	x.tabMax = xs[len(xs)-1]
	// Constant-φ temperature scaling: π ∝ T/V̄_w(T) (flagged away from the
	// table's temperature).
	x.tabScale = (x.TK / x.vw) / (tRefK / water.MolarVolume(tRefK))
	if math.Abs(x.TK-tRefK) > 5 {
		x.warn(warn.Temperature25C, "%s: measured π table at %g °C scaled to %g °C assuming a constant osmotic coefficient", x.Solute.ID, t.TemperatureC, x.tC)
	}
	x.validMolal = x.tabMax
	return nil
}

// solubilityAt interpolates the saturation molality linearly in
// temperature; outside the tabulated range it holds the end value and warns.
func (x *Solution) solubilityAt(tC float64) float64 {
	if x.mix != nil {
		if sol, ok := x.mixSolubility(tC); ok {
			return sol
		}
	}
	sol := x.Solute.Solubility
	if sol.Miscible || len(sol.Points) == 0 {
		return math.Inf(1)
	}
	p := sol.Points
	if len(p) == 1 {
		if math.Abs(tC-p[0].TemperatureC) > 5 {
			x.warn(warn.Solubility, "%s: solubility known at %g °C only; used at %g °C", x.Solute.ID, p[0].TemperatureC, tC)
		}
		return p[0].MolalityMolPerKg
	}
	if tC <= p[0].TemperatureC || tC >= p[len(p)-1].TemperatureC {
		end := p[0]
		if tC >= p[len(p)-1].TemperatureC {
			end = p[len(p)-1]
		}
		if math.Abs(tC-end.TemperatureC) > 1e-9 {
			x.warn(warn.Solubility, "%s: solubility data span %s; the end value is used at %s °C", x.Solute.ID, tempSpan(p[0].TemperatureC, p[len(p)-1].TemperatureC), trimFloat(tC))
		}
		return end.MolalityMolPerKg
	}
	i := sort.Search(len(p), func(i int) bool { return p[i].TemperatureC >= tC })
	a, b := p[i-1], p[i]
	f := (tC - a.TemperatureC) / (b.TemperatureC - a.TemperatureC)
	return a.MolalityMolPerKg + f*(b.MolalityMolPerKg-a.MolalityMolPerKg)
}

// prepareCap sets the top of the working range used by solvers: the
// larger of the solubility and the model's data limit (finite), and the
// values needed for the monotone linear extension of π(c) above it.
func (x *Solution) prepareCap() {
	c := x.validMolal
	if !math.IsInf(x.solMolal, 0) && (math.IsInf(c, 0) || x.solMolal > c) {
		c = x.solMolal
	}
	if math.IsInf(c, 0) || c <= 0 {
		c = 30 // miscible with no data limit: 30 mol/kg is far past any draw in use
	}
	// A model extrapolated far past its data (e.g. Pitzer parameters away
	// from their temperature range) can stop rising before the cap; end
	// the working range where ν·m·φ stops increasing, so that π(c) stays
	// monotone for the solvers.
	const steps = 256
	for i := 1; i <= steps; i++ {
		m := c * float64(i) / steps
		if _, dg := x.mPhi(m); !(dg > 0) {
			c = c * float64(i-1) / steps
			x.warn(warn.Extrapolated, "%s: the osmotic model stops rising at %s mol/kg at %s °C; π is extended linearly beyond", x.Solute.ID, trimFloat(c), trimFloat(x.tC))
			break
		}
	}
	x.capMolal = c
	x.wCap = c * x.mKg / (1 + c*x.mKg)
	x.capC = x.molarityFromMolality(c)
	pi, dpdm := x.piM(c)
	x.capPi = pi
	dmdc := 1 / x.dcdm(c)
	x.capSlope = dpdm * dmdc
	if !(x.capSlope > 0) {
		// A model whose π stops rising at the cap would break the solvers'
		// monotonicity; continue with the van 't Hoff slope instead.
		x.capSlope = x.nu * x.rt
	}
}
