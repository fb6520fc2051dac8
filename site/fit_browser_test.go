package site_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"drawsift/engine/api"

	"github.com/chromedp/chromedp"
)

// TestPageFit runs the Fit tab on its published example (Membranes
// 11(2):153 (2021), Appendix C: the page's "Published example" button),
// loading the full engine in its own worker: the parameters and intervals
// the page shows are the native engine's for the request it sent, the
// parity plots are drawn, the fitted membrane becomes the scenario's
// (and the screen runs with it), and bad CSV is refused naming the row
// and field; a seeded bootstrap reports progress and matches the native
// one. It waits on body data-fit, which the page sets after each fit.
func TestPageFit(t *testing.T) {
	b, run := openServed(t)
	b.do(t, chromedp.Click(chromedp.ID("tab-fit")), chromedp.Click(chromedp.ID("btn-fit-example")), chromedp.Click(chromedp.ID("btn-fit")))
	b.waitFor(t, `/^(done|error)-1$/.test(document.body.dataset.fit || "")`)
	if got := eval[string](t, b, `document.body.dataset.fit`); got != "done-1" {
		b.screenshot(t, "fit")
		t.Fatalf("the fit ended %s: %s", got, eval[string](t, b, `document.getElementById("fit-error").textContent`))
	}
	req := eval[map[string]any](t, b, `window.DrawsiftPage.fitLast().request`)
	if req["external_cp"] != false || !strings.Contains(fmt.Sprint(req["csv"]), "15.82") {
		t.Fatalf("the page sent %v", req)
	}
	want := nativeJSON[api.FitResponse](t, api.OpFit, req)
	type row struct {
		Param, Value, Low, High string
	}
	rows := eval[[]row](t, b, `Array.from(document.querySelectorAll("#fit-params tbody tr")).map(tr => ({param: tr.dataset.param, value: tr.dataset.value, low: tr.dataset.ciLow || "", high: tr.dataset.ciHigh || ""}))`)
	if len(rows) != 3 {
		t.Fatalf("%d parameter rows", len(rows))
	}
	for i, w := range []api.FitEstimate{want.ALMHPerBar, want.BLMH, want.SUM} {
		var v, lo, hi float64
		fmt.Sscan(rows[i].Value, &v)
		fmt.Sscan(rows[i].Low, &lo)
		fmt.Sscan(rows[i].High, &hi)
		// wasm and native differ in the last bits (DEVELOPERS.md).
		if math.Abs(v-w.Value) > 1e-6*w.Value || w.CILow == nil || math.Abs(lo-*w.CILow) > 1e-6*w.Value || math.Abs(hi-*w.CIHigh) > 1e-6*w.Value {
			t.Errorf("%s: page %v [%v, %v], native %+v", rows[i].Param, v, lo, hi, w)
		}
	}
	if n := eval[int](t, b, `document.querySelectorAll('#fit-plot figure[data-plot="fit-parity-jw"] circle[r="4.5"]').length`); n != 4 {
		t.Errorf("water-flux parity plot has %d points, want 4", n)
	}
	if n := eval[int](t, b, `document.querySelectorAll('#fit-plot figure[data-plot="fit-parity-js"] circle[r="4.5"]').length`); n != 2 {
		t.Errorf("solute-flux parity plot has %d points, want 2", n)
	}

	// The fitted membrane becomes the scenario's, and the screen runs.
	b.do(t, chromedp.Click(chromedp.ID("btn-fit-use")))
	b.waitRun(t, run)
	sc := pageScenario(t, b)
	mem, _ := sc["membrane"].(map[string]any)
	if a, _ := mem["a_lmh_per_bar"].(float64); math.Abs(a-want.ALMHPerBar.Value) > 1e-6*a {
		t.Errorf("scenario membrane %v, fitted A %g", mem, want.ALMHPerBar.Value)
	}
	if eval[bool](t, b, `document.getElementById("undo").hidden`) {
		t.Error("no undo offered for the scenario the fitted membrane replaced")
	}

	// A seeded bootstrap reports its progress through the worker and adds
	// its intervals, equal to the native engine's for the same seed.
	b.do(t, chromedp.Click(chromedp.ID("tab-fit")), chromedp.Click(chromedp.ID("fit-boot")),
		chromedp.SetValue(chromedp.ID("fit-boot-n"), "300"), chromedp.Click(chromedp.ID("btn-fit")))
	b.waitFor(t, `/^(done|error)-2$/.test(document.body.dataset.fit || "")`)
	if got := eval[string](t, b, `document.body.dataset.fit`); got != "done-2" {
		t.Fatalf("the bootstrap fit ended %s: %s", got, eval[string](t, b, `document.getElementById("fit-error").textContent`))
	}
	if n := eval[string](t, b, `document.body.dataset.fitProgress`); n == "" || n == "0" {
		t.Errorf("no bootstrap progress reported (%q)", n)
	}
	breq := eval[map[string]any](t, b, `window.DrawsiftPage.fitLast().request`)
	bwant := nativeJSON[api.FitResponse](t, api.OpFit, breq)
	blow := eval[float64](t, b, `window.DrawsiftPage.fitLast().response.s_um.bootstrap.ci_low`)
	if bwant.SUM.Bootstrap == nil || math.Abs(blow-bwant.SUM.Bootstrap.CILow) > 1e-6*blow {
		t.Errorf("bootstrap S low: page %g, native %+v", blow, bwant.SUM.Bootstrap)
	}

	// Bad CSV: the engine's error names the row and field.
	b.do(t, chromedp.Click(chromedp.ID("fit-boot")),
		chromedp.SetValue(chromedp.ID("fit-csv"), "orientation,draw_solute,draw_concentration_mol_per_l,water_flux_lmh\nAL-FS,NaCl,0.5,-8\nAL-FS,NaCl,1,9\n"),
		chromedp.Click(chromedp.ID("btn-fit")))
	b.waitFor(t, `/^(done|error)-3$/.test(document.body.dataset.fit || "")`)
	if msg := eval[string](t, b, `document.getElementById("fit-error").textContent`); !strings.Contains(msg, "data[0].water_flux_lmh") || !strings.Contains(msg, "CSV line 2") {
		t.Errorf("bad CSV: %q", msg)
	}
}
