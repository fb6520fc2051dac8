package scenario

import (
	"drawsift/engine/limits"
	"fmt"
	"math"

	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// ChannelSpec describes a crossflow channel in the request's units; k
// follows from a Sherwood correlation. The JSON names are the contract's
// (engine/api re-exports the type).
type ChannelSpec struct {
	HeightMM                 float64  `json:"height_mm"`
	WidthMM                  float64  `json:"width_mm"`
	LengthMM                 float64  `json:"length_mm"`
	CrossflowVelocityMPerS   float64  `json:"crossflow_velocity_m_per_s"`
	Spacer                   bool     `json:"spacer"`
	FeedCrossflowVelocityMPS *float64 `json:"feed_crossflow_velocity_m_per_s,omitempty"`
}

// DefaultChannel is the channel a request without one gets (the
// defaults of the Channel… ranges).
func DefaultChannel() ChannelSpec {
	return ChannelSpec{HeightMM: limits.ChannelHeight.Default, WidthMM: limits.ChannelWidth.Default,
		LengthMM: limits.ChannelLength.Default, CrossflowVelocityMPerS: limits.Crossflow.Default}
}

// ResolveChannel checks a channel in the request's units (so an error
// names the request's field and its limit; the correlations check again
// in SI) and returns it in SI. nil → DefaultChannel.
func ResolveChannel(c *ChannelSpec) (transport.Channel, error) {
	spec := DefaultChannel()
	if c != nil {
		spec = *c
	}
	for _, f := range []struct {
		r *limits.Range
		v float64
	}{{&limits.ChannelHeight, spec.HeightMM}, {&limits.ChannelWidth, spec.WidthMM}, {&limits.ChannelLength, spec.LengthMM}, {&limits.Crossflow, spec.CrossflowVelocityMPerS}} {
		if err := f.r.Check(f.v); err != nil {
			return transport.Channel{}, err
		}
	}
	if err := optional(&limits.FeedCrossflow, limits.FeedCrossflow.Field, spec.FeedCrossflowVelocityMPS); err != nil {
		return transport.Channel{}, err
	}
	ch := transport.Channel{HeightM: spec.HeightMM * thermo.MPerMM, WidthM: spec.WidthMM * thermo.MPerMM, LengthM: spec.LengthMM * thermo.MPerMM,
		VelocityMPerS: spec.CrossflowVelocityMPerS, Spacer: spec.Spacer}
	if u := spec.FeedCrossflowVelocityMPS; u != nil {
		ch.FeedVelocityMPerS = *u
	}
	return ch, nil
}

// KOrigin says where a side's k came from.
type KOrigin string

// Origins of k.
const (
	KGiven       KOrigin = "given"
	KCorrelation KOrigin = "correlation"
	KNone        KOrigin = "none" // no external CP: k → ∞
)

// SideK is one side's mass-transfer coefficient and how it was found.
type SideK struct {
	KMPerS float64 // +Inf for no external CP
	Origin KOrigin
	// MassTransfer holds the Sherwood groups and warnings (Origin
	// correlation).
	MassTransfer transport.MassTransfer
}

// GivenK checks a given k on r's field; nil means none given (0).
func GivenK(r *limits.Range, v *float64) (float64, error) {
	if v == nil {
		return 0, nil
	}
	return *v, r.Check(*v)
}

// ResolveK returns one side's k: +Inf without external CP, the given
// value (checked against r), or the channel's Sherwood correlation with
// the solution's density, viscosity and diffusivity.
func ResolveK(r *limits.Range, given *float64, ch transport.Channel, externalCP, feedSide bool, fluid transport.Fluid) (SideK, error) {
	if !externalCP {
		return SideK{KMPerS: math.Inf(1), Origin: KNone}, nil
	}
	if given != nil {
		k, err := GivenK(r, given)
		return SideK{KMPerS: k, Origin: KGiven}, err
	}
	mt, err := transport.MassTransferCoefficient(ch.Side(feedSide), fluid)
	if err != nil {
		// The channel was checked in ResolveChannel, so only the solution's
		// own properties can be refused here: an engine fault.
		return SideK{}, fmt.Errorf("mass transfer: %v", err)
	}
	return SideK{KMPerS: mt.KMPerS, Origin: KCorrelation, MassTransfer: mt}, nil
}
