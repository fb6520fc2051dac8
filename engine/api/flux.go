package api

import (
	"slices"

	"drawsift/engine/library"
	"drawsift/engine/scenario"
	"drawsift/engine/species"
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

// SpeciesFlux reports one transport species (an ion, or a neutral
// solute) of the draw or the feed, by identity.
type SpeciesFlux struct {
	Species string `json:"species"`
	Charge  int    `json:"charge"`
	Role    string `json:"role"` // "draw", "feed" or "both"
	// Flux is the net flux, positive from feed to draw (negative toward
	// the feed).
	FluxMmolPerM2H float64 `json:"flux_mmol_per_m2_h"`
	FluxGMH        float64 `json:"flux_gmh"`
	// ToFeedGMH and ToDrawGMH are the one-way fluxes through the active
	// layer (their difference is the net flux).
	ToFeedGMH float64 `json:"to_feed_gmh"`
	ToDrawGMH float64 `json:"to_draw_gmh"`
	BLMH      float64 `json:"b_lmh"`
	BOrigin   string  `json:"b_origin"`
	// IngressMmolPerLWater: for a species entering the draw, the amount
	// it carries in per litre of water drawn — in a closed draw loop whose
	// regeneration holds it back, the loop's inventory grows by this much
	// for each litre of product.
	IngressMmolPerLWater float64 `json:"ingress_mmol_per_l_water"`
}

// SpeciesProfile reports one species' concentrations across the membrane.
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
	// ReverseSoluteFlux* and SpecificReverseSoluteFlux* are net: the mass
	// of the draw's species that leaves it net (NetDrawLossGPerL is the
	// same per litre); the gross values count the one-way flux toward
	// the feed.
	NetDrawLossGPerL          float64 `json:"net_draw_loss_g_per_l"`
	GrossDrawLossGPerL        float64 `json:"gross_draw_loss_g_per_l"`
	GrossReverseSoluteFluxGMH float64 `json:"gross_reverse_solute_flux_gmh"`
	// ForwardSoluteFluxGMH is the mass of the feed's own species (those the
	// draw does not hold) entering the draw, when the feed holds any.
	ForwardSoluteFluxGMH *float64 `json:"forward_solute_flux_gmh,omitempty"`
	// MembranePotentialMV is the electric potential of the feed face over
	// the draw face that keeps the ion fluxes free of current.
	MembranePotentialMV        float64            `json:"membrane_potential_mv"`
	Species                    []SpeciesFlux      `json:"species"`
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
	{Field: "model.ions", Reference: "species by identity: every ion crosses the active layer by the Goldman constant-field solution–diffusion–electromigration flux with zero electric current (Goldman 1943; Hodgkin & Katz 1949; bidirectional electrolyte permeation in FO: Hancock, Phillip, Elimelech & Cath 2011, Environ. Sci. Technol. 45:10642); ions of a layer share one diffusivity; no fixed membrane charge"},
	{Field: "model.mixture", Reference: "osmotic pressure at each face by Young's mixing rule at equal total osmolarity over the draw's and the feed's own non-ideal models (exact for one solution and in the van 't Hoff limit)"},
	{Field: "model.b", Reference: library.HinderedRule},
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
	in, draw, deltaP := &f.Input, f.Draw, f.DeltaPBar
	resp := &FluxResponse{Orientation: in.Orientation.String(), OsmoticModel: f.Model.String(), TemperatureC: f.TemperatureK - thermo.ZeroCelsiusK,
		DeltaPBar: deltaP, Cautions: ScreenCautions, EngineVersion: EngineVersion}
	resp.Membrane = membraneReport(f)
	resp.KDraw, resp.KFeed = kReport(f.KDraw), kReport(f.KFeed)

	// Outputs: the draw's loss is net over its species (a species the feed
	// also holds may come back).
	jwLMH := res.JwMPerS / thermo.MPerSPerLMH
	mDraw := draw.X.MolarMassKgPerMol()
	loss := f.Layout.LossesAt(in, &res, mDraw)
	resp.WaterFluxLMH = jwLMH
	resp.ReverseSoluteFluxMmolPerM2H = loss.NetFormulaMolPerM2S * thermo.MmolPerM2HPerMolPerM2S
	resp.ReverseSoluteFluxGMH = loss.NetKgPerM2S * thermo.GPerM2HPerKgPerM2S
	resp.GrossReverseSoluteFluxGMH = loss.GrossKgPerM2S * thermo.GPerM2HPerKgPerM2S
	if res.JwMPerS != 0 {
		resp.SpecificReverseSoluteFluxMolPerL = loss.NetFormulaMolPerM2S / res.JwMPerS / 1000
		resp.SpecificReverseSoluteFluxGPerL = loss.NetKgPerM2S / res.JwMPerS
		resp.NetDrawLossGPerL = resp.SpecificReverseSoluteFluxGPerL
		resp.GrossDrawLossGPerL = loss.GrossKgPerM2S / res.JwMPerS
	}
	resp.MembranePotentialMV = res.Potential * thermo.GasConstant * f.TemperatureK / thermo.Faraday * 1e3
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
	var feedOnly bool
	var fwd float64
	resp.Species = make([]SpeciesFlux, 0, len(f.Layout.Info))
	resp.Profiles = make([]SpeciesProfile, 0, len(f.Layout.Info))
	for i, info := range f.Layout.Info {
		r, sp := res.Species[i], in.Species[i]
		toFeed, toDraw := transport.OneWay(in, &res, i)
		g := info.MolarMassKgPerMol * thermo.GPerM2HPerKgPerM2S
		sf := SpeciesFlux{Species: info.Name, Charge: info.Charge, Role: info.Role,
			FluxMmolPerM2H: r.FluxMolPerM2S * thermo.MmolPerM2HPerMolPerM2S, FluxGMH: r.FluxMolPerM2S * g,
			ToFeedGMH: toFeed * g, ToDrawGMH: toDraw * g,
			BLMH: sp.BMPerS / thermo.MPerSPerLMH, BOrigin: string(info.BOrigin)}
		if r.FluxMolPerM2S > 0 && res.JwMPerS > 0 {
			sf.IngressMmolPerLWater = r.FluxMolPerM2S / res.JwMPerS // mol/m³ = mmol/L
		}
		resp.Species = append(resp.Species, sf)
		role := info.Role
		if role == species.RoleBoth {
			role = "draw+feed"
		}
		resp.Profiles = append(resp.Profiles, profile(info.Name, role, r, sp, sp.BMPerS/thermo.MPerSPerLMH, info.BOrigin.Estimated(), info.MolarMassKgPerMol))
		if info.Role == species.RoleFeed {
			feedOnly = true
			fwd += r.FluxMolPerM2S * g
		}
	}
	if feedOnly {
		resp.ForwardSoluteFluxGMH = &fwd
	}
	resp.Solver = SolverReport{Method: res.Stats.Method, Iterations: res.Stats.Iterations, Evaluations: res.Stats.Evaluations, Residual: res.Stats.Residual}
	resp.Warnings = warn.Strings(append(f.Warnings, f.ResultWarnings(&res)...))
	resp.Sources = fluxSourcesFor(f, resp.Sources)
	if !finite(resp.WaterFluxLMH, resp.ReverseSoluteFluxGMH, resp.SpecificReverseSoluteFluxGPerL, resp.FluxEfficiency,
		resp.DrawFaceOsmoticPressureBar, resp.FeedFaceOsmoticPressureBar) {
		return nil, &Error{Message: "internal error: non-finite flux result", Kind: KindInternal}
	}
	return resp, nil
}

