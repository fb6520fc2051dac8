package transport

import "math"

// Ions crossing the active layer.
//
// A species with a charge z ≠ 0 is an ion. Through the active layer every
// species obeys the solution–diffusion–electromigration form of the
// Nernst–Planck equation with the Goldman constant-field approximation
// (Goldman 1943, J. Gen. Physiol. 27:37; Hodgkin & Katz 1949, J. Physiol.
// 108:37; applied to dense polyamide layers as the SDEM model of
// Yaroshchuk & Bruening 2017, J. Membr. Sci. 523:361 — journal details from
// memory): with u = F(ψ_f − ψ_d)/RT the electric potential drop from the
// feed face to the draw face and w = z·u,
//
//	N = B·[g(w)·c_f − g(−w)·c_d],   g(w) = w/(1 − e^{−w})   (g(0) = 1),
//
// where B = D_m·K/δ folds in the partition coefficient, so c_f and c_d are
// solution concentrations at the faces. With u = 0 it is the classical
// N = B·(c_f − c_d). The potential is set by zero electric current,
//
//	Σ z_i·N_i = 0,
//
// which is strictly increasing in u (each N_i rises with z_i·u), so u is
// unique; with every ion at one B and one resistance, u = 0 exactly (a
// single salt with one B crosses as one solute). Coupled this way a salt
// whose counter-ion is held back crosses slowly, and ions of one sign
// exchange across the membrane (a feed cation entering as a draw cation
// leaves), the bidirectional permeation of electrolytes that Hancock,
// Phillip, Elimelech & Cath (2011, Environ. Sci. Technol. 45:10642)
// describe for FO.
//
// Limits of the model: in the unstirred layers (support, boundary
// layers) each species moves by convection and diffusion alone, with its
// own resistance; the diffusion potential there is not modelled, so ions
// of one side should share one diffusivity (engine/scenario gives every
// ion of a side that side's solution diffusivity), which keeps the
// profiles electroneutral exactly. No fixed membrane charge (Donnan
// exclusion), no dielectric exclusion beyond what B carries, no ion
// pairing in the membrane.

// ghk returns g(w) = w/(1 − e^{−w}) and g′(w).
func ghk(w float64) (g, dg float64) {
	if math.Abs(w) < 1e-3 {
		// g = 1 + w/2 + w²/12 − w⁴/720, g′ = 1/2 + w/6 − w³/180.
		w2 := w * w
		return 1 + w*(0.5+w/12) - w2*w2/720, 0.5 + w/6 - w2*w/180
	}
	d := -math.Expm1(-w) // 1 − e^{−w}
	g = w / d
	if math.IsInf(d, 0) { // w ≪ 0: g → 0
		return 0, 0
	}
	// g′ = (d − w·e^{−w})/d² = (1 − g·e^{−w})/d, with e^{−w} = 1 − d.
	dg = (1 - g*(1-d)) / d
	if !finite(dg) {
		dg = 0
	}
	return g, dg
}

// partials of one species' profile: value and derivatives in Jw, in the
// feed-face coefficient bf = B·g(w) and in the draw-face coefficient
// bd = B·g(−w).
type partials struct {
	n, cf, cd       float64
	nJ, cfJ, cdJ    float64
	nBf, cfBf, cdBf float64
	nBd, cfBd, cdBd float64
}

// profileU is profile with different coefficients at the two faces of
// the active layer, N = bf·c_f − bd·c_d, for j ≥ 0. With the notation of
// profile,
//
//	Vs = p + bf·G + bd·h·p
//	N  = (bf·cF − bd·cD·e·p)/Vs
//	cf = [cF·(1 + bd·h) + bd·G·cD·e]/Vs
//	cd = [cD·e·(p + bf·G) + bf·h·cF]/Vs
//
// (profile is the case bf = bd). Requires bf, bd > 0 or one of them 0.
func profileU(j, bf, bd, cF, cD, rf, rd float64, out *partials) {
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

	vs := p + bf*g + bd*h*p
	iv := 1 / vs
	dvs := dp + bf*dg + bd*(dh*p+h*dp)

	num := bf*cF - bd*cD*e*p
	n := num * iv
	dnum := -bd * cD * (de*p + e*dp)
	out.n = n
	out.nJ = (dnum - n*dvs) * iv
	out.nBf = (cF - n*g) * iv
	out.nBd = -(cD*e + n*h) * p * iv

	xf := cF*(1+bd*h) + bd*g*cD*e
	cf := xf * iv
	out.cf = cf
	out.cfJ = (bd*(cF*dh+cD*(dg*e+g*de)) - cf*dvs) * iv
	out.cfBf = -cf * g * iv
	out.cfBd = (cF*h + g*cD*e - cf*h*p) * iv

	xd := cD*e*(p+bf*g) + bf*h*cF
	cd := xd * iv
	out.cd = cd
	out.cdJ = (cD*(de*(p+bf*g)+e*(dp+bf*dg)) + bf*dh*cF - cd*dvs) * iv
	out.cdBf = (cD*e*g + h*cF - cd*g) * iv
	out.cdBd = -cd * h * p * iv
}

