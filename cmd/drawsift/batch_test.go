package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"sync/atomic"
	"testing"

	"drawsift/engine/api"
	"drawsift/engine/api/httpapi"
)

// scenarioFor returns a small screen scenario; kind picks the variant.
func scenarioFor(kind int) string {
	cands := []string{`["NaCl","MgCl2"]`, `["KCl"]`, `["Na2SO4","NaCl"]`, `["MgSO4"]`}[kind%4]
	return `{"feed":{"solute":"seawater","concentration":35,"unit":"g/kg"},"membrane":{"a_lmh_per_bar":2,"b_lmh":0.4,"s_um":400},` +
		`"orientation":"AL-FS","temperature_c":25,"candidates":` + cands + `,"basis":{"kind":"osmotic-pressure","value":60,"unit":"bar"}}`
}

const badScenario = `{"candidates":["Unobtainium"]}`

// batchLine is one NDJSON output line.
type batchLine struct {
	Index  int             `json:"index"`
	Result json.RawMessage `json:"result"`
	Error  *api.Error      `json:"error"`
}

func runCLI(t *testing.T, stdin string, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var o, e bytes.Buffer
	code = run(args, strings.NewReader(stdin), &o, &e)
	return code, o.String(), e.String()
}

func parseLines(t *testing.T, out string) []batchLine {
	t.Helper()
	var lines []batchLine
	sc := bufio.NewScanner(strings.NewReader(out))
	sc.Buffer(nil, 1<<24)
	for sc.Scan() {
		var l batchLine
		dec := json.NewDecoder(bytes.NewReader(sc.Bytes()))
		dec.DisallowUnknownFields()
		if err := dec.Decode(&l); err != nil {
			t.Fatalf("output line is not {index, result|error}: %v\n%s", err, sc.Text())
		}
		if (l.Result == nil) == (l.Error == nil) {
			t.Fatalf("line must hold exactly one of result and error: %s", sc.Text())
		}
		lines = append(lines, l)
	}
	return lines
}

func TestBatchArrayAndNDJSON(t *testing.T) {
	var scen []string
	for i := 0; i < 8; i++ {
		scen = append(scen, scenarioFor(i))
	}
	scen[5] = badScenario
	array := "[\n" + strings.Join(scen, ",\n") + "\n]\n"
	ndjson := strings.Join(scen, "\n") + "\n"
	codeA, outA, _ := runCLI(t, array, "screen", "--concurrency", "3")
	codeN, outN, errN := runCLI(t, ndjson, "screen")
	if codeA != 2 || codeN != 2 {
		t.Errorf("exit %d and %d, want 2 (one scenario fails)", codeA, codeN)
	}
	if outA != outN {
		t.Errorf("array and NDJSON give different output")
	}
	if !strings.Contains(errN, "1 of 8 scenarios failed") {
		t.Errorf("stderr summary: %q", errN)
	}
	lines := parseLines(t, outA)
	if len(lines) != len(scen) {
		t.Fatalf("%d lines for %d scenarios", len(lines), len(scen))
	}
	for i, l := range lines {
		if l.Index != i {
			t.Errorf("line %d has index %d: output must keep input order", i, l.Index)
		}
		want, e := api.Dispatch(context.Background(), api.OpScreen, []byte(scen[i]))
		if i == 5 {
			if l.Error == nil || l.Error.Field != "candidates[0]" {
				t.Errorf("scenario 5: want the error on candidates[0], got %+v", l.Error)
			}
			continue
		}
		if e != nil {
			t.Fatalf("scenario %d: %v", i, e)
		}
		if !bytes.Equal(l.Result, want) {
			t.Errorf("scenario %d: batch result differs from the single request's", i)
		}
	}
}

func TestBatchCSV(t *testing.T) {
	in := scenarioFor(0) + "\n" + badScenario + "\n" + scenarioFor(1) + "\n"
	code, out, _ := runCLI(t, in, "screen", "--format", "csv")
	if code != 2 {
		t.Errorf("exit %d, want 2", code)
	}
	rows := strings.Split(strings.TrimSpace(out), "\n")
	if !strings.HasPrefix(rows[0], "scenario,error_field,error_message,rank,solute,") {
		t.Fatalf("header: %s", rows[0])
	}
	var seen []string
	for _, r := range rows[1:] {
		seen = append(seen, strings.SplitN(r, ",", 2)[0])
	}
	// Scenario 0 ranks two candidates, 1 is an error row, 2 ranks one.
	if got := strings.Join(seen, " "); got != "0 0 1 2" {
		t.Errorf("rows by scenario: %q, want \"0 0 1 2\"\n%s", got, out)
	}
	if !strings.HasPrefix(rows[3], "1,candidates[0],") {
		t.Errorf("error row: %s", rows[3])
	}
}

// apiServer runs the API handler behind an optional wrapper.
func apiServer(t *testing.T, wrap func(http.Handler) http.Handler) *httptest.Server {
	h := httpapi.New(httpapi.Options{})
	if wrap != nil {
		h = wrap(h)
	}
	srv := httptest.NewServer(h)
	t.Cleanup(srv.Close)
	return srv
}

