//go:build !js

// End-to-end tests of the page in a real headless Chromium (Debian's
// chromium), driven with chromedp against `drawsift serve` on 127.0.0.1 and
// against the single-file bundle opened from file://. Each test builds what
// it needs (the page's wasm, wasm_exec.js, the drawsift binary) with the go
// command, once per run, under build/test-page/ in the module. Without a
// chromium on PATH the tests skip. Screenshots go to testdata/artifacts/
// at the module root (git-ignored).
//
// The tests wait for what the page signals — the worker's version
// handshake (body data-engine), the run markers (data-edit, data-run,
// data-run-edit, data-plots, data-robust, data-robust-progress,
// data-sweep; see site/static/app.js), stored scenarios, the browser's own
// download and service-worker events — never for a fixed time. The one
// bound left on each wait, patience, is a safety net of minutes that only
// a hang reaches, so the tests hold on a machine loaded many times over.
//
// The speed and size figures are a benchmark, never a timed test:
//
//	go test -run '^$' -bench PageFirstResult -benchtime 5x ./cmd/drawsift/
package site_test

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"compress/gzip"
	"compress/zlib"
	"io"
	"io/fs"
	"net/http/httptest"

	cdpbrowser "github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"

	"drawsift/engine/api"
	"drawsift/engine/screen"
	"drawsift/site"
)

// patience bounds every wait on the page: a safety net against a hang,
// minutes beyond what a loaded machine needs, never the means of waiting.
// DRAWSIFT_TEST_PATIENCE (a Go duration) changes it, e.g. shorter to see a
// hang's report sooner while debugging a test.
var patience = func() time.Duration {
	if d, err := time.ParseDuration(os.Getenv("DRAWSIFT_TEST_PATIENCE")); err == nil && d > 0 {
		return d
	}
	return 5 * time.Minute
}()

// ---- build products ---------------------------------------------------------

type pageProducts struct {
	dir, wasm, exec, bin, bundle string
}

var (
	buildOnce sync.Once
	built     pageProducts
	buildErr  error
)

// moduleRoot is the directory of go.mod.
func moduleRoot(t testing.TB) string {
	t.Helper()
	out, err := exec.Command("go", "env", "GOMOD").Output()
	if err != nil {
		t.Fatalf("go env GOMOD: %v", err)
	}
	return filepath.Dir(strings.TrimSpace(string(out)))
}

// pageBuild builds the page's wasm exactly as `make wasm` does, copies the
// toolchain's wasm_exec.js beside it, builds the drawsift binary and the
// single-file bundle, once per test run.
func pageBuild(t testing.TB) pageProducts {
	t.Helper()
	root := moduleRoot(t)
	buildOnce.Do(func() {
		dir := filepath.Join(root, "build", "test-page")
		if buildErr = os.MkdirAll(dir, 0o755); buildErr != nil {
			return
		}
		p := pageProducts{dir: dir, wasm: filepath.Join(dir, "drawsift.wasm"), exec: filepath.Join(dir, "wasm_exec.js"),
			bin: filepath.Join(dir, "drawsift"), bundle: filepath.Join(dir, "drawsift.html")}
		run := func(env []string, args ...string) error {
			cmd := exec.Command("go", args...)
			cmd.Dir = root
			cmd.Env = append(os.Environ(), env...)
			if out, err := cmd.CombinedOutput(); err != nil {
				return fmt.Errorf("go %s: %v\n%s", strings.Join(args, " "), err, out)
			}
			return nil
		}
		if buildErr = run([]string{"GOOS=js", "GOARCH=wasm"}, "build", "-tags", "stdjson,nofit", "-trimpath", "-ldflags=-s -w", "-o", p.wasm, "./wasm/page"); buildErr != nil {
			return
		}
		if buildErr = run([]string{"GOOS=js", "GOARCH=wasm"}, "build", "-tags", "stdjson", "-trimpath", "-ldflags=-s -w", "-o", filepath.Join(dir, "drawsift-fit.wasm"), "./wasm/page"); buildErr != nil {
			return
		}
		// Compressed beside the wasm as `make wasm` does, so that the
		// server sends it from the first request (it compresses a file
		// without one itself, which would count in the first visit).
		for _, w := range []string{p.wasm, filepath.Join(dir, "drawsift-fit.wasm")} {
			if buildErr = gzipFile(w); buildErr != nil {
				return
			}
		}
		goroot, err := exec.Command("go", "env", "GOROOT").Output()
		if err != nil {
			buildErr = err
			return
		}
		b, err := os.ReadFile(filepath.Join(strings.TrimSpace(string(goroot)), "lib", "wasm", "wasm_exec.js"))
		if err != nil {
			buildErr = err
			return
		}
		if buildErr = os.WriteFile(p.exec, b, 0o644); buildErr != nil {
			return
		}
		if buildErr = run(nil, "build", "-trimpath", "-o", p.bin, "./cmd/drawsift"); buildErr != nil {
			return
		}
		out, err := exec.Command(p.bin, "bundle", "-o", p.bundle, "--wasm", p.wasm).CombinedOutput()
		if err != nil {
			buildErr = fmt.Errorf("drawsift bundle: %v\n%s", err, out)
			return
		}
		built = p
	})
	if buildErr != nil {
		t.Fatal(buildErr)
	}
	return built
}

// startServe runs `drawsift serve` on a free loopback port and returns the page's URL.
func startServe(t testing.TB, p pageProducts) (url string, stop func()) {
	t.Helper()
	cmd := exec.Command(p.bin, "serve", "--addr", "127.0.0.1:0", "--wasm", p.wasm)
	stdout, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	found := make(chan string, 1)
	go func() {
		sc := bufio.NewScanner(stdout)
		re := regexp.MustCompile(`http://127\.0\.0\.1:\d+/`)
		for sc.Scan() {
			if m := re.FindString(sc.Text()); m != "" {
				select {
				case found <- m:
				default:
				}
			}
		}
	}()
	var once sync.Once
	stop = func() {
		once.Do(func() {
			cmd.Process.Signal(syscall.SIGINT)
			done := make(chan struct{})
			go func() { cmd.Wait(); close(done) }()
			select {
			case <-done:
			case <-time.After(patience):
				cmd.Process.Kill()
				<-done
			}
		})
	}
	t.Cleanup(stop)
	select {
	case url = <-found:
	case <-time.After(patience):
		stop()
		t.Fatalf("drawsift serve did not print its address; stderr:\n%s", stderr.String())
	}
	return url, stop
}

// ---- the browser -------------------------------------------------------------

type browserSession struct {
	ctx     context.Context
	mu      sync.Mutex
	console []string
}

// browser starts a fresh headless Chromium (its own profile: a first
// visit) for one test.
func browser(t testing.TB) *browserSession {
	t.Helper()
	exe, err := exec.LookPath("chromium")
	if err != nil {
		t.Skip("no chromium on PATH (Debian package chromium); .ci/run installs it")
	}
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(exe), chromedp.Flag("headless", true), chromedp.NoSandbox, chromedp.DisableGPU,
		chromedp.Flag("disable-background-networking", true), chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true), chromedp.NoFirstRun, chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1280, 900),
	}
	actx, c1 := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, c2 := chromedp.NewContext(actx)
	// The whole browser lives until the test's own deadline (go test
	// -timeout) less a minute, so that a hang fails this test with its
	// screenshot and console rather than the package with a panic.
	limit := 20 * time.Minute
	if d, ok := t.(interface{ Deadline() (time.Time, bool) }); ok {
		if dl, ok := d.Deadline(); ok {
			limit = time.Until(dl) - time.Minute
		}
	}
	ctx, c3 := context.WithTimeout(ctx, limit)
	b := &browserSession{ctx: ctx}
	t.Cleanup(func() {
		c3()
		c2()
		c1()
	})
	// Start the browser and collect the console for failure reports.
	if err := chromedp.Do(ctx, chromedp.Navigate("about:blank")); err != nil {
		t.Fatalf("starting chromium: %v", err)
	}
	msgs := chromedp.Console(ctx)
	go func() {
		for m, err := range msgs {
			if err != nil {
				return
			}
			b.mu.Lock()
			b.console = append(b.console, m.String())
			b.mu.Unlock()
		}
	}()
	t.Cleanup(func() {
		if t.Failed() {
			b.mu.Lock()
			defer b.mu.Unlock()
			for _, m := range b.console {
				t.Log("console:", m)
			}
		}
	})
	return b
}

func (b *browserSession) do(t testing.TB, steps ...chromedp.Action[chromedp.Void]) {
	t.Helper()
	if err := chromedp.Do(b.ctx, steps...); err != nil {
		t.Fatal(err)
	}
}

// eval evaluates a JS expression (awaiting a promise) and decodes its
// value into T.
func eval[T any](t testing.TB, b *browserSession, js string) T {
	t.Helper()
	ctx, cancel := context.WithTimeout(b.ctx, patience)
	defer cancel()
	v, err := chromedp.Run(ctx, chromedp.Evaluate[T](js, chromedp.EvalAwaitPromise))
	if err != nil {
		t.Fatalf("evaluating %s: %v", js, err)
	}
	return v
}

// waitFor waits until a JS condition about what the page has signalled
// holds; the page re-checks it every frame.
func (b *browserSession) waitFor(t testing.TB, cond string) {
	t.Helper()
	b.poll(t, cond)
}

// waitForMutation is waitFor for a condition on the page's DOM alone:
// it is checked on each mutation of the DOM, so the wait costs the page
// nothing between them.
func (b *browserSession) waitForMutation(t testing.TB, cond string) {
	t.Helper()
	b.poll(t, cond, chromedp.WithPollingMutation())
}

func (b *browserSession) poll(t testing.TB, cond string, opts ...chromedp.PollOption) {
	t.Helper()
	ctx, cancel := context.WithTimeout(b.ctx, patience)
	defer cancel()
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](cond, append([]chromedp.PollOption{chromedp.WithPollingTimeout(patience)}, opts...)...)); err != nil {
		b.screenshot(t, "timeout")
		// What the page says it is doing, for the report.
		said, _ := chromedp.Run(b.ctx, chromedp.Evaluate[string](`JSON.stringify(Object.assign({banner: document.getElementById("banner").textContent,
			error: document.getElementById("run-error").textContent}, document.body.dataset))`))
		t.Fatalf("waiting for %s: %v\nthe page: %s", cond, err, said)
	}
}

// screenshot saves a full-page PNG into testdata/artifacts/.
func (b *browserSession) screenshot(t testing.TB, name string) {
	t.Helper()
	png, err := chromedp.Run(b.ctx, chromedp.FullScreenshot(100))
	if err != nil {
		t.Logf("screenshot %s: %v", name, err)
		return
	}
	dir := filepath.Join(moduleRoot(t), "testdata", "artifacts")
	os.MkdirAll(dir, 0o755)
	file := filepath.Join(dir, strings.ReplaceAll(t.Name(), "/", "_")+"-"+name+".png")
	if err := os.WriteFile(file, png, 0o644); err != nil {
		t.Logf("screenshot %s: %v", name, err)
	}
}

// ---- what the page shows and what the engine says -----------------------------------

type pageRow struct {
	Solute string  `json:"solute"`
	Rank   int     `json:"rank"`
	Score  float64 `json:"score"`
}

const jsRows = `Array.from(document.querySelectorAll("#ranking tbody tr")).map(tr => ({solute: tr.dataset.solute, rank: Number(tr.dataset.rank), score: Number(tr.dataset.score)}))`

// jsSettled holds once the page has finished a run of its latest
// scenario edit: the run marker (done-, error- or invalid-<run>) names the
// edit it ran, and that is the last edit (app.js).
const jsSettled = `(d => !!d.run && d.runEdit === d.edit)(document.body.dataset)`

// settle waits until the page has run its latest edit and returns the run
// marker, whatever the outcome. An edit made through the DOM (an input
// event) counts at once; one made by a key press counts once the page
// has stored it, which callers wait for first.
func (b *browserSession) settle(t testing.TB) string {
	t.Helper()
	b.waitFor(t, jsSettled)
	return eval[string](t, b, `document.body.dataset.run`)
}

// waitRun waits for a ranking of the latest edit, after the given run
// marker, and returns its marker; a run that ended otherwise fails the test.
func (b *browserSession) waitRun(t testing.TB, after string) string {
	t.Helper()
	b.waitFor(t, fmt.Sprintf(`%s && document.body.dataset.run !== %q`, jsSettled, after))
	run := eval[string](t, b, `document.body.dataset.run`)
	if !strings.HasPrefix(run, "done-") {
		b.screenshot(t, "run")
		t.Fatalf("the run ended %s: %s", run, eval[string](t, b, `document.getElementById("run-error").textContent`))
	}
	return run
}

// waitPlots waits until the plots of the latest ranking are drawn.
func (b *browserSession) waitPlots(t testing.TB) {
	t.Helper()
	b.waitFor(t, `(d => d.plots === d.run && d.runEdit === d.edit)(document.body.dataset)`)
}

