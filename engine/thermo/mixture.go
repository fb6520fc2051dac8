package thermo

import (
	"fmt"
	"math"
	"strings"
	"sync"

	"gonum.org/v1/gonum/integrate/quad"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// MixIon is one species of a mixed-electrolyte solution: an ion, or a
// neutral solute (Charge 0) such as CO2 for the carbonate system.
type MixIon struct {
	Symbol string
	Charge int
}

// binary is one cation–anion pair's Pitzer parameters at temperature.
type binary struct {
	set              bool
	b0, b1, b2, cphi float64
	a1, a2           float64
	inRange          bool
	fromSolute       string
}

// pairTerm is a set cation–anion pair as Eval uses it: ion indices, the
// parameters, the positions of α₁ and α₂ in Mixture.alpha (ia2 < 0: no
// β⁽²⁾) and C = C^φ/(2√|z_c z_a|).
type pairTerm struct {
	c, a     int
	b0, b1   float64
	b2, cc   float64
	ia1, ia2 int
}

// likeTerm is a pair of ions of the same sign: θ, the charges for ᴱθ and
// the ψ with ions of the other sign that are tabulated.
type likeTerm struct {
	i, j   int
	zi, zj int // |z|
	theta  float64
	psi    []psiTerm
}

type psiTerm struct {
	k int
	v float64
}

// lambdaTerm is a neutral solute n with an ion i: λ_ni.
type lambdaTerm struct {
	n, i int
	l    float64
}

// maxAlphas bounds the distinct α values of a mixture (2, 1.4, 12 in
// practice; a record may bring its own).
const maxAlphas = 8

// maxCharge bounds |z| of a mixture's ions (the ᴱθ cache of Eval).
const maxCharge = 4

// Mixture is the Harvie–Møller–Weare form of the Pitzer model for a
// solution of several electrolytes and neutral solutes at one temperature:
// binary β⁽⁰⁾, β⁽¹⁾, β⁽²⁾, C^φ for each cation–anion pair, the like-ion
// mixing terms θ and ψ, the unsymmetrical-mixing terms ᴱθ, ᴱθ′ from the
// J(x) integral, and the neutral–ion terms λ.
// Harvie, Møller & Weare (1984) Geochim. Cosmochim. Acta 48:723,
// eqs. 1–9 and appendix; Pitzer (1991) Activity Coefficients in
// Electrolyte Solutions, 2nd ed., ch. 3, eqs. 59–69 and 84–86; Pitzer (1975)
// J. Solution Chem. 4:249 for ᴱθ.
//
// The like-ion θ and ψ come from Harvie, Møller & Weare (1984) Table 2 and
// the few other sources named in mixing.go (zero for pairs none lists:
// MissingMixing names them); ᴱθ (which needs no parameter) is always
// included, so ions of unlike charge (Na⁺–Mg²⁺, Cl⁻–SO₄²⁻) are never
// treated as symmetric. λ for CO₂(aq) are HMW 1984's (pairs.go). Ternary
// neutral terms ζ and neutral–neutral λ are not included.
type Mixture struct {
	ions  []MixIon
	z     []float64
	tK    float64
	cat   []int // indices of the cations
	an    []int // indices of the anions
	neu   []int // indices of the neutral species
	pairs []pairTerm
	like  []likeTerm
	lams  []lambdaTerm
	alpha []float64
	aphi  float64
	// kOnce, k: the carbonate equilibrium constants at tK (carbonateK).
	kOnce sync.Once
	k     [3]float64
	// missingTheta: like-charged pairs without a tabulated θ;
	// missingPairs: cation–anion pairs without binary parameters.
	missingTheta, missingPairs []string
	// minerals whose ions are all present, prepared on first use by
	// SaturationIndices.
	mineralsOnce sync.Once
	minerals     []mineralAt
	// Warnings: mixing data at 25 °C used elsewhere; binary sets used
	// outside their temperature range; pairs without parameters.
	Warnings []warn.Warning
}

// NewMixture builds the model at tK from library salts: each Pitzer salt
// brings its cation–anion pair's binary parameters (at tK, by the record's
// temperature function). The ions are the salts' ions, merged by symbol.
// Cation–anion pairs that no given salt holds (Ca²⁺ with SO₄²⁻ from CaCl2
// and Na2SO4) take their parameters as NewIonMixture does.
func NewMixture(salts []*library.Solute, tK float64) (*Mixture, error) {
	var ions []MixIon
	index := map[string]bool{}
	add := func(ion library.Ion) {
		if !index[ion.Symbol] {
			index[ion.Symbol] = true
			ions = append(ions, MixIon{Symbol: ion.Symbol, Charge: ion.Charge})
		}
	}
	given := map[[2]string]binary{}
	for k, s := range salts {
		if s.Osmotic.Kind != library.ModelPitzer || len(s.Ions) != 2 || s.Ions[0].Charge*s.Ions[1].Charge >= 0 {
			return nil, errs.InvalidText(fmt.Sprintf("mixture[%d].solute", k), s.ID, "a Pitzer salt of one cation and one anion",
				"%s has no Pitzer parameters for a mixture", s.ID)
		}
		cat, an := s.Ions[0], s.Ions[1]
		if cat.Charge < 0 {
			cat, an = an, cat
		}
		add(cat)
		add(an)
		key := [2]string{cat.Symbol, an.Symbol}
		if _, dup := given[key]; !dup {
			given[key] = saltBinary(s, tK)
		}
	}
	return newMixture(ions, given, tK)
}

// NewIonMixture builds the model at tK for the given ions and neutral
// species (Charge 0), in that order (the order Eval takes molalities).
// Each cation–anion pair takes its binary parameters, in this order of
// preference:
//
//  1. the library's Pitzer salt of exactly that pair (library.Default), with
//     its temperature function, so that a single salt gives the single-salt
//     model's numbers;
//  2. the pair table of pairs.go (HMW 1984 Table 1 and the other sources
//     named there), with its temperature terms where published;
//  3. none: the pair's parameters are zero (Debye–Hückel and mixing terms
//     only) and a warn.ModelNote warning names it.
//
// Data used outside their temperature range are flagged
// (warn.Temperature25C). Each neutral species takes its λ with each ion
// from pairs.go; one without any λ gets a warn.ModelNote.
//
// Errors (*errs.InputError): an empty symbol, a repeated symbol, |charge|
// above 4, tK outside 273.15–573.15 K (the range of A_φ, Møller 1988).
func NewIonMixture(ions []MixIon, tK float64) (*Mixture, error) {
	return newMixture(ions, nil, tK)
}

// saltBinary is a library salt's binary parameters at tK.
func saltBinary(s *library.Solute, tK float64) binary {
	p, inRange := pitzerParams(s, tK)
	return binary{set: true, b0: p.b0, b1: p.b1, b2: p.b2, cphi: p.cphi,
		a1: p.a1, a2: p.a2, inRange: inRange, fromSolute: s.ID}
}

// librarySalts maps {cation, anion} to the default library's Pitzer salt of
// exactly that pair (the first in file order).
var librarySalts struct {
	once sync.Once
	m    map[[2]string]*library.Solute
}

func librarySalt(cat, an string) *library.Solute {
	librarySalts.once.Do(func() {
		librarySalts.m = map[[2]string]*library.Solute{}
		lib, err := library.Default()
		if err != nil {
			return // the library's own tests rule this out; the pair table still serves
		}
		for _, s := range lib.All() {
			if s.Osmotic.Kind != library.ModelPitzer || len(s.Ions) != 2 || s.Ions[0].Charge*s.Ions[1].Charge >= 0 {
				continue
			}
			c, a := s.Ions[0], s.Ions[1]
			if c.Charge < 0 {
				c, a = a, c
			}
			key := [2]string{c.Symbol, a.Symbol}
			if _, ok := librarySalts.m[key]; !ok {
				librarySalts.m[key] = s
			}
		}
	})
	return librarySalts.m[[2]string{cat, an}]
}

func newMixture(ions []MixIon, given map[[2]string]binary, tK float64) (*Mixture, error) {
	if !(tK >= ZeroCelsiusK-1e-9 && tK <= 573.15) {
		return nil, errs.Invalid("temperature_k", tK, "273.15–573.15 K", "mixture temperature outside the range of A_φ (Møller 1988)")
	}
	mx := &Mixture{aphi: AphiMoller88(tK), tK: tK}
	seen := map[string]bool{}
	for k, ion := range ions {
		field := fmt.Sprintf("ions[%d]", k)
		switch {
		case ion.Symbol == "":
			return nil, errs.InvalidText(field+".symbol", "", "a species symbol such as Na+", "empty species symbol")
		case seen[ion.Symbol]:
			return nil, errs.InvalidText(field+".symbol", ion.Symbol, "each species once", "%s is listed twice", ion.Symbol)
		case ion.Charge > maxCharge || ion.Charge < -maxCharge:
			return nil, errs.Invalid(field+".charge", float64(ion.Charge), "−4…4", "charge of %s out of range", ion.Symbol)
		}
		seen[ion.Symbol] = true
		mx.ions = append(mx.ions, ion)
		mx.z = append(mx.z, float64(ion.Charge))
		switch {
		case ion.Charge > 0:
			mx.cat = append(mx.cat, k)
		case ion.Charge < 0:
			mx.an = append(mx.an, k)
		default:
			mx.neu = append(mx.neu, k)
		}
	}
	alphaIndex := func(a float64) int {
		for k, v := range mx.alpha {
			if v == a {
				return k
			}
		}
		mx.alpha = append(mx.alpha, a)
		return len(mx.alpha) - 1
	}
	var missing []string
	for _, c := range mx.cat {
		for _, a := range mx.an {
			cs, as := mx.ions[c].Symbol, mx.ions[a].Symbol
			var b binary
			var ok bool
			if b, ok = given[[2]string{cs, as}]; !ok {
				if s := librarySalt(cs, as); s != nil {
					b, ok = saltBinary(s, tK), true
				} else {
					b, ok = pairParams(cs, as, mx.z[c], mx.z[a], tK)
				}
			}
			if !ok {
				missing = append(missing, cs+"–"+as)
				continue
			}
			if !b.inRange {
				mx.Warnings = append(mx.Warnings, warn.New(warn.Temperature25C, b.fromSolute,
					"%s: Pitzer parameters used outside the temperature range of their data (%.4g °C)", b.fromSolute, tK-ZeroCelsiusK))
			}
			if len(mx.alpha) >= maxAlphas-1 {
				return nil, errs.Invalid("ions", float64(len(ions)), fmt.Sprintf("at most %d distinct α values", maxAlphas), "too many distinct Pitzer α values")
			}
			t := pairTerm{c: c, a: a, b0: b.b0, b1: b.b1, b2: b.b2,
				cc: b.cphi / (2 * math.Sqrt(math.Abs(mx.z[c]*mx.z[a]))), ia1: alphaIndex(b.a1), ia2: -1}
			if b.b2 != 0 {
				t.ia2 = alphaIndex(b.a2)
			}
			mx.pairs = append(mx.pairs, t)
		}
	}
	mx.missingPairs = missing
	if len(missing) > 0 {
		mx.Warnings = append(mx.Warnings, warn.New(warn.ModelNote, "mixture",
			"mixture: no binary Pitzer parameters for %s; taken as zero (Debye–Hückel and mixing terms only)", strings.Join(missing, ", ")))
	}
	lam25 := false
	for _, n := range mx.neu {
		any := false
		for i := range mx.ions {
			if l, ok := lambdaNeutral[[2]string{mx.ions[n].Symbol, mx.ions[i].Symbol}]; ok && mx.z[i] != 0 {
				mx.lams = append(mx.lams, lambdaTerm{n: n, i: i, l: l})
				any = true
			}
		}
		if !any {
			mx.Warnings = append(mx.Warnings, warn.New(warn.ModelNote, mx.ions[n].Symbol,
				"%s: no neutral–ion λ parameters; treated as ideal", mx.ions[n].Symbol))
		}
		lam25 = lam25 || any
	}
	if (mx.fillMixing() || lam25) && math.Abs(tK-ReferenceK) > 5 {
		mx.Warnings = append(mx.Warnings, warn.New(warn.Temperature25C, "mixture",
			"mixture: the mixing parameters θ, ψ and λ are 25 °C data (Harvie, Møller & Weare 1984), used unchanged at %.4g °C", tK-ZeroCelsiusK))
	}
	return mx, nil
}

// Ions lists the mixture's species in the order Eval takes their
// molalities.
func (mx *Mixture) Ions() []MixIon { return mx.ions }

// TemperatureK returns the temperature the mixture was built for.
func (mx *Mixture) TemperatureK() float64 { return mx.tK }

// Index returns the position of the species symbol in Ions.
func (mx *Mixture) Index(symbol string) (int, bool) {
	for i, ion := range mx.ions {
		if ion.Symbol == symbol {
			return i, true
		}
	}
	return -1, false
}

// IonicStrength returns I = ½ Σ mᵢ zᵢ² (mol/kg) at the molalities m (in
// the order of Ions; neutral species add nothing).
func (mx *Mixture) IonicStrength(m []float64) float64 {
	iStr := 0.0
	for i, mi := range m {
		iStr += 0.5 * mi * mx.z[i] * mx.z[i]
	}
	return iStr
}

// MissingMixing lists the like-charged ion pairs of the mixture ("K+/Na+"
// style, each pair once) for which no θ is tabulated, so that a caller can
// fall back to a mixing rule (Zdanovskii–Stokes–Robinson) and say so. ᴱθ
// is still applied to them where the charges differ.
func (mx *Mixture) MissingMixing() []string { return mx.missingTheta }

// MissingPairs lists the cation–anion pairs ("Na+–F-") without binary
// parameters, taken as zero (also reported in Warnings).
func (mx *Mixture) MissingPairs() []string { return mx.missingPairs }

// WaterActivity returns the activity of water at the molalities m:
//
//	ln a_w = −M_w φ Σ mᵢ
//
// with every species counted in Σmᵢ, neutral ones included (the definition
// of the molal osmotic coefficient, IUPAC Gold Book). Pure water gives 1.
func (mx *Mixture) WaterActivity(m []float64) float64 {
	sum := 0.0
	for _, mi := range m {
		sum += mi
	}
	if sum <= 0 {
		return 1
	}
	return math.Exp(-water.MolarMassKgPerMol * mx.Eval(m, nil) * sum)
}

// gFun and its companion are the ionic-strength functions of β⁽¹⁾ and
// β⁽²⁾ (Pitzer 1991 eqs. 3-60, 3-62):
//
//	g(x)  = 2[1 − (1 + x)e^{−x}]/x²
//	g′(x) = −2[1 − (1 + x + x²/2)e^{−x}]/x²
func gFun(x float64) float64 {
	if x < 1e-4 {
		return 1 - 2*x/3 + x*x/4
	}
	return 2 * (1 - (1+x)*math.Exp(-x)) / (x * x)
}

func gPrime(x float64) float64 {
	if x < 1e-4 {
		return -2*x/3 + x*x/2
	}
	return -2 * (1 - (1+x+0.5*x*x)*math.Exp(-x)) / (x * x)
}

// Eval returns the osmotic coefficient φ of the mixture at the species
// molalities m (mol/kg water, in the order of Ions) and, when lnGamma is
// not nil (len(Ions)), each species' ln γ:
//
//	φ − 1 = (2/Σmᵢ)[−A_φ I^{3/2}/(1 + b√I) + Σ_c Σ_a m_c m_a (B^φ_ca + Z C_ca)
//	        + Σ_{c<c′} m_c m_c′ (Φ^φ_cc′ + Σ_a m_a ψ_cc′a) + Σ_{a<a′} m_a m_a′ (Φ^φ_aa′ + Σ_c m_c ψ_aa′c)
//	        + Σ_n Σ_i m_n m_i λ_ni]
//	ln γ_M = z_M² F + Σ_a m_a (2B_Ma + Z C_Ma) + Σ_c m_c (2Φ_Mc + Σ_a m_a ψ_Mca)
//	        + Σ_{a<a′} m_a m_a′ ψ_aa′M + |z_M| Σ_c Σ_a m_c m_a C_ca + 2 Σ_n m_n λ_nM     (and likewise for anions)
//	ln γ_N = 2 Σ_i m_i λ_Ni
//	F = −A_φ[√I/(1 + b√I) + (2/b) ln(1 + b√I)] + Σ_c Σ_a m_c m_a B′_ca
//	    + Σ_{c<c′} m_c m_c′ Φ′_cc′ + Σ_{a<a′} m_a m_a′ Φ′_aa′
//
// with Z = Σ mᵢ|zᵢ|, C_ca = C^φ_ca/(2√|z_c z_a|), b = 1.2, n over neutral
// species and i over ions (HMW 1984 eqs. 1–9; Pitzer 1991 eqs. 3-59 to
// 3-69). Electroneutrality is the caller's: Eval does not enforce it. Eval
// does not allocate. Special cases: all molalities zero gives φ = 1 and
// ln γ = 0.
func (mx *Mixture) Eval(m, lnGamma []float64) float64 {
	var sumM, iStr, zSum float64
	for i, mi := range m {
		sumM += mi
		iStr += 0.5 * mi * mx.z[i] * mx.z[i]
		zSum += mi * math.Abs(mx.z[i])
	}
	for i := range lnGamma {
		lnGamma[i] = 0
	}
	if sumM <= 0 {
		return 1
	}
	s := math.Sqrt(iStr)
	const b = pitzerB
	osm := -mx.aphi * iStr * s / (1 + b*s)
	f := -mx.aphi * (s/(1+b*s) + 2/b*math.Log1p(b*s))
	// The ionic-strength functions of each distinct α, once.
	var ex, gg, gp [maxAlphas]float64
	for k, a := range mx.alpha {
		x := a * s
		ex[k], gg[k] = math.Exp(-x), gFun(x)
		if iStr > 0 {
			gp[k] = gPrime(x) / iStr
		}
	}
	var sumCC float64 // Σ_c Σ_a m_c m_a C_ca
	for k := range mx.pairs {
		p := &mx.pairs[k]
		mc, ma := m[p.c], m[p.a]
		if mc == 0 && ma == 0 {
			continue
		}
		bphi := p.b0 + p.b1*ex[p.ia1]
		bb := p.b0 + p.b1*gg[p.ia1]
		bprime := p.b1 * gp[p.ia1]
		if p.ia2 >= 0 {
			bphi += p.b2 * ex[p.ia2]
			bb += p.b2 * gg[p.ia2]
			bprime += p.b2 * gp[p.ia2]
		}
		mm := mc * ma
		osm += mm * (bphi + zSum*p.cc)
		f += mm * bprime
		sumCC += mm * p.cc
		if lnGamma != nil {
			lnGamma[p.c] += ma * (2*bb + zSum*p.cc)
			lnGamma[p.a] += mc * (2*bb + zSum*p.cc)
		}
	}
	// Like-charged pairs: Φ = θ + ᴱθ, Φ′ = ᴱθ′, Φ^φ = Φ + IΦ′. ᴱθ depends on
	// the charges only: computed once per pair of charges.
	var etv, etpv [maxCharge + 1][maxCharge + 1]float64
	var etok [maxCharge + 1][maxCharge + 1]bool
	for k := range mx.like {
		l := &mx.like[k]
		var et, etp float64
		if l.zi != l.zj {
			if !etok[l.zi][l.zj] {
				etv[l.zi][l.zj], etpv[l.zi][l.zj] = mx.etheta(float64(l.zi), float64(l.zj), iStr, s)
				etok[l.zi][l.zj] = true
			}
			et, etp = etv[l.zi][l.zj], etpv[l.zi][l.zj]
		}
		phi := l.theta + et
		mm := m[l.i] * m[l.j]
		sumPsi := 0.0
		for _, ps := range l.psi {
			sumPsi += m[ps.k] * ps.v
		}
		osm += mm * (phi + iStr*etp + sumPsi)
		f += mm * etp
		if lnGamma != nil {
			lnGamma[l.i] += m[l.j] * (2*phi + sumPsi)
			lnGamma[l.j] += m[l.i] * (2*phi + sumPsi)
			for _, ps := range l.psi {
				lnGamma[ps.k] += mm * ps.v
			}
		}
	}
	for k := range mx.lams {
		t := &mx.lams[k]
		osm += m[t.n] * m[t.i] * t.l
		if lnGamma != nil {
			lnGamma[t.n] += 2 * m[t.i] * t.l
			lnGamma[t.i] += 2 * m[t.n] * t.l
		}
	}
	for i := range lnGamma {
		lnGamma[i] += mx.z[i]*mx.z[i]*f + math.Abs(mx.z[i])*sumCC
	}
	return 1 + 2*osm/sumM
}

// etheta returns ᴱθ and ᴱθ′ for ions of charges zi, zj of the same sign at
// ionic strength I (√I = s):
//
//	ᴱθ  = (zᵢzⱼ/4I)[J(xᵢⱼ) − J(xᵢᵢ)/2 − J(xⱼⱼ)/2]
//	ᴱθ′ = −ᴱθ/I + (zᵢzⱼ/8I²)[xᵢⱼJ′(xᵢⱼ) − xᵢᵢJ′(xᵢᵢ)/2 − xⱼⱼJ′(xⱼⱼ)/2]
//	xᵢⱼ = 6 zᵢzⱼ A_φ √I
//
// (Pitzer 1975 eqs. 32–35; Pitzer 1991 eqs. 3-84 to 3-86). Both vanish for
// equal charges and at I = 0.
func (mx *Mixture) etheta(zi, zj, iStr, s float64) (et, etp float64) {
	if zi == zj || iStr <= 0 {
		return 0, 0
	}
	xij := 6 * zi * zj * mx.aphi * s
	xii := 6 * zi * zi * mx.aphi * s
	xjj := 6 * zj * zj * mx.aphi * s
	jij, dij := jFast(xij)
	jii, dii := jFast(xii)
	jjj, djj := jFast(xjj)
	et = zi * zj / (4 * iStr) * (jij - 0.5*jii - 0.5*jjj)
	etp = -et/iStr + zi*zj/(8*iStr*iStr)*(xij*dij-0.5*xii*dii-0.5*xjj*djj)
	return et, etp
}

// ExcessGibbs returns Gᴱˣ/(w_w R T), the excess Gibbs energy per kilogram
// of water in units of RT, of which ln γᵢ = ∂/∂mᵢ and φ − 1 =
// (Σ mᵢ ln γᵢ − Gᴱˣ/(w_w RT))/Σ mᵢ (Pitzer 1991 eq. 3-59):
//
//	Gᴱˣ/(w_w RT) = −A_φ(4I/b) ln(1 + b√I) + Σ_c Σ_a m_c m_a (2B_ca + Z C_ca)
//	              + Σ_{c<c′} m_c m_c′ (2Φ_cc′ + Σ_a m_a ψ_cc′a) + Σ_{a<a′} m_a m_a′ (2Φ_aa′ + Σ_c m_c ψ_aa′c)
//	              + 2 Σ_n Σ_i m_n m_i λ_ni
//
// It exists to check Eval (the two are independent codings of the
// model, sharing only the parameter lists) and is not on any hot path.
func (mx *Mixture) ExcessGibbs(m []float64) float64 {
	var iStr, zSum float64
	for i, mi := range m {
		iStr += 0.5 * mi * mx.z[i] * mx.z[i]
		zSum += mi * math.Abs(mx.z[i])
	}
	if iStr <= 0 {
		return 0
	}
	s := math.Sqrt(iStr)
	g := -mx.aphi * 4 * iStr / pitzerB * math.Log1p(pitzerB*s)
	for _, p := range mx.pairs {
		bb := p.b0 + p.b1*gFun(mx.alpha[p.ia1]*s)
		if p.ia2 >= 0 {
			bb += p.b2 * gFun(mx.alpha[p.ia2]*s)
		}
		cc := p.cc
		g += m[p.c] * m[p.a] * (2*bb + zSum*cc)
	}
	for _, l := range mx.like {
		et, _ := mx.etheta(mx.z[l.i], mx.z[l.j], iStr, s)
		sumPsi := 0.0
		for _, ps := range l.psi {
			sumPsi += m[ps.k] * ps.v
		}
		g += m[l.i] * m[l.j] * (2*(l.theta+et) + sumPsi)
	}
	for _, t := range mx.lams {
		g += 2 * m[t.n] * m[t.i] * t.l
	}
	return g
}

// jNodes, jWeight: composite Gauss–Legendre on u = ln y over
// [ln 1e-10, ln 60], in jPanels panels of 16 points each.
var (
	jOnce           sync.Once
	jNodes, jWeight []float64
)

const (
	jPanels   = 14
	jPerPanel = 16
	jLowerLnY = -23.025850929940457 // ln 1e-10
	jUpperLnY = 4.0943445622221     // ln 60
)

// JIntegral returns J(x) and J′(x), the integral of unsymmetrical mixing:
//
//	J(x) = (1/x) ∫₀^∞ [1 + q + q²/2 − e^q] y² dy,   q = −(x/y) e^{−y}
//	J′(x) = −J/x + (1/x²) ∫₀^∞ q (1 + q − e^q) y² dy
//
// (Pitzer 1975, J. Solution Chem. 4:249, eq. 47; the derivative follows
// from ∂q/∂x = q/x). Evaluated in u = ln y by composite Gauss–Legendre
// quadrature (14 panels × 16 points over 1e-10 ≤ y ≤ 60; below, where the
// integrand tends to x²/2, in closed form; above, it decays as e^{−3y}),
// with the cancellation in 1 + q + q²/2 − e^q avoided by its series for
// small |q|. Accurate to better than 1e-10 relative for 1e-4 ≤ x ≤ 1e3
// (TestJIntegral). Special cases: J(0) = J′(0) = 0; x < 0 is not a valid
// argument and returns zeros.
func JIntegral(x float64) (j, dj float64) {
	if !(x > 0) {
		return 0, 0
	}
	jOnce.Do(func() {
		n := jPanels * jPerPanel
		jNodes, jWeight = make([]float64, n), make([]float64, n)
		h := (jUpperLnY - jLowerLnY) / jPanels
		for p := 0; p < jPanels; p++ {
			lo := jLowerLnY + float64(p)*h
			quad.Legendre{}.FixedLocations(jNodes[p*jPerPanel:(p+1)*jPerPanel], jWeight[p*jPerPanel:(p+1)*jPerPanel], lo, lo+h)
		}
		for k, u := range jNodes {
			jNodes[k] = math.Exp(u) // y
			jWeight[k] *= jNodes[k] // dy = y du
		}
	})
	var sj, sd float64
	for k, y := range jNodes {
		q := -x / y * math.Exp(-y)
		var f, fp float64 // 1+q+q²/2−e^q and 1+q−e^q
		if math.Abs(q) < 0.05 {
			q2 := q * q
			f = -q2 * q * (1.0/6 + q*(1.0/24+q*(1.0/120+q*(1.0/720+q/5040))))
			fp = -q2 * (0.5 + q*(1.0/6+q*(1.0/24+q*(1.0/120+q/720))))
		} else {
			e := math.Exp(q)
			f = 1 + q + 0.5*q*q - e
			fp = 1 + q - e
		}
		w := jWeight[k] * y * y
		sj += w * f
		sd += w * q * fp
	}
	// Below y₀ = 1e-10 (y ≪ x) the integrands tend to x²/2 and x²: their
	// integrals over [0, y₀] are added in closed form.
	const y0 = 1e-10
	sj += 0.5*x*x*y0 - 0.5*x*y0*y0
	sd += x * x * y0
	j = sj / x
	dj = -j/x + sd/(x*x)
	return j, dj
}

// jTable holds H(u) = J(eᵘ) and dH/du = x·J′(x) on a uniform grid of
// u = ln x over [ln 1e-4, ln 1e3], for jFast. It is built a piece of
// jPiece nodes at a time, on first use of the piece: one solution's ionic
// strengths reach a few pieces, and a whole table (1,201 quadratures) was
// a third of a cold screen in wasm. Every node holds what a whole build
// gives it.
var jTable struct {
	u0, h  float64
	hv, dv [jTabNodes]float64
	built  [jTabNodes/jPiece + 1]sync.Once
}

const (
	jTabLo    = 1e-4
	jTabHi    = 1e3
	jTabNodes = 1201
	jPiece    = 48
)

func init() {
	jTable.u0 = math.Log(jTabLo)
	jTable.h = (math.Log(jTabHi) - jTable.u0) / (jTabNodes - 1)
}

// jNode builds the piece of jTable that holds node k.
func jNode(k int) {
	t := &jTable
	p := k / jPiece
	t.built[p].Do(func() {
		for k := p * jPiece; k < min((p+1)*jPiece, jTabNodes); k++ {
			xk := math.Exp(t.u0 + float64(k)*t.h)
			jk, dk := JIntegral(xk)
			t.hv[k], t.dv[k] = jk, xk*dk
		}
	})
}

// jFast returns J(x) and J′(x) by cubic Hermite interpolation in ln x of a
// table of JIntegral (values and exact slopes), falling back to JIntegral
// outside 1e-4 ≤ x ≤ 1e3. J′ is the derivative of the interpolant itself,
// so ᴱθ′ stays the exact derivative of the ᴱθ used (Eval and ExcessGibbs
// agree to rounding). Interpolation error below 1e-9 relative in J and
// 5e-8 in J′, plus 1e-9 absolute in J′ for x below about 1e-2, where J
// behaves as x² ln x (TestJFast).
func jFast(x float64) (j, dj float64) {
	if !(x >= jTabLo && x < jTabHi) {
		return JIntegral(x)
	}
	t := &jTable
	u := (math.Log(x) - t.u0) / t.h
	k := int(u)
	if k >= jTabNodes-1 {
		k = jTabNodes - 2
	}
	jNode(k)
	if (k+1)%jPiece == 0 {
		jNode(k + 1)
	}
	s := u - float64(k)
	s2, s3 := s*s, s*s*s
	h0, h1 := t.hv[k], t.hv[k+1]
	d0, d1 := t.dv[k]*t.h, t.dv[k+1]*t.h // slopes per unit s
	j = (2*s3-3*s2+1)*h0 + (s3-2*s2+s)*d0 + (-2*s3+3*s2)*h1 + (s3-s2)*d1
	dHds := (6*s2-6*s)*h0 + (3*s2-4*s+1)*d0 + (-6*s2+6*s)*h1 + (3*s2-2*s)*d1
	dj = dHds / t.h / x
	return j, dj
}
