package api

import (
	"context"
	"slices"

	"drawsift/engine/errs"
	"drawsift/engine/limits"
	"drawsift/engine/module"
	"drawsift/engine/regen"
	"drawsift/engine/scenario"
	"drawsift/engine/species"
	"drawsift/engine/thermo"
	"drawsift/engine/warn"
)

// ModuleStream is a module's inlet stream: a concentration as in a flux
// request and its inflow.
type ModuleStream struct {
	scenario.Concentration
	FlowLPerH *float64 `json:"flow_l_per_h"`
}

// ModuleTarget is a design target: one of a recovery and a permeate flow.
type ModuleTarget struct {
	Recovery      *float64 `json:"recovery,omitempty"`
	PermeateLPerH *float64 `json:"permeate_l_per_h,omitempty"`
}

// ModuleRequest is the contract's module request: the flux request's
// membrane, orientation, temperature, model and mass transfer, the two
// streams with their flows, the flow arrangement, and either an area
// (rating) or a target (design).
type ModuleRequest struct {
	Membrane           *MembraneSpec `json:"membrane"`
	Orientation        string        `json:"orientation"`
	Draw               *ModuleStream `json:"draw"`
	Feed               *ModuleStream `json:"feed"`
	TemperatureC       *float64      `json:"temperature_c,omitempty"`
	KDrawMPerS         *float64      `json:"k_draw_m_per_s,omitempty"`
	KFeedMPerS         *float64      `json:"k_feed_m_per_s,omitempty"`
	Channel            *ChannelSpec  `json:"channel,omitempty"`
	ExternalCP         *bool         `json:"external_cp,omitempty"`
	DiffusivityM2PerS  *float64      `json:"diffusivity_m2_per_s,omitempty"`
	BFeedLMH           *float64      `json:"b_feed_lmh,omitempty"`
	OsmoticModel       string        `json:"osmotic_model,omitempty"`
	DeltaPBar          *float64      `json:"delta_p_bar,omitempty"`
	AllowExtrapolation bool          `json:"allow_extrapolation,omitempty"`

	// Flow is "counter" (default) or "co".
	Flow   string        `json:"flow,omitempty"`
	AreaM2 *float64      `json:"area_m2,omitempty"`
	Target *ModuleTarget `json:"target,omitempty"`
	// Pressure lost by each channel per m² of membrane along its flow.
	DrawPressureDropBarPerM2 *float64 `json:"draw_pressure_drop_bar_per_m2,omitempty"`
	FeedPressureDropBarPerM2 *float64 `json:"feed_pressure_drop_bar_per_m2,omitempty"`
	ProfilePoints            *float64 `json:"profile_points,omitempty"`
	Tolerance                *float64 `json:"tolerance,omitempty"`
	// Regeneration chooses the routes for re-concentrating the leaving
	// draw and changes their parameters (regen.Spec; defaults in limits).
	Regeneration *regen.Spec `json:"regeneration,omitempty"`
}

// ModuleSpecies is one species' concentration in a stream.
type ModuleSpecies struct {
	Species string  `json:"species"`
	MolPerL float64 `json:"mol_per_l"`
}

// ModuleStreamReport is a stream at an end of the module.
type ModuleStreamReport struct {
	FlowLPerH float64 `json:"flow_l_per_h"`
	// ConcentrationMolPerL is the stream's own solute in its formula
	// units (the least over its species of concentration per unit).
	ConcentrationMolPerL float64         `json:"concentration_mol_per_l"`
	OsmoticPressureBar   float64         `json:"osmotic_pressure_bar"`
	Species              []ModuleSpecies `json:"species"`
}

// ModuleExchange is one species' net transfer into the draw over the
// module (negative: into the feed).
type ModuleExchange struct {
	Species     string  `json:"species"`
	Role        string  `json:"role"`
	ToDrawMolPH float64 `json:"to_draw_mol_per_h"`
	ToDrawGPerH float64 `json:"to_draw_g_per_h"`
}

// ModuleSpeciesProfile is one species along the area.
type ModuleSpeciesProfile struct {
	Species     string    `json:"species"`
	DrawMolPerL []float64 `json:"draw_mol_per_l"`
	FeedMolPerL []float64 `json:"feed_mol_per_l"`
}

