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

// More θ and ψ of Harvie, Møller & Weare (1984) Table 2, for the H⁺, OH⁻,
// HSO₄⁻ and carbonate ions (same compilation).
var mixThetaHMW = map[[2]string]float64{
	{"Cl-", "HSO4-"}: -0.006,
}

var mixPsiHMW = map[[3]string]float64{
	{"Ca+2", "H+", "Cl-"}: -0.015, {"H+", "K+", "Cl-"}: -0.011, {"H+", "Mg+2", "Cl-"}: -0.011, {"H+", "Na+", "Cl-"}: -0.004,
	{"H+", "K+", "HSO4-"}: -0.0265, {"H+", "Mg+2", "HSO4-"}: -0.0178, {"H+", "Na+", "HSO4-"}: -0.0129,
	{"H+", "K+", "SO4-2"}:  0.197,
	{"K+", "Na+", "CO3-2"}: 0.003, {"K+", "Na+", "HCO3-"}: -0.003,
	{"Cl-", "HSO4-", "H+"}: 0.013, {"Cl-", "HSO4-", "Na+"}: -0.006,
	{"Cl-", "OH-", "K+"}: -0.006, {"Cl-", "OH-", "Na+"}: -0.006, {"Cl-", "OH-", "Ca+2"}: -0.025,
	{"CO3-2", "HCO3-", "K+"}: 0.012, {"CO3-2", "HCO3-", "Na+"}: 0.002,
	{"CO3-2", "OH-", "K+"}: -0.01, {"CO3-2", "OH-", "Na+"}: -0.017,
	{"HSO4-", "SO4-2", "K+"}: -0.0677, {"HSO4-", "SO4-2", "Mg+2"}: -0.0425, {"HSO4-", "SO4-2", "Na+"}: -0.0094,
	{"OH-", "SO4-2", "K+"}: -0.050, {"OH-", "SO4-2", "Na+"}: -0.009,
}

// θ and ψ of the seawater minor ions, from other papers, as compiled in
// pitzer.dat: borate (B(OH)₄⁻) from Felmy & Weare (1986) Geochim.
// Cosmochim. Acta 50:2771; bromide and strontium from the same
// compilation, which names no primary source for them (Pitzer & Kim 1974,
// J. Am. Chem. Soc. 96:5701, for the bromide mixtures, from memory,
// unverified). 25 °C data.
var mixThetaOther = map[[2]string]float64{
	{"B(OH)4-", "Cl-"}: -0.065, {"B(OH)4-", "SO4-2"}: -0.012,
	{"Br-", "OH-"}: -0.065, {"Na+", "Sr+2"}: 0.051,
}

var mixPsiOther = map[[3]string]float64{
	{"B(OH)4-", "Cl-", "Na+"}: -0.0073,
	{"Br-", "Cl-", "K+"}:      0, // tabulated as zero
	{"K+", "Na+", "Br-"}:      -0.0022, {"Br-", "OH-", "K+"}: -0.014, {"Br-", "OH-", "Na+"}: -0.018,
	{"H+", "Na+", "Br-"}: -0.012, {"H+", "K+", "Br-"}: -0.021,
	{"Na+", "Sr+2", "Cl-"}: -0.0021,
}

// likeKey orders a pair of symbols as the tables do.
func likeKey(a, b string) [2]string {
	p := []string{a, b}
	sort.Strings(p)
	return [2]string{p[0], p[1]}
}

func lookTheta(key [2]string) (float64, bool) {
	for _, t := range []map[[2]string]float64{mixTheta, mixThetaHMW, mixThetaOther} {
		if v, ok := t[key]; ok {
			return v, true
		}
	}
	return 0, false
}

// psiListed reports whether any ψ of the like pair key is tabulated.
func psiListed(key [2]string) bool {
	for _, t := range []map[[3]string]float64{mixPsi, mixPsiHMW, mixPsiOther} {
		for k := range t {
			if k[0] == key[0] && k[1] == key[1] {
				return true
			}
		}
	}
	return false
}

func lookPsi(key [3]string) (float64, bool) {
	for _, t := range []map[[3]string]float64{mixPsi, mixPsiHMW, mixPsiOther} {
		if v, ok := t[key]; ok {
			return v, true
		}
	}
	return 0, false
}

// fillMixing builds the like-charged pair terms (θ, ψ, charges for ᴱθ) of
// the mixture's ions from the tables, records the pairs without θ, and
// reports whether any θ or ψ was set (so a caller can flag 25 °C data).
func (mx *Mixture) fillMixing() bool {
	set := false
	for _, group := range [2][2][]int{{mx.cat, mx.an}, {mx.an, mx.cat}} {
		ions, other := group[0], group[1]
		for x := 0; x < len(ions); x++ {
			for y := x + 1; y < len(ions); y++ {
				i, j := ions[x], ions[y]
				key := likeKey(mx.ions[i].Symbol, mx.ions[j].Symbol)
				l := likeTerm{i: i, j: j, zi: abs(mx.ions[i].Charge), zj: abs(mx.ions[j].Charge)}
				if th, ok := lookTheta(key); ok {
					l.theta = th
					set = true
				} else if !psiListed(key) {
					// A pair with ψ values but no θ was fitted with θ = 0
					// (e.g. K⁺–Mg²⁺ in HMW 1984 Table 2): data, not a gap.
					mx.missingTheta = append(mx.missingTheta, key[0]+"/"+key[1])
				}
				for _, k := range other {
					if ps, ok := lookPsi([3]string{key[0], key[1], mx.ions[k].Symbol}); ok && ps != 0 {
						l.psi = append(l.psi, psiTerm{k: k, v: ps})
						set = true
					}
				}
				mx.like = append(mx.like, l)
			}
		}
	}
	return set
}

func abs(z int) int {
	if z < 0 {
		return -z
	}
	return z
}
