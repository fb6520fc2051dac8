package thermo

import "math"

// Binary cation–anion Pitzer parameters for pairs that no library salt
// carries (a library salt of exactly the pair always comes first, so that
// single-salt results stay those of the salt's record), and the
// neutral-solute λ terms.
//
// Each parameter is a temperature function in the form of PHREEQC's
// pitzer.dat (Parkhurst & Appelo 2013, USGS Techniques and Methods 6-A43),
// from which the numbers were read as a compilation of published values:
//
//	p(T) = A0 + A1(1/T − 1/Tr) + A2 ln(T/Tr) + A3(T − Tr) + A4(T² − Tr²) + A5(1/T² − 1/Tr²),  Tr = 298.15 K
//
// so p(298.15 K) = A0, the 25 °C value. Most entries have A0 only (25 °C
// data, flagged by Mixture away from 25 °C) or A0 and A3, a first
// temperature derivative at 25 °C. The primary source of every A0 is named
// in the entry's src, that of the temperature terms in tsrc.

// tcoef holds A0…A5 of a pitzer.dat temperature function.
type tcoef [6]float64

// at evaluates the function at tK.
func (c tcoef) at(tK float64) float64 {
	const tr = ReferenceK
	if tK == tr {
		return c[0]
	}
	return c[0] + c[1]*(1/tK-1/tr) + c[2]*math.Log(tK/tr) + c[3]*(tK-tr) +
		c[4]*(tK*tK-tr*tr) + c[5]*(1/(tK*tK)-1/(tr*tr))
}

// hasT reports whether the function has temperature terms.
func (c tcoef) hasT() bool { return c[1] != 0 || c[2] != 0 || c[3] != 0 || c[4] != 0 || c[5] != 0 }

// pairData is one cation–anion pair's binary parameters.
type pairData struct {
	b0, b1, b2, cphi tcoef
	// a1, a2 override α₁ and α₂ (zero: the HMW 1984 convention, α₁ = 2
	// and, with β⁽²⁾, α₂ = 12; α₁ = 1.4, α₂ = 12 for 2-2 pairs).
	a1, a2 float64
	src    string // primary source of the 25 °C values
	tsrc   string // source of the temperature terms ("" when none)
}

// Sources of the pair table, named once.
const (
	srcHMW84T1 = "Harvie, Møller & Weare (1984) Geochim. Cosmochim. Acta 48:723, Table 1"
	srcPM73    = "Pitzer & Mayorga (1973) J. Phys. Chem. 77:2300, Tables I and VI (plain convention)"
	srcSP78    = "first temperature derivatives at 25 °C of Silvester & Pitzer (1978) J. Solution Chem. 7:327 (Pitzer 1991 ch. 3, Tables 12–13), as compiled in pitzer.dat"
	srcFW86    = "Felmy & Weare (1986) Geochim. Cosmochim. Acta 50:2771 (the borate system), as compiled in pitzer.dat"
	srcPP82    = "Peiper & Pitzer (1982) J. Chem. Thermodyn. 14:613, first temperature derivatives, as compiled in pitzer.dat"
	srcCompT   = "temperature derivatives as compiled in pitzer.dat; the compilation names no primary source"
	srcComp    = "pitzer.dat compilation; the compilation names no primary source (not verified against a paper)"
)