// membraneReport echoes a resolved flux problem's membrane.
func membraneReport(f *scenario.Flux) MembraneReport {
	mem := f.Membrane
	r := MembraneReport{ALMHPerBar: mem.AMPerSPa / thermo.MPerSPaPerLMHPerBar, BLMH: f.BDrawMPerS / thermo.MPerSPerLMH, SUM: mem.SM / thermo.MPerUM}
	if mem.Record != nil {
		r.Preset = mem.Record.ID
	}
	tm := mem.Temperature
	r.ATemperatureFactor, r.BTemperatureFactor, r.TemperatureRule = tm.FactorA, tm.FactorB, tm.Rule
	if tm.RefK > 0 {
		refC := tm.RefK - thermo.ZeroCelsiusK
		r.ReferenceTemperatureC = &refC
	}
	if f.BDrawEstimated {
		r.BRule = library.BEstimateRule
	}
	return r
}

// fluxSourcesFor appends to src the sources of a resolved flux problem:
// the flux model, the draw's osmotic model and record, the membrane's.
func fluxSourcesFor(f *scenario.Flux, src []Source) []Source {
	if len(src) > 0 {
		return listFluxSources(f, src)
	}
	// A library solute on a preset membrane (or none) has one list per
	// model, kept; custom records are listed afresh and never kept.
	k := fluxSourcesKey{f.Draw.Solute, f.Membrane.Record, f.Model == scenario.Real}
	if v, ok := recordSources.Load(k); ok {
		return v.([]Source)
	}
	list := slices.Clip(listFluxSources(f, nil)) // an append by a caller copies
	if libraryOwned(f.Draw.Solute, f.Membrane.Record) {
		recordSources.Store(k, list)
	}
	return list
}

type fluxSourcesKey struct {
	solute   *library.Solute
	membrane *library.Membrane
	real     bool
}

// libraryOwned reports whether s and m (nil or) are the library's records.
func libraryOwned(s *library.Solute, m *library.Membrane) bool {
	lib, err := library.Default()
	if err != nil {
		return false
	}
	if own, ok := lib.Lookup(s.ID); !ok || own != s {
		return false
	}
	if m == nil {
		return true
	}
	own, ok := library.LookupMembrane(m.ID)
	return ok && own == m
}

func listFluxSources(f *scenario.Flux, src []Source) []Source {
	n := len(fluxSources) + len(modelSources[f.Draw.Solute.Osmotic.Kind]) + len(f.Draw.Solute.Sources)
	if r := f.Membrane.Record; r != nil {
		n += len(r.Sources)
	}
	src = slices.Grow(src, n)
	src = append(src, fluxSources...)
	if f.Model == scenario.Real {
		src = append(src, modelSources[f.Draw.Solute.Osmotic.Kind]...)
	}
	src = append(src, soluteSources(f.Draw.Solute)...)
	if r := f.Membrane.Record; r != nil {
		src = append(src, membraneSources(r)...)
	}
	return src
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
