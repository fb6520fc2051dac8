package regen

import (
	"slices"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/thermo"
)

// Spec is the request's "regeneration" object: the routes to evaluate
// and any parameter to change from its default (engine/limits lists every
// default and its source).
type Spec struct {
	// Routes are route ids (Routes); empty: every route.
	Routes              []string           `json:"routes,omitempty"`
	PumpEfficiency      *float64           `json:"pump_efficiency,omitempty"`
	ERDEfficiency       *float64           `json:"erd_efficiency,omitempty"`
	PressureMarginBar   *float64           `json:"pressure_margin_bar,omitempty"`
	ROMaxPressureBar    *float64           `json:"ro_max_pressure_bar,omitempty"`
	ROHighMaxBar        *float64           `json:"ro_high_max_pressure_bar,omitempty"`
	NFMaxPressureBar    *float64           `json:"nf_max_pressure_bar,omitempty"`
	RORejection         *float64           `json:"ro_rejection,omitempty"`
	RORejectionBySolute map[string]float64 `json:"ro_rejection_by_solute,omitempty"`
	NFRejectionBySolute map[string]float64 `json:"nf_rejection_by_solute,omitempty"`

	StripTemperatureC       *float64 `json:"thermal_strip_temperature_c,omitempty"`
	DecompositionKJPerMol   *float64 `json:"thermal_decomposition_kj_per_mol,omitempty"`
	HeatRecovery            *float64 `json:"heat_recovery,omitempty"`
	ThermalHeatKWhPerM3     *float64 `json:"thermal_heat_kwh_per_m3,omitempty"`
	ThermalElectricKWhPerM3 *float64 `json:"thermal_electric_kwh_per_m3,omitempty"`
	CarnotFraction          *float64 `json:"heat_to_work_carnot_fraction,omitempty"`

	MDGainedOutputRatio *float64 `json:"md_gained_output_ratio,omitempty"`
	MDHotTemperatureC   *float64 `json:"md_hot_temperature_c,omitempty"`
	MDElectricKWhPerM3  *float64 `json:"md_electric_kwh_per_m3,omitempty"`
}

// Params are the checked parameters of every route, in SI units.
type Params struct {
	Routes                        []string
	PumpEfficiency, ERDEfficiency float64
	MarginPa                      float64
	ROMaxPa, ROHighMaxPa, NFMaxPa float64
	RORejection                   float64
	// By library.Key of the solute id.
	RORejectionBySolute, NFRejectionBySolute map[string]float64

	StripC                float64
	DecompositionJPerMol  float64
	HeatRecovery          float64
	ThermalHeatJPerM3     float64 // 0: the model's
	ThermalElectricJPerM3 float64
	CarnotFraction        float64

	MDGOR            float64
	MDHotC           float64
	MDElectricJPerM3 float64
}

// Defaults are the parameters when nothing is changed.
func Defaults() Params {
	p, err := (*Spec)(nil).Resolve("regeneration.")
	if err != nil {
		panic(err) // the defaults lie in their ranges (limits tests)
	}
	return p
}

// Resolve checks every field against its limits range, naming
// prefix+field in an error (prefix "regeneration." in a module request),
// and returns the parameters; a nil Spec gives the defaults.
func (s *Spec) Resolve(prefix string) (Params, error) {
	if s == nil {
		s = &Spec{}
	}
	var p Params
	var err error
	get := func(r *limits.Range, v *float64, scale float64) float64 {
		if err != nil {
			return 0
		}
		x := r.Default
		if v != nil {
			x = *v
			err = r.CheckAt(prefix+strings.TrimPrefix(r.Field, "regeneration."), x)
		}
		return x * scale
	}
	const bar, kwh = thermo.PascalPerBar, thermo.JPerKWh
	p.PumpEfficiency = get(&limits.RegenPumpEfficiency, s.PumpEfficiency, 1)
	p.ERDEfficiency = get(&limits.RegenERDEfficiency, s.ERDEfficiency, 1)
	p.MarginPa = get(&limits.RegenPressureMargin, s.PressureMarginBar, bar)
	p.ROMaxPa = get(&limits.RegenROMaxPressure, s.ROMaxPressureBar, bar)
	p.ROHighMaxPa = get(&limits.RegenROHighPressure, s.ROHighMaxBar, bar)
	p.NFMaxPa = get(&limits.RegenNFMaxPressure, s.NFMaxPressureBar, bar)
	p.RORejection = get(&limits.RegenRORejection, s.RORejection, 1)
	p.StripC = get(&limits.RegenStripC, s.StripTemperatureC, 1)
	p.DecompositionJPerMol = get(&limits.RegenDecomposition, s.DecompositionKJPerMol, 1e3)
	p.HeatRecovery = get(&limits.RegenHeatRecovery, s.HeatRecovery, 1)
	p.ThermalHeatJPerM3 = get(&limits.RegenThermalHeat, s.ThermalHeatKWhPerM3, kwh)
	p.ThermalElectricJPerM3 = get(&limits.RegenThermalElectric, s.ThermalElectricKWhPerM3, kwh)
	p.CarnotFraction = get(&limits.RegenCarnotFraction, s.CarnotFraction, 1)
	p.MDGOR = get(&limits.RegenMDGOR, s.MDGainedOutputRatio, 1)
	p.MDHotC = get(&limits.RegenMDHotC, s.MDHotTemperatureC, 1)
	p.MDElectricJPerM3 = get(&limits.RegenMDElectric, s.MDElectricKWhPerM3, kwh)
	if err != nil {
		return Params{}, err
	}
	if p.RORejectionBySolute, err = rejections(prefix+"ro_rejection_by_solute", s.RORejectionBySolute); err != nil {
		return Params{}, err
	}
	if p.NFRejectionBySolute, err = rejections(prefix+"nf_rejection_by_solute", s.NFRejectionBySolute); err != nil {
		return Params{}, err
	}
	for i, id := range s.Routes {
		if !slices.Contains(Routes, id) {
			return Params{}, errs.InvalidText(prefix+"routes", id, strings.Join(Routes, ", "),
				"regeneration route %d, %q, is not one of %s", i+1, id, strings.Join(Routes, ", "))
		}
		if slices.Contains(p.Routes, id) {
			continue
		}
		p.Routes = append(p.Routes, id)
	}
	return p, nil
}

// rejections checks a per-solute rejection map (keys in sorted order, so
// the first error is always the same one) and keys it by library.Key.
func rejections(field string, in map[string]float64) (map[string]float64, error) {
	if len(in) == 0 {
		return nil, nil
	}
	keys := make([]string, 0, len(in))
	for k := range in {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	out := make(map[string]float64, len(in))
	for _, k := range keys {
		if err := limits.RegenRejectionEntry.CheckAt(field+"."+k, in[k]); err != nil {
			return nil, err
		}
		out[library.Key(k)] = in[k]
	}
	return out, nil
}
