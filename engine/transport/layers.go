package transport

import "math"

// This file holds the per-species concentration profile: given Jw, the
// solute flux N and the two active-layer face concentrations, with their
// derivatives in Jw. Everything is written with decaying exponentials only,
// so no intermediate overflows however large |Jw·R| becomes.

// pq returns, for y ≥ 0 and em = exp(−y),
//
//	P(y) = (1 − e^{−y})/y            (P(0) = 1)
//	Q(y) = (1 − (1 + y)·e^{−y})/y²   (Q(0) = 1/2) = −P′(y)
//
// Below y = 0.05 both come from their Taylor series,
// P = Σ (−y)ⁿ/(n+1)!, Q = Σ (−1)ⁿ (n+1) yⁿ/(n+2)!, truncated where the next
// term is below 1e-16 (P) and 3e-14 (Q, which only enters derivatives).
// Above, the closed forms lose at most about 2ε/y relative to cancellation.
func pq(y, em float64) (p, q float64) {
	if y < 0.05 {
		p = 1 + y*(-1.0/2+y*(1.0/6+y*(-1.0/24+y*(1.0/120+y*(-1.0/720+y*(1.0/5040+y*(-1.0/40320)))))))
		q = 1.0/2 + y*(-1.0/3+y*(1.0/8+y*(-1.0/30+y*(1.0/144+y*(-1.0/840+y*(1.0/5760))))))
		return p, q
	}
	iy := 1 / y
	return (1 - em) * iy, (1 - em - y*em) * iy * iy
}

// profile evaluates one species at water flux j ≥ 0 (the forward
// direction; Jw < 0 is handled by the mirror symmetry in speciesAt).
//
// With a = j·rf, b = j·rd, p = e^{−a}, e = e^{−b} and the unscaled
//
//	E = e^{a},  g = (E − 1)/j = rf·E·P(a),  h = (1 − e)/j = rd·P(b),
//	V = 1 + bp·(g + h),  U = cF·E − cD·e,  N = bp·U/V,
//
// every term is multiplied by p = 1/E so that nothing grows:
//
//	Vs = p + bp·(G + h·p),    G = g·p = rf·P(a)
//	N  = bp·(cF − cD·e·p)/Vs
//	cf = [cF·(1 + bp·h) + bp·G·cD·e]/Vs            (= cF·E − N·g)
//	cd = [cD·e·(p + bp·G) + bp·h·cF]/Vs            (= cD·e + N·h)
//
// Both numerators and Vs are sums of non-negative terms, so cf, cd ≥ 0.
// The derivatives follow by the quotient rule with G′ = −rf²·Q(a),
// h′ = −rd²·Q(b), p′ = −rf·p, e′ = −rd·e. Requires bp > 0 (speciesAt
// handles B = 0).
func profile(j, bp, cF, cD, rf, rd float64) (n, cf, dcf, cd, dcd float64) {
	a, b := j*rf, j*rd
	p, e := 1.0, 1.0
	if a != 0 {
		p = expNeg(-a)
	}
	if b != 0 {
		e = expNeg(-b)
	}
	pa, qa := pq(a, p)
	pb, qb := pq(b, e)
	g := rf * pa
	dg := -rf * rf * qa
	h := rd * pb
	dh := -rd * rd * qb
	dp := -rf * p
	de := -rd * e

	vs := p + bp*(g+h*p)
	iv := 1 / vs
	dvs := dp + bp*(dg+dh*p+h*dp)
	n = bp * (cF - cD*e*p) * iv

	xf := cF*(1+bp*h) + bp*g*cD*e
	dxf := bp * (cF*dh + cD*(dg*e+g*de))
	cf = xf * iv
	dcf = (dxf - cf*dvs) * iv

	xd := cD*e*(p+bp*g) + bp*h*cF
	dxd := cD*(de*(p+bp*g)+e*(dp+bp*dg)) + bp*dh*cF
	cd = xd * iv
	dcd = (dxd - cd*dvs) * iv
	return n, cf, dcf, cd, dcd
}

