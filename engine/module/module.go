// Package module takes the local FO flux of engine/transport to the scale
// of a module: steady one-dimensional plug flow of a draw and a feed
// stream on the two sides of a membrane of area A, in co-current or
// counter-current flow.
//
// # Model
//
// The independent variable x is the membrane area swept from the feed
// inlet (0 ≤ x ≤ A, m²). The state is each stream's volumetric flow Q
// (m³/s) and the molar flow n_i (mol/s) of every transport species i (the
// layout of engine/species: a shared ion is one species). At every x the
// bulk concentrations are c_i = n_i/Q, and engine/transport gives the
// local water flux Jw (m/s, feed → draw) and species fluxes N_i
// (mol m⁻² s⁻¹, feed → draw) with ICP, ECP and reverse and forward solute
// flux. The balances are
//
//	dQ_f/dx = −Jw,     dn_f,i/dx = −N_i                (feed, flowing +x)
//	dQ_d/dx = ±Jw,     dn_d,i/dx = ±N_i                (+ co-current, − counter-current)
//
// (the plug-flow balances of any membrane exchanger; for FO modules e.g.
// Gu, Kim, Hsu & Hsu 2011, Desalination 276:1; Xiao et al. 2011, J.
// Membr. Sci. 366:314). The volume carried by the solutes that cross is
// neglected beside the water (volumes add as water), so Q_d + Q_f (co)
// or Q_f − Q_d (counter) and n_d,i + n_f,i (co) or n_f,i − n_d,i
// (counter) are invariants, which the integrator keeps to rounding.
//
// The hydraulic pressure of the draw over the feed starts at ΔP (the
// draw's pressure at its inlet over the feed's at its inlet) and each
// channel loses a stated pressure per m² of area along its own flow
// (a linear pressure drop). The mass-transfer coefficients, the
// diffusivities and the temperature are those of the inlets throughout
// (a stated simplification: the local k would follow the local velocity).
//
// # Solution
//
// Co-current flow is an initial-value problem, integrated by the
// Dormand–Prince 5(4) embedded Runge–Kutta pair (Dormand & Prince 1980,
// J. Comput. Appl. Math. 6:19; step control as Hairer, Nørsett & Wanner
// 1993, Solving Ordinary Differential Equations I, §II.4) to a mixed
// relative and absolute tolerance per component (Tol, default 1e-9).
// Counter-current flow is a two-point boundary-value problem: the feed's
// state is known at x = 0, the draw's at x = A. It is solved by shooting
// on the draw's outlet state at x = 0: a Brent search on the permeate
// (bracketed between zero and the osmotic-equilibrium dilution of the
// draw against the feed inlet, which no solution exceeds) gives a start,
// then Newton's method on the whole outlet state (flow and every
// species) with a finite-difference Jacobian on a frozen step sequence,
// and a final error-controlled pass. Where Newton fails near a pinch the
// solve continues in area from a smaller module whose solution starts the
// next (Stats.Method says which path ran).
package module

import (
	"drawsift/engine/errs"
	"drawsift/engine/species"
	"drawsift/engine/transport"
)

// Flow is the relative direction of the two streams.
type Flow int

const (
	// Counter: the draw enters where the feed leaves (x = A).
	Counter Flow = iota
	// Co: both enter at x = 0.
	Co
)

// String returns "counter" or "co".
func (f Flow) String() string {
	if f == Co {
		return "co"
	}
	return "counter"
}

// ParseFlow reads "counter" (default for "") or "co".
func ParseFlow(field, s string) (Flow, error) {
	switch s {
	case "", "counter", "counter-current":
		return Counter, nil
	case "co", "co-current", "cocurrent":
		return Co, nil
	}
	return Counter, errs.InvalidText(field, s, `"counter" or "co"`, "flow %q is not known: give \"counter\" or \"co\"", s)
}

