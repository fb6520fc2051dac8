package regen

import (
	"fmt"
	"math"
	"strings"

	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/water"
)

// Model texts, reported with each route's result.
const (
	modelRO      = "single-stage RO at the thermodynamic restriction: feed pressure = concentrate π − permeate π + margin; SEC = P·[1 − η_ERD(1 − r)]/(η_pump·r) (Zhu, Christofides & Cohen 2009, Ind. Eng. Chem. Res. 48:6010, from memory); permeate (1 − R) × the mean of inflow and concentrate"
	modelNF      = "as RO, with the solute's NF rejection and the NF pressure rating"
	modelThermal = "split-stream stripping: the product share of the diluted draw is heated to the column temperature and stripped of the draw (heat of decomposition per mole, sensible heat less the heat exchanger's recovery); the gases are re-absorbed by the rest (McCutcheon, McGinnis & Elimelech 2005, Desalination 174:1, and McGinnis & Elimelech 2007, Desalination 207:370, for the NH3–CO2 process); column reflux and stripping steam left out, so the heat is a lower bound"
	modelMD      = "heat = latent heat at the hot inlet ÷ gained output ratio (Sharqawy et al. 2010 latent heat); feasible while the concentrate's vapour pressure a_w·p_sat(T_hot) exceeds the distillate's p_sat(T)"
	modelDirect  = "the diluted draw is the product, a fertiliser solution (Phuntsho et al. 2011, J. Membr. Sci. 375:172, from memory); no separation, no regeneration energy"
)

// RouteOf maps a library record's free-text regeneration name to a route
// id, "" for a route not modelled (crystallisation, evaporation, CO2
// stripping of bicarbonates).
func RouteOf(name string) string {
	n := strings.ToLower(name)
	switch {
	case strings.Contains(n, "reverse osmosis"):
		return RO
	case strings.Contains(n, "nanofiltration"):
		return NF
	case strings.Contains(n, "membrane distillation"):
		return MD
	case strings.Contains(n, "thermal stripping"):
		return Thermal
	}
	return ""
}

// thermolytic draws decompose to gases on mild heating and are stripped
// thermally (McCutcheon, McGinnis & Elimelech 2005, Desalination 174:1,
// for NH4HCO3 and the NH3–CO2 draw).
var thermolytic = map[string]bool{"NH4HCO3": true}

// fertiliserDraws may be used directly as fertigation solutions: the
// salts Phuntsho et al. (2011), J. Membr. Sci. 375:172 screened as
// fertiliser draws (from memory), and K2SO4, Mg(NO3)2 and NH4HCO3, sold as
// fertilisers (common practice).
var fertiliserDraws = map[string]bool{
	"KCl": true, "KNO3": true, "NaNO3": true, "NH4NO3": true, "NH4Cl": true, "Ca(NO3)2": true, "(NH4)2SO4": true,
	"K2SO4": true, "Mg(NO3)2": true, "NH4HCO3": true,
}

// nfRejection is the NF rejection of draws an NF membrane is known to
// retain: divalent salts and sugars (typical figures for NF90/NF270-class
// polyamide membranes at a few g/L, from memory; edit per solute with
// regeneration.nf_rejection_by_solute). Monovalent salts and small
// neutral solutes have none stated: NF passes too much of them.
var nfRejection = map[string]float64{
	"MgSO4": 0.97, "Na2SO4": 0.95, "K2SO4": 0.95, "(NH4)2SO4": 0.93, "Li2SO4": 0.95,
	"MgCl2": 0.90, "CaCl2": 0.85, "Mg(NO3)2": 0.85, "Ca(NO3)2": 0.80,
	"glucose": 0.95, "sucrose": 0.98,
}

// roRejection overrides the RO default for draws RO retains less well:
// glycerol, a small neutral solute (about 0.95, from memory).
var roRejection = map[string]float64{"glycerol": 0.95}

// cpWater is the specific heat of liquid water, 4.18 kJ/(kg K) (IAPWS-95
// at 25 °C via python3-iapws: 4.1816), used for sensible heat.
const cpWater = 4181.6

// membrane fills a pressure-driven route with rejection rej and pressure
// limit limitPa.
func (e *duty) membrane(r *Result, rej, limitPa float64, model string) {
	r.Applicable, r.Model, r.Rejection, r.PressureLimitBar = true, model, rej, limitPa/thermo.PascalPerBar
	p := e.p
	mP := (1 - rej) * (e.mD + e.mC) / 2
	if !(mP < e.mD) {
		r.Reason = fmt.Sprintf("at a rejection of %.3g the permeate would be as strong as the diluted draw: the route cannot concentrate it", rej)
		return
	}
	// Solute balance over the diluted draw's water W: m_D W = m_C (W − P) + m_P P.
	rw := (e.mC - e.mD) / (e.mC - mP)
	perm := rw / e.waterPerM3(mP)  // m³ of permeate per kg of inflow water
	feed := 1 / e.waterPerM3(e.mD) // m³ of inflow per kg of its water
	rv := perm / feed              // volumetric recovery
	press := e.piC - e.Pi(mP) + p.MarginPa
	sec := press * (1 - p.ERDEfficiency*(1-rv)) / (p.PumpEfficiency * rv)
	loss := mP * e.waterPerM3(mP) // mol per m³ of permeate
	r.WaterRecovery, r.PressureBar = rw, press/thermo.PascalPerBar
	r.ElectricKWhPerM3 = sec / thermo.JPerKWh
	r.EquivalentWorkKWhPerM3 = r.ElectricKWhPerM3
	r.DrawLossMolPerM3, r.DrawLossGPerM3 = loss, loss*e.mm*1000
	r.ProductSoluteMgPerL = r.DrawLossGPerM3
	r.Feasible = press <= limitPa
	if !r.Feasible {
		r.Reason = fmt.Sprintf("needs %.1f bar (concentrate π %.1f bar plus margin), above the %.0f bar limit", r.PressureBar, e.piC/thermo.PascalPerBar, r.PressureLimitBar)
	}
}

