package api

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"testing"
)

func dispatch(t *testing.T, op, body string) (map[string]any, *Error) {
	t.Helper()
	out, e := Dispatch(context.Background(), op, []byte(body))
	var m map[string]any
	if err := json.Unmarshal(out, &m); err != nil {
		t.Fatalf("%s %s: response is not JSON: %v\n%s", op, body, err, out)
	}
	if e != nil {
		if _, ok := m["error"]; !ok {
			t.Fatalf("error response without the error object: %s", out)
		}
	}
	return m, e
}

func TestOsmoticContract(t *testing.T) {
	m, e := dispatch(t, OpOsmotic, `{"solute":"nacl","concentration":1,"unit":"mol/kg","temperature_c":25}`)
	if e != nil {
		t.Fatal(e)
	}
	for _, k := range []string{"osmotic_pressure_bar", "van_t_hoff_bar", "osmotic_coefficient", "water_activity",
		"molality_mol_per_kg", "molarity_mol_per_l", "density_kg_per_m3", "viscosity_mpa_s", "warnings", "sources"} {
		if _, ok := m[k]; !ok {
			t.Errorf("osmotic response lacks %q", k)
		}
	}
	// φ(NaCl, 1 mol/kg, 25 °C) = 0.9355 (Robinson & Stokes 1959, from
	// memory; Pitzer–Mayorga parameters give 0.936).
	if phi := m["osmotic_coefficient"].(float64); math.Abs(phi-0.9355) > 0.003 {
		t.Errorf("φ = %v", phi)
	}
	if m["solute"] != "NaCl" {
		t.Errorf("solute echoed as %v, want the library ID", m["solute"])
	}
}

func TestOsmoticErrors(t *testing.T) {
	for _, tc := range []struct {
		name, body, field string
	}{
		{"unknown solute", `{"solute":"unobtainium","concentration":1,"unit":"mol/L"}`, "solute"},
		{"missing solute", `{"concentration":1,"unit":"mol/L"}`, "solute"},
		{"missing concentration", `{"solute":"NaCl","unit":"mol/L"}`, "concentration"},
		{"negative", `{"solute":"NaCl","concentration":-0.1,"unit":"mol/L"}`, "concentration"},
		{"huge", `{"solute":"NaCl","concentration":1e300,"unit":"mol/L"}`, "concentration"},
		{"overflow", `{"solute":"NaCl","concentration":1e999,"unit":"mol/L"}`, "concentration"},
		{"unknown unit", `{"solute":"NaCl","concentration":1,"unit":"furlongs"}`, "unit"},
		{"missing unit", `{"solute":"NaCl","concentration":1}`, "unit"},
		{"beyond solubility", `{"solute":"NaCl","concentration":7,"unit":"mol/kg"}`, "concentration"},
		{"too hot", `{"solute":"NaCl","concentration":1,"unit":"mol/kg","temperature_c":150}`, "temperature_c"},
		{"wrong type", `{"solute":"NaCl","concentration":"one","unit":"mol/kg"}`, "concentration"},
		{"unknown field", `{"solute":"NaCl","concentration":1,"unit":"mol/kg","colour":"blue"}`, "colour"},
	} {
		_, e := dispatch(t, OpOsmotic, tc.body)
		if e == nil || e.Field != tc.field || e.Kind != KindInvalid {
			t.Errorf("%s: got %+v, want an invalid error on %q", tc.name, e, tc.field)
		}
	}
	// Beyond solubility: the limit is given in the request's unit.
	_, e := dispatch(t, OpOsmotic, `{"solute":"NaCl","concentration":30,"unit":"wt%"}`)
	if e == nil || fmt.Sprint(e.Limit) != "26.46 wt%" {
		t.Errorf("30 wt%% NaCl: %+v, want limit 26.46 wt%%", e)
	}
	for _, body := range []string{``, `{`, `[]`, `{"solute":"NaCl"} {}`, `null`} {
		_, e := dispatch(t, OpOsmotic, body)
		if e == nil || e.Kind != KindInvalid {
			t.Errorf("malformed %q accepted: %+v", body, e)
		}
	}
}

