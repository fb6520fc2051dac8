package httpapi

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"net/http"
	"net/http/httptest"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"testing"

	"drawsift/engine/api"
)

// errorReply is the contract's error object, decoded strictly.
type errorReply struct {
	Error *struct {
		Field     string `json:"field"`
		Message   string `json:"message"`
		Limit     any    `json:"limit"`
		RequestID string `json:"request_id"`
	} `json:"error"`
}

// do sends one request to h and returns the recorder.
func do(h http.Handler, method, path, contentType string, body io.Reader, hdr ...string) *httptest.ResponseRecorder {
	req := httptest.NewRequest(method, path, body)
	if contentType != "" {
		req.Header.Set("Content-Type", contentType)
	}
	for i := 0; i+1 < len(hdr); i += 2 {
		req.Header.Set(hdr[i], hdr[i+1])
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec
}

func post(h http.Handler, path, body string) *httptest.ResponseRecorder {
	return do(h, http.MethodPost, path, "application/json", strings.NewReader(body))
}

// mustError checks that rec is the contract's error object with the
// status and field given, and returns it.
func mustError(t *testing.T, rec *httptest.ResponseRecorder, status int, field string) errorReply {
	t.Helper()
	if rec.Code != status {
		t.Fatalf("status %d, want %d; body %s", rec.Code, status, rec.Body)
	}
	if ct := rec.Header().Get("Content-Type"); ct != "application/json" {
		t.Errorf("Content-Type %q, want application/json", ct)
	}
	var e errorReply
	dec := json.NewDecoder(bytes.NewReader(rec.Body.Bytes()))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&e); err != nil || e.Error == nil {
		t.Fatalf("body is not the contract's error object (%v): %s", err, rec.Body)
	}
	if e.Error.Field != field {
		t.Errorf("field %q, want %q (message %q)", e.Error.Field, field, e.Error.Message)
	}
	if strings.TrimSpace(e.Error.Message) == "" {
		t.Errorf("empty message")
	}
	if rec.Header().Get(RequestIDHeader) == "" {
		t.Errorf("no %s header", RequestIDHeader)
	}
	return e
}

// okJSON checks a 200 answer and decodes it.
func okJSON(t *testing.T, rec *httptest.ResponseRecorder) map[string]any {
	t.Helper()
	if rec.Code != http.StatusOK {
		t.Fatalf("status %d, want 200; body %s", rec.Code, rec.Body)
	}
	if ct := rec.Header().Get("Content-Type"); ct != "application/json" {
		t.Errorf("Content-Type %q, want application/json", ct)
	}
	var m map[string]any
	if err := json.Unmarshal(rec.Body.Bytes(), &m); err != nil {
		t.Fatalf("body is not a JSON object: %v\n%s", err, rec.Body)
	}
	return m
}

func num(t *testing.T, m map[string]any, key string) float64 {
	t.Helper()
	v, ok := m[key].(float64)
	if !ok {
		t.Fatalf("%s missing or not a number: %v", key, m[key])
	}
	return v
}

const (
	osmoticNaCl = `{"solute":"NaCl","concentration":1,"unit":"mol/kg","temperature_c":25}`
	fluxBase    = `{"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500},"orientation":"AL-FS",
		"draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"},
		"feed":{"solute":"NaCl","concentration":0,"unit":"mol/L"},
		"temperature_c":25,"k_draw_m_per_s":5e-5,"k_feed_m_per_s":5e-5}`
)

func TestHealth(t *testing.T) {
	m := okJSON(t, do(New(Options{}), http.MethodGet, "/v1/health", "", nil))
	if m["status"] != "ok" || m["engine_version"] != api.EngineVersion {
		t.Errorf("health = %v, want status ok and engine_version %s", m, api.EngineVersion)
	}
}

func TestPresets(t *testing.T) {
	m := okJSON(t, do(New(Options{}), http.MethodGet, "/v1/presets", "", nil))
	if ms, ok := m["membranes"].([]any); !ok || len(ms) == 0 {
		t.Errorf("presets: no membranes in %v", m)
	}
	if fs, ok := m["feeds"].([]any); !ok || len(fs) == 0 {
		t.Errorf("presets: no feeds in %v", m)
	}
}

