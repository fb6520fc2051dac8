package thermo

import (
	"fmt"
	"math"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/internal/roots"
	"drawsift/engine/water"
)

// The carbonate system in a Mixture: CO₂(aq), HCO₃⁻, CO₃²⁻, H⁺ and OH⁻
// at equilibrium,
//
//	CO₂(aq) + H₂O = H⁺ + HCO₃⁻    K₁ = a_H a_HCO3 / (a_CO2 a_w)
//	HCO₃⁻ = H⁺ + CO₃²⁻            K₂ = a_H a_CO3 / a_HCO3
//	H₂O = H⁺ + OH⁻                K_w = a_H a_OH / a_w
//
// with the activities of the Pitzer model (Eval; λ of CO₂ from HMW 1984).
// pH is −log₁₀ a_H on the model's (Harvie–Møller–Weare, free-ion molal)
// scale, which is not the total-hydrogen-ion scale of oceanographic pH:
// for seawater the two differ by about 0.1 (the HSO₄⁻ and HF
// equilibria, not modelled here), and a measured NBS-buffer pH by a
// liquid-junction term. Limits: no ion pairs (CaCO₃°, MgCO₃°, NaCO₃⁻ are
// represented by the binary parameters only, as in HMW 1984 without their
// complexes), no borate or sulfate protonation equilibria (B(OH)₄⁻ and
// SO₄²⁻ keep their given molalities), no gas phase (a closed system: DIC
// is conserved).

// CarbonateSpecies are the symbols the carbonate equilibria need in a
// mixture.
var CarbonateSpecies = [5]string{"CO2", "H+", "OH-", "HCO3-", "CO3-2"}

// CarbonateIons returns the species of the carbonate system, to append to
// a mixture's ion list for NewIonMixture (skip those already present):
// CO2 (neutral), H+, OH-, HCO3-, CO3-2.
func CarbonateIons() []MixIon {
	return []MixIon{{"CO2", 0}, {"H+", 1}, {"OH-", -1}, {"HCO3-", -1}, {"CO3-2", -2}}
}

// LogK1Carbonic returns log₁₀ K₁ of CO₂(aq) + H₂O = H⁺ + HCO₃⁻ at tK:
//
//	log K₁ = −356.3094 − 0.06091964 T + 21834.37/T + 126.8339 log₁₀T − 1684915/T²
//
// Plummer & Busenberg (1982) Geochim. Cosmochim. Acta 46:1011, eq. and
// Table 3; 0–250 °C. log K₁(25 °C) = −6.352.
func LogK1Carbonic(tK float64) float64 {
	return -356.3094 - 0.06091964*tK + 21834.37/tK + 126.8339*math.Log10(tK) - 1684915/(tK*tK)
}

// LogK2Carbonic returns log₁₀ K₂ of HCO₃⁻ = H⁺ + CO₃²⁻ at tK:
//
//	log K₂ = −107.8871 − 0.03252849 T + 5151.79/T + 38.92561 log₁₀T − 563713.9/T²
//
// Plummer & Busenberg (1982) Table 3; 0–250 °C. log K₂(25 °C) = −10.329.
func LogK2Carbonic(tK float64) float64 {
	return -107.8871 - 0.03252849*tK + 5151.79/tK + 38.92561*math.Log10(tK) - 563713.9/(tK*tK)
}

// LogKw returns log₁₀ of the ion product of water at tK:
//
//	log K_w = −4470.99/T + 6.0875 − 0.01706 T
//
// Harned & Robinson (1940) Trans. Faraday Soc. 36:973 (as given by Harned
// & Owen 1958 and Stumm & Morgan); 0–60 °C. log K_w(25 °C) = −13.995.
func LogKw(tK float64) float64 { return -4470.99/tK + 6.0875 - 0.01706*tK }

// carbonateIdx holds the positions of CarbonateSpecies in a mixture.
type carbonateIdx struct{ co2, h, oh, hco3, co3 int }

func (mx *Mixture) carbonateIndex() (carbonateIdx, error) {
	var idx [5]int
	var missing []string
	for k, sym := range CarbonateSpecies {
		i, ok := mx.Index(sym)
		if !ok {
			missing = append(missing, sym)
		}
		idx[k] = i
	}
	if len(missing) > 0 {
		return carbonateIdx{}, errs.InvalidText("ions", strings.Join(missing, ", "), "CO2, H+, OH-, HCO3- and CO3-2 (CarbonateIons)",
			"the mixture lacks the carbonate species %s", strings.Join(missing, ", "))
	}
	return carbonateIdx{co2: idx[0], h: idx[1], oh: idx[2], hco3: idx[3], co3: idx[4]}, nil
}

func checkMolalities(m []float64, n int) error {
	if len(m) != n {
		return errs.Invalid("molalities", float64(len(m)), fmt.Sprintf("%d values, one per species", n), "wrong number of molalities")
	}
	for i, v := range m {
		if !(v >= 0) || math.IsInf(v, 0) {
			return errs.Invalid(fmt.Sprintf("molalities[%d]", i), v, "≥ 0 mol/kg, finite", "molality must be finite and not negative")
		}
	}
	return nil
}

