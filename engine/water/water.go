// Package water gives properties of pure liquid water at 0.101325 MPa
// (1 atm) from 0 to 100 °C, from published correlations: density (Kell 1975),
// molar volume, viscosity (IAPWS 2008) and static relative permittivity
// (IAPWS 1997).
//
// Every function takes the thermodynamic temperature in kelvin on ITS-90 and
// is valid for MinTemperatureK ≤ tK ≤ MaxTemperatureK. The functions do not
// validate their argument: outside that range they return the value of the
// formula, which may be meaningless (and far away, ±Inf or NaN); callers
// check the temperature with InRange first. Inside the range every function
// returns a finite, positive value.
//
// The functions are pure, allocation-free and safe for concurrent use.
package water

import "math"

// MolarMassKgPerMol is the molar mass of water, in kg/mol:
// 2·A_r(H) + A_r(O) = 2·1.00794 + 15.9994 = 18.01528 g/mol, from the IUPAC
// standard atomic weights in use before 2009 (from memory), which carry an
// uncertainty of about ±0.0004 g/mol. IAPWS-95 uses 18.015268 g/mol; the 0.7 ppm
// difference is far below every accuracy quoted in this package.
const MolarMassKgPerMol = 0.01801528

// The temperature range of this package, in kelvin: 0 °C to 100 °C.
const (
	MinTemperatureK = 273.15
	MaxTemperatureK = 373.15
)

// celsiusOffsetK is the exact offset of the Celsius scale, in kelvin (SI).
const celsiusOffsetK = 273.15

// Reference constants of the IAPWS formulations for viscosity (2008) and
// dielectric constant (1997): critical temperature and density of water, as
// in IAPWS-95 (Wagner & Pruß 2002, J. Phys. Chem. Ref. Data 31:387). Exact
// by definition in those releases.
const (
	criticalTemperatureK       = 647.096
	criticalDensityKgPerM3     = 322.0
	iapwsMolarMassKgPerMol     = 0.018015268 // IAPWS-95 molar mass, used by the dielectric release
	viscosityReferencePaS      = 1e-6        // μ* of the IAPWS 2008 release
	dielectricSingularTempK    = 228.0       // the 228 K in the g-factor term of the 1997 release
	dielectricSingularExponent = -1.2        // its exponent
)

// InRange reports whether tK lies within [MinTemperatureK, MaxTemperatureK],
// the range in which the functions of this package are valid.
//
// Special cases are:
//
//	InRange(NaN) = false
//	InRange(±Inf) = false
func InRange(tK float64) bool {
	return tK >= MinTemperatureK && tK <= MaxTemperatureK
}

// Density returns the density of air-free liquid water at 0.101325 MPa, in
// kg/m³, from Kell's equation
//
//	ρ = (999.83952 + 16.945176 t − 7.9870401×10⁻³ t² − 46.170461×10⁻⁶ t³
//	     + 105.56302×10⁻⁹ t⁴ − 280.54253×10⁻¹² t⁵) / (1 + 16.879850×10⁻³ t)
//
// with t = tK − 273.15 in °C.
//
// Source: G. S. Kell (1975), "Density, thermal expansivity, and
// compressibility of liquid water from 0 °C to 150 °C", J. Chem. Eng. Data
// 20:97–105, eq. 16, valid 0–150 °C at 1 atm. (Jones & Harris 1992,
// J. Res. NIST 97:335, eq. 1, reprints it with the denominator misprinted as
// 16.897850×10⁻³, which is 650 ppm off at 100 °C; the value above is Kell's.)
//
// Kell wrote t on IPTS-68; it is used here with the ITS-90 temperature. The
// difference (t68 − t90 ≈ 0.026 K at 100 °C) shifts ρ by at most ~2×10⁻⁵.
// Against IAPWS-95 at 0.101325 MPa (python3-iapws 1.5.2) the relative
// deviation is at most 1.5×10⁻⁵ from 0 to 100 °C (see water_test.go).
//
// Special cases are:
//
//	Density(NaN) = NaN
//	Density(±Inf) = NaN
//	Density(tK) for tK outside [273.15, 373.15] K is Kell's formula
//	  extrapolated (still defined to 150 °C by Kell); it has a pole at
//	  t = −59.24 °C (tK ≈ 213.91 K) and is not physical far from the range.
func Density(tK float64) float64 {
	t := tK - celsiusOffsetK
	// Kell (1975) eq. 16, numerator in Horner form.
	num := 999.83952 + t*(16.945176+t*(-7.9870401e-3+t*(-46.170461e-6+t*(105.56302e-9+t*(-280.54253e-12)))))
	return num / (1 + 16.879850e-3*t)
}

// MolarVolume returns the molar volume of liquid water at 0.101325 MPa, in
// m³/mol:
//
//	V_m = M / ρ(T)
//
// with M = MolarMassKgPerMol and ρ from Density (Kell 1975). Its accuracy is
// that of Density: within 1.5×10⁻⁵ of IAPWS-95 from 0 to 100 °C.
//
// Special cases are:
//
//	MolarVolume(NaN) = MolarVolume(±Inf) = NaN
//	MolarVolume(tK) outside the range follows Density (±Inf at its pole).
func MolarVolume(tK float64) float64 {
	return MolarMassKgPerMol / Density(tK)
}