// pairTable: key {cation, anion}.
var pairTable = map[[2]string]pairData{
	// HMW 1984 Table 1, the pairs of the Na–K–Mg–Ca–H–Cl–SO4–OH–HCO3–CO3
	// system that no library salt holds.
	{"Ca+2", "SO4-2"}: {b0: tcoef{0.2}, b1: tcoef{3.1973, 0, 0, 5.46e-2}, b2: tcoef{-54.24, 0, 0, -0.516},
		src: srcHMW84T1, tsrc: srcCompT},
	{"Ca+2", "HCO3-"}:  {b0: tcoef{0.4}, b1: tcoef{2.977}, src: srcHMW84T1},
	{"Ca+2", "OH-"}:    {b0: tcoef{-0.1747}, b1: tcoef{-0.2303}, b2: tcoef{-5.72}, src: srcHMW84T1},
	{"Ca+2", "HSO4-"}:  {b0: tcoef{0.2145}, b1: tcoef{2.53}, src: srcHMW84T1},
	{"Mg+2", "HCO3-"}:  {b0: tcoef{0.329}, b1: tcoef{0.6072}, src: srcHMW84T1},
	{"Mg+2", "HSO4-"}:  {b0: tcoef{0.4746}, b1: tcoef{1.729}, src: srcHMW84T1},
	{"Na+", "CO3-2"}:   {b0: tcoef{0.0399, 0, 0, 1.79e-3}, b1: tcoef{1.389, 0, 0, 2.05e-3}, cphi: tcoef{0.0044}, src: srcHMW84T1, tsrc: srcPP82},
	{"K+", "CO3-2"}:    {b0: tcoef{0.1488, 0, 0, 1.788e-3}, b1: tcoef{1.43, 0, 0, 2.051e-3}, cphi: tcoef{-0.0015}, src: srcHMW84T1, tsrc: srcCompT},
	{"Na+", "OH-"}:     {b0: tcoef{0.0864, 0, 0, 7.00e-4}, b1: tcoef{0.253, 0, 0, 1.34e-4}, cphi: tcoef{0.0044, 0, 0, -18.94e-5}, src: srcHMW84T1, tsrc: srcSP78},
	{"K+", "OH-"}:      {b0: tcoef{0.1298}, b1: tcoef{0.32}, cphi: tcoef{0.0041}, src: srcHMW84T1},
	{"H+", "Cl-"}:      {b0: tcoef{0.1775, 0, 0, -3.081e-4}, b1: tcoef{0.2945, 0, 0, 1.419e-4}, cphi: tcoef{0.0008, 0, 0, 6.213e-5}, src: srcHMW84T1, tsrc: srcSP78},
	{"H+", "SO4-2"}:    {b0: tcoef{0.0298}, cphi: tcoef{0.0438}, src: srcHMW84T1},
	{"H+", "HSO4-"}:    {b0: tcoef{0.2065}, b1: tcoef{0.5556}, src: srcHMW84T1},
	{"Na+", "HSO4-"}:   {b0: tcoef{0.0454}, b1: tcoef{0.398}, src: srcHMW84T1},
	{"K+", "HSO4-"}:    {b0: tcoef{-0.0003}, b1: tcoef{0.1735}, src: srcHMW84T1},
	{"Na+", "HCO3-"}:   {b0: tcoef{0.0277, 0, 0, 1.00e-3}, b1: tcoef{0.0411, 0, 0, 1.10e-3}, src: srcHMW84T1, tsrc: srcPP82},
	{"K+", "HCO3-"}:    {b0: tcoef{0.0296, 0, 0, 0.996e-3}, b1: tcoef{-0.013, 0, 0, 1.104e-3}, cphi: tcoef{-0.008}, src: srcHMW84T1, tsrc: srcCompT},
	{"Ca+2", "Cl-"}:    {b0: tcoef{0.3159}, b1: tcoef{1.614}, cphi: tcoef{-0.00034}, src: srcHMW84T1},
	{"Mg+2", "Cl-"}:    {b0: tcoef{0.35235}, b1: tcoef{1.6815}, cphi: tcoef{0.00519}, src: srcHMW84T1},
	{"Mg+2", "SO4-2"}:  {b0: tcoef{0.221}, b1: tcoef{3.343}, b2: tcoef{-37.23}, cphi: tcoef{0.025}, src: srcHMW84T1},
	{"Na+", "SO4-2"}:   {b0: tcoef{0.01958}, b1: tcoef{1.113}, cphi: tcoef{0.00497}, src: srcHMW84T1},
	{"K+", "SO4-2"}:    {b0: tcoef{0.04995}, b1: tcoef{0.7793}, src: srcHMW84T1},
	{"Na+", "Cl-"}:     {b0: tcoef{0.0765}, b1: tcoef{0.2664}, cphi: tcoef{0.00127}, src: srcHMW84T1},
	{"K+", "Cl-"}:      {b0: tcoef{0.04835}, b1: tcoef{0.2122}, cphi: tcoef{-0.00084}, src: srcHMW84T1},
	{"Sr+2", "Cl-"}:    {b0: tcoef{0.2858, 0, 0, 0.717e-3}, b1: tcoef{1.667, 0, 0, 2.8425e-3}, cphi: tcoef{-0.0013}, src: srcPM73, tsrc: srcSP78},
	{"Sr+2", "Br-"}:    {b0: tcoef{0.331125, 0, 0, -0.32775e-3}, b1: tcoef{1.7115, 0, 0, 6.5325e-3}, cphi: tcoef{0.00122506}, src: srcPM73, tsrc: srcSP78},
	{"Mg+2", "Br-"}:    {b0: tcoef{0.4327, 0, 0, -5.625e-5}, b1: tcoef{1.753, 0, 0, 3.8625e-3}, cphi: tcoef{0.00312}, src: srcPM73, tsrc: srcSP78},
	{"Ca+2", "Br-"}:    {b0: tcoef{0.3816, 0, 0, -5.2275e-4}, b1: tcoef{1.613, 0, 0, 6.0375e-3}, cphi: tcoef{-0.00257}, src: srcPM73, tsrc: srcSP78},
	{"H+", "Br-"}:      {b0: tcoef{0.1960, 0, 0, -2.049e-4}, b1: tcoef{0.3564, 0, 0, 4.467e-4}, cphi: tcoef{0.00827, 0, 0, -5.685e-5}, src: srcPM73, tsrc: srcSP78},
	{"Li+", "Br-"}:     {b0: tcoef{0.1748, 0, 0, -1.819e-4}, b1: tcoef{0.2547, 0, 0, 6.636e-4}, cphi: tcoef{0.0053, 0, 0, -2.813e-5}, src: srcPM73, tsrc: srcSP78},
	{"Na+", "B(OH)4-"}: {b0: tcoef{-0.0427}, b1: tcoef{0.089}, cphi: tcoef{0.0114}, src: srcFW86},
	{"K+", "B(OH)4-"}:  {b0: tcoef{0.035}, b1: tcoef{0.14}, src: srcFW86},
	// Sr–SO4 is CaSO4's β⁽¹⁾, β⁽²⁾ with β⁽⁰⁾ = 0.200 in the compilation
	// (an analogy, not a fit to SrSO4 data as far as we know); Sr–HCO3 is
	// a lone β⁽⁰⁾ there.
	{"Sr+2", "SO4-2"}: {b0: tcoef{0.200, 0, 0, -2.9e-3}, b1: tcoef{3.1973, 0, 0, 27.0e-3}, b2: tcoef{-54.24, 0, 0, -0.42}, src: srcComp, tsrc: srcCompT},
	{"Sr+2", "HCO3-"}: {b0: tcoef{0.12}, src: srcComp},
}

