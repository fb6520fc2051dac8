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

// ghk2 returns g(w), g′(w), g(−w) and g′(−w) for g(w) = w/(1 − e^{−w})
// from one exponential: with d = 1 − e^{−w}, g(w) = w/d,
// g(−w) = g(w)·(1 − d), g′(w) = (1 − g(w)(1 − d))/d and
// g′(−w) = −(1 − d − g(−w))/d.
func ghk2(w float64) (gp, dgp, gm, dgm float64) {
	if math.Abs(w) < 1e-3 {
		// g(±w) = 1 ± w/2 + w²/12 − w⁴/720, g′(±w) = 1/2 ± w/6 ∓ w³/180.
		w2 := w * w
		even, odd := 1+w2/12-w2*w2/720, w/2
		deven, dodd := 0.5, w/6-w2*w/180
		return even + odd, deven + dodd, even - odd, deven - dodd
	}
	d := -math.Expm1(-w)  // 1 − e^{−w}
	if math.IsInf(d, 0) { // w ≪ 0: g(w) → 0, g(−w) → −w
		return 0, 0, -w, 1
	}
	e := 1 - d // e^{−w}
	gp = w / d
	gm = gp * e
	dgp = (1 - gp*e) / d
	dgm = -(e - gm) / d
	if !finite(dgp) {
		dgp = 0
	}
	if !finite(dgm) {
		dgm = 0
	}
	return gp, dgp, gm, dgm
}

// ghkZ is ghk2 at w = z·u for an integer charge, given d1 = 1 − e^{−u}
// and e1 = e^{−u}: the exponential of every charge follows from e1 by
// products, with 1 − e^{−zu} = d1·(1 + e1 + … + e1^{z−1}) for z > 0 and
// −(1 − e^{−|z|u})/e1^{|z|} for z < 0, free of cancellation.
func ghkZ(z int, u, d1, e1 float64) (gp, dgp, gm, dgm float64) {
	w := float64(z) * u
	if math.Abs(w) < 1e-3 || math.IsInf(d1, 0) || e1 == 0 {
		return ghk2(w)
	}
	az := z
	if az < 0 {
		az = -az
	}
	sum, pw := 1.0, 1.0
	for k := 1; k < az; k++ {
		pw *= e1
		sum += pw
	}
	d := d1 * sum // 1 − e^{−|z|u}
	if z < 0 {
		d = -d / (pw * e1) // 1 − e^{|z|u}
	}
	if !finite(d) || d == 0 {
		return ghk2(w)
	}
	e := 1 - d // e^{−w}
	gp = w / d
	gm = gp * e
	dgp = (1 - gp*e) / d
	dgm = -(e - gm) / d
	if !finite(dgp) || !finite(dgm) || !finite(gm) {
		return ghk2(w)
	}
	return gp, dgp, gm, dgm
}