// ModuleProfiles are arrays along the area (the same length each), from
// the feed inlet (area 0) to the feed outlet.
type ModuleProfiles struct {
	AreaM2                   []float64              `json:"area_m2"`
	DrawFlowLPerH            []float64              `json:"draw_flow_l_per_h"`
	FeedFlowLPerH            []float64              `json:"feed_flow_l_per_h"`
	DrawConcentrationMolPerL []float64              `json:"draw_concentration_mol_per_l"`
	FeedConcentrationMolPerL []float64              `json:"feed_concentration_mol_per_l"`
	DrawOsmoticPressureBar   []float64              `json:"draw_osmotic_pressure_bar"`
	FeedOsmoticPressureBar   []float64              `json:"feed_osmotic_pressure_bar"`
	WaterFluxLMH             []float64              `json:"water_flux_lmh"`
	DeltaPBar                []float64              `json:"delta_p_bar"`
	Species                  []ModuleSpeciesProfile `json:"species"`
}

// ModuleSolverReport is the module solver's statistics.
type ModuleSolverReport struct {
	Method           string  `json:"method"`
	Tolerance        float64 `json:"tolerance"`
	Integrations     int     `json:"integrations"`
	Steps            int     `json:"steps"`
	RejectedSteps    int     `json:"rejected_steps"`
	FluxSolves       int     `json:"flux_solves"`
	NewtonIterations int     `json:"newton_iterations"`
	BoundaryResidual float64 `json:"boundary_residual"`
	DesignIterations int     `json:"design_iterations,omitempty"`
	WaterBalance     float64 `json:"water_balance"`
	SpeciesBalance   float64 `json:"species_balance"`
}

// ModuleResponse is the contract's module response.
type ModuleResponse struct {
	Mode                string  `json:"mode"` // "rating" or "design"
	Flow                string  `json:"flow"`
	Orientation         string  `json:"orientation"`
	OsmoticModel        string  `json:"osmotic_model"`
	TemperatureC        float64 `json:"temperature_c"`
	AreaM2              float64 `json:"area_m2"`
	PermeateLPerH       float64 `json:"permeate_l_per_h"`
	Recovery            float64 `json:"recovery"`
	AverageWaterFluxLMH float64 `json:"average_water_flux_lmh"`
	// RecoveryCap: osmotic equilibrium with no solute crossing, at the
	// inlet ΔP; RecoveryCapPinch names where it pinches.
	RecoveryCap      float64            `json:"recovery_cap"`
	RecoveryCapPinch string             `json:"recovery_cap_pinch"`
	DrawIn           ModuleStreamReport `json:"draw_in"`
	FeedIn           ModuleStreamReport `json:"feed_in"`
	DrawOut          ModuleStreamReport `json:"draw_out"`
	FeedOut          ModuleStreamReport `json:"feed_out"`
	// ReverseSoluteMolPerH: the draw solute lost net to the feed, in its
	// formula units (as the flux's net reverse solute flux, summed over
	// the area); the g/h figure and per litre of permeate beside it.
	ReverseSoluteMolPerH  float64          `json:"reverse_solute_mol_per_h"`
	ReverseSoluteGPerH    float64          `json:"reverse_solute_g_per_h"`
	DrawLossGPerLPermeate float64          `json:"draw_loss_g_per_l_permeate"`
	ForwardSoluteGPerH    float64          `json:"forward_solute_g_per_h"`
	Exchange              []ModuleExchange `json:"exchange"`
	Profiles              ModuleProfiles   `json:"profiles"`
	// RegenerationMinimum is the thermodynamic floor of re-concentrating
	// the leaving draw to its inlet concentration; Regeneration is each
	// route's estimate for the same duty, per m³ of product water, and
	// RegenerationBest the feasible route of least equivalent work (direct
	// use only when the request names it). DrawMakeUpGPerM3 is the draw
	// to replace per m³ of product: the formula units that restore the
	// draw's most depleted species after the module (a shared ion the
	// draw gained from the feed needs none, and draw_loss_g_per_l_permeate,
	// a net mass, can then be below it or negative) plus that route's
	// loss. All are omitted when the draw did not dilute.
	RegenerationMinimum *regen.Minimum     `json:"regeneration_minimum,omitempty"`
	Regeneration        []regen.Result     `json:"regeneration,omitempty"`
	RegenerationBest    string             `json:"regeneration_best,omitempty"`
	DrawMakeUpGPerM3    *float64           `json:"draw_make_up_g_per_m3,omitempty"`
	Membrane            MembraneReport     `json:"membrane"`
	KDraw               MassTransferReport `json:"k_draw"`
	KFeed               MassTransferReport `json:"k_feed"`
	Solver              ModuleSolverReport `json:"solver"`
	Warnings            []string           `json:"warnings"`
	Sources             []Source           `json:"sources"`
	Cautions            []string           `json:"cautions"`
	EngineVersion       string             `json:"engine_version"`
}

