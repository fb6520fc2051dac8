package scenario

import (
	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/species"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
)

// Concentration is how a concentration travels: a solute, a value and a
// unit, or a mixture of parts each at its own concentration (the
// contract's JSON names; engine/api re-exports the type).
type Concentration struct {
	Solute        string        `json:"solute,omitempty"`
	Concentration *float64      `json:"concentration,omitempty"`
	Unit          string        `json:"unit,omitempty"`
	Mixture       []MixturePart `json:"mixture,omitempty"`
	// Blend takes the solute's place: parts at fixed mole or mass
	// fractions, at the total concentration given (ID names it; omitted,
	// the parts and fractions do).
	ID    string      `json:"id,omitempty"`
	Blend []BlendPart `json:"blend,omitempty"`
	// Preset names a feed preset (a flux feed only), with an optional
	// concentration in the preset's own unit — as a screen's feed takes it.
	Preset string `json:"preset,omitempty"`
}

// FluxSpec is a flux request as the contract gives it (engine/api
// re-exports it as FluxRequest).
type FluxSpec struct {
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
	// AllowExtrapolation computes a draw or feed past its osmotic model's
	// data (flagged), as the scenario's switch of the same name keeps such
	// candidates; default false: refused with the limit (CheckDataRange).
	AllowExtrapolation bool `json:"allow_extrapolation,omitempty"`
}

// CheckDataRange refuses molality m of solution x when it lies past the
// osmotic model's data limit and past any bridge to a measured saturated
// solution (thermo.Solution.CheckSupported), unless allow is set: the
// error names prefix's concentration field and gives the limit in unit u.
// The osmotic and flux requests call it for their bulk concentrations.
func CheckDataRange(prefix string, x *thermo.Solution, m float64, u thermo.Unit, allow bool) error {
	if allow {
		return nil
	}
	return prefixed(prefix, x.CheckSupported(m, u))
}

// Side is one prepared stream: its solute, its solution at the
// temperature and its bulk state.
type Side struct {
	Solute *library.Solute
	X      *thermo.Solution
	M      float64 // molality, mol/kg
	CSI    float64 // molarity, mol/m³
	State  thermo.State
	Unit   thermo.Unit // the request's unit
	// Whole: the solute stands in for a feed's ions (equivalent NaCl) and
	// crosses as one species.
	Whole bool
}

// PrepareSide checks one stream's solute and concentration (fields under
// prefix) and evaluates its bulk state at tK.
func PrepareSide(prefix string, c *Concentration, tK float64) (*Side, error) {
	x, m, u, err := PrepareSolution(prefix, c, tK)
	if err != nil {
		return nil, err
	}
	return sideAt(prefix, x, m, u)
}

// sideAt evaluates a prepared solution's bulk state at molality m.
func sideAt(prefix string, x *thermo.Solution, m float64, u thermo.Unit) (*Side, error) {
	st, err := x.StateAt(m, u)
	if err != nil {
		return nil, prefixed(prefix, err)
	}
	return &Side{Solute: x.Solute, X: x, M: m, CSI: st.MolarityMolPerM3, State: st, Unit: u}, nil
}

// presetFeed reads a feed preset as a flux stream: the solution the
// screen's feed resolution gives it (a library solute at its
// concentration, or its ions as one composition), or nil for pure water.
func presetFeed(c *Concentration, tK float64) (*Side, error) {
	if c.Solute != "" || c.Mixture != nil || c.Blend != nil || c.Unit != "" {
		return nil, invalid("feed.preset", nil, "give either a feed preset (with an optional concentration in its own unit) or a solute, blend or mixture, not both")
	}
	f, _, err := resolveFeed(&FeedSpec{Preset: c.Preset, Concentration: c.Concentration}, tK)
	if err != nil {
		return nil, err
	}
	if f.Solute == nil || !(f.Concentration > 0) {
		return nil, nil
	}
	x, err := thermo.Prepared(f.Solute, tK)
	if err != nil {
		return nil, prefixed("feed", err)
	}
	m, err := x.ToMolality(f.Concentration, f.Unit)
	if err != nil {
		return nil, prefixed("feed", err)
	}
	sd, err := sideAt("feed", x, m, f.Unit)
	if sd != nil {
		sd.Whole = f.Surrogate
	}
	return sd, err
}

