package transport

import (
	"fmt"
	"math"

	"drawsift/engine/warn"
)

// Channel is a rectangular crossflow channel on the faces of the membrane.
type Channel struct {
	HeightM, WidthM, LengthM float64
	VelocityMPerS            float64 // mean crossflow velocity
	// FeedVelocityMPerS, when positive, is the feed side's own velocity
	// (see Side); MassTransferCoefficient itself uses VelocityMPerS.
	FeedVelocityMPerS float64
	Spacer            bool // spacer-filled (mesh) channel
}

// Side returns the channel as one side of the membrane sees it: the feed
// side runs at FeedVelocityMPerS when that is set.
func (c Channel) Side(feed bool) Channel {
	if feed && c.FeedVelocityMPerS > 0 {
		c.VelocityMPerS = c.FeedVelocityMPerS
	}
	c.FeedVelocityMPerS = 0
	return c
}

// Fluid holds the solution properties that enter the Sherwood correlations.
type Fluid struct {
	DensityKgPerM3    float64
	ViscosityPaS      float64
	DiffusivityM2PerS float64 // of the solute that polarizes
}

// MassTransfer is the boundary-layer mass-transfer coefficient with the
// dimensionless groups behind it.
type MassTransfer struct {
	KMPerS             float64
	Re, Sc, Sh         float64
	HydraulicDiameterM float64
	Regime             string // "laminar", "transitional", "turbulent" or "spacer-filled"
	Correlation        string // formula and source
	Warnings           []warn.Warning
}

// Regime boundaries for flow in channels (common practice).
const (
	reLaminarMax     = 2100
	reTurbulentMin   = 4000
	laminarCorr      = "Sh = 1.85·(Re·Sc·d_h/L)^(1/3) (McCutcheon & Elimelech 2006; from memory, unverified)"
	turbulentCorr    = "Sh = 0.04·Re^0.75·Sc^0.33 (McCutcheon & Elimelech 2006; from memory, unverified)"
	spacerCorr       = "Sh = 0.065·Re^0.875·Sc^0.25 (Schock & Miquel 1987; from memory, unverified)"
	warnBorderline   = "laminar/turbulent borderline: Re between 2100 and 4000, laminar correlation used"
	warnUnverified   = "Sherwood correlation quoted from memory, not checked against the paper: enter k directly when it is known"
	maxChannelDimM   = 10   // m
	maxVelocityMPerS = 100  // m/s
	maxDensity       = 1e4  // kg/m³
	maxViscosityPaS  = 10.0 // Pa·s
)

// unverifiedOnly is the note every correlation's result carries, shared
// by the results that carry no other (no allocation per solve).
var unverifiedOnly = []warn.Warning{{Code: warn.Unverified, Text: warnUnverified}}

// MassTransferCoefficient returns the mass-transfer coefficient k of the
// concentration boundary layer in a crossflow channel:
//
//	d_h = 2·h·w/(h + w)            (hydraulic diameter of a rectangle)
//	Re = ρ·u·d_h/μ,  Sc = μ/(ρ·D),  k = Sh·D/d_h
//
// with Sh from, by regime,
//
//	laminar (Re < 2100):       Sh = 1.85·(Re·Sc·d_h/L)^(1/3)
//	                           (McCutcheon & Elimelech 2006, J. Membr. Sci. 284:237)
//	turbulent (Re > 4000):     Sh = 0.04·Re^0.75·Sc^0.33 (same source)
//	2100 ≤ Re ≤ 4000:          the laminar form, with the warning
//	                           "laminar/turbulent borderline"
//	spacer-filled (any Re):    Sh = 0.065·Re^0.875·Sc^0.25
//	                           (Schock & Miquel 1987, Desalination 64:339)
//
// All three correlations are quoted from memory and unverified; every result
// carries a warning saying so, and callers should prefer a measured k.
//
// Special cases are: any dimension, the velocity, the density, the
// viscosity or the diffusivity ≤ 0, non-finite or absurdly large returns an
// *errs.InputError naming the field ("channel.height_m", "channel.width_m",
// "channel.length_m", "channel.velocity_m_per_s", "fluid.density_kg_per_m3",
// "fluid.viscosity_pa_s", "fluid.diffusivity_m2_per_s").
func MassTransferCoefficient(ch Channel, f Fluid) (MassTransfer, error) {
	type check struct {
		field string
		v     float64
		lo    float64
		hi    float64
	}
	for _, c := range []check{
		{"channel.height_m", ch.HeightM, 0, maxChannelDimM},
		{"channel.width_m", ch.WidthM, 0, maxChannelDimM},
		{"channel.length_m", ch.LengthM, 0, maxChannelDimM * 100},
		{"channel.velocity_m_per_s", ch.VelocityMPerS, 0, maxVelocityMPerS},
		{"fluid.density_kg_per_m3", f.DensityKgPerM3, 0, maxDensity},
		{"fluid.viscosity_pa_s", f.ViscosityPaS, 0, maxViscosityPaS},
		{"fluid.diffusivity_m2_per_s", f.DiffusivityM2PerS, 0, maxDM2PerS},
	} {
		if !(c.v > c.lo && c.v <= c.hi) {
			return MassTransfer{}, inErr(c.field, c.v, fmt.Sprintf("> %g and ≤ %g", c.lo, c.hi))
		}
	}
	dh := 2 * ch.HeightM * ch.WidthM / (ch.HeightM + ch.WidthM)
	re := f.DensityKgPerM3 * ch.VelocityMPerS * dh / f.ViscosityPaS
	sc := f.ViscosityPaS / (f.DensityKgPerM3 * f.DiffusivityM2PerS)
	mt := MassTransfer{Re: re, Sc: sc, HydraulicDiameterM: dh}
	switch {
	case ch.Spacer:
		mt.Regime, mt.Correlation = "spacer-filled", spacerCorr
		mt.Sh = 0.065 * math.Pow(re, 0.875) * math.Pow(sc, 0.25)
	case re > reTurbulentMin:
		mt.Regime, mt.Correlation = "turbulent", turbulentCorr
		mt.Sh = 0.04 * math.Pow(re, 0.75) * math.Pow(sc, 0.33)
	default:
		mt.Regime, mt.Correlation = "laminar", laminarCorr
		if re >= reLaminarMax {
			mt.Regime = "transitional"
			mt.Warnings = append(mt.Warnings, warn.New(warn.FlowRegime, "", "%s (Re = %.0f)", warnBorderline, re))
		}
		mt.Sh = 1.85 * math.Cbrt(re*sc*dh/ch.LengthM)
	}
	if mt.Warnings == nil {
		mt.Warnings = unverifiedOnly[:1:1] // shared, full: an append copies
	} else {
		mt.Warnings = append(mt.Warnings, unverifiedOnly[0])
	}
	mt.KMPerS = mt.Sh * f.DiffusivityM2PerS / dh
	return mt, nil
}
