package api

import (
	"drawsift/engine/scenario"
	"drawsift/engine/warn"

	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// MembraneSpec is a membrane in a request: a preset, custom values, or a
// preset with some values overridden (scenario.MembraneSpec).
type MembraneSpec = scenario.MembraneSpec

// ChannelSpec describes a crossflow channel; k follows from a Sherwood
// correlation (scenario.ChannelSpec).
type ChannelSpec = scenario.ChannelSpec

// FluxRequest is the contract's flux request.
type FluxRequest struct {
	Membrane     *MembraneSpec  `json:"membrane"`
	Orientation  string         `json:"orientation"`
	Draw         *Concentration `json:"draw"`
	Feed         *Concentration `json:"feed,omitempty"` // omitted → deionised water
	TemperatureC *float64       `json:"temperature_c,omitempty"`
	KDrawMPerS   *float64       `json:"k_draw_m_per_s,omitempty"`
	KFeedMPerS   *float64       `json:"k_feed_m_per_s,omitempty"`
	Channel      *ChannelSpec   `json:"channel,omitempty"`
	ExternalCP   *bool          `json:"external_cp,omitempty"` // default true
	// DiffusivityM2PerS overrides the draw solute's D.
	DiffusivityM2PerS *float64 `json:"diffusivity_m2_per_s,omitempty"`
	// BFeedLMH is B for the feed solute when it differs from the draw solute.
	BFeedLMH     *float64 `json:"b_feed_lmh,omitempty"`
	OsmoticModel string   `json:"osmotic_model,omitempty"` // "real" (default) or "van-t-hoff"
	DeltaPBar    *float64 `json:"delta_p_bar,omitempty"`   // hydraulic pressure on the draw side
}

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
	EngineVersion              string             `json:"engine_version"`
}

// MembraneReport echoes the membrane parameters used.
type MembraneReport struct {
	Preset     string  `json:"preset,omitempty"`
	ALMHPerBar float64 `json:"a_lmh_per_bar"`
	BLMH       float64 `json:"b_lmh"`
	SUM        float64 `json:"s_um"`
	BRule      string  `json:"b_rule,omitempty"`
}

var fluxSources = []Source{
	{Field: "model", Reference: "Tiraferri, Yip, Phillip, Schiffman & Elimelech (2011) J. Membr. Sci. 367:340; Tiraferri et al. (2013) J. Membr. Sci. 444:523 (water and reverse solute flux with ICP and ECP)"},
	{Field: "model.icp", Reference: "McCutcheon & Elimelech (2006) J. Membr. Sci. 284:237 (ICP, K = S/D)"},
	{Field: "model.delta_p", Reference: "Yip et al. (2011) Environ. Sci. Technol. 45:4360 (PRO with hydraulic pressure)"},
	{Field: "model.mixture", Reference: "additive osmotic pressure at each face: each solute's own non-ideal π at its own concentration (exact in the van 't Hoff limit)"},
	{Field: "model.interfaces", Reference: "interface concentrations from the exponential profiles, then π from the real model (never a non-ideal π times the exponentials)"},
}

// side is one prepared stream: its solute and its bulk state.
type side struct {
	sol   *library.Solute
	x     *thermo.Solution
	m     float64 // molality
	cSI   float64 // mol/m³
	state thermo.State
}

// prepareSide validates one stream's concentration and evaluates its bulk.
func prepareSide(prefix string, c *Concentration, tK float64) (*side, *Error) {
	s, err := scenario.LookupSolute(prefix+".solute", c.Solute)
	if err != nil {
		return nil, fromEngine("", err)
	}
	v, u, err := scenario.ParseConcentration(prefix, c.Concentration, c.Unit)
	if err != nil {
		return nil, fromEngine("", err)
	}
	x, err := thermo.NewSolution(s, tK)
	if err != nil {
		return nil, fromEngine(prefix, err)
	}
	m, err := x.ToMolality(v, u)
	if err != nil {
		return nil, fromEngine(prefix, err)
	}
	st, err := x.StateAt(m, u)
	if err != nil {
		return nil, fromEngine(prefix, err)
	}
	return &side{sol: s, x: x, m: m, cSI: st.MolarityMolPerM3, state: st}, nil
}

