package screen

import "drawsift/engine/transport"

// channelK returns the mass-transfer coefficient (m/s) of one side of the
// channel from transport.MassTransferCoefficient (the laminar, turbulent or
// spacer-filled Sherwood correlation the flow calls for), with the
// solution's density (kg/m³), viscosity (Pa·s) and diffusivity (m²/s).
// The feed side may run at its own crossflow velocity.
func channelK(ch Channel, feedSide bool, rho, mu, d float64) (float64, error) {
	u := ch.VelocityMPerS
	if feedSide && ch.FeedVelocityMPerS > 0 {
		u = ch.FeedVelocityMPerS
	}
	mt, err := transport.MassTransferCoefficient(
		transport.Channel{HeightM: ch.HeightM, WidthM: ch.WidthM, LengthM: ch.LengthM, VelocityMPerS: u, Spacer: ch.Spacer},
		transport.Fluid{DensityKgPerM3: rho, ViscosityPaS: mu, DiffusivityM2PerS: d})
	if err != nil {
		return 0, err
	}
	return mt.KMPerS, nil
}
