package thermo

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/water"
)

// Checks of the mixed-electrolyte model against published measurements of
// common-ion mixtures at 25 °C (issue #10), with the Zdanovskii–Stokes–
// Robinson rule as a second, parameter-free prediction beside it, and
// property tests of the model: Gibbs–Duhem between φ and the activity
// coefficients, and π rising along every fixed-ratio blend path.
//
// Tolerances. Harvie, Møller & Weare (1984) fitted their mixing terms to
// isopiestic data of these systems and report agreement within a few
// tenths of a percent in φ (from memory). Each check below states its
// bound from the data's own uncertainty plus that model allowance, and logs
// the deviations it measured, Pitzer and ZSR, so that a regression or an
// improvement shows.

// saltMix is a composition given as salt molalities (mol/kg water).
type saltMix struct {
	salts []*library.Solute
	m     []float64
}

// ionMolalities spreads the salt molalities over the mixture's ions.
func (s saltMix) ionMolalities(mx *Mixture) []float64 {
	out := make([]float64, len(mx.Ions()))
	for k, salt := range s.salts {
		for _, ion := range salt.Ions {
			for i, mi := range mx.Ions() {
				if mi.Symbol == ion.Symbol {
					out[i] += float64(ion.Count) * s.m[k]
				}
			}
		}
	}
	return out
}

// nuSum returns Σ ν_k m_k, the total ion molality.
func (s saltMix) nuSum() float64 {
	sum := 0.0
	for k, salt := range s.salts {
		for _, ion := range salt.Ions {
			sum += float64(ion.Count) * s.m[k]
		}
	}
	return sum
}

// pitzerPhi is the mixture model's osmotic coefficient of the composition.
func pitzerPhi(t *testing.T, s saltMix, tK float64) float64 {
	t.Helper()
	mx, err := NewMixture(s.salts, tK)
	if err != nil {
		t.Fatal(err)
	}
	return mx.Eval(s.ionMolalities(mx), nil)
}

// zsrReference is the Zdanovskii–Stokes–Robinson rule (Zdanovskii 1936;
// Stokes & Robinson 1966, J. Phys. Chem. 70:2126, eq. 1): a mixture has the
// water activity a_w at which
//
//	Σ_k m_k / m_k°(a_w) = 1,
//
// m_k° being the molality of the binary solution of salt k alone at that
// water activity. Here m_k° comes from each salt's own single-salt model
// (Solution.MolalityForPi at π = −(RT/V̄_w) ln a_w), so the rule needs no
// mixing parameter: it is what the engine falls back to where none are
// published. The sum falls as a_w falls (each m_k° rises), so bisection in
// L = −ln a_w between two bounds that bracket the root converges.
type zsrReference struct {
	sols []*Solution
	rtV  float64 // R·T/V̄_w, Pa
}

func newZSR(t *testing.T, salts []*library.Solute, tK float64) *zsrReference {
	t.Helper()
	z := &zsrReference{rtV: GasConstant * tK / water.MolarVolume(tK)}
	for _, s := range salts {
		x, err := NewSolution(s, tK)
		if err != nil {
			t.Fatal(err)
		}
		z.sols = append(z.sols, x)
	}
	return z
}

