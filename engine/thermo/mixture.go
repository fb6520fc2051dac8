package thermo

import (
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/integrate/quad"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/warn"
)

// MixIon is one ion of a mixed-electrolyte solution.
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

// Mixture is the Harvie–Møller–Weare form of the Pitzer model for a
// solution of several electrolytes at one temperature: binary β⁽⁰⁾, β⁽¹⁾,
// β⁽²⁾, C^φ for each cation–anion pair, the like-ion mixing terms θ and ψ,
// and the unsymmetrical-mixing terms ᴱθ, ᴱθ′ from the J(x) integral.
// Harvie, Møller & Weare (1984) Geochim. Cosmochim. Acta 48:723,
// eqs. 1–9 and appendix; Pitzer (1991) Activity Coefficients in
// Electrolyte Solutions, 2nd ed., ch. 3, eqs. 59–69 and 84–86; Pitzer (1975)
// J. Solution Chem. 4:249 for ᴱθ.
//
// The like-ion θ and ψ come from Harvie, Møller & Weare (1984) Table 2
// (mixing.go; zero for pairs it does not list); ᴱθ (which needs no
// parameter) is always included, so ions of unlike charge (Na⁺–Mg²⁺,
// Cl⁻–SO₄²⁻) are never treated as symmetric.
type Mixture struct {
	ions  []MixIon
	z     []float64
	cat   []int       // indices of the cations
	an    []int       // indices of the anions
	pair  [][]binary  // [cation][anion] by position in cat, an
	theta [][]float64 // like-charged pairs, by ion index (zero for now)
	psi   [][][]float64
	aphi  float64
	// Warnings: mixing data at 25 °C used elsewhere; binary sets used
	// outside their temperature range.
	Warnings []warn.Warning
}

// NewMixture builds the model at tK from library salts: each Pitzer salt
// brings its cation–anion pair's binary parameters (at tK, by the record's
// temperature function). The ions are the salts' ions, merged by symbol.
func NewMixture(salts []*library.Solute, tK float64) (*Mixture, error) {
	mx := &Mixture{aphi: AphiMoller88(tK)}
	index := map[string]int{}
	add := func(ion library.Ion) int {
		if i, ok := index[ion.Symbol]; ok {
			return i
		}
		index[ion.Symbol] = len(mx.ions)
		mx.ions = append(mx.ions, MixIon{Symbol: ion.Symbol, Charge: ion.Charge})
		mx.z = append(mx.z, float64(ion.Charge))
		return len(mx.ions) - 1
	}
	type link struct {
		c, a int
		p    binary
	}
	var links []link
	for k, s := range salts {
		if s.Osmotic.Kind != library.ModelPitzer || len(s.Ions) != 2 {
			return nil, errs.InvalidText(fmt.Sprintf("mixture[%d].solute", k), s.ID, "a Pitzer salt of one cation and one anion",
				"%s has no Pitzer parameters for a mixture", s.ID)
		}
		cat, an := s.Ions[0], s.Ions[1]
		if cat.Charge < 0 {
			cat, an = an, cat
		}
		p, inRange := pitzerParams(s, tK)
		links = append(links, link{add(cat), add(an), binary{set: true, b0: p.b0, b1: p.b1, b2: p.b2, cphi: p.cphi,
			a1: p.a1, a2: p.a2, inRange: inRange, fromSolute: s.ID}})
	}
	pos := make([]int, len(mx.ions))
	for i, ion := range mx.ions {
		if ion.Charge > 0 {
			pos[i] = len(mx.cat)
			mx.cat = append(mx.cat, i)
		} else {
			pos[i] = len(mx.an)
			mx.an = append(mx.an, i)
		}
	}
	mx.pair = make([][]binary, len(mx.cat))
	for c := range mx.pair {
		mx.pair[c] = make([]binary, len(mx.an))
	}
	for _, l := range links {
		mx.pair[pos[l.c]][pos[l.a]] = l.p
	}
	for _, l := range links {
		if !l.p.inRange {
			mx.Warnings = append(mx.Warnings, warn.New(warn.Temperature25C, l.p.fromSolute,
				"%s: Pitzer parameters used outside the temperature range of their data", l.p.fromSolute))
		}
	}
	n := len(mx.ions)
	mx.theta = make([][]float64, n)
	mx.psi = make([][][]float64, n)
	for i := range mx.theta {
		mx.theta[i] = make([]float64, n)
		mx.psi[i] = make([][]float64, n)
		for j := range mx.psi[i] {
			mx.psi[i][j] = make([]float64, n)
		}
	}
	if mx.fillMixing() && math.Abs(tK-ReferenceK) > 5 {
		mx.Warnings = append(mx.Warnings, warn.New(warn.Temperature25C, "mixture",
			"mixture: the like-ion mixing parameters θ and ψ are 25 °C data (Harvie, Møller & Weare 1984), used unchanged at %.4g °C", tK-ZeroCelsiusK))
	}
	return mx, nil
}

