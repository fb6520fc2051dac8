package fit

import (
	"fmt"
	"math"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/scenario"
	"drawsift/engine/species"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
)

// Parameter indices of the full vector (A in LMH/bar, B in LMH, S in µm).
const (
	PA = iota
	PB
	PS
	nParams
)

// ParamNames are the names the request's parameters list takes.
var ParamNames = [nParams]string{"a", "b", "s"}

// Bounds of each parameter during the fit: the engine's own ranges
// (limits.MembraneA, MembraneB with a positive floor for ln B, MembraneS).
var (
	lowerBound = [nParams]float64{limits.MembraneA.Min, 1e-5, limits.MembraneS.Min}
	upperBound = [nParams]float64{limits.MembraneA.Max, limits.MembraneB.Max, limits.MembraneS.Max}
)

// Identifiability is the warning code of a poorly identified parameter.
const Identifiability warn.Code = "poorly-identified"

// point is one resolved data row: its transport problem (solved again for
// every A, B, S) and its measurements.
type point struct {
	in transport.Input
	// fa carries A from the reference temperature to the row's.
	fa float64
	// lay is the row's species layout (ions by identity); the reverse
	// solute flux is its net loss of the draw's species.
	lay *species.Transport
	// bRatio[j] is species j's B over the fitted B at the row's
	// temperature: the draw's species take the fitted B itself, a species
	// only the feed holds the NaCl B the fitted B implies times its
	// estimate (library.HinderedRule); fixedB[j] when the row fixes it
	// (b_feed_lmh).
	bRatio []float64
	fixedB []bool
	// gPerMol converts the draw solute's mol m⁻² s⁻¹ to gMH.
	gPerMol float64
	// Measured fluxes and their standard uncertainties.
	jw, sdJw float64
	js, sdJs float64
	hasJs    bool
	// Description for identifiability checks.
	orient               transport.Orientation
	drawC, feedC, tK, nu float64
	drawID               string
	res                  transport.Result
}

// Problem is a resolved fit request: the data points, the parameters to
// fit and the fixed ones.
type Problem struct {
	points []point
	// free lists the fitted parameters' indices, in a, b, s order.
	free  []int
	fixed [nParams]float64
	// start holds the request's starting values (0 where not given).
	start        [nParams]float64
	Model        scenario.OsmoticModel
	Confidence   float64
	AbsoluteSD   bool
	RefTempC     float64
	DrawSolute   *library.Solute
	Warnings     []warn.Warning
	Bootstrap    int
	Seed         uint64
	observations int
}

// Observations is the number of measured fluxes.
func (p *Problem) Observations() int { return p.observations }

// Free returns the fitted parameters' names.
func (p *Problem) Free() []string {
	out := make([]string, len(p.free))
	for i, j := range p.free {
		out[i] = ParamNames[j]
	}
	return out
}

// rowErr puts a row's index before an error's field; a row read from
// CSV also names its line.
func rowErr(i int, r *Row, err error) error {
	ie, ok := err.(*errs.InputError)
	if !ok {
		return err
	}
	// Request-level fields every row shares keep their own names.
	for _, shared := range []string{"channel", "osmotic_model", "external_cp", "membrane"} {
		if ie.Field == shared || strings.HasPrefix(ie.Field, shared+".") {
			return err
		}
	}
	c := ie.Prefix(fmt.Sprintf("data[%d]", i))
	if r.line > 0 {
		c.Msg = fmt.Sprintf("CSV line %d: %s", r.line, strings.TrimPrefix(ie.Error(), ie.Field+": "))
	}
	return c
}

