package library

import (
	"strings"
	"testing"
)

// replacerKey is the earlier definition of Key (a strings.Replacer built
// per call), kept here as the reference the single-pass fold must equal.
func replacerKey(name string) string {
	r := strings.NewReplacer(" ", "", "\t", "", "·", "", "_", "", "-", "")
	return strings.ToLower(r.Replace(strings.TrimSpace(name)))
}

// The hand-written fold gives the same key as the replacer it replaced,
// for ASCII, non-ASCII (Σ, İ, the middle dot), invalid UTF-8 and blanks.
func TestKeySameAsReplacerFold(t *testing.T) {
	for _, s := range []string{
		"", " ", "NaCl", "nacl", " Na Cl ", "na_cl", "NH4-HCO3", "Na·Cl", "Ca(NO3)2", "ΣNaCl", "İstanbul",
		"\tMgSO4\t", "ammonia-release", "Oxidizer", "a\xffb", "ſolute", "Na\u200bCl", "---", "MgCl2·6H2O",
	} {
		if got, want := Key(s), replacerKey(s); got != want {
			t.Errorf("Key(%q) = %q, want %q", s, got, want)
		}
	}
}

// A name already in key form costs no allocation (the hazard flags of
// the library and of most requests), so matching lists stays cheap.
func TestKeyAllocationFreeOnKeyForm(t *testing.T) {
	if n := testing.AllocsPerRun(100, func() { _ = Key("ammonia-release"[:7]) }); n != 0 {
		t.Errorf("Key on a key-form name: %v allocations, want 0", n)
	}
	if n := testing.AllocsPerRun(100, func() { _ = Key("Ammonia-Release") }); n > 1 {
		t.Errorf("Key with folding: %v allocations, want ≤ 1", n)
	}
}

// Repeated flags collapse to their first spelling, in order.
func TestUniqueFlagsDropsRepeats(t *testing.T) {
	got := UniqueFlags([]string{"toxic", "Toxic", "corrosive", "toxic", "CORROSIVE", "nutrient"})
	if strings.Join(got, ",") != "toxic,corrosive,nutrient" {
		t.Errorf("UniqueFlags: %v", got)
	}
	if UniqueFlags(nil) != nil {
		t.Error("UniqueFlags(nil) is not nil")
	}
}

func BenchmarkKey(b *testing.B) {
	for _, s := range []string{"toxic", "Ammonia-Release", "Na·Cl"} {
		b.Run(s, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				_ = Key(s)
			}
		})
	}
}