// Viscosity returns the dynamic viscosity of liquid water at 0.101325 MPa,
// in Pa·s, from the IAPWS 2008 formulation evaluated at ρ = Density(tK):
//
//	μ = μ* · μ̄0(T̄) · μ̄1(T̄, ρ̄) · μ̄2,   T̄ = T/647.096 K, ρ̄ = ρ/(322 kg/m³), μ* = 1 µPa·s
//	μ̄0 = 100 √T̄ / Σ_{i=0..3} H_i / T̄^i
//	μ̄1 = exp[ ρ̄ Σ_{i=0..5} Σ_{j=0..6} H_ij (1/T̄ − 1)^i (ρ̄ − 1)^j ]
//
// Source: IAPWS (2008), "Release on the IAPWS Formulation 2008 for the
// Viscosity of Ordinary Water Substance"; M. L. Huber et al. (2009), "New
// international formulation for the viscosity of H2O", J. Phys. Chem. Ref.
// Data 38:101–125, eqs. 10–12 with H_i from their Table 2 and H_ij from
// their Table 3.
//
// The critical enhancement μ̄2 is taken as 1: it matters only close to the
// critical point (647 K, 322 kg/m³). Over 0–100 °C at 0.101325 MPa the
// release's own μ̄2, as evaluated by python3-iapws 1.5.2, is exactly 1
// (testdata/water_iapws95.csv header).
//
// Against the full IAPWS 2008 + IAPWS-95 evaluation (python3-iapws) the
// relative deviation is at most 3×10⁻⁵ (only the density input differs); the
// formulation itself represents the best experimental data at these
// conditions to about 1 % (Huber et al. 2009, from memory).
//
// Special cases are:
//
//	Viscosity(NaN) = Viscosity(±Inf) = NaN
//	Viscosity(tK) outside the range is the formulation evaluated at Kell's
//	  extrapolated density; not physical far from the range.
func Viscosity(tK float64) float64 {
	return viscosity(Density(tK), tK)
}

// viscosityH holds H_i of eq. 11 (Huber et al. 2009, Table 2).
var viscosityH = [4]float64{1.67752, 2.20462, 0.6366564, -0.241605}

// viscosityHij holds H_ij of eq. 12 (Huber et al. 2009, Table 3),
// indexed [j][i]: row j is the power of (ρ̄ − 1), column i the power of
// (1/T̄ − 1). Absent coefficients are zero.
var viscosityHij = [7][6]float64{
	{5.20094e-1, 8.50895e-2, -1.08374, -2.89555e-1, 0, 0},
	{2.22531e-1, 9.99115e-1, 1.88797, 1.26613, 0, 1.20573e-1},
	{-2.81378e-1, -9.06851e-1, -7.72479e-1, -4.89837e-1, -2.57040e-1, 0},
	{1.61913e-1, 2.57399e-1, 0, 0, 0, 0},
	{-3.25372e-2, 0, 0, 6.98452e-2, 0, 0},
	{0, 0, 0, 0, 8.72102e-3, 0},
	{0, 0, 0, -4.35673e-3, 0, -5.93264e-4},
}

// viscosity returns μ̄0·μ̄1·μ* of the IAPWS 2008 release, in Pa·s, for density
// rhoKgPerM3 and temperature tK (μ̄2 = 1).
func viscosity(rhoKgPerM3, tK float64) float64 {
	tr := tK / criticalTemperatureK
	dr := rhoKgPerM3 / criticalDensityKgPerM3

	// Eq. 11: ideal-gas limit μ̄0.
	inv := 1 / tr
	den := viscosityH[0] + inv*(viscosityH[1]+inv*(viscosityH[2]+inv*viscosityH[3]))
	mu0 := 100 * math.Sqrt(tr) / den

	// Eq. 12: residual factor μ̄1, as a polynomial in y = ρ̄−1 whose
	// coefficients are polynomials in x = 1/T̄−1 (both in Horner form).
	x := inv - 1
	y := dr - 1
	var s float64
	for j := len(viscosityHij) - 1; j >= 0; j-- {
		row := &viscosityHij[j]
		var p float64
		for i := len(row) - 1; i >= 0; i-- {
			p = p*x + row[i]
		}
		s = s*y + p
	}
	mu1 := math.Exp(dr * s)

	return viscosityReferencePaS * mu0 * mu1
}

