package thermo

import (
	"errors"
	"math"
	"testing"

	"drawsift/engine/errs"
)

// The equilibrium constants at 25 °C against the values their sources
// print: Plummer & Busenberg (1982) Table 3 give log K₁ = −6.352,
// log K₂ = −10.329, log K_calcite = −8.480, log K_aragonite = −8.336;
// K_w of Harned & Robinson (1940) gives pK_w = 13.995 (14.00 in Harned &
// Owen's table). Tolerance: the printed last digit.
func TestCarbonateConstants(t *testing.T) {
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"log K1", LogK1Carbonic(ReferenceK), -6.352},
		{"log K2", LogK2Carbonic(ReferenceK), -10.329},
		{"log Kw", LogKw(ReferenceK), -13.995},
		{"log K calcite", analyticLogK(minerals[len(minerals)-2].anal, ReferenceK), -8.480},
		{"log K aragonite", analyticLogK(minerals[len(minerals)-1].anal, ReferenceK), -8.336},
	} {
		if math.Abs(c.got-c.want) > 1e-3 {
			t.Errorf("%s(25 °C) = %.4f, want %.3f", c.name, c.got, c.want)
		}
	}
}

// Speciation conserves DIC, meets the mass-action laws with the model's
// activities, and round-trips through the closed-system solver: the
// alkalinity of the pH-8.1 speciation, solved for pH, gives 8.1 back.
func TestSpeciateCarbonate(t *testing.T) {
	mx, m0 := seawaterAt(t, ReferenceK, 1)
	base := seawaterMolalities(t, mx, 35.16504, 1)
	ix, err := mx.carbonateIndex()
	if err != nil {
		t.Fatal(err)
	}
	dic := base[ix.hco3] + base[ix.co3]
	for _, pH := range []float64{4, 6.35, 8.1, 10, 12} {
		m, err := mx.SpeciateCarbonate(base, pH)
		if err != nil {
			t.Fatal(err)
		}
		if got := m[ix.co2] + m[ix.hco3] + m[ix.co3]; math.Abs(got/dic-1) > 1e-12 {
			t.Errorf("pH %g: DIC %.15g, want %.15g", pH, got, dic)
		}
		lg := make([]float64, len(m))
		mx.Eval(m, lg)
		la := func(i int) float64 { return math.Log10(m[i]) + lg[i]/math.Ln10 }
		law := math.Log10(mx.WaterActivity(m))
		if d := la(ix.h); math.Abs(d+pH) > 1e-10 {
			t.Errorf("pH %g: −log a_H = %.12g", pH, -d)
		}
		if d := la(ix.h) + la(ix.hco3) - la(ix.co2) - law - LogK1Carbonic(ReferenceK); math.Abs(d) > 1e-10 {
			t.Errorf("pH %g: K1 residual %g", pH, d)
		}
		if d := la(ix.h) + la(ix.co3) - la(ix.hco3) - LogK2Carbonic(ReferenceK); math.Abs(d) > 1e-10 {
			t.Errorf("pH %g: K2 residual %g", pH, d)
		}
		if d := la(ix.h) + la(ix.oh) - law - LogKw(ReferenceK); math.Abs(d) > 1e-10 {
			t.Errorf("pH %g: Kw residual %g", pH, d)
		}
	}
	alk, err := mx.CarbonateAlkalinity(m0)
	if err != nil {
		t.Fatal(err)
	}
	m, pH, err := mx.SpeciateAlkalinity(base, dic, alk)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(pH-8.1) > 1e-8 {
		t.Errorf("closed system: pH %.10g, want 8.1", pH)
	}
	for i := range m {
		if math.Abs(m[i]-m0[i]) > 1e-9*m0[i]+1e-18 {
			t.Errorf("closed system: %s %.10g, want %.10g", mx.Ions()[i].Symbol, m[i], m0[i])
		}
	}
	t.Logf("seawater at pH 8.1: alkalinity %.4g mol/kg, CO2 %.3g, HCO3 %.4g, CO3 %.3g", alk, m0[ix.co2], m0[ix.hco3], m0[ix.co3])
}

// Bad input gets an *errs.InputError naming the field; an unreachable
// alkalinity a *errs.ConvergenceError; DIC = 0 only sets H+ and OH-.
func TestSpeciateCarbonateErrors(t *testing.T) {
	plain, err := NewIonMixture([]MixIon{{"Na+", 1}, {"Cl-", -1}}, ReferenceK)
	if err != nil {
		t.Fatal(err)
	}
	var ie *errs.InputError
	if _, err := plain.SpeciateCarbonate([]float64{1, 1}, 7); !errors.As(err, &ie) || ie.Field != "ions" {
		t.Errorf("no carbonate species: %v", err)
	}
	mx, err := NewIonMixture(append([]MixIon{{"Na+", 1}, {"Cl-", -1}}, CarbonateIons()...), ReferenceK)
	if err != nil {
		t.Fatal(err)
	}
	m := []float64{0.5, 0.5, 0, 0, 0, 0, 0}
	for _, c := range []struct {
		m     []float64
		pH    float64
		field string
	}{
		{m, 15, "ph"},
		{m, math.NaN(), "ph"},
		{m[:3], 7, "molalities"},
		{[]float64{0.5, 0.5, 0, 0, 0, -1, 0}, 7, "molalities[5]"},
		{[]float64{0.5, math.Inf(1), 0, 0, 0, 0, 0}, 7, "molalities[1]"},
	} {
		if _, err := mx.SpeciateCarbonate(c.m, c.pH); !errors.As(err, &ie) || ie.Field != c.field {
			t.Errorf("%v pH %g: %v, want an error on %s", c.m, c.pH, err, c.field)
		}
	}
	w, err := mx.SpeciateCarbonate(m, 7)
	if err != nil {
		t.Fatal(err)
	}
	if w[2] != 0 || w[5] != 0 || w[6] != 0 || !(w[3] > 0 && w[4] > 0) {
		t.Errorf("DIC 0: %v", w)
	}
	var ce *errs.ConvergenceError
	// −10 mol/kg: more acid than pH 0 holds (about −1 mol/kg there).
	if _, _, err := mx.SpeciateAlkalinity(m, 1e-3, -10); !errors.As(err, &ce) {
		t.Errorf("alkalinity −10 mol/kg: %v, want a ConvergenceError", err)
	}
	if _, _, err := mx.SpeciateAlkalinity(m, -1, 0); !errors.As(err, &ie) || ie.Field != "dic_mol_per_kg" {
		t.Errorf("negative DIC: %v", err)
	}
}