// Ions lists the mixture's ions in the order Eval takes their molalities.
func (mx *Mixture) Ions() []MixIon { return mx.ions }

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

// Eval returns the osmotic coefficient φ of the mixture at the ion
// molalities m (mol/kg water, in the order of Ions) and, when lnGamma is not
// nil (len(Ions)), each ion's ln γ:
//
//	φ − 1 = (2/Σmᵢ)[−A_φ I^{3/2}/(1 + b√I) + Σ_c Σ_a m_c m_a (B^φ_ca + Z C_ca)
//	        + Σ_{c<c′} m_c m_c′ (Φ^φ_cc′ + Σ_a m_a ψ_cc′a) + Σ_{a<a′} m_a m_a′ (Φ^φ_aa′ + Σ_c m_c ψ_aa′c)]
//	ln γ_M = z_M² F + Σ_a m_a (2B_Ma + Z C_Ma) + Σ_c m_c (2Φ_Mc + Σ_a m_a ψ_Mca)
//	        + Σ_{a<a′} m_a m_a′ ψ_aa′M + |z_M| Σ_c Σ_a m_c m_a C_ca     (and likewise for anions)
//	F = −A_φ[√I/(1 + b√I) + (2/b) ln(1 + b√I)] + Σ_c Σ_a m_c m_a B′_ca
//	    + Σ_{c<c′} m_c m_c′ Φ′_cc′ + Σ_{a<a′} m_a m_a′ Φ′_aa′
//
// with Z = Σ mᵢ|zᵢ|, C_ca = C^φ_ca/(2√|z_c z_a|), b = 1.2 (HMW 1984 eqs.
// 1–9; Pitzer 1991 eqs. 3-59 to 3-69). Electroneutrality is the caller's:
// Eval does not enforce it. Special cases: all molalities zero gives φ = 1
// and ln γ = 0.
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
	var sumCC float64 // Σ_c Σ_a m_c m_a C_ca
	for ci, c := range mx.cat {
		for ai, a := range mx.an {
			p := &mx.pair[ci][ai]
			if !p.set || m[c] == 0 && m[a] == 0 {
				continue
			}
			x1 := p.a1 * s
			bphi := p.b0 + p.b1*math.Exp(-x1)
			bb := p.b0 + p.b1*gFun(x1)
			bprime := 0.0
			if iStr > 0 {
				bprime = p.b1 * gPrime(x1) / iStr
			}
			if p.b2 != 0 {
				x2 := p.a2 * s
				bphi += p.b2 * math.Exp(-x2)
				bb += p.b2 * gFun(x2)
				if iStr > 0 {
					bprime += p.b2 * gPrime(x2) / iStr
				}
			}
			cc := p.cphi / (2 * math.Sqrt(math.Abs(mx.z[c]*mx.z[a])))
			mm := m[c] * m[a]
			osm += mm * (bphi + zSum*cc)
			f += mm * bprime
			sumCC += mm * cc
			if lnGamma != nil {
				lnGamma[c] += m[a] * (2*bb + zSum*cc)
				lnGamma[a] += m[c] * (2*bb + zSum*cc)
			}
		}
	}
	// Like-charged pairs: Φ = θ + ᴱθ, Φ′ = ᴱθ′, Φ^φ = Φ + IΦ′.
	like := func(group []int, other []int) {
		for x := 0; x < len(group); x++ {
			for y := x + 1; y < len(group); y++ {
				i, j := group[x], group[y]
				et, etp := mx.etheta(mx.z[i], mx.z[j], iStr, s)
				phi := mx.theta[i][j] + et
				mm := m[i] * m[j]
				sumPsi := 0.0
				for _, k := range other {
					sumPsi += m[k] * mx.psi[i][j][k]
				}
				osm += mm * (phi + iStr*etp + sumPsi)
				f += mm * etp
				if lnGamma != nil {
					lnGamma[i] += m[j] * (2*phi + sumPsi)
					lnGamma[j] += m[i] * (2*phi + sumPsi)
					for _, k := range other {
						lnGamma[k] += mm * mx.psi[i][j][k]
					}
				}
			}
		}
	}
	like(mx.cat, mx.an)
	like(mx.an, mx.cat)
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
//
// It exists to check Eval (the two are independent codings of the
// model) and is not on any hot path.
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
	for ci, c := range mx.cat {
		for ai, a := range mx.an {
			p := &mx.pair[ci][ai]
			if !p.set {
				continue
			}
			bb := p.b0 + p.b1*gFun(p.a1*s)
			if p.b2 != 0 {
				bb += p.b2 * gFun(p.a2*s)
			}
			cc := p.cphi / (2 * math.Sqrt(math.Abs(mx.z[c]*mx.z[a])))
			g += m[c] * m[a] * (2*bb + zSum*cc)
		}
	}
	for _, group := range [2][2][]int{{mx.cat, mx.an}, {mx.an, mx.cat}} {
		ions, other := group[0], group[1]
		for x := 0; x < len(ions); x++ {
			for y := x + 1; y < len(ions); y++ {
				i, j := ions[x], ions[y]
				et, _ := mx.etheta(mx.z[i], mx.z[j], iStr, s)
				sumPsi := 0.0
				for _, k := range other {
					sumPsi += m[k] * mx.psi[i][j][k]
				}
				g += m[i] * m[j] * (2*(mx.theta[i][j]+et) + sumPsi)
			}
		}
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
// u = ln x over [ln 1e-4, ln 1e3], for jFast.
var jTable struct {
	once  sync.Once
	u0, h float64
	hv    []float64
	dv    []float64
}

const (
	jTabLo    = 1e-4
	jTabHi    = 1e3
	jTabNodes = 1201
)

// jFast returns J(x) and J′(x) by cubic Hermite interpolation in ln x of a
// table of JIntegral (values and exact slopes), falling back to JIntegral
// outside 1e-4 ≤ x ≤ 1e3. J′ is the derivative of the interpolant itself,
// so ᴱθ′ stays the exact derivative of the ᴱθ used (Eval and ExcessGibbs
// agree to rounding). Interpolation error below 1e-9 relative in J and
// 5e-8 in J′, plus 1e-9 absolute in J′ for x below about 1e-2, where J
// behaves as x² ln x (TestJFast); the table is built once, on first use.
func jFast(x float64) (j, dj float64) {
	if !(x >= jTabLo && x < jTabHi) {
		return JIntegral(x)
	}
	t := &jTable
	t.once.Do(func() {
		t.u0 = math.Log(jTabLo)
		t.h = (math.Log(jTabHi) - t.u0) / (jTabNodes - 1)
		t.hv, t.dv = make([]float64, jTabNodes), make([]float64, jTabNodes)
		for k := range t.hv {
			xk := math.Exp(t.u0 + float64(k)*t.h)
			jk, dk := JIntegral(xk)
			t.hv[k], t.dv[k] = jk, xk*dk
		}
	})
	u := (math.Log(x) - t.u0) / t.h
	k := int(u)
	if k >= jTabNodes-1 {
		k = jTabNodes - 2
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
