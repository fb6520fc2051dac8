package api

import (
	"math"
	"strings"
	"testing"

	"drawsift/engine/thermo"
	"drawsift/engine/water"
)

// Membranes respond to temperature. The presets' A and B were measured at
// 20 °C (Coday et al. 2013, the records' test conditions); at 45 °C A
// follows water's viscosity (η_w from IAPWS 2008, engine/water) and B
// Stokes–Einstein, and the flux response says so. Water permeation
// through thin-film composite membranes tracks water's viscosity: the
// non-viscous share of its activation energy is 3.9–6.4 kJ/mol (Sharma,
// Agrawal & Chellam 2003, J. Membr. Sci. 223:69), so the default rule's
// apparent activation energy must lie within that of the viscous part,
// i.e. equal water's own (about 16–17 kJ/mol near 30 °C, from the
// viscosity correlation). A custom membrane with no reference temperature
// is left as given, an activation energy replaces the default rule, and
// out-of-range values name the field.
func TestMembraneTemperature(t *testing.T) {
	body := func(extra string) string {
		return `{"membrane":{"preset":"tfc-standard"` + extra + `},"orientation":"AL-FS","temperature_c":45,
			"draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"}}`
	}
	b, e := dispatch(t, OpFlux, body(""))
	if e != nil {
		t.Fatal(e)
	}
	mem := b["membrane"].(map[string]any)
	tr, tk := 293.15, 318.15
	fa := water.Viscosity(tr) / water.Viscosity(tk)
	fb := tk / tr * fa
	if got := num(t, mem, "a_lmh_per_bar"); math.Abs(got-1.63*fa) > 1e-9 {
		t.Errorf("A at 45 °C %.6g LMH/bar, want 1.63 × %.6g", got, fa)
	}
	if got := num(t, mem, "b_lmh"); math.Abs(got-0.2988*fb) > 1e-9 {
		t.Errorf("B at 45 °C %.6g LMH, want 0.2988 × %.6g", got, fb)
	}
	if num(t, mem, "reference_temperature_c") != 20 || !strings.Contains(mem["temperature_rule"].(string), "measured at 20 °C, carried to 45 °C") {
		t.Errorf("membrane report %v", mem)
	}
	// The rule's apparent activation energy, −R·d ln A/d(1/T), over 15–45 °C.
	ea := -thermo.GasConstant * math.Log(water.Viscosity(288.15)/water.Viscosity(318.15)) / (1/318.15 - 1/288.15)
	if !(ea > 14e3 && ea < 19e3) {
		t.Errorf("apparent activation energy of A by the viscosity rule %.1f kJ/mol", ea/1e3)
	}
	// At the reference temperature nothing changes.
	b20, e := dispatch(t, OpFlux, strings.Replace(body(""), `"temperature_c":45`, `"temperature_c":20`, 1))
	if e != nil {
		t.Fatal(e)
	}
	if m := b20["membrane"].(map[string]any); math.Abs(num(t, m, "a_lmh_per_bar")-1.63) > 1e-12 || num(t, m, "a_temperature_factor") != 1 {
		t.Errorf("at 20 °C: %v", m)
	}
	// An activation energy replaces the rule: Arrhenius.
	ba, e := dispatch(t, OpFlux, body(`,"b_activation_energy_kj_per_mol":30`))
	if e != nil {
		t.Fatal(e)
	}
	want := 0.2988 * math.Exp(-30e3/thermo.GasConstant*(1/tk-1/tr))
	if got := num(t, ba["membrane"].(map[string]any), "b_lmh"); math.Abs(got-want) > 1e-9 {
		t.Errorf("B with 30 kJ/mol %.6g, want %.6g", got, want)
	}
	// A custom membrane without a reference temperature is taken as given.
	bc, e := dispatch(t, OpFlux, `{"membrane":{"a_lmh_per_bar":2,"b_lmh":0.3,"s_um":500},"orientation":"AL-FS","temperature_c":45,
		"draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"}}`)
	if e != nil {
		t.Fatal(e)
	}
	if m := bc["membrane"].(map[string]any); math.Abs(num(t, m, "a_lmh_per_bar")-2) > 1e-12 || m["reference_temperature_c"] != nil {
		t.Errorf("custom membrane at 45 °C: %v", m)
	}
	for _, c := range []struct{ extra, field string }{
		{`,"reference_temperature_c":150`, "membrane.reference_temperature_c"},
		{`,"a_activation_energy_kj_per_mol":-5`, "membrane.a_activation_energy_kj_per_mol"},
		{`,"b_activation_energy_kj_per_mol":500`, "membrane.b_activation_energy_kj_per_mol"},
	} {
		if _, e := dispatch(t, OpFlux, body(c.extra)); e == nil || e.Field != c.field || e.Limit == nil {
			t.Errorf("%s: %+v, want an error on %s with its limit", c.extra, e, c.field)
		}
	}
	// The screen reports the rule among its model choices.
	s, e := dispatch(t, OpScreen, `{"temperature_c":45,"candidates":["NaCl"]}`)
	if e != nil {
		t.Fatal(e)
	}
	if mc := s["model_choices"].(map[string]any); !strings.Contains(mc["membrane_temperature"].(string), "carried to 45 °C") {
		t.Errorf("model choices: %v", mc["membrane_temperature"])
	}
}
