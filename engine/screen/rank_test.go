package screen

import (
	"math"
	"testing"
)

// TestNormaliseAgainst: the reference scores 0.5; twice as good on a
// maximised metric (water flux) or half as much on a minimised one (SRSF)
// scores 2/3; a saturation index one log unit above the reference's, 1/11;
// unknown values 0 (ReferenceFormula).
func TestNormaliseAgainst(t *testing.T) {
	ref := &Reference{}
	for o := range ref.Values {
		ref.Values[o], ref.Known[o] = 2, true
	}
	vals := make([][NumObjectives]float64, 3)
	known := make([][NumObjectives]bool, 3)
	for i := range vals {
		for o := range vals[i] {
			vals[i][o], known[i][o] = 2, true
		}
	}
	vals[1][ObjWaterFlux], vals[1][ObjSRSF], vals[1][ObjScaling] = 4, 1, 3
	known[2][ObjWaterFlux] = false
	out := make([][NumObjectives]float64, 3)
	NormaliseAgainst(vals, known, ref, out)
	for o, v := range out[0] {
		if math.Abs(v-0.5) > 1e-15 {
			t.Errorf("reference row, %s: %g", Objective(o).Key(), v)
		}
	}
	for _, c := range []struct {
		o    Objective
		want float64
	}{{ObjWaterFlux, 2.0 / 3}, {ObjSRSF, 2.0 / 3}, {ObjScaling, 1.0 / 11}} {
		if got := out[1][c.o]; math.Abs(got-c.want) > 1e-15 {
			t.Errorf("%s: %g, want %g", c.o.Key(), got, c.want)
		}
	}
	if out[2][ObjWaterFlux] != 0 {
		t.Errorf("unknown value normalised to %g", out[2][ObjWaterFlux])
	}
}
