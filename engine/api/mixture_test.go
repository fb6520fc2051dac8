package api

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// A mixture in the osmotic contract: the ion-level fields follow from the
// parts exactly (ionic strength ½Σmz², each ion's molality, electroneutral),
// the components echo the parts, and the mixed-electrolyte π lies close to
// the Zdanovskii–Stokes–Robinson estimate from the two salts alone
// (computed here through the API: the binary molalities at the mixture's
// water activity). For common-anion mixtures of this kind the two
// treatments agree within about 1–2 % (engine/thermo's published-data
// checks measured 0.35 % RMS for CaCl2–MgCl2, Robinson & Bower 1966).
func TestOsmoticMixture(t *testing.T) {
	b, e := dispatch(t, OpOsmotic, `{"mixture":[{"solute":"NaCl","concentration":1,"unit":"mol/kg"},{"solute":"MgCl2","concentration":0.5,"unit":"mol/kg"}]}`)
	if e != nil {
		t.Fatal(e)
	}
	if b["model"] != "pitzer-mixture" {
		t.Errorf("model %v, want pitzer-mixture", b["model"])
	}
	if got := num(t, b, "ionic_strength_mol_per_kg"); math.Abs(got-2.5) > 1e-12 {
		t.Errorf("ionic strength %g, want ½(1 + 2·4·0.5/2·… ) = 2.5", got)
	}
	want := map[string]float64{"Na+": 1, "Mg+2": 0.5, "Cl-": 2}
	charge := 0.0
	for _, v := range b["ions"].([]any) {
		ion := v.(map[string]any)
		sym := ion["ion"].(string)
		m := num(t, ion, "molality_mol_per_kg")
		charge += m * num(t, ion, "charge")
		if w, ok := want[sym]; !ok || math.Abs(m-w) > 1e-12 {
			t.Errorf("ion %s at %g mol/kg, want %g", sym, m, w)
		}
		if g, ok := ion["activity_coefficient"].(float64); !ok || !(g > 0 && g < 1) {
			t.Errorf("ion %s: γ %v, want in (0, 1) at I = 2.5", sym, ion["activity_coefficient"])
		}
	}
	if math.Abs(charge) > 1e-12 {
		t.Errorf("ions carry net charge %g", charge)
	}
	comps := b["components"].([]any)
	if len(comps) != 2 || comps[0].(map[string]any)["solute"] != "NaCl" || math.Abs(num(t, comps[1].(map[string]any), "molality_mol_per_kg")-0.5) > 1e-12 {
		t.Errorf("components %v", comps)
	}
	// ZSR: Σ m_k/m°_k(a_w) = 1, with m°_k the binary molality at the
	// mixture's water activity (from the osmolality, osmol/kg).
	om := num(t, b, "osmolality_osmol_per_kg")
	zsr := 0.0
	for _, p := range []struct {
		id string
		m  float64
	}{{"NaCl", 1}, {"MgCl2", 0.5}} {
		r, e := dispatch(t, OpOsmotic, fmt.Sprintf(`{"solute":%q,"concentration":%g,"unit":"osmol/kg"}`, p.id, om))
		if e != nil {
			t.Fatal(e)
		}
		zsr += p.m / num(t, r, "molality_mol_per_kg")
	}
	if math.Abs(zsr-1) > 0.02 {
		t.Errorf("ZSR sum at the mixture's water activity = %.4f, want 1 within 2 %%", zsr)
	}
	t.Logf("NaCl 1 + MgCl2 0.5 mol/kg: π %.2f bar, ZSR sum %.4f", num(t, b, "osmotic_pressure_bar"), zsr)
}

// Per-litre parts keep their molarities: the mole ratio is that of the
// molarities and the total converts with the blend's density.
func TestOsmoticMixturePerLitre(t *testing.T) {
	b, e := dispatch(t, OpOsmotic, `{"mixture":[{"solute":"NaCl","concentration":0.6,"unit":"mol/L"},{"solute":"KCl","concentration":29.82,"unit":"g/L"}]}`)
	if e != nil {
		t.Fatal(e)
	}
	comps := b["components"].([]any)
	lib, _ := Solutes()
	mKCl := 0.0
	for _, s := range lib.Solutes {
		if s.ID == "KCl" {
			mKCl = s.MolarMassGPerMol
		}
	}
	for k, want := range []float64{0.6, 29.82 / mKCl} {
		if got := num(t, comps[k].(map[string]any), "molarity_mol_per_l"); math.Abs(got/want-1) > 1e-9 {
			t.Errorf("part %d: %g mol/L, want %g", k, got, want)
		}
	}
}