// Problem is one module: the local transport problem at the inlets and
// the streams' flows.
type Problem struct {
	// Input is the transport problem at the inlets: each species' draw
	// and feed bulk concentrations are the inlet values. Solve works on a
	// copy of its species.
	Input transport.Input
	// Layout, when set, is the species layout whose face-π rule
	// Input.FacePi is (engine/species): Solve updates the rule's shares
	// of the species in both streams as the bulks change. The layout is
	// modified: give each concurrent Solve its own (Transport.Clone).
	Layout *species.Transport
	Flow   Flow
	// Inlet flows, m³/s.
	DrawInM3PerS, FeedInM3PerS float64
	// DeltaPPa is the draw's hydraulic pressure at its inlet over the
	// feed's at its inlet; the drops are each channel's loss per m² of
	// area along its flow (Pa/m²).
	DeltaPPa                         float64
	DrawDropPaPerM2, FeedDropPaPerM2 float64
	// Tol is the integrator's relative tolerance (default DefaultTol).
	Tol float64
	// Points is the number of profile points, evenly spaced in area from
	// 0 to A (default DefaultPoints; at least 2).
	Points int
	// Stop, when set, is polled between integrations; a non-nil error
	// ends the solve with it (a cancelled request).
	Stop func() error
}

// Defaults.
const (
	DefaultTol    = 1e-9
	DefaultPoints = 41
	// MaxPoints bounds the profiles.
	MaxPoints = 1001
)

// Profile is the state at one point along the area.
type Profile struct {
	AreaM2 float64
	// Flows (m³/s) and every species' bulk concentration (mol/m³) in the
	// draw and the feed.
	DrawM3PerS, FeedM3PerS     float64
	DrawMolPerM3, FeedMolPerM3 []float64
	WaterFluxMPerS             float64
	DrawPiPa, FeedPiPa         float64 // bulk osmotic pressures
	DeltaPPa                   float64
	SpeciesFluxMolPerM2S       []float64
	DrawFacePiPa, FeedFacePiPa float64
}

// Stream is one stream's state at an end of the module.
type Stream struct {
	M3PerS   float64
	MolPerS  []float64 // every species' molar flow
	MolPerM3 []float64 // and its concentration
	PiPa     float64   // bulk osmotic pressure
}

// Result is a solved module.
type Result struct {
	AreaM2 float64
	Flow   Flow
	// DrawIn, FeedIn, DrawOut, FeedOut are the streams at their inlets and
	// outlets.
	DrawIn, FeedIn, DrawOut, FeedOut Stream
	// PermeateM3PerS is the water that crossed, Q_d,out − Q_d,in.
	PermeateM3PerS float64
	// Recovery = permeate / feed inflow.
	Recovery float64
	// RecoveryCap is the recovery at osmotic equilibrium with no solute
	// crossing (RecoveryCap); CapPinch names where it pinches.
	RecoveryCap float64
	CapPinch    string
	// ToDrawMolPerS: each species' net transfer into the draw over the
	// module (n_d,out − n_d,in).
	ToDrawMolPerS []float64
	Profiles      []Profile
	Stats         Stats
	// WaterBalance and SpeciesBalance are the worst relative imbalances
	// of the invariants (rounding only).
	WaterBalance, SpeciesBalance float64
}

// Stats reports how the module was solved.
type Stats struct {
	// Method: "dopri5" (co-current), "shooting-newton",
	// "shooting-newton+continuation" (counter-current).
	Method string
	// Integrations of the whole area, accepted and rejected steps, and
	// local flux solves, over the whole solve.
	Integrations, Steps, Rejected, FluxSolves int
	// NewtonIterations of the counter-current shooting; BoundaryResidual
	// its final scaled residual at x = A.
	NewtonIterations int
	BoundaryResidual float64
	// DesignIterations of the area search (design only).
	DesignIterations int
}

// finite reports whether v is a finite number.
func finite(v float64) bool { return v-v == 0 }

// piOf returns the osmotic pressure of a bulk composition c (mol/m³ per
// species) under the problem's face rule (the additive rule when FacePi
// is nil), using grad as scratch.
func piOf(in *transport.Input, c, grad []float64) float64 {
	if in.FacePi != nil {
		return in.FacePi(c, grad)
	}
	var p float64
	for i := range in.Species {
		v, _ := in.Species[i].Pi(c[i])
		p += v
	}
	return p
}

// lPerHPerM3PerS converts m³/s to L/h (for errors).
const lPerHPerM3PerS = 3.6e6
