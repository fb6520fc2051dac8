package api

import (
	"drawsift/engine/library"
	"drawsift/engine/scenario"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
)

// MembraneSpec is a membrane in a request: a preset, custom values, or a
// preset with some values overridden (scenario.MembraneSpec).
type MembraneSpec = scenario.MembraneSpec

// ChannelSpec describes a crossflow channel; k follows from a Sherwood
// correlation (scenario.ChannelSpec).
type ChannelSpec = scenario.ChannelSpec

// FluxRequest is the contract's flux request (scenario.FluxSpec).
type FluxRequest = scenario.FluxSpec

// SpeciesProfile reports one solute's concentrations across the membrane.
type SpeciesProfile struct {
	Solute             string  `json:"solute"`
	Role               string  `json:"role"` // "draw", "feed" or "draw+feed"
	DrawBulkMolPerL    float64 `json:"draw_bulk_mol_per_l"`
	DrawSupportMolPerL float64 `json:"support_interface_mol_per_l"`
	DrawFaceMolPerL    float64 `json:"draw_face_mol_per_l"`
	FeedFaceMolPerL    float64 `json:"feed_face_mol_per_l"`
	FeedBulkMolPerL    float64 `json:"feed_bulk_mol_per_l"`
	// FluxMmolPerM2H is positive from feed to draw.
	FluxMmolPerM2H    float64 `json:"flux_mmol_per_m2_h"`
	FluxGMH           float64 `json:"flux_gmh"`
	BLMH              float64 `json:"b_lmh"`
	BEstimated        bool    `json:"b_estimated"`
	DiffusivityM2PerS float64 `json:"diffusivity_m2_per_s"`
}

// MassTransferReport gives the k used on one side and how it was found.
type MassTransferReport struct {
	KMPerS      float64 `json:"k_m_per_s"`
	Origin      string  `json:"origin"` // "given", "correlation" or "none"
	Correlation string  `json:"correlation,omitempty"`
	Regime      string  `json:"regime,omitempty"`
	Reynolds    float64 `json:"reynolds,omitempty"`
	Schmidt     float64 `json:"schmidt,omitempty"`
	Sherwood    float64 `json:"sherwood,omitempty"`
}

// SolverReport is the root finder's statistics.
type SolverReport struct {
	Method      string  `json:"method"`
	Iterations  int     `json:"iterations"`
	Evaluations int     `json:"evaluations"`
	Residual    float64 `json:"relative_residual"`
}

// FluxResponse is the contract's flux response.
type FluxResponse struct {
	Orientation                      string  `json:"orientation"`
	OsmoticModel                     string  `json:"osmotic_model"`
	TemperatureC                     float64 `json:"temperature_c"`
	WaterFluxLMH                     float64 `json:"water_flux_lmh"`
	ReverseSoluteFluxGMH             float64 `json:"reverse_solute_flux_gmh"`
	ReverseSoluteFluxMmolPerM2H      float64 `json:"reverse_solute_flux_mmol_per_m2_h"`
	SpecificReverseSoluteFluxGPerL   float64 `json:"specific_reverse_solute_flux_g_per_l"`
	SpecificReverseSoluteFluxMolPerL float64 `json:"specific_reverse_solute_flux_mol_per_l"`
	// ForwardSoluteFluxGMH is the feed solute's flux into the draw, when
	// the feed holds a different solute.
	ForwardSoluteFluxGMH       *float64           `json:"forward_solute_flux_gmh,omitempty"`
	DrawOsmoticPressureBar     float64            `json:"draw_osmotic_pressure_bar"`
	FeedOsmoticPressureBar     float64            `json:"feed_osmotic_pressure_bar"`
	DrawFaceOsmoticPressureBar float64            `json:"draw_face_osmotic_pressure_bar"`
	FeedFaceOsmoticPressureBar float64            `json:"feed_face_osmotic_pressure_bar"`
	EffectiveDrivingForceBar   float64            `json:"effective_driving_force_bar"`
	DeltaPBar                  float64            `json:"delta_p_bar"`
	FluxEfficiency             float64            `json:"flux_efficiency"`
	DrawDilutionModulus        float64            `json:"draw_dilution_modulus"`
	FeedConcentrationModulus   *float64           `json:"feed_concentration_modulus,omitempty"`
	PowerDensityWPerM2         *float64           `json:"power_density_w_per_m2,omitempty"`
	Profiles                   []SpeciesProfile   `json:"profiles"`
	Membrane                   MembraneReport     `json:"membrane"`
	KDraw                      MassTransferReport `json:"k_draw"`
	KFeed                      MassTransferReport `json:"k_feed"`
	Solver                     SolverReport       `json:"solver"`
	Warnings                   []string           `json:"warnings"`
	Sources                    []Source           `json:"sources"`
	// Cautions are the usual ones (ScreenCautions), with every answer.
	Cautions      []string `json:"cautions"`
	EngineVersion string   `json:"engine_version"`
}

