package thermo

import (
	"math"
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/water"
)

// Gordon's equation (Gordon 1937, J. Chem. Phys. 5:522), D = D⁰·η_w/η ·
// d(mφ)/dm, against the measured concentration dependence of the three
// salts the library holds D(c) points for (Lobo 1993, Pure Appl. Chem.
// 65:2613, compilation values; the library marks them from memory): within
// 7 %, the accuracy the equation is usually credited with for 1:1
// electrolytes up to a few mol/L (Robinson & Stokes 1959, ch. 11; from
// memory).
func TestGordonAgainstMeasuredD(t *testing.T) {
	lib, err := library.Default()
	if err != nil {
		t.Fatal(err)
	}
	for _, id := range []string{"NaCl", "KCl", "LiCl"} {
		s, _ := lib.Lookup(id)
		x, err := NewSolution(s, ReferenceK)
		if err != nil {
			t.Fatal(err)
		}
		if len(s.Diffusivity.Points) == 0 {
			t.Fatalf("%s has no measured D(c)", id)
		}
		for _, p := range s.Diffusivity.Points {
			m, ok := x.MolalityFromMolarity(p.MolarityMolPerL * 1000)
			if !ok {
				t.Fatalf("%s: %g mol/L out of range", id, p.MolarityMolPerL)
			}
			got := s.Diffusivity.D0M2PerS * x.GordonFactor(m)
			if r := got / p.DM2PerS; math.Abs(r-1) > 0.07 {
				t.Errorf("%s at %g mol/L: Gordon %.4g m²/s, measured %.4g (ratio %.3f)", id, p.MolarityMolPerL, got, p.DM2PerS, r)
			}
		}
	}
}

// Where no D(c) is on record, a neutral solute's D follows Gordon's
// equation: sucrose at 1.5 mol/L (about 6.7 mPa·s) diffuses several times
// slower than at infinite dilution, and D·η/T times the thermodynamic
// factor's inverse stays D⁰·η_w/T⁰ at every temperature (the
// Stokes–Einstein form). A multivalent salt keeps D⁰ scaled by water's
// fluidity, and the dilute limit is D⁰ for every solute.
func TestDiffusivityFollowsViscosity(t *testing.T) {
	lib, _ := library.Default()
	suc, _ := lib.Lookup("sucrose")
	for _, tK := range []float64{288.15, 298.15, 318.15} {
		x, err := NewSolution(suc, tK)
		if err != nil {
			t.Fatal(err)
		}
		m, ok := x.MolalityFromMolarity(1500)
		if !ok {
			t.Fatal("1.5 mol/L sucrose out of range")
		}
		d := x.DiffusivityM2PerS(m)
		_, tf := x.mPhi(m)
		want := suc.Diffusivity.D0M2PerS * (tK / ReferenceK) * water.Viscosity(ReferenceK) / x.ViscosityPaS(m) * tf
		if math.Abs(d/want-1) > 1e-12 {
			t.Errorf("%g K: D %g, Stokes–Einstein–Gordon %g", tK, d, want)
		}
		if tK == ReferenceK && !(d < 0.3*suc.Diffusivity.D0M2PerS) {
			t.Errorf("1.5 mol/L sucrose: D %g m²/s, want well below D⁰ %g (η %.2f mPa·s)", d, suc.Diffusivity.D0M2PerS, 1e3*x.ViscosityPaS(m))
		}
		if d0 := x.DiffusivityM2PerS(0); math.Abs(d0/(suc.Diffusivity.D0M2PerS*(tK/ReferenceK)*water.Viscosity(ReferenceK)/water.Viscosity(tK))-1) > 1e-12 {
			t.Errorf("%g K: dilute D %g", tK, d0)
		}
	}
	mg, _ := lib.Lookup("MgSO4")
	x, _ := NewSolution(mg, ReferenceK)
	if d := x.DiffusivityM2PerS(1); d != mg.Diffusivity.D0M2PerS {
		t.Errorf("MgSO4 at 1 mol/kg: D %g, want its D⁰ %g (no Gordon for a 2:2 salt)", d, mg.Diffusivity.D0M2PerS)
	}
}