// TestBatchRemoteMatchesLocal: adding --remote moves the same job to the
// API with the same output.
func TestBatchRemoteMatchesLocal(t *testing.T) {
	var scen []string
	for i := 0; i < 12; i++ {
		scen = append(scen, scenarioFor(i))
	}
	scen[7] = badScenario
	in := strings.Join(scen, "\n")
	var inflight, peak atomic.Int64
	srv := apiServer(t, func(h http.Handler) http.Handler {
		return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
			n := inflight.Add(1)
			defer inflight.Add(-1)
			for {
				p := peak.Load()
				if n <= p || peak.CompareAndSwap(p, n) {
					break
				}
			}
			h.ServeHTTP(w, r)
		})
	})
	codeL, outL, _ := runCLI(t, in, "screen")
	codeR, outR, errR := runCLI(t, in, "screen", "--remote", srv.URL, "--concurrency", "3")
	if codeL != 2 || codeR != 2 {
		t.Errorf("exit local %d, remote %d; want 2 and 2 (%s)", codeL, codeR, errR)
	}
	if outL != outR {
		t.Errorf("remote output differs from local:\nlocal  %.300s\nremote %.300s", outL, outR)
	}
	if p := peak.Load(); p > 3 {
		t.Errorf("%d requests in flight at once, --concurrency 3", p)
	}
	// A single scenario with --remote prints like a local run.
	codeL, outL, _ = runCLI(t, scenarioFor(0), "screen", "--format", "csv")
	codeR, outR, _ = runCLI(t, scenarioFor(0), "screen", "--format", "csv", "--remote", srv.URL+"/v1/")
	if codeL != 0 || codeR != 0 || outL != outR {
		t.Errorf("single scenario: local %d, remote %d; outputs equal %v", codeL, codeR, outL == outR)
	}
}

// TestBatchRemoteRetries: 5xx answers and dropped connections are retried;
// a 4xx answer is the scenario's verdict and is not.
func TestBatchRemoteRetries(t *testing.T) {
	var mu sync.Mutex
	attempts := map[string]int{}
	srv := apiServer(t, func(h http.Handler) http.Handler {
		return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
			b, _ := io.ReadAll(r.Body)
			mu.Lock()
			attempts[string(b)]++
			n := attempts[string(b)]
			mu.Unlock()
			switch {
			case n == 1 && strings.Contains(string(b), "KCl"):
				// Drop the connection: a network error.
				hj, _ := w.(http.Hijacker)
				c, _, _ := hj.Hijack()
				c.Close()
				return
			case n <= 2 && !strings.Contains(string(b), "Unobtainium"):
				http.Error(w, "overloaded", http.StatusServiceUnavailable)
				return
			}
			r.Body = io.NopCloser(bytes.NewReader(b))
			h.ServeHTTP(w, r)
		})
	})
	in := scenarioFor(0) + "\n" + scenarioFor(1) + "\n" + badScenario + "\n"
	code, out, errOut := runCLI(t, in, "screen", "--remote", srv.URL, "--retries", "3")
	if code != 2 {
		t.Errorf("exit %d, want 2 (one bad scenario): %s", code, errOut)
	}
	lines := parseLines(t, out)
	if len(lines) != 3 || lines[0].Result == nil || lines[1].Result == nil || lines[2].Error == nil || lines[2].Error.Field != "candidates[0]" {
		t.Fatalf("unexpected lines: %s", out)
	}
	mu.Lock()
	defer mu.Unlock()
	if n := attempts[badScenario]; n != 1 {
		t.Errorf("the 4xx scenario was sent %d times, want 1", n)
	}
	if n := attempts[scenarioFor(0)]; n != 3 {
		t.Errorf("scenario 0 was sent %d times, want 3 (two 503s)", n)
	}
}

func TestBatchRemoteGivesUp(t *testing.T) {
	srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		http.Error(w, "<html>bad gateway</html>", http.StatusBadGateway)
	}))
	defer srv.Close()
	code, out, _ := runCLI(t, scenarioFor(0)+"\n"+scenarioFor(1)+"\n", "screen", "--remote", srv.URL, "--retries", "1")
	if code != 1 {
		t.Errorf("exit %d, want 1 (no verdict from the remote)", code)
	}
	for _, l := range parseLines(t, out) {
		if l.Error == nil || l.Error.Field != "remote" || !strings.Contains(l.Error.Message, "502") || !strings.Contains(l.Error.Message, "after 2 attempts") {
			t.Errorf("want a remote error after 2 attempts, got %+v", l.Error)
		}
	}
	// Nothing listening: a network error, retried, then reported.
	srv.Close()
	code, out, _ = runCLI(t, scenarioFor(0), "screen", "--remote", srv.URL, "--retries", "0")
	if code != 1 || !strings.Contains(out, `"field":"remote"`) {
		t.Errorf("unreachable remote: exit %d, %s", code, out)
	}
}

func TestBatchFromFile(t *testing.T) {
	p := filepath.Join(t.TempDir(), "sweep.json")
	if err := os.WriteFile(p, []byte("["+scenarioFor(0)+","+scenarioFor(2)+"]"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, _ := runCLI(t, "", "screen", "-f", p)
	if code != 0 || len(parseLines(t, out)) != 2 {
		t.Errorf("exit %d, output %.200s", code, out)
	}
}

func TestEndpointURL(t *testing.T) {
	for in, want := range map[string]string{
		"http://127.0.0.1:8080":                   "http://127.0.0.1:8080/v1/screen",
		"http://127.0.0.1:8080/":                  "http://127.0.0.1:8080/v1/screen",
		"https://api.example/v1":                  "https://api.example/v1/screen",
		"https://api.example/drawsift/v1/screen":  "https://api.example/drawsift/v1/screen",
		"https://api.example/drawsift/?x=1":       "https://api.example/drawsift/v1/screen?x=1",
		"https://drawsift.lab.example/v1/screen/": "https://drawsift.lab.example/v1/screen",
	} {
		got, err := endpointURL(in, "screen")
		if err != nil || got != want {
			t.Errorf("endpointURL(%q) = %q, %v; want %q", in, got, err, want)
		}
	}
	for _, bad := range []string{"", "127.0.0.1:8080", "ftp://x/", "http://", "::"} {
		if _, err := endpointURL(bad, "screen"); err == nil {
			t.Errorf("endpointURL(%q) should fail", bad)
		}
	}
}