// MembraneReport echoes the membrane parameters used.
type MembraneReport struct {
	Preset     string  `json:"preset,omitempty"`
	ALMHPerBar float64 `json:"a_lmh_per_bar"`
	BLMH       float64 `json:"b_lmh"`
	SUM        float64 `json:"s_um"`
	BRule      string  `json:"b_rule,omitempty"`
	// A and B above are at the operating temperature: measured at
	// reference_temperature_c (omitted: taken as measured at it) and
	// multiplied by the factors by temperature_rule.
	ReferenceTemperatureC *float64 `json:"reference_temperature_c,omitempty"`
	ATemperatureFactor    float64  `json:"a_temperature_factor"`
	BTemperatureFactor    float64  `json:"b_temperature_factor"`
	TemperatureRule       string   `json:"temperature_rule"`
}

var fluxSources = []Source{
	{Field: "model", Reference: "Tiraferri, Yip, Phillip, Schiffman & Elimelech (2011) J. Membr. Sci. 367:340; Tiraferri et al. (2013) J. Membr. Sci. 444:523 (water and reverse solute flux with ICP and ECP)"},
	{Field: "model.icp", Reference: "McCutcheon & Elimelech (2006) J. Membr. Sci. 284:237 (ICP, K = S/D)"},
	{Field: "model.delta_p", Reference: "Yip et al. (2011) Environ. Sci. Technol. 45:4360 (PRO with hydraulic pressure)"},
	{Field: "model.mixture", Reference: "additive osmotic pressure at each face: each solute's own non-ideal π at its own concentration (exact in the van 't Hoff limit)"},
	{Field: "model.interfaces", Reference: "interface concentrations from the exponential profiles, then π from the real model (never a non-ideal π times the exponentials)"},
}

