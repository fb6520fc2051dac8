package transport

import (
	"math"

	"drawsift/engine/errs"
	"drawsift/engine/thermo"
)

// Root finder for the water flux. The residual
//
//	f(J) = A·(π_d(J) − π_f(J) − ΔP) − J
//
// is strictly decreasing in J (π_d falls and π_f rises with J, and the −J
// term is strictly decreasing), so it has exactly one root, of the sign of
// f(0); TestResidualMonotone samples this on random inputs. Past
// FaceCapMolPerM3 the logarithmic extension of π (see face) keeps the
// residual finite and monotone for every J.
//
// Method (chosen by benchmark: plain safeguarded Newton from Jw = 0 needed
// 7–9 evaluations on the BenchmarkSolve cases, this needs 4–5; the mean
// over the robustness test's inputs is 4.4):
//
//  1. Evaluate f(0) and f′(0): the sign gives the direction.
//  2. First guess: the root of a two-exponential model of f fitted at 0
//     (firstGuess), found from a Lambert W estimate and three Newton steps on
//     its logarithmic form. For a van 't Hoff draw, pure-water feed, B = 0
//     and no ECP it is the exact root (McCutcheon & Elimelech 2006);
//     elsewhere it is typically within a few per cent. Using the same model
//     for later steps saved too few evaluations to pay for itself.
//  3. Newton steps with the analytic derivative, kept inside the bracket
//     [lo, hi] of known signs; a step that leaves the bracket or fails to
//     halve the step before last becomes bisection (rtsafe-style safeguard),
//     and while one side of the bracket is still open the search grows
//     geometrically.
//  4. Stop when |f| ≤ 1e-12·A·(π_Db + π_Fb + |ΔP|), or when the Newton step
//     or the bracket is at the resolution of float64 (then the residual must
//     still be ≤ 1e-9 relative).

const (
	relTol        = 1e-12
	acceptRelTol  = 1e-9
	maxIterations = 200
	eps           = 0x1p-52
)

type speciesState struct {
	bp, cFb, cDb, rf, rd float64
	z                    int
	pi                   OsmoticFunc
	// state at the last evaluation
	n, cf, cd float64
}

type solver struct {
	a, dp float64
	ns    int
	sp    [MaxSpecies]speciesState
	// Coupled ions (see ions.go): coupled is set when charged species
	// cross with different B or resistances, so that the membrane
	// potential u is not 0; ion holds each species' state at (Jw, u).
	coupled bool
	u, dudj float64
	uEvals  int // zero-current evaluations, all Jw
	uJ      float64
	uAt     bool // u, dudj hold at Jw = uJ
	ion     [MaxSpecies]ionState
	// Composition π (Input.FacePi): the face concentrations and ∂π/∂c.
	facePi  CompositionPi
	buf     []float64 // Result.buf: the face concentrations and ∂π/∂c
	piF     float64   // Σ π at the feed face, last evaluation
	piD     float64   // Σ π at the draw face, last evaluation
	dPiD    float64   // dπ_d/dJ, last evaluation
	dPiF    float64   // dπ_f/dJ, last evaluation
	lastJ   float64
	evals   int
	badPi   int // index+1 of a species whose Pi misbehaved, 0 if none
	badC    float64
	in      *Input
	drive   float64 // π_Db + π_Fb + |ΔP|
	piDbulk float64
	piFbulk float64
}

func (s *solver) setup(in *Input) {
	s.in = in
	s.a, s.dp = in.AMPerSPa, in.DeltaPPa
	s.ns = len(in.Species)
	s.facePi = in.FacePi
	invKD, invKF := 1/in.KDrawMPerS, 1/in.KFeedMPerS // 0 for +Inf
	first := -1
	for i := range in.Species {
		sp := &in.Species[i]
		st := &s.sp[i]
		st.bp, st.cFb, st.cDb, st.pi, st.z = sp.BMPerS, sp.FeedBulkMolPerM3, sp.DrawBulkMolPerM3, sp.Pi, sp.Charge
		k := in.SM / sp.DM2PerS
		if in.Orientation == ALFS {
			st.rf, st.rd = invKF, k+invKD
		} else {
			st.rf, st.rd = k+invKF, invKD
		}
		// Ions crossing with one B and one resistance keep u = 0 exactly
		// (Σ z N is then the same combination of the electroneutral
		// bulks for every Jw); otherwise the potential is solved.
		if st.z != 0 && st.bp > 0 {
			if first < 0 {
				first = i
			} else if f := &s.sp[first]; st.bp != f.bp || st.rf != f.rf || st.rd != f.rd {
				s.coupled = true
			}
		}
	}
}