// No response may carry NaN or Inf: JSON cannot encode them, so a
// successful Marshal is the check; every library solute is run near its
// solubility at the ends of the temperature range, with allow_extrapolation
// (past the model's data the result is computed and flagged) and without
// it (then a concentration past the data is refused, naming the field and
// the limit).
func TestOsmoticEverySoluteFinite(t *testing.T) {
	resp, _ := Solutes()
	for _, s := range resp.Solutes {
		for _, tC := range []float64{0, 25, 100} {
			for _, frac := range []float64{0, 0.5, 0.999} {
				for _, allow := range []bool{true, false} {
					b, e := dispatch(t, OpOsmotic, fmt.Sprintf(`{"solute":%q,"concentration":%g,"unit":"mol/kg","temperature_c":%g,"allow_extrapolation":%v}`,
						s.ID, frac*soluteTop(s.ID, tC), tC, allow))
					if e != nil {
						if allow || e.Field != "concentration" || e.Kind != KindInvalid || e.Limit == nil {
							t.Errorf("%s %g °C allow_extrapolation=%v: %v", s.ID, tC, allow, e)
						}
						continue
					}
					if w, ok := b["warnings"]; !ok || w == nil {
						t.Errorf("%s: warnings must be a list, even empty", s.ID)
					}
				}
			}
		}
	}
}

// soluteTop is the solubility (or 10 mol/kg for a miscible solute).
func soluteTop(id string, tC float64) float64 {
	c := 1e9
	r, e := Osmotic(&OsmoticRequest{Solute: id, Concentration: &c, Unit: "mol/kg", TemperatureC: &tC})
	if r != nil || e == nil || e.Limit == nil {
		return 10
	}
	var v float64
	fmt.Sscanf(fmt.Sprint(e.Limit), "%g", &v)
	return v
}

func TestUnknownOperation(t *testing.T) {
	_, e := dispatch(t, "transmogrify", `{}`)
	if e == nil || e.Kind != KindNotFound {
		t.Errorf("unknown op: %+v", e)
	}
	m, e := dispatch(t, OpHealth, ``)
	if e != nil || m["engine_version"] != EngineVersion {
		t.Errorf("health: %v %v", m, e)
	}
}

func ExampleDispatch() {
	out, e := Dispatch(context.Background(), OpOsmotic,
		[]byte(`{"solute":"MgCl2","concentration":1,"unit":"mol/L","temperature_c":25}`))
	if e != nil {
		fmt.Println("error:", e)
		return
	}
	var r OsmoticResponse
	if err := json.Unmarshal(out, &r); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("π = %.3g bar (van 't Hoff %.3g bar), φ = %.3g\n", r.OsmoticPressureBar, r.VantHoffBar, r.OsmoticCoefficient)
	fmt.Println(strings.Join(r.Warnings, "; ") == "")
	// Output:
	// π = 84.9 bar (van 't Hoff 74.4 bar), φ = 1.12
	// true
}

func TestPresets(t *testing.T) {
	m, e := dispatch(t, OpPresets, ``)
	if e != nil {
		t.Fatal(e)
	}
	ms, fs := m["membranes"].([]any), m["feeds"].([]any)
	if len(ms) < 3 || len(fs) < 5 {
		t.Errorf("presets: %d membranes, %d feeds", len(ms), len(fs))
	}
	for _, x := range append(ms, fs...) {
		if src, ok := x.(map[string]any)["sources"].(map[string]any); !ok || len(src) == 0 {
			t.Errorf("preset without sources: %v", x.(map[string]any)["id"])
		}
	}
}

// DispatchProgress reports a robustness run's progress and stops when the
// context is cancelled.
func TestDispatchProgress(t *testing.T) {
	body := []byte(`{"candidates":["NaCl","KCl","MgCl2"],"uncertainty":{"samples":200},"seed":3}`)
	var last, total int
	if _, e := DispatchProgress(context.Background(), OpScreen, body, func(d, n int) { last, total = d, n }); e != nil {
		t.Fatal(e)
	}
	if total == 0 || last != total {
		t.Errorf("progress ended at %d of %d", last, total)
	}
	ctx, cancel := context.WithCancel(context.Background())
	_, e := DispatchProgress(ctx, OpScreen, body, func(d, n int) {
		if d > 10 {
			cancel()
		}
	})
	if e == nil {
		t.Error("a cancelled screen returned no error")
	}
}