// Flux computes the water and solute fluxes through an FO membrane.
func Flux(req *FluxRequest) (*FluxResponse, *Error) {
	f, err := scenario.ResolveFlux(req)
	if err != nil {
		return nil, fromEngine("", err)
	}
	res, err := transport.Solve(&f.Input)
	if err != nil {
		return nil, fromEngine("", err)
	}
	in, draw, feed, mem, deltaP := &f.Input, f.Draw, f.Feed, f.Membrane, f.DeltaPBar
	resp := &FluxResponse{Orientation: in.Orientation.String(), OsmoticModel: f.Model.String(), TemperatureC: f.TemperatureK - thermo.ZeroCelsiusK,
		DeltaPBar: deltaP, Cautions: ScreenCautions, EngineVersion: EngineVersion}
	resp.Membrane = MembraneReport{ALMHPerBar: mem.AMPerSPa / thermo.MPerSPaPerLMHPerBar, BLMH: f.BDrawMPerS / thermo.MPerSPerLMH, SUM: mem.SM / thermo.MPerUM}
	if mem.Record != nil {
		resp.Membrane.Preset = mem.Record.ID
	}
	tm := mem.Temperature
	resp.Membrane.ATemperatureFactor, resp.Membrane.BTemperatureFactor, resp.Membrane.TemperatureRule = tm.FactorA, tm.FactorB, tm.Rule
	if tm.RefK > 0 {
		refC := tm.RefK - thermo.ZeroCelsiusK
		resp.Membrane.ReferenceTemperatureC = &refC
	}
	if f.BDrawEstimated {
		resp.Membrane.BRule = library.BEstimateRule
	}
	resp.KDraw, resp.KFeed = kReport(f.KDraw), kReport(f.KFeed)

	// Outputs.
	jwLMH := res.JwMPerS / thermo.MPerSPerLMH
	js := res.JsMolPerM2S // mol m⁻² s⁻¹, draw → feed
	mDraw := draw.X.MolarMassKgPerMol()
	resp.WaterFluxLMH = jwLMH
	resp.ReverseSoluteFluxMmolPerM2H = js * thermo.MmolPerM2HPerMolPerM2S
	resp.ReverseSoluteFluxGMH = js * mDraw * thermo.GPerM2HPerKgPerM2S
	if res.JwMPerS != 0 {
		resp.SpecificReverseSoluteFluxMolPerL = js / res.JwMPerS / 1000
		resp.SpecificReverseSoluteFluxGPerL = js * mDraw / res.JwMPerS
	}
	resp.DrawOsmoticPressureBar = res.PiDrawBulkPa / thermo.PascalPerBar
	resp.FeedOsmoticPressureBar = res.PiFeedBulkPa / thermo.PascalPerBar
	resp.DrawFaceOsmoticPressureBar = res.PiDrawFacePa / thermo.PascalPerBar
	resp.FeedFaceOsmoticPressureBar = res.PiFeedFacePa / thermo.PascalPerBar
	resp.EffectiveDrivingForceBar = (res.PiDrawFacePa-res.PiFeedFacePa)/thermo.PascalPerBar - deltaP
	resp.FluxEfficiency = res.FluxEfficiency(in.AMPerSPa, in.DeltaPPa)
	if res.PiDrawBulkPa > 0 {
		resp.DrawDilutionModulus = res.PiDrawFacePa / res.PiDrawBulkPa
	}
	if res.PiFeedBulkPa > 0 {
		v := res.PiFeedFacePa / res.PiFeedBulkPa
		resp.FeedConcentrationModulus = &v
	}
	if deltaP > 0 {
		w := res.JwMPerS * deltaP * thermo.PascalPerBar
		resp.PowerDensityWPerM2 = &w
	}
	role := "draw"
	if f.SameSolute && feed.CSI > 0 {
		role = "draw+feed"
	}
	resp.Profiles = append(resp.Profiles, profile(draw.Solute.ID, role, res.Species[0], in.Species[0], f.BDrawMPerS/thermo.MPerSPerLMH, f.BDrawEstimated, mDraw))
	if len(in.Species) == 2 {
		p := profile(feed.Solute.ID, "feed", res.Species[1], in.Species[1], f.BFeedMPerS/thermo.MPerSPerLMH, f.BFeedEstimated, feed.X.MolarMassKgPerMol())
		resp.Profiles = append(resp.Profiles, p)
		fwd := p.FluxGMH
		resp.ForwardSoluteFluxGMH = &fwd
	}
	resp.Solver = SolverReport{Method: res.Stats.Method, Iterations: res.Stats.Iterations, Evaluations: res.Stats.Evaluations, Residual: res.Stats.Residual}
	resp.Warnings = warn.Strings(append(f.Warnings, f.ResultWarnings(&res)...))
	resp.Sources = append(resp.Sources, fluxSources...)
	if f.Model == scenario.Real {
		resp.Sources = append(resp.Sources, modelSources[draw.Solute.Osmotic.Kind]...)
	}
	resp.Sources = append(resp.Sources, soluteSources(draw.Solute)...)
	if r := mem.Record; r != nil {
		resp.Sources = append(resp.Sources, sortedSources("membrane."+r.ID, r.Sources)...)
	}
	if !finite(resp.WaterFluxLMH, resp.ReverseSoluteFluxGMH, resp.SpecificReverseSoluteFluxGPerL, resp.FluxEfficiency,
		resp.DrawFaceOsmoticPressureBar, resp.FeedFaceOsmoticPressureBar) {
		return nil, &Error{Message: "internal error: non-finite flux result", Kind: KindInternal}
	}
	return resp, nil
}

func profile(id, role string, r transport.SpeciesResult, sp transport.Species, bLMH float64, est bool, molarMass float64) SpeciesProfile {
	return SpeciesProfile{
		Solute: id, Role: role,
		DrawBulkMolPerL: sp.DrawBulkMolPerM3 / 1000, DrawSupportMolPerL: r.SupportInterfaceMolPerM3 / 1000,
		DrawFaceMolPerL: r.DrawFaceMolPerM3 / 1000, FeedFaceMolPerL: r.FeedFaceMolPerM3 / 1000,
		FeedBulkMolPerL: sp.FeedBulkMolPerM3 / 1000,
		FluxMmolPerM2H:  r.FluxMolPerM2S * thermo.MmolPerM2HPerMolPerM2S, FluxGMH: r.FluxMolPerM2S * molarMass * thermo.GPerM2HPerKgPerM2S,
		BLMH: bLMH, BEstimated: est, DiffusivityM2PerS: sp.DM2PerS,
	}
}

// kReport describes how a side's k was found.
func kReport(k scenario.SideK) MassTransferReport {
	switch k.Origin {
	case scenario.KNone:
		return MassTransferReport{Origin: string(k.Origin)}
	case scenario.KGiven:
		return MassTransferReport{KMPerS: k.KMPerS, Origin: string(k.Origin)}
	}
	mt := k.MassTransfer
	return MassTransferReport{KMPerS: mt.KMPerS, Origin: string(k.Origin), Correlation: mt.Correlation,
		Regime: mt.Regime, Reynolds: mt.Re, Schmidt: mt.Sc, Sherwood: mt.Sh}
}
