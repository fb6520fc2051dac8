package thermo

import (
	"slices"
	"sync"
	"testing"

	"drawsift/engine/library"
)

// Prepared shares one Solution per library solute and temperature, builds
// it once under concurrent callers, gives the same numbers as a fresh
// NewSolution, and never shares a solute that is not a library record.
func TestPreparedShares(t *testing.T) {
	lib, err := library.Default()
	if err != nil {
		t.Fatal(err)
	}
	nacl, _ := lib.Lookup("NaCl")
	const tK = 301.15
	var wg sync.WaitGroup
	got := make([]*Solution, 16)
	for i := range got {
		wg.Add(1)
		go func() {
			defer wg.Done()
			x, err := Prepared(nacl, tK)
			if err != nil {
				t.Error(err)
				return
			}
			x.FastOsmoticFunc()(500) // the lazy table, built once
			got[i] = x
		}()
	}
	wg.Wait()
	for _, x := range got {
		if x != got[0] {
			t.Fatal("concurrent callers got different Solutions")
		}
	}
	fresh, _ := NewSolution(nacl, tK)
	for _, m := range []float64{0.1, 1, 5} {
		if a, b := got[0].OsmoticPressurePa(m), fresh.OsmoticPressurePa(m); a != b {
			t.Errorf("π at %g mol/kg: shared %g, fresh %g", m, a, b)
		}
	}
	if x, _ := Prepared(nacl, tK+1); x == got[0] {
		t.Error("another temperature shares the Solution")
	}
	// A copy of a record (a custom solute, a request's blend) is never shared.
	cp := *nacl
	a, _ := Prepared(&cp, tK)
	b, _ := Prepared(&cp, tK)
	if a == b || a == got[0] {
		t.Error("a solute outside the library was shared")
	}
	// A blend of library solutes asked for again (a new record, as every
	// request builds) is the same Solution; another ratio is not.
	mg, _ := lib.Lookup("MgCl2")
	bl := func(x float64) *library.Solute {
		b, err := library.NewBlend("b", []*library.Solute{nacl, mg}, []float64{x, 1 - x})
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	b1, _ := Prepared(bl(0.9), tK)
	b2, _ := Prepared(bl(0.9), tK)
	b3, _ := Prepared(bl(0.8), tK)
	if b1 != b2 || b1 == b3 {
		t.Error("blends are not shared by their composition")
	}
	// Out-of-range temperatures fail every time and are not kept.
	for i := 0; i < 2; i++ {
		if _, err := Prepared(nacl, 400); err == nil {
			t.Fatal("400 K accepted")
		}
	}
	// Warnings of a shared Solution cannot be appended into.
	if len(got[0].Warnings) != cap(got[0].Warnings) {
		t.Error("a shared Solution's warnings have spare capacity")
	}
}

// SharedIonMixture gives one model per ion list and temperature, the
// same as a model built afresh (here seawater's major ions with the
// carbonate species, as the screen's scaling model has them), and
// another for another order or temperature.
func TestSharedIonMixture(t *testing.T) {
	ions := []MixIon{{"Na+", 1}, {"Mg+2", 2}, {"Ca+2", 2}, {"K+", 1}, {"Cl-", -1}, {"SO4-2", -2}, {"HCO3-", -1}, {"CO3-2", -2}, {"CO2", 0}}
	a, err := SharedIonMixture(ions, 298.15)
	if err != nil {
		t.Fatal(err)
	}
	if b, _ := SharedIonMixture(append([]MixIon(nil), ions...), 298.15); b != a {
		t.Error("the same ions at the same temperature gave another model")
	}
	swapped := append([]MixIon(nil), ions...)
	swapped[0], swapped[1] = swapped[1], swapped[0]
	if b, _ := SharedIonMixture(swapped, 298.15); b == a {
		t.Error("another order of the ions gave the same model (its vectors are in that order)")
	}
	if b, _ := SharedIonMixture(ions, 308.15); b == a {
		t.Error("another temperature gave the same model")
	}
	fresh, err := NewIonMixture(ions, 298.15)
	if err != nil {
		t.Fatal(err)
	}
	m := []float64{0.486, 0.0547, 0.0107, 0.0106, 0.566, 0.0293, 0.0017, 0.0002, 0.00001}
	g1, g2 := make([]float64, len(m)), make([]float64, len(m))
	if p1, p2 := a.Eval(m, g1), fresh.Eval(m, g2); p1 != p2 || !slices.Equal(g1, g2) {
		t.Errorf("shared model: φ term %g, ln γ %v; fresh model: %g, %v", p1, g1, p2, g2)
	}
	if _, err := SharedIonMixture([]MixIon{{"Na+", 1}, {"Na+", 1}}, 298.15); err == nil {
		t.Error("an ion listed twice was accepted")
	}
}