// pageScenario is the scenario the page has stored (what it sent, before
// its own additions are stripped).
func pageScenario(t testing.TB, b *browserSession) map[string]any {
	t.Helper()
	s := eval[string](t, b, `localStorage.getItem("drawsift.scenario.v1") || ""`)
	var sc map[string]any
	if err := json.Unmarshal([]byte(s), &sc); err != nil {
		t.Fatalf("stored scenario %q: %v", s, err)
	}
	return sc
}

// openServed builds the page, starts drawsift serve on 127.0.0.1, opens
// the page in a fresh browser and waits for the demo's first ranking; it
// returns the session and the run marker of that ranking.
func openServed(t testing.TB) (*browserSession, string) {
	t.Helper()
	p := pageBuild(t)
	b := browser(t)
	url, _ := startServe(t, p)
	b.do(t, chromedp.Navigate(url))
	return b, b.waitRun(t, "")
}

type nativeResult struct {
	Candidates []pageRow `json:"candidates"`
	Excluded   []struct {
		Solute string `json:"solute"`
		Reason string `json:"reason"`
	} `json:"excluded"`
}

// native runs the scenario through the engine natively, as the page's
// live ranking does (no robustness run; page-only fields removed, the
// measured table renamed to the contract's pi_table).
func native(t testing.TB, sc map[string]any) nativeResult {
	t.Helper()
	req := map[string]any{}
	for k, v := range sc {
		req[k] = v
	}
	delete(req, "uncertainty")
	if cs, ok := req["custom_solutes"].([]any); ok {
		for _, c := range cs {
			m := c.(map[string]any)
			delete(m, "hazards")
			delete(m, "regeneration")
			if tab, ok := m["osmotic_table"]; ok {
				m["pi_table"] = tab // the page sends its stored table as the contract's pi_table
				delete(m, "osmotic_table")
			}
		}
	}
	body, _ := json.Marshal(req)
	out, e := api.Dispatch(context.Background(), api.OpScreen, body)
	if e != nil {
		t.Fatalf("native screen of %s: %s", body, out)
	}
	var r nativeResult
	if err := json.Unmarshal(out, &r); err != nil {
		t.Fatal(err)
	}
	return r
}

// sameRanking compares the page's table with the native ranking: the same
// solutes in the same order with the same ranks, and scores equal within
// 1e-9 (js/wasm and amd64 math differ in the last bits, tooling.md §3).
func sameRanking(t testing.TB, page []pageRow, want nativeResult) {
	t.Helper()
	if len(page) != len(want.Candidates) {
		t.Fatalf("page ranks %d candidates, native %d:\npage   %v\nnative %v", len(page), len(want.Candidates), page, want.Candidates)
	}
	for i, w := range want.Candidates {
		g := page[i]
		if g.Solute != w.Solute || g.Rank != w.Rank || math.Abs(g.Score-w.Score) > 1e-9*math.Max(1, math.Abs(w.Score)) {
			t.Errorf("row %d: page %+v, native %+v", i, g, w)
		}
	}
}

func demoScenario(t testing.TB) map[string]any {
	t.Helper()
	b, err := site.FS.(interface{ ReadFile(string) ([]byte, error) }).ReadFile("demo.json")
	if err != nil {
		t.Fatal(err)
	}
	var sc map[string]any
	if err := json.Unmarshal(b, &sc); err != nil {
		t.Fatal(err)
	}
	return sc
}

// ---- tests --------------------------------------------------------------------------

// TestPageDemoMatchesEngine loads the demo on a first visit, and checks
// that the ranked table is the engine's native ranking of the same
// scenario, and of the demo file itself.
func TestPageDemoMatchesEngine(t *testing.T) {
	b, _ := openServed(t)
	rows := eval[[]pageRow](t, b, jsRows)
	sc := pageScenario(t, b)
	sameRanking(t, rows, native(t, sc))
	sameRanking(t, rows, native(t, demoScenario(t)))
	if len(rows) < 5 {
		t.Errorf("the demo ranks only %d candidates", len(rows))
	}
	// Solutes that failed a hard limit are listed apart with the reason.
	want := native(t, sc)
	ex := eval[[]string](t, b, `Array.from(document.querySelectorAll("#excluded li[data-solute]")).map(li => li.dataset.solute + ": " + li.querySelector(".reason").textContent)`)
	if len(ex) != len(want.Excluded) {
		t.Errorf("excluded on the page %v, native %v", ex, want.Excluded)
	}
	for i, x := range want.Excluded {
		if i < len(ex) && ex[i] != x.Solute+": "+x.Reason {
			t.Errorf("excluded[%d] = %q, native %s: %s", i, ex[i], x.Solute, x.Reason)
		}
	}
	// The cautions are on screen by default, not hidden.
	if !eval[bool](t, b, `(() => { const r = document.getElementById("cautions").getBoundingClientRect(); return r.height > 40 && r.top < innerHeight; })()`) {
		t.Error("the cautions are not visible on first view")
	}
	// Units are in every numeric header.
	heads := eval[[]string](t, b, `Array.from(document.querySelectorAll("#ranking thead th")).map(th => th.textContent)`)
	for _, h := range heads[2:] {
		if !strings.Contains(h, "(") {
			t.Errorf("header %q has no unit", h)
		}
	}
	b.screenshot(t, "demo")
	b.waitPlots(t)
	b.do(t, chromedp.Click(chromedp.ID("tab-plots")))
	n := eval[int](t, b, `document.querySelectorAll("#plots figure svg").length`)
	if n != 4 {
		t.Errorf("%d plots, want 4 (π, SRSF, trade-off, Jw)", n)
	}
	// The π plot's curves come from one engine batch of osmotic requests
	// (24 concentrations per solute, after the origin): for each plotted
	// solute a real curve (points past its solubility or data left out) and
	// a van 't Hoff curve at the same concentrations.
	plotted := eval[int](t, b, `Math.min(Number(document.getElementById("plot-count").value) || Infinity, document.querySelectorAll("#ranking tbody tr").length)`)
	curves := eval[[]int](t, b, `Array.from(document.querySelectorAll('#plots [data-plot="osmotic-pressure"] g[clip-path] path')).map(p => p.getAttribute("d").split("L").length)`)
	if len(curves) != 2*plotted {
		t.Errorf("the π plot has %d curves for %d solutes", len(curves), plotted)
	}
	for i, c := range curves {
		if i%2 == 1 && c != curves[i-1] || c < 2 || c > 25 {
			t.Errorf("π curve %d has %d points (curves %v)", i, c, curves)
		}
	}
	b.screenshot(t, "plots")
}

// TestPageFieldChange edits a field by keyboard and sees the ranking change
// to the engine's native result for the edited scenario.
func TestPageFieldChange(t *testing.T) {
	b, run := openServed(t)
	before := eval[[]pageRow](t, b, jsRows)
	b.do(t, chromedp.Click(chromedp.ID("temp")), chromedp.Evaluate[chromedp.Void](`document.getElementById("temp").select()`),
		chromedp.SendKeys(chromedp.ID("temp"), "45"))
	b.waitFor(t, `document.getElementById("temp").value === "45"`)
	// A run may have started between the two keys: once the page has
	// stored the last one, wait for the run of that edit.
	b.waitFor(t, `JSON.parse(localStorage.getItem("drawsift.scenario.v1")).temperature_c === 45`)
	b.waitRun(t, run)
	after := eval[[]pageRow](t, b, jsRows)
	sc := pageScenario(t, b)
	if sc["temperature_c"] != 45.0 {
		t.Fatalf("stored temperature %v, want 45", sc["temperature_c"])
	}
	sameRanking(t, after, native(t, sc))
	changed := len(after) != len(before)
	for i := range after {
		if !changed && (after[i].Solute != before[i].Solute || after[i].Score != before[i].Score) {
			changed = true
		}
	}
	if !changed {
		t.Error("the ranking did not change when the temperature went from 25 to 45 °C")
	}
	b.screenshot(t, "45C")
}