func TestSolutes(t *testing.T) {
	m := okJSON(t, do(New(Options{}), http.MethodGet, "/v1/solutes", "", nil))
	list, ok := m["solutes"].([]any)
	if !ok || len(list) < 5 {
		t.Fatalf("solutes: want the library (≥ 5 records), got %v", m["solutes"])
	}
	var ids []string
	for _, s := range list {
		rec, _ := s.(map[string]any)
		ids = append(ids, rec["id"].(string))
		if src, ok := rec["sources"].(map[string]any); !ok || len(src) == 0 {
			t.Errorf("solute %v has no sources", rec["id"])
		}
	}
	if !strings.Contains(strings.Join(ids, " "), "NaCl") {
		t.Errorf("NaCl missing from %v", ids)
	}
}

func TestOsmotic(t *testing.T) {
	m := okJSON(t, post(New(Options{}), "/v1/osmotic", osmoticNaCl))
	// 1 mol/kg NaCl at 25 °C: φ = 0.936 (Robinson & Stokes 1959, Electrolyte
	// Solutions, appendix 8.10; value from memory), so π ≈ 46 bar. The
	// engine's own tests check the figures against their sources; here the
	// transport must carry them intact.
	if phi := num(t, m, "osmotic_coefficient"); math.Abs(phi-0.936) > 0.005 {
		t.Errorf("osmotic_coefficient = %g, want 0.936 ± 0.005", phi)
	}
	if p := num(t, m, "osmotic_pressure_bar"); p < 40 || p > 50 {
		t.Errorf("osmotic_pressure_bar = %g, want about 46", p)
	}
}

func TestFlux(t *testing.T) {
	m := okJSON(t, post(New(Options{}), "/v1/flux", fluxBase))
	jw := num(t, m, "water_flux_lmh")
	// Bounded by A·π_draw = 1 LMH/bar × ≈47 bar; ICP in a 500 µm support
	// cuts it well below that (common practice).
	if !(jw > 0 && jw < 47) {
		t.Errorf("water_flux_lmh = %g, want within (0, 47)", jw)
	}
	if num(t, m, "reverse_solute_flux_gmh") <= 0 {
		t.Errorf("reverse_solute_flux_gmh should be positive")
	}
}

// TestScreenRejectsUnknownField: strict decoding on the screen endpoint.
// (Its successful answers are the screen engine's tests; here the route and
// the error path are checked.)
func TestScreenRejectsUnknownField(t *testing.T) {
	mustError(t, post(New(Options{}), "/v1/screen", `{"no_such_field":1}`), http.StatusBadRequest, "no_such_field")
}

func TestNotFound(t *testing.T) {
	h := New(Options{})
	for _, p := range []string{"/", "/v1", "/v1/", "/v1/healthz", "/v2/health", "/v1/osmotic/extra"} {
		e := mustError(t, do(h, http.MethodGet, p, "", nil), http.StatusNotFound, "path")
		if !strings.Contains(e.Error.Message, "/v1/osmotic") {
			t.Errorf("%s: message should list the endpoints: %q", p, e.Error.Message)
		}
	}
}

func TestMethodNotAllowed(t *testing.T) {
	h := New(Options{})
	for _, tc := range []struct{ method, path, allow string }{
		{http.MethodGet, "/v1/osmotic", "POST"},
		{http.MethodPut, "/v1/flux", "POST"},
		{http.MethodDelete, "/v1/screen", "POST"},
		{http.MethodPost, "/v1/health", "GET"},
		{http.MethodPost, "/v1/solutes", "GET"},
		{http.MethodOptions, "/v1/osmotic", "POST"}, // CORS off: no preflight
	} {
		rec := do(h, tc.method, tc.path, "application/json", strings.NewReader("{}"))
		e := mustError(t, rec, http.StatusMethodNotAllowed, "method")
		if got := rec.Header().Get("Allow"); got != tc.allow {
			t.Errorf("%s %s: Allow %q, want %q", tc.method, tc.path, got, tc.allow)
		}
		if e.Error.Limit != tc.allow {
			t.Errorf("%s %s: limit %v, want %q", tc.method, tc.path, e.Error.Limit, tc.allow)
		}
	}
}

