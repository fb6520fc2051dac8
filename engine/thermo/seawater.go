package thermo

import "drawsift/engine/water"

// seawaterMolarMass is the mean molar mass of sea salt, kg/mol: total solute
// molality Σm = 31.843280·S/(1000 − S) mol/kg with S in g/kg (Sharqawy et
// al. 2010; Nayar et al. 2016), i.e. 1/31.843280 kg/mol.
const seawaterMolarMass = 1 / 31.843280

// seawaterPhi returns the osmotic coefficient of seawater of salinity
// sGPerKg (g/kg) at tC °C:
//
//	φ = a1 + a2 t + a3 t² + a4 t⁴ + a5 S + a6 t S + a7 S t³ + a8 S² + a9 S² t + a10 S² t²
//
// Source: Sharqawy, Lienhard & Zubair (2010), Desalination and Water
// Treatment 16:354, a fit of Bromley's data valid 0–200 °C and
// 10–120 g/kg (±2.57 %), extended below 10 g/kg by Sharqawy, Banchik &
// Lienhard (2013) and Nayar et al. (2016); coefficients as implemented in
// the MIT seawater-properties library (SW_OsmCoeff).
func seawaterPhi(sGPerKg, tC float64) float64 {
	const (
		a1  = 8.9453233003e-1
		a2  = 4.1560737424e-4
		a3  = -4.6262121398e-6
		a4  = 2.2211195897e-11
		a5  = -1.1445456438e-4
		a6  = -1.4783462366e-6
		a7  = -1.3526263499e-11
		a8  = 7.0132355546e-6
		a9  = 5.6960486681e-8
		a10 = -2.8624032584e-10
	)
	t, s := tC, sGPerKg
	t2 := t * t
	return a1 + a2*t + a3*t2 + a4*t2*t2 + a5*s + a6*t*s + a7*s*t2*t +
		a8*s*s + a9*s*s*t + a10*s*s*t2
}

// seawaterDensity returns the density of seawater (kg/m³) at mass fraction
// of salt w (kg/kg) and tC °C, at 0.1 MPa, and dρ/dw:
//
//	ρ = ρ_w(t) + b1 w + b2 w t + b3 w t² + b4 w t³ + b5 w² t²
//
// Source: Sharqawy, Lienhard & Zubair (2010), eq. 8 (a fit of Isdale &
// Morris 1972 and Millero & Poisson 1981 data, 0–180 °C, 0–160 g/kg,
// ±0.1 %); coefficients as implemented in the MIT seawater-properties
// library (SW_Density). ρ_w is taken from package water rather than
// Sharqawy's own pure-water fit (they agree to 0.01 %).
func seawaterDensity(w, tC float64) (rho, drhodw float64) {
	const (
		b1 = 8.0200240891e2
		b2 = -2.0005183488
		b3 = 1.6771024982e-2
		b4 = -3.0600536746e-5
		b5 = -1.6132224742e-5
	)
	t := tC
	lin := b1 + t*(b2+t*(b3+t*b4))
	rho = water.Density(t+ZeroCelsiusK) + w*lin + b5*w*w*t*t
	return rho, lin + 2*b5*w*t*t
}

// seawaterRelViscosity returns μ_sw/μ_w at mass fraction w and tC °C:
//
//	μ_sw/μ_w = 1 + A w + B w²,  A = 1.541 + 1.998e-2 t − 9.52e-5 t²,
//	B = 7.974 − 7.561e-2 t + 4.724e-4 t²
//
// Source: Sharqawy, Lienhard & Zubair (2010), eqs. 22–23 (0–180 °C,
// 0–150 g/kg, ±1.5 %); coefficients as implemented in the MIT
// seawater-properties library (SW_Viscosity).
func seawaterRelViscosity(w, tC float64) float64 {
	t := tC
	a := 1.5409136040 + 1.9981117208e-2*t - 9.5203865864e-5*t*t
	b := 7.9739318223 - 7.5614568881e-2*t + 4.7237011074e-4*t*t
	return 1 + a*w + b*w*w
}
