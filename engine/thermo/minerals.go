package thermo

import (
	"math"

	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// Saturation is one mineral's saturation state in a mixture.
type Saturation struct {
	Mineral string  // lower-case mineral name, e.g. "gypsum"
	SI      float64 // saturation index log₁₀(IAP/K_sp); > 0 supersaturated
	LogKsp  float64 // log₁₀ K_sp at the mixture's temperature
	Source  string  // where K_sp and its temperature function come from
	// Warnings: a 25 °C-only K_sp used at another temperature, or a
	// temperature function used outside its range.
	Warnings []warn.Warning
}

// mineralStoich is one species of a mineral's dissolution reaction.
type mineralStoich struct {
	symbol string
	n      float64
}

// mineral is a solid phase: its dissolution reaction and log₁₀ K_sp(T).
type mineral struct {
	name  string
	ions  []mineralStoich
	water float64 // waters of hydration released
	// logK25 is log₁₀ K_sp at 25 °C. When anal is non-zero the
	// temperature function
	//
	//	f(T) = A1 + A2·T + A3/T + A4·log₁₀T + A5/T² + A6·T²
	//
	// gives log K(T) = f(T) when absolute, else logK25 + f(T) − f(298.15 K)
	// (the function as a difference, so that 25 °C keeps logK25).
	logK25   float64
	anal     [6]float64
	absolute bool
	// rangeC is the °C range where the temperature function is used
	// without a warning: the source's range where it states one, else
	// 0–100 °C cut at the hydrate's transition temperature (mirabilite
	// 32 °C, epsomite 48 °C: common practice, from memory).
	rangeC [2]float64
	src    string
}

const (
	srcHMW84T3 = "log K at 25 °C: Harvie, Møller & Weare (1984) Geochim. Cosmochim. Acta 48:723, Table 3, as compiled in PHREEQC's pitzer.dat"
	srcCompKT  = "; temperature function as compiled in pitzer.dat (the compilation names no primary source)"
	srcPB82    = "Plummer & Busenberg (1982) Geochim. Cosmochim. Acta 46:1011, log K(T) for 0–90 °C"
)

// minerals lists the solids SaturationIndices reports, in this order.
var minerals = []mineral{
	{name: "gypsum", ions: []mineralStoich{{"Ca+2", 1}, {"SO4-2", 1}}, water: 2, logK25: -4.581,
		anal: [6]float64{90.318, 0, -4213, -32.641}, rangeC: [2]float64{0, 100}, src: srcHMW84T3 + srcCompKT},
	{name: "anhydrite", ions: []mineralStoich{{"Ca+2", 1}, {"SO4-2", 1}}, logK25: -4.362,
		anal: [6]float64{87.836, 0, -3136.79, -32.953}, rangeC: [2]float64{50, 160},
		src: srcHMW84T3 + "; temperature function of Blount & Dickson (1973) Am. Mineral. 58:323 (50–160 °C), as compiled in pitzer.dat"},
	{name: "halite", ions: []mineralStoich{{"Na+", 1}, {"Cl-", 1}}, logK25: 1.570,
		anal: [6]float64{-713.4616, -0.1201241, 37302.21, 262.4583, -2106915}, rangeC: [2]float64{0, 100}, src: srcHMW84T3 + srcCompKT},
	{name: "sylvite", ions: []mineralStoich{{"K+", 1}, {"Cl-", 1}}, logK25: 0.900,
		anal: [6]float64{3.984, 0, -919.55}, rangeC: [2]float64{0, 100}, src: srcHMW84T3 + srcCompKT},
	{name: "mirabilite", ions: []mineralStoich{{"Na+", 2}, {"SO4-2", 1}}, water: 10, logK25: -1.214,
		anal: [6]float64{-3862.234, -1.19856, 93713.54, 1577.756}, rangeC: [2]float64{0, 32}, src: srcHMW84T3 + srcCompKT},
	{name: "epsomite", ions: []mineralStoich{{"Mg+2", 1}, {"SO4-2", 1}}, water: 7, logK25: -1.881,
		anal: [6]float64{1.718, 0, -1073}, rangeC: [2]float64{0, 48}, src: srcHMW84T3 + srcCompKT},
	{name: "hexahydrite", ions: []mineralStoich{{"Mg+2", 1}, {"SO4-2", 1}}, water: 6, logK25: -1.635,
		anal: [6]float64{-62.666, 0, 1828, 22.187}, rangeC: [2]float64{0, 100}, src: srcHMW84T3 + srcCompKT},
	{name: "kieserite", ions: []mineralStoich{{"Mg+2", 1}, {"SO4-2", 1}}, water: 1, logK25: -0.123, src: srcHMW84T3},
	{name: "bischofite", ions: []mineralStoich{{"Mg+2", 1}, {"Cl-", 2}}, water: 6, logK25: 4.455,
		anal: [6]float64{3.524, 0, 277.6}, rangeC: [2]float64{0, 100}, src: srcHMW84T3 + srcCompKT},
	{name: "carnallite", ions: []mineralStoich{{"K+", 1}, {"Mg+2", 1}, {"Cl-", 3}}, water: 6, logK25: 4.330, src: srcHMW84T3},
	{name: "glauberite", ions: []mineralStoich{{"Na+", 2}, {"Ca+2", 1}, {"SO4-2", 2}}, logK25: -5.245, src: srcHMW84T3},
	{name: "polyhalite", ions: []mineralStoich{{"K+", 2}, {"Mg+2", 1}, {"Ca+2", 2}, {"SO4-2", 4}}, water: 2, logK25: -13.744, src: srcHMW84T3},
	{name: "arcanite", ions: []mineralStoich{{"K+", 2}, {"SO4-2", 1}}, logK25: -1.776,
		src: "log K at 25 °C: Freyer & Voigt (2004) Geochim. Cosmochim. Acta 68:307, as compiled in pitzer.dat"},
	{name: "celestite", ions: []mineralStoich{{"Sr+2", 1}, {"SO4-2", 1}}, logK25: -6.630,
		anal: [6]float64{-7.14, 6.11e-3, 75, 0, 0, -1.79e-5}, rangeC: [2]float64{0, 100},
		src: "log K at 25 °C as compiled in pitzer.dat; temperature function of Howell et al. (1992) J. Chem. Eng. Data 37:464, as named there"},
	{name: "brucite", ions: []mineralStoich{{"Mg+2", 1}, {"OH-", 2}}, logK25: -10.88, src: srcHMW84T3},
	{name: "portlandite", ions: []mineralStoich{{"Ca+2", 1}, {"OH-", 2}}, logK25: -5.190, src: srcHMW84T3},
	{name: "calcite", ions: []mineralStoich{{"Ca+2", 1}, {"CO3-2", 1}}, absolute: true,
		anal: [6]float64{-171.9065, -0.077993, 2839.319, 71.595}, rangeC: [2]float64{0, 90}, src: srcPB82},
	{name: "aragonite", ions: []mineralStoich{{"Ca+2", 1}, {"CO3-2", 1}}, absolute: true,
		anal: [6]float64{-171.9773, -0.077993, 2903.293, 71.595}, rangeC: [2]float64{0, 90}, src: srcPB82},
}

// analyticLogK evaluates A1 + A2·T + A3/T + A4·log₁₀T + A5/T² + A6·T².
func analyticLogK(a [6]float64, tK float64) float64 {
	return a[0] + a[1]*tK + a[2]/tK + a[3]*math.Log10(tK) + a[4]/(tK*tK) + a[5]*tK*tK
}

// logKAt returns log₁₀ K_sp at tK and, when the data are used outside
// their range, a warning.
func (mn *mineral) logKAt(tK float64) (float64, []warn.Warning) {
	tC := tK - ZeroCelsiusK
	hasT := mn.anal != [6]float64{}
	var lk float64
	switch {
	case mn.absolute:
		lk = analyticLogK(mn.anal, tK)
	case hasT:
		lk = mn.logK25 + analyticLogK(mn.anal, tK) - analyticLogK(mn.anal, ReferenceK)
	default:
		lk = mn.logK25
	}
	var ws []warn.Warning
	switch {
	case !hasT && math.Abs(tK-ReferenceK) > 5:
		ws = append(ws, warn.New(warn.Temperature25C, mn.name,
			"%s: the solubility product is 25 °C data, used unchanged at %.4g °C", mn.name, tC))
	case hasT && (tC < mn.rangeC[0]-1e-9 || tC > mn.rangeC[1]+1e-9) && math.Abs(tK-ReferenceK) > 5:
		ws = append(ws, warn.New(warn.Temperature25C, mn.name,
			"%s: the solubility product's temperature function is used at %.4g °C, outside %g–%g °C", mn.name, tC, mn.rangeC[0], mn.rangeC[1]))
	}
	return lk, ws
}

// SaturationIndices returns the saturation index of each mineral whose
// ions are all in the mixture with positive molality, in a fixed order
// (gypsum, anhydrite, halite, sylvite, mirabilite, epsomite, hexahydrite,
// kieserite, bischofite, carnallite, glauberite, polyhalite, arcanite,
// celestite, brucite, portlandite, calcite, aragonite):
//
//	SI = log₁₀ IAP − log₁₀ K_sp,   log₁₀ IAP = Σᵢ νᵢ log₁₀(mᵢ γᵢ) + n_w log₁₀ a_w
//
// with the γᵢ and a_w of Eval and WaterActivity (n_w the waters of
// hydration), and K_sp(T) from the source named in each result: HMW 1984
// Table 3 at 25 °C (the K_sp consistent with the model's parameters) with
// the temperature functions as compiled in pitzer.dat where it has them;
// Plummer & Busenberg (1982) for calcite and aragonite. A 25 °C-only K_sp
// used more than 5 K away, or a function used outside its range, carries
// a warning.
//
// Special cases: a mineral with any ion absent or at zero (or negative)
// molality is omitted, so the result is never NaN; an empty mixture gives
// none. SaturationIndices allocates its result and its work slices (SaturationInto does not).
func (mx *Mixture) SaturationIndices(m []float64) []Saturation {
	si, has := make([]float64, len(minerals)), make([]bool, len(minerals))
	mx.SaturationInto(m, make([]float64, len(mx.ions)), si, has)
	var out []Saturation
	for k := range mx.minerals {
		ma := &mx.minerals[k]
		if has[ma.k] {
			out = append(out, Saturation{Mineral: ma.mn.name, SI: si[ma.k], LogKsp: ma.logK, Source: ma.mn.src, Warnings: ma.ws})
		}
	}
	return out
}

// mineralAt is a mineral whose ions are all in a mixture: their
// positions and log K_sp at the mixture's temperature.
type mineralAt struct {
	k    int // index in minerals
	mn   *mineral
	idx  []int
	logK float64
	ws   []warn.Warning
}

// prepareMinerals lists the minerals whose ions the mixture holds.
func (mx *Mixture) prepareMinerals() {
	for k := range minerals {
		mn := &minerals[k]
		ma := mineralAt{k: k, mn: mn}
		for _, st := range mn.ions {
			i, ok := mx.Index(st.symbol)
			if !ok {
				ma.idx = nil
				break
			}
			ma.idx = append(ma.idx, i)
		}
		if len(ma.idx) == len(mn.ions) {
			ma.logK, ma.ws = mn.logKAt(mx.tK)
			mx.minerals = append(mx.minerals, ma)
		}
	}
}

// mineralFormulas are the minerals' formulas, by name.
var mineralFormulas = map[string]string{
	"gypsum": "CaSO4·2H2O", "anhydrite": "CaSO4", "halite": "NaCl", "sylvite": "KCl",
	"mirabilite": "Na2SO4·10H2O", "epsomite": "MgSO4·7H2O", "hexahydrite": "MgSO4·6H2O",
	"kieserite": "MgSO4·H2O", "bischofite": "MgCl2·6H2O", "carnallite": "KMgCl3·6H2O",
	"glauberite": "Na2Ca(SO4)2", "polyhalite": "K2Ca2Mg(SO4)4·2H2O", "arcanite": "K2SO4",
	"celestite": "SrSO4", "brucite": "Mg(OH)2", "portlandite": "Ca(OH)2",
	"calcite": "CaCO3", "aragonite": "CaCO3",
}

// MineralCount is the number of minerals SaturationInto reports on.
func MineralCount() int { return len(minerals) }

// MineralName returns mineral k's lower-case name and its formula.
func MineralName(k int) (name, formula string) {
	return minerals[k].name, mineralFormulas[minerals[k].name]
}

// MineralSource names mineral k's solubility product.
func MineralSource(k int) string { return minerals[k].src }

// MineralWarnings returns the warnings of mineral k's solubility product
// at the mixture's temperature (25 °C data used elsewhere), or nil if the
// mixture lacks its ions.
func (mx *Mixture) MineralWarnings(k int) []warn.Warning {
	mx.mineralsOnce.Do(mx.prepareMinerals)
	for i := range mx.minerals {
		if mx.minerals[i].k == k {
			return mx.minerals[i].ws
		}
	}
	return nil
}

// SaturationInto is SaturationIndices without allocation, for hot loops:
// si[k] and has[k] (len MineralCount()) receive mineral k's index and
// whether it is defined at m; work needs len(Ions()) and is overwritten.
// It returns the mixture's φ.
func (mx *Mixture) SaturationInto(m, work, si []float64, has []bool) float64 {
	mx.mineralsOnce.Do(mx.prepareMinerals)
	for k := range has {
		has[k], si[k] = false, 0
	}
	lg := work[:len(mx.ions)]
	phi := mx.Eval(m, lg)
	sum := 0.0
	for _, mi := range m {
		sum += mi
	}
	log10aw := -water.MolarMassKgPerMol * phi * sum / math.Ln10
	for i := range lg {
		if m[i] > 0 {
			lg[i] = math.Log10(m[i]) + lg[i]/math.Ln10
		}
	}
	for k := range mx.minerals {
		ma := &mx.minerals[k]
		logIAP := ma.mn.water * log10aw
		ok := true
		for j, st := range ma.mn.ions {
			i := ma.idx[j]
			if !(m[i] > 0) {
				ok = false
				break
			}
			logIAP += st.n * lg[i]
		}
		if v := logIAP - ma.logK; ok && !math.IsNaN(v) && !math.IsInf(v, 0) {
			si[ma.k], has[ma.k] = v, true
		}
	}
	return phi
}