// pairTRange is where a pair's first temperature derivatives are used
// without a warning: 0–50 °C, 25 ± 25 K (common practice: a linear
// expansion about 25 °C).
var pairTRange = [2]float64{ZeroCelsiusK, ZeroCelsiusK + 50}

// lambdaNeutral holds λ between a neutral solute and an ion (25 °C): key
// {neutral, ion}. CO₂(aq) with the seawater ions: Harvie, Møller & Weare
// (1984) Table 2 (their fit to CO₂ solubility in salt solutions), as
// compiled in pitzer.dat.
var lambdaNeutral = map[[2]string]float64{
	{"CO2", "Na+"}: 0.085, {"CO2", "K+"}: 0.051, {"CO2", "Mg+2"}: 0.183, {"CO2", "Ca+2"}: 0.183,
	{"CO2", "Cl-"}: -0.005, {"CO2", "SO4-2"}: 0.097, {"CO2", "HSO4-"}: -0.003,
}

// pairParams returns the table's parameters for a cation–anion pair at
// tK as a binary and whether the pair is tabulated; b.inRange says whether
// tK is inside the range of its temperature data (25 ± 5 K for 25 °C-only data, the
// library's rule; pairTRange with derivatives).
func pairParams(cat, an string, zc, za, tK float64) (b binary, ok bool) {
	d, ok := pairTable[[2]string{cat, an}]
	if !ok {
		return binary{}, false
	}
	b = binary{set: true, b0: d.b0.at(tK), b1: d.b1.at(tK), b2: d.b2.at(tK), cphi: d.cphi.at(tK), fromSolute: cat + "–" + an}
	b.a1, b.a2 = 2, 12
	if math.Abs(zc*za) >= 4 {
		b.a1 = 1.4
	}
	if d.a1 != 0 {
		b.a1 = d.a1
	}
	if d.a2 != 0 {
		b.a2 = d.a2
	}
	if d.b0.hasT() || d.b1.hasT() || d.b2.hasT() || d.cphi.hasT() {
		b.inRange = tK >= pairTRange[0]-1e-9 && tK <= pairTRange[1]+1e-9
	} else {
		b.inRange = math.Abs(tK-ReferenceK) <= 5
	}
	return b, true
}
