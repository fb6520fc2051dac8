package httpapi

import (
	"net/http"
	"slices"
	"strings"
	"testing"
)

// badInputCase is one named bad request and the error it must get: the
// status and the exact field the error object names ("" where the body as
// a whole is at fault and no field can be named, e.g. malformed JSON).
type badInputCase struct {
	name        string
	method      string // default POST
	path        string
	contentType string // default application/json
	body        string
	status      int
	field       string
	limit       any   // checked when not nil
	limitHas    []any // the limit is a list holding at least these
}

// fluxWith returns the base flux request with one substring replaced; it
// fails loudly if the substring is missing, so a case cannot silently test
// the valid request.
func fluxWith(old, new string) string {
	if !strings.Contains(fluxBase, old) {
		panic("fluxWith: " + old + " not in the base request")
	}
	return strings.Replace(fluxBase, old, new, 1)
}

func osmoticWith(old, new string) string {
	if !strings.Contains(osmoticNaCl, old) {
		panic("osmoticWith: " + old + " not in the base request")
	}
	return strings.Replace(osmoticNaCl, old, new, 1)
}

// units are the contract's concentration units; the engine may accept more.
var units = []any{"mol/kg", "mol/L", "g/L", "g/kg", "wt%"}

func badInputCases() []badInputCase {
	const osm, fx, sc = "/v1/osmotic", "/v1/flux", "/v1/screen"
	return []badInputCase{
		// Malformed JSON.
		{name: "truncated JSON", path: osm, body: `{"solute":`, status: 400, field: ""},
		{name: "trailing data", path: osm, body: osmoticNaCl + ` x`, status: 400, field: ""},
		{name: "empty body", path: osm, body: ``, status: 400, field: ""},
		{name: "NaN literal", path: osm, body: osmoticWith(`"concentration":1`, `"concentration":NaN`), status: 400, field: ""},
		{name: "Infinity literal", path: fx, body: fluxWith(`"s_um":500`, `"s_um":Infinity`), status: 400, field: ""},
		{name: "top-level array", path: osm, body: `[1,2]`, status: 400, field: ""},
		{name: "top-level string", path: osm, body: `"NaCl"`, status: 400, field: ""},
		{name: "deeply nested arrays", path: osm, body: `{"solute":` + strings.Repeat("[", 100000) + strings.Repeat("]", 100000) + `}`, status: 400, field: ""},
		{name: "deeply nested objects", path: fx, body: `{"membrane":` + strings.Repeat(`{"a":`, 20000) + "1" + strings.Repeat("}", 20000) + `}`, status: 400, field: "membrane.a"}, // refused at its first unknown key,
		// Wrong types.
		{name: "concentration as string", path: osm, body: osmoticWith(`"concentration":1`, `"concentration":"1"`), status: 400, field: "concentration"},
		{name: "solute as number", path: osm, body: osmoticWith(`"solute":"NaCl"`, `"solute":7`), status: 400, field: "solute"},
		{name: "temperature as bool", path: osm, body: osmoticWith(`"temperature_c":25`, `"temperature_c":true`), status: 400, field: "temperature_c"},
		{name: "b_lmh as bool", path: fx, body: fluxWith(`"b_lmh":0.3`, `"b_lmh":true`), status: 400, field: "membrane.b_lmh"},
		{name: "draw as string", path: fx, body: fluxWith(`"draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"}`, `"draw":"NaCl"`), status: 400, field: "draw"},
		{name: "candidates as string", path: sc, body: `{"candidates":"NaCl"}`, status: 400, field: "candidates"},
		// Missing fields.
		{name: "missing solute", path: osm, body: `{"concentration":1,"unit":"mol/kg"}`, status: 400, field: "solute"},
		{name: "null body", path: osm, body: `null`, status: 400, field: ""}, // refused as null, not read as an empty request,
		{name: "missing concentration", path: osm, body: `{"solute":"NaCl","unit":"mol/kg"}`, status: 400, field: "concentration"},
		{name: "missing unit", path: osm, body: `{"solute":"NaCl","concentration":1}`, status: 400, field: "unit", limitHas: units},
		{name: "missing membrane", path: fx, body: fluxWith(`"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500},`, ``), status: 400, field: "membrane"},
		{name: "missing draw", path: fx, body: fluxWith(`"draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"},`, ``), status: 400, field: "draw"},
		// Negative, NaN-producing and huge numbers.
		{name: "negative concentration", path: osm, body: osmoticWith(`"concentration":1`, `"concentration":-0.5`), status: 400, field: "concentration", limit: "0–100000"},
		{name: "huge concentration", path: osm, body: osmoticWith(`"concentration":1`, `"concentration":1e300`), status: 400, field: "concentration"},
		{name: "overflowing concentration", path: osm, body: osmoticWith(`"concentration":1`, `"concentration":1e999`), status: 400, field: "concentration"},
		{name: "past solubility", path: osm, body: osmoticWith(`"concentration":1`, `"concentration":50`), status: 400, field: "concentration"},
		{name: "temperature below range", path: osm, body: osmoticWith(`"temperature_c":25`, `"temperature_c":-10`), status: 400, field: "temperature_c", limit: "0–100 °C"},
		{name: "huge temperature", path: osm, body: osmoticWith(`"temperature_c":25`, `"temperature_c":1e9`), status: 400, field: "temperature_c", limit: "0–100 °C"},
		{name: "negative A", path: fx, body: fluxWith(`"a_lmh_per_bar":1`, `"a_lmh_per_bar":-1`), status: 400, field: "membrane.a_lmh_per_bar", limit: "0.001–100 LMH/bar"},
		{name: "huge S", path: fx, body: fluxWith(`"s_um":500`, `"s_um":1e12`), status: 400, field: "membrane.s_um", limit: "1–100000 µm"},
		{name: "negative feed concentration", path: fx, body: fluxWith(`"concentration":0,`, `"concentration":-3,`), status: 400, field: "feed.concentration", limit: "0–100000"},
		{name: "zero k_draw", path: fx, body: fluxWith(`"k_draw_m_per_s":5e-5`, `"k_draw_m_per_s":0`), status: 400, field: "k_draw_m_per_s"},
		{name: "huge delta_p", path: fx, body: fluxWith(`"temperature_c":25`, `"temperature_c":25,"delta_p_bar":1e300`), status: 400, field: "delta_p_bar"},
		{name: "negative diffusivity", path: fx, body: fluxWith(`"temperature_c":25`, `"temperature_c":25,"diffusivity_m2_per_s":-1e-9`), status: 400, field: "diffusivity_m2_per_s"},
		{name: "draw past solubility", path: fx, body: fluxWith(`"concentration":1,"unit":"mol/L"`, `"concentration":1e6,"unit":"mol/L"`), status: 400, field: "draw.concentration"},
		// Unknown names.
		{name: "unknown solute", path: osm, body: osmoticWith(`"NaCl"`, `"unobtainium"`), status: 400, field: "solute"},
		{name: "unknown draw solute", path: fx, body: fluxWith(`"draw":{"solute":"NaCl"`, `"draw":{"solute":"Kryptonite"`), status: 400, field: "draw.solute"},
		{name: "unknown unit", path: osm, body: osmoticWith(`"mol/kg"`, `"furlongs"`), status: 400, field: "unit", limitHas: units},
		{name: "unknown draw unit", path: fx, body: fluxWith(`"concentration":1,"unit":"mol/L"`, `"concentration":1,"unit":"mol/gallon"`), status: 400, field: "draw.unit", limitHas: units},
		{name: "unknown orientation", path: fx, body: fluxWith(`"AL-FS"`, `"sideways"`), status: 400, field: "orientation", limit: []any{"AL-FS", "AL-DS"}},
		{name: "unknown membrane preset", path: fx, body: fluxWith(`{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500}`, `{"preset":"no-such-membrane"}`), status: 400, field: "membrane.preset"},
		{name: "unknown osmotic model", path: fx, body: fluxWith(`"temperature_c":25`, `"temperature_c":25,"osmotic_model":"magic"`), status: 400, field: "osmotic_model", limit: []any{"real", "van-t-hoff"}},
		// Strict decoding: unknown fields, named by their full path.
		{name: "unknown top-level field", path: osm, body: osmoticWith(`"temperature_c":25`, `"temperature_c":25,"bogus":1`), status: 400, field: "bogus"},
		{name: "unknown nested field", path: fx, body: fluxWith(`"s_um":500`, `"s_um":500,"s_mm":0.5`), status: 400, field: "membrane.s_mm"},
		{name: "unknown screen field", path: sc, body: `{"no_such":1}`, status: 400, field: "no_such"},
		// Transport.
		{name: "oversized body", path: osm, body: `{"solute":"` + strings.Repeat("a", DefaultMaxBodyBytes) + `"}`, status: 413, field: "body", limit: float64(DefaultMaxBodyBytes)},
		{name: "text/plain body", path: osm, contentType: "text/plain", body: osmoticNaCl, status: 415, field: "Content-Type", limit: "application/json"},
		{name: "form body", path: fx, contentType: "application/x-www-form-urlencoded", body: "a=1", status: 415, field: "Content-Type", limit: "application/json"},
		{name: "GET on a POST endpoint", method: http.MethodGet, path: osm, status: 405, field: "method", limit: "POST"},
		{name: "POST on a GET endpoint", path: "/v1/health", body: `{}`, status: 405, field: "method", limit: "GET"},
		{name: "unknown endpoint", path: "/v1/osmosis", body: osmoticNaCl, status: 404, field: "path"},
	}
}