// Bad mixtures get the contract's error naming the field and the limit.
func TestOsmoticMixtureBadInput(t *testing.T) {
	for _, c := range []struct{ body, field string }{
		{`{"mixture":[{"solute":"NaCl","concentration":1,"unit":"mol/kg"},{"solute":"KCl","concentration":1,"unit":"mol/L"}]}`, "mixture[1].unit"},
		{`{"mixture":[{"solute":"NaCl","concentration":1,"unit":"mol/kg"},{"solute":"sodium chloride","concentration":1,"unit":"mol/kg"}]}`, "mixture[1].solute"},
		{`{"mixture":[{"solute":"NaCl","concentration":0,"unit":"mol/kg"},{"solute":"KCl","concentration":1,"unit":"mol/kg"}]}`, "mixture[0].concentration"},
		{`{"mixture":[{"solute":"NaCl","concentration":-1,"unit":"mol/kg"},{"solute":"KCl","concentration":1,"unit":"mol/kg"}]}`, "mixture[0].concentration"},
		{`{"mixture":[{"solute":"seawater","concentration":35,"unit":"g/kg"},{"solute":"KCl","concentration":1,"unit":"mol/kg"}]}`, "mixture[0].solute"},
		{`{"mixture":[{"solute":"unobtainium","concentration":1,"unit":"mol/kg"},{"solute":"KCl","concentration":1,"unit":"mol/kg"}]}`, "mixture[0].solute"},
		{`{"mixture":[{"solute":"NaCl","concentration":1,"unit":"osmol/kg"},{"solute":"KCl","concentration":1,"unit":"osmol/kg"}]}`, "mixture[0].unit"},
		{`{"solute":"NaCl","concentration":1,"unit":"mol/kg","mixture":[{"solute":"KCl","concentration":1,"unit":"mol/kg"}]}`, "mixture"},
		{`{"mixture":[{"solute":"NaCl","concentration":60,"unit":"wt%"},{"solute":"KCl","concentration":50,"unit":"wt%"}]}`, "mixture"},
		// Halite saturates in 2 mol/kg MgCl2 far below NaCl's own 6.1 mol/kg.
		{`{"mixture":[{"solute":"NaCl","concentration":5,"unit":"mol/kg"},{"solute":"MgCl2","concentration":2,"unit":"mol/kg"}]}`, "mixture[0].concentration"},
	} {
		_, e := dispatch(t, OpOsmotic, c.body)
		if e == nil || e.Kind != KindInvalid || e.Field != c.field {
			t.Errorf("%s: %+v, want an invalid-input error on %s", c.body, e, c.field)
			continue
		}
		if e.Limit == nil && !strings.Contains(c.field, "solute") && c.field != "mixture" {
			t.Errorf("%s: no limit in %+v", c.body, e)
		}
	}
}