// pi evaluates species i's osmotic function and records misbehaviour.
func (s *solver) pi(i int, c float64) (float64, float64) {
	p, d := s.sp[i].pi(c)
	if !(p >= 0 && p <= math.MaxFloat64) || !(d <= math.MaxFloat64 && d >= -math.MaxFloat64) {
		if s.badPi == 0 {
			s.badPi, s.badC = i+1, c
		}
		return 0, 0
	}
	if d < 0 {
		d = 0 // contract: non-decreasing; tolerate rounding-level negatives
	}
	return p, d
}

// eval returns f(J) and f′(J) and keeps the species state at J.
func (s *solver) eval(j float64) (f, df float64) {
	if s.coupled || s.facePi != nil {
		return s.evalGeneral(j)
	}
	s.evals++
	s.lastJ = j
	var piD, piF, sD, sF float64
	for i := 0; i < s.ns; i++ {
		st := &s.sp[i]
		if st.bp > 0 && j >= 0 {
			// The common case, written out: forward flux, both faces below
			// the cap, π well behaved. It computes exactly what the general
			// path below does, with a third of the calls (which matters in
			// js/wasm, where calls are dear); anything unusual falls through.
			n, cf, dcf, cd, dcd := profile(j, st.bp, st.cFb, st.cDb, st.rf, st.rd)
			if cf <= FaceCapMolPerM3 && cd <= FaceCapMolPerM3 && finite(dcf) && finite(dcd) {
				pd, dpd := st.pi(cd)
				pf, dpf := st.pi(cf)
				if pd >= 0 && pf >= 0 && pd <= math.MaxFloat64 && pf <= math.MaxFloat64 &&
					dpd <= math.MaxFloat64 && dpf <= math.MaxFloat64 && dpd >= -math.MaxFloat64 && dpf >= -math.MaxFloat64 {
					st.n, st.cf, st.cd = n, cf, cd
					piD += pd
					piF += pf
					sD += math.Max(dpd, 0) * dcd
					sF += math.Max(dpf, 0) * dcf
					continue
				}
			}
		}
		n, ff, fd := speciesAt(j, st.bp, st.cFb, st.cDb, st.rf, st.rd)
		st.n, st.cf, st.cd = n, ff.c, fd.c
		pd, dpd := s.facePi1(i, fd)
		pf, dpf := s.facePi1(i, ff)
		piD += pd
		piF += pf
		sD += dpd
		sF += dpf
	}
	s.piD, s.piF, s.dPiD, s.dPiF = piD, piF, sD, sF
	f = s.a*(piD-piF-s.dp) - j
	df = s.a*(sD-sF) - 1
	return f, df
}

// evalGeneral is eval for coupled ions (the membrane potential solved at
// each J) or a composition π (Input.FacePi). Face concentrations carry
// their total derivative in J, du/dJ included.
func (s *solver) evalGeneral(j float64) (f, df float64) {
	s.evals++
	s.lastJ = j
	if s.coupled {
		// Start from the last potential carried along its slope in Jw.
		u0 := s.u
		if s.uAt {
			u0 += s.dudj * (j - s.uJ)
		}
		if !finite(u0) {
			u0 = s.u
		}
		s.u, s.dudj = s.potential(j, u0)
		s.uJ, s.uAt = j, true
	}
	var faces [2][MaxSpecies]face
	for i := 0; i < s.ns; i++ {
		st := &s.sp[i]
		if s.coupled && st.bp > 0 {
			is := &s.ion[i]
			st.n, st.cf, st.cd = is.n, is.cf, is.cd
			faces[0][i] = toFace(is.cd, is.cdJ+is.cdU*s.dudj)
			faces[1][i] = toFace(is.cf, is.cfJ+is.cfU*s.dudj)
			st.cf, st.cd = faces[1][i].c, faces[0][i].c
			continue
		}
		n, ff, fd := speciesAt(j, st.bp, st.cFb, st.cDb, st.rf, st.rd)
		st.n, st.cf, st.cd = n, ff.c, fd.c
		faces[0][i], faces[1][i] = fd, ff
	}
	piD, sD := s.sidePi(faces[0][:s.ns])
	piF, sF := s.sidePi(faces[1][:s.ns])
	s.piD, s.piF, s.dPiD, s.dPiF = piD, piF, sD, sF
	f = s.a*(piD-piF-s.dp) - j
	df = s.a*(sD-sF) - 1
	return f, df
}