// vantHoffFunc is π = ν c R T and its derivative.
func vantHoffFunc(nu, tK float64) transport.OsmoticFunc {
	k := nu * thermo.GasConstant * tK
	return func(c float64) (float64, float64) { return k * c, k }
}

// Flux computes the water and solute fluxes through an FO membrane.
func Flux(req *FluxRequest) (*FluxResponse, *Error) {
	mem, err := scenario.ResolveMembrane(req.Membrane)
	if err != nil {
		return nil, fromEngine("", err)
	}
	orient, err := scenario.ParseOrientation("orientation", req.Orientation)
	if err != nil {
		return nil, fromEngine("", err)
	}
	osm, err := scenario.ParseOsmoticModel(req.OsmoticModel)
	if err != nil {
		return nil, fromEngine("", err)
	}
	model := osm.String()
	tK, err := scenario.TemperatureK("temperature_c", req.TemperatureC)
	if err != nil {
		return nil, fromEngine("", err)
	}
	if req.Draw == nil {
		return nil, Invalid("draw", nil, "a draw solution is required: {\"solute\", \"concentration\", \"unit\"}")
	}
	draw, e := prepareSide("draw", req.Draw, tK)
	if e != nil {
		return nil, e
	}
	feedSpec := req.Feed
	if feedSpec == nil {
		zero := 0.0
		feedSpec = &Concentration{Solute: draw.sol.ID, Concentration: &zero, Unit: "mol/L"}
	}
	feed, e := prepareSide("feed", feedSpec, tK)
	if e != nil {
		return nil, e
	}
	deltaP, err := scenario.DeltaP.Or(req.DeltaPBar)
	if err != nil {
		return nil, fromEngine("", err)
	}
	resp := &FluxResponse{Orientation: orient.String(), OsmoticModel: model, TemperatureC: tK - thermo.ZeroCelsiusK,
		DeltaPBar: deltaP, EngineVersion: EngineVersion}
	var warns []warn.Warning
	warns = append(warns, draw.state.Warnings...)
	if feed.sol != draw.sol {
		warns = append(warns, feed.state.Warnings...)
	}

	// Diffusivities: the library's concentration- and temperature-dependent
	// D at the bulk concentration, or the override.
	dDraw := draw.x.DiffusivityM2PerS(draw.m)
	if req.DiffusivityM2PerS != nil {
		if err := scenario.Diffusivity.Check(*req.DiffusivityM2PerS); err != nil {
			return nil, fromEngine("", err)
		}
		dDraw = *req.DiffusivityM2PerS
	}
	bDrawSI, bDrawEst, err := mem.BFor("membrane.b_lmh", draw.sol, mem.BGivenMPerS)
	if err != nil {
		return nil, fromEngine("", err)
	}
	bDraw := bDrawSI / thermo.MPerSPerLMH
	resp.Membrane = MembraneReport{ALMHPerBar: mem.AMPerSPa / thermo.MPerSPaPerLMHPerBar, BLMH: bDraw, SUM: mem.SM * 1e6}
	if mem.Record != nil {
		resp.Membrane.Preset = mem.Record.ID
	}
	if bDrawEst {
		resp.Membrane.BRule = library.BEstimateRule
		warns = append(warns, warn.New(warn.BEstimated, draw.sol.ID, "B for %s is an estimate (%.3g LMH) scaled from the NaCl value by diffusivity", draw.sol.ID, bDraw))
	}

	// Mass transfer on each side.
	extCP := req.ExternalCP == nil || *req.ExternalCP
	var ch transport.Channel
	if extCP && (req.KDrawMPerS == nil || req.KFeedMPerS == nil) {
		if ch, err = scenario.ResolveChannel(req.Channel); err != nil {
			return nil, fromEngine("", err)
		}
	}
	dFeed := feed.x.DiffusivityM2PerS(feed.m)
	if feed.sol == draw.sol && req.DiffusivityM2PerS != nil {
		dFeed = dDraw
	}
	kD, err := scenario.ResolveK(&scenario.KDraw, req.KDrawMPerS, ch, extCP, false, draw.fluid(dDraw))
	if err != nil {
		return nil, fromEngine("", err)
	}
	kF, err := scenario.ResolveK(&scenario.KFeed, req.KFeedMPerS, ch, extCP, true, feed.fluid(dFeed))
	if err != nil {
		return nil, fromEngine("", err)
	}
	kDraw, kFeed := kD.KMPerS, kF.KMPerS
	resp.KDraw, resp.KFeed = kReport(kD), kReport(kF)
	for _, k := range []struct {
		side string
		k    scenario.SideK
	}{{"k_draw", kD}, {"k_feed", kF}} {
		for _, w := range k.k.MassTransfer.Warnings {
			warns = append(warns, w.About(k.side))
		}
	}

	piFor := func(sd *side) transport.OsmoticFunc {
		if osm == scenario.VantHoff {
			return vantHoffFunc(sd.x.Nu(), tK)
		}
		return sd.x.OsmoticFunc
	}
	in := transport.Input{
		AMPerSPa: mem.AMPerSPa, SM: mem.SM, Orientation: orient,
		DeltaPPa: deltaP * thermo.PascalPerBar, KDrawMPerS: kDraw, KFeedMPerS: kFeed,
	}
	var species [2]transport.Species
	species[0] = transport.Species{Name: draw.sol.ID, DrawBulkMolPerM3: draw.cSI, BMPerS: bDraw * thermo.MPerSPerLMH,
		DM2PerS: dDraw, Pi: piFor(draw)}
	n := 1
	var bFeed float64
	var bFeedEst bool
	sameSolute := feed.sol == draw.sol
	if req.BFeedLMH != nil && (sameSolute || feed.cSI == 0) {
		warns = append(warns, warn.New(warn.Unused, "b_feed_lmh", "b_feed_lmh is not used: the feed holds no solute other than the draw's"))
	}
	if sameSolute {
		species[0].FeedBulkMolPerM3 = feed.cSI
	} else if feed.cSI > 0 {
		var over *float64
		if req.BFeedLMH != nil {
			if err := scenario.FeedB.Check(*req.BFeedLMH); err != nil {
				return nil, fromEngine("", err)
			}
			over = ptr(*req.BFeedLMH * thermo.MPerSPerLMH)
		}
		b, est, err := mem.BFor("b_feed_lmh", feed.sol, over)
		if err != nil {
			return nil, fromEngine("", err)
		}
		bFeed, bFeedEst = b/thermo.MPerSPerLMH, est
		species[1] = transport.Species{Name: feed.sol.ID, FeedBulkMolPerM3: feed.cSI, BMPerS: bFeed * thermo.MPerSPerLMH,
			DM2PerS: dFeed, Pi: piFor(feed)}
		n = 2
	}
	in.Species = species[:n]
	res, err := transport.Solve(&in)
	if err != nil {
		return nil, fromEngine("", err)
	}

	// Outputs.
	jwLMH := res.JwMPerS / thermo.MPerSPerLMH
	js := res.JsMolPerM2S // mol m⁻² s⁻¹, draw → feed
	mDraw := draw.x.MolarMassKgPerMol()
	resp.WaterFluxLMH = jwLMH
	resp.ReverseSoluteFluxMmolPerM2H = js * 3600 * 1e3
	resp.ReverseSoluteFluxGMH = js * 3600 * mDraw * 1e3
	if res.JwMPerS != 0 {
		resp.SpecificReverseSoluteFluxMolPerL = js / res.JwMPerS / 1000
		resp.SpecificReverseSoluteFluxGPerL = js * mDraw / res.JwMPerS
	}
	resp.DrawOsmoticPressureBar = res.PiDrawBulkPa / thermo.PascalPerBar
	resp.FeedOsmoticPressureBar = res.PiFeedBulkPa / thermo.PascalPerBar
	resp.DrawFaceOsmoticPressureBar = res.PiDrawFacePa / thermo.PascalPerBar
	resp.FeedFaceOsmoticPressureBar = res.PiFeedFacePa / thermo.PascalPerBar
	resp.EffectiveDrivingForceBar = (res.PiDrawFacePa-res.PiFeedFacePa)/thermo.PascalPerBar - deltaP
	if bulk := res.PiDrawBulkPa - res.PiFeedBulkPa - deltaP*thermo.PascalPerBar; bulk != 0 {
		resp.FluxEfficiency = res.JwMPerS / (in.AMPerSPa * bulk)
	}
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
	if sameSolute && feed.cSI > 0 {
		role = "draw+feed"
	}
	resp.Profiles = append(resp.Profiles, profile(draw.sol.ID, role, res.Species[0], species[0], bDraw, bDrawEst, mDraw))
	if n == 2 {
		p := profile(feed.sol.ID, "feed", res.Species[1], species[1], bFeed, bFeedEst, feed.x.MolarMassKgPerMol())
		resp.Profiles = append(resp.Profiles, p)
		fwd := p.FluxGMH
		resp.ForwardSoluteFluxGMH = &fwd
	}
	resp.Solver = SolverReport{Method: res.Stats.Method, Iterations: res.Stats.Iterations, Evaluations: res.Stats.Evaluations, Residual: res.Stats.Residual}
	warns = append(warns, fluxWarnings(resp, draw, feed, res)...)
	resp.Warnings = warn.Strings(warns)
	resp.Sources = append(resp.Sources, fluxSources...)
	if model == "real" {
		resp.Sources = append(resp.Sources, modelSources[draw.sol.Osmotic.Kind]...)
	}
	resp.Sources = append(resp.Sources, soluteSources(draw.sol)...)
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
		FluxMmolPerM2H:  r.FluxMolPerM2S * 3600 * 1e3, FluxGMH: r.FluxMolPerM2S * 3600 * molarMass * 1e3,
		BLMH: bLMH, BEstimated: est, DiffusivityM2PerS: sp.DM2PerS,
	}
}

