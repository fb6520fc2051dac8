package httpapi

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"net/http/httptest"
	"strconv"
	"strings"
	"testing"
)

// Fuzz targets for request decoding and validation, one per endpoint plus
// the transport. Each checks, for any input: no panic and no 500; a body
// that is one JSON value whose numbers are all finite (no NaN or Inf can
// hide as an overflowing literal); every rejection is the contract's error
// object. Seed corpora live in testdata/fuzz/<FuzzName>.
//
//	go test -run '^$' -fuzz '^FuzzFlux$' -fuzztime 20s ./engine/api/httpapi/

// checkAnswer applies the invariants to one answer.
func checkAnswer(t *testing.T, status int, body []byte) {
	t.Helper()
	switch status {
	case http.StatusOK, http.StatusBadRequest, http.StatusNotFound, http.StatusMethodNotAllowed,
		http.StatusRequestEntityTooLarge, http.StatusUnsupportedMediaType, http.StatusNoContent:
	default:
		t.Fatalf("status %d: %s", status, body)
	}
	if status == http.StatusNoContent {
		return
	}
	dec := json.NewDecoder(bytes.NewReader(body))
	dec.UseNumber()
	var v any
	if err := dec.Decode(&v); err != nil {
		t.Fatalf("answer is not JSON (%v): %s", err, body)
	}
	if err := allFinite(v); err != nil {
		t.Fatalf("%v in %s", err, body)
	}
	if status == http.StatusOK {
		if items, ok := v.([]any); ok { // a batch: each item {ok, result}
			for i, it := range items {
				m, ok := it.(map[string]any)
				res, has := m["result"].(map[string]any)
				if !ok || !has {
					t.Fatalf("batch item %d is not {ok, result}: %s", i, body)
				}
				if m["ok"] != true {
					if e, ok := res["error"].(map[string]any); !ok || e["message"] == "" {
						t.Fatalf("batch item %d failed without the contract's error object: %s", i, body)
					}
				}
			}
			return
		}
		if _, ok := v.(map[string]any); !ok {
			t.Fatalf("200 answer is not an object: %s", body)
		}
		return
	}
	var e errorReply
	strict := json.NewDecoder(bytes.NewReader(body))
	strict.DisallowUnknownFields()
	if err := strict.Decode(&e); err != nil || e.Error == nil || e.Error.Message == "" {
		t.Fatalf("status %d without the contract's error object (%v): %s", status, err, body)
	}
}

// allFinite reports a number that does not parse to a finite float64.
func allFinite(v any) error {
	switch v := v.(type) {
	case json.Number:
		f, err := strconv.ParseFloat(string(v), 64)
		if err != nil || math.IsNaN(f) || math.IsInf(f, 0) {
			return fmt.Errorf("non-finite number %s", v)
		}
	case map[string]any:
		for _, x := range v {
			if err := allFinite(x); err != nil {
				return err
			}
		}
	case []any:
		for _, x := range v {
			if err := allFinite(x); err != nil {
				return err
			}
		}
	}
	return nil
}

func fuzzPost(f *testing.F, path string, seeds ...string) {
	for _, s := range seeds {
		f.Add([]byte(s))
	}
	h := New(Options{})
	f.Fuzz(func(t *testing.T, body []byte) {
		rec := do(h, http.MethodPost, path, "application/json", bytes.NewReader(body))
		checkAnswer(t, rec.Code, rec.Body.Bytes())
	})
}

func FuzzOsmotic(f *testing.F) {
	fuzzPost(f, "/v1/osmotic", osmoticNaCl,
		`{"solute":"seawater","concentration":35,"unit":"g/kg","temperature_c":10}`,
		`{"solute":"MgCl2","concentration":20,"unit":"wt%"}`,
		`{"solute":"sucrose","concentration":300,"unit":"g/L"}`,
		`{"solute":"NaCl","concentration":-1e-300,"unit":"mol/L"}`)
}