var moduleSources = []Source{
	{Field: "module", Reference: "steady one-dimensional plug flow on both sides of the membrane, water and every species balanced (Gu, Kim, Hsu & Hsu 2011, Desalination 276:1; Xiao et al. 2011, J. Membr. Sci. 366:314); local fluxes from the flux model; k, D and T held at the inlet values"},
	{Field: "module.integrator", Reference: "Dormand & Prince (1980) J. Comput. Appl. Math. 6:19, step control after Hairer, Nørsett & Wanner (1993) Solving Ordinary Differential Equations I, §II.4"},
	{Field: "module.counter_current", Reference: "shooting on the draw's outlet state: Brent (1973) on the permeate, then Newton's method with a finite-difference Jacobian on a frozen step sequence (Keller 1968, Numerical Methods for Two-Point Boundary-Value Problems)"},
}

// moduleResolved is a module request resolved onto the engine.
type moduleResolved struct {
	flux    *scenario.Flux
	problem *module.Problem
	target  *module.Target
	area    float64
	regen   regen.Params
}

// resolveModule checks a module request and builds its problem.
func resolveModule(req *ModuleRequest) (*moduleResolved, error) {
	if req.Draw == nil {
		return nil, errs.InvalidText("draw", "", "a draw stream", "a draw is required: {\"solute\", \"concentration\", \"unit\", \"flow_l_per_h\"}")
	}
	if req.Feed == nil {
		return nil, errs.InvalidText("feed", "", "a feed stream", "a feed is required: {\"flow_l_per_h\"} with a solute, a preset or a mixture (none: deionised water)")
	}
	qd, err := limits.ModuleDrawFlow.Required(req.Draw.FlowLPerH)
	if err != nil {
		return nil, err
	}
	qf, err := limits.ModuleFeedFlow.Required(req.Feed.FlowLPerH)
	if err != nil {
		return nil, err
	}
	flow, err := module.ParseFlow("flow", req.Flow)
	if err != nil {
		return nil, err
	}
	out := &moduleResolved{}
	if out.regen, err = req.Regeneration.Resolve("regeneration."); err != nil {
		return nil, err
	}
	switch {
	case req.AreaM2 != nil && req.Target != nil:
		return nil, errs.InvalidText("target", "", "either area_m2 or target", "give area_m2 (rating) or target (design), not both")
	case req.AreaM2 != nil:
		if err := limits.ModuleArea.Check(*req.AreaM2); err != nil {
			return nil, err
		}
		out.area = *req.AreaM2
	case req.Target != nil:
		t := req.Target
		switch {
		case t.Recovery != nil && t.PermeateLPerH != nil:
			return nil, errs.InvalidText("target", "", "one of recovery or permeate_l_per_h", "give one design target: recovery or permeate_l_per_h")
		case t.Recovery != nil:
			if err := limits.ModuleRecovery.Check(*t.Recovery); err != nil {
				return nil, err
			}
			out.target = &module.Target{Recovery: *t.Recovery}
		case t.PermeateLPerH != nil:
			if err := limits.ModulePermeate.Check(*t.PermeateLPerH); err != nil {
				return nil, err
			}
			out.target = &module.Target{PermeateM3PerS: *t.PermeateLPerH / lPerHPerM3PerS}
		default:
			return nil, errs.InvalidText("target", "", "one of recovery or permeate_l_per_h", "the target is empty: give recovery or permeate_l_per_h")
		}
	default:
		return nil, errs.InvalidText("area_m2", "", "area_m2 or target", "give area_m2 (rating) or target (design: {\"recovery\"} or {\"permeate_l_per_h\"})")
	}
	dropD, err := limits.ModuleDrawDrop.Or(req.DrawPressureDropBarPerM2)
	if err != nil {
		return nil, err
	}
	dropF, err := limits.ModuleFeedDrop.Or(req.FeedPressureDropBarPerM2)
	if err != nil {
		return nil, err
	}
	points, err := limits.ModulePoints.Or(req.ProfilePoints)
	if err != nil {
		return nil, err
	}
	tol, err := limits.ModuleTolerance.Or(req.Tolerance)
	if err != nil {
		return nil, err
	}
	spec := &scenario.FluxSpec{Membrane: req.Membrane, Orientation: req.Orientation, Draw: &req.Draw.Concentration,
		TemperatureC: req.TemperatureC, KDrawMPerS: req.KDrawMPerS, KFeedMPerS: req.KFeedMPerS, Channel: req.Channel, ExternalCP: req.ExternalCP,
		DiffusivityM2PerS: req.DiffusivityM2PerS, BFeedLMH: req.BFeedLMH, OsmoticModel: req.OsmoticModel, DeltaPBar: req.DeltaPBar,
		AllowExtrapolation: req.AllowExtrapolation}
	if c := req.Feed.Concentration; c.Solute != "" || c.Preset != "" || c.Mixture != nil || c.Blend != nil || c.Concentration != nil || c.Unit != "" {
		spec.Feed = &req.Feed.Concentration
	}
	f, err := scenario.ResolveFlux(spec)
	if err != nil {
		return nil, err
	}
	out.flux = f
	out.problem = &module.Problem{Input: f.Input, Layout: f.Layout, Flow: flow,
		DrawInM3PerS: qd / lPerHPerM3PerS, FeedInM3PerS: qf / lPerHPerM3PerS,
		DeltaPPa: f.DeltaPBar * thermo.PascalPerBar, DrawDropPaPerM2: dropD * thermo.PascalPerBar, FeedDropPaPerM2: dropF * thermo.PascalPerBar,
		Tol: tol, Points: int(points)}
	return out, nil
}

