package screen

import (
	"math"
	"testing"

	"drawsift/engine/regen"
	"drawsift/engine/thermo"
)

// The robustness run's regeneration-energy table (issue #16 item 3): for
// every library draw at 25 °C over the span a run tabulates, an accepted
// table matches the exact quadrature to regenTableTol at 400 points
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
		m0 := math.Min(1, sup/regenTableSpan)
		a, b := m0/regenTableSpan, math.Min(m0*regenTableSpan, sup)
		f := func(m float64) float64 { return regen.MinimumSeparationEnergy(x.OsmoticPressurePa, m*0.5, 0.5) }
		tab := newRegenTable(f, a, b)
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
		if worst > regenTableTol {
			t.Errorf("%s: table error %.2g over [%g, %g], accepted at %g", s.ID, worst, a, b, regenTableTol)
		}
		if _, ok := tab.at(b * 1.01); ok {
			t.Errorf("%s: the table answers outside its span", s.ID)
		}
	}
	if accepted < len(all)-4 {
		t.Errorf("only %d of %d draws tabulated", accepted, len(all))
	}
	kink := func(m float64) float64 { return 1 + math.Abs(m-1) }
	if newRegenTable(kink, 0.5, 2) != nil {
		t.Error("a kinked function was tabulated")
	}
}