// Seawater by composition holds up to halite saturation. Published
// evaporation of seawater saturates halite at about 10–11× concentration
// (McCaffrey, Lazar & Holland 1987); at constant composition that is a
// salinity S with S/(1000 − S) = f·35.165/964.8, 260–290 g/kg for
// f = 10–11.3 — the limit the osmotic operation gives past it.
func TestSeawaterToHalite(t *testing.T) {
	b, e := dispatch(t, OpOsmotic, `{"solute":"seawater","concentration":250,"unit":"g/kg"}`)
	if e != nil {
		t.Fatal(e)
	}
	if b["model"] != "pitzer-mixture" || !(num(t, b, "osmotic_pressure_bar") > 300) {
		t.Errorf("250 g/kg brine: model %v, π %v", b["model"], b["osmotic_pressure_bar"])
	}
	si := b["saturation_indices"].(map[string]any)
	if g, ok := si["gypsum"].(float64); !ok || !(g > 0) {
		t.Errorf("gypsum SI at 250 g/kg %v: want supersaturated (past 3–4× seawater)", si["gypsum"])
	}
	_, e = dispatch(t, OpOsmotic, `{"solute":"seawater","concentration":350,"unit":"g/kg"}`)
	if e == nil || e.Field != "concentration" {
		t.Fatalf("350 g/kg seawater: %+v, want refused", e)
	}
	var lim float64
	if _, err := fmt.Sscanf(fmt.Sprint(e.Limit), "%g g/kg", &lim); err != nil || lim < 260 || lim > 290 {
		t.Errorf("halite limit %v, want 260–290 g/kg", e.Limit)
	}
	sw, e := dispatch(t, OpOsmotic, `{"solute":"seawater","concentration":35,"unit":"g/kg"}`)
	if e != nil {
		t.Fatal(e)
	}
	if g := sw["saturation_indices"].(map[string]any)["gypsum"].(float64); !(g < -0.3) {
		t.Errorf("plain seawater gypsum SI %g, want well below saturation", g)
	}
	if ph, ok := sw["ph"].(float64); !ok || ph != 8.1 {
		t.Errorf("seawater pH %v, want the preset's 8.1", sw["ph"])
	}
}

// Flux with a blended draw and a mixture feed.
func TestFluxMixtures(t *testing.T) {
	b, e := dispatch(t, OpFlux, `{"membrane":{"preset":"tfc-standard"},"orientation":"AL-FS",
		"draw":{"mixture":[{"solute":"NaCl","concentration":1.5,"unit":"mol/L"},{"solute":"MgCl2","concentration":0.2,"unit":"mol/L"}]},
		"feed":{"mixture":[{"solute":"NaCl","concentration":0.1,"unit":"mol/L"},{"solute":"CaCl2","concentration":0.01,"unit":"mol/L"}]}}`)
	if e != nil {
		t.Fatal(e)
	}
	if jw := num(t, b, "water_flux_lmh"); !(jw > 0) {
		t.Errorf("water flux %g LMH, want positive", jw)
	}
	_, e = dispatch(t, OpFlux, `{"membrane":{"preset":"tfc-standard"},"orientation":"AL-FS",
		"draw":{"mixture":[{"solute":"NaCl","concentration":1,"unit":"mol/L"},{"solute":"NaCl","concentration":1,"unit":"mol/L"}]}}`)
	if e == nil || e.Field != "draw.mixture[1].solute" {
		t.Errorf("duplicate part: %+v, want draw.mixture[1].solute", e)
	}
}

// Blends rank like any candidate; bad blends are refused naming the field.
func TestScreenBlends(t *testing.T) {
	b, e := dispatch(t, OpScreen, `{"feed":{"preset":"seawater"},"candidates":["NaCl","MgCl2",
		{"id":"NaCl+MgCl2 9:1","blend":[{"solute":"NaCl","mole_fraction":0.9},{"solute":"MgCl2","mole_fraction":0.1}]},
		{"blend":[{"solute":"KCl","mass_fraction":0.5},{"solute":"NaCl","mass_fraction":0.5}]}]}`)
	if e != nil {
		t.Fatal(e)
	}
	ids := map[string]bool{}
	for _, c := range b["candidates"].([]any) {
		ids[c.(map[string]any)["solute"].(string)] = true
	}
	if !ids["NaCl+MgCl2 9:1"] || len(ids) != 4 {
		t.Errorf("ranked %v, want NaCl, MgCl2 and both blends", ids)
	}
	fs := b["feed_saturation_indices"].(map[string]any)
	if g, ok := fs["gypsum"].(float64); !ok || !(g < 0) {
		t.Errorf("bulk seawater gypsum SI %v, want below saturation", fs["gypsum"])
	}
	for _, c := range []struct{ body, field string }{
		{`{"candidates":[{"id":"x","blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"KCl","mole_fraction":0.4}]}]}`, "candidates[0].blend"},
		{`{"candidates":[{"id":"x","blend":[{"solute":"NaCl","mole_fraction":1}]}]}`, "candidates[0].blend"},
		{`{"candidates":[{"id":"NaCl","blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"KCl","mole_fraction":0.5}]}]}`, "candidates[0].id"},
		{`{"candidates":[{"id":"x","blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"KCl","mass_fraction":0.5}]}]}`, "candidates[0].blend[1]"},
		{`{"candidates":[{"id":"x","blend":[{"solute":"NaCl","mole_fraction":1.5},{"solute":"KCl","mole_fraction":-0.5}]}]}`, "candidates[0].blend[0].mole_fraction"},
	} {
		_, e := dispatch(t, OpScreen, c.body)
		if e == nil || e.Kind != KindInvalid || e.Field != c.field {
			t.Errorf("%s: %+v, want an invalid-input error on %s", c.body, e, c.field)
		}
	}
}

