package water

import "math"

// if97Sat are the coefficients n1…n10 of the saturation equation of
// IAPWS-IF97 (IAPWS 2007, "Revised Release on the IAPWS Industrial
// Formulation 1997 for the Thermodynamic Properties of Water and Steam",
// eq. 30 and Table 34).
var if97Sat = [10]float64{
	0.11670521452767e4, -0.72421316598421e6, -0.17073846940092e2,
	0.12020824702470e5, -0.32325550322333e7, 0.14915108613530e2,
	-0.48232657361591e4, 0.40511340542057e6, -0.23855557567849,
	0.65017534844798e3,
}

// SaturationPressurePa returns the vapour pressure of pure water at tK, in
// Pa, from the saturation equation of IAPWS-IF97 (eq. 30), valid from
// 273.15 K to the critical point:
//
//	ϑ = T + n9/(T − n10),  A = ϑ² + n1ϑ + n2,  B = n3ϑ² + n4ϑ + n5,  C = n6ϑ² + n7ϑ + n8
//	p/MPa = [2C / (−B + √(B² − 4AC))]⁴
//
// It matches IAPWS-95 to within 10⁻⁴ relative from 0 to 100 °C (the
// release states ±0.1 % against IAPWS-95 over its range; tested against
// python3-iapws).
//
// Special cases are:
//
//	SaturationPressurePa(NaN) = NaN
func SaturationPressurePa(tK float64) float64 {
	n := &if97Sat
	th := tK + n[8]/(tK-n[9])
	a := th*th + n[0]*th + n[1]
	b := n[2]*th*th + n[3]*th + n[4]
	c := n[5]*th*th + n[6]*th + n[7]
	p := 2 * c / (-b + math.Sqrt(b*b-4*a*c))
	p *= p
	return p * p * 1e6
}

// LatentHeatJPerKg returns the enthalpy of vaporisation of pure water at
// saturation at tK, in J/kg, from the correlation of Sharqawy, Lienhard &
// Zubair (2010), Desalination and Water Treatment 16:354, eq. 54 (a fit to
// IAPWS-95 from 0 to 200 °C; coefficients from memory, checked against
// python3-iapws to 10⁻⁴):
//
//	h_fg = 2.501×10⁶ − 2.369×10³ t + 2.678×10⁻¹ t² − 8.103×10⁻³ t³ − 2.079×10⁻⁵ t⁴,  t in °C
//
// Special cases are:
//
//	LatentHeatJPerKg(NaN) = NaN
func LatentHeatJPerKg(tK float64) float64 {
	t := tK - celsiusOffsetK
	return 2.501e6 + t*(-2.369e3+t*(2.678e-1+t*(-8.103e-3+t*-2.079e-5)))
}