// sidePi returns π at one face of the active layer and dπ/dJ: the sum of
// each species' own π (the additive rule), or the composition π of
// Input.FacePi, each with the logarithmic extension past FaceCapMolPerM3
// (see face).
func (s *solver) sidePi(fs []face) (pi, dpi float64) {
	if s.facePi == nil {
		for i := range fs {
			p, d := s.facePi1(i, fs[i])
			pi += p
			dpi += d
		}
		return pi, dpi
	}
	n := len(fs)
	c, g := s.buf[:n], s.buf[n:2*n]
	for i := range fs {
		c[i] = fs[i].c
	}
	p := s.facePi(c, g)
	if !(p >= 0 && p <= math.MaxFloat64) {
		if s.badPi == 0 {
			s.badPi, s.badC = 1, c[0]
		}
		return 0, 0
	}
	pi = p
	for i := range fs {
		gi := g[i]
		if !(gi >= -math.MaxFloat64 && gi <= math.MaxFloat64) {
			gi = 0
		}
		gi = math.Max(gi, 0) // contract: non-decreasing in every species
		pi += gi * FaceCapMolPerM3 * fs[i].l
		dpi += gi * (fs[i].dc + FaceCapMolPerM3*fs[i].dl)
	}
	return pi, dpi
}

// facePi1 returns species i's own π at a face and dπ/dJw, with the
// logarithmic extension past FaceCapMolPerM3 (see face).
func (s *solver) facePi1(i int, f face) (pi, dpi float64) {
	p, d := s.pi(i, f.c)
	if f.l == 0 {
		return p, d * f.dc
	}
	k := d * FaceCapMolPerM3
	return p + k*f.l, k * f.dl
}

func (s *solver) piError() error {
	_, _, _, _, fpi := speciesFields(s.in, s.badPi-1)
	return inErr(fpi, s.badC/thermo.MolPerM3PerMolPerL, "a model returning a finite π ≥ 0 at this concentration (mol/L)")
}