// TestBadInput: each named bad request gets the contract's error object
// with the status, the exact field and (where given) the limit.
func TestBadInput(t *testing.T) {
	h := New(Options{})
	cases := badInputCases()
	if len(cases) < 30 {
		t.Fatalf("only %d bad-input cases", len(cases))
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			method, ct := tc.method, tc.contentType
			if method == "" {
				method = http.MethodPost
			}
			if ct == "" {
				ct = "application/json"
			}
			e := mustError(t, do(h, method, tc.path, ct, strings.NewReader(tc.body)), tc.status, tc.field)
			if tc.limit != nil && !equalJSON(e.Error.Limit, tc.limit) {
				t.Errorf("limit %#v, want %#v", e.Error.Limit, tc.limit)
			}
			if tc.limitHas != nil {
				list, _ := e.Error.Limit.([]any)
				for _, want := range tc.limitHas {
					if !slices.Contains(list, want) {
						t.Errorf("limit %#v lacks %v", e.Error.Limit, want)
					}
				}
			}
		})
	}
}

func equalJSON(a, b any) bool {
	as, aok := a.([]any)
	bs, bok := b.([]any)
	if aok != bok {
		return false
	}
	if !aok {
		return a == b
	}
	if len(as) != len(bs) {
		return false
	}
	for i := range as {
		if as[i] != bs[i] {
			return false
		}
	}
	return true
}
