package screen

import (
	"math"

	"drawsift/engine/transport"
)

// channelK returns the mass-transfer coefficient of one side of the
// channel from the Sherwood correlations of package transport, with the
// solution's density, viscosity and the diffusing solute's D.
func channelK(ch Channel, feedSide bool, rho, mu, d float64) (float64, error) {
	u := ch.VelocityMPerS
	if feedSide && ch.FeedVelocityMPerS > 0 {
		u = ch.FeedVelocityMPerS
	}
	mt, err := transport.MassTransferCoefficient(transport.Channel{
		HeightM: ch.HeightM, WidthM: ch.WidthM, LengthM: ch.LengthM, VelocityMPerS: u, Spacer: ch.Spacer,
	}, transport.Fluid{DensityKgPerM3: rho, ViscosityPaS: mu, DiffusivityM2PerS: d})
	if err != nil {
		return 0, err
	}
	if !(mt.KMPerS > 0) || math.IsInf(mt.KMPerS, 0) {
		return math.Inf(1), nil
	}
	return mt.KMPerS, nil
}
