package scenario

import (
	"slices"

	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/regen"
)

// SystemSpec is the screen's "system" object: the plant every candidate
// is rated for (a module designed for the recovery and product flow, the
// draw's regeneration, and the cost per m³ of product).
type SystemSpec struct {
	Recovery        *float64 `json:"recovery,omitempty"`
	ProductM3PerDay *float64 `json:"product_m3_per_day,omitempty"`
	// DrawToFeedFlowRatio is the draw's inflow over the feed's.
	DrawToFeedFlowRatio *float64      `json:"draw_to_feed_flow_ratio,omitempty"`
	Flow                string        `json:"flow,omitempty"` // "counter" (default) or "co"
	Prices              *SystemPrices `json:"prices,omitempty"`
	Regeneration        *regen.Spec   `json:"regeneration,omitempty"`
}

// SystemPrices are the prices of the cost per m³; omitted ones take the
// defaults of engine/limits (each with its source there).
type SystemPrices struct {
	ElectricityUSDPerKWh *float64 `json:"electricity_usd_per_kwh,omitempty"`
	HeatUSDPerKWh        *float64 `json:"heat_usd_per_kwh,omitempty"`
	MembraneUSDPerM2     *float64 `json:"membrane_usd_per_m2,omitempty"`
	MembraneLifeYears    *float64 `json:"membrane_life_years,omitempty"`
	// DrawUSDPerKg: a price per solute ID (else the middle of the
	// library's range).
	DrawUSDPerKg map[string]float64 `json:"draw_usd_per_kg,omitempty"`
}

// System is a checked SystemSpec.
type System struct {
	Recovery, ProductM3PerDay, DrawToFeedFlowRatio float64
	Flow                                           string
	ElectricityUSDPerKWh, HeatUSDPerKWh            float64
	MembraneUSDPerM2, MembraneLifeYears            float64
	// DrawUSDPerKg by library.Key of the solute ID.
	DrawUSDPerKg map[string]float64
	Regeneration regen.Params
}

// ResolveSystem checks the system object (nil: every default).
func ResolveSystem(s *SystemSpec) (*System, error) {
	if s == nil {
		s = &SystemSpec{}
	}
	out := &System{Flow: s.Flow}
	if out.Flow == "" {
		out.Flow = "counter"
	}
	if out.Flow != "counter" && out.Flow != "co" {
		return nil, invalid("system.flow", []string{"counter", "co"}, "unknown flow arrangement %q", s.Flow)
	}
	pr := s.Prices
	if pr == nil {
		pr = &SystemPrices{}
	}
	for _, f := range []struct {
		r   *limits.Range
		v   *float64
		dst *float64
	}{
		{&limits.SystemRecovery, s.Recovery, &out.Recovery},
		{&limits.SystemProduct, s.ProductM3PerDay, &out.ProductM3PerDay},
		{&limits.SystemDrawRatio, s.DrawToFeedFlowRatio, &out.DrawToFeedFlowRatio},
		{&limits.SystemElectricity, pr.ElectricityUSDPerKWh, &out.ElectricityUSDPerKWh},
		{&limits.SystemHeat, pr.HeatUSDPerKWh, &out.HeatUSDPerKWh},
		{&limits.SystemMembranePrice, pr.MembraneUSDPerM2, &out.MembraneUSDPerM2},
		{&limits.SystemMembraneLife, pr.MembraneLifeYears, &out.MembraneLifeYears},
	} {
		v, err := f.r.Or(f.v)
		if err != nil {
			return nil, err
		}
		*f.dst = v
	}
	if len(pr.DrawUSDPerKg) > 0 {
		keys := make([]string, 0, len(pr.DrawUSDPerKg))
		for k := range pr.DrawUSDPerKg {
			keys = append(keys, k)
		}
		slices.Sort(keys)
		out.DrawUSDPerKg = map[string]float64{}
		for _, k := range keys {
			if err := limits.SystemDrawPrice.CheckAt("system.prices.draw_usd_per_kg."+k, pr.DrawUSDPerKg[k]); err != nil {
				return nil, err
			}
			out.DrawUSDPerKg[library.Key(k)] = pr.DrawUSDPerKg[k]
		}
	}
	var err error
	if out.Regeneration, err = s.Regeneration.Resolve("system.regeneration."); err != nil {
		return nil, err
	}
	return out, nil
}