// lPerHPerM3PerS converts m³/s to L/h.
const lPerHPerM3PerS = 3.6e6

// Module rates a module of a given area, or designs one for a target.
func Module(ctx context.Context, req *ModuleRequest) (*ModuleResponse, *Error) {
	mr, err := resolveModule(req)
	if err != nil {
		return nil, fromEngine("", err)
	}
	mr.problem.Stop = ctx.Err
	var res *module.Result
	mode := "rating"
	if mr.target != nil {
		mode = "design"
		res, err = module.Design(mr.problem, *mr.target)
	} else {
		res, err = module.Solve(mr.problem, mr.area)
	}
	if err != nil {
		return nil, fromEngine("", err)
	}
	resp := moduleResponse(mr, res)
	resp.Mode = mode
	if !finite(resp.PermeateLPerH, resp.Recovery, resp.AverageWaterFluxLMH, resp.RecoveryCap, resp.ReverseSoluteMolPerH) {
		return nil, &Error{Message: "internal error: non-finite module result", Kind: KindInternal}
	}
	return resp, nil
}

// moduleResponse reports a solved module.
func moduleResponse(mr *moduleResolved, res *module.Result) *ModuleResponse {
	f, lay := mr.flux, mr.flux.Layout
	resp := &ModuleResponse{Flow: res.Flow.String(), Orientation: f.Input.Orientation.String(), OsmoticModel: f.Model.String(),
		TemperatureC: f.TemperatureK - thermo.ZeroCelsiusK, AreaM2: res.AreaM2,
		PermeateLPerH: res.PermeateM3PerS * lPerHPerM3PerS, Recovery: res.Recovery,
		RecoveryCap: res.RecoveryCap, RecoveryCapPinch: res.CapPinch,
		Cautions: ScreenCautions, EngineVersion: EngineVersion}
	resp.AverageWaterFluxLMH = res.PermeateM3PerS / res.AreaM2 / thermo.MPerSPerLMH
	feedIn := mr.problem.Input.Species
	drawUnit := func(c []float64) float64 { // mol/m³ per formula unit of the draw solute
		best := -1.0
		for i, in := range lay.Info {
			if in.DrawPerUnit > 0 {
				if v := c[i] / in.DrawPerUnit; best < 0 || v < best {
					best = v
				}
			}
		}
		return max(best, 0)
	}
	feedUnit := func(c []float64) float64 {
		if !(f.Feed.CSI > 0) {
			return 0
		}
		best := -1.0
		for i := range feedIn {
			if c0 := feedIn[i].FeedBulkMolPerM3; c0 > 0 {
				if v := c[i] / c0; best < 0 || v < best {
					best = v
				}
			}
		}
		return max(best, 0) * f.Feed.CSI
	}
	stream := func(s module.Stream, unit func([]float64) float64) ModuleStreamReport {
		r := ModuleStreamReport{FlowLPerH: s.M3PerS * lPerHPerM3PerS, ConcentrationMolPerL: unit(s.MolPerM3) / 1000, OsmoticPressureBar: s.PiPa / thermo.PascalPerBar}
		for i, in := range lay.Info {
			r.Species = append(r.Species, ModuleSpecies{Species: in.Name, MolPerL: s.MolPerM3[i] / 1000})
		}
		return r
	}
	resp.DrawIn, resp.DrawOut = stream(res.DrawIn, drawUnit), stream(res.DrawOut, drawUnit)
	resp.FeedIn, resp.FeedOut = stream(res.FeedIn, feedUnit), stream(res.FeedOut, feedUnit)

	// Exchange: the draw's species lost net (as species.LossesAt, summed
	// over the area), the feed's own gained.
	// makeUp: formula units of draw solute that restore its most depleted
	// species (a species the draw gained needs none).
	var lostKg, fwdKg, makeUp float64
	for i, in := range lay.Info {
		d := res.ToDrawMolPerS[i]
		resp.Exchange = append(resp.Exchange, ModuleExchange{Species: in.Name, Role: in.Role,
			ToDrawMolPH: d * 3600, ToDrawGPerH: d * in.MolarMassKgPerMol * 3.6e6})
		if in.DrawPerUnit > 0 {
			lostKg -= d * in.MolarMassKgPerMol
			makeUp = max(makeUp, -d/in.DrawPerUnit)
		} else if d > 0 {
			fwdKg += d * in.MolarMassKgPerMol
		}
	}
	resp.ReverseSoluteGPerH = lostKg * 3.6e6
	if mm := f.Draw.X.MolarMassKgPerMol(); mm > 0 {
		resp.ReverseSoluteMolPerH = lostKg / mm * 3600
	}
	resp.ForwardSoluteGPerH = fwdKg * 3.6e6
	if res.PermeateM3PerS > 0 {
		resp.DrawLossGPerLPermeate = lostKg / res.PermeateM3PerS // kg/m³ = g/L
	}

	var regenWarnings []warn.Warning
	if rep := regeneration(f, resp.DrawOut.ConcentrationMolPerL, resp.DrawIn.ConcentrationMolPerL, mr.regen); rep != nil {
		resp.Regeneration, regenWarnings = rep.Routes, rep.Warnings
		if len(rep.Routes) > 0 {
			resp.RegenerationMinimum = &rep.Minimum
			best := rep.Best(slices.Contains(mr.regen.Routes, regen.DirectUse))
			if best != nil && res.PermeateM3PerS > 0 {
				resp.RegenerationBest = best.Route
				// g per m³ of permeate: mol/s × kg/mol ÷ m³/s × 1000.
				resp.DrawMakeUpGPerM3 = ptr(makeUp*f.Draw.X.MolarMassKgPerMol()/res.PermeateM3PerS*1000 + best.DrawLossGPerM3)
			} else {
				regenWarnings = append(regenWarnings, warn.New(warn.Regeneration, "regeneration", "regeneration: no route evaluated can re-concentrate this draw at this duty (see each route's reason)"))
			}
		}
	}

	pr := &resp.Profiles
	for i := range lay.Info {
		pr.Species = append(pr.Species, ModuleSpeciesProfile{Species: lay.Info[i].Name})
	}
	var reverse bool
	for _, p := range res.Profiles {
		pr.AreaM2 = append(pr.AreaM2, p.AreaM2)
		pr.DrawFlowLPerH = append(pr.DrawFlowLPerH, p.DrawM3PerS*lPerHPerM3PerS)
		pr.FeedFlowLPerH = append(pr.FeedFlowLPerH, p.FeedM3PerS*lPerHPerM3PerS)
		pr.DrawConcentrationMolPerL = append(pr.DrawConcentrationMolPerL, drawUnit(p.DrawMolPerM3)/1000)
		pr.FeedConcentrationMolPerL = append(pr.FeedConcentrationMolPerL, feedUnit(p.FeedMolPerM3)/1000)
		pr.DrawOsmoticPressureBar = append(pr.DrawOsmoticPressureBar, p.DrawPiPa/thermo.PascalPerBar)
		pr.FeedOsmoticPressureBar = append(pr.FeedOsmoticPressureBar, p.FeedPiPa/thermo.PascalPerBar)
		pr.WaterFluxLMH = append(pr.WaterFluxLMH, p.WaterFluxMPerS/thermo.MPerSPerLMH)
		pr.DeltaPBar = append(pr.DeltaPBar, p.DeltaPPa/thermo.PascalPerBar)
		for i := range pr.Species {
			pr.Species[i].DrawMolPerL = append(pr.Species[i].DrawMolPerL, p.DrawMolPerM3[i]/1000)
			pr.Species[i].FeedMolPerL = append(pr.Species[i].FeedMolPerL, p.FeedMolPerM3[i]/1000)
		}
		reverse = reverse || p.WaterFluxMPerS < 0
	}

	resp.Membrane = membraneReport(f)
	resp.KDraw, resp.KFeed = kReport(f.KDraw), kReport(f.KFeed)
	st := res.Stats
	resp.Solver = ModuleSolverReport{Method: st.Method, Tolerance: mr.problem.Tol, Integrations: st.Integrations, Steps: st.Steps, RejectedSteps: st.Rejected,
		FluxSolves: st.FluxSolves, NewtonIterations: st.NewtonIterations, BoundaryResidual: st.BoundaryResidual, DesignIterations: st.DesignIterations,
		WaterBalance: res.WaterBalance, SpeciesBalance: res.SpeciesBalance}

	w := append(append([]warn.Warning(nil), f.Warnings...), regenWarnings...)
	if reverse {
		w = append(w, warn.New(warn.ReverseFlow, "module", "water flows back from the draw to the feed over part of the area: past that point the module loses permeate (a smaller area, or a stronger draw, would do better)"))
	}
	if res.Recovery > 0.95*res.RecoveryCap {
		w = append(w, warn.New(warn.ModelNote, "recovery", "the recovery (%.3g) is within 5 %% of the osmotic-equilibrium cap (%.3g): the module works near a pinch, where the area needed grows steeply", res.Recovery, res.RecoveryCap))
	}
	if lay != nil && hasFeedIons(lay) && res.Recovery > 0 {
		w = append(w, warn.New(warn.FeedToDraw, "draw_out", "the draw leaves holding the feed's own species (see exchange): a closed draw loop accumulates them unless regeneration rejects them"))
	}
	resp.Warnings = warn.Strings(w)
	resp.Sources = fluxSourcesFor(f, append(resp.Sources, moduleSources...))
	return resp
}