func (s *solver) solve(out *Result) error {
	if s.facePi != nil {
		var bd, bf [MaxSpecies]face
		for i := 0; i < s.ns; i++ {
			bd[i].c, bf[i].c = s.sp[i].cDb, s.sp[i].cFb
		}
		s.piDbulk, _ = s.sidePi(bd[:s.ns])
		s.piFbulk, _ = s.sidePi(bf[:s.ns])
	} else {
		for i := 0; i < s.ns; i++ {
			pd, _ := s.pi(i, s.sp[i].cDb)
			pf, _ := s.pi(i, s.sp[i].cFb)
			s.piDbulk += pd
			s.piFbulk += pf
		}
	}
	s.drive = s.piDbulk + s.piFbulk + math.Abs(s.dp)
	scale := s.a * s.drive // m/s
	f0, d0 := s.eval(0)
	if s.badPi != 0 {
		return s.piError()
	}
	if scale == 0 || f0 == 0 {
		method := "newton-bracketed"
		if scale == 0 {
			method = "trivial"
		}
		s.finish(out, 0, 0, 0, method)
		return nil
	}
	tol := relTol * scale

	lo, hi := math.Inf(-1), math.Inf(1)
	if f0 > 0 {
		lo = 0
	} else {
		hi = 0
	}
	j, ok := s.firstGuess(f0, d0)
	if !ok || !(j > lo && j < hi) {
		j = -f0 / d0 // plain Newton step
		if !(j > lo && j < hi) {
			j = f0
		}
	}
	best, bestF := 0.0, f0
	dxold := math.Inf(1) // step before last
	dx := math.Inf(1)    // last step
	for it := 1; it <= maxIterations; it++ {
		f, df := s.eval(j)
		if s.badPi != 0 {
			return s.piError()
		}
		if math.Abs(f) < math.Abs(bestF) {
			best, bestF = j, f
		}
		if math.Abs(f) <= tol {
			s.finish(out, j, f, it, "newton-bracketed")
			return nil
		}
		if f > 0 {
			lo = j
		} else {
			hi = j
		}
		step := -f / df
		newtonOK := df < 0 && finite(step)
		if newtonOK && math.Abs(step) <= 2*eps*math.Abs(j) {
			// Newton step below the resolution of j: j is the root to
			// machine precision.
			return s.accept(out, j, f, it)
		}
		next := j + step
		bracketed := !math.IsInf(lo, 0) && !math.IsInf(hi, 0)
		switch {
		case bracketed:
			if hi-lo <= 4*eps*math.Max(math.Abs(lo), math.Abs(hi)) {
				return s.accept(out, best, bestF, it)
			}
			if !newtonOK || !(next > lo && next < hi) || math.Abs(step) > 0.5*math.Abs(dxold) {
				next = lo + 0.5*(hi-lo)
			}
		case math.IsInf(hi, 1): // root above lo, no upper bound yet
			if !newtonOK || !(next > lo) {
				next = lo + math.Max(2*math.Abs(dx), scale)
			}
		default: // root below hi, no lower bound yet
			if !newtonOK || !(next < hi) {
				next = hi - math.Max(2*math.Abs(dx), scale)
			}
		}
		dxold, dx = dx, next-j
		j = next
	}
	res := math.Abs(bestF) / scale
	return &errs.ConvergenceError{Solver: "water-flux solver", Iterations: maxIterations, Residual: res}
}

// accept ends the iteration at a point where float64 cannot do better; the
// residual must still pass the looser acceptance tolerance.
func (s *solver) accept(out *Result, j, f float64, it int) error {
	scale := s.a * s.drive
	if math.Abs(f) > acceptRelTol*scale {
		return &errs.ConvergenceError{Solver: "water-flux solver", Iterations: it, Residual: math.Abs(f) / scale}
	}
	if s.lastJ != j {
		f, _ = s.eval(j)
	}
	s.finish(out, j, f, it, "newton-bracketed")
	return nil
}

// firstGuess returns the root of a model of the residual fitted at Jw = 0
// (the evaluation just made, with value f0 and slope d0):
//
//	g(J) = E_d·e^{−κ_d J} − E_f·e^{κ_f J} + l0 + l1·J,
//
// where E_d = A·π_d(0), κ_d = −π_d′/π_d when π_d falls with J (else E_d = 0),
// E_f = A·π_f(0), κ_f = π_f′/π_f when π_f rises with J (else E_f = 0), and
// the linear part l0 + l1·J takes up the rest so that g(0) = f0 and
// g′(0) = d0. g is exact for van 't Hoff solutes with B = 0 (the
// McCutcheon & Elimelech 2006 equations); where the polarization
// exponentials dominate, its root is far closer than a Newton step from 0,
// which creeps by about 1/κ per step. ok is false when the model does not
// apply (l1 ≥ 0).
func (s *solver) firstGuess(f0, d0 float64) (float64, bool) {
	var ed, kd, ef, kf float64
	if s.piD > 0 && s.dPiD < 0 {
		ed, kd = s.a*s.piD, -s.dPiD/s.piD
	}
	if s.piF > 0 && s.dPiF > 0 {
		ef, kf = s.a*s.piF, s.dPiF/s.piF
	}
	l0 := f0 - ed + ef
	l1 := d0 + kd*ed + kf*ef
	if !(l1 < 0) || !finite(kd) || !finite(kf) {
		return 0, false
	}
	beta := -l1
	// In δ, with the linear part normalised to −δ.
	j, ok := surrogateRoot(ed/beta, kd, ef/beta, kf, -l0/beta)
	return j, ok && finite(j)
}

