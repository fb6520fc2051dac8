package scenario

import (
	"drawsift/engine/limits"
	"math"
	"strings"
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
)

// A preset's measured B stands for its own solutes; overriding its NaCl B
// drops them (they were measured with the preset's NaCl B), and a custom
// membrane without a NaCl B cannot estimate.
func TestMembraneBFor(t *testing.T) {
	lib, err := library.Default()
	if err != nil {
		t.Fatal(err)
	}
	// No preset carries a measured B besides NaCl's yet, so the measured
	// value is set here (an invented number, not data).
	s, _ := lib.Lookup("MgCl2")
	nacl, _ := lib.Lookup("NaCl")
	m := &Membrane{B: library.SoluteB{NaCl: 1e-7, Measured: map[string]float64{"MgCl2": 2e-8}}, BKnown: true}
	if b, est, err := m.BFor("membrane.b_lmh", s, nil); err != nil || est || b != 2e-8 {
		t.Errorf("measured B: %g %v %v", b, est, err)
	}
	if b, est, _ := m.BFor("membrane.b_lmh", nacl, nil); est || b != 1e-7 {
		t.Errorf("NaCl B: %g %v", b, est)
	}
	kcl, _ := lib.Lookup("KCl")
	// BEstimateRule (library.HinderedRule): K⁺ by hindered diffusion from
	// its D⁰, Cl⁻ at the NaCl value, combined as a salt (library.SaltB).
	want := library.SaltB(1, -1, 1e-7*library.HinderedFactor(1.957e-9), 1e-7)
	if b, est, _ := m.BFor("membrane.b_lmh", kcl, nil); !est || math.Abs(b-want) > 1e-12*want {
		t.Errorf("estimated B for KCl: %g %v, want %g", b, est, want)
	}
	over := 3e-8
	if b, est, _ := m.BFor("membrane.b_lmh", kcl, &over); est || b != over {
		t.Errorf("override: %g %v", b, est)
	}
	preset, err := ResolveMembrane(&MembraneSpec{Preset: DefaultMembranePreset})
	if err != nil || !preset.BKnown || preset.Record == nil {
		t.Fatalf("preset %s: %+v %v", DefaultMembranePreset, preset, err)
	}
	two := 2 * preset.Record.BNaClLMH
	m2, _ := ResolveMembrane(&MembraneSpec{Preset: DefaultMembranePreset, BNaClLMH: &two})
	if b, _, _ := m2.BFor("membrane.b_lmh", nacl, nil); math.Abs(b-two*thermo.MPerSPerLMH) > 1e-18 {
		t.Errorf("b_nacl_lmh override not applied: %g", b)
	}
	a, sUM := 1.0, 500.0
	custom, err := ResolveMembrane(&MembraneSpec{ALMHPerBar: &a, SUM: &sUM})
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := custom.BFor("membrane.b_lmh", s, nil); err == nil {
		t.Error("a custom membrane without any B gave a B")
	}
	bad := 1e6
	if _, err := ResolveMembrane(&MembraneSpec{ALMHPerBar: &bad, SUM: &sUM}); err == nil || !strings.Contains(err.Error(), "a_lmh_per_bar") {
		t.Errorf("A = 1e6 LMH/bar: %v, want an error naming a_lmh_per_bar", err)
	}
}

// The seawater composition scales with salinity: at 35.16504 g/kg (the
// Reference Composition's own salinity, Millero et al. 2008 Table 4) Na+
// is 10.78145 g/kg, i.e. 0.468965 mol/kg with M = 22.98977 g/mol.
func TestFeedIonsAt(t *testing.T) {
	f, ok := library.LookupFeed("seawater")
	if !ok {
		t.Fatal("no seawater preset")
	}
	var na float64
	for _, ion := range f.IonsAt(f.ReferenceSalinityGPerKg) {
		if ion.Symbol == "Na+" {
			na = ion.Mol
		}
	}
	if math.Abs(na-10.78145/22.98977) > 1e-4*na {
		t.Errorf("Na+ at the reference salinity: %g mol/kg, want %g", na, 10.78145/22.98977)
	}
	half := f.IonsAt(f.ReferenceSalinityGPerKg / 2)
	for i, ion := range f.IonsAt(f.ReferenceSalinityGPerKg) {
		if math.Abs(half[i].Mol-ion.Mol/2) > 1e-12*ion.Mol {
			t.Errorf("%s does not scale with salinity", ion.Symbol)
		}
	}
	for _, ion := range f.IonsAt(0) {
		if ion.Mol != 0 {
			t.Errorf("%s at zero salinity: %g", ion.Symbol, ion.Mol)
		}
	}
}

// A channel flow between laminar and turbulent (Re ≈ 3,200) carries its
// warning as a value, with its code, so no host has to find a word in it.
func TestResolveKWarnings(t *testing.T) {
	spec := ChannelSpec{HeightMM: 2, WidthMM: 40, LengthMM: 80, CrossflowVelocityMPerS: 0.75}
	ch, err := ResolveChannel(&spec)
	if err != nil {
		t.Fatal(err)
	}
	// Water at 25 °C: ρ 997 kg/m³, μ 0.89 mPa·s (IAPWS; common values), NaCl's D.
	k, err := ResolveK(&limits.KDraw, nil, ch, true, false, transport.Fluid{DensityKgPerM3: 997, ViscosityPaS: 0.89e-3, DiffusivityM2PerS: 1.5e-9})
	if err != nil {
		t.Fatal(err)
	}
	if k.Origin != KCorrelation || !warn.Has(k.MassTransfer.Warnings, warn.FlowRegime) || !warn.Has(k.MassTransfer.Warnings, warn.Unverified) {
		t.Errorf("Re %g: origin %s warnings %v, want the flow-regime and unverified warnings", k.MassTransfer.Re, k.Origin, k.MassTransfer.Warnings)
	}
	none, _ := ResolveK(&limits.KDraw, nil, ch, false, false, transport.Fluid{})
	if !math.IsInf(none.KMPerS, 1) || none.Origin != KNone {
		t.Errorf("no external CP: %+v", none)
	}
	bad := 5.0
	if _, err := ResolveK(&limits.KDraw, &bad, ch, true, false, transport.Fluid{}); err == nil || !strings.Contains(err.Error(), "k_draw_m_per_s") {
		t.Errorf("k = 5 m/s: %v", err)
	}
	tall := spec
	tall.HeightMM = 2e4
	if _, err := ResolveChannel(&tall); err == nil || !strings.Contains(err.Error(), "channel.height_mm") {
		t.Errorf("a 20 m channel: %v", err)
	}
}

func TestParseNames(t *testing.T) {
	for _, name := range []string{"", "real", "REAL"} {
		if m, err := ParseOsmoticModel(name); err != nil || m != Real {
			t.Errorf("%q: %v %v", name, m, err)
		}
	}
	for _, name := range []string{"van-t-hoff", "ideal", "van't-hoff"} {
		if m, err := ParseOsmoticModel(name); err != nil || m != VantHoff {
			t.Errorf("%q: %v %v", name, m, err)
		}
	}
	if _, err := ParseOsmoticModel("magic"); err == nil {
		t.Error("magic accepted")
	}
	if o, err := ParseOrientation("orientation", ""); err != nil || o != transport.ALFS {
		t.Errorf("default orientation %v %v", o, err)
	}
}
