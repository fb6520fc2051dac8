package thermo

import (
	"math"
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

func blendOf(t *testing.T, ids []string, x []float64) *library.Solute {
	t.Helper()
	b, err := library.NewBlend(library.BlendID(ids, x), mixSalts(t, ids...), x)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// The gradient ∂π/∂mᵢ against central differences of π itself, for
// seawater with the carbonate species (internal consistency of the
// Gibbs-energy identity the gradient uses; Pitzer 1991 eq. 3-59).
func TestOsmoticPressureGradient(t *testing.T) {
	f, _ := library.LookupFeed("seawater")
	var ions []MixIon
	var m []float64
	for _, ion := range f.IonsAt(35 * 3) {
		ions = append(ions, MixIon{Symbol: ion.Symbol, Charge: ion.Charge})
		m = append(m, ion.Mol/(1-0.105))
	}
	mx, err := NewIonMixture(ions, ReferenceK)
	if err != nil {
		t.Fatal(err)
	}
	// π = k·Ω with k = RT·M_w/V̄_w.
	k := GasConstant * ReferenceK * water.MolarMassKgPerMol / water.MolarVolume(ReferenceK)
	omega := func(v []float64) float64 {
		s := 0.0
		for _, x := range v {
			s += x
		}
		return mx.Eval(v, nil) * s
	}
	grad := make([]float64, len(m))
	mx.OsmoticPressureGradient(m, grad)
	for i := range m {
		h := 1e-5 * math.Max(m[i], 1e-2)
		up := append([]float64(nil), m...)
		dn := append([]float64(nil), m...)
		up[i] += h
		dn[i] = math.Max(0, dn[i]-h)
		fd := (omega(up) - omega(dn)) / (up[i] - dn[i])
		if got := grad[i] / k; math.Abs(got-fd) > 1e-6*math.Max(1, math.Abs(fd)) {
			t.Errorf("%s: ∂Ω/∂m from the gradient %.10g, finite difference %.10g", ions[i].Symbol, got, fd)
		}
	}
}

// A blend Solution: both paths give dg/dm equal to a finite difference of
// g, the inverse π → m returns the molality, π rises with molality up to
// the solubility, and the path is the one the mixing data call for
// (NaCl–MgCl2: θ(Na,Mg) in HMW 1984 Table 2 → Pitzer; NaCl–glucose: a
// non-electrolyte part → ZSR, flagged).
func TestBlendSolution(t *testing.T) {
	for _, c := range []struct {
		ids  []string
		x    []float64
		path string
	}{
		{[]string{"NaCl", "MgCl2"}, []float64{0.9, 0.1}, PathPitzerMixture},
		{[]string{"NaCl", "glucose"}, []float64{0.5, 0.5}, PathZSR},
		{[]string{"KCl", "NH4NO3", "MgSO4"}, []float64{0.4, 0.4, 0.2}, ""},
	} {
		for _, tC := range []float64{5, 25, 60} {
			x := mustSolution(t, blendOf(t, c.ids, c.x), tC+ZeroCelsiusK)
			if c.path != "" && x.MixturePath() != c.path {
				t.Errorf("%v: path %s, want %s", c.ids, x.MixturePath(), c.path)
			}
			if x.MixturePath() == PathZSR && !warn.Has(x.Warnings, warn.ModelNote) {
				t.Errorf("%v: ZSR path not flagged", c.ids)
			}
			top := math.Min(x.SolubilityMolPerKg(), x.CapMolPerKg())
			prev := 0.0
			for k := 1; k <= 40; k++ {
				m := top * float64(k) / 40
				g, dg := x.mPhi(m)
				h := 1e-6 * m
				g1, _ := x.mPhi(m + h)
				g0, _ := x.mPhi(m - h)
				if fd := (g1 - g0) / (2 * h); math.Abs(dg/fd-1) > 1e-5 {
					t.Errorf("%v %g °C, m = %.4g: dg/dm %.10g, finite difference %.10g", c.ids, tC, m, dg, fd)
				}
				pi := x.OsmoticPressurePa(m)
				if !(pi > prev) || math.IsNaN(g) {
					t.Errorf("%v %g °C: π not rising at m = %.4g (%g after %g)", c.ids, tC, m, pi, prev)
				}
				prev = pi
				if k%10 == 0 {
					back, err := x.MolalityForPi(pi)
					if err != nil || math.Abs(back/m-1) > 1e-9 {
						t.Errorf("%v %g °C: MolalityForPi(π(%g)) = %g, %v", c.ids, tC, m, back, err)
					}
				}
			}
		}
	}
}

// The blend's solubility is where its first part's mineral saturates in
// the blend: NaCl with MgCl2 reaches halite below NaCl's own solubility
// (the common-ion effect; halite solubility falls in MgCl2 solutions,
// e.g. the NaCl–MgCl2–H2O diagram of Benhassen-Chehimi et al. 1998 used in
// minerals_test.go), and the part named is NaCl.
func TestBlendSolubilityCommonIon(t *testing.T) {
	x := mustSolution(t, blendOf(t, []string{"NaCl", "MgCl2"}, []float64{0.7, 0.3}), ReferenceK)
	nacl := mustSolution(t, libSolute(t, "NaCl"), ReferenceK)
	mNaCl := 0.7 * x.SolubilityMolPerKg()
	if !(mNaCl < 0.8*nacl.SolubilityMolPerKg()) || x.LimitingPart() != 0 {
		t.Errorf("NaCl in the blend saturates at %.3g mol/kg (part %d), NaCl alone at %.3g", mNaCl, x.LimitingPart(), nacl.SolubilityMolPerKg())
	}
	ions, err := x.IonsAt(x.SolubilityMolPerKg(), math.NaN())
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range ions.Saturation {
		if s.Mineral == "halite" && math.Abs(s.SI) > 1e-8 {
			t.Errorf("halite SI at the blend's solubility %g, want 0", s.SI)
		}
	}
}

// The Sharqawy, Lienhard & Zubair (2010) seawater correlation (kept as a
// cross-check) against seawater by composition, 10–120 g/kg (its fitted
// range) and 10–40 °C: within its stated ±2.57 % accuracy.
func TestSeawaterSharqawyCrossCheck(t *testing.T) {
	sw := libSolute(t, "seawater")
	sh := *sw
	sh.ID = "seawater-sharqawy"
	sh.Osmotic = library.OsmoticModel{Kind: library.ModelSeawater, VantHoffNu: 1}
	worst := 0.0
	for _, tC := range []float64{10, 25, 40} {
		a := mustSolution(t, sw, tC+ZeroCelsiusK)
		b := mustSolution(t, &sh, tC+ZeroCelsiusK)
		for _, s := range []float64{10, 35, 70, 120} {
			ma, _ := a.ToMolality(s, GPerKg)
			mb, _ := b.ToMolality(s, GPerKg)
			d := a.OsmoticPressurePa(ma)/b.OsmoticPressurePa(mb) - 1
			worst = math.Max(worst, math.Abs(d))
			if math.Abs(d) > 0.0257 {
				t.Errorf("%g g/kg, %g °C: composition vs Sharqawy %+.2f %%", s, tC, 100*d)
			}
		}
	}
	t.Logf("seawater by composition vs Sharqawy (2010), 10–120 g/kg, 10–40 °C: worst %.2f %%", 100*worst)
}

// Every mineral a library record names in solubility.minerals is one the
// mixed-electrolyte model knows.
func TestRecordMineralsKnown(t *testing.T) {
	known := map[string]bool{}
	for k := 0; k < MineralCount(); k++ {
		n, _ := MineralName(k)
		known[n] = true
	}
	for _, s := range library.MustDefault().All() {
		for _, m := range s.Solubility.Minerals {
			if !known[m] {
				t.Errorf("%s: mineral %q unknown to the model", s.ID, m)
			}
		}
	}
}