// TestPageReloadRestores edits the scenario, reloads, and finds it restored.
func TestPageReloadRestores(t *testing.T) {
	b, run := openServed(t)
	b.do(t, chromedp.SetValue(chromedp.ID("basis-value"), "75"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("basis-value").dispatchEvent(new Event("input", {bubbles: true}))`))
	b.waitRun(t, run)
	before := eval[[]pageRow](t, b, jsRows)
	b.do(t, chromedp.Reload())
	b.waitRun(t, "")
	if v := eval[string](t, b, `document.getElementById("basis-value").value`); v != "75" {
		t.Errorf("after reload the basis value is %q, want 75", v)
	}
	after := eval[[]pageRow](t, b, jsRows)
	sameRanking(t, after, native(t, pageScenario(t, b)))
	if fmt.Sprint(before) != fmt.Sprint(after) {
		t.Errorf("ranking before reload %v, after %v", before, after)
	}
}

// TestPageMalformedImport imports broken files: a clear message, and the
// scenario untouched.
func TestPageMalformedImport(t *testing.T) {
	b, _ := openServed(t)
	stored := eval[string](t, b, `localStorage.getItem("drawsift.scenario.v1")`)
	rows := eval[[]pageRow](t, b, jsRows)
	dir := t.TempDir()
	for _, tc := range []struct{ name, body, want string }{
		{"truncated.json", `{"feed": {"preset": "seawater"}, "membrane": `, "not valid JSON"},
		{"unknown-field.json", `{"feed": {"preset": "seawater"}, "membrane": {"preset": "tfc-standard", "colour": "blue"}}`, "membrane.colour"},
		{"wrong-type.json", `{"temperature_c": "warm"}`, "temperature_c"},
		{"engine-rejects.json", `{"temperature_c": 250}`, "temperature_c"},
		{"script.json", `{"candidates": ["<img src=x onerror=alert(1)>"]}`, "candidates[0]"},
	} {
		f := filepath.Join(dir, tc.name)
		os.WriteFile(f, []byte(tc.body), 0o644)
		b.do(t, chromedp.Evaluate[chromedp.Void](`document.getElementById("banner").hidden = true`),
			chromedp.SetUploadFiles(chromedp.ID("file-import"), []string{f}))
		b.waitFor(t, `!document.getElementById("banner").hidden`)
		msg := eval[string](t, b, `document.getElementById("banner").textContent`)
		if !strings.Contains(msg, "Nothing was changed") || !strings.Contains(msg, tc.want) {
			t.Errorf("%s: message %q, want it to say nothing changed and name %q", tc.name, msg, tc.want)
		}
		if s := eval[string](t, b, `localStorage.getItem("drawsift.scenario.v1")`); s != stored {
			t.Errorf("%s: the stored scenario changed:\n%s\n→\n%s", tc.name, stored, s)
		}
		if r := eval[[]pageRow](t, b, jsRows); fmt.Sprint(r) != fmt.Sprint(rows) {
			t.Errorf("%s: the ranking changed", tc.name)
		}
		if eval[int](t, b, `document.querySelectorAll("img").length`) != 0 {
			t.Errorf("%s: imported text became markup", tc.name)
		}
	}
	b.screenshot(t, "import-error")
}

// jsClicks records, for each button the page handles a click on, the
// robustness state (body data-robust) at that moment. Installed once per
// page; a capturing listener on window runs before the page's own.
const jsClicks = `window.__clicks = window.__clicks || (addEventListener("click", e => {
	const b = e.target.closest && e.target.closest("button");
	if (b) window.__clicks[b.id] = document.body.dataset.robust;
}, true), {})`

// robustRun starts a robustness run with the real mouse and waits until
// the page reports it running with progress, or finished.
func robustRun(t *testing.T, b *browserSession) {
	t.Helper()
	b.do(t, chromedp.Evaluate[chromedp.Void](`delete document.body.dataset.robust`), chromedp.Click(chromedp.ID("btn-robust")))
	b.waitFor(t, `(d => d.robust === "running" && Number(d.robustProgress) > 0 || d.robust === "done" || d.robust === "error")(document.body.dataset)`)
}

// clickDuring clicks a button with the real mouse and returns the
// robustness state at the moment the page handled the click; "" when it
// handled none (a disabled button) and the run has ended.
func clickDuring(t *testing.T, b *browserSession, id string) string {
	t.Helper()
	b.do(t, chromedp.Evaluate[chromedp.Void](jsClicks+`; delete window.__clicks[`+fmt.Sprintf("%q", id)+`]`), chromedp.Click(chromedp.ID(id)))
	b.waitFor(t, fmt.Sprintf(`%q in window.__clicks || !["running", undefined].includes(document.body.dataset.robust)`, id))
	return eval[string](t, b, fmt.Sprintf(`window.__clicks[%q] || ""`, id))
}

// robustAttempts bounds the runs tried until a click lands while one is
// running (each of 20000 samples takes seconds; one attempt is the rule).
const robustAttempts = 3

// TestPageRobustness runs a long robustness job: progress arrives, the page
// answers while it runs, the figures appear; a second run is cancelled.
func TestPageRobustness(t *testing.T) {
	b, run := openServed(t)
	b.do(t, chromedp.SetValue(chromedp.ID("unc-samples"), "20000"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("unc-samples").dispatchEvent(new Event("change", {bubbles: true}))`))
	b.waitFor(t, `JSON.parse(localStorage.getItem("drawsift.scenario.v1")).uncertainty.samples === 20000`)
	b.waitRun(t, run)
	// The page stays responsive: a tab switch by mouse is handled while
	// the engine works in its worker (the page records the run's state
	// when it handles the click).
	for attempt := 1; ; attempt++ {
		robustRun(t, b)
		start := time.Now()
		during := clickDuring(t, b, "tab-sources")
		if during == "running" {
			if eval[string](t, b, `document.getElementById("tab-sources").getAttribute("aria-selected")`) != "true" {
				t.Error("the tab did not switch during the robustness run")
			}
			t.Logf("tab switch during the run took %v", time.Since(start))
			b.screenshot(t, "running")
			b.do(t, chromedp.Click(chromedp.ID("tab-ranking")))
		}
		b.waitFor(t, `["done", "error"].includes(document.body.dataset.robust)`)
		if st := eval[string](t, b, `document.body.dataset.robust`); st != "done" {
			t.Fatalf("the robustness run ended %s: %s", st, eval[string](t, b, `document.getElementById("run-error").textContent`))
		}
		if eval[int](t, b, `Number(document.body.dataset.robustProgress)`) == 0 {
			t.Error("the robustness run ended before any progress was seen; 20000 samples should take longer")
		}
		if during == "running" {
			break
		}
		if attempt == robustAttempts {
			t.Errorf("in %d runs of 20000 samples the page handled no click while one ran", attempt)
			break
		}
	}
	n := eval[int](t, b, `document.querySelectorAll("#robust-table tbody tr[data-solute]").length`)
	if n != len(eval[[]pageRow](t, b, jsRows)) {
		t.Errorf("robustness rows %d, ranked candidates %d", n, len(eval[[]pageRow](t, b, jsRows)))
	}
	b.screenshot(t, "robust")

	// Cancel a second run: a cancel the page handles while the run is on
	// ends it as cancelled.
	for attempt := 1; ; attempt++ {
		robustRun(t, b)
		during := clickDuring(t, b, "btn-robust-cancel")
		b.waitFor(t, `["done", "cancelled", "error"].includes(document.body.dataset.robust)`)
		st := eval[string](t, b, `document.body.dataset.robust`)
		if during == "running" {
			if st != "cancelled" {
				t.Errorf("a cancel during the run ended it %s", st)
			}
			break
		}
		if attempt == robustAttempts {
			t.Errorf("in %d runs of 20000 samples the page handled no cancel while one ran", attempt)
			break
		}
	}
	// The engine still answers after the cancel.
	run = eval[string](t, b, `document.body.dataset.run`)
	b.do(t, chromedp.Click(chromedp.ID("btn-screen")))
	b.waitRun(t, run)
}

// robustOn runs the page's robustness run of samples split between
// workers (the page's own choice overridden) and fails unless it ends
// done on that many workers.
func robustOn(t testing.TB, b *browserSession, workers, samples int) {
	t.Helper()
	b.do(t, chromedp.Evaluate[chromedp.Void](fmt.Sprintf(`window.DrawsiftPage.state.robustWorkers = %d`, workers)),
		chromedp.SetValue(chromedp.ID("unc-samples"), strconv.Itoa(samples)),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("unc-samples").dispatchEvent(new Event("change", {bubbles: true}))`))
	b.do(t, chromedp.Evaluate[chromedp.Void](`delete document.body.dataset.robust`), chromedp.Click(chromedp.ID("btn-robust")))
	// Awaited on the page's own mutations, not on every animation frame:
	// a poll per frame would keep a core busy beside the workers timed.
	b.waitForMutation(t, `["done", "error", "cancelled"].includes(document.body.dataset.robust)`)
	if st := eval[string](t, b, `document.body.dataset.robust`); st != "done" {
		t.Fatalf("the run on %d workers ended %s: %s", workers, st, eval[string](t, b, `document.getElementById("run-error").textContent`))
	}
	if got := eval[string](t, b, `document.body.dataset.robustWorkers`); got != strconv.Itoa(workers) {
		t.Fatalf("the run used %s workers, want %d", got, workers)
	}
}

// robustRows is what the robustness tests read of a screen answer.
type robustRows struct {
	Candidates []struct {
		Solute     string `json:"solute"`
		Robustness struct {
			RankCounts []int   `json:"rank_counts"`
			PTop3      float64 `json:"probability_top3"`
		} `json:"robustness"`
	} `json:"candidates"`
}

// TestPageRobustnessWorkers: a robustness run split between two Web
// Workers (each a part of the samples, added up by the engine's
// robustness-merge) gives exactly the answer of one worker, and the
// figures of the native engine's run of the same request within the
// last-bit differences of js/wasm math (a sample may rank two near-tied
// candidates the other way round).
func TestPageRobustnessWorkers(t *testing.T) {
	b, _ := openServed(t)
	runWith := func(workers int) string {
		robustOn(t, b, workers, 401)
		return eval[string](t, b, `JSON.stringify(window.DrawsiftPage.state.robust)`)
	}
	one, two := runWith(1), runWith(2)
	if one != two {
		t.Fatalf("2 workers answered\n%s\n1 worker\n%s", two, one)
	}
	// A ranking of the same edit ending after the run (as the edit's
	// debounced ranking may) keeps its figures.
	run := eval[string](t, b, `document.body.dataset.run`)
	b.do(t, chromedp.Evaluate[chromedp.Void](`window.DrawsiftPage.runScreen(), undefined`))
	b.waitRun(t, run)
	if eval[bool](t, b, `window.DrawsiftPage.state.robust === null`) {
		t.Error("a ranking of the same scenario dropped the robustness figures")
	}
	var page struct {
		robustRows
		Scenario json.RawMessage `json:"scenario"`
	}
	if err := json.Unmarshal([]byte(two), &page); err != nil {
		t.Fatal(err)
	}
	if bytes.Contains(page.Scenario, []byte(`"shard"`)) {
		t.Errorf("the merged answer echoes a part's shard: %s", page.Scenario)
	}
	out, e := api.Dispatch(context.Background(), api.OpScreen, page.Scenario)
	if e != nil {
		t.Fatalf("native run of the page's request: %s", out)
	}
	var nat robustRows
	if err := json.Unmarshal(out, &nat); err != nil {
		t.Fatal(err)
	}
	if len(nat.Candidates) != len(page.Candidates) {
		t.Fatalf("page ranks %d candidates, native %d", len(page.Candidates), len(nat.Candidates))
	}
	for i, c := range page.Candidates {
		n := nat.Candidates[i]
		sum := 0
		for _, k := range c.Robustness.RankCounts {
			sum += k
		}
		if c.Solute != n.Solute || sum != 401 || math.Abs(c.Robustness.PTop3-n.Robustness.PTop3) > 0.01 {
			t.Errorf("%s: page counts %v (P(top 3) %g); native %s %v (%g)", c.Solute, c.Robustness.RankCounts, c.Robustness.PTop3,
				n.Solute, n.Robustness.RankCounts, n.Robustness.PTop3)
		}
	}
}

// TestPagePrintReport prints to PDF and finds the report's sections.
func TestPagePrintReport(t *testing.T) {
	b, _ := openServed(t)
	b.waitPlots(t)
	// In print media the report shows and the controls do not.
	if _, err := chromedp.Run(b.ctx, chromedp.Action[chromedp.Void](func(ctx context.Context, tg *chromedp.Target) (chromedp.Void, error) {
		_, err := chromedp.Call(ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: "print"})
		return chromedp.Void{}, err
	})); err != nil {
		t.Fatal(err)
	}
	sections := eval[[]string](t, b, `Array.from(document.querySelectorAll("#report h2")).filter(h => h.offsetParent !== null).map(h => h.textContent)`)
	want := []string{"Cautions", "Inputs", "Model choices", "Results", "Plots", "Sources"}
	if fmt.Sprint(sections) != fmt.Sprint(want) {
		t.Errorf("printed sections %v, want %v", sections, want)
	}
	if eval[bool](t, b, `document.getElementById("scenario-form").offsetParent !== null`) {
		t.Error("the form prints")
	}
	ranked := len(eval[[]pageRow](t, b, jsRows))
	if n := eval[int](t, b, `document.querySelectorAll("#rp-results table.ranking tbody tr").length`); n != ranked {
		t.Errorf("the report's table has %d rows", n)
	}
	// The mineral saturation table: the bulk feed and each candidate's face.
	if n := eval[int](t, b, `document.querySelectorAll("#rp-results table.scaling tbody tr").length`); n != ranked+1 {
		t.Errorf("the report's saturation table has %d rows, want %d", n, ranked+1)
	}
	if n := eval[int](t, b, `document.querySelectorAll("#rp-plots svg").length`); n != 4 {
		t.Errorf("the report has %d plots, want 4", n)
	}
	pdf, err := chromedp.Run(b.ctx, chromedp.PrintToPDF(chromedp.PDFPaper(chromedp.PaperA4), chromedp.PDFOutlineAndTagged()))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(pdf, []byte("%PDF-")) {
		t.Fatalf("not a PDF: %q", pdf[:min(len(pdf), 20)])
	}
	// The printed pages hold the report's title and every section.
	squash := func(s string) string { return strings.Join(strings.Fields(s), "") }
	text := squash(pdfText(t, pdf))
	for _, s := range append([]string{"Drawsift screening report", "Screening estimates, not a design"}, want...) {
		if !strings.Contains(text, squash(s)) {
			t.Errorf("the PDF's text lacks %q", s)
		}
	}
	if !strings.Contains(text, "KCl") || !strings.Contains(text, "NaCl") {
		t.Error("the PDF's text lacks the ranked solutes")
	}
	if !strings.Contains(text, squash("Mineral saturation of the feed")) || !strings.Contains(text, "gypsum") {
		t.Error("the PDF's text lacks the mineral saturation table")
	}
	// Compact: the caption says what the table is (not how to sort it), each
	// note is printed once with the candidates it concerns, and the whole
	// report — inputs, ranking, saturation, exclusions, warnings, four plots
	// two to a page, sources — fits a few A4 pages.
	if strings.Contains(text, squash("select a column heading to sort")) {
		t.Error("the on-screen caption is printed")
	}
	notes := eval[[]string](t, b, `Array.from(document.querySelectorAll("#rp-results .rp-warnings li")).map(li => li.textContent)`)
	seen := map[string]bool{}
	for _, n := range notes {
		if seen[n] {
			t.Errorf("the report repeats the note %q", n)
		}
		seen[n] = true
	}
	if c := strings.Count(text, squash("Sherwood correlation quoted from memory")); c > 2 {
		t.Errorf("the report prints the Sherwood note %d times", c)
	}
	pages := len(regexp.MustCompile(`/Type\s*/Page[^s]`).FindAll(pdf, -1))
	t.Logf("the report prints on %d A4 pages", pages)
	b.screenshot(t, "print")
	if pages > 6 {
		t.Errorf("the report takes %d A4 pages, want at most 6", pages)
	}
	dir := filepath.Join(moduleRoot(t), "testdata", "artifacts")
	os.MkdirAll(dir, 0o755)
	os.WriteFile(filepath.Join(dir, "report.pdf"), pdf, 0o644)
}

// pdfText extracts the text of a PDF as Chromium writes it: Flate
// content streams showing glyph codes of Type0 fonts (Identity-H), each
// font with a ToUnicode CMap. Enough to find headings; not a general PDF
// reader.
func pdfText(t testing.TB, pdf []byte) string {
	t.Helper()
	objs := map[string][]byte{}
	for _, m := range regexp.MustCompile(`(?s)(\d+) 0 obj(.*?)endobj`).FindAllSubmatch(pdf, -1) {
		objs[string(m[1])] = m[2]
	}
	stream := func(o []byte) []byte {
		i := bytes.Index(o, []byte("stream"))
		j := bytes.LastIndex(o, []byte("endstream"))
		if i < 0 || j < i {
			return nil
		}
		data := bytes.TrimLeft(o[i+len("stream"):j], "\r\n")
		if !bytes.Contains(o[:i], []byte("/FlateDecode")) {
			return data
		}
		zr, err := zlib.NewReader(bytes.NewReader(data))
		if err != nil {
			return nil
		}
		out, _ := io.ReadAll(zr)
		return out
	}
	hexRE := regexp.MustCompile(`<([0-9A-Fa-f]+)>`)
	utf16 := func(h string) string {
		var sb strings.Builder
		for i := 0; i+3 < len(h); i += 4 {
			var r rune
			fmt.Sscanf(h[i:i+4], "%04X", &r)
			sb.WriteRune(r)
		}
		return sb.String()
	}
	// Fonts: object number → code → text.
	cmaps := map[string]map[string]string{}
	for n, o := range objs {
		m := regexp.MustCompile(`/ToUnicode (\d+) 0 R`).FindSubmatch(o)
		if m == nil {
			continue
		}
		cm := map[string]string{}
		body := string(stream(objs[string(m[1])]))
		for _, blk := range regexp.MustCompile(`(?s)beginbfchar(.*?)endbfchar`).FindAllStringSubmatch(body, -1) {
			hs := hexRE.FindAllStringSubmatch(blk[1], -1)
			for i := 0; i+1 < len(hs); i += 2 {
				cm[strings.ToUpper(hs[i][1])] = utf16(hs[i+1][1])
			}
		}
		for _, blk := range regexp.MustCompile(`(?s)beginbfrange(.*?)endbfrange`).FindAllStringSubmatch(body, -1) {
			for _, line := range strings.Split(blk[1], "\n") {
				hs := hexRE.FindAllStringSubmatch(line, -1)
				if len(hs) != 3 {
					continue
				}
				var lo, hi, dst int
				fmt.Sscanf(hs[0][1], "%X", &lo)
				fmt.Sscanf(hs[1][1], "%X", &hi)
				fmt.Sscanf(hs[2][1], "%X", &dst)
				for c := lo; c <= hi && c-lo < 65536; c++ {
					cm[fmt.Sprintf("%0*X", len(hs[0][1]), c)] = string(rune(dst + c - lo))
				}
			}
		}
		cmaps[n] = cm
	}
	// Font resource names (/F5 5 0 R) → object numbers.
	names := map[string]string{}
	for _, m := range regexp.MustCompile(`/(F\d+) (\d+) 0 R`).FindAllSubmatch(pdf, -1) {
		names[string(m[1])] = string(m[2])
	}
	var sb strings.Builder
	tok := regexp.MustCompile(`/(F\d+)\s+[\d.]+\s+Tf|<([0-9A-Fa-f]*)>|\b(Td|TD|T\*|Tm|ET)\b`)
	for _, o := range objs {
		if bytes.Contains(o, []byte("/ToUnicode")) || !bytes.Contains(o, []byte("stream")) {
			continue
		}
		content := stream(o)
		if !bytes.Contains(content, []byte("Tf")) {
			continue
		}
		var cm map[string]string
		for _, m := range tok.FindAllSubmatch(content, -1) {
			switch {
			case m[1] != nil:
				cm = cmaps[names[string(m[1])]]
			case m[3] != nil:
				sb.WriteByte('\n')
			case cm != nil:
				h := strings.ToUpper(string(m[2]))
				for i := 0; i+3 < len(h); i += 4 {
					sb.WriteString(cm[h[i:i+4]])
				}
			}
		}
	}
	return sb.String()
}

// TestBundleFromFile opens the single-file bundle from file://: the demo
// loads and ranks as the engine does natively, and the page asks the
// network for nothing.
func TestBundleFromFile(t *testing.T) {
	p := pageBuild(t)
	b := browser(t)
	var mu sync.Mutex
	var urls []string
	if _, err := chromedp.Call(b.ctx, network.Enable, network.EnableParams{}); err != nil {
		t.Fatal(err)
	}
	chromedp.Listen(b.ctx, func(ev any) {
		if e, ok := ev.(*network.EventRequestWillBeSent); ok {
			mu.Lock()
			urls = append(urls, e.Request.URL)
			mu.Unlock()
		}
	})
	b.do(t, chromedp.Navigate("file://"+p.bundle))
	b.waitRun(t, "")
	rows := eval[[]pageRow](t, b, jsRows)
	sameRanking(t, rows, native(t, pageScenario(t, b)))
	sameRanking(t, rows, native(t, demoScenario(t)))
	if v := eval[string](t, b, `document.getElementById("engine-status").textContent`); !strings.Contains(v, api.EngineVersion) {
		t.Errorf("engine status %q lacks the version %s", v, api.EngineVersion)
	}
	b.waitPlots(t)
	b.screenshot(t, "bundle")
	// A share link from the file says it works only where the file is.
	b.do(t, chromedp.Click(chromedp.ID("btn-share")))
	b.waitFor(t, `document.body.dataset.share === "file"`)
	if msg := eval[string](t, b, `document.getElementById("banner").textContent`); !strings.Contains(msg, "opened from a file") {
		t.Errorf("the file page's share link says %q", msg)
	}
	// A robustness run split between two workers, each built from the
	// page's Blob on the one compiled module, completes offline too.
	robustOn(t, b, 2, 200)
	mu.Lock()
	defer mu.Unlock()
	for _, u := range urls {
		if !strings.HasPrefix(u, "file://") && !strings.HasPrefix(u, "data:") && !strings.HasPrefix(u, "blob:") {
			t.Errorf("the bundle requested %s", u)
		}
	}
}

// TestPageOffline visits once, stops the server, reloads: the service
// worker serves the page and its engine.
func TestPageOffline(t *testing.T) {
	p := pageBuild(t)
	b := browser(t)
	url, stop := startServe(t, p)
	b.do(t, chromedp.Navigate(url))
	b.waitRun(t, "")
	// The service worker becomes active (ready) only once its install has
	// cached every file of its list (sw.js: waitUntil(cache.addAll)).
	n := eval[int](t, b, `navigator.serviceWorker.ready.then(() => caches.keys()).then(ks => Promise.all(ks.map(k => caches.open(k).then(c => c.keys())))).then(a => a.flat().length)`)
	if n < 12 {
		t.Fatalf("the active service worker has cached %d files", n)
	}
	stop()
	if _, err := http.Get(url); err == nil {
		t.Fatal("the server still answers")
	}
	b.do(t, chromedp.Reload())
	b.waitRun(t, "")
	rows := eval[[]pageRow](t, b, jsRows)
	sameRanking(t, rows, native(t, pageScenario(t, b)))
	b.screenshot(t, "offline")
}

// TestPageNetworkOwnOrigin: served, the page requests only its own origin.
func TestPageNetworkOwnOrigin(t *testing.T) {
	p := pageBuild(t)
	b := browser(t)
	url, _ := startServe(t, p)
	var mu sync.Mutex
	var urls []string
	if _, err := chromedp.Call(b.ctx, network.Enable, network.EnableParams{}); err != nil {
		t.Fatal(err)
	}
	chromedp.Listen(b.ctx, func(ev any) {
		if e, ok := ev.(*network.EventRequestWillBeSent); ok {
			mu.Lock()
			urls = append(urls, e.Request.URL)
			mu.Unlock()
		}
	})
	b.do(t, chromedp.Navigate(url))
	b.waitRun(t, "")
	b.waitPlots(t)
	mu.Lock()
	defer mu.Unlock()
	if len(urls) == 0 {
		t.Fatal("no requests seen")
	}
	for _, u := range urls {
		if !strings.HasPrefix(u, url) && !strings.HasPrefix(u, "blob:") && !strings.HasPrefix(u, "data:") {
			t.Errorf("the page requested %s (own origin %s)", u, url)
		}
	}
}

// TestPageAccessible checks that every control has a label, the tabs work
// from the keyboard, and the layout fits a tablet.
func TestPageAccessible(t *testing.T) {
	b, _ := openServed(t)
	unlabelled := eval[[]string](t, b, `Array.from(document.querySelectorAll("input, select, textarea, button")).filter(e => {
		if (e.type === "hidden") return false;
		const name = (e.labels && e.labels.length) || e.getAttribute("aria-label") || e.getAttribute("aria-labelledby") || (e.tagName === "BUTTON" && e.textContent.trim());
		return !name;
	}).map(e => e.outerHTML.slice(0, 80))`)
	if len(unlabelled) > 0 {
		t.Errorf("controls without a label: %v", unlabelled)
	}
	// Arrow keys move between tabs.
	b.do(t, chromedp.Focus(chromedp.ID("tab-ranking")), chromedp.SendKeys(chromedp.ID("tab-ranking"), kb.ArrowRight))
	if got := eval[string](t, b, `document.activeElement.id + " " + document.getElementById("tab-plots").getAttribute("aria-selected")`); got != "tab-plots true" {
		t.Errorf("after ArrowRight on the first tab: %q", got)
	}
	// Tablet width: one column, nothing wider than the viewport.
	if _, err := chromedp.Call(b.ctx, emulation.SetDeviceMetricsOverride, emulation.SetDeviceMetricsOverrideParams{Width: 768, Height: 1024, DeviceScaleFactor: 1, Mobile: true}); err != nil {
		t.Fatal(err)
	}
	b.waitFor(t, `document.documentElement.scrollWidth <= innerWidth + 1`)
	b.screenshot(t, "tablet")
}

// ---- the benchmark ----------------------------------------------------------------

// BenchmarkPageFirstResult measures, in headless Chromium, the time from
// navigation to the first ranked result (served and from the bundle), and
// reports the sizes: the wasm raw and gzip, and the bundle.
func BenchmarkPageFirstResult(b *testing.B) {
	p := pageBuild(b)
	wasm, err := os.ReadFile(p.wasm)
	if err != nil {
		b.Fatal(err)
	}
	bundle, err := os.Stat(p.bundle)
	if err != nil {
		b.Fatal(err)
	}
	url, _ := startServe(b, p)
	// The page's marks (performance.mark in engine.js and app.js), in ms
	// after navigation: where the time to the first result goes.
	phases := []string{"ds:compiled:drawsift.wasm", "ds:engine-ready", "ds:library-read", "ds:form-built", "ds:first-answer", "ds:first-result"}
	for _, target := range []struct{ name, url string }{{"served", url}, {"bundle", "file://" + p.bundle}} {
		b.Run(target.name, func(b *testing.B) {
			var first, again []float64
			at := make([][]float64, len(phases))
			for i := 0; i < b.N; i++ {
				bs := browser(b) // a fresh profile each time: a first visit
				b.ResetTimer()
				bs.do(b, chromedp.Navigate(target.url))
				bs.waitRun(b, "")
				first = append(first, eval[float64](b, bs, `Number(document.body.dataset.firstResultMs)`))
				marks := eval[map[string]float64](b, bs, `Object.fromEntries(performance.getEntriesByType("mark").map(m => [m.name, m.startTime]))`)
				for k, ph := range phases {
					at[k] = append(at[k], marks[ph])
				}
				// A revisit in the same profile, once start-up is over: the
				// browser's caches (and the service worker when served) now
				// hold the page and the compiled engine.
				if target.name == "served" {
					bs.waitFor(b, jsStartedUp)
				} else {
					bs.waitFor(b, `document.body.dataset.warm === "done"`) // no service worker from file://
				}
				bs.do(b, chromedp.Navigate(target.url))
				bs.waitRun(b, "")
				again = append(again, eval[float64](b, bs, `Number(document.body.dataset.firstResultMs)`))
			}
			b.ReportMetric(median(first), "ms/first-result")
			b.ReportMetric(spread(first), "ms-spread/first-result")
			b.ReportMetric(median(again), "ms/first-result-revisit")
			for k, ph := range phases {
				b.ReportMetric(median(at[k]), "ms/"+strings.TrimPrefix(strings.TrimSuffix(ph, ":drawsift.wasm"), "ds:"))
			}
			b.ReportMetric(float64(len(wasm)), "wasm-bytes")
			b.ReportMetric(float64(gzipLen(wasm)), "wasm-gzip-bytes")
			b.ReportMetric(float64(bundle.Size()), "bundle-bytes")
		})
	}
}

// jsTimeScreens runs the page's current scenario through its engine n
// times, one after another as edits would, and returns each round trip
// in ms (the worker's message, the engine, the reply parsed).
const jsTimeScreens = `(async n => {
	const P = window.DrawsiftPage, sc = P.engineScenario(P.state.scenario, false), out = [];
	for (let i = 0; i < n; i++) {
		const t0 = performance.now();
		const r = await P.state.engine.call("screen", sc);
		if (!r.ok) throw new Error(JSON.stringify(r.data));
		out.push(performance.now() - t0);
	}
	return out;
})`

// jsStartedUp holds once the served page's start-up is over: the engine
// warmed up after the first result and the offline copy saved (the
// service worker's install, registered after the warm-up, reads every
// file).
const jsStartedUp = `document.body.dataset.warm === "done" && document.body.dataset.offline !== undefined`

// BenchmarkPageWarmScreen: the demo screen's round trip in the page once
// the page has started (jsStartedUp): the first screens after start-up,
// and the steady state (the median of screens 21–40).
func BenchmarkPageWarmScreen(b *testing.B) {
	p := pageBuild(b)
	url, _ := startServe(b, p)
	var early, steady []float64
	for i := 0; i < b.N; i++ {
		bs := browser(b)
		bs.do(b, chromedp.Navigate(url))
		bs.waitRun(b, "")
		bs.waitFor(b, jsStartedUp)
		ms := eval[[]float64](b, bs, jsTimeScreens+`(40)`)
		early = append(early, median(ms[:5]))
		steady = append(steady, median(ms[20:]))
	}
	b.ReportMetric(median(early), "ms/screen-first5")
	b.ReportMetric(median(steady), "ms/screen-steady")
	b.ReportMetric(spread(steady), "ms-spread/screen-steady")
}

// BenchmarkPageRobustness: 1,000 samples of the demo scenario in the
// page once it has warmed up, on one worker and on every worker the page
// uses (navigator.hardwareConcurrency, at most 4), the helpers started.
func BenchmarkPageRobustness(b *testing.B) {
	p := pageBuild(b)
	url, _ := startServe(b, p)
	bs := browser(b)
	bs.do(b, chromedp.Navigate(url))
	bs.waitRun(b, "")
	bs.waitFor(b, jsStartedUp)
	cores := eval[int](b, bs, `window.DrawsiftPage.robustWorkerCount()`)
	var times [2][]float64
	// One split run first, not counted: it starts the helper workers.
	for i := -1; i < b.N; i++ {
		for k, workers := range []int{1, cores} {
			if i < 0 && k == 0 {
				continue
			}
			robustOn(b, bs, workers, 1000)
			if i >= 0 {
				times[k] = append(times[k], eval[float64](b, bs, `Number(document.body.dataset.robustMs)`))
			}
		}
	}
	b.ReportMetric(median(times[0]), "ms/robust-1-worker")
	b.ReportMetric(median(times[1]), fmt.Sprintf("ms/robust-%d-workers", cores))
	b.ReportMetric(median(times[0])/median(times[1]), "speed-up")
}

// median and spread (max − min) of a benchmark's samples.
func median(x []float64) float64 {
	y := append([]float64(nil), x...)
	sort.Float64s(y)
	if len(y) == 0 {
		return 0
	}
	return (y[(len(y)-1)/2] + y[len(y)/2]) / 2
}

func spread(x []float64) float64 {
	if len(x) == 0 {
		return 0
	}
	return slices.Max(x) - slices.Min(x)
}

// gzipFile writes p.gz (gzip -9).
func gzipFile(p string) error {
	b, err := os.ReadFile(p)
	if err != nil {
		return err
	}
	var buf bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&buf, gzip.BestCompression)
	zw.Write(b)
	if err := zw.Close(); err != nil {
		return err
	}
	return os.WriteFile(p+".gz", buf.Bytes(), 0o644)
}

func gzipLen(b []byte) int {
	var buf bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&buf, gzip.BestCompression)
	zw.Write(b)
	zw.Close()
	return buf.Len()
}

// TestPageFieldError: a value past the engine's limit is reported beside
// its field, naming the field and the limit, and the input is kept.
func TestPageFieldError(t *testing.T) {
	b, _ := openServed(t)
	b.do(t, chromedp.SetValue(chromedp.ID("temp"), "150"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("temp").dispatchEvent(new Event("input", {bubbles: true}))`))
	if run := b.settle(t); !strings.HasPrefix(run, "error-") {
		t.Fatalf("the run of 150 °C ended %s, want the engine's error", run)
	}
	msg := eval[string](t, b, `document.querySelector('.field-error[data-for="operation"]').textContent`)
	if !strings.Contains(msg, "temperature_c") || !strings.Contains(msg, "0–100") {
		t.Errorf("field error %q should name temperature_c and its limit", msg)
	}
	if eval[string](t, b, `document.getElementById("temp").getAttribute("aria-invalid")`) != "true" {
		t.Error("the temperature input is not marked invalid")
	}
	if v := eval[string](t, b, `document.getElementById("temp").value`); v != "150" {
		t.Errorf("the user's input was changed to %q", v)
	}
	b.screenshot(t, "error")
}