func FuzzFlux(f *testing.F) {
	fuzzPost(f, "/v1/flux", fluxBase,
		`{"membrane":{"preset":"tfc-standard"},"orientation":"AL-DS","draw":{"solute":"MgCl2","concentration":2,"unit":"mol/kg"},"feed":{"solute":"seawater","concentration":35,"unit":"g/kg"},"delta_p_bar":10}`,
		`{"membrane":{"a_lmh_per_bar":3,"b_lmh":0,"s_um":300},"orientation":"AL-FS","draw":{"solute":"NaCl","concentration":3,"unit":"mol/L"},"external_cp":false,"osmotic_model":"van-t-hoff"}`,
		`{"membrane":{"a_lmh_per_bar":1,"b_nacl_lmh":0.2,"s_um":600},"orientation":"AL-FS","draw":{"solute":"Na2SO4","concentration":1,"unit":"mol/L"},"channel":{"height_mm":1,"width_mm":20,"length_mm":100,"crossflow_velocity_m_per_s":0.1,"spacer":true}}`)
}

func FuzzScreen(f *testing.F) {
	fuzzPost(f, "/v1/screen",
		`{"feed":{"solute":"seawater","concentration":35,"unit":"g/kg"},"membrane":{"a_lmh_per_bar":2,"b_lmh":0.4,"s_um":400},"orientation":"AL-FS","temperature_c":25,"candidates":["NaCl","MgCl2","Na2SO4"],"basis":{"kind":"osmotic-pressure","value":60,"unit":"bar"}}`,
		`{"feed":{"solute":"NaCl","concentration":0.1,"unit":"mol/L"},"membrane":{"preset":"tfc-standard"},"candidates":["KCl"],"basis":{"kind":"water-flux","value":10,"unit":"LMH"}}`,
		`{"candidates":["NaCl"],"basis":{"kind":"concentration","value":1,"unit":"mol/L"}}`,
		`{"no_such_field":1}`)
}

// FuzzBatch: a batch answers every item or refuses the whole with the
// contract's error; no item's failure escapes as a 500.
func FuzzBatch(f *testing.F) {
	fuzzPost(f, "/v1/batch",
		`[{"op":"osmotic","body":`+osmoticNaCl+`},{"op":"flux","body":`+fluxBase+`}]`,
		`[{"op":"screen","body":{}},{"op":"osmotic","body":{"solute":"NaCl","concentration":-1,"unit":"mol/kg"}}]`,
		`[]`,
		`[{"op":"osmotic"}]`,
		`{"op":"osmotic"}`)
}

// FuzzFluxFields builds well-formed flux requests from fuzzed values, to
// reach the range checks and the solver behind the decoder.
func FuzzFluxFields(f *testing.F) {
	f.Add(1.0, 0.3, 500.0, 1.0, 0.0, 25.0, 5e-5, 0.0, "NaCl", "mol/L", "AL-FS")
	f.Add(2.0, 0.0, 300.0, 4.0, 35.0, 40.0, 1e-5, 20.0, "MgCl2", "mol/kg", "AL-DS")
	f.Add(1e-3, 100.0, 1e5, 0.0, 0.0, 0.0, 1.0, -1000.0, "sucrose", "g/L", "AL-FS")
	h := New(Options{})
	f.Fuzz(func(t *testing.T, a, b, s, cDraw, cFeed, temp, k, dp float64, solute, unit, orientation string) {
		body := fmt.Sprintf(`{"membrane":{"a_lmh_per_bar":%s,"b_lmh":%s,"s_um":%s},"orientation":%s,`+
			`"draw":{"solute":%s,"concentration":%s,"unit":%s},"feed":{"solute":"NaCl","concentration":%s,"unit":"g/L"},`+
			`"temperature_c":%s,"k_draw_m_per_s":%s,"k_feed_m_per_s":%s,"delta_p_bar":%s}`,
			jnum(a), jnum(b), jnum(s), jstr(orientation), jstr(solute), jnum(cDraw), jstr(unit), jnum(cFeed),
			jnum(temp), jnum(k), jnum(k), jnum(dp))
		rec := do(h, http.MethodPost, "/v1/flux", "application/json", strings.NewReader(body))
		checkAnswer(t, rec.Code, rec.Body.Bytes())
	})
}

