package screen

import (
	"math"
	"testing"

	"drawsift/engine/regen"
	"drawsift/engine/thermo"
)

// The robustness run's regeneration-energy table (issue #16 item 3): for
// every library draw at 25 °C over the span a run tabulates, an accepted
// table matches the exact quadrature to lnTableTol at 400 points
// (not only at its own check points); most draws are accepted (a π model
// with a kink in the span is refused and the run keeps the quadrature);
// outside its span the table declines; a function with a kink is refused.
func TestRegenTableError(t *testing.T) {
	accepted := 0
	all := lib(t).All()
	for _, s := range all {
		x, err := thermo.Prepared(s, 298.15)
		if err != nil {
			t.Fatal(err)
		}
		sup := x.SupportedMolPerKg()
		m0 := math.Min(1, sup/lnTableSpan)
		a, b := m0/lnTableSpan, math.Min(m0*lnTableSpan, sup)
		f := func(m float64) float64 { return regen.MinimumSeparationEnergy(x.OsmoticPressurePa, m*0.5, 0.5) }
		tab := newLnTable(f, a, b)
		if tab == nil {
			continue
		}
		accepted++
		worst := 0.0
		for i := 0; i <= 400; i++ {
			m := a * math.Pow(b/a, float64(i)/400)
			got, ok := tab.at(m)
			if !ok {
				t.Fatalf("%s: the table declines m = %g inside [%g, %g]", s.ID, m, a, b)
			}
			worst = math.Max(worst, math.Abs(got/f(m)-1))
		}
		if worst > lnTableTol {
			t.Errorf("%s: table error %.2g over [%g, %g], accepted at %g", s.ID, worst, a, b, lnTableTol)
		}
		if _, ok := tab.at(b * 1.01); ok {
			t.Errorf("%s: the table answers outside its span", s.ID)
		}
	}
	if accepted < len(all)-4 {
		t.Errorf("only %d of %d draws tabulated", accepted, len(all))
	}
	kink := func(m float64) float64 { return 1 + math.Abs(m-1) }
	if newLnTable(kink, 0.5, 2) != nil {
		t.Error("a kinked function was tabulated")
	}
}

// The robustness run's viscosity and inverse-π tables: for every library
// draw at 25 °C over the span a run tabulates, an accepted table matches
// the exact function (the viscosity model; the Newton solve for the
// molality at a π) to lnTableTol at 400 points, and most draws are
// accepted.
func TestViscosityAndInverseTablesError(t *testing.T) {
	all := lib(t).All()
	visc, inv := 0, 0
	for _, s := range all {
		x, err := thermo.Prepared(s, 298.15)
		if err != nil {
			t.Fatal(err)
		}
		sup := x.SupportedMolPerKg()
		m0 := min(1, sup/lnTableSpan, x.SolubilityMolPerKg()/lnTableSpan)
		a, b := m0/lnTableSpan, math.Min(m0*lnTableSpan, sup)
		exactM := func(pi float64) float64 {
			m, err := x.MolalityForPi(pi)
			if err != nil {
				return math.NaN()
			}
			return m
		}
		for _, tc := range []struct {
			name   string
			f      func(float64) float64
			lo, hi float64
			n      *int
		}{
			{"viscosity", x.ViscosityPaS, a, b, &visc},
			{"molality at π", exactM, x.OsmoticPressurePa(a), x.OsmoticPressurePa(math.Min(b, x.SolubilityMolPerKg())), &inv},
		} {
			tab := newLnTable(tc.f, tc.lo, tc.hi)
			if tab == nil {
				continue
			}
			*tc.n++
			worst := 0.0
			for i := 0; i <= 400; i++ {
				v := tc.lo * math.Pow(tc.hi/tc.lo, float64(i)/400)
				got, ok := tab.at(v)
				if !ok {
					t.Fatalf("%s %s: the table declines %g inside [%g, %g]", s.ID, tc.name, v, tc.lo, tc.hi)
				}
				worst = math.Max(worst, math.Abs(got/tc.f(v)-1))
			}
			if worst > lnTableTol {
				t.Errorf("%s %s: table error %.2g over [%g, %g], accepted at %g", s.ID, tc.name, worst, tc.lo, tc.hi, lnTableTol)
			}
		}
	}
	t.Logf("tabulated: viscosity %d, inverse %d of %d draws", visc, inv, len(all))
	if visc < len(all)-4 || inv < len(all)-4 {
		t.Errorf("tabulated only viscosity %d and inverse %d of %d draws", visc, inv, len(all))
	}
}