// A custom feed given by its ions takes its π from them; ion lists are
// checked for known ions, their charges and electroneutrality.
func TestFeedByIons(t *testing.T) {
	ions := `[{"symbol":"Na+","charge":1,"molar_mass_g_per_mol":22.99,"mg_per_l":2299},{"symbol":"Cl-","charge":-1,"molar_mass_g_per_mol":35.45,"mg_per_l":3545}]`
	b, e := dispatch(t, OpScreen, `{"candidates":["NaCl"],"feed":{"ions":`+ions+`}}`)
	if e != nil {
		t.Fatal(e)
	}
	// 0.1 mol/L NaCl as ions against NaCl's own record at 0.1 mol/L: the
	// mixture's single-salt limit is the salt's own model.
	r, e := dispatch(t, OpOsmotic, `{"solute":"NaCl","concentration":0.1,"unit":"mol/L"}`)
	if e != nil {
		t.Fatal(e)
	}
	if got, want := num(t, b, "feed_osmotic_pressure_bar"), num(t, r, "osmotic_pressure_bar"); math.Abs(got/want-1) > 2e-3 {
		t.Errorf("feed of 0.1 mol/L Na⁺ and Cl⁻: π %.5g bar, NaCl at 0.1 mol/L %.5g bar", got, want)
	}
	for _, c := range []struct{ ions, field string }{
		{`[{"symbol":"Na+","charge":1,"molar_mass_g_per_mol":22.99,"mg_per_l":2299},{"symbol":"Cl-","charge":-1,"molar_mass_g_per_mol":35.45,"mg_per_l":1000}]`, "feed.ions"},
		{`[{"symbol":"Xx+","charge":1,"molar_mass_g_per_mol":22.99,"mg_per_l":2299},{"symbol":"Cl-","charge":-1,"molar_mass_g_per_mol":35.45,"mg_per_l":3545}]`, "feed.ions[0].symbol"},
		{`[{"symbol":"Na+","charge":2,"molar_mass_g_per_mol":22.99,"mg_per_l":2299},{"symbol":"Cl-","charge":-1,"molar_mass_g_per_mol":35.45,"mg_per_l":7090}]`, "feed.ions[0].charge"},
		{`[{"symbol":"Na+","charge":1,"molar_mass_g_per_mol":22.99,"mg_per_l":-5},{"symbol":"Cl-","charge":-1,"molar_mass_g_per_mol":35.45,"mg_per_l":3545}]`, "feed.ions[0].mg_per_l"},
	} {
		_, e := dispatch(t, OpScreen, `{"candidates":["NaCl"],"feed":{"ions":`+c.ions+`}}`)
		if e == nil || e.Kind != KindInvalid || e.Field != c.field {
			t.Errorf("%s: %+v, want an invalid-input error on %s", c.ions, e, c.field)
		}
	}
}