// ionAt evaluates one species with B > 0 at any Jw and face coefficients
// (bf, bd), by mirror symmetry for Jw < 0 (see speciesAt): reversing Jw
// and swapping feed with draw maps the problem onto itself with N → −N,
// the faces exchanged and bf ↔ bd.
func ionAt(j, bf, bd, cF, cD, rf, rd float64, out *partials) {
	if j >= 0 {
		profileU(j, bf, bd, cF, cD, rf, rd, out)
		return
	}
	var m partials
	profileU(-j, bd, bf, cD, cF, rd, rf, &m)
	*out = partials{
		n: -m.n, cf: m.cd, cd: m.cf,
		nJ: m.nJ, cfJ: -m.cdJ, cdJ: -m.cfJ,
		nBf: -m.nBd, cfBf: m.cdBd, cdBf: m.cfBd,
		nBd: -m.nBf, cfBd: m.cdBf, cdBd: m.cfBf,
	}
}

// ionState is one species at (Jw, u): the profile and its derivatives in
// Jw and u.
type ionState struct {
	n, cf, cd    float64
	nJ, cfJ, cdJ float64
	nU, cfU, cdU float64
}

// ionEval fills st for species sp (B > 0) at water flux j and potential u.
func ionEval(sp *speciesState, j, u float64, st *ionState) {
	w := float64(sp.z) * u
	gp, dgp := ghk(w)
	gm, dgm := ghk(-w)
	var p partials
	ionAt(j, sp.bp*gp, sp.bp*gm, sp.cFb, sp.cDb, sp.rf, sp.rd, &p)
	// d(bf)/du = B·z·g′(w), d(bd)/du = −B·z·g′(−w).
	dbf, dbd := sp.bp*float64(sp.z)*dgp, -sp.bp*float64(sp.z)*dgm
	*st = ionState{
		n: p.n, cf: p.cf, cd: p.cd,
		nJ: p.nJ, cfJ: p.cfJ, cdJ: p.cdJ,
		nU: p.nBf*dbf + p.nBd*dbd, cfU: p.cfBf*dbf + p.cfBd*dbd, cdU: p.cdBf*dbf + p.cdBd*dbd,
	}
}

// potential solves Σ z_i N_i(j, u) = 0 for u by safeguarded Newton steps
// from u0 (the last solution: u moves little between evaluations),
// leaving every species' state in s.ion. It returns u and du/dJ.
func (s *solver) potential(j, u0 float64) (u, dudj float64) {
	const maxIt = 100
	cur := func(u float64) (i, di, scale float64) {
		for k := 0; k < s.ns; k++ {
			sp := &s.sp[k]
			if sp.z == 0 || sp.bp == 0 {
				continue
			}
			st := &s.ion[k]
			ionEval(sp, j, u, st)
			z := float64(sp.z)
			i += z * st.n
			di += z * st.nU
			scale += math.Abs(z * st.n)
		}
		return i, di, scale
	}
	lo, hi := math.Inf(-1), math.Inf(1)
	u = u0
	var i, di, scale float64
	at := math.NaN() // where the states were last evaluated
	for it := 0; it < maxIt; it++ {
		i, di, scale = cur(u)
		at = u
		if math.Abs(i) <= 1e-14*scale || scale == 0 {
			break
		}
		if i > 0 {
			hi = u
		} else {
			lo = u
		}
		next := u - i/di
		if !(di > 0) || !finite(next) || !(next > lo && next < hi) {
			switch {
			case math.IsInf(lo, -1):
				next = hi - math.Max(1, 2*math.Abs(hi-u))
			case math.IsInf(hi, 1):
				next = lo + math.Max(1, 2*math.Abs(u-lo))
			default:
				next = 0.5 * (lo + hi)
			}
		}
		if next == u || (!math.IsInf(lo, 0) && !math.IsInf(hi, 0) && hi-lo <= 4*eps*math.Max(1, math.Abs(u))) {
			break
		}
		u = next
	}
	if at != u {
		_, di, _ = cur(u)
	}
	// Neutral species do not depend on u; species with B = 0 take the
	// uncoupled path in eval.
	var iJ float64
	for k := 0; k < s.ns; k++ {
		sp := &s.sp[k]
		switch {
		case sp.bp == 0:
		case sp.z != 0:
			iJ += float64(sp.z) * s.ion[k].nJ
		default:
			ionEval(sp, j, u, &s.ion[k])
		}
	}
	if di > 0 {
		dudj = -iJ / di
	}
	return u, dudj
}

// OneWay returns the two one-way fluxes of species i through the active
// layer at a solution (mol m⁻² s⁻¹, both ≥ 0): toFeed = B·g(−z·u)·c_d
// leaves the draw face, toDraw = B·g(z·u)·c_f leaves the feed face; the
// net flux N_i is toDraw − toFeed. The gross loss of a draw species is its
// toFeed.
func OneWay(in *Input, r *Result, i int) (toFeed, toDraw float64) {
	sp, sr := &in.Species[i], &r.Species[i]
	w := float64(sp.Charge) * r.Potential
	gp, _ := ghk(w)
	gm, _ := ghk(-w)
	return sp.BMPerS * gm * sr.DrawFaceMolPerM3, sp.BMPerS * gp * sr.FeedFaceMolPerM3
}