// FuzzModuleFields builds well-formed module requests from fuzzed values
// (concentrations, flows, area or target, flow arrangement, pressure
// drops, regeneration parameters), to reach the module's range checks and
// solvers behind the decoder: every answer is a finite 200 or the
// contract's error.
func FuzzModuleFields(f *testing.F) {
	f.Add(1.0, 35.0, 40.0, 80.0, 2.0, 0.0, 0.0, "counter", "AL-FS", 0.8, 0.995, 3.0)
	f.Add(2.0, 5.0, 10.0, 10.0, 0.0, 0.5, 0.01, "co", "AL-DS", 1.0, 0.5, 30.0)
	f.Add(0.5, 70.0, 1e-3, 1e6, 1e5, 0.0, 0.0, "counter", "AL-FS", 0.1, 0.0, 0.1)
	f.Add(3.0, 0.0, 40.0, 40.0, 0.0, 0.99, 0.0, "co", "AL-FS", 2.0, 1.0, -1.0)
	h := New(Options{})
	f.Fuzz(func(t *testing.T, cDraw, sal, qd, qf, area, rec, drop float64, flow, orientation string, pump, rej, gor float64) {
		size := fmt.Sprintf(`"area_m2":%s`, jnum(area))
		if rec != 0 {
			size = fmt.Sprintf(`"target":{"recovery":%s}`, jnum(rec))
		}
		body := fmt.Sprintf(`{"membrane":{"preset":"tfc-standard"},"orientation":%s,"flow":%s,`+
			`"draw":{"solute":"NaCl","concentration":%s,"unit":"mol/L","flow_l_per_h":%s},`+
			`"feed":{"preset":"seawater","concentration":%s,"flow_l_per_h":%s},%s,"draw_pressure_drop_bar_per_m2":%s,"profile_points":5,`+
			`"regeneration":{"pump_efficiency":%s,"ro_rejection":%s,"md_gained_output_ratio":%s}}`,
			jstr(orientation), jstr(flow), jnum(cDraw), jnum(qd), jnum(sal), jnum(qf), size, jnum(drop), jnum(pump), jnum(rej), jnum(gor))
		rec0 := do(h, http.MethodPost, "/v1/module", "application/json", strings.NewReader(body))
		checkAnswer(t, rec0.Code, rec0.Body.Bytes())
	})
}

// FuzzSystemFields builds well-formed screens on the system basis from
// fuzzed values (the draws' π, recovery, product, flow ratio and prices)
// for two candidates against seawater: every answer is a finite 200 or
// the contract's error.
func FuzzSystemFields(f *testing.F) {
	f.Add(52.0, 0.3, 100.0, 1.0, 0.1, 30.0, 5.0, "counter")
	f.Add(80.0, 0.6, 1e7, 20.0, 0.0, 0.0, 50.0, "co")
	f.Add(30.0, 0.95, 1e-3, 0.05, 10.0, 1e4, 0.1, "counter")
	f.Add(-1.0, 0.0, 0.0, 0.0, -1.0, -1.0, 0.0, "sideways")
	h := New(Options{})
	f.Fuzz(func(t *testing.T, pi, rec, product, ratio, elec, mem, life float64, flow string) {
		body := fmt.Sprintf(`{"feed":{"preset":"seawater"},"candidates":["NaCl","MgCl2"],"basis":{"kind":"system","value":%s,"unit":"bar"},`+
			`"system":{"recovery":%s,"product_m3_per_day":%s,"draw_to_feed_flow_ratio":%s,"flow":%s,"prices":{"electricity_usd_per_kwh":%s,"membrane_usd_per_m2":%s,"membrane_life_years":%s}}}`,
			jnum(pi), jnum(rec), jnum(product), jnum(ratio), jstr(flow), jnum(elec), jnum(mem), jnum(life))
		rec0 := do(h, http.MethodPost, "/v1/screen", "application/json", strings.NewReader(body))
		checkAnswer(t, rec0.Code, rec0.Body.Bytes())
	})
}