// regeneration evaluates re-concentrating the draw solute from cOut back
// to cIn (mol/L, its own formula units: the feed species the draw gained
// are left out), or nil when the draw did not dilute.
func regeneration(f *scenario.Flux, cOut, cIn float64, p regen.Params) *regen.Report {
	x := f.Draw.X
	mOut, ok1 := x.MolalityFromMolarity(cOut * 1000)
	mIn, ok2 := x.MolalityFromMolarity(cIn * 1000)
	if !ok1 || !ok2 || !(mOut > 0 && mOut < mIn) {
		return nil
	}
	d := regen.Duty{Solution: x, Record: f.Draw.Solute, DilutedMolPerKg: mOut, ConcentratedMolPerKg: mIn, TempK: f.TemperatureK}
	if f.Model == scenario.VantHoff {
		d.Pi = func(m float64) float64 { return x.VantHoffPa(x.MolarityMolPerM3(m)) }
	}
	rep, err := regen.Evaluate(d, p)
	if err != nil {
		rep.Warnings = []warn.Warning{warn.New(warn.Regeneration, "regeneration", "regeneration: not estimated (%v)", err)}
		return &rep
	}
	return &rep
}

// hasFeedIons reports whether the feed holds species the draw does not.
func hasFeedIons(lay *species.Transport) bool {
	for _, in := range lay.Info {
		if in.Role == species.RoleFeed {
			return true
		}
	}
	return false
}