// TestPageShareLink: a link made in one browser opens the same scenario
// and ranking in another.
func TestPageShareLink(t *testing.T) {
	b, run := openServed(t)
	b.do(t, chromedp.SetValue(chromedp.ID("basis-value"), "55"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("basis-value").dispatchEvent(new Event("input", {bubbles: true}))`))
	b.waitRun(t, run)
	want := eval[[]pageRow](t, b, jsRows)
	b.do(t, chromedp.Click(chromedp.ID("btn-share")))
	b.waitFor(t, `location.hash.startsWith("#s=z")`)
	link := eval[string](t, b, `location.href`)
	sc := pageScenario(t, b)

	b2 := browser(t)
	b2.do(t, chromedp.Navigate(link))
	b2.waitRun(t, "")
	if v := eval[string](t, b2, `document.getElementById("basis-value").value`); v != "55" {
		t.Errorf("the shared scenario's basis value is %q, want 55", v)
	}
	got := eval[[]pageRow](t, b2, jsRows)
	sameRanking(t, got, native(t, sc))
	if fmt.Sprint(got) != fmt.Sprint(want) {
		t.Errorf("shared ranking %v, original %v", got, want)
	}
}

// TestPageCustomSolute adds a solute with a pasted π(c) table: it joins the
// library and the screen, ranks as the engine ranks it natively, and its
// measured points are plotted. A broken table is refused with a message.
func TestPageCustomSolute(t *testing.T) {
	b, run := openServed(t)
	b.do(t, chromedp.Click(chromedp.ID("tab-candidates")),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("custom-box").open = true`))
	fill := func(id, v string) {
		b.do(t, chromedp.SetValue(chromedp.ID(id), v))
	}
	// A table whose concentrations go down is refused.
	fill("cs-id", "Draw-X")
	fill("cs-mm", "120")
	fill("cs-nu", "2")
	fill("cs-d", "1.2")
	fill("cs-sol", "4")
	fill("cs-pmin", "0.5")
	fill("cs-pmax", "1.5")
	fill("cs-table", "0.5, 24\n0.4, 20")
	b.do(t, chromedp.Click(chromedp.CSS(`#custom-form button[type=submit]`)))
	b.waitFor(t, `document.getElementById("cs-error").textContent !== ""`)
	if msg := eval[string](t, b, `document.getElementById("cs-error").textContent`); !strings.Contains(msg, "must increase") {
		t.Errorf("broken table: message %q", msg)
	}
	if eval[bool](t, b, `!!document.querySelector('#lib-list li[data-solute="Draw-X"]')`) {
		t.Fatal("a refused solute joined the library")
	}
	// A π of 1e308 bar (it would break every later screen) is refused with the engine's bound.
	fill("cs-table", "0.5, 24\n1.0, 1e308")
	b.do(t, chromedp.Evaluate[chromedp.Void](`document.getElementById("cs-error").textContent = ""`), chromedp.Click(chromedp.CSS(`#custom-form button[type=submit]`)))
	b.waitFor(t, `document.getElementById("cs-error").textContent !== ""`)
	if msg := eval[string](t, b, `document.getElementById("cs-error").textContent`); !strings.Contains(msg, "10000 bar") {
		t.Errorf("π of 1e308 bar: message %q", msg)
	}
	fill("cs-table", "# c (mol/kg), π (bar)\n0.5, 24.1\n1.0, 49.5\n1.5, 76.0\n2.0, 104")
	b.do(t, chromedp.Click(chromedp.CSS(`#custom-form button[type=submit]`)))
	b.waitFor(t, `!!document.querySelector('#lib-list li[data-solute="Draw-X"] input:checked')`)
	b.waitRun(t, run)
	b.waitFor(t, `!!document.querySelector('#ranking tbody tr[data-solute="Draw-X"]')`)
	sc := pageScenario(t, b)
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, sc))
	b.screenshot(t, "custom")
	// Restored after a reload, with its table.
	b.do(t, chromedp.Reload())
	b.waitRun(t, "")
	if !eval[bool](t, b, `!!document.querySelector('#ranking tbody tr[data-solute="Draw-X"]')`) {
		t.Error("the custom solute is gone after a reload")
	}
	b.do(t, chromedp.Evaluate[chromedp.Void](`document.getElementById("plot-count").value = "all"; document.getElementById("plot-count").dispatchEvent(new Event("change"))`))
	b.waitFor(t, `Array.from(document.querySelectorAll('#plots [data-plot="osmotic-pressure"] text')).some(e => e.textContent.includes("Draw-X (custom; dots: measured"))`)
}

