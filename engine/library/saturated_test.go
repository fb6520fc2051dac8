package library

import (
	"math"
	"testing"
)

// The saturated-solution water activities on record (the CRC Handbook's
// constant-humidity table, RH = A·exp(B/T), stated accuracy ±2 % RH)
// against a second published form of the same measurements: Greenspan's
// (1977, J. Res. Natl. Bur. Stand. 81A:89) least-squares polynomials
// RH = Σ a_i t^i (t in °C), with the coefficients as quoted in two
// independent public programs that cite the paper; at 25 °C they give
// Greenspan's tabulated 75.29 (NaCl), 84.34 (KCl), 32.78 (MgCl2), 93.58
// (KNO3) and 97.30 % RH (K2SO4) to ±0.02 (tabulated values from memory).
func TestSaturatedWaterActivityGreenspan(t *testing.T) {
	poly := map[string][]float64{
		"NaCl":  {75.5164, 0.0398321, -0.265459e-2, 0.2848e-4},
		"KCl":   {88.6190, -0.193340, 0.899706e-3},
		"MgCl2": {33.6686, -0.00797397, -0.108988e-2},
		"KNO3":  {96.3361, 0.0112371, -0.484514e-2},
		"K2SO4": {98.7792, -0.0590502},
	}
	lib := MustDefault()
	for id, a := range poly {
		s, ok := lib.Lookup(id)
		if !ok {
			t.Fatalf("%s missing", id)
		}
		sw := s.Solubility.SaturatedWaterActivity
		for tC := math.Max(sw.MinC, 0); tC <= sw.MaxC; tC += 5 {
			got, ok := sw.At(tC)
			if !ok {
				t.Fatalf("%s: no value at %g °C inside %g–%g °C", id, tC, sw.MinC, sw.MaxC)
			}
			rh, tp := 0.0, 1.0
			for _, c := range a {
				rh += c * tp
				tp *= tC
			}
			if math.Abs(100*got-rh) > sw.UncertaintyPercentRH {
				t.Errorf("%s %g °C: CRC form %.2f %% RH, Greenspan's polynomial %.2f %% RH", id, tC, 100*got, rh)
			}
		}
	}
	// Outside the measured range there is no value.
	s, _ := lib.Lookup("LiCl")
	if _, ok := s.Solubility.SaturatedWaterActivity.At(10); ok {
		t.Errorf("LiCl: a value at 10 °C, outside the CRC range 20–65 °C")
	}
}
