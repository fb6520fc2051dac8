//go:build !nofit

package api

import (
	"drawsift/engine/fit"
)

// FitRequest is the contract's fit request (fit.Spec).
type FitRequest = fit.Spec

// FitRow is one measured row of a fit request (fit.Row).
type FitRow = fit.Row

// FitEstimate is one parameter of a fit: the value and, for a fitted
// parameter, its standard error and confidence interval.
type FitEstimate struct {
	Value         float64  `json:"value"`
	CILow         *float64 `json:"ci_low,omitempty"`
	CIHigh        *float64 `json:"ci_high,omitempty"`
	StandardError *float64 `json:"standard_error,omitempty"`
	Fitted        bool     `json:"fitted"`
	// Fixed: the request fixed the value (not fitted).
	Fixed   bool `json:"fixed,omitempty"`
	AtBound bool `json:"at_bound,omitempty"`
	// Bootstrap: the percentile interval and standard deviation of the
	// resampled fits, when asked for.
	Bootstrap *FitInterval `json:"bootstrap,omitempty"`
}

// FitInterval is a bootstrap interval.
type FitInterval struct {
	CILow         float64 `json:"ci_low"`
	CIHigh        float64 `json:"ci_high"`
	StandardError float64 `json:"standard_error"`
}

// FitFlux is one flux of one row: measured, fitted, their difference and
// the weighted residual (difference / standard uncertainty).
type FitFlux struct {
	Measured            *float64 `json:"measured,omitempty"`
	Fitted              float64  `json:"fitted"`
	Residual            *float64 `json:"residual,omitempty"`
	WeightedResidual    *float64 `json:"weighted_residual,omitempty"`
	StandardUncertainty *float64 `json:"standard_uncertainty,omitempty"`
}

// FitResidual is one row's measured and fitted fluxes.
type FitResidual struct {
	Row                  int     `json:"row"`
	Orientation          string  `json:"orientation"`
	WaterFluxLMH         FitFlux `json:"water_flux_lmh"`
	ReverseSoluteFluxGMH FitFlux `json:"reverse_solute_flux_gmh"`
}

// FitCorrelation is the correlation matrix of the fitted parameters, in
// the order of parameters (empty when the covariance is singular).
type FitCorrelation struct {
	Parameters []string    `json:"parameters"`
	Matrix     [][]float64 `json:"matrix"`
}

// FitGoodness is the goodness of fit.
type FitGoodness struct {
	Observations     int      `json:"observations"`
	DegreesOfFreedom int      `json:"degrees_of_freedom"`
	ChiSquare        float64  `json:"chi_square"`
	ReducedChiSquare float64  `json:"reduced_chi_square"`
	RMSEWaterFlux    float64  `json:"rmse_water_flux_lmh"`
	RMSEReverseFlux  *float64 `json:"rmse_reverse_solute_flux_gmh,omitempty"`
	// Quantile is the t (or normal) quantile the intervals use.
	Quantile float64 `json:"quantile,omitempty"`
}

// FitSolver is the minimiser's statistics.
type FitSolver struct {
	Method       string  `json:"method"`
	Status       string  `json:"status"`
	Iterations   int     `json:"iterations"`
	Evaluations  int     `json:"evaluations"`
	Starts       int     `json:"starts"`
	GradientNorm float64 `json:"gradient_norm"`
	Cost         float64 `json:"cost"`
}

// FitBootstrap describes a bootstrap run.
type FitBootstrap struct {
	Samples int    `json:"samples"`
	Failed  int    `json:"failed"`
	Seed    uint64 `json:"seed"`
	Method  string `json:"method"`
}

// FitResponse is the contract's fit response.
type FitResponse struct {
	Parameters     []string       `json:"parameters"`
	ALMHPerBar     FitEstimate    `json:"a_lmh_per_bar"`
	BLMH           FitEstimate    `json:"b_lmh"`
	SUM            FitEstimate    `json:"s_um"`
	Confidence     float64        `json:"confidence"`
	IntervalMethod string         `json:"interval_method"`
	Correlation    FitCorrelation `json:"correlation"`
	Residuals      []FitResidual  `json:"residuals"`
	Goodness       FitGoodness    `json:"goodness_of_fit"`
	Solver         FitSolver      `json:"solver"`
	Bootstrap      *FitBootstrap  `json:"bootstrap,omitempty"`
	// Membrane is ready to paste into a scenario's membrane field.
	Membrane     MembraneSpec `json:"membrane"`
	DrawSolute   string       `json:"draw_solute"`
	OsmoticModel string       `json:"osmotic_model"`
	Warnings     []string     `json:"warnings"`
	Sources      []Source     `json:"sources"`
	Cautions     []string     `json:"cautions"`
	// EngineVersion identifies the engine.
	EngineVersion string `json:"engine_version"`
}

var fitSources = []Source{
	{Field: "fit", Reference: "Tiraferri, Yip, Straub, Castrillón & Elimelech (2013) J. Membr. Sci. 444:523 (A, B and S fitted together from FO water and reverse solute fluxes)"},
	{Field: "fit.minimiser", Reference: "Levenberg–Marquardt with Marquardt's scaling (Moré 1978, Numerical Analysis, Springer LNM 630) in ln A, ln B, ln S"},
	{Field: "fit.start", Reference: "Phillip, Yong & Elimelech (2010) Environ. Sci. Technol. 44:5170 (Js/Jw = B/(A·ν·R·T)) for the starting B"},
	{Field: "fit.intervals", Reference: "Bates & Watts (1988) Nonlinear Regression Analysis and Its Applications, ch. 2 (linearised covariance, t intervals)"},
	{Field: "fit.bootstrap", Reference: "Efron & Tibshirani (1993) An Introduction to the Bootstrap, §9.5 (resampling residuals)"},
}

// FitCautions are said with every fit.
var FitCautions = []string{
	"Fitted A, B and S hold for the model, the test conditions and the mass-transfer coefficients used; a different k or osmotic model changes S most.",
	"Screening estimates, not a design: confirm the membrane's parameters with the standard tests of your lab.",
}