// Resolve checks a fit request and resolves every data row once.
func Resolve(spec *Spec) (*Problem, error) {
	rows := spec.Data
	if spec.CSV != "" {
		if len(spec.Data) > 0 {
			return nil, errs.InvalidText("csv", "", nil, "give the measurements either as data rows or as csv text, not both")
		}
		var err error
		if rows, err = ParseCSV(spec.CSV); err != nil {
			return nil, err
		}
	}
	if len(rows) == 0 {
		return nil, errs.InvalidText("data", "", limits.FitRows.Text(), "no measurements: give data rows or csv text")
	}
	if err := limits.FitRows.Check(float64(len(rows))); err != nil {
		return nil, err
	}
	p := &Problem{}
	model, err := scenario.ParseOsmoticModel(spec.OsmoticModel)
	if err != nil {
		return nil, err
	}
	p.Model = model
	if p.Confidence, err = limits.FitConfidence.Or(spec.Confidence); err != nil {
		return nil, err
	}
	if err := p.parameters(spec); err != nil {
		return nil, err
	}

	// Measurement uncertainty.
	me := spec.MeasurementError
	if me == nil {
		me = &MeasurementError{}
	}
	p.AbsoluteSD = me.Absolute
	relW, err := limits.FitRelError.Or(me.WaterFluxRelative)
	if err != nil {
		return nil, err
	}
	relS := limits.FitRelError.Default
	if me.ReverseSoluteFluxRelative != nil {
		relS = *me.ReverseSoluteFluxRelative
		if err := limits.FitRelError.CheckAt("measurement_error.reverse_solute_flux_relative", relS); err != nil {
			return nil, err
		}
	}
	absW, err := limits.FitAbsWaterFlux.Or(me.WaterFluxLMH)
	if err != nil {
		return nil, err
	}
	absS, err := limits.FitAbsReverseFlux.Or(me.ReverseSoluteFluxGMH)
	if err != nil {
		return nil, err
	}

	// The reference temperature of the fitted A and B.
	refC := limits.TemperatureC.Default
	if rows[0].TemperatureC != nil {
		refC = *rows[0].TemperatureC
	}
	if spec.Membrane != nil && spec.Membrane.ReferenceTemperatureC != nil {
		refC = *spec.Membrane.ReferenceTemperatureC
	}
	if err := limits.MembraneRefT.Check(refC); err != nil {
		return nil, err
	}
	p.RefTempC = refC

	// The placeholder membrane every row resolves with: a draw B of 1 LMH
	// gives every draw species the fitted B, and its NaCl B of 1 LMH makes
	// a feed species' B come out as its ratio to NaCl's.
	one, s0, t := 1.0, 500.0, refC
	mem := &scenario.MembraneSpec{ALMHPerBar: &one, BLMH: &one, BNaClLMH: &one, SUM: &s0, ReferenceTemperatureC: &t}
	if m := spec.Membrane; m != nil {
		mem.AActivationKJPerMol, mem.BActivationKJPerMol = m.AActivationKJPerMol, m.BActivationKJPerMol
	}
	base := library.SoluteB{NaCl: 1}
	var refRatio float64
	seen := map[string]bool{}
	tempsDiffer := false
	for i := range rows {
		r := &rows[i]
		pt, ws, err := p.resolveRow(r, mem, spec)
		if err != nil {
			return nil, rowErr(i, r, err)
		}
		if i == 0 {
			p.DrawSolute = ws.draw
			refRatio, _ = base.For(ws.draw)
		} else if ws.draw != p.DrawSolute && !seen["draws"] {
			seen["draws"] = true
			p.Warnings = append(p.Warnings, warn.New(warn.BEstimated, "b_lmh",
				"the fitted B is %s's (data[0]'s draw solute); rows with another draw solute use it scaled by %s", p.DrawSolute.ID, library.BEstimateRule))
		}
		for j := range pt.bRatio {
			if pt.lay.Info[j].Role == species.RoleFeed {
				pt.bRatio[j] /= refRatio
			}
		}
		if math.Abs(pt.tK-thermo.ZeroCelsiusK-refC) > 1e-9 {
			tempsDiffer = true
		}
		// Measurements.
		if r.WaterFluxLMH == nil {
			return nil, rowErr(i, r, errs.InvalidText("water_flux_lmh", "", limits.FitWaterFlux.Text(), "a measured water flux is required"))
		}
		if err := limits.FitWaterFlux.CheckAt("water_flux_lmh", *r.WaterFluxLMH); err != nil {
			return nil, rowErr(i, r, err)
		}
		pt.jw = *r.WaterFluxLMH
		pt.sdJw = math.Hypot(relW*pt.jw, absW)
		if r.WaterFluxSDLMH != nil {
			if err := limits.FitWaterFluxSD.CheckAt("water_flux_sd_lmh", *r.WaterFluxSDLMH); err != nil {
				return nil, rowErr(i, r, err)
			}
			pt.sdJw = *r.WaterFluxSDLMH
		}
		if !(pt.sdJw > 0) {
			return nil, rowErr(i, r, errs.InvalidText("water_flux_sd_lmh", "", "> 0 LMH", "the water flux's uncertainty is zero: give water_flux_sd_lmh, or a measurement_error above 0"))
		}
		p.observations++
		if r.ReverseSoluteFluxGMH != nil {
			if err := limits.FitReverseFlux.CheckAt("reverse_solute_flux_gmh", *r.ReverseSoluteFluxGMH); err != nil {
				return nil, rowErr(i, r, err)
			}
			pt.js, pt.hasJs = *r.ReverseSoluteFluxGMH, true
			pt.sdJs = math.Hypot(relS*pt.js, absS)
			if r.ReverseSoluteFluxSDGMH != nil {
				if err := limits.FitReverseFluxSD.CheckAt("reverse_solute_flux_sd_gmh", *r.ReverseSoluteFluxSDGMH); err != nil {
					return nil, rowErr(i, r, err)
				}
				pt.sdJs = *r.ReverseSoluteFluxSDGMH
			}
			if !(pt.sdJs > 0) {
				return nil, rowErr(i, r, errs.InvalidText("reverse_solute_flux_sd_gmh", "", "> 0 gMH", "the reverse solute flux's uncertainty is zero: give reverse_solute_flux_sd_gmh, or a measurement_error above 0"))
			}
			p.observations++
		} else if r.ReverseSoluteFluxSDGMH != nil {
			return nil, rowErr(i, r, errs.InvalidText("reverse_solute_flux_sd_gmh", "", nil, "an uncertainty without a reverse_solute_flux_gmh"))
		}
		for _, w := range ws.warnings {
			if !seen[w.String()] {
				seen[w.String()] = true
				p.Warnings = append(p.Warnings, w)
			}
		}
		p.points = append(p.points, *pt)
	}
	if tempsDiffer {
		p.Warnings = append(p.Warnings, warn.New(warn.ModelNote, "membrane",
			"the rows span several temperatures: the fitted A and B hold at %.4g °C, carried to each row's temperature by the membrane's temperature rules (scenario.Membrane.AtTemperature)", refC))
	}
	if n, k := p.observations, len(p.free); n < k {
		return nil, errs.Invalid("data", float64(n), fmt.Sprintf("≥ %d measured fluxes", k),
			"%d measured fluxes cannot determine %d parameters (%s): add rows, add reverse solute fluxes, or fix parameters", n, k, strings.Join(p.Free(), ", "))
	}
	if spec.Bootstrap != nil {
		if err := p.bootstrapSpec(spec.Bootstrap); err != nil {
			return nil, err
		}
	}
	return p, nil
}