// TestPageExports downloads the CSV, the JSON and a chart's SVG and PNG.
func TestPageExports(t *testing.T) {
	p := pageBuild(t)
	b := browser(t)
	url, _ := startServe(t, p)
	dir := t.TempDir()
	// The browser reports each download's name as it begins and its end
	// (Browser.downloadWillBegin, Browser.downloadProgress "completed").
	var mu sync.Mutex
	names := map[string]string{} // download id → file name
	done := map[string]bool{}    // file name → completed
	ended := make(chan struct{}, 1)
	if err := chromedp.ListenBrowser(b.ctx, func(ev any) {
		switch e := ev.(type) {
		case *cdpbrowser.EventDownloadWillBegin:
			mu.Lock()
			names[e.GUID] = e.SuggestedFilename
			mu.Unlock()
		case *cdpbrowser.EventDownloadProgress:
			if e.State == cdpbrowser.DownloadProgressStateCompleted {
				mu.Lock()
				done[names[e.GUID]] = true
				mu.Unlock()
				select {
				case ended <- struct{}{}:
				default:
				}
			}
		}
	}); err != nil {
		t.Fatal(err)
	}
	events := true
	if _, err := chromedp.CallBrowser(b.ctx, cdpbrowser.SetDownloadBehavior, cdpbrowser.SetDownloadBehaviorParams{
		Behavior: cdpbrowser.SetDownloadBehaviorBehaviorAllow, DownloadPath: dir, EventsEnabled: &events}); err != nil {
		t.Fatal(err)
	}
	b.do(t, chromedp.Navigate(url))
	b.waitRun(t, "")
	b.waitPlots(t)
	wait := func(name string) []byte {
		t.Helper()
		limit := time.After(patience)
		for {
			mu.Lock()
			ok := done[name]
			mu.Unlock()
			if ok {
				b, err := os.ReadFile(filepath.Join(dir, name))
				if err != nil {
					t.Fatalf("%s was downloaded but cannot be read: %v", name, err)
				}
				return b
			}
			select {
			case <-ended:
			case <-limit:
				t.Fatalf("%s was not downloaded", name)
			case <-b.ctx.Done():
				t.Fatalf("%s was not downloaded: %v", name, b.ctx.Err())
			}
		}
	}
	rows := eval[[]pageRow](t, b, jsRows)
	b.do(t, chromedp.Click(chromedp.ID("btn-csv")))
	csv := string(wait("drawsift-ranking.csv"))
	// UTF-8 with a byte-order mark; a header block with the cautions and
	// the scenario; then the one table with the CLI's columns; numbers
	// with at most 6 significant digits.
	if !strings.HasPrefix(csv, "\ufeffDrawsift screening result,") {
		t.Errorf("CSV starts %q", csv[:min(len(csv), 60)])
	}
	lines := strings.Split(strings.TrimSpace(strings.TrimPrefix(csv, "\ufeff")), "\r\n")
	head := -1
	for i, l := range lines {
		if strings.HasPrefix(l, "rank,solute,") {
			head = i
			break
		}
	}
	if head < 0 || !strings.Contains(csv, "\r\ncaution,") || !strings.Contains(csv, "\r\nscenario (JSON),") || lines[head-1] != "" {
		t.Fatalf("CSV header block or table missing:\n%s", csv)
	}
	cli := exec.Command(p.bin, "screen", "--format", "csv")
	body, _ := json.Marshal(nativeRequest(pageScenario(t, b)))
	cli.Stdin = bytes.NewReader(body)
	cliOut, err := cli.Output()
	if err != nil {
		t.Fatalf("drawsift screen --format csv: %v", err)
	}
	if want := strings.SplitN(string(cliOut), "\n", 2)[0]; strings.TrimSuffix(want, "\r") != lines[head] {
		t.Errorf("CSV columns differ from the CLI's:\npage %s\ncli  %s", lines[head], want)
	}
	if !strings.HasPrefix(lines[head+1], "1,"+rows[0].Solute+",") {
		t.Errorf("CSV first row %q, want %s first", lines[head+1], rows[0].Solute)
	}
	for _, l := range lines[head+1 : head+len(rows)+1] {
		for _, cell := range strings.Split(l, ",") {
			if _, err := strconv.ParseFloat(cell, 64); err != nil {
				continue
			}
			mant := strings.TrimLeft(strings.NewReplacer("-", "", ".", "").Replace(strings.SplitN(strings.ToLower(cell), "e", 2)[0]), "0")
			if len(mant) > 6 {
				t.Errorf("CSV cell %s has more than 6 significant digits", cell)
			}
		}
	}
	// CSV formula injection: a solute named as a formula is exported as
	// quoted text, an excluded one too; numeric cells stay numbers.
	evil := eval[string](t, b, `(() => { const P = window.DrawsiftPage, r = P.state.result;
		const c = Object.assign({}, r.candidates[0], {solute: '=HYPERLINK("http://example.invalid","x")', name: "@name"});
		return P.rankingCSV(Object.assign({}, r, {candidates: [c], excluded: [{solute: "+1+1", reason: "-cmd", detail: "\t=2"}]})); })()`)
	for _, bad := range []string{`,=HYPERLINK`, `,"=HYPERLINK`, ",@name", ",+1+1", ",-cmd", ",\t=2"} {
		if strings.Contains(evil, bad) {
			t.Errorf("CSV holds a formula cell %q: %s", bad, evil)
		}
	}
	if !strings.Contains(evil, `"'=HYPERLINK(""http://example.invalid"",""x"")"`) || !strings.Contains(evil, ",'+1+1,") || !strings.Contains(evil, ",'-cmd: \t=2") {
		t.Errorf("formula cells not quoted as text: %s", evil)
	}
	if !strings.Contains(evil, "\r\n1,\"'=HYPERLINK") {
		t.Errorf("rank is no longer a number: %s", evil)
	}
	b.do(t, chromedp.Click(chromedp.ID("btn-json")))
	var res struct {
		Candidates    []pageRow `json:"candidates"`
		EngineVersion string    `json:"engine_version"`
	}
	if err := json.Unmarshal(wait("drawsift-result.json"), &res); err != nil {
		t.Fatal(err)
	}
	if len(res.Candidates) != len(rows) || res.EngineVersion != api.EngineVersion {
		t.Errorf("JSON export: %d candidates, engine %s", len(res.Candidates), res.EngineVersion)
	}
	b.do(t, chromedp.Click(chromedp.ID("tab-plots")),
		chromedp.Click(chromedp.CSS(`figure[data-plot="tradeoff"] figcaption button:first-of-type`)))
	svg := string(wait("drawsift-tradeoff.svg"))
	if !strings.HasPrefix(svg, "<?xml") || !strings.Contains(svg, `<svg xmlns="http://www.w3.org/2000/svg"`) || !strings.Contains(svg, rows[0].Solute) {
		t.Errorf("SVG export starts %q", svg[:min(len(svg), 120)])
	}
	b.do(t, chromedp.Click(chromedp.CSS(`figure[data-plot="tradeoff"] figcaption button:last-of-type`)))
	if png := wait("drawsift-tradeoff.png"); !bytes.HasPrefix(png, []byte("\x89PNG")) {
		t.Error("PNG export is not a PNG")
	}
	b.do(t, chromedp.Click(chromedp.ID("btn-export-scenario")))
	var sc map[string]any
	if err := json.Unmarshal(wait("drawsift-scenario.json"), &sc); err != nil {
		t.Fatal(err)
	}
	sameRanking(t, rows, native(t, sc))
}