// A blend at a total concentration is the mixture of its parts at their
// shares of it: by mole, x_k·c of each part in mol/L; by mass, w_k·c of
// each in g/L (the definition of the fractions; common practice). The
// blend's π equals the mixture's to rounding, in the osmotic operation and
// as a flux draw; bad blends name the field.
func TestOsmoticBlendAtTotal(t *testing.T) {
	for _, c := range []struct{ blend, mixture string }{
		{`"blend":[{"solute":"NaCl","mole_fraction":0.9},{"solute":"MgCl2","mole_fraction":0.1}],"concentration":1.2,"unit":"mol/L"`,
			`"mixture":[{"solute":"NaCl","concentration":1.08,"unit":"mol/L"},{"solute":"MgCl2","concentration":0.12,"unit":"mol/L"}]`},
		{`"blend":[{"solute":"KCl","mass_fraction":0.25},{"solute":"NaCl","mass_fraction":0.75}],"concentration":80,"unit":"g/L"`,
			`"mixture":[{"solute":"KCl","concentration":20,"unit":"g/L"},{"solute":"NaCl","concentration":60,"unit":"g/L"}]`},
	} {
		b, e := dispatch(t, OpOsmotic, "{"+c.blend+"}")
		if e != nil {
			t.Fatalf("%s: %+v", c.blend, e)
		}
		m, e := dispatch(t, OpOsmotic, "{"+c.mixture+"}")
		if e != nil {
			t.Fatal(e)
		}
		for _, k := range []string{"osmotic_pressure_bar", "water_activity", "molality_mol_per_kg", "ionic_strength_mol_per_kg", "density_kg_per_m3"} {
			if g, w := num(t, b, k), num(t, m, k); math.Abs(g-w) > 1e-9*math.Abs(w) {
				t.Errorf("%s: blend %s = %.12g, mixture %.12g", c.blend, k, g, w)
			}
		}
		f, e := dispatch(t, OpFlux, `{"membrane":{"preset":"tfc-standard"},"orientation":"AL-FS","draw":{`+c.blend+`}}`)
		if e != nil {
			t.Fatal(e)
		}
		fm, e := dispatch(t, OpFlux, `{"membrane":{"preset":"tfc-standard"},"orientation":"AL-FS","draw":{`+c.mixture+`}}`)
		if e != nil {
			t.Fatal(e)
		}
		if g, w := num(t, f, "water_flux_lmh"), num(t, fm, "water_flux_lmh"); math.Abs(g-w) > 1e-9*w {
			t.Errorf("flux of the blend draw %.12g LMH, of the mixture %.12g", g, w)
		}
	}
	named, e := dispatch(t, OpOsmotic, `{"id":"my blend","blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"KCl","mole_fraction":0.5}],"concentration":1,"unit":"mol/kg"}`)
	if e != nil || named["solute"] != "my blend" {
		t.Errorf("named blend: %v %+v", named["solute"], e)
	}
	for _, c := range []struct{ body, field string }{
		{`{"blend":[{"solute":"NaCl","mole_fraction":0.9},{"solute":"MgCl2","mole_fraction":0.2}],"concentration":1,"unit":"mol/L"}`, "blend"},
		{`{"blend":[{"solute":"NaCl","mole_fraction":1}],"concentration":1,"unit":"mol/L"}`, "blend"},
		{`{"blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"nope","mole_fraction":0.5}],"concentration":1,"unit":"mol/L"}`, "blend[1].solute"},
		{`{"solute":"NaCl","blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"KCl","mole_fraction":0.5}],"concentration":1,"unit":"mol/L"}`, "blend"},
		{`{"blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"KCl","mole_fraction":0.5}],"mixture":[{"solute":"KCl","concentration":1,"unit":"mol/kg"}]}`, "mixture"},
		{`{"blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"KCl","mole_fraction":0.5}],"concentration":-1,"unit":"mol/L"}`, "concentration"},
	} {
		_, e := dispatch(t, OpOsmotic, c.body)
		if e == nil || e.Kind != KindInvalid || e.Field != c.field {
			t.Errorf("%s: %+v, want an invalid-input error on %s", c.body, e, c.field)
		}
	}
	if _, e := dispatch(t, OpFlux, `{"membrane":{"preset":"tfc-standard"},"orientation":"AL-FS","draw":{"blend":[{"solute":"NaCl","mole_fraction":0.5},{"solute":"KCl","mole_fraction":0.6}],"concentration":1,"unit":"mol/L"}}`); e == nil || e.Field != "draw.blend" {
		t.Errorf("flux draw blend summing to 1.1: %+v, want draw.blend", e)
	}
}
