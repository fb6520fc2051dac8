package thermo

import (
	"math"

	"drawsift/engine/library"
)

// pitzerB is b of the Pitzer equations, 1.2 kg^½ mol^-½, used for every
// salt (Pitzer 1973, J. Phys. Chem. 77:268; Pitzer 1991, ch. 3).
const pitzerB = 1.2

// AphiMoller88 returns the Debye–Hückel osmotic slope A_φ (kg^½ mol^-½) at
// tK kelvin:
//
//	A_φ = a1 + a2·T + a3/T + a4·ln T + a5/(T−263) + a6·T² + a7/(680−T) + a8/(T−227)
//
// Source: Møller (1988), Geochim. Cosmochim. Acta 52:821, eq. 13 (a8 = 0).
// Valid 273.15–573.15 K. A_φ(298.15 K) = 0.39148, against Pitzer (1991)
// ch. 3 Table 1's 0.3915.
func AphiMoller88(tK float64) float64 {
	const (
		a1 = 3.36901532e-1
		a2 = -6.32100430e-4
		a3 = 9.14252359
		a4 = -1.35143986e-2
		a5 = 2.26089488e-3
		a6 = 1.92118597e-6
		a7 = 45.2586464
	)
	return a1 + a2*tK + a3/tK + a4*math.Log(tK) + a5/(tK-263) + a6*tK*tK + a7/(680-tK)
}

// pitzer holds one salt's Pitzer parameters at one temperature, with the
// stoichiometric factors folded in so that an evaluation costs one sqrt
// and one or two exp.
type pitzer struct {
	nu     float64 // ν = νM + νX
	zz     float64 // |zM·zX|
	iPerM  float64 // I/m = ½(νM zM² + νX zX²)
	cB, cC float64 // 2νMνX/ν and 2(νMνX)^{3/2}/ν
	aphi   float64
	b0, b1 float64
	b2     float64
	cphi   float64
	a1, a2 float64
}

// pitzerParams evaluates the record's parameters at tK. It reports whether
// tK lies inside the temperature range of the parameters' data.
func pitzerParams(s *library.Solute, tK float64) (p pitzer, inRange bool) {
	m := s.Osmotic
	cat, an := s.Ions[0], s.Ions[1]
	if cat.Charge < 0 {
		cat, an = an, cat
	}
	nM, nX := float64(cat.Count), float64(an.Count)
	zM, zX := float64(cat.Charge), float64(an.Charge)
	p.nu = nM + nX
	p.zz = math.Abs(zM * zX)
	p.iPerM = 0.5 * (nM*zM*zM + nX*zX*zX)
	p.cB = 2 * nM * nX / p.nu
	p.cC = 2 * math.Pow(nM*nX, 1.5) / p.nu
	p.aphi = AphiMoller88(tK)
	p.a1, p.a2 = m.Alpha1, m.Alpha2
	p.b0, p.b1, p.b2, p.cphi = m.Beta0, m.Beta1, m.Beta2, m.CPhi

	t := m.Temperature
	if t == nil {
		// 25 °C data only: accepted within ±5 K without a warning
		// (common practice: Pitzer parameters change by well under 1 % of
		// φ over that span).
		return p, math.Abs(tK-ReferenceK) <= 5
	}
	tC := tK - ZeroCelsiusK
	inRange = tC >= t.MinC-1e-9 && tC <= t.MaxC+1e-9
	switch t.Kind {
	case library.TempLinear:
		dT := tK - ReferenceK
		p.b0 += t.DBeta0DT * dT
		p.b1 += t.DBeta1DT * dT
		p.b2 += t.DBeta2DT * dT
		p.cphi += t.DCPhiDT * dT
	case library.TempQuadratic, library.TempHolmesMesmer:
		// The published temperature function is applied as a difference
		// from 25 °C, p(T) = p₂₅ + f(T) − f(298.15 K), so that results at
		// 25 °C are exactly those of the record's 25 °C set (the functions
		// were fitted to other data and differ slightly there).
		f := quadraticT
		if t.Kind == library.TempHolmesMesmer {
			f = holmesMesmerT
		}
		p.b0 += f(t.Beta0Coeffs, tK) - f(t.Beta0Coeffs, ReferenceK)
		p.b1 += f(t.Beta1Coeffs, tK) - f(t.Beta1Coeffs, ReferenceK)
		p.cphi += f(t.CPhiCoeffs, tK) - f(t.CPhiCoeffs, ReferenceK)
	}
	return p, inRange
}

// quadraticT is the de Lima & Pitzer (1983) form p = q0·T² + q1·T + q2.
func quadraticT(c []float64, tK float64) float64 { return (c[0]*tK+c[1])*tK + c[2] }

// holmesMesmerT is the Holmes & Mesmer (1983) form
// p = a1 + a2(1/T − 1/Tr) + a3 ln(T/Tr) + a4(T − Tr) + a5(T² − Tr²) + a6 ln(T − 260).
func holmesMesmerT(a []float64, tK float64) float64 {
	const tr = ReferenceK
	return a[0] + a[1]*(1/tK-1/tr) + a[2]*math.Log(tK/tr) + a[3]*(tK-tr) +
		a[4]*(tK*tK-tr*tr) + a[5]*math.Log(tK-260)
}

