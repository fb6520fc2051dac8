package library

import (
	"math"
	"testing"
)

// The five feed presets load, validate, and are electroneutral within
// 2 % (seawater: the Reference Composition of Millero et al. 2008 balances
// to well under 1 % on its major ions).
func TestFeedPresets(t *testing.T) {
	all, err := Feeds()
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"deionised-water", "brackish-groundwater", "seawater", "brine-70", "wastewater-effluent"}
	if len(all) != len(want) {
		t.Fatalf("%d presets, want %d", len(all), len(want))
	}
	for i, f := range all {
		if f.ID != want[i] {
			t.Errorf("preset %d is %q, want %q", i, f.ID, want[i])
		}
		if im := f.ChargeImbalance(); math.Abs(im) > 0.02 {
			t.Errorf("%s: charge imbalance %.3f", f.ID, im)
		}
		if _, ok := LookupFeed(f.ID); !ok {
			t.Errorf("%s: lookup fails", f.ID)
		}
	}
}

// Millero et al. (2008) Reference Composition: the listed ions sum to the
// reference salinity 35.16504 g/kg less the omitted neutral species
// B(OH)3 (0.01944) and CO2 (0.00042) and OH- (0.00014) — 35.14504 g/kg,
// to the printed 5 decimals.
func TestSeawaterReferenceComposition(t *testing.T) {
	f, _ := LookupFeed("seawater")
	sum := 0.0
	for _, ion := range f.Ions {
		sum += ion.Concentration / 1000
	}
	if want := 35.16504 - 0.01944 - 0.00042 - 0.00014; math.Abs(sum-want) > 2e-5 {
		t.Errorf("Σ ions = %.5f g/kg, want %.5f", sum, want)
	}
}

// Equivalent NaCl: half the total ion molarity.
func TestEquivalentNaCl(t *testing.T) {
	f := &Feed{Ions: []FeedIon{{"Na+", 1, 22.99, 2299}, {"Cl-", -1, 35.453, 3545.3}}}
	if got := f.EquivalentNaClMolPerL(); math.Abs(got-0.1) > 1e-12 {
		t.Errorf("got %g mol/L, want 0.1", got)
	}
}
