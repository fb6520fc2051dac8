package thermo

import (
	"math"
	"testing"
)

// The gas constant is the product of the two exact SI constants, and the
// float64 nearest 8.31446261815324 (CODATA 2018, exact).
func TestGasConstantExact(t *testing.T) {
	if float64(GasConstant) != 8.31446261815324 {
		t.Errorf("R = %.17g, want 8.31446261815324", GasConstant)
	}
	if r := float64(AvogadroConstant) * float64(BoltzmannConstant); math.Abs(r-GasConstant) > 2e-16*GasConstant {
		t.Errorf("N_A·k_B in float64 = %.17g, R = %.17g", r, GasConstant)
	}
}

// Each pressure factor against its definition (exact) and, for psi, the
// value NIST SP 811 (2008) appendix B.8 prints to 7 figures.
func TestPressureUnits(t *testing.T) {
	for _, tc := range []struct {
		name string
		want float64
		tol  float64 // relative
	}{
		{"bar", 1e5, 0},
		{"kPa", 1e3, 0},
		{"MPa", 1e6, 0},
		{"atm", 101325, 0},
		{"psi", 6.894757e3, 5e-8}, // NIST SP 811 prints 6.894 757 E+03
		{"Pa", 1, 0},
	} {
		for _, spelled := range []string{tc.name, " " + tc.name + " ", "  " + tc.name} {
			got, ok := ParsePressureUnit(spelled)
			if !ok || math.Abs(got-tc.want) > tc.tol*tc.want {
				t.Errorf("ParsePressureUnit(%q) = %.17g, %v; want %.10g", spelled, got, ok, tc.want)
			}
		}
	}
	// Case-insensitive ("KPA", "mpa"), and nothing else is a unit: not the
	// empty name (the default is the caller's), not a near miss.
	if f, ok := ParsePressureUnit("KPA"); !ok || f != 1e3 {
		t.Errorf(`"KPA" = %g, %v`, f, ok)
	}
	if f, ok := ParsePressureUnit("mpa"); !ok || f != 1e6 {
		t.Errorf(`"mpa" = %g, %v`, f, ok)
	}
	for _, bad := range []string{"", "mbar", "psig", "Torr", "bars"} {
		if f, ok := ParsePressureUnit(bad); ok || f != 0 {
			t.Errorf("ParsePressureUnit(%q) = %g, %v; want not a unit", bad, f, ok)
		}
	}
	// psi from its definition: lbf = 0.45359237 kg × 9.80665 m/s², in² =
	// 0.0254² m² = 6894.757293168361336… Pa (Python's decimal module, 40
	// digits), whose nearest float64 prints as 6894.757293168362.
	if float64(PascalPerPsi) != 6894.757293168362 { // float64: untyped constants compare exactly
		t.Errorf("psi = %.17g Pa, want 6894.757293168362", PascalPerPsi)
	}
	names := PressureUnitNames()
	if len(names) != 6 || names[0] != "bar" {
		t.Errorf("PressureUnitNames() = %v", names)
	}
	for _, n := range names {
		if _, ok := ParsePressureUnit(n); !ok {
			t.Errorf("listed unit %q does not parse", n)
		}
	}
	names[0] = "changed"
	if PressureUnitNames()[0] != "bar" {
		t.Error("PressureUnitNames shares its slice with the caller")
	}
}

// Flux and energy factors: 1 LMH = 1/3.6e6 m/s, 1 mol m⁻² s⁻¹ = 3.6e6
// mmol m⁻² h⁻¹, 1 kg m⁻² s⁻¹ = 3.6e6 g m⁻² h⁻¹, 1 kWh = 3.6e6 J (all
// exact), and round trips through them.
func TestFluxAndEnergyFactors(t *testing.T) {
	if MPerSPerLMH != 1/3.6e6 || MPerSPaPerLMHPerBar != 1/(3.6e6*1e5) {
		t.Errorf("LMH factors %g, %g", MPerSPerLMH, MPerSPaPerLMHPerBar)
	}
	if MmolPerM2HPerMolPerM2S != 3.6e6 || GPerM2HPerKgPerM2S != 3.6e6 || JPerKWh != 3.6e6 {
		t.Errorf("per-hour factors %g, %g, %g", MmolPerM2HPerMolPerM2S, GPerM2HPerKgPerM2S, JPerKWh)
	}
	// 10 LMH → m/s → LMH; 1 mmol m⁻² h⁻¹ → mol m⁻² s⁻¹ → back.
	if got := 10 * MPerSPerLMH / MPerSPerLMH; math.Abs(got-10) > 1e-15*10 {
		t.Errorf("LMH round trip %g", got)
	}
	if got := (1 / MmolPerM2HPerMolPerM2S) * MmolPerM2HPerMolPerM2S; math.Abs(got-1) > 1e-15 {
		t.Errorf("mmol m⁻² h⁻¹ round trip %g", got)
	}
}