// carbonateMaxIter bounds the activity-coefficient iterations; they
// converge to 1e-13 in under 10 for seawater-like and brine compositions.
const carbonateMaxIter = 60

// speciateTol is the relative change at which the exact speciations stop.
const speciateTol = 1e-13

// carbonateK returns K₁, K₂ and K_w at the mixture's temperature, computed
// once per mixture.
func (mx *Mixture) carbonateK() (k1, k2, kw float64) {
	mx.kOnce.Do(func() {
		mx.k = [3]float64{math.Pow(10, LogK1Carbonic(mx.tK)), math.Pow(10, LogK2Carbonic(mx.tK)), math.Pow(10, LogKw(mx.tK))}
	})
	return mx.k[0], mx.k[1], mx.k[2]
}

// speciateAt sets out's carbonate species for the given DIC and a_H, by
// successive substitution of the activity coefficients (each step solves
// the mass-action laws exactly for fixed γ). lg is work space.
func (mx *Mixture) speciateAt(out, lg []float64, ix carbonateIdx, dic, aH, tol float64) (int, error) {
	k1, k2, kw := mx.carbonateK()
	sum0 := 0.0
	for i, v := range out {
		if i != ix.co2 && i != ix.h && i != ix.oh && i != ix.hco3 && i != ix.co3 {
			sum0 += v
		}
	}
	for it := 1; it <= carbonateMaxIter; it++ {
		phi := mx.Eval(out, lg)
		sum := sum0 + out[ix.co2] + out[ix.h] + out[ix.oh] + out[ix.hco3] + out[ix.co3]
		aw := math.Exp(-water.MolarMassKgPerMol * phi * sum)
		g := func(i int) float64 { return math.Exp(lg[i]) }
		r1 := k1 * aw * g(ix.co2) / (aH * g(ix.hco3)) // m_HCO3 / m_CO2
		r2 := k2 * g(ix.hco3) / (aH * g(ix.co3))      // m_CO3 / m_HCO3
		hco3 := dic / (1/r1 + 1 + r2)
		next := [5]float64{hco3 / r1, aH / g(ix.h), kw * aw / (aH * g(ix.oh)), hco3, hco3 * r2}
		prev := [5]float64{out[ix.co2], out[ix.h], out[ix.oh], out[ix.hco3], out[ix.co3]}
		out[ix.co2], out[ix.h], out[ix.oh], out[ix.hco3], out[ix.co3] = next[0], next[1], next[2], next[3], next[4]
		change := 0.0
		for k := range next {
			if !(next[k] >= 0) || math.IsInf(next[k], 0) {
				return it, &errs.ConvergenceError{Solver: "thermo.SpeciateCarbonate", Iterations: it, Residual: 1, Reason: "function not finite"}
			}
			if next[k] > 0 {
				change = math.Max(change, math.Abs(next[k]-prev[k])/next[k])
			}
		}
		if change < tol {
			return it, nil
		}
		if it == carbonateMaxIter {
			return it, &errs.ConvergenceError{Solver: "thermo.SpeciateCarbonate", Iterations: it, Residual: change, Reason: "iteration limit"}
		}
	}
	return carbonateMaxIter, nil
}

// SpeciateCarbonate redistributes the mixture's dissolved inorganic
// carbon, DIC = m_CO2 + m_HCO3 + m_CO3 as given in m, among CO₂(aq),
// HCO₃⁻ and CO₃²⁻ at the given pH (−log₁₀ a_H, the model's scale), and
// sets m_H = a_H/γ_H and m_OH = K_w a_w/(a_H γ_OH). The other species keep
// their molalities. It returns a new slice; m is not changed.
//
// The mixture must hold CarbonateSpecies (append CarbonateIons() to the
// ion list given to NewIonMixture). A feed given as HCO₃⁻ and CO₃²⁻ with a
// pH is set up by putting those molalities in m (CO₂, H⁺, OH⁻ zero) and
// calling SpeciateCarbonate with the feed's pH; DIC is conserved, so the
// charge balance shifts by the change of carbonate alkalinity (small near
// the given speciation, and the caller's to judge).
//
// The equations are K₁, K₂ (Plummer & Busenberg 1982) and K_w (Harned &
// Robinson 1940) with the activity coefficients and water activity of
// Eval, solved by successive substitution of γ (each step exact for
// fixed γ). Errors: a mixture without the carbonate species, a pH outside
// 0–14, molalities of the wrong length, negative or not finite
// (*errs.InputError); no convergence (*errs.ConvergenceError). Special
// case: DIC = 0 sets only H⁺ and OH⁻.
func (mx *Mixture) SpeciateCarbonate(m []float64, pH float64) ([]float64, error) {
	ix, err := mx.carbonateIndex()
	if err != nil {
		return nil, err
	}
	if err := checkMolalities(m, len(mx.ions)); err != nil {
		return nil, err
	}
	if !(pH >= 0 && pH <= 14) {
		return nil, errs.Invalid("ph", pH, "0–14", "pH outside 0–14")
	}
	out := append([]float64(nil), m...)
	dic := m[ix.co2] + m[ix.hco3] + m[ix.co3]
	lg := make([]float64, len(m))
	if _, err := mx.speciateAt(out, lg, ix, dic, math.Pow(10, -pH), speciateTol); err != nil {
		return nil, err
	}
	return out, nil
}

