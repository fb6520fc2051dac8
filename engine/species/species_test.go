package species

import (
	"math"
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/transport"
)

func lookup(t *testing.T, id string) *library.Solute {
	t.Helper()
	lib, err := library.Default()
	if err != nil {
		t.Fatal(err)
	}
	s, ok := lib.Lookup(id)
	if !ok {
		t.Fatalf("no %s", id)
	}
	return s
}

// A salt's ions add up to its formula mass exactly (the ion table's
// masses are rounded atomic weights, IUPAC standard atomic weights,
// common practice), and a blend's species are its parts' scaled by their
// mole fractions.
func TestUnits(t *testing.T) {
	for _, id := range []string{"NaCl", "MgCl2", "Na2SO4", "NH4HCO3", "CH3COONa"} {
		s := lookup(t, id)
		var m float64
		for _, u := range unitsOf(s, false) {
			m += u.perUnit * u.massKg * 1000
		}
		if math.Abs(m-s.MolarMassGPerMol) > 1e-12*s.MolarMassGPerMol {
			t.Errorf("%s: ions add up to %.12g g/mol, record %.12g", id, m, s.MolarMassGPerMol)
		}
	}
	b, err := library.NewBlend("b", []*library.Solute{lookup(t, "NaCl"), lookup(t, "MgCl2"), lookup(t, "glucose")}, []float64{0.5, 0.25, 0.25})
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]float64{}
	for _, u := range unitsOf(b, false) {
		got[u.name] = u.perUnit
	}
	want := map[string]float64{"Na+": 0.5, "Mg+2": 0.25, "Cl-": 1.0, "glucose": 0.25}
	for k, v := range want {
		if math.Abs(got[k]-v) > 1e-15 {
			t.Errorf("blend species %s: %g per unit, want %g (all: %v)", k, got[k], v, got)
		}
	}
}

// Layout of a NaCl draw against a feed of MgCl2: Cl⁻ is one species of
// role both (the draw's B), Mg²⁺ the feed's alone; the losses of a
// single solute are its reverse flux times its molar mass.
func TestLayoutAndLosses(t *testing.T) {
	perm := &Permeability{B: library.SoluteB{NaCl: 1e-7}, Known: true}
	nacl, mgcl2 := lookup(t, "NaCl"), lookup(t, "MgCl2")
	lay, err := NewTransport(perm, TransportSide{Solute: nacl, Nu: 2}, TransportSide{Solute: mgcl2, CMolPerM3: 100, Nu: 3})
	if err != nil {
		t.Fatal(err)
	}
	roles := map[string]string{}
	for _, in := range lay.Info {
		roles[in.Name] = in.Role
	}
	if len(lay.Info) != 3 || roles["Na+"] != RoleDraw || roles["Cl-"] != RoleBoth || roles["Mg+2"] != RoleFeed {
		t.Fatalf("layout %+v", lay.Info)
	}
	if lay.Info[1].FeedMolPerM3 != 200 || lay.Info[1].BMPerS != 1e-7 || lay.Info[2].BOrigin != library.BEstimated {
		t.Errorf("Cl⁻ feed %g mol/m³, B %g; Mg²⁺ origin %s", lay.Info[1].FeedMolPerM3, lay.Info[1].BMPerS, lay.Info[2].BOrigin)
	}
	// Alone against pure water: net loss = the ions' reverse flux × mass.
	alone, _ := NewTransport(perm, TransportSide{Solute: nacl, Nu: 2}, TransportSide{})
	vh := func(c float64) (float64, float64) { return 2 * 2479 * c, 2 * 2479 }
	in := transport.Input{AMPerSPa: 1e-12, SM: 5e-4, KDrawMPerS: math.Inf(1), KFeedMPerS: math.Inf(1), FacePi: alone.Rule.Pi,
		Species: make([]transport.Species, alone.N())}
	alone.Fill(in.Species, transport.ALFS, 1000, 1.5e-9, 1.5e-9, 1, vh, nil)
	r, err := transport.Solve(&in)
	if err != nil {
		t.Fatal(err)
	}
	l := alone.LossesAt(&in, &r, nacl.MolarMassGPerMol/1000)
	want := -r.Species[0].FluxMolPerM2S * nacl.MolarMassGPerMol / 1000
	if math.Abs(l.NetKgPerM2S-want) > 1e-12*want || !(l.GrossKgPerM2S >= l.NetKgPerM2S) || l.FeedGainKgPerM2S != 0 {
		t.Errorf("losses %+v, want net %g", l, want)
	}
}