func TestUnsupportedMediaType(t *testing.T) {
	h := New(Options{})
	for _, ct := range []string{"", "text/plain", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x",
		"application/json; charset=latin1", "application/json; =bad", "application/xml"} {
		rec := do(h, http.MethodPost, "/v1/osmotic", ct, strings.NewReader(osmoticNaCl))
		e := mustError(t, rec, http.StatusUnsupportedMediaType, "Content-Type")
		if e.Error.Limit != "application/json" {
			t.Errorf("%q: limit %v", ct, e.Error.Limit)
		}
	}
	for _, ct := range []string{"application/json", "application/json; charset=utf-8", "Application/JSON; charset=UTF-8", "application/vnd.drawsift+json"} {
		okJSON(t, do(h, http.MethodPost, "/v1/osmotic", ct, strings.NewReader(osmoticNaCl)))
	}
}

// lenDispatch answers with the length of the body it was given.
func lenDispatch(_ context.Context, _ string, body []byte) ([]byte, *api.Error) {
	return []byte(`{"bytes":` + strconv.Itoa(len(body)) + `}`), nil
}

func TestBodyCap(t *testing.T) {
	const limit = 1000
	h := New(Options{MaxBodyBytes: limit, dispatch: lenDispatch})
	// At the cap: accepted and passed on whole.
	m := okJSON(t, post(h, "/v1/osmotic", strings.Repeat(" ", limit)))
	if num(t, m, "bytes") != limit {
		t.Errorf("dispatch saw %v bytes, want %d", m["bytes"], limit)
	}
	// One byte over, with a Content-Length: refused before reading.
	e := mustError(t, post(h, "/v1/osmotic", strings.Repeat(" ", limit+1)), http.StatusRequestEntityTooLarge, "body")
	if e.Error.Limit != float64(limit) {
		t.Errorf("limit %v, want %d", e.Error.Limit, limit)
	}
	// Over, streamed without a Content-Length (chunked): refused after
	// reading limit+1 bytes.
	req := httptest.NewRequest(http.MethodPost, "/v1/flux", io.MultiReader(strings.NewReader(strings.Repeat(" ", 5*limit))))
	req.ContentLength = -1
	req.Header.Set("Content-Type", "application/json")
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	mustError(t, rec, http.StatusRequestEntityTooLarge, "body")
	// The default cap is 1 MiB.
	big := `{"solute":"` + strings.Repeat("a", DefaultMaxBodyBytes) + `"}`
	mustError(t, post(New(Options{}), "/v1/osmotic", big), http.StatusRequestEntityTooLarge, "body")
}

func TestPanicBecomes500(t *testing.T) {
	var logged bytes.Buffer
	var mu sync.Mutex
	h := New(Options{
		dispatch: func(context.Context, string, []byte) ([]byte, *api.Error) {
			panic("secret internal detail 0xdeadbeef")
		},
		Logf: func(f string, a ...any) {
			mu.Lock()
			defer mu.Unlock()
			logged.WriteString(strings.TrimSpace(fmt.Sprintf(f, a...)))
		},
	})
	rec := post(h, "/v1/osmotic", osmoticNaCl)
	e := mustError(t, rec, http.StatusInternalServerError, "")
	id := rec.Header().Get(RequestIDHeader)
	if e.Error.RequestID != id || !regexp.MustCompile(`^[0-9a-f]{24}$`).MatchString(id) {
		t.Errorf("request_id %q, header %q: want the same 24 hex digits", e.Error.RequestID, id)
	}
	if e.Error.Message != "internal error" || strings.Contains(rec.Body.String(), "deadbeef") || strings.Contains(rec.Body.String(), "goroutine") {
		t.Errorf("500 body leaks internals: %s", rec.Body)
	}
	if !strings.Contains(logged.String(), id) || !strings.Contains(logged.String(), "deadbeef") {
		t.Errorf("log should hold the request id and the panic: %q", logged.String())
	}
	// A client's own request id is used when it is plain.
	rec = do(h, http.MethodPost, "/v1/flux", "application/json", strings.NewReader("{}"), RequestIDHeader, "batch-7.scenario_12")
	if e := mustError(t, rec, http.StatusInternalServerError, ""); e.Error.RequestID != "batch-7.scenario_12" {
		t.Errorf("request_id %q, want the client's", e.Error.RequestID)
	}
	// ...and replaced when it is not.
	rec = do(h, http.MethodPost, "/v1/flux", "application/json", strings.NewReader("{}"), RequestIDHeader, "a b\x01<script>")
	if id := rec.Header().Get(RequestIDHeader); strings.ContainsAny(id, " <\x01") {
		t.Errorf("unsafe request id echoed: %q", id)
	}
}