// face is an active-layer face concentration ready for π. When the model's
// concentration c_true exceeds FaceCapMolPerM3, c is held at the cap (dc = 0)
// and l = ln(c_true/cap) > 0 carries the excess, with dl = dl/dJw; the solver
// then extends π logarithmically past the cap,
//
//	π_ext = π(cap) + π′(cap)·cap·l,
//
// which is monotone in c_true, continuous with its first derivative at the
// cap, and finite for any Jw. During bracketing the exponential factors can
// ask for absurd concentrations; a flat cap there would let another species'
// rising contribution make the residual non-monotone, the logarithmic
// extension does not.
type face struct{ c, dc, l, dl float64 }

var logCap = math.Log(FaceCapMolPerM3)

// toFace caps a finite or infinite model concentration.
func toFace(c, dc float64) face {
	if c <= FaceCapMolPerM3 {
		if !finite(dc) {
			dc = 0
		}
		return face{c: c, dc: dc}
	}
	if c <= math.MaxFloat64 {
		dl := dc / c
		if !finite(dl) {
			dl = 0
		}
		return face{c: FaceCapMolPerM3, l: math.Log(c) - logCap, dl: dl}
	}
	// Only with a vanishing but non-zero B; the excess is beyond any use.
	return face{c: FaceCapMolPerM3, l: math.Log(math.MaxFloat64) - logCap}
}

// expFace returns the face for c_true = c0·exp(x) with dx/dJw = dx, computed
// in logarithms so that it never overflows (B = 0 profiles).
func expFace(c0, x, dx float64) face {
	if c0 == 0 {
		return face{}
	}
	lc := math.Log(c0) + x
	if lc <= logCap {
		c := c0 * math.Exp(x)
		return face{c: c, dc: dx * c}
	}
	return face{c: FaceCapMolPerM3, l: lc - logCap, dl: dx}
}

// speciesAt evaluates one species at any Jw. For Jw < 0 it uses the mirror
// symmetry of the equations: reversing Jw and swapping feed with draw
// (concentrations and resistances) maps the problem onto itself with
// N → −N and the two faces exchanged.
func speciesAt(jw, bp, cFb, cDb, rf, rd float64) (n float64, ff, fd face) {
	if bp == 0 {
		// No solute crosses the active layer: pure exponential profiles,
		// c_f = c_Fb·e^{Jw R_f}, c_d = c_Db·e^{−Jw R_d}.
		return 0, expFace(cFb, jw*rf, rf), expFace(cDb, -jw*rd, -rd)
	}
	var cf, dcf, cd, dcd float64
	if jw >= 0 {
		n, cf, dcf, cd, dcd = profile(jw, bp, cFb, cDb, rf, rd)
	} else {
		var mcf, dmcf, mcd, dmcd float64
		n, mcf, dmcf, mcd, dmcd = profile(-jw, bp, cDb, cFb, rd, rf)
		n, cd, dcd, cf, dcf = -n, mcf, -dmcf, mcd, -dmcd
	}
	return n, toFace(cf, dcf), toFace(cd, dcd)
}

// between clamps x into the closed interval spanned by u and v.
func between(x, u, v float64) float64 {
	lo, hi := math.Min(u, v), math.Max(u, v)
	if !(x >= lo) {
		return lo
	}
	if x > hi {
		return hi
	}
	return x
}

// supportInterface returns the concentration between the support and its
// outer boundary layer, from the converged state. The layer on the bulk
// side of the support has resistance rbl = 1/k, the support rs = S/D. It
// integrates from whichever end makes the exponential decay, and clamps the
// result between the active-layer face and the bulk (the profile in a layer
// is monotone, so the exact value lies there).
func supportInterface(ori Orientation, jw, n, cf, cd, cFb, cDb, rs, rbl float64) float64 {
	if ori == ALFS { // support on the draw side: face cd | support | BL | bulk cDb
		var c float64
		if jw >= 0 {
			x := jw * rbl
			em := expNeg(-x)
			p, _ := pq(x, em)
			c = cDb*em + n*rbl*p
		} else {
			y := -jw * rs
			em := expNeg(-y)
			p, _ := pq(y, em)
			c = cd*em - n*rs*p
		}
		return between(c, cd, cDb)
	}
	// AL-DS, support on the feed side: bulk cFb | BL | support | face cf
	var c float64
	if jw >= 0 {
		x := jw * rs
		em := expNeg(-x)
		p, _ := pq(x, em)
		c = cf*em + n*rs*p
	} else {
		y := -jw * rbl
		em := expNeg(-y)
		p, _ := pq(y, em)
		c = cFb*em - n*rbl*p
	}
	return between(c, cf, cFb)
}