// PrepareSolution reads one solution (fields under prefix): a solute at
// a concentration, a blend at a total concentration (ResolveBlend), or a
// mixture of parts each at its own concentration (ResolveMixture).
func PrepareSolution(prefix string, c *Concentration, tK float64) (*thermo.Solution, float64, thermo.Unit, error) {
	if len(c.Mixture) > 0 {
		if c.Solute != "" || c.Concentration != nil || c.Blend != nil {
			return nil, 0, 0, invalid(errs.Join(prefix, "mixture"), nil, "give a solute or a blend with its concentration, or a mixture, not two of them")
		}
		return ResolveMixture(prefix, c.Mixture, tK)
	}
	var s *library.Solute
	var err error
	if c.Blend != nil {
		if c.Solute != "" {
			return nil, 0, 0, invalid(errs.Join(prefix, "blend"), nil, "give either a solute or a blend, not both")
		}
		s, err = ResolveBlend(prefix, &Candidate{ID: c.ID, Blend: c.Blend}, nil)
	} else {
		s, err = LookupSolute(errs.Join(prefix, "solute"), c.Solute)
	}
	if err != nil {
		return nil, 0, 0, err
	}
	v, u, err := ParseConcentration(prefix, c.Concentration, c.Unit)
	if err != nil {
		return nil, 0, 0, err
	}
	x, err := thermo.Prepared(s, tK)
	if err != nil {
		return nil, 0, 0, prefixed(prefix, err)
	}
	m, err := x.ToMolality(v, u)
	if err != nil {
		return nil, 0, 0, prefixed(prefix, err)
	}
	return x, m, u, nil
}

// Fluid is the side's bulk solution as the Sherwood correlations see it,
// with diffusivity d.
func (sd *Side) Fluid(d float64) transport.Fluid {
	return transport.Fluid{DensityKgPerM3: sd.State.DensityKgPerM3, ViscosityPaS: sd.State.ViscosityPaS, DiffusivityM2PerS: d}
}

// Pi is the side's π(c) under the osmotic model: van 't Hoff, or the real
// model's table (thermo.Solution.FastOsmoticFunc, within 1e-8 of the
// model: a mixture's exact π costs a Pitzer evaluation and a density
// inversion, and the flux solve asks for it a few dozen times).
func (sd *Side) Pi(model OsmoticModel, tK float64) transport.OsmoticFunc {
	if model == VantHoff {
		k := sd.X.Nu() * thermo.GasConstant * tK
		return func(c float64) (float64, float64) { return k * c, k }
	}
	return sd.X.FastOsmoticFunc()
}

// Flux is a resolved flux request: the transport problem and what the
// response reports about it.
type Flux struct {
	Input        transport.Input
	Draw, Feed   *Side
	Membrane     *Membrane
	Model        OsmoticModel
	TemperatureK float64
	DeltaPBar    float64
	// SameSolute: the feed holds the draw solute.
	SameSolute bool
	// BDrawMPerS and BFeedMPerS are each solute's B as one unit (the
	// report's b_lmh); the transport moves species with their own B.
	BDrawMPerS, BFeedMPerS         float64
	BDrawEstimated, BFeedEstimated bool
	KDraw, KFeed                   SideK
	// Layout is the species by identity (ions of both streams).
	Layout   *species.Transport
	Warnings []warn.Warning
}

