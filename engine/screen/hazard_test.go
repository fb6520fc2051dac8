package screen

import (
	"context"
	"errors"
	"fmt"
	"testing"

	"drawsift/engine/library"
)

// floodFlags returns n hazard flags cycling through the known ones with
// varied spelling (as a request flooding the lists would send them).
func floodFlags(n int, upper bool) []string {
	out := make([]string, n)
	for i := range out {
		f := library.HazardFlags[i%len(library.HazardFlags)]
		if upper && i%2 == 1 {
			f = "  " + f + " "
		}
		out[i] = f
	}
	return out
}

// Exclusion matches each flag once against the normalised set: a solute
// with every flag repeated many times is excluded by the earliest listed
// exclusion, and one with none of the excluded flags is kept.
func TestHazardMatchingFloodedLists(t *testing.T) {
	s := &library.Solute{ID: "X", HazardFlags: floodFlags(1000, true)}
	set := hazardSet(append([]string{"Corrosive"}, floodFlags(1000, false)...))
	if got := hazardHit(s, set); library.Key(got) != "corrosive" {
		t.Errorf("hit %q, want the first excluded flag (corrosive)", got)
	}
	if got := hazardHit(&library.Solute{ID: "Y", HazardFlags: []string{"nutrient"}}, hazardSet([]string{"toxic", "oxidizer"})); got != "" {
		t.Errorf("hit %q on a solute without an excluded flag", got)
	}
	if got := hazardHit(s, nil); got != "" {
		t.Errorf("hit %q with nothing excluded", got)
	}
}

// A cancelled context stops the preparation (before any candidate's
// Solution is built), with no robustness run or sweep asked for.
func TestPrepareStopsWhenClientGone(t *testing.T) {
	sc := baseScenario(t)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Run(ctx, sc, lib(t), nil); !errors.Is(err, context.Canceled) {
		t.Errorf("Run with a cancelled context: %v, want context.Canceled", err)
	}
}

// BenchmarkHazardMatching: n excluded entries × n flags on one solute.
// Linear matching shows ns/op growing ×10 per ×10 in n (not ×100).
func BenchmarkHazardMatching(b *testing.B) {
	for _, n := range []int{100, 1000, 10000} {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			s := &library.Solute{ID: "X", HazardFlags: floodFlags(n, true)}
			excl := floodFlags(n, true)
			b.ReportAllocs()
			for b.Loop() {
				_ = hazardHit(s, hazardSet(excl))
			}
		})
	}
}