// DielectricConstant returns the static relative permittivity ε of liquid
// water at 0.101325 MPa (dimensionless), from the IAPWS 1997 formulation
// evaluated at ρ = Density(tK):
//
//	ε = [1 + A + 5B + √(9 + 2A + 18B + A² + 10AB + 9B²)] / [4(1 − B)]
//	A = N_A μ² ρ g / (M ε₀ k T),   B = N_A α ρ / (3 M ε₀)
//	g = 1 + Σ_{k=1..11} N_k δ^{i_k} (T_c/T)^{j_k} + N_12 δ (T/228 K − 1)^−1.2,   δ = ρ/ρ_c
//
// Source: IAPWS (1997), "Release on the Static Dielectric Constant of
// Ordinary Water Substance for Temperatures from 238 K to 873 K and
// Pressures up to 1000 MPa" (its equations for ε, A, B and g and its table of
// N_k, i_k, j_k); D. P. Fernández,
// A. R. H. Goodwin, E. W. Lemmon, J. M. H. Levelt Sengers and R. C. Williams
// (1997), J. Phys. Chem. Ref. Data 26:1125. The constants N_A, k, ε₀,
// μ and α are the release's own (CODATA 1986), not the 2019 SI values.
//
// Against the full IAPWS 1997 + IAPWS-95 evaluation (python3-iapws) the
// relative deviation is at most 2×10⁻⁵ (only the density input differs). The
// older Malmberg & Maryott (1956, J. Res. NBS 56:1) fit of measured data
// differs from it by up to 0.35 % over 0–100 °C (water_test.go).
//
// Special cases are:
//
//	DielectricConstant(NaN) = DielectricConstant(±Inf) = NaN
//	DielectricConstant(tK) = NaN for tK < 228 K and +Inf at 228 K (the
//	  g-factor's singular term); between 228 K and 273.15 K and above
//	  373.15 K it is the formulation at Kell's extrapolated density.
func DielectricConstant(tK float64) float64 {
	return dielectric(Density(tK), tK)
}

// Constants of the IAPWS 1997 dielectric release.
const (
	dielBoltzmannJPerK   = 1.380658e-23    // k
	dielAvogadroPerMol   = 6.0221367e23    // N_A
	dielVacuumPermFPerM  = 8.854187817e-12 // ε₀
	dielDipoleMomentCm   = 6.138e-30       // μ, dipole moment of the isolated molecule
	dielPolarizabilityC2 = 1.636e-40       // α, mean molecular polarizability, C² m² J⁻¹
)

// dielectricN holds N_1…N_12 of the IAPWS 1997 release. The
// exponents i_k (of δ) and j_k (of T_c/T) for k = 1…11 are
// i = 1 1 1 2 3 3 4 5 6 7 10 and j = 0.25 1 2.5 1.5 1.5 2.5 2 2 5 0.5 10;
// they are written out in dielectric.
var dielectricN = [12]float64{
	0.978224486826, -0.957771379375, 0.237511794148, 0.714692244396,
	-0.298217036956, -0.108863472196, 0.949327488264e-1, -0.980469816509e-2,
	0.165167634970e-4, 0.937359795772e-4, -0.123179218720e-9, 0.196096504426e-2,
}

// dielectric returns ε of the IAPWS 1997 release for density rhoKgPerM3 and
// temperature tK.
func dielectric(rhoKgPerM3, tK float64) float64 {
	n := &dielectricN
	d := rhoKgPerM3 / criticalDensityKgPerM3
	tau := criticalTemperatureK / tK

	// Powers without math.Pow: τ^½, τ^¼, τ^n and δ^n by products.
	s := math.Sqrt(tau)
	q := math.Sqrt(s)
	tau2 := tau * tau
	tau5 := tau2 * tau2 * tau
	tau10 := tau5 * tau5
	d2 := d * d
	d3 := d2 * d
	d4 := d2 * d2
	d5 := d4 * d
	d6 := d3 * d3
	d7 := d6 * d
	d10 := d5 * d5

	// The release's g-factor, term by term with its exponents (i_k, j_k).
	g := 1 +
		n[0]*d*q + // i=1, j=0.25
		n[1]*d*tau + // i=1, j=1
		n[2]*d*tau2*s + // i=1, j=2.5
		n[3]*d2*tau*s + // i=2, j=1.5
		n[4]*d3*tau*s + // i=3, j=1.5
		n[5]*d3*tau2*s + // i=3, j=2.5
		n[6]*d4*tau2 + // i=4, j=2
		n[7]*d5*tau2 + // i=5, j=2
		n[8]*d6*tau5 + // i=6, j=5
		n[9]*d7*s + // i=7, j=0.5
		n[10]*d10*tau10 + // i=10, j=10
		n[11]*d*math.Pow(tK/dielectricSingularTempK-1, dielectricSingularExponent) // k=12

	// A and B of the release; molar density ρ/M.
	rhoMolar := rhoKgPerM3 / iapwsMolarMassKgPerMol
	a := dielAvogadroPerMol * dielDipoleMomentCm * dielDipoleMomentCm * rhoMolar * g /
		(dielVacuumPermFPerM * dielBoltzmannJPerK * tK)
	b := dielAvogadroPerMol * dielPolarizabilityC2 * rhoMolar / (3 * dielVacuumPermFPerM)

	// ε from A and B (the release's closed form).
	return (1 + a + 5*b + math.Sqrt(9+2*a+18*b+a*a+10*a*b+9*b*b)) / (4 * (1 - b))
}