// The usual cautions travel with every osmotic and flux answer, as with
// every screen (common practice for screening tools touching drinking
// water and chemicals).
func TestCautionsEverywhere(t *testing.T) {
	for _, c := range []struct{ op, body string }{
		{OpOsmotic, `{"solute":"NaCl","concentration":1,"unit":"mol/L"}`},
		{OpFlux, `{"membrane":{"preset":"tfc-standard"},"orientation":"AL-FS","draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"}}`},
	} {
		b, e := dispatch(t, c.op, c.body)
		if e != nil {
			t.Fatal(e)
		}
		cs, _ := b["cautions"].([]any)
		if len(cs) != len(ScreenCautions) || !strings.Contains(fmt.Sprint(cs), "safety data sheet") {
			t.Errorf("%s: cautions %v", c.op, b["cautions"])
		}
	}
}

// Units of the trade beside the engine's own (M, mM, mmol/L, mg/L,
// mOsm/kg: SI prefixes, exact), and a misspelled solute gets a
// suggestion; "m" alone (molal in some texts, ambiguous) is refused.
func TestUnitSymbolsAndSuggestions(t *testing.T) {
	base, e := dispatch(t, OpOsmotic, `{"solute":"NaCl","concentration":0.5,"unit":"mol/L"}`)
	if e != nil {
		t.Fatal(e)
	}
	for _, c := range []struct {
		v    float64
		unit string
	}{{0.5, "M"}, {500, "mM"}, {500, "mmol/L"}, {500 * 58.44, "mg/L"}} {
		b, e := dispatch(t, OpOsmotic, fmt.Sprintf(`{"solute":"NaCl","concentration":%g,"unit":%q}`, c.v, c.unit))
		if e != nil {
			t.Fatalf("%g %s: %+v", c.v, c.unit, e)
		}
		want := num(t, base, "osmotic_pressure_bar")
		if c.unit == "mg/L" {
			want = num(t, dispatchOK(t, OpOsmotic, fmt.Sprintf(`{"solute":"NaCl","concentration":%g,"unit":"g/L"}`, c.v/1000)), "osmotic_pressure_bar")
		}
		if got := num(t, b, "osmotic_pressure_bar"); math.Abs(got-want) > 1e-9*want {
			t.Errorf("%g %s: π %g bar, want %g", c.v, c.unit, got, want)
		}
	}
	osm := dispatchOK(t, OpOsmotic, `{"solute":"NaCl","concentration":900,"unit":"mOsm/kg"}`)
	if got := num(t, osm, "osmolality_osmol_per_kg"); math.Abs(got-0.9) > 1e-9 {
		t.Errorf("900 mOsm/kg: osmolality %g osmol/kg", got)
	}
	if _, e := dispatch(t, OpOsmotic, `{"solute":"NaCl","concentration":1,"unit":"m"}`); e == nil || e.Field != "unit" {
		t.Errorf(`unit "m": %+v, want refused`, e)
	}
	_, e = dispatch(t, OpOsmotic, `{"solute":"NaCI","concentration":1,"unit":"M"}`)
	if e == nil || e.Field != "solute" || !strings.Contains(e.Message, `did you mean "NaCl"`) {
		t.Errorf("NaCI: %+v", e)
	}
	if _, e = dispatch(t, OpOsmotic, `{"solute":"unobtainium","concentration":1,"unit":"M"}`); e == nil || strings.Contains(e.Message, "did you mean") {
		t.Errorf("a name far from every solute: %+v", e)
	}
}

func dispatchOK(t *testing.T, op, body string) map[string]any {
	t.Helper()
	b, e := dispatch(t, op, body)
	if e != nil {
		t.Fatalf("%s %s: %+v", op, body, e)
	}
	return b
}