// parameters reads the parameters list and the fixed values.
func (p *Problem) parameters(spec *Spec) error {
	names := spec.Parameters
	if names == nil {
		names = ParamNames[:]
	}
	if len(names) == 0 {
		return errs.InvalidText("parameters", "", ParamNames[:], "no parameter to fit: name at least one of a, b, s")
	}
	var want [nParams]bool
	for i, n := range names {
		k := -1
		for j, m := range ParamNames {
			if strings.EqualFold(strings.TrimSpace(n), m) {
				k = j
			}
		}
		field := fmt.Sprintf("parameters[%d]", i)
		if k < 0 {
			return errs.InvalidText(field, n, ParamNames[:], "unknown parameter %q", n)
		}
		if want[k] {
			return errs.InvalidText(field, n, ParamNames[:], "parameter %q named twice", n)
		}
		want[k] = true
	}
	m := spec.Membrane
	if m == nil {
		m = &scenario.MembraneSpec{}
	}
	if m.Preset != "" || m.BNaClLMH != nil {
		f := "membrane.preset"
		if m.Preset == "" {
			f = "membrane.b_nacl_lmh"
		}
		return errs.InvalidText(f, "", nil, "a fit's membrane takes a_lmh_per_bar, b_lmh (B of the draw solute) and s_um: the fixed parameters' values and the fitted ones' starting values")
	}
	vals := [nParams]*float64{m.ALMHPerBar, m.BLMH, m.SUM}
	ranges := [nParams]*limits.Range{&limits.MembraneA, &limits.MembraneB, &limits.MembraneS}
	for j := range nParams {
		if v := vals[j]; v != nil {
			if err := ranges[j].Check(*v); err != nil {
				return err
			}
			if want[j] && !(*v >= lowerBound[j]) {
				return errs.Invalid(ranges[j].Field, *v, fmt.Sprintf("≥ %g %s", lowerBound[j], ranges[j].Unit), "a fitted parameter's starting value must be positive")
			}
		}
		if want[j] {
			p.free = append(p.free, j)
			if vals[j] != nil {
				p.start[j] = *vals[j]
			}
			continue
		}
		if vals[j] == nil {
			return errs.InvalidText(ranges[j].Field, "", ranges[j].Text(), "%s is not fitted, so its value is needed", ParamNames[j])
		}
		p.fixed[j] = *vals[j]
	}
	return nil
}

// rowWarnings holds what resolving a row found.
type rowWarnings struct {
	draw     *library.Solute
	warnings []warn.Warning
}