// TestEngineInternalErrorBecomes500: an internal error reported by the
// engine (api.KindInternal) also answers 500 without its details.
func TestEngineInternalErrorBecomes500(t *testing.T) {
	h := New(Options{dispatch: func(context.Context, string, []byte) ([]byte, *api.Error) {
		return nil, &api.Error{Field: "draw", Message: "solver diverged at j=1e300", Kind: api.KindInternal}
	}})
	rec := post(h, "/v1/flux", fluxBase)
	e := mustError(t, rec, http.StatusInternalServerError, "")
	if strings.Contains(rec.Body.String(), "diverged") || e.Error.RequestID == "" {
		t.Errorf("500 body: %s", rec.Body)
	}
}

func TestStatusTable(t *testing.T) {
	for kind, want := range map[string]int{
		api.KindInvalid: 400, api.KindNotFound: 404, api.KindInternal: 500,
		kindMethod: 405, kindTooLarge: 413, kindMediaType: 415, "no-such-kind": 500,
	} {
		if got := status(kind); got != want {
			t.Errorf("status(%q) = %d, want %d", kind, got, want)
		}
	}
}

func TestCORS(t *testing.T) {
	// Off by default: no CORS headers even for a browser call.
	rec := do(New(Options{}), http.MethodGet, "/v1/health", "", nil, "Origin", "https://lab.example")
	if v := rec.Header().Get("Access-Control-Allow-Origin"); v != "" {
		t.Errorf("CORS off: Access-Control-Allow-Origin %q", v)
	}
	h := New(Options{CORSOrigins: []string{"https://lab.example/", " https://other.example"}})
	rec = do(h, http.MethodGet, "/v1/health", "", nil, "Origin", "https://lab.example")
	if v := rec.Header().Get("Access-Control-Allow-Origin"); v != "https://lab.example" {
		t.Errorf("allowed origin: Access-Control-Allow-Origin %q", v)
	}
	if v := rec.Header().Get("Vary"); v != "Origin" {
		t.Errorf("Vary %q, want Origin", v)
	}
	rec = do(h, http.MethodGet, "/v1/health", "", nil, "Origin", "https://evil.example")
	if v := rec.Header().Get("Access-Control-Allow-Origin"); v != "" {
		t.Errorf("other origin: Access-Control-Allow-Origin %q", v)
	}
	// Preflight.
	rec = do(h, http.MethodOptions, "/v1/screen", "", nil, "Origin", "https://other.example", "Access-Control-Request-Method", "POST")
	if rec.Code != http.StatusNoContent || rec.Header().Get("Access-Control-Allow-Methods") == "" ||
		!strings.Contains(rec.Header().Get("Access-Control-Allow-Headers"), "Content-Type") {
		t.Errorf("preflight: %d %v", rec.Code, rec.Header())
	}
	// Preflight for an unknown path is still a 404.
	mustError(t, do(h, http.MethodOptions, "/v1/nope", "", nil, "Origin", "https://other.example"), http.StatusNotFound, "path")
	// "*" allows any origin.
	rec = do(New(Options{CORSOrigins: []string{"*"}}), http.MethodGet, "/v1/health", "", nil, "Origin", "https://any.example")
	if v := rec.Header().Get("Access-Control-Allow-Origin"); v != "*" {
		t.Errorf("*: Access-Control-Allow-Origin %q", v)
	}
}

// TestConcurrentRequests: the handler holds no per-request state, so
// concurrent requests get the answers they would get alone (run with
// -race).
func TestConcurrentRequests(t *testing.T) {
	h := New(Options{})
	want := map[string]string{}
	bodies := map[string]string{
		"/v1/osmotic": osmoticNaCl,
		"/v1/flux":    fluxBase,
	}
	for p, b := range bodies {
		want[p] = post(h, p, b).Body.String()
	}
	var wg sync.WaitGroup
	errs := make(chan string, 64)
	for i := 0; i < 32; i++ {
		wg.Add(1)
		go func(i int) {
			defer wg.Done()
			for p, b := range bodies {
				if got := post(h, p, b).Body.String(); got != want[p] {
					errs <- p + ": " + got
				}
			}
			if rec := post(h, "/v1/osmotic", `{"solute":"NaCl","concentration":-1,"unit":"mol/kg"}`); rec.Code != 400 {
				errs <- "bad request answered " + rec.Body.String()
			}
		}(i)
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
}
