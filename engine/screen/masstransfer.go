package screen

import "drawsift/engine/transport"

// channelK returns the mass-transfer coefficient of one side of the
// channel (with its Sherwood groups and warnings) from
// transport.MassTransferCoefficient — the laminar, turbulent or
// spacer-filled correlation the flow calls for — with the solution's
// density (kg/m³), viscosity (Pa·s) and diffusivity (m²/s).
func channelK(ch transport.Channel, feedSide bool, rho, mu, d float64) (transport.MassTransfer, error) {
	return transport.MassTransferCoefficient(ch.Side(feedSide),
		transport.Fluid{DensityKgPerM3: rho, ViscosityPaS: mu, DiffusivityM2PerS: d})
}