// resolveRow builds one row's transport problem through the flux
// request's resolution.
func (p *Problem) resolveRow(r *Row, mem *scenario.MembraneSpec, spec *Spec) (*point, *rowWarnings, error) {
	if r.Orientation == "" {
		return nil, nil, errs.InvalidText("orientation", "", scenario.OrientationNames, "an orientation is required")
	}
	if r.Draw == nil {
		return nil, nil, errs.InvalidText("draw", "", nil, "a draw solution is required: {\"solute\", \"concentration\", \"unit\"}")
	}
	fs := &scenario.FluxSpec{
		Membrane: mem, Orientation: r.Orientation, Draw: r.Draw, Feed: r.Feed, TemperatureC: r.TemperatureC,
		KDrawMPerS: r.KDrawMPerS, KFeedMPerS: r.KFeedMPerS, Channel: spec.Channel, ExternalCP: spec.ExternalCP,
		DiffusivityM2PerS: r.DiffusivityM2PerS, BFeedLMH: r.BFeedLMH, OsmoticModel: spec.OsmoticModel,
		DeltaPBar: r.DeltaPBar, AllowExtrapolation: spec.AllowExtrapolation,
	}
	f, err := scenario.ResolveFlux(fs)
	if err != nil {
		return nil, nil, err
	}
	pt := &point{in: f.Input, fa: f.Membrane.Temperature.FactorA,
		gPerMol: f.Draw.X.MolarMassKgPerMol() * thermo.GPerM2HPerKgPerM2S, orient: f.Input.Orientation,
		drawC: f.Draw.CSI, feedC: f.Feed.CSI, tK: f.TemperatureK, nu: f.Draw.X.Nu(), drawID: f.Draw.Solute.ID}
	// The row owns its species (the fit changes their B).
	pt.in.Species = append([]transport.Species(nil), f.Input.Species...)
	pt.lay = f.Layout
	n := len(pt.in.Species)
	pt.bRatio, pt.fixedB = make([]float64, n), make([]bool, n)
	ws := &rowWarnings{draw: f.Draw.Solute}
	for j, info := range f.Layout.Info {
		pt.bRatio[j] = pt.in.Species[j].BMPerS / thermo.MPerSPerLMH
		if info.Role != species.RoleFeed {
			continue
		}
		if r.BFeedLMH != nil {
			pt.fixedB[j] = true
		} else {
			ws.warnings = append(ws.warnings, warn.New(warn.BEstimated, info.Name,
				"B for the feed's %s follows the fitted B by %s (give b_feed_lmh to fix it)", info.Name, library.BEstimateRule))
		}
	}
	for _, w := range f.Warnings {
		// The placeholder membrane's own notes (estimated B, temperature
		// carry-over) are not the user's; the fit states its own.
		if w.Code == warn.BEstimated || w.Subject == "membrane" {
			continue
		}
		ws.warnings = append(ws.warnings, w)
	}
	return pt, ws, nil
}

// eval solves every point at the full parameter vector v (LMH/bar, LMH,
// µm), writing the model fluxes into each point's res.
func (p *Problem) eval(v *[nParams]float64) error {
	for i := range p.points {
		pt := &p.points[i]
		pt.in.AMPerSPa = v[PA] * thermo.MPerSPaPerLMHPerBar * pt.fa
		pt.in.SM = v[PS] * thermo.MPerUM
		for j := range pt.in.Species {
			if !pt.fixedB[j] {
				pt.in.Species[j].BMPerS = v[PB] * thermo.MPerSPerLMH * pt.bRatio[j]
			}
		}
		if err := transport.SolveInto(&pt.in, &pt.res); err != nil {
			return err
		}
	}
	return nil
}

// fluxes are a point's model fluxes (LMH, gMH) after eval: the reverse
// solute flux is the draw's net loss (what the feed's conductivity shows).
func (pt *point) fluxes() (jw, js float64) {
	loss := pt.lay.LossesAt(&pt.in, &pt.res, 0)
	return pt.res.JwMPerS / thermo.MPerSPerLMH, loss.NetKgPerM2S * thermo.GPerM2HPerKgPerM2S
}

// residuals writes the weighted residuals (model − measured)/σ of every
// measured flux into r (len Observations) for measurements y (nil: the
// data's own).
func (p *Problem) residuals(v *[nParams]float64, y []float64, r []float64) error {
	if err := p.eval(v); err != nil {
		return err
	}
	k := 0
	for i := range p.points {
		pt := &p.points[i]
		jw, js := pt.fluxes()
		mw, ms := pt.jw, pt.js
		if y != nil {
			mw = y[k]
		}
		r[k] = (jw - mw) / pt.sdJw
		k++
		if pt.hasJs {
			if y != nil {
				ms = y[k]
			}
			r[k] = (js - ms) / pt.sdJs
			k++
		}
	}
	return nil
}

// full expands the free parameters' logarithms into the full vector.
func (p *Problem) full(theta []float64) [nParams]float64 {
	v := p.fixed
	for i, j := range p.free {
		v[j] = math.Exp(theta[i])
	}
	return v
}
