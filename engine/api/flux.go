package api

import (
	"fmt"
	"math"
	"strings"

	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// MembraneSpec is a membrane in a request: a preset, custom values, or a
// preset with some values overridden.
type MembraneSpec struct {
	Preset     string   `json:"preset,omitempty"`
	ALMHPerBar *float64 `json:"a_lmh_per_bar,omitempty"`
	// BLMH is B for the draw solute; omitted → the preset's measured value
	// for that solute or an estimate (library.BEstimateRule).
	BLMH *float64 `json:"b_lmh,omitempty"`
	// BNaClLMH is the membrane's NaCl B, the base of the estimate for other
	// solutes (custom membranes).
	BNaClLMH *float64 `json:"b_nacl_lmh,omitempty"`
	SUM      *float64 `json:"s_um,omitempty"`
}

// ChannelSpec describes a crossflow channel; k follows from a Sherwood
// correlation.
type ChannelSpec struct {
	HeightMM                 float64  `json:"height_mm"`
	WidthMM                  float64  `json:"width_mm"`
	LengthMM                 float64  `json:"length_mm"`
	CrossflowVelocityMPerS   float64  `json:"crossflow_velocity_m_per_s"`
	Spacer                   bool     `json:"spacer"`
	FeedCrossflowVelocityMPS *float64 `json:"feed_crossflow_velocity_m_per_s,omitempty"`
}

// validate checks a channel's numbers in the request's units, so that the
// error names the request's field and its limit (the correlations in
// engine/transport check again, in SI). The bounds catch unit slips, not
// unusual cells: 10 m is far beyond any channel dimension.
func (c *ChannelSpec) validate() *Error {
	for _, f := range []struct {
		name  string
		v, hi float64
		unit  string
	}{
		{"height_mm", c.HeightMM, 1e4, "mm"}, {"width_mm", c.WidthMM, 1e4, "mm"}, {"length_mm", c.LengthMM, 1e6, "mm"},
		{"crossflow_velocity_m_per_s", c.CrossflowVelocityMPerS, 20, "m/s"},
	} {
		if !(f.v > 0 && f.v <= f.hi) {
			lim := fmt.Sprintf("> 0 and ≤ %g %s", f.hi, f.unit)
			return Invalid("channel."+f.name, lim, "channel %s = %g must be %s", f.name, f.v, lim)
		}
	}
	if u := c.FeedCrossflowVelocityMPS; u != nil && !(*u > 0 && *u <= 20) {
		return Invalid("channel.feed_crossflow_velocity_m_per_s", "> 0 and ≤ 20 m/s", "the feed-side crossflow velocity must be > 0 and ≤ 20 m/s")
	}
	return nil
}

// DefaultChannel is a bench-scale flat-sheet FO cell with an empty
// channel at 0.25 m/s crossflow (common practice for lab FO tests; the
// 0.25 m/s of the standard protocol, Cath et al. 2013, is from memory).
var DefaultChannel = ChannelSpec{HeightMM: 2, WidthMM: 26, LengthMM: 77, CrossflowVelocityMPerS: 0.25}

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

// resolvedMembrane holds the membrane numbers in SI.
type resolvedMembrane struct {
	rec      *library.Membrane // preset record, or nil
	aLMHBar  float64
	bNaClLMH float64 // base for estimates, valid when bNaClSet
	bNaClSet bool    // from the preset or b_nacl_lmh
	bDrawLMH *float64
	sUM      float64
}

// resolveMembrane reads a MembraneSpec: a preset, overridden field by field.
func resolveMembrane(spec *MembraneSpec) (*resolvedMembrane, *Error) {
	if spec == nil {
		return nil, Invalid("membrane", nil, "a membrane is required: {\"preset\": ID} or {\"a_lmh_per_bar\", \"b_lmh\", \"s_um\"}")
	}
	r := &resolvedMembrane{}
	if spec.Preset != "" {
		m, ok := library.LookupMembrane(spec.Preset)
		if !ok {
			ids := []string{}
			all, _ := library.Membranes()
			for _, p := range all {
				ids = append(ids, p.ID)
			}
			return nil, Invalid("membrane.preset", ids, "unknown membrane preset %q", spec.Preset)
		}
		r.rec = m
		r.aLMHBar, r.bNaClLMH, r.sUM = m.ALMHPerBar, m.BNaClLMH, m.SUM
		r.bNaClSet = true
	}
	set := func(field string, v *float64, dst *float64, lo, hi float64) *Error {
		if v == nil {
			return nil
		}
		if !(*v >= lo && *v <= hi) {
			return Invalid("membrane."+field, fmt.Sprintf("%g–%g", lo, hi), "%s = %g is outside %g–%g", field, *v, lo, hi)
		}
		*dst = *v
		return nil
	}
	// Bounds: far outside any FO membrane reported, to catch unit slips
	// (e.g. A in m/s/Pa or S in m) rather than to judge the membrane.
	if e := set("a_lmh_per_bar", spec.ALMHPerBar, &r.aLMHBar, 1e-3, 100); e != nil {
		return nil, e
	}
	if e := set("s_um", spec.SUM, &r.sUM, 1, 1e5); e != nil {
		return nil, e
	}
	if e := set("b_nacl_lmh", spec.BNaClLMH, &r.bNaClLMH, 0, 100); e != nil {
		return nil, e
	}
	r.bNaClSet = r.bNaClSet || spec.BNaClLMH != nil
	if spec.BLMH != nil {
		var b float64
		if e := set("b_lmh", spec.BLMH, &b, 0, 100); e != nil {
			return nil, e
		}
		r.bDrawLMH = &b
	}
	if r.aLMHBar == 0 {
		return nil, Invalid("membrane.a_lmh_per_bar", "> 0", "a_lmh_per_bar is required for a custom membrane")
	}
	if r.sUM == 0 {
		return nil, Invalid("membrane.s_um", "> 0", "s_um is required for a custom membrane")
	}
	return r, nil
}

// bFor returns B (LMH) for solute s and whether it is an estimate.
func (r *resolvedMembrane) bFor(field string, s *library.Solute, override *float64) (float64, bool, *Error) {
	if override != nil {
		return *override, false, nil
	}
	if r.rec != nil {
		if b, ok := r.rec.BBySolute[s.ID]; ok && r.bNaClLMH == r.rec.BNaClLMH {
			return b, false, nil
		}
	}
	if !r.bNaClSet {
		return 0, false, Invalid(field, "≥ 0", "B for %s is needed: give %s, or membrane.b_nacl_lmh to estimate it from the NaCl value", s.ID, field)
	}
	if library.Key(s.ID) == "nacl" {
		return r.bNaClLMH, false, nil
	}
	nacl, e := lookupSolute(field, "NaCl")
	if e != nil {
		return 0, false, e
	}
	return r.bNaClLMH * s.Diffusivity.D0M2PerS / nacl.Diffusivity.D0M2PerS, true, nil
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
	s, e := lookupSolute(prefix+".solute", c.Solute)
	if e != nil {
		return nil, e
	}
	v, u, e := parseConcentration(prefix, c.Concentration, c.Unit)
	if e != nil {
		return nil, e
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
	mem, e := resolveMembrane(req.Membrane)
	if e != nil {
		return nil, e
	}
	orient := transport.ALFS
	if req.Orientation != "" {
		o, err := transport.ParseOrientation(req.Orientation)
		if err != nil {
			return nil, Invalid("orientation", []string{"AL-FS", "AL-DS"}, "unknown orientation %q", req.Orientation)
		}
		orient = o
	}
	model := strings.ToLower(req.OsmoticModel)
	switch model {
	case "", "real":
		model = "real"
	case "van-t-hoff", "vant-hoff", "van't-hoff", "ideal":
		model = "van-t-hoff"
	default:
		return nil, Invalid("osmotic_model", []string{"real", "van-t-hoff"}, "unknown osmotic model %q", req.OsmoticModel)
	}
	tK, e := parseTemperature("temperature_c", req.TemperatureC)
	if e != nil {
		return nil, e
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
	deltaP := 0.0
	if req.DeltaPBar != nil {
		deltaP = *req.DeltaPBar
		if !(math.Abs(deltaP) <= 1000) {
			return nil, Invalid("delta_p_bar", "−1000–1000 bar", "delta_p_bar = %g is outside ±1000 bar", deltaP)
		}
	}
	resp := &FluxResponse{Orientation: orient.String(), OsmoticModel: model, TemperatureC: tK - thermo.ZeroCelsiusK,
		DeltaPBar: deltaP, EngineVersion: EngineVersion, Warnings: []string{}}
	resp.Warnings = append(resp.Warnings, draw.state.Warnings...)
	if feed.sol != draw.sol {
		resp.Warnings = append(resp.Warnings, feed.state.Warnings...)
	}

	// Diffusivities: the library's concentration- and temperature-dependent
	// D at the bulk concentration, or the override.
	dDraw := draw.x.DiffusivityM2PerS(draw.m)
	if req.DiffusivityM2PerS != nil {
		d := *req.DiffusivityM2PerS
		if !(d >= 1e-12 && d <= 1e-7) {
			return nil, Invalid("diffusivity_m2_per_s", "1e-12–1e-7 m²/s", "diffusivity_m2_per_s = %g is outside 1e-12–1e-7", d)
		}
		dDraw = d
	}
	bDraw, bDrawEst, e := mem.bFor("membrane.b_lmh", draw.sol, mem.bDrawLMH)
	if e != nil {
		return nil, e
	}
	resp.Membrane = MembraneReport{ALMHPerBar: mem.aLMHBar, BLMH: bDraw, SUM: mem.sUM}
	if mem.rec != nil {
		resp.Membrane.Preset = mem.rec.ID
	}
	if bDrawEst {
		resp.Membrane.BRule = library.BEstimateRule
		resp.Warnings = append(resp.Warnings, fmt.Sprintf("B for %s is an estimate (%.3g LMH) scaled from the NaCl value by diffusivity", draw.sol.ID, bDraw))
	}

	// Mass transfer on each side.
	extCP := req.ExternalCP == nil || *req.ExternalCP
	kDraw, repD, e := massTransfer("k_draw_m_per_s", req.KDrawMPerS, req.Channel, extCP, draw, dDraw, false)
	if e != nil {
		return nil, e
	}
	dFeed := feed.x.DiffusivityM2PerS(feed.m)
	if feed.sol == draw.sol && req.DiffusivityM2PerS != nil {
		dFeed = dDraw
	}
	kFeed, repF, e := massTransfer("k_feed_m_per_s", req.KFeedMPerS, req.Channel, extCP, feed, dFeed, true)
	if e != nil {
		return nil, e
	}
	resp.KDraw, resp.KFeed = repD, repF
	for _, r := range []MassTransferReport{repD, repF} {
		if strings.Contains(r.Regime, "borderline") {
			resp.Warnings = append(resp.Warnings, fmt.Sprintf("channel flow at Re = %.0f is between laminar and turbulent; the laminar correlation is used", r.Reynolds))
		}
	}

	piFor := func(sd *side) transport.OsmoticFunc {
		if model == "van-t-hoff" {
			return vantHoffFunc(sd.x.Nu(), tK)
		}
		return sd.x.OsmoticFunc
	}
	in := transport.Input{
		AMPerSPa: mem.aLMHBar * thermo.MPerSPaPerLMHPerBar, SM: mem.sUM * 1e-6, Orientation: orient,
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
		resp.Warnings = append(resp.Warnings, "b_feed_lmh is not used: the feed holds no solute other than the draw's")
	}
	if sameSolute {
		species[0].FeedBulkMolPerM3 = feed.cSI
	} else if feed.cSI > 0 {
		bFeed, bFeedEst, e = mem.bFor("b_feed_lmh", feed.sol, req.BFeedLMH)
		if e != nil {
			return nil, e
		}
		if req.BFeedLMH != nil && !(*req.BFeedLMH >= 0 && *req.BFeedLMH <= 100) {
			return nil, Invalid("b_feed_lmh", "0–100 LMH", "b_feed_lmh = %g is outside 0–100", *req.BFeedLMH)
		}
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
	resp.Warnings = append(resp.Warnings, fluxWarnings(resp, draw, feed, res, orient)...)
	resp.Sources = append(resp.Sources, fluxSources...)
	if model == "real" {
		resp.Sources = append(resp.Sources, modelSources[draw.sol.Osmotic.Kind]...)
	}
	resp.Sources = append(resp.Sources, soluteSources(draw.sol)...)
	if mem.rec != nil {
		for k, v := range mem.rec.Sources {
			resp.Sources = append(resp.Sources, Source{Field: "membrane." + mem.rec.ID + "." + k, Reference: v})
		}
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
func fluxWarnings(resp *FluxResponse, draw, feed *side, res transport.Result, o transport.Orientation) []string {
	var w []string
	if res.JwMPerS < 0 {
		w = append(w, "water flows from draw to feed (reverse flow): the hydraulic pressure or the feed's osmotic pressure exceeds what the draw provides at the membrane")
	}
	// Interface concentrations past solubility: draw solute at the faces.
	check := func(x *thermo.Solution, id string, cSI float64, where string) {
		m, ok := x.MolalityFromMolarity(cSI)
		if !ok || m > x.SolubilityMolPerKg() {
			w = append(w, fmt.Sprintf("%s at the %s (%.3g mol/L) exceeds its solubility: precipitation or scaling is possible", id, where, cSI/1000))
		} else if m > x.ValidMolPerKg() {
			w = append(w, fmt.Sprintf("%s at the %s (%.3g mol/kg) is above the osmotic model's data limit; π there is extrapolated", id, where, m))
		}
	}
	sp := res.Species[0]
	check(draw.x, draw.sol.ID, sp.FeedFaceMolPerM3, "feed-side face of the active layer")
	check(draw.x, draw.sol.ID, sp.DrawFaceMolPerM3, "draw-side face of the active layer")
	if len(res.Species) == 2 {
		check(feed.x, feed.sol.ID, res.Species[1].FeedFaceMolPerM3, "feed-side face of the active layer")
	}
	if resp.PowerDensityWPerM2 != nil && res.JwMPerS < 0 {
		w = append(w, "ΔP exceeds the osmotic pressure difference across the membrane: no PRO power is produced")
	}
	_ = o
	return w
}

// massTransfer resolves k for one side: given, from the channel, or none.
func massTransfer(field string, given *float64, ch *ChannelSpec, extCP bool, sd *side, d float64, feedSide bool) (float64, MassTransferReport, *Error) {
	if !extCP {
		return math.Inf(1), MassTransferReport{Origin: "none"}, nil
	}
	if given != nil {
		k := *given
		if !(k >= 1e-8 && k <= 1) {
			return 0, MassTransferReport{}, Invalid(field, "1e-8–1 m/s", "%s = %g is outside 1e-8–1 m/s", field, k)
		}
		return k, MassTransferReport{KMPerS: k, Origin: "given"}, nil
	}
	c := DefaultChannel
	if ch != nil {
		c = *ch
	}
	u := c.CrossflowVelocityMPerS
	if feedSide && c.FeedCrossflowVelocityMPS != nil {
		u = *c.FeedCrossflowVelocityMPS
	}
	if e := c.validate(); e != nil {
		return 0, MassTransferReport{}, e
	}
	mt, err := transport.MassTransferCoefficient(transport.Channel{
		HeightM: c.HeightMM * 1e-3, WidthM: c.WidthMM * 1e-3, LengthM: c.LengthMM * 1e-3,
		VelocityMPerS: u, Spacer: c.Spacer,
	}, transport.Fluid{DensityKgPerM3: sd.state.DensityKgPerM3, ViscosityPaS: sd.state.ViscosityPaS, DiffusivityM2PerS: d})
	if err != nil {
		// The channel was validated above, so only the solution's own
		// properties can be refused here: an engine fault, not user input.
		return 0, MassTransferReport{}, &Error{Message: "internal error", Kind: KindInternal, detail: "mass transfer: " + err.Error()}
	}
	return mt.KMPerS, MassTransferReport{KMPerS: mt.KMPerS, Origin: "correlation", Correlation: mt.Correlation,
		Regime: mt.Regime, Reynolds: mt.Re, Schmidt: mt.Sc, Sherwood: mt.Sh}, nil
}