// TestPageSweep runs a temperature sweep with progress and draws it.
func TestPageSweep(t *testing.T) {
	b, _ := openServed(t)
	b.do(t, chromedp.Click(chromedp.ID("tab-plots")))
	// The plots of the ranking come first; the sweep runs after them.
	b.waitPlots(t)
	b.do(t, chromedp.Click(chromedp.ID("btn-sweep")))
	b.waitFor(t, `document.body.dataset.sweep === "done" || document.body.dataset.sweep === "failed"`)
	if st := eval[string](t, b, `document.body.dataset.sweep + ": " + document.getElementById("sweep-status").textContent`); st != "done: Done." {
		t.Fatalf("the sweep ended %q", st)
	}
	b.waitFor(t, `!!document.querySelector('#sweep-plot figure[data-plot="sweep"]')`)
	if n := eval[int](t, b, `document.querySelectorAll('#sweep-plot svg path').length`); n < 3 {
		t.Errorf("the sweep plot has %d series", n)
	}
	if v := eval[float64](t, b, `document.getElementById("sweep-progress").value`); v != 1 {
		t.Errorf("sweep progress ends at %v", v)
	}
}

// TestPageVersionMismatch serves the page with a version that is not the
// engine's: the page says so instead of computing with a stale engine.
func TestPageVersionMismatch(t *testing.T) {
	p := pageBuild(t)
	b := browser(t)
	index, err := fs.ReadFile(site.FS, "index.html")
	if err != nil {
		t.Fatal(err)
	}
	index = bytes.Replace(index, []byte(`content="`+api.EngineVersion+`"`), []byte(`content="0.0.0-stale"`), 1)
	mux := http.NewServeMux()
	mux.Handle("/", http.FileServerFS(site.FS))
	mux.HandleFunc("/{$}", func(w http.ResponseWriter, r *http.Request) { w.Write(index) })
	mux.HandleFunc("/drawsift.wasm", func(w http.ResponseWriter, r *http.Request) { http.ServeFile(w, r, p.wasm) })
	mux.HandleFunc("/wasm_exec.js", func(w http.ResponseWriter, r *http.Request) { http.ServeFile(w, r, p.exec) })
	srv := httptest.NewServer(mux)
	defer srv.Close()
	b.do(t, chromedp.Navigate(srv.URL+"/"))
	b.waitFor(t, `document.body.dataset.engine === "failed"`)
	msg := eval[string](t, b, `document.getElementById("banner").textContent`)
	if !strings.Contains(msg, api.EngineVersion) || !strings.Contains(msg, "0.0.0-stale") || !strings.Contains(msg, "does not match") {
		t.Errorf("banner %q", msg)
	}
	if n := eval[int](t, b, `document.querySelectorAll("#ranking tbody tr").length`); n != 0 {
		t.Errorf("%d rows ranked with a mismatched engine", n)
	}
}

// TestPageKeepsHiddenFields: an imported scenario's screening rules are
// shown in the form and survive an edit made in another field.
func TestPageKeepsHiddenFields(t *testing.T) {
	b, run := openServed(t)
	sc := demoScenario(t)
	sc["allow_extrapolation"] = true
	sc["exclude_hazards"] = []any{"oxidizer"}
	sc["regeneration_recovery"] = 0.6
	f := filepath.Join(t.TempDir(), "hidden.json")
	body, _ := json.Marshal(sc)
	os.WriteFile(f, body, 0o644)
	b.do(t, chromedp.SetUploadFiles(chromedp.ID("file-import"), []string{f}))
	run = b.waitRun(t, run)
	b.do(t, chromedp.SetValue(chromedp.ID("temp"), "30"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("temp").dispatchEvent(new Event("input", {bubbles: true}))`))
	b.waitRun(t, run)
	got := pageScenario(t, b)
	if got["allow_extrapolation"] != true || got["regeneration_recovery"] != 0.6 || fmt.Sprint(got["exclude_hazards"]) != "[oxidizer]" || got["temperature_c"] != 30.0 {
		t.Errorf("after an edit the scenario is %v", got)
	}
	if form := eval[string](t, b, `[document.getElementById("allow-extrap").checked, document.getElementById("regen-recovery").value, document.getElementById("hz-oxidizer").checked].join(" ")`); form != "true 60 true" {
		t.Errorf("the form shows the imported rules as %q, want \"true 60 true\"", form)
	}
	// With extrapolation allowed, KHCO3 is ranked, not left out.
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, got))
}

// excludedOnPage lists the page's "left out" entries as solute: reason.
const jsExcluded = `Array.from(document.querySelectorAll("#excluded li[data-solute]")).map(li => li.dataset.solute + ": " + li.querySelector(".reason").textContent)`

// TestPageExcludeHazard adds two solutes flagged toxic in the library
// (LiCl, KBr) to the demo, then ticks "toxic" from the keyboard: both move
// to the "left out" list with the engine's reason, and the page's ranking
// and exclusions are the native engine's for the stored scenario, which
// names the flag. Too few Pareto objectives get a message beside the field
// and no run.
func TestPageExcludeHazard(t *testing.T) {
	b, run := openServed(t)
	if eval[bool](t, b, `document.getElementById("hz-toxic").checked`) {
		t.Fatal("the demo starts with toxic solutes excluded")
	}
	b.do(t, chromedp.Click(chromedp.ID("tab-candidates")), chromedp.Click(chromedp.ID("inc-LiCl")), chromedp.Click(chromedp.ID("inc-KBr")))
	b.waitFor(t, `["LiCl", "KBr"].every(id => JSON.parse(localStorage.getItem("drawsift.scenario.v1")).candidates.includes(id))`)
	run = b.waitRun(t, run)
	b.waitFor(t, `!!document.querySelector('#ranking tbody tr[data-solute="LiCl"]') && !!document.querySelector('#ranking tbody tr[data-solute="KBr"]')`)
	sc := pageScenario(t, b)
	if _, ok := sc["exclude_hazards"]; ok {
		t.Errorf("no hazard is ticked, yet the scenario has exclude_hazards = %v", sc["exclude_hazards"])
	}
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, sc))

	// Tick "toxic" with the space bar.
	b.do(t, chromedp.Click(chromedp.ID("tab-ranking")), chromedp.Focus(chromedp.ID("hz-toxic")), chromedp.SendKeys(chromedp.ID("hz-toxic"), " "))
	b.waitFor(t, `JSON.stringify(JSON.parse(localStorage.getItem("drawsift.scenario.v1")).exclude_hazards) === '["toxic"]'`)
	b.waitRun(t, run)
	b.waitFor(t, `!document.querySelector('#ranking tbody tr[data-solute="LiCl"]')`)
	sc = pageScenario(t, b)
	want := native(t, sc)
	rows := eval[[]pageRow](t, b, jsRows)
	sameRanking(t, rows, want)
	for _, r := range rows {
		if r.Solute == "LiCl" || r.Solute == "KBr" {
			t.Errorf("%s is toxic in the library and still ranked", r.Solute)
		}
	}
	ex := eval[[]string](t, b, jsExcluded)
	if len(ex) != len(want.Excluded) {
		t.Errorf("left out on the page %v, native %v", ex, want.Excluded)
	}
	for i, x := range want.Excluded {
		if i < len(ex) && ex[i] != x.Solute+": "+x.Reason {
			t.Errorf("left out [%d] = %q, native %s: %s", i, ex[i], x.Solute, x.Reason)
		}
	}
	for _, id := range []string{"LiCl", "KBr"} {
		found := false
		for _, e := range ex {
			found = found || e == id+": "+screen.ReasonHazard
		}
		if !found {
			t.Errorf("%s is not left out as %q: %v", id, screen.ReasonHazard, ex)
		}
	}
	if d := eval[string](t, b, `document.querySelector('#excluded li[data-solute="LiCl"]').textContent`); !strings.Contains(d, `"toxic"`) {
		t.Errorf("LiCl's entry %q does not name the flag", d)
	}
	if r := eval[string](t, b, `Array.from(document.querySelectorAll("#rp-inputs tr")).map(tr => tr.textContent).join("\n")`); !strings.Contains(r, "Solutes excluded by hazardtoxic") {
		t.Errorf("the report's inputs do not list the hazard:\n%s", r)
	}
	b.screenshot(t, "toxic")

	// Leave one Pareto objective ticked: a message beside the field, no run.
	b.do(t, chromedp.Click(chromedp.ID("po-water_flux")), chromedp.Click(chromedp.ID("po-replenishment_cost")))
	b.waitFor(t, `!document.getElementById("po-water_flux").checked && !document.getElementById("po-replenishment_cost").checked`)
	if run := b.settle(t); !strings.HasPrefix(run, "invalid-") {
		t.Fatalf("with one Pareto objective the run ended %s, want the page's refusal", run)
	}
	if msg := eval[string](t, b, `document.querySelector('.field-error[data-field="pareto_objectives"]').textContent`); !strings.Contains(msg, "pareto_objectives") || !strings.Contains(msg, "at least two") {
		t.Errorf("Pareto message %q", msg)
	}
}

// TestPageGivenK switches mass transfer to given k values: the ranking
// changes and is the native engine's; a k past its limit is refused
// beside the field; the choice survives a reload.
func TestPageGivenK(t *testing.T) {
	b, run := openServed(t)
	before := eval[[]pageRow](t, b, jsRows)
	if !eval[bool](t, b, `document.getElementById("k-given-box").hidden`) {
		t.Error("the k inputs show while k comes from the channel")
	}
	set := func(id, v string) {
		b.do(t, chromedp.SetValue(chromedp.ID(id), v),
			chromedp.Evaluate[chromedp.Void](`document.getElementById("`+id+`").dispatchEvent(new Event("input", {bubbles: true}))`))
	}
	b.do(t, chromedp.Click(chromedp.CSS(`#channel-box summary`)), chromedp.Click(chromedp.ID("k-mode-given")))
	// Past the engine's limit: refused in the page, beside the field.
	set("k-draw", "5")
	if run := b.settle(t); !strings.HasPrefix(run, "invalid-") {
		t.Fatalf("with k = 5 m/s the run ended %s, want the page's refusal", run)
	}
	if msg := eval[string](t, b, `document.querySelector('.field-error[data-field="k"]').textContent`); !strings.Contains(msg, "k_draw_m_per_s") || !strings.Contains(msg, "1e-8") {
		t.Errorf("k message %q should name k_draw_m_per_s and its limit", msg)
	}
	if eval[string](t, b, `document.getElementById("k-draw").getAttribute("aria-invalid")`) != "true" {
		t.Error("the k input is not marked invalid")
	}
	// Mass-transfer coefficients a few times below the default channel's.
	set("k-draw", "4e-6")
	set("k-feed", "8e-6")
	b.waitFor(t, `(s => s.k_draw_m_per_s === 4e-6 && s.k_feed_m_per_s === 8e-6)(JSON.parse(localStorage.getItem("drawsift.scenario.v1")))`)
	b.waitRun(t, run)
	after := eval[[]pageRow](t, b, jsRows)
	sc := pageScenario(t, b)
	sameRanking(t, after, native(t, sc))
	changed := len(after) != len(before)
	for i := range after {
		if !changed && (after[i].Solute != before[i].Solute || math.Abs(after[i].Score-before[i].Score) > 1e-6) {
			changed = true
		}
	}
	if !changed {
		t.Error("the ranking did not change with given k values")
	}
	if got := eval[string](t, b, `document.querySelector('#repro').textContent`); !strings.Contains(got, "k as given") {
		t.Errorf("the model choices do not say k was given: %q", got)
	}
	b.screenshot(t, "given-k")
	// Restored after a reload.
	b.do(t, chromedp.Reload())
	b.waitRun(t, "")
	if got := eval[string](t, b, `[document.getElementById("k-mode-given").checked, Number(document.getElementById("k-draw").value), Number(document.getElementById("k-feed").value)].join(" ")`); got != "true 0.000004 0.000008" {
		t.Errorf("after a reload the k fields are %q", got)
	}
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, pageScenario(t, b)))
}