// thermal fills the thermal stripping route (thermolytic draws only).
func (e *duty) thermal(r *Result) {
	if !thermolytic[e.id()] {
		r.Reason = "only a thermolytic draw (NH4HCO3 / NH3–CO2) is stripped thermally"
		return
	}
	p := e.p
	r.Applicable, r.Model = true, modelThermal
	tS := p.StripC + 273.15
	if !(tS > e.TempK) {
		r.Reason = fmt.Sprintf("the column (%.0f °C) must run above the draw's temperature", p.StripC)
		return
	}
	heat := p.ThermalHeatJPerM3
	if heat == 0 {
		// Per m³ of product: the solute in that water, mD·ρw mol, is
		// stripped; the product share of the draw is heated from T to T_S.
		n := e.mD * e.rhoW
		stream := e.rhoW * (1 + e.mD*e.mm) // kg of draw heated
		heat = n*p.DecompositionJPerMol + stream*cpWater*(tS-e.TempK)*(1-p.HeatRecovery)
	}
	r.HeatKWhPerM3 = heat / thermo.JPerKWh
	r.ElectricKWhPerM3 = p.ThermalElectricJPerM3 / thermo.JPerKWh
	r.EquivalentWorkKWhPerM3 = r.ElectricKWhPerM3 + r.HeatKWhPerM3*p.CarnotFraction*(1-e.TempK/tS)
	r.Feasible = true
	r.Reason = "residual ammonia in the product is left out: the product water needs polishing"
	e.secondLaw(r, heat, tS)
}

// secondLaw marks a heat-driven route infeasible when its heat's exergy,
// heat × (1 − T/T_hot), and its electricity fall short of the reversible
// minimum: its parameters (gained output ratio, heat) ask for more than
// thermodynamics allows at that temperature lift.
func (e *duty) secondLaw(r *Result, heatJ, tHot float64) {
	if !r.Feasible {
		return
	}
	if ex := heatJ*(1-e.TempK/tHot) + r.ElectricKWhPerM3*thermo.JPerKWh; ex < e.minimal {
		r.Feasible = false
		r.Reason = fmt.Sprintf("the heat's exergy (%.3g kWh/m³ with the electricity) is below the reversible minimum (%.3g kWh/m³): these parameters break the second law at a %.0f K lift",
			ex/thermo.JPerKWh, e.minimal/thermo.JPerKWh, tHot-e.TempK)
	}
}

// distillation fills the membrane distillation route.
func (e *duty) distillation(r *Result) {
	if thermolytic[e.id()] {
		r.Reason = "a volatile draw crosses an MD membrane with the vapour; use thermal stripping"
		return
	}
	p := e.p
	r.Applicable, r.Model = true, modelMD
	tH := p.MDHotC + 273.15
	// Water activity of the concentrate from its π (π = −RT ln a_w/V̄_w).
	aw := math.Exp(-e.piC * water.MolarVolume(e.TempK) / (thermo.GasConstant * e.TempK))
	drive := aw*water.SaturationPressurePa(tH) - water.SaturationPressurePa(e.TempK)
	r.DrivingVapourPressurePa = drive
	heat := e.rhoW * water.LatentHeatJPerKg(tH) / p.MDGOR
	r.HeatKWhPerM3 = heat / thermo.JPerKWh
	r.ElectricKWhPerM3 = p.MDElectricJPerM3 / thermo.JPerKWh
	r.EquivalentWorkKWhPerM3 = r.ElectricKWhPerM3
	if tH > e.TempK {
		r.EquivalentWorkKWhPerM3 += r.HeatKWhPerM3 * p.CarnotFraction * (1 - e.TempK/tH)
	}
	r.Feasible = tH > e.TempK && drive > 0
	e.secondLaw(r, heat, tH)
	if drive <= 0 || tH <= e.TempK {
		r.Reason = fmt.Sprintf("no vapour-pressure drive at the concentrate end (a_w = %.3f at %.0f °C hot, %.0f °C cold)", aw, p.MDHotC, e.TempK-273.15)
	}
}

// direct fills direct use (fertiliser draws).
func (e *duty) direct(r *Result) {
	if !fertiliserDraws[e.id()] {
		r.Reason = "only a fertiliser draw can be used directly"
		return
	}
	r.Applicable, r.Feasible, r.Model = true, true, modelDirect
	r.WaterRecovery = 0
	r.DeliveredSoluteKgPM3 = e.mD * e.mm * e.rhoW
	r.Reason = "the diluted draw is a fertiliser solution, not drinking water: dilute it to the crop's nutrient strength; nutrient discharge is regulated"
}

// rejection is the route's rejection of the draw: the request's per-solute
// figure, else the stated default; for NF −1 when none is stated.
func (p *Params) rejection(rec *library.Solute, route string) float64 {
	by, table, def := p.RORejectionBySolute, roRejection, p.RORejection
	if route == NF {
		by, table, def = p.NFRejectionBySolute, nfRejection, -1
	}
	if rec == nil {
		return def
	}
	if v, ok := by[library.Key(rec.ID)]; ok {
		return v
	}
	if v, ok := table[rec.ID]; ok {
		return v
	}
	return def
}