// binaryMolality returns m_k° at L = −ln a_w, and whether it lies within
// the salt's parameter range (the model's data limit). Up to the salt's
// solubility it is Solution.MolalityForPi; above (a mixture can hold more
// of a salt than its binary solution at the same a_w), it inverts the
// binary model's own water activity by bisection, as ZSR practice uses
// supersaturated binary data (Stokes & Robinson 1966), and reports the
// point as out of range if it also passes the data limit.
func (z *zsrReference) binaryMolality(k int, lnInv float64) (float64, bool, error) {
	x := z.sols[k]
	valid := x.ValidMolPerKg() * (1 + 1e-12)
	m, err := x.MolalityForPi(z.rtV * lnInv)
	if err == nil {
		return m, m <= valid, nil
	}
	lo := x.SolubilityMolPerKg()
	if -math.Log(x.WaterActivity(lo)) > lnInv {
		return 0, false, err // not a solubility refusal
	}
	hi := 2 * lo
	for -math.Log(x.WaterActivity(hi)) < lnInv {
		if hi > 100 {
			return 0, false, fmt.Errorf("%s: no binary molality at ln a_w = %g", x.Solute.ID, -lnInv)
		}
		hi *= 2
	}
	for range 200 {
		mid := 0.5 * (lo + hi)
		if -math.Log(x.WaterActivity(mid)) < lnInv {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo <= 1e-14*hi {
			break
		}
	}
	m = 0.5 * (lo + hi)
	return m, m <= valid, nil
}

// waterActivity solves the ZSR relation for the composition m (salt
// molalities in the order of the salts given to newZSR). inRange is false
// when some m_k° at the root lies past its salt's parameter range.
func (z *zsrReference) waterActivity(m []float64) (aw float64, inRange bool, err error) {
	total := 0.0
	for _, v := range m {
		total += v
	}
	// L at which salt k alone, at its own molality m_k, has the water
	// activity: there m_k° = m_k, so the sum is ≥ 1. L at which it is
	// alone at the total molality: there m_k° ≥ total, so the sum is ≤ 1.
	lo, hi := 0.0, 0.0
	for k, x := range z.sols {
		if m[k] > 0 {
			lo = math.Max(lo, -math.Log(x.WaterActivity(m[k])))
		}
		hi = math.Max(hi, -math.Log(x.WaterActivity(total)))
	}
	sum := func(l float64) (float64, bool, error) {
		s, ok := 0.0, true
		for k := range z.sols {
			if m[k] == 0 {
				continue
			}
			mk, in, err := z.binaryMolality(k, l)
			if err != nil {
				return 0, false, err
			}
			ok = ok && in
			s += m[k] / mk
		}
		return s, ok, nil
	}
	for range 200 {
		mid := 0.5 * (lo + hi)
		s, _, err := sum(mid)
		if err != nil {
			return 0, false, err
		}
		if s > 1 {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo <= 1e-15*hi {
			break
		}
	}
	l := 0.5 * (lo + hi)
	_, inRange, err = sum(l)
	return math.Exp(-l), inRange, err
}

// devStats accumulates deviations for a max/RMS summary.
type devStats struct {
	n        int
	sumSq    float64
	maxAbs   float64
	maxWhere string
}

func (d *devStats) add(v float64, where string) {
	d.n++
	d.sumSq += v * v
	if math.Abs(v) > d.maxAbs {
		d.maxAbs, d.maxWhere = math.Abs(v), where
	}
}

func (d *devStats) String() string {
	if d.n == 0 {
		return "no points"
	}
	return fmt.Sprintf("max %.3f %% (%s), RMS %.3f %% over %d points", 100*d.maxAbs, d.maxWhere, 100*math.Sqrt(d.sumSq/float64(d.n)), d.n)
}

// phiFromWaterActivity is the molal osmotic coefficient's definition,
// φ = −ln a_w/(M_w Σ mᵢ) (IUPAC Gold Book, "osmotic coefficient").
func phiFromWaterActivity(aw, nuSum float64) float64 {
	return -math.Log(aw) / (water.MolarMassKgPerMol * nuSum)
}

// CaCl2 + MgCl2 at 25 °C, Robinson & Bower (1966) Table 2 (testdata/
// mixtures/cacl2_mgcl2_robinson_bower_1966.csv): the mixture's φ from the
// paper's isopiestic ratio R = 1 − a·y − b·y² at MgCl2 fractions y = 0, ¼, ½,
// ¾ and 1 of each of its three levels (total salt 0.55–2.2 mol/kg, ionic
// strength to 6.6 mol/kg). The ends y = 0 and 1 are the binary solutions,
// so they measure the single-salt parameters (Pitzer & Mayorga 1973 CaCl2,
// Harvie, Møller & Weare 1984 MgCl2); the mixing terms (θ_CaMg = 0.007,
// ψ_CaMgCl = −0.012, HMW 1984 Table 2) act between them, and the test logs
// the deviation left after removing the ends' (linear in y) as the mixing
// terms' own.
//
// Bound, Pitzer and ZSR alike: 1.0 % in φ = 0.3 % for the isopiestic data
// (the paper states none; 0.1–0.3 % is the usual reproducibility of the
// method, from memory) + 0.4 % for the binary ends (the largest measured
// here, CaCl2 at 2.2 mol/kg) + 0.3 % for the mixing terms (HMW 1984's "a
// few tenths of a percent"). Measured (2026): Pitzer max 0.81 %, RMS 0.35 %;
// ZSR max 0.41 % (an end), RMS 0.19 %. The HMW mixing terms overshoot
// here: at I ≈ 6.4 mol/kg and y = ½ they take φ 1.1 % below the line
// between the ends, where these data sit within 0.1 % of ZSR.
func TestMixturePublishedCaCl2MgCl2(t *testing.T) {
	const tol = 0.010
	salts := mixSalts(t, "CaCl2", "MgCl2")
	zsr := newZSR(t, salts, ReferenceK)
	var pz, zs, mixOnly devStats
	for _, r := range readCSV(t, "../../testdata/mixtures/cacl2_mgcl2_robinson_bower_1966.csv") {
		mb, mbPhi, a, b := r[0], r[1], r[2], r[3]
		ys := []float64{0, 0.25, 0.5, 0.75, 1}
		dev := make([]float64, len(ys))
		for i, y := range ys {
			ratio := 1 - a*y - b*y*y
			mTot := mb / ratio
			want := mbPhi / mTot
			s := saltMix{salts, []float64{(1 - y) * mTot, y * mTot}}
			got := pitzerPhi(t, s, ReferenceK)
			aw, inRange, err := zsr.waterActivity(s.m)
			if err != nil {
				t.Fatal(err)
			}
			zPhi := phiFromWaterActivity(aw, s.nuSum())
			where := fmt.Sprintf("m = %.3f, y(MgCl2) = %.2f", mTot, y)
			dev[i] = got/want - 1
			pz.add(dev[i], where)
			zs.add(zPhi/want-1, where)
			t.Logf("%s: φ published %.4f, Pitzer %.4f (%+.2f %%), ZSR %.4f (%+.2f %%)%s", where, want, got, 100*dev[i], zPhi, 100*(zPhi/want-1), outOfRange(inRange))
			if math.Abs(dev[i]) > tol {
				t.Errorf("%s: Pitzer φ %.4f, Robinson & Bower %.4f (%+.2f %%, bound %.1f %%)", where, got, want, 100*dev[i], 100*tol)
			}
			if d := zPhi/want - 1; math.Abs(d) > tol {
				t.Errorf("%s: ZSR φ %.4f, Robinson & Bower %.4f (%+.2f %%, bound %.1f %%)", where, zPhi, want, 100*d, 100*tol)
			}
		}
		for i, y := range ys[1 : len(ys)-1] {
			mixOnly.add(dev[i+1]-((1-y)*dev[0]+y*dev[len(ys)-1]), fmt.Sprintf("M_B = %.4f, y = %.2f", mb, y))
		}
	}
	t.Logf("CaCl2+MgCl2 (Robinson & Bower 1966), φ: Pitzer %v; ZSR %v; Pitzer less its binary ends (the mixing terms' share) %v", &pz, &zs, &mixOnly)
}

func outOfRange(inRange bool) string {
	if inRange {
		return ""
	}
	return " [ZSR: a binary molality past its parameter range]"
}

// MgCl2 + MgSO4 at 298.15 K, El Guendouzi & Errougui (2007), hygrometric
// water activities with their 95 % expanded uncertainties U (testdata/
// mixtures/mgcl2_mgso4_el_guendouzi_2007.csv): total salt 0.35–3.8 mol/kg,
// ionic strength to 11 mol/kg, three MgCl2 ionic-strength fractions.
//
// Bound, Pitzer: |Δa_w| ≤ U + 0.01·a_w·|ln a_w|, i.e. the data's U plus 1 %
// of φ for the model (HMW 1984 claim a few tenths of a percent within
// their fitted ranges; these data reach I = 11 mol/kg, with MgSO4 to 2.2 of
// its 3 mol/kg parameter range). One point, MgCl2 0.40 + MgSO4 0.30, is
// logged but not bounded: on its own composition line its φ lies about
// 5 % below its neighbours' trend (0.20 + 0.15 and 0.60 + 0.45), twice its
// stated U in a_w, for both models alike. ZSR is only held to a gross 10 %
// of φ (it has no mixing information, and for ions of unlike charge its
// dilute limit is known to be poor); its deviations are logged.
// Measured (2026): Pitzer a_w within U at 23 of 28 points and high by up
// to 0.0038 (φ low by 1–2.4 % on the concentrated points, RMS 1.5 % where
// U is at most 2.5 % of φ; RMS 2.6 % over all 28, most of it from the
// dilute points where U is 2–8 % of φ); ZSR further off, by 1.2–9.8 % in
// φ, always on the same side as Pitzer.
func TestMixturePublishedMgCl2MgSO4(t *testing.T) {
	const modelPhi, zsrPhi = 0.01, 0.10
	salts := mixSalts(t, "MgCl2", "MgSO4")
	zsr := newZSR(t, salts, ReferenceK)
	var pz, zs, pzConc devStats
	within := 0
	rows := readCSV(t, "../../testdata/mixtures/mgcl2_mgso4_el_guendouzi_2007.csv")
	for _, r := range rows {
		s := saltMix{salts, []float64{r[0], r[1]}}
		want, u := r[2], r[3]
		nu := s.nuSum()
		phiWant := phiFromWaterActivity(want, nu)
		phi := pitzerPhi(t, s, ReferenceK)
		aw := math.Exp(-phi * nu * water.MolarMassKgPerMol)
		zaw, inRange, err := zsr.waterActivity(s.m)
		if err != nil {
			t.Fatal(err)
		}
		zPhi := phiFromWaterActivity(zaw, nu)
		where := fmt.Sprintf("MgCl2 %.2f + MgSO4 %.2f", r[0], r[1])
		// φ from a_w carries the relative uncertainty U/(a_w·|ln a_w|).
		scale := want * -math.Log(want)
		uPhi := u / scale
		pz.add(phi/phiWant-1, where)
		zs.add(zPhi/phiWant-1, where)
		if uPhi <= 0.025 {
			pzConc.add(phi/phiWant-1, where)
		}
		if math.Abs(aw-want) <= u {
			within++
		}
		t.Logf("%s: a_w %.3f ± %.3f, Pitzer %.4f (%+.4f), ZSR %.4f (%+.4f)%s; φ %.3f ± %.1f %%, Pitzer %+.2f %%, ZSR %+.2f %%",
			where, want, u, aw, aw-want, zaw, zaw-want, outOfRange(inRange), phiWant, 100*uPhi, 100*(phi/phiWant-1), 100*(zPhi/phiWant-1))
		if r[0] == 0.40 && r[1] == 0.30 {
			continue // the outlier named above
		}
		if d := math.Abs(aw - want); d > u+modelPhi*scale {
			t.Errorf("%s: Pitzer a_w %.4f, El Guendouzi & Errougui %.3f ± %.3f (bound %.4f)", where, aw, want, u, u+modelPhi*scale)
		}
		if d := math.Abs(zaw - want); d > u+zsrPhi*scale {
			t.Errorf("%s: ZSR a_w %.4f, El Guendouzi & Errougui %.3f ± %.3f (bound %.4f)", where, zaw, want, u, u+zsrPhi*scale)
		}
	}
	t.Logf("MgCl2+MgSO4 (El Guendouzi & Errougui 2007): Pitzer a_w within U at %d of %d points; φ: Pitzer %v; Pitzer where U(φ) ≤ 2.5 %% %v; ZSR %v", within, len(rows), &pz, &pzConc, &zs)
}

// The ZSR reference itself: for one salt it returns that salt's binary
// water activity (the rule's defining limit), and at its root the sum
// Σ m_k/m_k° is 1.
func TestZSRReference(t *testing.T) {
	salts := mixSalts(t, "NaCl", "MgCl2")
	zsr := newZSR(t, salts, ReferenceK)
	for _, m := range []float64{0.1, 1, 3} {
		aw, _, err := zsr.waterActivity([]float64{m, 0})
		if err != nil {
			t.Fatal(err)
		}
		if want := zsr.sols[0].WaterActivity(m); math.Abs(aw-want) > 1e-12 {
			t.Errorf("NaCl %g m alone: ZSR a_w %.15f, binary %.15f", m, aw, want)
		}
	}
	m := []float64{1.2, 0.7}
	aw, _, err := zsr.waterActivity(m)
	if err != nil {
		t.Fatal(err)
	}
	sum := 0.0
	for k := range m {
		mk, _, err := zsr.binaryMolality(k, -math.Log(aw))
		if err != nil {
			t.Fatal(err)
		}
		if got := zsr.sols[k].WaterActivity(mk); math.Abs(got-aw) > 1e-12 {
			t.Errorf("binary %s at %g m: a_w %.15f, wanted %.15f", salts[k].ID, mk, got, aw)
		}
		sum += m[k] / mk
	}
	if math.Abs(sum-1) > 1e-10 {
		t.Errorf("ZSR sum at the root = %.15f, want 1", sum)
	}
}

// Gibbs–Duhem for a binary through the mixture model: with ν ions per
// formula unit, d ln a_w = −ν M_w d(mφ) and Σ nᵢ d ln aᵢ = 0 give
//
//	d[m(φ − 1)]/dm = m · d ln γ±/dm
//
// (Robinson & Stokes 1959, Electrolyte Solutions, ch. 2; Pitzer 1991
// eq. 3-7). Both sides by central differences of Eval's φ and ln γ, for
// 1-1, 2-1, 1-2 and 2-2 (β⁽²⁾) salts. TestMixtureGibbsConsistency checks
// each ln γᵢ against ∂Gᴱˣ/∂mᵢ; this checks φ against ln γ± directly,
// without Gᴱˣ, and then the multicomponent form along a dilution path of a
// mixture with unsymmetrical mixing.
func TestMixtureGibbsDuhem(t *testing.T) {
	for _, id := range []string{"NaCl", "KCl", "MgCl2", "Na2SO4", "MgSO4"} {
		salts := mixSalts(t, id)
		mx, err := NewMixture(salts, ReferenceK)
		if err != nil {
			t.Fatal(err)
		}
		nu := 0.0
		for _, ion := range salts[0].Ions {
			nu += float64(ion.Count)
		}
		eval := func(m float64) (phi, lgpm float64) {
			ms := saltMix{salts, []float64{m}}.ionMolalities(mx)
			lg := make([]float64, len(ms))
			phi = mx.Eval(ms, lg)
			for i := range ms {
				lgpm += ms[i] / m * lg[i] / nu
			}
			return phi, lgpm
		}
		for _, m := range []float64{0.01, 0.1, 0.5, 1, 2, 3} {
			h := 1e-5 * m
			pp, gp := eval(m + h)
			pm, gm := eval(m - h)
			lhs := ((m+h)*(pp-1) - (m-h)*(pm-1)) / (2 * h)
			rhs := m * (gp - gm) / (2 * h)
			if math.Abs(lhs-rhs) > 1e-7*math.Max(1, math.Abs(lhs)) {
				t.Errorf("%s %g m: d[m(φ−1)]/dm = %.10g, m·d ln γ±/dm = %.10g", id, m, lhs, rhs)
			}
		}
	}
	// Multicomponent: d[(φ − 1)Σmᵢ] = Σ mᵢ d ln γᵢ along mᵢ = t·xᵢ, for a
	// Na–Mg–Cl–SO4 mixture (ᴱθ on both sides, θ and ψ from HMW 1984).
	salts := mixSalts(t, "NaCl", "MgCl2", "Na2SO4")
	mx, err := NewMixture(salts, ReferenceK)
	if err != nil {
		t.Fatal(err)
	}
	x := saltMix{salts, []float64{0.6, 0.25, 0.15}}.ionMolalities(mx)
	at := func(tt float64) (g float64, lg []float64) {
		ms := make([]float64, len(x))
		sum := 0.0
		for i := range x {
			ms[i] = tt * x[i]
			sum += ms[i]
		}
		lg = make([]float64, len(ms))
		return (mx.Eval(ms, lg) - 1) * sum, lg
	}
	for _, tt := range []float64{0.05, 0.5, 1, 2, 4} {
		h := 1e-5 * tt
		gp, lp := at(tt + h)
		gm, lm := at(tt - h)
		lhs := (gp - gm) / (2 * h)
		rhs := 0.0
		for i := range x {
			rhs += tt * x[i] * (lp[i] - lm[i]) / (2 * h)
		}
		if math.Abs(lhs-rhs) > 1e-7*math.Max(1, math.Abs(lhs)) {
			t.Errorf("mixture ×%g: d[(φ−1)Σm]/dt = %.10g, Σ mᵢ d ln γᵢ/dt = %.10g", tt, lhs, rhs)
		}
	}
}

// π rises along every blend path: for random fixed-ratio blends of two or
// three library Pitzer salts (random salts and mole fractions, seeded), π
// of the mixture model, π = (RT/V̄_w) M_w φ Σmᵢ, increases strictly with
// the total salt molality (issue #10, property tests), at 25 and 60 °C.
// Non-monotone π would give a blend two concentrations for one target and
// break every root finder built on it.
//
// Asserted from zero up to where the first component reaches the smaller
// of its solubility and its parameter set's data limit. From there up to
// the first component's solubility the test only logs where π turns over:
// measured (2026), 24 of the 120 blends do (nitrates, formate,
// acetates, bicarbonates, whose parameter sets end far below their
// solubilities), because the mixture kernel, unlike Solution, extrapolates
// each binary set past its range. Issue #10 item 5 (no silent
// extrapolation) has to cover mixtures too.
func TestMixtureBlendPathMonotone(t *testing.T) {
	lib, err := library.Default()
	if err != nil {
		t.Fatal(err)
	}
	var salts []*library.Solute
	for _, s := range lib.All() {
		if s.Osmotic.Kind == library.ModelPitzer && len(s.Ions) == 2 {
			salts = append(salts, s)
		}
	}
	if len(salts) < 3 {
		t.Fatalf("only %d Pitzer salts in the library", len(salts))
	}
	rng := rand.New(rand.NewPCG(10, 2026))
	const blends, steps = 60, 400
	turned, tried := 0, 0
	for _, tC := range []float64{25, 60} {
		tK := tC + ZeroCelsiusK
		piPerOsm := GasConstant * tK / water.MolarVolume(tK) * water.MolarMassKgPerMol
		for b := 0; b < blends; b++ {
			n := 2 + rng.IntN(2)
			perm := rng.Perm(len(salts))[:n]
			var pick []*library.Solute
			frac := make([]float64, n)
			total := 0.0
			for k, i := range perm {
				pick = append(pick, salts[i])
				frac[k] = 0.05 + rng.Float64()
				total += frac[k]
			}
			top, valid := math.Inf(1), math.Inf(1)
			name := ""
			for k := range frac {
				frac[k] /= total
				x, err := NewSolution(pick[k], tK)
				if err != nil {
					t.Fatal(err)
				}
				sol := x.SolubilityMolPerKg()
				top = math.Min(top, sol/frac[k])
				valid = math.Min(valid, math.Min(sol, x.ValidMolPerKg())/frac[k])
				name += fmt.Sprintf("%s %.2f ", pick[k].ID, frac[k])
			}
			if math.IsInf(top, 0) {
				continue
			}
			tried++
			mx, err := NewMixture(pick, tK)
			if err != nil {
				t.Fatal(err)
			}
			prev := 0.0
			for i := 1; i <= steps; i++ {
				mTot := top * float64(i) / steps
				ms := make([]float64, n)
				for k := range ms {
					ms[k] = frac[k] * mTot
				}
				s := saltMix{pick, ms}
				pi := piPerOsm * mx.Eval(s.ionMolalities(mx), nil) * s.nuSum()
				if !(pi > prev) {
					if mTot <= valid*(1+1e-12) {
						t.Errorf("%g °C, blend %s: π falls from %.6g to %.6g Pa at %.4g mol/kg total, inside every component's range (to %.4g)", tC, name, prev, pi, mTot, valid)
					} else {
						turned++
						t.Logf("%g °C, blend %s: π turns over at %.4g mol/kg total, past a parameter range (ranges end at %.4g, first solubility at %.4g)", tC, name, mTot, valid, top)
					}
					break
				}
				prev = pi
			}
		}
	}
	t.Logf("%d of %d blends: π turns over between the first parameter-range end and the first solubility", turned, tried)
}