// ResolveFlux checks a flux request and builds its transport problem:
// the membrane (preset and overrides), both streams at temperature, D at
// the bulk concentration (or the override), B per solute, k per side
// (given, from the channel, or none) and π per species under the osmotic
// model. A feed that is omitted is deionised water.
func ResolveFlux(req *FluxSpec) (*Flux, error) {
	mem, err := ResolveMembrane(req.Membrane)
	if err != nil {
		return nil, err
	}
	orient, err := ParseOrientation("orientation", req.Orientation)
	if err != nil {
		return nil, err
	}
	model, err := ParseOsmoticModel(req.OsmoticModel)
	if err != nil {
		return nil, err
	}
	tK, err := TemperatureK("temperature_c", req.TemperatureC)
	if err != nil {
		return nil, err
	}
	if req.Draw == nil {
		return nil, invalid("draw", nil, "a draw solution is required: {\"solute\", \"concentration\", \"unit\"}")
	}
	if req.Draw.Preset != "" {
		return nil, invalid("draw.preset", nil, "presets are feeds; give the draw as a solute, a blend or a mixture")
	}
	draw, err := PrepareSide("draw", req.Draw, tK)
	if err != nil {
		return nil, err
	}
	var feed *Side
	switch {
	case req.Feed != nil && req.Feed.Preset != "":
		feed, err = presetFeed(req.Feed, tK)
		if err == nil && feed == nil {
			feed, err = sideAt("feed", draw.X, 0, thermo.MolPerL)
		}
	case req.Feed == nil:
		// Deionised water: the draw's own solution at zero concentration.
		feed, err = sideAt("feed", draw.X, 0, thermo.MolPerL)
	default:
		feed, err = PrepareSide("feed", req.Feed, tK)
	}
	if err != nil {
		return nil, err
	}
	if model != VantHoff {
		for _, sd := range []struct {
			prefix string
			side   *Side
		}{{"draw", draw}, {"feed", feed}} {
			if err := CheckDataRange(sd.prefix, sd.side.X, sd.side.M, sd.side.Unit, req.AllowExtrapolation); err != nil {
				return nil, err
			}
		}
	}
	deltaP, err := limits.DeltaP.Or(req.DeltaPBar)
	if err != nil {
		return nil, err
	}
	f := &Flux{Draw: draw, Feed: feed, Membrane: mem, Model: model, TemperatureK: tK, DeltaPBar: deltaP,
		SameSolute: feed.Solute == draw.Solute}
	f.Warnings = append(f.Warnings, draw.State.Warnings...)
	if !f.SameSolute {
		f.Warnings = append(f.Warnings, feed.State.Warnings...)
	}
	if w := mem.AtTemperature(tK); w != nil {
		f.Warnings = append(f.Warnings, *w)
	}

	// Diffusivities: the library's concentration- and temperature-dependent
	// D at the bulk concentration, or the override.
	dDraw := draw.X.DiffusivityM2PerS(draw.M)
	if req.DiffusivityM2PerS != nil {
		if err := limits.Diffusivity.Check(*req.DiffusivityM2PerS); err != nil {
			return nil, err
		}
		dDraw = *req.DiffusivityM2PerS
	}
	f.BDrawMPerS, f.BDrawEstimated, err = mem.BFor("membrane.b_lmh", draw.Solute, mem.BGivenMPerS)
	if err != nil {
		return nil, err
	}

	// Mass transfer on each side.
	extCP := req.ExternalCP == nil || *req.ExternalCP
	var ch transport.Channel
	if extCP && (req.KDrawMPerS == nil || req.KFeedMPerS == nil) {
		if ch, err = ResolveChannel(req.Channel); err != nil {
			return nil, err
		}
	}
	dFeed := feed.X.DiffusivityM2PerS(feed.M)
	if f.SameSolute && req.DiffusivityM2PerS != nil {
		dFeed = dDraw
	}
	if f.KDraw, err = ResolveK(&limits.KDraw, req.KDrawMPerS, ch, extCP, false, draw.Fluid(dDraw)); err != nil {
		return nil, err
	}
	if f.KFeed, err = ResolveK(&limits.KFeed, req.KFeedMPerS, ch, extCP, true, feed.Fluid(dFeed)); err != nil {
		return nil, err
	}
	for _, k := range []struct {
		side string
		k    SideK
	}{{"k_draw", f.KDraw}, {"k_feed", f.KFeed}} {
		for _, w := range k.k.MassTransfer.Warnings {
			f.Warnings = append(f.Warnings, w.About(k.side))
		}
	}

	f.Input = transport.Input{
		AMPerSPa: mem.AMPerSPa, SM: mem.SM, Orientation: orient,
		DeltaPPa: deltaP * thermo.PascalPerBar, KDrawMPerS: f.KDraw.KMPerS, KFeedMPerS: f.KFeed.KMPerS,
	}
	// b_feed_lmh is checked even when it is not used (a unit slip is still
	// a slip); unused, it is kept and flagged rather than refused, so the
	// request still answers and says which B applied.
	var feedOver *float64
	if req.BFeedLMH != nil {
		if err := limits.FeedB.Check(*req.BFeedLMH); err != nil {
			return nil, err
		}
		b := *req.BFeedLMH * thermo.MPerSPerLMH
		feedOver = &b
		switch {
		case feed.CSI == 0:
			f.Warnings = append(f.Warnings, warn.New(warn.Unused, "b_feed_lmh", "b_feed_lmh (%g LMH) is not used: the feed holds no solute", *req.BFeedLMH))
		case f.SameSolute:
			f.Warnings = append(f.Warnings, warn.New(warn.Unused, "b_feed_lmh",
				"b_feed_lmh (%g LMH) is not used: the feed solute is the draw solute (%s), which crosses the membrane with the draw's B (%.3g LMH, from %s); to change it, set membrane.b_lmh",
				*req.BFeedLMH, draw.Solute.ID, f.BDrawMPerS/thermo.MPerSPerLMH, map[bool]string{true: "an estimate", false: "the membrane"}[f.BDrawEstimated]))
		}
	}
	if feed.CSI > 0 && !f.SameSolute {
		if f.BFeedMPerS, f.BFeedEstimated, err = mem.BFor("b_feed_lmh", feed.Solute, feedOver); err != nil {
			return nil, err
		}
	}
	f.Layout, err = species.NewTransport(mem.Permeability(),
		species.TransportSide{Solute: draw.Solute, Nu: draw.X.Nu(), BMPerS: mem.BGivenMPerS},
		species.TransportSide{Solute: feed.Solute, Whole: feed.Whole, CMolPerM3: feed.CSI, Nu: feed.X.Nu(), BMPerS: feedOver})
	if err != nil {
		return nil, err
	}
	for _, in := range f.Layout.Info {
		if in.BOrigin.Estimated() {
			f.Warnings = append(f.Warnings, warn.New(warn.BEstimated, in.Name, "B for %s is an estimate (%.3g LMH, hindered diffusion scaled from the NaCl value)",
				in.Name, in.BMPerS/thermo.MPerSPerLMH))
		}
	}
	f.Input.Species = make([]transport.Species, f.Layout.N())
	f.Layout.Fill(f.Input.Species, orient, draw.CSI, dDraw, dFeed, 1, draw.Pi(model, tK), feed.Pi(model, tK))
	f.Input.FacePi = f.Layout.Rule.Pi
	return f, nil
}