// TestPageDrawBAndFeedPH: a B for the draw solutes is sent as b_lmh with
// the membrane's NaCl B beside it, so the engine uses it for every
// candidate (engine/api ScreenRequest.Membrane), and the ranking is the
// native one; a custom feed's pH outside 0–14 is refused beside the field.
func TestPageDrawBAndFeedPH(t *testing.T) {
	b, run := openServed(t)
	before := eval[[]pageRow](t, b, jsRows)
	set := func(id, v string) {
		b.do(t, chromedp.Evaluate[chromedp.Void](fmt.Sprintf(`(e => { e.value = %q; e.dispatchEvent(new Event("input", {bubbles: true})); })(document.getElementById(%q))`, v, id)))
	}
	set("mem-bdraw", "0.05")
	b.waitFor(t, `JSON.parse(localStorage.getItem("drawsift.scenario.v1")).membrane.b_lmh === 0.05`)
	b.waitRun(t, run)
	sc := pageScenario(t, b)
	mem, _ := sc["membrane"].(map[string]any)
	if mem["preset"] != "tfc-standard" || mem["b_nacl_lmh"] != 0.2988 || mem["b_lmh"] != 0.05 {
		t.Errorf("membrane sent as %v, want the preset with its NaCl B and b_lmh 0.05", mem)
	}
	after := eval[[]pageRow](t, b, jsRows)
	sameRanking(t, after, native(t, sc))
	if fmt.Sprint(after) == fmt.Sprint(before) {
		t.Error("the ranking did not change with one B for every draw solute")
	}
	if got := eval[string](t, b, `document.querySelector('#repro').textContent`); !strings.Contains(got, "membrane.b_lmh used for every candidate") {
		t.Errorf("the model choices do not say the B was used for every candidate: %q", got)
	}
	// Past its limit: refused beside the field, named as the contract names it.
	set("mem-bdraw", "150")
	b.settle(t)
	if msg := eval[string](t, b, `document.querySelector('.field-error[data-field="membrane.b_draw"]').textContent`); !strings.Contains(msg, "membrane.b_lmh") || !strings.Contains(msg, "100") {
		t.Errorf("draw B message %q", msg)
	}

	// A custom feed: pH 15 is refused beside the field; pH 8.1 is sent.
	set("mem-bdraw", "")
	b.do(t, chromedp.Evaluate[chromedp.Void](`(s => { s.value = "custom"; s.dispatchEvent(new Event("change", {bubbles: true})); })(document.getElementById("feed-preset"))`))
	b.waitFor(t, `!document.getElementById("feed-ions-box").hidden`)
	set("feed-conc", "20")
	set("feed-ph", "15")
	b.settle(t)
	if msg := eval[string](t, b, `document.querySelector('.field-error[data-field="feed.ph"]').textContent`); !strings.Contains(msg, "feed.ph") || !strings.Contains(msg, "0–14") {
		t.Errorf("pH message %q", msg)
	}
	run = eval[string](t, b, `document.body.dataset.run`)
	set("feed-ph", "8.1")
	b.waitFor(t, `JSON.parse(localStorage.getItem("drawsift.scenario.v1")).feed.ph === 8.1`)
	b.waitRun(t, run)
	sc = pageScenario(t, b)
	if _, ok := sc["membrane"].(map[string]any)["b_nacl_lmh"]; ok {
		t.Errorf("a blank draw B still sends b_nacl_lmh: %v", sc["membrane"])
	}
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, sc))
}

// engineDefaults is the engine's defaults operation, read natively.
type engineDefaults struct {
	Limits map[string]struct {
		Field        string   `json:"field"`
		Unit         string   `json:"unit"`
		Min          *float64 `json:"min"`
		Max          *float64 `json:"max"`
		MinExclusive bool     `json:"min_exclusive"`
		MaxExclusive bool     `json:"max_exclusive"`
		Integer      bool     `json:"integer"`
		Default      *float64 `json:"default"`
		Text         string   `json:"text"`
	} `json:"limits"`
	Weights    map[string]float64 `json:"weights"`
	Objectives []struct {
		Key      string `json:"key"`
		Maximise bool   `json:"maximise"`
	} `json:"objectives"`
	ParetoObjectives []string `json:"pareto_objectives"`
	Channel          struct {
		HeightMM  float64 `json:"height_mm"`
		WidthMM   float64 `json:"width_mm"`
		LengthMM  float64 `json:"length_mm"`
		Crossflow float64 `json:"crossflow_velocity_m_per_s"`
		Spacer    bool    `json:"spacer"`
	} `json:"channel"`
	MembranePreset string   `json:"membrane_preset"`
	FeedPreset     string   `json:"feed_preset"`
	Orientation    string   `json:"orientation"`
	OsmoticModel   string   `json:"osmotic_model"`
	HazardFlags    []string `json:"hazard_flags"`
}

func readDefaults(t testing.TB) engineDefaults {
	t.Helper()
	out, e := api.Dispatch(context.Background(), api.OpDefaults, nil)
	if e != nil {
		t.Fatalf("defaults: %s", out)
	}
	var d engineDefaults
	if err := json.Unmarshal(out, &d); err != nil {
		t.Fatal(err)
	}
	return d
}

// limitedInputs are the form's inputs with a range in the engine's
// listing: input id, listing key, and the scale of the form's unit (the
// recovery is a fraction shown in %, a custom diffusivity is entered in
// 10⁻⁹ m²/s).
var limitedInputs = []struct {
	id, key string
	scale   float64
}{
	{"temp", "temperature_c", 1}, {"mem-a", "membrane.a_lmh_per_bar", 1}, {"mem-b", "membrane.b_nacl_lmh", 1},
	{"mem-s", "membrane.s_um", 1}, {"mem-bdraw", "membrane.b_lmh", 1}, {"k-draw", "k_draw_m_per_s", 1},
	{"k-feed", "k_feed_m_per_s", 1}, {"ch-h", "channel.height_mm", 1}, {"ch-w", "channel.width_mm", 1},
	{"ch-l", "channel.length_mm", 1}, {"ch-u", "channel.crossflow_velocity_m_per_s", 1}, {"feed-ph", "feed.ph", 1},
	{"regen-recovery", "regeneration_recovery", 100}, {"unc-samples", "uncertainty.samples", 1}, {"seed", "seed", 1},
	{"unc-a", "uncertainty.a_rel_sd", 1}, {"unc-b", "uncertainty.b_rel_sd", 1}, {"unc-s", "uncertainty.s_rel_sd", 1},
	{"unc-pi", "uncertainty.osmotic_rel_sd", 1}, {"unc-d", "uncertainty.diffusivity_rel_sd", 1}, {"sweep-n", "sweep.points", 1},
	{"cs-mm", "custom_solutes[].molar_mass_g_per_mol", 1}, {"cs-nu", "custom_solutes[].van_t_hoff_factor", 1},
	{"cs-d", "custom_solutes[].diffusivity_m2_per_s", 1e9}, {"cs-table-t", "temperature_c", 1},
	{"basis-value", "basis.osmotic_pressure_bar", 1}, // the demo's basis is in bar
}

// close12 compares a number the page printed (12 significant digits)
// with the engine's.
func close12(got, want float64) bool {
	return math.Abs(got-want) <= 1e-11*math.Max(math.Abs(want), 1e-300)
}

