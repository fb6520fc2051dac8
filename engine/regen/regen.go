// Package regen estimates what it takes to bring a diluted draw back to
// its working concentration: the reversible minimum from the draw's water
// activity, and the energy, the draw lost and the feasibility of each
// regeneration route (reverse osmosis at standard and high pressure,
// nanofiltration, thermal stripping of a thermolytic draw, membrane
// distillation, and direct use of a fertiliser draw).
//
// Every figure is per m³ of product water unless its name says otherwise.
// The route models are screening models with stated parameters
// (engine/limits lists each with its default and source); they bound
// and rank routes, they are not a process design.
package regen

import (
	"math"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// Route ids, in the order results are reported.
const (
	RO        = "ro"
	ROHigh    = "ro-high-pressure"
	NF        = "nf"
	Thermal   = "thermal"
	MD        = "md"
	DirectUse = "direct-use"
)

// Routes lists every route id in report order.
var Routes = []string{RO, ROHigh, NF, Thermal, MD, DirectUse}

var routeLabels = map[string]string{
	RO:        "reverse osmosis",
	ROHigh:    "high-pressure reverse osmosis",
	NF:        "nanofiltration",
	Thermal:   "thermal stripping",
	MD:        "membrane distillation",
	DirectUse: "direct use (fertiliser)",
}

// Duty is one re-concentration: the draw solution, diluted to one
// molality, brought back to a higher one by removing water.
type Duty struct {
	Solution *thermo.Solution
	// Pi is the osmotic pressure (Pa) at a molality of the draw solute
	// under the request's osmotic model; nil → Solution.OsmoticPressurePa.
	Pi func(mMolPerKg float64) float64
	// Record is the draw's library record; nil for a custom draw or a
	// blend (then only the general routes apply).
	Record *library.Solute
	// DilutedMolPerKg and ConcentratedMolPerKg are the draw solute's
	// molality before and after (0 < diluted < concentrated).
	DilutedMolPerKg, ConcentratedMolPerKg float64
	// TempK is the draw's temperature, taken as the ambient.
	TempK float64
}

// Minimum is the reversible work of the duty: the least work to remove
// the water as pure water (screen.MinimumSeparationEnergy's integral).
type Minimum struct {
	// WaterRecovery is the fraction of the diluted draw's water removed,
	// 1 − m_diluted/m_concentrated.
	WaterRecovery float64 `json:"water_recovery"`
	// Per m³ of water removed (the product) and per m³ of diluted draw.
	KWhPerM3Water       float64 `json:"kwh_per_m3_water"`
	KWhPerM3DilutedDraw float64 `json:"kwh_per_m3_diluted_draw"`
	DilutedPiBar        float64 `json:"diluted_osmotic_pressure_bar"`
	ConcentratePiBar    float64 `json:"concentrate_osmotic_pressure_bar"`
}

// Result is one route's estimate for a duty.
type Result struct {
	Route string `json:"route"`
	Label string `json:"label"`
	// Listed: the draw's library record names this route.
	Listed bool `json:"listed"`
	// Applicable: the route can treat this draw at all; Feasible: it can
	// at this duty. Reason says why not, or what to mind.
	Applicable bool   `json:"applicable"`
	Feasible   bool   `json:"feasible"`
	Reason     string `json:"reason,omitempty"`

	// ElectricKWhPerM3 is the electricity used; HeatKWhPerM3 the heat;
	// EquivalentWorkKWhPerM3 the electricity plus the work the heat could
	// have made (heat × Carnot fraction × Carnot factor).
	ElectricKWhPerM3       float64 `json:"electric_kwh_per_m3"`
	HeatKWhPerM3           float64 `json:"heat_kwh_per_m3"`
	EquivalentWorkKWhPerM3 float64 `json:"equivalent_work_kwh_per_m3"`
	// RatioToMinimum is the equivalent work over the reversible minimum
	// on the water basis (0 for direct use, which separates nothing).
	RatioToMinimum float64 `json:"ratio_to_minimum"`

	// Membrane routes: the applied pressure, the route's limit and the
	// rejection used.
	PressureBar      float64 `json:"pressure_bar,omitempty"`
	PressureLimitBar float64 `json:"pressure_limit_bar,omitempty"`
	Rejection        float64 `json:"rejection,omitempty"`
	// MD: the vapour-pressure difference left at the concentrate end.
	DrivingVapourPressurePa float64 `json:"driving_vapour_pressure_pa,omitempty"`
	// WaterRecovery is the fraction of the diluted draw's water the route
	// removes (above the duty's when its product carries solute).
	WaterRecovery float64 `json:"water_recovery"`
	// The draw leaving with the product per m³ (its make-up), and the
	// product's draw solute content (mg/L).
	DrawLossGPerM3       float64 `json:"draw_loss_g_per_m3"`
	DrawLossMolPerM3     float64 `json:"draw_loss_mol_per_m3"`
	ProductSoluteMgPerL  float64 `json:"product_solute_mg_per_l"`
	DeliveredSoluteKgPM3 float64 `json:"delivered_solute_kg_per_m3,omitempty"`
	Model                string  `json:"model"`
}

// Report is the evaluation of a duty.
type Report struct {
	Minimum  Minimum
	Routes   []Result
	Warnings []warn.Warning
}

// Best returns the feasible route of least equivalent work, or nil. Direct
// use makes a fertiliser solution rather than water, so it counts only
// when withDirect is set.
func (r *Report) Best(withDirect bool) *Result {
	var best *Result
	for i := range r.Routes {
		x := &r.Routes[i]
		if !x.Feasible || x.Route == DirectUse && !withDirect {
			continue
		}
		if best == nil || x.EquivalentWorkKWhPerM3 < best.EquivalentWorkKWhPerM3 {
			best = x
		}
	}
	return best
}

// Evaluate returns the reversible minimum of the duty and the estimate of
// each route p.Routes names (every route when empty).
func Evaluate(d Duty, p Params) (Report, error) {
	e, err := newDuty(d, &p)
	if err != nil {
		return Report{}, err
	}
	rep := Report{Minimum: e.minimum()}
	routes := p.Routes
	if len(routes) == 0 {
		routes = Routes
	}
	for _, id := range routes {
		r := e.route(id)
		if !finiteResult(&r) {
			return Report{}, errs.InvalidText("regeneration", id, "a finite estimate", "the %s estimate is not finite at this duty", routeLabels[id])
		}
		rep.Routes = append(rep.Routes, r)
	}
	if d.Record != nil {
		for _, name := range d.Record.Regeneration {
			if RouteOf(name) == "" {
				rep.Warnings = append(rep.Warnings, warn.New(warn.Regeneration, "regeneration",
					"regeneration: the library also names %q for %s, which is not modelled here", name, d.Record.ID))
			}
		}
	}
	return rep, nil
}

// MinimumOf is the reversible minimum of a duty alone.
func MinimumOf(d Duty) (Minimum, error) {
	e, err := newDuty(d, nil)
	if err != nil {
		return Minimum{}, err
	}
	return e.minimum(), nil
}

// duty is a checked Duty with its derived quantities.
type duty struct {
	Duty
	p       *Params
	mD, mC  float64
	mm      float64 // molar mass, kg/mol
	rhoW    float64 // pure water, kg/m³
	r       float64 // water recovery of the duty
	piD     float64
	piC     float64
	minimal float64 // J per m³ of product
}

func newDuty(d Duty, p *Params) (*duty, error) {
	if d.Solution == nil {
		return nil, errs.InvalidText("regeneration", "", "a draw solution", "regeneration needs the draw solution")
	}
	if !(d.DilutedMolPerKg > 0) || !(d.ConcentratedMolPerKg > d.DilutedMolPerKg) || math.IsInf(d.ConcentratedMolPerKg, 0) {
		return nil, errs.Invalid("regeneration", d.DilutedMolPerKg, "0 < diluted < concentrated molality",
			"regeneration needs a diluted draw weaker than the concentrated one (%.4g and %.4g mol/kg)", d.DilutedMolPerKg, d.ConcentratedMolPerKg)
	}
	if !water.InRange(d.TempK) {
		return nil, errs.Invalid("temperature_c", d.TempK-273.15, "0–100 °C", "regeneration needs a temperature within 0–100 °C")
	}
	if d.Pi == nil {
		d.Pi = d.Solution.OsmoticPressurePa
	}
	e := &duty{Duty: d, p: p, mD: d.DilutedMolPerKg, mC: d.ConcentratedMolPerKg,
		mm: d.Solution.MolarMassKgPerMol(), rhoW: water.Density(d.TempK)}
	e.r = 1 - e.mD/e.mC
	e.piD, e.piC = d.Pi(e.mD), d.Pi(e.mC)
	e.minimal = MinimumSeparationEnergy(d.Pi, e.mD, e.r)
	return e, nil
}

func (e *duty) minimum() Minimum {
	return Minimum{WaterRecovery: e.r, KWhPerM3Water: e.minimal / thermo.JPerKWh,
		KWhPerM3DilutedDraw: e.minimal * e.r * e.waterPerM3(e.mD) / e.rhoW / thermo.JPerKWh,
		DilutedPiBar:        e.piD / thermo.PascalPerBar, ConcentratePiBar: e.piC / thermo.PascalPerBar}
}

// waterPerM3 is the water in one m³ of draw at molality m, kg.
func (e *duty) waterPerM3(m float64) float64 {
	return e.Solution.DensityKgPerM3(m) / (1 + m*e.mm)
}

// id is the record's id, "" for a custom draw.
func (e *duty) id() string {
	if e.Record == nil {
		return ""
	}
	return e.Record.ID
}

// listed reports whether the draw's record names the route.
func (e *duty) listed(route string) bool {
	if e.Record == nil {
		return false
	}
	for _, name := range e.Record.Regeneration {
		if id := RouteOf(name); id == route || id == RO && route == ROHigh {
			return true
		}
	}
	return false
}

func (e *duty) route(id string) Result {
	r := Result{Route: id, Label: routeLabels[id], Listed: e.listed(id), WaterRecovery: e.r}
	switch id {
	case RO:
		e.membrane(&r, e.p.rejection(e.Record, RO), e.p.ROMaxPa, modelRO)
	case ROHigh:
		e.membrane(&r, e.p.rejection(e.Record, RO), e.p.ROHighMaxPa, modelRO)
	case NF:
		rej := e.p.rejection(e.Record, NF)
		if rej < 0 {
			r.Reason = "no NF rejection is stated for this draw (give regeneration.nf_rejection_by_solute); NF suits divalent and large solutes"
			return r
		}
		e.membrane(&r, rej, e.p.NFMaxPa, modelNF)
	case Thermal:
		e.thermal(&r)
	case MD:
		e.distillation(&r)
	case DirectUse:
		e.direct(&r)
	}
	if r.Applicable && e.minimal > 0 && id != DirectUse {
		r.RatioToMinimum = r.EquivalentWorkKWhPerM3 * thermo.JPerKWh / e.minimal
	}
	return r
}

func finiteResult(r *Result) bool {
	for _, v := range []float64{r.ElectricKWhPerM3, r.HeatKWhPerM3, r.EquivalentWorkKWhPerM3, r.RatioToMinimum, r.PressureBar,
		r.DrivingVapourPressurePa, r.WaterRecovery, r.DrawLossGPerM3, r.DrawLossMolPerM3, r.ProductSoluteMgPerL, r.DeliveredSoluteKgPM3} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}
