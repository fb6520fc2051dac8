//go:build !js

package main

// The edge build under test: the js/wasm program is built as `make edge`
// builds it, wrapped in the glue that workers-assets-gen generates, and
// driven under Node through the glue's fetch handler (node/runtime.mjs
// stands in for the platform's module loader). Every request gets the same
// answer — status, Content-Type and body — as the native handler.

import (
	"bytes"
	"compress/gzip"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"net/http/httptest"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"strings"
	"sync"
	"testing"

	"drawsift/engine/api/httpapi"
)

// edgeTags are the build tags of the edge build (see edge.mk): the edge
// uses encoding/json, not goccy/go-json, to stay well inside the bundle
// budget.
const edgeTags = "stdjson"

// bundleBudget is the platform's limit on the gzip-compressed bundle
// (the platform limit: < 3 MiB).
const bundleBudget = 3 << 20

type edgeRequest struct {
	Name    string            `json:"name"`
	Method  string            `json:"method"`
	Path    string            `json:"path"`
	Headers map[string]string `json:"headers,omitempty"`
	Body    *string           `json:"body,omitempty"`
	Env     map[string]string `json:"env,omitempty"`
}

type edgeAnswer struct {
	Status  int               `json:"status"`
	Headers map[string]string `json:"headers"`
	Body    string            `json:"body"`
	MS      float64           `json:"ms"`
}

func str(s string) *string { return &s }

var (
	buildOnce sync.Once
	buildDir  string
	buildErr  string
)

// TestMain removes the shared build directory.
func TestMain(m *testing.M) {
	code := m.Run()
	if buildDir != "" {
		os.RemoveAll(buildDir)
	}
	os.Exit(code)
}

// buildEdge builds the edge bundle, the way edge.mk does, once per test
// run, and returns its directory.
func buildEdge(t *testing.T) string {
	t.Helper()
	if testing.Short() {
		t.Skip("builds the js/wasm edge bundle; skipped under -short")
	}
	if _, err := exec.LookPath("node"); err != nil {
		t.Skip("node not found: cannot run the edge build")
	}
	goBin, err := exec.LookPath("go")
	if err != nil {
		t.Skip("go command not found")
	}
	buildOnce.Do(func() { buildDir, buildErr = build(goBin) })
	if buildErr != "" {
		t.Fatal(buildErr)
	}
	return buildDir
}

func build(goBin string) (string, string) {
	dir, err := os.MkdirTemp("", "drawsift-edge-")
	if err != nil {
		return "", err.Error()
	}
	gen := exec.Command(goBin, "run", "github.com/syumai/workers/cmd/workers-assets-gen", "-mode=go", "-o", dir)
	if out, err := gen.CombinedOutput(); err != nil {
		return dir, fmt.Sprintf("workers-assets-gen: %v\n%s", err, out)
	}
	build := exec.Command(goBin, "build", "-trimpath", "-buildvcs=false", "-ldflags=-s -w", "-tags", edgeTags,
		"-o", filepath.Join(dir, "app.wasm"), ".")
	build.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	if out, err := build.CombinedOutput(); err != nil {
		return dir, fmt.Sprintf("building the edge wasm: %v\n%s", err, out)
	}
	// The generated runtime (the platform's module loader) is kept for
	// the platform's own runtime (workerd_test.go); Node gets its shim.
	if err := os.Rename(filepath.Join(dir, "runtime.mjs"), filepath.Join(dir, platformRuntime)); err != nil {
		return dir, err.Error()
	}
	rt, err := os.ReadFile(filepath.Join("node", "runtime.mjs"))
	if err != nil {
		return dir, err.Error()
	}
	if err := os.WriteFile(filepath.Join(dir, "runtime.mjs"), rt, 0o644); err != nil {
		return dir, err.Error()
	}
	return dir, ""
}