// TestPageDefaultsFromEngine ties the page to the engine's defaults
// operation, read natively: after a fresh load every limited input's
// min/max attributes are the engine's range, the hazard boxes are the
// engine's flags, the weight sliders and Pareto boxes its objectives; a
// scenario that names nothing shows every engine default in the form and
// ranks as the engine ranks {} — also once the page sends those defaults
// itself; and a value just past a limit is refused beside its field with
// the engine's limit text.
func TestPageDefaultsFromEngine(t *testing.T) {
	d := readDefaults(t)
	b, run := openServed(t)

	// min and max of every limited input.
	for _, in := range limitedInputs {
		l, ok := d.Limits[in.key]
		if !ok {
			t.Errorf("the engine lists no limit %s", in.key)
			continue
		}
		attrs := eval[[]any](t, b, fmt.Sprintf(`(e => [e.getAttribute("min"), e.getAttribute("max")])(document.getElementById(%q))`, in.id))
		for i, want := range []*float64{l.Min, l.Max} {
			name := []string{"min", "max"}[i]
			switch {
			case want == nil && attrs[i] != nil:
				t.Errorf("%s: %s=%v, the engine has no bound", in.id, name, attrs[i])
			case want != nil && attrs[i] == nil:
				t.Errorf("%s: no %s, the engine's is %g", in.id, name, *want*in.scale)
			case want != nil:
				got, err := strconv.ParseFloat(attrs[i].(string), 64)
				if err != nil || !close12(got, *want*in.scale) {
					t.Errorf("%s: %s=%v, the engine's is %g", in.id, name, attrs[i], *want*in.scale)
				}
			}
		}
		if l.Integer && eval[string](t, b, fmt.Sprintf(`document.getElementById(%q).getAttribute("step")`, in.id)) != "1" {
			t.Errorf("%s: %s takes whole numbers, the input's step is not 1", in.id, in.key)
		}
	}
	// Hazard boxes: the engine's flags, in its order; weights and Pareto
	// boxes: its objectives, each slider titled with its direction.
	if got := eval[[]string](t, b, `Array.from(document.querySelectorAll("#hazard-boxes input")).map(i => i.dataset.flag)`); fmt.Sprint(got) != fmt.Sprint(d.HazardFlags) {
		t.Errorf("hazard boxes %v, engine flags %v", got, d.HazardFlags)
	}
	var keys, senses []string
	for _, o := range d.Objectives {
		keys = append(keys, o.Key)
		senses = append(senses, map[bool]string{true: "higher is better", false: "lower is better"}[o.Maximise])
	}
	if got := eval[[]string](t, b, `Array.from(document.querySelectorAll("#weights input")).map(i => i.dataset.key)`); fmt.Sprint(got) != fmt.Sprint(keys) {
		t.Errorf("weight sliders %v, engine objectives %v", got, keys)
	}
	if got := eval[[]string](t, b, `Array.from(document.querySelectorAll("#weights label")).map(l => l.title)`); fmt.Sprint(got) != fmt.Sprint(senses) {
		t.Errorf("weight directions %v, engine %v", got, senses)
	}
	if got := eval[[]string](t, b, `Array.from(document.querySelectorAll("#pareto-boxes input")).map(i => i.dataset.key)`); fmt.Sprint(got) != fmt.Sprint(keys) {
		t.Errorf("Pareto boxes %v, engine objectives %v", got, keys)
	}
	// The hints quote the engine's limits and defaults.
	for _, h := range eval[[]map[string]string](t, b, `Array.from(document.querySelectorAll("[data-limit-of], [data-default-of]")).map(e => Object.assign({text: e.textContent}, e.dataset))`) {
		key := h["limitOf"] + h["defaultOf"]
		l := d.Limits[key]
		switch {
		case h["limitOf"] != "" && h["scale"] == "" && h["text"] != l.Text:
			t.Errorf("hint for %s says %q, the engine %q", key, h["text"], l.Text)
		case h["defaultOf"] != "":
			scale := 1.0
			if h["scale"] != "" {
				scale, _ = strconv.ParseFloat(h["scale"], 64)
			}
			if got, err := strconv.ParseFloat(h["text"], 64); err != nil || l.Default == nil || !close12(got, *l.Default*scale) {
				t.Errorf("hint for the default of %s says %q", key, h["text"])
			}
		}
	}
	if got, want := eval[string](t, b, `document.getElementById("regen-recovery-hint").textContent`), recoveryPct(d); !strings.Contains(got, want) {
		t.Errorf("the recovery hint %q lacks %q", got, want)
	}

	// A scenario that names nothing: the form shows the engine's defaults.
	empty := filepath.Join(t.TempDir(), "empty.json")
	os.WriteFile(empty, []byte("{}"), 0o644)
	b.do(t, chromedp.SetUploadFiles(chromedp.ID("file-import"), []string{empty}))
	run = b.waitRun(t, run)
	type formView struct {
		Feed, Membrane, Orientation, Model, BasisKind, BasisUnit       string
		Temp, ChH, ChW, ChL, ChU, Recovery, Samples, Seed, UncD, Basis float64
		Spacer                                                         bool
		Weights                                                        map[string]float64
		Pareto, Hazards                                                []string
		PHHolder, PiHolder                                             string
	}
	f := eval[formView](t, b, `(() => { const v = id => document.getElementById(id).value, n = id => Number(v(id));
		const ticked = sel => Array.from(document.querySelectorAll(sel)).filter(i => i.checked).map(i => i.dataset.key || i.dataset.flag);
		return { Feed: v("feed-preset"), Membrane: v("mem-preset"), Orientation: document.querySelector('input[name="orientation"]:checked').value,
			Model: v("osm-model"), BasisKind: v("basis-kind"), BasisUnit: v("basis-unit"), Basis: n("basis-value"),
			Temp: n("temp"), ChH: n("ch-h"), ChW: n("ch-w"), ChL: n("ch-l"), ChU: n("ch-u"), Spacer: document.getElementById("ch-spacer").checked,
			Recovery: n("regen-recovery"), Samples: n("unc-samples"), Seed: n("seed"), UncD: n("unc-d"),
			Weights: Object.fromEntries(Array.from(document.querySelectorAll("#weights input")).map(i => [i.dataset.key, Number(i.value)])),
			Pareto: ticked("#pareto-boxes input"), Hazards: ticked("#hazard-boxes input"),
			PHHolder: document.getElementById("feed-ph").placeholder, PiHolder: document.getElementById("unc-pi").placeholder };
	})()`)
	def := func(key string) float64 {
		l := d.Limits[key]
		if l.Default == nil {
			t.Fatalf("the engine has no default for %s", key)
		}
		return *l.Default
	}
	for _, c := range []struct {
		what      string
		got, want any
	}{
		{"feed", f.Feed, "preset:" + d.FeedPreset}, {"membrane", f.Membrane, d.MembranePreset},
		{"orientation", f.Orientation, d.Orientation}, {"osmotic model", f.Model, d.OsmoticModel},
		{"temperature", f.Temp, def("temperature_c")},
		{"channel", [5]any{f.ChH, f.ChW, f.ChL, f.ChU, f.Spacer}, [5]any{d.Channel.HeightMM, d.Channel.WidthMM, d.Channel.LengthMM, d.Channel.Crossflow, d.Channel.Spacer}},
		{"recovery (%)", f.Recovery, 100 * def("regeneration_recovery")},
		{"samples", f.Samples, def("uncertainty.samples")}, {"seed", f.Seed, def("seed")},
		{"diffusivity spread", f.UncD, def("uncertainty.diffusivity_rel_sd")},
		// The deionised-water feed has no π: the engine's basis is an equal π (engine/api resolveBasis).
		{"basis", [3]any{f.BasisKind, f.BasisUnit, f.Basis}, [3]any{"osmotic-pressure", d.Limits["basis.osmotic_pressure_bar"].Unit, def("basis.osmotic_pressure_bar")}},
		{"weights", fmt.Sprint(f.Weights), fmt.Sprint(d.Weights)},
		{"Pareto objectives", fmt.Sprint(f.Pareto), fmt.Sprint(d.ParetoObjectives)},
		{"hazards excluded", len(f.Hazards), 0},
		{"pH placeholder", f.PHHolder, strconv.FormatFloat(def("feed.ph"), 'g', -1, 64)},
	} {
		if fmt.Sprint(c.got) != fmt.Sprint(c.want) {
			t.Errorf("for {} the form shows %s %v, the engine's default is %v", c.what, c.got, c.want)
		}
	}
	if want := strconv.FormatFloat(def("uncertainty.osmotic_rel_sd"), 'g', -1, 64); !strings.HasPrefix(f.PiHolder, want) {
		t.Errorf("the π spread's placeholder %q does not start with the engine's default %s", f.PiHolder, want)
	}
	// The page ran {} as imported; once an edit makes it send every value
	// the form shows, the ranking is still the engine's ranking of {}.
	want := native(t, map[string]any{})
	sameRanking(t, eval[[]pageRow](t, b, jsRows), want)
	b.do(t, chromedp.Evaluate[chromedp.Void](`document.getElementById("temp").dispatchEvent(new Event("input", {bubbles: true}))`))
	run = b.waitRun(t, run)
	sc := pageScenario(t, b)
	if sc["regeneration_recovery"] != def("regeneration_recovery") || sc["pareto_objectives"] == nil || sc["temperature_c"] != def("temperature_c") {
		t.Errorf("the page's own request for the defaults is %v", sc)
	}
	sameRanking(t, eval[[]pageRow](t, b, jsRows), want)
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, sc))

	// A custom membrane takes the engine's spreads of A, B and S.
	custom := filepath.Join(t.TempDir(), "custom.json")
	os.WriteFile(custom, []byte(`{"membrane": {"a_lmh_per_bar": 1.2, "b_lmh": 0.4, "s_um": 450}}`), 0o644)
	b.do(t, chromedp.SetUploadFiles(chromedp.ID("file-import"), []string{custom}))
	run = b.waitRun(t, run)
	if got, want := eval[[]float64](t, b, `["unc-a", "unc-b", "unc-s"].map(id => Number(document.getElementById(id).value))`),
		[]float64{def("uncertainty.a_rel_sd"), def("uncertainty.b_rel_sd"), def("uncertainty.s_rel_sd")}; fmt.Sprint(got) != fmt.Sprint(want) {
		t.Errorf("a custom membrane's spreads %v, the engine's defaults %v", got, want)
	}

	// Just past a limit: refused beside the field (the input marked
	// invalid, the message in its fieldset quoting the engine's limit),
	// by the page or by the engine; back within it, the ranking returns.
	set := func(id, v string) {
		b.do(t, chromedp.Evaluate[chromedp.Void](fmt.Sprintf(`(e => { e.value = %q; e.dispatchEvent(new Event("input", {bubbles: true})); })(document.getElementById(%q))`, v, id)))
	}
	b.do(t, chromedp.Evaluate[chromedp.Void](`(r => { r.checked = true; r.dispatchEvent(new Event("change", {bubbles: true})); })(document.getElementById("k-mode-given"))`))
	set("k-feed", "8e-6")
	run = b.waitRun(t, run)
	for _, c := range []struct {
		id, key string
		upper   bool // past the upper bound, else the lower
		scale   float64
		also    string // a second text the message must hold
	}{
		{id: "temp", key: "temperature_c", upper: true},
		{id: "ch-h", key: "channel.height_mm"},
		{id: "ch-u", key: "channel.crossflow_velocity_m_per_s", upper: true},
		{id: "k-draw", key: "k_draw_m_per_s"},
		{id: "k-draw", key: "k_draw_m_per_s", upper: true},
		{id: "mem-bdraw", key: "membrane.b_lmh", upper: true},
		{id: "mem-a", key: "membrane.a_lmh_per_bar", upper: true},
		{id: "mem-s", key: "membrane.s_um"},
		{id: "mem-b", key: "membrane.b_nacl_lmh", upper: true},
		{id: "regen-recovery", key: "regeneration_recovery", scale: 100, also: recoveryPct(d)},
		{id: "regen-recovery", key: "regeneration_recovery", upper: true, scale: 100, also: recoveryPct(d)},
		{id: "unc-samples", key: "uncertainty.samples"},
		{id: "unc-samples", key: "uncertainty.samples", upper: true},
		{id: "unc-a", key: "uncertainty.a_rel_sd", upper: true},
		{id: "unc-d", key: "uncertainty.diffusivity_rel_sd"},
		{id: "seed", key: "seed"},
	} {
		l := d.Limits[c.key]
		scale := c.scale
		if scale == 0 {
			scale = 1
		}
		bound, open := l.Min, l.MinExclusive
		if c.upper {
			bound, open = l.Max, l.MaxExclusive
		}
		if bound == nil {
			t.Errorf("%s has no bound to pass", c.key)
			continue
		}
		v := *bound * scale
		step := math.Abs(v) * 1e-6
		if step == 0 {
			step = 1e-6
		}
		switch {
		case open: // the bound itself is out
		case l.Integer:
			step = 1
			fallthrough
		default:
			if c.upper {
				v += step
			} else {
				v -= step
			}
		}
		before := eval[string](t, b, fmt.Sprintf(`document.getElementById(%q).value`, c.id))
		set(c.id, strconv.FormatFloat(v, 'g', -1, 64))
		got := b.settle(t)
		if !strings.HasPrefix(got, "invalid-") && !strings.HasPrefix(got, "error-") {
			t.Errorf("%s = %g (%s %s) was not refused: run %s", c.id, v, c.key, l.Text, got)
		}
		beside := eval[string](t, b, fmt.Sprintf(`(e => Array.from(e.closest("fieldset").querySelectorAll(".field-error")).map(x => x.textContent).join(" | "))(document.getElementById(%q))`, c.id))
		if !strings.Contains(beside, l.Text) || !strings.Contains(beside, c.also) {
			t.Errorf("%s = %g: beside the field %q, want the engine's limit %q %s", c.id, v, beside, l.Text, c.also)
		}
		if eval[string](t, b, fmt.Sprintf(`document.getElementById(%q).getAttribute("aria-invalid")`, c.id)) != "true" {
			t.Errorf("%s = %g: the input is not marked invalid", c.id, v)
		}
		set(c.id, before)
		run = b.waitRun(t, run)
	}
	b.screenshot(t, "defaults")
}

// recoveryPct is the recovery's limit as the form shows it: the engine's
// bounds of the fraction, in %, written as the engine writes a range
// (engine/scenario Range.Text).
func recoveryPct(d engineDefaults) string {
	l := d.Limits["regeneration_recovery"]
	pct := func(v *float64) string { return strconv.FormatFloat(100**v, 'g', 12, 64) }
	lo, hi := ">= ", "<= "
	if l.MinExclusive {
		lo = "> "
	}
	if l.MaxExclusive {
		hi = "< "
	}
	if !l.MinExclusive && !l.MaxExclusive {
		return pct(l.Min) + "–" + pct(l.Max) + " %"
	}
	return strings.NewReplacer(">=", "≥", "<=", "≤").Replace(lo+pct(l.Min)+" and "+hi+pct(l.Max)) + " %"
}

// TestPageMembraneTemperature: the temperature of the membrane's A and B
// is sent as the contract's reference_temperature_c, the ranking follows
// the engine's, the model choices say how A and B were carried to the
// operating temperature, and a value past the engine's range is refused
// beside the field.
func TestPageMembraneTemperature(t *testing.T) {
	b, run := openServed(t)
	if ph := eval[string](t, b, `document.getElementById("mem-reft").placeholder`); ph != "preset: 20 °C" {
		t.Errorf("placeholder %q, want the preset's test temperature", ph)
	}
	set := func(id, v string) {
		b.do(t, chromedp.Evaluate[chromedp.Void](fmt.Sprintf(`(e => { e.value = %q; e.dispatchEvent(new Event("input", {bubbles: true})); })(document.getElementById(%q))`, v, id)))
	}
	set("mem-reft", "30")
	b.waitFor(t, `JSON.parse(localStorage.getItem("drawsift.scenario.v1")).membrane.reference_temperature_c === 30`)
	b.waitRun(t, run)
	sc := pageScenario(t, b)
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, sc))
	if got := eval[string](t, b, `document.querySelector('#repro').textContent`); !strings.Contains(got, "measured at 30 °C, carried to") {
		t.Errorf("the model choices do not say how A and B were carried: %q", got)
	}
	set("mem-reft", "150")
	b.settle(t)
	if msg := eval[string](t, b, `document.querySelector('.field-error[data-field="membrane.reference_temperature_c"]').textContent`); !strings.Contains(msg, "150") || !strings.Contains(msg, "°C") {
		t.Errorf("reference temperature message %q", msg)
	}
}