// ghk returns g(w) = w/(1 − e^{−w}) and g′(w).
func ghk(w float64) (g, dg float64) {
	g, dg, _, _ = ghk2(w)
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

// jState holds the parts of a species' profile that depend on Jw only
// (for j ≥ 0, with the resistances rf, rd of profile), so that the
// membrane-potential iteration at one Jw costs arithmetic alone.
type jState struct{ p, e, g, dg, h, dh, dp, de float64 }

func newJState(j, rf, rd float64) jState {
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
	return jState{p: p, e: e, g: rf * pa, dg: -rf * rf * qa, h: rd * pb, dh: -rd * rd * qb, dp: -rf * p, de: -rd * e}
}

// profileJ is profile with different coefficients at the two faces of
// the active layer, N = bf·c_f − bd·c_d, for j ≥ 0, from a prepared
// jState. With the notation of profile,
//
//	Vs = p + bf·G + bd·h·p
//	N  = (bf·cF − bd·cD·e·p)/Vs
//	cf = [cF·(1 + bd·h) + bd·G·cD·e]/Vs
//	cd = [cD·e·(p + bf·G) + bf·h·cF]/Vs
//
// (profile is the case bf = bd). Requires bf, bd > 0 or one of them 0.
func profileJ(st *jState, bf, bd, cF, cD float64, out *partials) {
	p, e, g, dg, h, dh, dp, de := st.p, st.e, st.g, st.dg, st.h, st.dh, st.dp, st.de
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

// fluxJ is the net flux of profileJ alone, with its derivatives in bf and
// bd: what the zero-current iteration needs.
func fluxJ(st *jState, bf, bd, cF, cD float64) (n, nBf, nBd float64) {
	iv := 1 / (st.p + bf*st.g + bd*st.h*st.p)
	n = (bf*cF - bd*cD*st.e*st.p) * iv
	return n, (cF - n*st.g) * iv, -(cD*st.e + n*st.h) * st.p * iv
}

// ionFlux is the net flux of species sp at (j, u) and its derivative in
// u (see ionEval).
func ionFlux(sp *speciesState, j, u, d1, e1 float64, js *jState) (n, nU float64) {
	gp, dgp, gm, dgm := ghkZ(sp.z, u, d1, e1)
	bf, bd := sp.bp*gp, sp.bp*gm
	var nBf, nBd float64
	if j >= 0 {
		n, nBf, nBd = fluxJ(js, bf, bd, sp.cFb, sp.cDb)
	} else {
		n, nBd, nBf = fluxJ(js, bd, bf, sp.cDb, sp.cFb)
		n, nBf, nBd = -n, -nBf, -nBd
	}
	z := float64(sp.z)
	return n, nBf*sp.bp*z*dgp - nBd*sp.bp*z*dgm
}

// ionAt evaluates one species with B > 0 at water flux j (its jState st
// made for |j|, with the resistances swapped when j < 0) and face
// coefficients (bf, bd), by mirror symmetry for Jw < 0 (see speciesAt):
// reversing Jw and swapping feed with draw maps the problem onto itself
// with N → −N, the faces exchanged and bf ↔ bd.
func ionAt(j float64, st *jState, bf, bd, cF, cD float64, out *partials) {
	if j >= 0 {
		profileJ(st, bf, bd, cF, cD, out)
		return
	}
	var m partials
	profileJ(st, bd, bf, cD, cF, &m)
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
	js           jState // at |Jw| (resistances swapped for Jw < 0)
}

// ionPrepare sets the species' jState for water flux j.
func ionPrepare(sp *speciesState, j float64, st *ionState) {
	if j >= 0 {
		st.js = newJState(j, sp.rf, sp.rd)
	} else {
		st.js = newJState(-j, sp.rd, sp.rf)
	}
}

// ionEval fills st for species sp (B > 0) at water flux j and potential
// u (d1 = 1 − e^{−u}, e1 = e^{−u}); st.js must be prepared for j.
func ionEval(sp *speciesState, j, u, d1, e1 float64, st *ionState) {
	gp, dgp, gm, dgm := ghkZ(sp.z, u, d1, e1)
	var p partials
	ionAt(j, &st.js, sp.bp*gp, sp.bp*gm, sp.cFb, sp.cDb, &p)
	// d(bf)/du = B·z·g′(w), d(bd)/du = −B·z·g′(−w).
	dbf, dbd := sp.bp*float64(sp.z)*dgp, -sp.bp*float64(sp.z)*dgm
	st.n, st.cf, st.cd = p.n, p.cf, p.cd
	st.nJ, st.cfJ, st.cdJ = p.nJ, p.cfJ, p.cdJ
	st.nU, st.cfU, st.cdU = p.nBf*dbf+p.nBd*dbd, p.cfBf*dbf+p.cfBd*dbd, p.cdBf*dbf+p.cdBd*dbd
}

// potential solves Σ z_i N_i(j, u) = 0 for u by safeguarded Newton steps
// from u0 (the last solution carried along its slope: u moves little
// between evaluations), on the net fluxes alone, then leaves every
// species' full state at u in s.ion. It returns u and du/dJ.
func (s *solver) potential(j, u0 float64) (u, dudj float64) {
	const maxIt = 100
	for k := 0; k < s.ns; k++ {
		if s.sp[k].bp > 0 {
			ionPrepare(&s.sp[k], j, &s.ion[k])
		}
	}
	cur := func(u float64) (i, di, scale float64) {
		d1 := -math.Expm1(-u)
		e1 := 1 - d1
		for k := 0; k < s.ns; k++ {
			sp := &s.sp[k]
			if sp.z == 0 || sp.bp == 0 {
				continue
			}
			n, nU := ionFlux(sp, j, u, d1, e1, &s.ion[k].js)
			z := float64(sp.z)
			i += z * n
			di += z * nU
			scale += math.Abs(z * n)
		}
		return i, di, scale
	}
	lo, hi := math.Inf(-1), math.Inf(1)
	u = u0
	var i, di, scale float64
	for it := 0; it < maxIt; it++ {
		i, di, scale = cur(u)
		s.uEvals++
		if math.Abs(i) <= 1e-14*scale || scale == 0 {
			break
		}
		if i > 0 {
			hi = u
		} else {
			lo = u
		}
		next := u - i/di
		if di > 0 && math.Abs(i/di) <= 1e-8 {
			// A last Newton step this small is exact to its square
			// (~1e-16 relative): take it without checking.
			u = next
			break
		}
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
	// The states of every species with B > 0 at the final u, with their
	// derivatives (and the slope of the current in u for du/dJ).
	d1 := -math.Expm1(-u)
	e1 := 1 - d1
	di = 0
	// Neutral species do not depend on u; species with B = 0 take the
	// uncoupled path in eval.
	var iJ float64
	for k := 0; k < s.ns; k++ {
		sp := &s.sp[k]
		if sp.bp == 0 {
			continue
		}
		st := &s.ion[k]
		ionEval(sp, j, u, d1, e1, st)
		z := float64(sp.z)
		iJ += z * st.nJ
		di += z * st.nU
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
	gp, _, gm, _ := ghk2(w)
	return sp.BMPerS * gm * sr.DrawFaceMolPerM3, sp.BMPerS * gp * sr.FeedFaceMolPerM3
}
