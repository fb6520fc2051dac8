//go:build !nofit

package api

import (
	"context"

	"drawsift/engine/fit"
	"drawsift/engine/library"
	"drawsift/engine/scenario"
	"drawsift/engine/warn"
)

// FitInBuild reports whether this build carries the fit operation.
const FitInBuild = true

// fitOp decodes and runs a fit request (Dispatch's case).
func fitOp(ctx context.Context, body []byte, progress func(done, total int)) (any, *Error) {
	var req FitRequest
	if e := decode(body, &req); e != nil {
		return nil, e
	}
	return Fit(ctx, &req, progress)
}

// Fit estimates A, B and S from measured fluxes.
func Fit(ctx context.Context, req *FitRequest, progress func(done, total int)) (*FitResponse, *Error) {
	p, err := fit.Resolve(req)
	if err != nil {
		return nil, fromEngine("", err)
	}
	r, err := fit.Run(ctx, p, progress)
	if err != nil {
		return nil, fromEngine("", err)
	}
	resp := &FitResponse{Parameters: r.Free, Confidence: r.Confidence, IntervalMethod: r.IntervalKind,
		DrawSolute: p.DrawSolute.ID, OsmoticModel: r.OsmoticModel, Cautions: append(append([]string{}, FitCautions...), ScreenCautions...),
		EngineVersion: EngineVersion, Sources: fitSources}
	est := func(e fit.Estimate) FitEstimate {
		out := FitEstimate{Value: e.Value, Fitted: e.Fitted, Fixed: !e.Fitted, AtBound: e.AtBound}
		if e.HasInterval {
			lo, hi, se := e.Low, e.High, e.SE
			out.CILow, out.CIHigh, out.StandardError = &lo, &hi, &se
		}
		if b := e.Bootstrap; b != nil {
			out.Bootstrap = &FitInterval{CILow: b.Low, CIHigh: b.High, StandardError: b.SE}
		}
		return out
	}
	resp.ALMHPerBar, resp.BLMH, resp.SUM = est(r.Params[fit.PA]), est(r.Params[fit.PB]), est(r.Params[fit.PS])
	resp.Correlation = FitCorrelation{Parameters: r.Free, Matrix: r.Correlation}
	if resp.Correlation.Matrix == nil {
		resp.Correlation.Matrix = [][]float64{}
	}
	for _, pt := range r.Points {
		rr := FitResidual{Row: pt.Row, Orientation: pt.Orientation}
		rr.WaterFluxLMH = fitFlux(pt.Jw, pt.JwFit, pt.SdJw, true)
		rr.ReverseSoluteFluxGMH = fitFlux(pt.Js, pt.JsFit, pt.SdJs, pt.HasJs)
		resp.Residuals = append(resp.Residuals, rr)
	}
	resp.Goodness = FitGoodness{Observations: r.Observations, DegreesOfFreedom: r.DOF, ChiSquare: r.ChiSquare,
		ReducedChiSquare: r.ReducedChiSq, RMSEWaterFlux: r.RMSEJwLMH, Quantile: r.TQuantile}
	if r.HasJs {
		v := r.RMSEJsGMH
		resp.Goodness.RMSEReverseFlux = &v
	}
	st := r.Solver
	resp.Solver = FitSolver{Method: "levenberg-marquardt (ln parameters, bounded)", Status: st.Status, Iterations: st.Iterations,
		Evaluations: st.Evaluations, Starts: r.Starts, GradientNorm: st.Gradient, Cost: st.Cost}
	if b := r.Bootstrap; b != nil {
		resp.Bootstrap = &FitBootstrap{Samples: b.Samples, Failed: b.Failed, Seed: b.Seed,
			Method: "residual bootstrap, refitted from the estimate; percentile intervals"}
	}

	// The membrane for a scenario: a NaCl draw gives b_lmh (a screen's
	// NaCl B); another draw solute's B is carried back to NaCl's by the
	// library's estimate rule, so b_lmh stays the screen's meaning.
	a, b, s := r.Params[fit.PA].Value, r.Params[fit.PB].Value, r.Params[fit.PS].Value
	refT := p.RefTempC
	resp.Membrane = MembraneSpec{ALMHPerBar: &a, SUM: &s, ReferenceTemperatureC: &refT}
	if req.Membrane != nil {
		resp.Membrane.AActivationKJPerMol, resp.Membrane.BActivationKJPerMol = req.Membrane.AActivationKJPerMol, req.Membrane.BActivationKJPerMol
	}
	ws := r.Warnings
	if p.DrawSolute.ID == "NaCl" {
		resp.Membrane.BLMH = &b
	} else {
		base := library.SoluteB{NaCl: 1}
		ratio, _ := base.For(p.DrawSolute)
		bn := b / ratio
		resp.Membrane.BNaClLMH = &bn
		ws = append(ws, warn.New(warn.BEstimated, "membrane", "B was fitted for %s (%.4g LMH); the membrane object carries the NaCl B it implies by %s (%.4g LMH)",
			p.DrawSolute.ID, b, library.BEstimateRule, bn))
	}
	resp.Warnings = warn.Strings(ws)
	if p.Model == scenario.Real {
		resp.Sources = append(resp.Sources, modelSources[p.DrawSolute.Osmotic.Kind]...)
	}
	resp.Sources = append(resp.Sources, fluxSources...)
	return resp, nil
}

func fitFlux(measured, fitted, sd float64, has bool) FitFlux {
	f := FitFlux{Fitted: fitted}
	if has {
		d, wr, u := fitted-measured, (fitted-measured)/sd, sd
		f.Measured, f.Residual, f.WeightedResidual, f.StandardUncertainty = &measured, &d, &wr, &u
	}
	return f
}