// surrogateRoot solves J = md·e^{−kd·J} − mf·e^{kf·J} − c for
// md, mf, kd, kf ≥ 0. With md > 0 it applies Newton's method to the
// equivalent
//
//	h(J) = ln md − kd·J − ln(J + c + mf·e^{kf·J}) = 0,
//
// which is decreasing where defined (J + c + mf·e^{…} > 0, true on the right
// of the root) and nearly linear when the exponential terms dominate. The
// start is the root with mf = 0, a Lambert W expression, which lies right of
// the root. With md = 0 it uses the mirror image J → −J. ok is false if an
// iterate leaves the domain; the caller then falls back to a Newton step on
// the full residual, and it vets the candidate against its bracket.
func surrogateRoot(md, kd, mf, kf, c float64) (float64, bool) {
	if md == 0 {
		if mf == 0 {
			return -c, true
		}
		r, ok := surrogateRoot(mf, kf, 0, kd, -c)
		return -r, ok
	}
	var j float64
	if kd*md < 1e-300 {
		j = md - c
	} else {
		// y = J + c solves y = md·e^{kd·c}·e^{−kd·y}.
		j = lambertWExp(math.Log(kd*md)+kd*c)/kd - c
	}
	// Two Newton steps from the few-per-cent Lambert estimate: the
	// surrogate is itself only a model, so full convergence would be wasted
	// (a third step saved no evaluation of the full residual in the
	// benchmarks and cost ~10 % of a solve).
	tol := 1e-14 * (md + mf + math.Abs(c))
	for i := 0; i < 2; i++ {
		ef := 0.0
		if mf > 0 {
			ef = mf * math.Exp(kf*j)
		}
		q := j + c + ef
		if !(q > 0) {
			return j, false
		}
		h := math.Log(md/q) - kd*j
		dh := -kd - (1+kf*ef)/q
		step := h / dh
		j -= step
		if math.Abs(step) <= tol {
			break
		}
	}
	return j, true
}

// lambertWExp returns W(e^l), the principal branch of the Lambert W function
// at e^l, for any real l, to a few per cent: for l > 1.5 the asymptotic
// series W ≈ l − ln l + ln l / l (de Bruijn 1958; Corless et al. 1996,
// eq. 4.19), below it the [2/2] Padé approximant about 0,
// W(x) ≈ x(60 + 114x + 17x²)/(60 + 174x + 101x²) (from memory). Used only for
// starting points, then refined by Newton's method on the surrogate.
func lambertWExp(l float64) float64 {
	if l > 1.5 {
		ll := math.Log(l)
		return l - ll + ll/l
	}
	x := math.Exp(l)
	return x * (60 + x*(114+17*x)) / (60 + x*(174+101*x))
}

// finish fills out from the state of the last evaluation, which must be at j.
func (s *solver) finish(out *Result, j, f float64, it int, method string) {
	in := s.in
	out.JwMPerS = j
	for i := 0; i < s.ns; i++ {
		st := &s.sp[i]
		sr := &out.Species[i]
		sr.FluxMolPerM2S = st.n
		sr.FeedFaceMolPerM3 = st.cf
		sr.DrawFaceMolPerM3 = st.cd
		rs := in.SM / in.Species[i].DM2PerS
		rbl := 1 / in.KDrawMPerS
		if in.Orientation == ALDS {
			rbl = 1 / in.KFeedMPerS
		}
		sr.SupportInterfaceMolPerM3 = supportInterface(in.Orientation, j, st.n, st.cf, st.cd, st.cFb, st.cDb, rs, rbl)
	}
	out.JsMolPerM2S = -s.sp[0].n
	out.Potential = s.u
	out.PiFeedFacePa, out.PiDrawFacePa = s.piF, s.piD
	out.PiFeedBulkPa, out.PiDrawBulkPa = s.piFbulk, s.piDbulk
	res := 0.0
	if sc := s.a * s.drive; sc > 0 {
		res = math.Abs(f) / sc
	}
	out.Stats = Stats{Iterations: it, Evaluations: s.evals, PotentialEvaluations: s.uEvals, Residual: res, Method: method}
}