// FuzzOsmoticFields builds well-formed osmotic requests from fuzzed values.
func FuzzOsmoticFields(f *testing.F) {
	f.Add("NaCl", 1.0, "mol/kg", 25.0)
	f.Add("seawater", 70.0, "g/kg", 60.0)
	f.Add("(NH4)2SO4", 40.0, "wt%", 100.0)
	h := New(Options{})
	f.Fuzz(func(t *testing.T, solute string, c float64, unit string, temp float64) {
		body := fmt.Sprintf(`{"solute":%s,"concentration":%s,"unit":%s,"temperature_c":%s}`, jstr(solute), jnum(c), jstr(unit), jnum(temp))
		rec := do(h, http.MethodPost, "/v1/osmotic", "application/json", strings.NewReader(body))
		checkAnswer(t, rec.Code, rec.Body.Bytes())
	})
}

// FuzzTransport fuzzes the method, path and Content-Type.
func FuzzTransport(f *testing.F) {
	f.Add("POST", "/v1/osmotic", "application/json", []byte(osmoticNaCl))
	f.Add("GET", "/v1/health", "", []byte(nil))
	f.Add("OPTIONS", "/v1/flux", "text/plain; charset=utf-8", []byte("{}"))
	f.Add("PATCH", "/v1/solutes?x=1", "application/json; charset=\"utf-8\"", []byte("[]"))
	h := New(Options{CORSOrigins: []string{"https://lab.example"}})
	f.Fuzz(func(t *testing.T, method, path, ct string, body []byte) {
		req, err := http.NewRequest(method, "http://drawsift.test"+path, bytes.NewReader(body))
		if err != nil || req.URL.Path == "" {
			return // not a request a server could receive
		}
		req.Header.Set("Content-Type", ct)
		req.Header.Set("Origin", "https://lab.example")
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		checkAnswer(t, rec.Code, rec.Body.Bytes())
	})
}

// jnum writes a float as a JSON number; NaN and ±Inf, which JSON cannot
// carry, are written as the bare words a careless client might send.
func jnum(x float64) string {
	return strconv.FormatFloat(x, 'g', -1, 64)
}

func jstr(s string) string {
	b, _ := json.Marshal(s)
	return string(b)
}

// FuzzRobustnessMerge: any body to the merge — whole parts, parts of
// other runs, counts edited — is merged or refused with the contract's
// error, never a 500 or a non-finite figure. The seeds are the two parts
// of a small split run (and the same with a count made negative).
func FuzzRobustnessMerge(f *testing.F) {
	h := New(Options{})
	part := func(i int) string {
		body := fmt.Sprintf(`{"candidates":["NaCl","KCl"],"uncertainty":{"samples":20,"shard":{"index":%d,"count":2}}}`, i)
		rec := do(h, http.MethodPost, "/v1/screen", "application/json", strings.NewReader(body))
		if rec.Code != http.StatusOK {
			f.Fatalf("part %d: %d %s", i, rec.Code, rec.Body)
		}
		return rec.Body.String()
	}
	p0, p1 := part(0), part(1)
	fuzzPost(f, "/v1/robustness-merge",
		`{"parts":[`+p0+`,`+p1+`]}`,
		`{"parts":[`+p1+`,`+strings.Replace(p0, `"rank_counts":[`, `"rank_counts":[-5,`, 1)+`]}`,
		`{"parts":[]}`, `{"parts":[{}]}`)
}
