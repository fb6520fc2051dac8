package api

// SystemMetrics is one candidate rated at plant scale: a module designed
// for the system's recovery and product flow with the draw at its basis
// concentration, the draw's best regeneration route, and the cost per m³
// of product. Per m³ of product water throughout.
type SystemMetrics struct {
	AreaM2              float64 `json:"area_m2"`
	AreaM2PerM3PerDay   float64 `json:"area_m2_per_m3_per_day"`
	AverageWaterFluxLMH float64 `json:"average_water_flux_lmh"`
	RecoveryCap         float64 `json:"recovery_cap"`
	// The draw leaving the module, to be re-concentrated.
	DrawOutConcentrationMolPerL float64 `json:"draw_out_concentration_mol_per_l"`
	DrawOutOsmoticPressureBar   float64 `json:"draw_out_osmotic_pressure_bar"`
	// Make-up: the draw lost to the feed (reverse solute flux) plus the
	// regeneration route's loss.
	ReverseSoluteLossGPerM3 float64 `json:"reverse_solute_loss_g_per_m3"`
	RegenerationLossGPerM3  float64 `json:"regeneration_loss_g_per_m3"`
	MakeUpGPerM3            float64 `json:"make_up_g_per_m3"`
	// The regeneration route of least equivalent work and its energy:
	// electricity, heat, and the two as equivalent work (energy_kwh_per_m3);
	// the reversible minimum beside them.
	RegenerationRoute    string  `json:"regeneration_route"`
	ElectricKWhPerM3     float64 `json:"electric_kwh_per_m3"`
	HeatKWhPerM3         float64 `json:"heat_kwh_per_m3"`
	EnergyKWhPerM3       float64 `json:"energy_kwh_per_m3"`
	MinimumKWhPerM3      float64 `json:"minimum_kwh_per_m3"`
	DrawPriceUSDPerKg    float64 `json:"draw_price_usd_per_kg"`
	MakeUpCostUSDPerM3   float64 `json:"make_up_cost_usd_per_m3"`
	EnergyCostUSDPerM3   float64 `json:"energy_cost_usd_per_m3"`
	MembraneCostUSDPerM3 float64 `json:"membrane_cost_usd_per_m3"`
	CostUSDPerM3         float64 `json:"cost_usd_per_m3"`
	// CouponRank is the candidate's rank on the coupon basis.
	CouponRank int `json:"coupon_rank"`
}

// SystemReport restates the plant the candidates were rated for.
type SystemReport struct {
	Recovery             float64 `json:"recovery"`
	ProductM3PerDay      float64 `json:"product_m3_per_day"`
	FeedInflowM3PerDay   float64 `json:"feed_inflow_m3_per_day"`
	DrawInflowM3PerDay   float64 `json:"draw_inflow_m3_per_day"`
	DrawToFeedFlowRatio  float64 `json:"draw_to_feed_flow_ratio"`
	Flow                 string  `json:"flow"`
	ElectricityUSDPerKWh float64 `json:"electricity_usd_per_kwh"`
	HeatUSDPerKWh        float64 `json:"heat_usd_per_kwh"`
	MembraneUSDPerM2     float64 `json:"membrane_usd_per_m2"`
	MembraneLifeYears    float64 `json:"membrane_life_years"`
	// Ranked: the candidates are ranked by cost_usd_per_m3 (basis
	// "system"); otherwise the coupon ranking stands beside the metrics.
	Ranked    bool    `json:"ranked"`
	Tolerance float64 `json:"tolerance"`
	Rated     int     `json:"rated"`
	Method    string  `json:"method"`
}

// systemMethod states what the system stage computes and leaves out.
const systemMethod = "each candidate at its basis concentration: a module designed for the recovery (operation module, tolerance as stated), the leaving draw re-concentrated to its inlet by the feasible regeneration route of least equivalent work (engine/regen); cost = make-up × draw price + electricity × its price + heat × its price + membrane area × its price ÷ (life × product per year), straight-line without interest; FO circulation pumping, pretreatment, post-treatment of the product and capital other than membrane are left out"