// ResultWarnings flags a solved flux problem's results a user should look
// at twice: reverse flow, and interface concentrations past solubility or
// past the osmotic model's data.
func (f *Flux) ResultWarnings(res *transport.Result) []warn.Warning {
	var w []warn.Warning
	if res.JwMPerS < 0 {
		w = append(w, warn.New(warn.ReverseFlow, "", "water flows from draw to feed (reverse flow): the hydraulic pressure or the feed's osmotic pressure exceeds what the draw provides at the membrane"))
	}
	check := func(x *thermo.Solution, id string, cSI float64, where string) {
		m, ok := x.MolalityFromMolarity(cSI)
		if !ok || m > x.SolubilityMolPerKg() {
			w = append(w, warn.New(warn.Solubility, id, "%s at the %s (%.3g mol/L) exceeds its solubility: precipitation or scaling is possible", id, where, cSI/1000))
		} else if m > x.SupportedMolPerKg() {
			w = append(w, warn.New(warn.Extrapolated, id, "%s at the %s (%.3g mol/kg) is above the osmotic model's data limit; π there is extrapolated", id, where, m))
		} else if m > x.ValidMolPerKg() {
			w = append(w, warn.New(warn.Bridged, id, "%s at the %s (%.3g mol/kg) is above the osmotic model's data limit; π there is interpolated to the measured saturated solution", id, where, m))
		}
	}
	check(f.Draw.X, f.Draw.Solute.ID, f.Layout.DrawFeedFace(res), "feed-side face of the active layer")
	check(f.Draw.X, f.Draw.Solute.ID, f.Layout.DrawDrawFace(res), "draw-side face of the active layer")
	loss := f.Layout.LossesAt(&f.Input, res, f.Draw.X.MolarMassKgPerMol())
	w = append(w, transport.CrossingWarnings(&f.Input, res, f.Draw.Solute.ID, loss.NetFormulaMolPerM2S)...)
	if f.DeltaPBar > 0 && res.JwMPerS < 0 {
		w = append(w, warn.New(warn.ReverseFlow, "delta_p_bar", "ΔP exceeds the osmotic pressure difference across the membrane: no PRO power is produced"))
	}
	return w
}
