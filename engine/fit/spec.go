// Package fit estimates a membrane's water permeability A, solute
// permeability B and structural parameter S from measured FO fluxes, with
// confidence intervals.
//
// # Method
//
// Weighted non-linear least squares on the water flux and the reverse
// solute flux together (Tiraferri, Yip, Straub, Castrillón & Elimelech
// 2013, J. Membr. Sci. 444:523, fit A, B and S simultaneously from FO
// stages at stepped draw concentrations): each measured flux y_i with
// standard uncertainty σ_i gives the residual r_i = (f_i(p) − y_i)/σ_i,
// and the fit minimises ½Σr_i². Every model value f_i is the engine's own
// flux model: each data row is resolved once by scenario.ResolveFlux
// (solutes, temperature, k from the row or the channel, D, π under the
// osmotic model), then A, B and S vary and transport.SolveInto solves it.
// The parameters travel as ln p (positive by construction) inside the
// engine's ranges for A, B and S; the minimiser is Levenberg–Marquardt
// with Marquardt's diagonal scaling (Moré 1978, "The Levenberg–Marquardt
// algorithm: implementation and theory", in Numerical Analysis, Springer LNM
// 630) and a projected step at the bounds, started from the best points
// of a grid over A and S with B from the specific reverse solute flux
// (Js/Jw = B/(A·ν·R·T), Phillip, Yong & Elimelech 2010, Environ. Sci.
// Technol. 44:5170).
//
// # Uncertainty
//
// The covariance of ln p is s²·(JᵀJ)⁻¹ with J the Jacobian of the weighted
// residuals at the minimum and s² the reduced chi-square (or 1 when the
// stated uncertainties are absolute); the standard error of p is
// p·SE(ln p) (the delta method), and the interval is
// exp(ln p ± t·SE(ln p)) with Student's t at n − p degrees of freedom
// (common practice for non-linear regression: Bates & Watts 1988,
// "Nonlinear Regression Analysis and Its Applications", ch. 2). A seeded
// residual bootstrap (Efron & Tibshirani 1993, "An Introduction to the
// Bootstrap", §9.5) gives percentile intervals where the problem is
// visibly non-linear.
package fit

import (
	"drawsift/engine/scenario"
)

// Row is one measurement: the conditions of an FO test and the fluxes
// measured in it (the contract's names; engine/api re-exports it).
type Row struct {
	Orientation  string                  `json:"orientation"`
	Draw         *scenario.Concentration `json:"draw"`
	Feed         *scenario.Concentration `json:"feed,omitempty"`
	TemperatureC *float64                `json:"temperature_c,omitempty"`
	WaterFluxLMH *float64                `json:"water_flux_lmh"`
	// ReverseSoluteFluxGMH is the draw solute's flux into the feed.
	ReverseSoluteFluxGMH *float64 `json:"reverse_solute_flux_gmh,omitempty"`
	KDrawMPerS           *float64 `json:"k_draw_m_per_s,omitempty"`
	KFeedMPerS           *float64 `json:"k_feed_m_per_s,omitempty"`
	DiffusivityM2PerS    *float64 `json:"diffusivity_m2_per_s,omitempty"`
	DeltaPBar            *float64 `json:"delta_p_bar,omitempty"`
	// BFeedLMH fixes B of a feed solute that differs from the draw solute
	// (omitted: it follows the fitted B by library.BEstimateRule).
	BFeedLMH *float64 `json:"b_feed_lmh,omitempty"`
	// Standard uncertainties of this row's fluxes (omitted: the request's
	// measurement_error).
	WaterFluxSDLMH         *float64 `json:"water_flux_sd_lmh,omitempty"`
	ReverseSoluteFluxSDGMH *float64 `json:"reverse_solute_flux_sd_gmh,omitempty"`

	// line is the CSV line the row came from (0: JSON).
	line int
}

// MeasurementError states the standard uncertainty of every measured
// flux: σ = √((relative·|y|)² + absolute²).
type MeasurementError struct {
	WaterFluxRelative         *float64 `json:"water_flux_relative,omitempty"`
	WaterFluxLMH              *float64 `json:"water_flux_lmh,omitempty"`
	ReverseSoluteFluxRelative *float64 `json:"reverse_solute_flux_relative,omitempty"`
	ReverseSoluteFluxGMH      *float64 `json:"reverse_solute_flux_gmh,omitempty"`
	// Absolute: the uncertainties are known in size, so the covariance is
	// not rescaled by the reduced chi-square (default false: they are
	// relative weights and the scatter of the residuals sets the size).
	Absolute bool `json:"absolute,omitempty"`
}

// BootstrapSpec asks for a seeded residual bootstrap.
type BootstrapSpec struct {
	Samples *float64 `json:"samples,omitempty"`
	Seed    *float64 `json:"seed,omitempty"`
}

// Spec is a fit request (engine/api re-exports it as FitRequest).
type Spec struct {
	Data []Row `json:"data,omitempty"`
	// CSV holds the rows as CSV text instead of data (ParseCSV).
	CSV string `json:"csv,omitempty"`
	// Parameters to fit: any of "a", "b", "s" (default all three).
	Parameters   []string `json:"parameters,omitempty"`
	OsmoticModel string   `json:"osmotic_model,omitempty"`
	Confidence   *float64 `json:"confidence,omitempty"`
	// Membrane gives the fixed parameters' values and, optionally, the
	// fitted ones' starting values; reference_temperature_c is where the
	// fitted A and B hold (omitted: the first row's temperature).
	Membrane *scenario.MembraneSpec `json:"membrane,omitempty"`
	// Channel sets k for rows that do not give it (Sherwood correlations).
	Channel            *scenario.ChannelSpec `json:"channel,omitempty"`
	ExternalCP         *bool                 `json:"external_cp,omitempty"`
	MeasurementError   *MeasurementError     `json:"measurement_error,omitempty"`
	Bootstrap          *BootstrapSpec        `json:"bootstrap,omitempty"`
	AllowExtrapolation bool                  `json:"allow_extrapolation,omitempty"`
}