// driveEdge runs the requests through the edge build under Node.
func driveEdge(t *testing.T, dir string, reqs []edgeRequest) []edgeAnswer {
	t.Helper()
	in := filepath.Join(t.TempDir(), "requests.json")
	out := filepath.Join(t.TempDir(), "answers.json")
	b, _ := json.Marshal(reqs)
	if err := os.WriteFile(in, b, 0o644); err != nil {
		t.Fatal(err)
	}
	drive, _ := filepath.Abs(filepath.Join("node", "drive.mjs"))
	cmd := exec.Command("node", "--stack-size=8192", drive, dir, in, out)
	var logs bytes.Buffer
	cmd.Stdout, cmd.Stderr = &logs, &logs
	if err := cmd.Run(); err != nil {
		t.Fatalf("node: %v\n%s", err, logs.String())
	}
	if logs.Len() > 0 {
		t.Logf("edge program output:\n%s", logs.String())
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	var ans []edgeAnswer
	if err := json.Unmarshal(b, &ans); err != nil {
		t.Fatal(err)
	}
	if len(ans) != len(reqs) {
		t.Fatalf("%d answers to %d requests", len(ans), len(reqs))
	}
	return ans
}

// native answers a request with the native handler, configured as the edge
// program configures itself from env.
func native(r edgeRequest) *httptest.ResponseRecorder {
	var origins []string
	for _, o := range strings.Split(r.Env["DRAWSIFT_CORS_ORIGINS"], ",") {
		if o = strings.TrimSpace(o); o != "" {
			origins = append(origins, o)
		}
	}
	h := httpapi.New(httpapi.Options{CORSOrigins: origins})
	var body io.Reader
	if r.Body != nil {
		body = strings.NewReader(*r.Body)
	}
	req := httptest.NewRequest(r.Method, r.Path, body)
	for k, v := range r.Headers {
		req.Header.Set(k, v)
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec
}

func edgeRequests() []edgeRequest {
	js := map[string]string{"Content-Type": "application/json", "X-Request-Id": "edge-test-1"}
	big := `{"solute":"NaCl","concentration":1,"unit":"mol/kg","pad":"` + strings.Repeat("x", httpapi.DefaultMaxBodyBytes) + `"}`
	return []edgeRequest{
		{Name: "health", Method: "GET", Path: "/v1/health"},
		{Name: "solutes", Method: "GET", Path: "/v1/solutes"},
		{Name: "osmotic NaCl", Method: "POST", Path: "/v1/osmotic", Headers: js,
			Body: str(`{"solute":"NaCl","concentration":1,"unit":"mol/kg","temperature_c":25}`)},
		{Name: "osmotic MgCl2 g/L", Method: "POST", Path: "/v1/osmotic", Headers: js,
			Body: str(`{"solute":"MgCl2","concentration":95,"unit":"g/L","temperature_c":40}`)},
		{Name: "osmotic seawater", Method: "POST", Path: "/v1/osmotic", Headers: js,
			Body: str(`{"solute":"seawater","concentration":35,"unit":"g/kg"}`)},
		{Name: "flux AL-FS", Method: "POST", Path: "/v1/flux", Headers: js,
			Body: str(`{"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500},"orientation":"AL-FS",
			"draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"},"feed":{"solute":"NaCl","concentration":0,"unit":"mol/L"},
			"temperature_c":25,"k_draw_m_per_s":5e-5,"k_feed_m_per_s":5e-5}`)},
		{Name: "flux AL-DS no ECP", Method: "POST", Path: "/v1/flux", Headers: js,
			Body: str(`{"membrane":{"a_lmh_per_bar":2,"b_lmh":0.4,"s_um":400},"orientation":"AL-DS",
			"draw":{"solute":"MgCl2","concentration":1.5,"unit":"mol/L"},"external_cp":false}`)},
		{Name: "screen unknown field", Method: "POST", Path: "/v1/screen", Headers: js, Body: str(`{"no_such_field":1}`)},
		{Name: "malformed", Method: "POST", Path: "/v1/osmotic", Headers: js, Body: str(`{"solute":`)},
		{Name: "unknown solute", Method: "POST", Path: "/v1/osmotic", Headers: js,
			Body: str(`{"solute":"unobtainium","concentration":1,"unit":"mol/kg"}`)},
		{Name: "unknown path", Method: "GET", Path: "/v2/health", Headers: js},
		{Name: "wrong method", Method: "GET", Path: "/v1/osmotic", Headers: js},
		{Name: "not JSON", Method: "POST", Path: "/v1/osmotic", Headers: map[string]string{"Content-Type": "text/plain", "X-Request-Id": "edge-test-2"}, Body: str(`{}`)},
		{Name: "too large", Method: "POST", Path: "/v1/osmotic", Headers: js, Body: &big},
		{Name: "CORS preflight", Method: "OPTIONS", Path: "/v1/flux",
			Headers: map[string]string{"Origin": "https://lab.example", "Access-Control-Request-Method": "POST", "X-Request-Id": "edge-test-3"},
			Env:     map[string]string{"DRAWSIFT_CORS_ORIGINS": "https://lab.example"}},
		{Name: "CORS call", Method: "GET", Path: "/v1/health",
			Headers: map[string]string{"Origin": "https://lab.example", "X-Request-Id": "edge-test-4"},
			Env:     map[string]string{"DRAWSIFT_CORS_ORIGINS": "https://lab.example"}},
	}
}

func TestEdgeMatchesNative(t *testing.T) {
	dir := buildEdge(t)
	reqs := edgeRequests()
	answers := driveEdge(t, dir, reqs)
	compared := map[int]bool{}
	for i, r := range reqs {
		got, want := answers[i], native(r)
		t.Run(r.Name, func(t *testing.T) {
			t.Logf("edge answered %d in %.1f ms", got.Status, got.MS)
			if got.Status != want.Code {
				t.Fatalf("status: edge %d, native %d (edge body %s)", got.Status, want.Code, got.Body)
			}
			compared[want.Code] = true
			for _, h := range []string{"Content-Type", "X-Request-Id", "Allow", "Access-Control-Allow-Origin", "Access-Control-Allow-Methods"} {
				if g, w := got.Headers[strings.ToLower(h)], want.Header().Get(h); g != w && !(h == "X-Request-Id" && r.Headers["X-Request-Id"] == "") {
					t.Errorf("header %s: edge %q, native %q", h, g, w)
				}
			}
			sameBody(t, r.Name, []byte(got.Body), want.Body.Bytes())
		})
	}
	for _, code := range []int{200, 204, 400, 404, 405, 413, 415} {
		if !compared[code] {
			t.Errorf("no request compared status %d", code)
		}
	}
}

// sameBody requires identical bodies. The engine's floats may differ in the
// last bits between amd64 and wasm (math.Exp is assembly on amd64; Go's
// math package documents such differences), so when the bytes differ the
// bodies are compared as JSON with numbers equal to 1e-12 relative (or
// 1e-15 absolute); the
// JSON library's name in the health answer is the one field allowed to
// differ (the edge build uses encoding/json).
func sameBody(t *testing.T, name string, got, want []byte) {
	t.Helper()
	if bytes.Equal(got, want) {
		return
	}
	var g, w any
	dg := json.NewDecoder(bytes.NewReader(got))
	dg.UseNumber()
	dw := json.NewDecoder(bytes.NewReader(want))
	dw.UseNumber()
	if err := dg.Decode(&g); err != nil {
		t.Fatalf("edge body is not JSON: %v\n%s", err, got)
	}
	if err := dw.Decode(&w); err != nil {
		t.Fatalf("native body is not JSON: %v\n%s", err, want)
	}
	if name == "health" || name == "CORS call" {
		if gm, ok := g.(map[string]any); ok {
			delete(gm, "json_library")
		}
		if wm, ok := w.(map[string]any); ok {
			delete(wm, "json_library")
		}
	}
	if diff := jsonDiff("", g, w); diff != "" {
		t.Errorf("edge and native bodies differ: %s\nedge:   %.600s\nnative: %.600s", diff, got, want)
		return
	}
	t.Logf("bodies equal as JSON (numbers within 1e-12), not byte for byte")
}

func jsonDiff(path string, g, w any) string {
	switch w := w.(type) {
	case map[string]any:
		gm, ok := g.(map[string]any)
		if !ok || len(gm) != len(w) {
			return fmt.Sprintf("%s: object keys differ", path)
		}
		for k, wv := range w {
			if d := jsonDiff(path+"."+k, gm[k], wv); d != "" {
				return d
			}
		}
		return ""
	case []any:
		ga, ok := g.([]any)
		if !ok || len(ga) != len(w) {
			return fmt.Sprintf("%s: arrays differ in length", path)
		}
		for i := range w {
			if d := jsonDiff(fmt.Sprintf("%s[%d]", path, i), ga[i], w[i]); d != "" {
				return d
			}
		}
		return ""
	case json.Number:
		gn, ok := g.(json.Number)
		if !ok {
			return path + ": not a number"
		}
		a, _ := gn.Float64()
		b, _ := w.Float64()
		// Relative 1e-12, or absolute 1e-15 for values that are rounding
		// noise themselves (the solver's relative residual, ~1e-16).
		if a == b || math.Abs(a-b) <= 1e-12*math.Max(math.Abs(a), math.Abs(b)) || math.Abs(a-b) <= 1e-15 {
			return ""
		}
		return fmt.Sprintf("%s: %s vs %s", path, gn, w)
	}
	if !reflect.DeepEqual(g, w) {
		return fmt.Sprintf("%s: %v vs %v", path, g, w)
	}
	return ""
}

// TestEdgeBundleSize checks the deployable bundle against the platform's
// budget and logs its size.
func TestEdgeBundleSize(t *testing.T) {
	dir := buildEdge(t)
	var raw, gz int64
	for _, f := range []string{"app.wasm", "wasm_exec.js", "worker.mjs"} {
		b, err := os.ReadFile(filepath.Join(dir, f))
		if err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		zw, _ := gzip.NewWriterLevel(&buf, gzip.BestCompression)
		zw.Write(b)
		zw.Close()
		raw += int64(len(b))
		gz += int64(buf.Len())
		t.Logf("%-12s %10d B raw %10d B gzip", f, len(b), buf.Len())
	}
	t.Logf("edge bundle (-tags %s): %d B raw, %d B gzip (budget %d B gzip)", edgeTags, raw, gz, bundleBudget)
	if gz >= bundleBudget {
		t.Errorf("edge bundle is %d B gzip, over the %d B budget", gz, bundleBudget)
	}
}
