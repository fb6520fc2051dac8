package transport

import (
	"errors"
	"math"
	"strings"
	"testing"

	"drawsift/engine/errs"
	"drawsift/engine/warn"
)

// Water-like fluid at 25 °C: ρ = 997 kg/m³, μ = 0.89 mPa·s (from memory),
// D = 1.47e-9 m²/s (test input).
var water = Fluid{DensityKgPerM3: 997, ViscosityPaS: 8.9e-4, DiffusivityM2PerS: 1.47e-9}

// Values: the correlations as quoted in MassTransferCoefficient's doc
// comment (McCutcheon & Elimelech 2006; Schock & Miquel 1987), evaluated
// independently with Python 3.11 (float64, ** for the powers), 2 mm × 40 mm
// × 80 mm channel.
func TestMassTransferValues(t *testing.T) {
	for _, tc := range []struct {
		name      string
		u         float64
		spacer    bool
		regime    string
		re, k     float64
		borderTag bool
	}{
		{"laminar", 0.25, false, "laminar", 1066.880684858213, 2.2389431243308826e-05, false},
		{"turbulent", 1.5, false, "turbulent", 6401.284109149278, 9.156332192667888e-05, false},
		{"spacer", 0.1, true, "spacer-filled", 426.7522739432852, 2.492345471154227e-05, false},
	} {
		mt, err := MassTransferCoefficient(Channel{HeightM: 0.002, WidthM: 0.04, LengthM: 0.08, VelocityMPerS: tc.u, Spacer: tc.spacer}, water)
		if err != nil {
			t.Fatal(err)
		}
		if mt.Regime != tc.regime || !closeTo(mt.Re, tc.re, 1e-12, 0) || !closeTo(mt.KMPerS, tc.k, 1e-12, 0) {
			t.Errorf("%s: got %+v, want regime %s Re %g k %g", tc.name, mt, tc.regime, tc.re, tc.k)
		}
		if !closeTo(mt.HydraulicDiameterM, 0.0038095238095238095, 1e-15, 0) || !closeTo(mt.Sc, 607.2639687770794, 1e-12, 0) {
			t.Errorf("%s: d_h %g Sc %g", tc.name, mt.HydraulicDiameterM, mt.Sc)
		}
		if mt.Correlation == "" || len(mt.Warnings) == 0 {
			t.Errorf("%s: correlation %q warnings %v", tc.name, mt.Correlation, mt.Warnings)
		}
	}
}

// Scaling laws implied by each correlation (d_h = 2h for a wide channel is
// the definition 4·area/perimeter in the limit w ≫ h, common practice):
// k ∝ u^(1/3) laminar, u^0.75 turbulent, u^0.875 spacer-filled.
func TestMassTransferScaling(t *testing.T) {
	wide, _ := MassTransferCoefficient(Channel{HeightM: 1e-3, WidthM: 10, LengthM: 0.1, VelocityMPerS: 0.1}, water)
	if !closeTo(wide.HydraulicDiameterM, 2e-3, 1e-3, 0) {
		t.Errorf("wide channel d_h = %g, want → 2h", wide.HydraulicDiameterM)
	}
	for _, tc := range []struct {
		u1, u2 float64
		spacer bool
		exp    float64
	}{{0.05, 0.2, false, 1.0 / 3}, {2, 4, false, 0.75}, {0.05, 0.4, true, 0.875}} {
		ch := Channel{HeightM: 0.002, WidthM: 0.04, LengthM: 0.08, VelocityMPerS: tc.u1, Spacer: tc.spacer}
		a, _ := MassTransferCoefficient(ch, water)
		ch.VelocityMPerS = tc.u2
		b, _ := MassTransferCoefficient(ch, water)
		if got := math.Log(b.KMPerS/a.KMPerS) / math.Log(tc.u2/tc.u1); !closeTo(got, tc.exp, 1e-12, 0) {
			t.Errorf("%s: k ∝ u^%g, want %g", a.Regime, got, tc.exp)
		}
	}
}

func TestMassTransferBorderline(t *testing.T) {
	mt, err := MassTransferCoefficient(Channel{HeightM: 0.002, WidthM: 0.04, LengthM: 0.08, VelocityMPerS: 0.75}, water) // Re ≈ 3200
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, w := range mt.Warnings {
		found = found || strings.Contains(w.Text, "laminar/turbulent borderline") && w.Code == warn.FlowRegime
	}
	if mt.Regime != "transitional" || !found || !strings.HasPrefix(mt.Correlation, "Sh = 1.85") {
		t.Errorf("Re %g: regime %q correlation %q warnings %v", mt.Re, mt.Regime, mt.Correlation, mt.Warnings)
	}
}

func TestMassTransferBadInput(t *testing.T) {
	good := Channel{HeightM: 0.002, WidthM: 0.04, LengthM: 0.08, VelocityMPerS: 0.2}
	for _, tc := range []struct {
		field string
		ch    Channel
		f     Fluid
	}{
		{"channel.height_m", Channel{HeightM: 0, WidthM: 0.04, LengthM: 0.08, VelocityMPerS: 0.2}, water},
		{"channel.width_m", Channel{HeightM: 0.002, WidthM: -1, LengthM: 0.08, VelocityMPerS: 0.2}, water},
		{"channel.length_m", Channel{HeightM: 0.002, WidthM: 0.04, LengthM: math.NaN(), VelocityMPerS: 0.2}, water},
		{"channel.velocity_m_per_s", Channel{HeightM: 0.002, WidthM: 0.04, LengthM: 0.08, VelocityMPerS: 0}, water},
		{"fluid.density_kg_per_m3", good, Fluid{DensityKgPerM3: 0, ViscosityPaS: 1e-3, DiffusivityM2PerS: 1e-9}},
		{"fluid.viscosity_pa_s", good, Fluid{DensityKgPerM3: 1000, ViscosityPaS: math.Inf(1), DiffusivityM2PerS: 1e-9}},
		{"fluid.diffusivity_m2_per_s", good, Fluid{DensityKgPerM3: 1000, ViscosityPaS: 1e-3, DiffusivityM2PerS: -1e-9}},
	} {
		_, err := MassTransferCoefficient(tc.ch, tc.f)
		var ie *errs.InputError
		if !errors.As(err, &ie) || ie.Field != tc.field || ie.Limit == "" {
			t.Errorf("%s: error %v", tc.field, err)
		}
	}
}