// CarbonateAlkalinity returns the carbonate-system alkalinity of m,
// m_HCO3 + 2 m_CO3 + m_OH − m_H (mol/kg water), which
// SpeciateAlkalinity holds fixed. Borate and other weak bases are not
// counted.
func (mx *Mixture) CarbonateAlkalinity(m []float64) (float64, error) {
	ix, err := mx.carbonateIndex()
	if err != nil {
		return 0, err
	}
	if err := checkMolalities(m, len(mx.ions)); err != nil {
		return 0, err
	}
	return m[ix.hco3] + 2*m[ix.co3] + m[ix.oh] - m[ix.h], nil
}

// SpeciateAlkalinity solves the closed carbonate system for a given DIC
// and carbonate alkalinity (mol/kg water; alkalinity as in
// CarbonateAlkalinity): it finds the pH at which the speciation of
// SpeciateCarbonate has that alkalinity, by Brent's method on pH in 0–14
// (internal/roots; at fixed γ the alkalinity rises monotonically with pH,
// so the root is unique), and returns the molalities and the pH.
// The non-carbonate species keep their molalities from m; the carbonate
// species of m are ignored. Errors as SpeciateCarbonate, plus a DIC or
// alkalinity not finite or negative DIC, and an alkalinity the system
// cannot reach at any pH in 0–14 (*errs.ConvergenceError, "no sign
// change").
func (mx *Mixture) SpeciateAlkalinity(m []float64, dicMolPerKg, alkMolPerKg float64) ([]float64, float64, error) {
	ix, err := mx.carbonateIndex()
	if err != nil {
		return nil, 0, err
	}
	if err := checkMolalities(m, len(mx.ions)); err != nil {
		return nil, 0, err
	}
	if !(dicMolPerKg >= 0) || math.IsInf(dicMolPerKg, 0) {
		return nil, 0, errs.Invalid("dic_mol_per_kg", dicMolPerKg, "≥ 0 mol/kg, finite", "dissolved inorganic carbon must be finite and not negative")
	}
	if math.IsNaN(alkMolPerKg) || math.IsInf(alkMolPerKg, 0) {
		return nil, 0, errs.Invalid("alkalinity_mol_per_kg", alkMolPerKg, "finite", "alkalinity must be finite")
	}
	out := append([]float64(nil), m...)
	lg := make([]float64, len(m))
	var inner error
	f := func(pH float64) float64 {
		if _, err := mx.speciateAt(out, lg, ix, dicMolPerKg, math.Pow(10, -pH), speciateTol); err != nil && inner == nil {
			inner = err
		}
		return out[ix.hco3] + 2*out[ix.co3] + out[ix.oh] - out[ix.h] - alkMolPerKg
	}
	br := roots.Bracket{Lo: 0, Hi: 14}
	br.FLo = f(br.Lo)
	br.FHi = f(br.Hi)
	scale := math.Max(math.Abs(alkMolPerKg), math.Max(dicMolPerKg, 1e-7))
	r, err := roots.Brent(f, br, &roots.Settings{Solver: "thermo.SpeciateAlkalinity", XAbsTol: 1e-10, Scale: scale})
	if err != nil {
		return nil, 0, err
	}
	if inner != nil {
		return nil, 0, inner
	}
	f(r.X) // leave out at the root
	if inner != nil {
		return nil, 0, inner
	}
	return out, r.X, nil
}

// SpeciateCarbonateInto is SpeciateCarbonate in place and without
// allocation, for hot loops: m is overwritten with the speciated
// molalities; work needs len(Ions()). The caller guarantees the carbonate
// species are in the mixture, molalities are finite and not negative,
// and pH is within 0–14 (checked by SpeciateCarbonate, not here). The
// iteration stops when no species changes by more than tol relative (each
// step is exact for the activity coefficients of the step before, so a
// loose tol costs an error of about tol in the carbonate molalities).
func (mx *Mixture) SpeciateCarbonateInto(m, work []float64, pH, tol float64) error {
	ix, err := mx.carbonateIndex()
	if err != nil {
		return err
	}
	dic := m[ix.co2] + m[ix.hco3] + m[ix.co3]
	_, err = mx.speciateAt(m, work[:len(m)], ix, dic, math.Pow(10, -pH), tol)
	return err
}