// phi returns the osmotic coefficient at molality m (mol/kg):
//
//	φ − 1 = |zM zX| f^φ + m (2νMνX/ν) B^φ + m² (2(νMνX)^{3/2}/ν) C^φ
//	f^φ = −A_φ √I / (1 + b√I)
//	B^φ = β⁽⁰⁾ + β⁽¹⁾ exp(−α₁√I) + β⁽²⁾ exp(−α₂√I)
//
// Pitzer (1973) J. Phys. Chem. 77:268; Pitzer & Mayorga (1973) eqs. 2–4;
// Pitzer (1991) ch. 3. Special cases: φ(0) = 1.
func (p *pitzer) phi(m float64) float64 {
	s := math.Sqrt(p.iPerM * m)
	f := -p.aphi * s / (1 + pitzerB*s)
	bphi := p.b0 + p.b1*math.Exp(-p.a1*s)
	if p.b2 != 0 {
		bphi += p.b2 * math.Exp(-p.a2*s)
	}
	return 1 + p.zz*f + m*(p.cB*bphi+m*p.cC*p.cphi)
}

// mPhi returns g = m·φ and its derivative dg/dm (see phi for the model).
//
//	dg/dm = 1 − |zz|A_φ [s/(1+bs) + s/(2(1+bs)²)]
//	        + cB [2mβ⁽⁰⁾ + Σ β⁽ⁱ⁾ e^{−αᵢs} (2m − αᵢ m s/2)] + 3 cC C^φ m²
//
// with s = √I (ds/dm = s/2m).
func (p *pitzer) mPhi(m float64) (g, dg float64) {
	s := math.Sqrt(p.iPerM * m)
	d := 1 + pitzerB*s
	e1 := math.Exp(-p.a1 * s)
	bphi := p.b0 + p.b1*e1
	dB := 2*m*p.b0 + p.b1*e1*(2*m-0.5*p.a1*m*s)
	if p.b2 != 0 {
		e2 := math.Exp(-p.a2 * s)
		bphi += p.b2 * e2
		dB += p.b2 * e2 * (2*m - 0.5*p.a2*m*s)
	}
	g = m - p.zz*p.aphi*m*s/d + m*m*(p.cB*bphi+m*p.cC*p.cphi)
	dg = 1 - p.zz*p.aphi*(s/d+0.5*s/(d*d)) + p.cB*dB + 3*p.cC*p.cphi*m*m
	return g, dg
}

// lnGamma returns ln γ±, the mean molal activity coefficient's logarithm:
//
//	ln γ± = |zM zX| f^γ + m (2νMνX/ν) B^γ + m² (2(νMνX)^{3/2}/ν) (3/2)C^φ
//	f^γ = −A_φ [√I/(1 + b√I) + (2/b) ln(1 + b√I)]
//	B^γ = 2β⁽⁰⁾ + Σᵢ (2β⁽ⁱ⁾/(αᵢ² I)) [1 − (1 + αᵢ√I − ½αᵢ² I) exp(−αᵢ√I)]
//
// Pitzer & Mayorga (1973) eqs. 5–7; Pitzer (1991) ch. 3. The exp term
// inside B^γ is easy to drop by mistake (γ±(NaCl, 1 m) would read 0.684
// instead of 0.656); a test guards it. Special cases: ln γ±(0) = 0.
func (p *pitzer) lnGamma(m float64) float64 {
	if m <= 0 {
		return 0
	}
	i := p.iPerM * m
	s := math.Sqrt(i)
	f := -p.aphi * (s/(1+pitzerB*s) + 2/pitzerB*math.Log1p(pitzerB*s))
	term := func(beta, alpha float64) float64 {
		if beta == 0 {
			return 0
		}
		x := alpha * s
		return 2 * beta / (alpha * alpha * i) * (1 - (1+x-0.5*x*x)*math.Exp(-x))
	}
	bg := 2*p.b0 + term(p.b1, p.a1) + term(p.b2, p.a2)
	return p.zz*f + m*p.cB*bg + m*m*p.cC*1.5*p.cphi
}

// PM73TableVIToPlain converts the parameters of a 2-1 or 1-2 salt as
// printed in Pitzer & Mayorga (1973) Table VI — (4/3)β⁽⁰⁾, (4/3)β⁽¹⁾ and
// (2^{5/2}/3)C^φ — to the plain β⁽⁰⁾, β⁽¹⁾, C^φ used by this package
// (PM73 eq. 13 and the table's heading; the converted values coincide with
// those printed by Harvie, Møller & Weare 1984, Table 1).
func PM73TableVIToPlain(b0Tab, b1Tab, cphiTab float64) (b0, b1, cphi float64) {
	return 0.75 * b0Tab, 0.75 * b1Tab, cphiTab * 3 / math.Pow(2, 2.5)
}
