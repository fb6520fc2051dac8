package thermo

import "sort"

// Like-ion mixing parameters of the Pitzer model at 25 °C: θ for a pair of
// ions of the same sign, ψ for that pair with an ion of the other sign.
// Source: Harvie, Møller & Weare (1984) Geochim. Cosmochim. Acta 48:723,
// Table 2 (the Na–K–Mg–Ca–H–Cl–SO4–OH–HCO3–CO3–CO2–H2O system at 25 °C),
// read from its compilation in PHREEQC's pitzer.dat (Parkhurst & Appelo
// 2013, USGS Techniques and Methods 6-A43), which prints these values
// unchanged. 25 °C data: Mixture flags their use at other temperatures.
var mixTheta = map[[2]string]float64{
	{"K+", "Na+"}: -0.012, {"Ca+2", "Na+"}: 0.07, {"Mg+2", "Na+"}: 0.07,
	{"Ca+2", "K+"}: 0.032, {"Ca+2", "Mg+2"}: 0.007,
	{"H+", "Na+"}: 0.036, {"H+", "K+"}: 0.005, {"H+", "Mg+2"}: 0.1, {"Ca+2", "H+"}: 0.092,
	{"Cl-", "SO4-2"}: 0.02, {"Cl-", "HCO3-"}: 0.03, {"CO3-2", "Cl-"}: -0.02, {"Cl-", "OH-"}: -0.05,
	{"HCO3-", "SO4-2"}: 0.01, {"CO3-2", "SO4-2"}: 0.02, {"OH-", "SO4-2"}: -0.013,
	{"CO3-2", "HCO3-"}: -0.04, {"CO3-2", "OH-"}: 0.1,
}

// mixPsi: key is the like pair (sorted) and then the third ion.
var mixPsi = map[[3]string]float64{
	{"K+", "Na+", "Cl-"}: -0.0018, {"Ca+2", "Na+", "Cl-"}: -0.007, {"Mg+2", "Na+", "Cl-"}: -0.012,
	{"K+", "Mg+2", "Cl-"}: -0.022, {"Ca+2", "K+", "Cl-"}: -0.025, {"Ca+2", "Mg+2", "Cl-"}: -0.012,
	{"K+", "Na+", "SO4-2"}: -0.010, {"Ca+2", "Na+", "SO4-2"}: -0.055, {"Mg+2", "Na+", "SO4-2"}: -0.015,
	{"K+", "Mg+2", "SO4-2"}: -0.048, {"Ca+2", "Mg+2", "SO4-2"}: 0.024,
	{"Cl-", "SO4-2", "Na+"}: 0.0014, {"Cl-", "SO4-2", "Ca+2"}: -0.018, {"Cl-", "SO4-2", "Mg+2"}: -0.004,
	{"Cl-", "HCO3-", "Na+"}: -0.015, {"Cl-", "HCO3-", "Mg+2"}: -0.096, {"HCO3-", "SO4-2", "Na+"}: -0.005,
	{"HCO3-", "SO4-2", "Mg+2"}: -0.161, {"CO3-2", "Cl-", "Na+"}: 0.0085, {"CO3-2", "Cl-", "K+"}: 0.004,
	{"CO3-2", "SO4-2", "Na+"}: -0.005, {"CO3-2", "SO4-2", "K+"}: -0.009,
}

// likeKey orders a pair of symbols as the tables do.
func likeKey(a, b string) [2]string {
	p := []string{a, b}
	sort.Strings(p)
	return [2]string{p[0], p[1]}
}

// fillMixing sets θ and ψ for the mixture's ions from the tables and
// reports whether any was set (so a caller can flag 25 °C data).
func (mx *Mixture) fillMixing() bool {
	set := false
	n := len(mx.ions)
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			if mx.z[i]*mx.z[j] <= 0 {
				continue
			}
			key := likeKey(mx.ions[i].Symbol, mx.ions[j].Symbol)
			if th, ok := mixTheta[key]; ok {
				mx.theta[i][j], mx.theta[j][i] = th, th
				set = true
			}
			for k := 0; k < n; k++ {
				if mx.z[k]*mx.z[i] >= 0 {
					continue
				}
				if ps, ok := mixPsi[[3]string{key[0], key[1], mx.ions[k].Symbol}]; ok {
					mx.psi[i][j][k], mx.psi[j][i][k] = ps, ps
					set = true
				}
			}
		}
	}
	return set
}