// fluxWarnings flags results a user should look at twice.
func fluxWarnings(resp *FluxResponse, draw, feed *side, res transport.Result) []warn.Warning {
	var w []warn.Warning
	if res.JwMPerS < 0 {
		w = append(w, warn.New(warn.ReverseFlow, "", "water flows from draw to feed (reverse flow): the hydraulic pressure or the feed's osmotic pressure exceeds what the draw provides at the membrane"))
	}
	// Interface concentrations past solubility: draw solute at the faces.
	check := func(x *thermo.Solution, id string, cSI float64, where string) {
		m, ok := x.MolalityFromMolarity(cSI)
		if !ok || m > x.SolubilityMolPerKg() {
			w = append(w, warn.New(warn.Solubility, id, "%s at the %s (%.3g mol/L) exceeds its solubility: precipitation or scaling is possible", id, where, cSI/1000))
		} else if m > x.ValidMolPerKg() {
			w = append(w, warn.New(warn.Extrapolated, id, "%s at the %s (%.3g mol/kg) is above the osmotic model's data limit; π there is extrapolated", id, where, m))
		}
	}
	sp := res.Species[0]
	check(draw.x, draw.sol.ID, sp.FeedFaceMolPerM3, "feed-side face of the active layer")
	check(draw.x, draw.sol.ID, sp.DrawFaceMolPerM3, "draw-side face of the active layer")
	if len(res.Species) == 2 {
		check(feed.x, feed.sol.ID, res.Species[1].FeedFaceMolPerM3, "feed-side face of the active layer")
	}
	if resp.PowerDensityWPerM2 != nil && res.JwMPerS < 0 {
		w = append(w, warn.New(warn.ReverseFlow, "delta_p_bar", "ΔP exceeds the osmotic pressure difference across the membrane: no PRO power is produced"))
	}
	return w
}

// fluid is the side's bulk solution as the Sherwood correlations see it.
func (sd *side) fluid(d float64) transport.Fluid {
	return transport.Fluid{DensityKgPerM3: sd.state.DensityKgPerM3, ViscosityPaS: sd.state.ViscosityPaS, DiffusivityM2PerS: d}
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
