package site_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"drawsift/engine/api"

	"github.com/chromedp/chromedp"
)

// TestPagePlant runs the Plant tab on the demo scenario: a module of the
// screen's leading draw, counter-current beside co-current, through the
// on-demand full engine. The permeates the page shows are the native
// engine's for the requests it sent (wasm and native differ in the last
// bits), the three profile plots carry both flows and both streams, the
// regeneration table has every route, and the plant ranking lists the
// native engine's candidates in its order. It waits on body data-plant
// and data-system, which the page sets after each run.
func TestPagePlant(t *testing.T) {
	b, _ := openServed(t)
	b.do(t, chromedp.Click(chromedp.ID("tab-plant")), chromedp.Click(chromedp.ID("btn-plant")))
	b.waitFor(t, `/^(done|error)-1$/.test(document.body.dataset.plant || "")`)
	if got := eval[string](t, b, `document.body.dataset.plant`); got != "done-1" {
		b.screenshot(t, "plant")
		t.Fatalf("the module run ended %s: %s", got, eval[string](t, b, `document.getElementById("plant-error").textContent`))
	}
	reqs := eval[map[string]map[string]any](t, b, `window.DrawsiftPage.plantLast().requests`)
	for _, fl := range []string{"counter", "co"} {
		want := nativeJSON[api.ModuleResponse](t, api.OpModule, reqs[fl])
		got := eval[float64](t, b, `Number(document.querySelector("#plant-summary tbody").rows[1].dataset.`+fl+`)`)
		if math.Abs(got-want.PermeateLPerH) > 1e-6*want.PermeateLPerH {
			t.Errorf("%s-current permeate: page %g L/h, native %g", fl, got, want.PermeateLPerH)
		}
	}
	for _, plot := range []string{"plant-concentration", "plant-pi"} {
		if n := eval[int](t, b, `document.querySelectorAll('#plant-plots figure[data-plot="`+plot+`"] g path').length`); n != 4 {
			t.Errorf("%s: %d curves, want 4 (draw and feed, counter and co)", plot, n)
		}
	}
	if n := eval[int](t, b, `document.querySelectorAll('#plant-plots figure[data-plot="plant-flux"] g path').length`); n != 2 {
		t.Errorf("flux plot: %d curves, want 2", n)
	}
	if n := eval[int](t, b, `document.querySelectorAll("#plant-regen tbody tr").length`); n != 6 {
		t.Errorf("regeneration table: %d routes, want 6", n)
	}

	b.screenshot(t, "module")

	// A bad value is refused with the field and the limit, inputs kept.
	b.do(t, chromedp.SetValue(chromedp.ID("pl-qd"), "-5"), chromedp.Click(chromedp.ID("btn-plant")))
	b.waitFor(t, `/^(done|error)-2$/.test(document.body.dataset.plant || "")`)
	if msg := eval[string](t, b, `document.getElementById("plant-error").textContent`); eval[string](t, b, `document.body.dataset.plant`) != "error-2" ||
		!strings.Contains(msg, "draw.flow_l_per_h") || eval[string](t, b, `document.getElementById("pl-qd").value`) != "-5" {
		t.Errorf("a negative draw inflow: %q", msg)
	}

	// The plant ranking: the native engine's order and costs.
	b.do(t, chromedp.Click(chromedp.ID("btn-system")))
	b.waitFor(t, `/^(done|error)-1$/.test(document.body.dataset.system || "")`)
	if got := eval[string](t, b, `document.body.dataset.system`); got != "done-1" {
		b.screenshot(t, "plant-system")
		t.Fatalf("the plant ranking ended %s: %s", got, eval[string](t, b, `document.getElementById("system-error").textContent`))
	}
	b.screenshot(t, "system")
	if n := eval[string](t, b, `document.body.dataset.systemProgress`); n == "" || n == "0" {
		t.Errorf("no progress reported while the candidates were rated (%q)", n)
	}
	body := eval[map[string]any](t, b, `window.DrawsiftPage.systemLast().request`)
	want := nativeJSON[api.ScreenResponse](t, api.OpScreen, body)
	type row struct{ Solute, Cost string }
	rows := eval[[]row](t, b, `Array.from(document.querySelectorAll("#system-table tbody tr")).map(tr => ({solute: tr.dataset.solute, cost: tr.dataset.cost}))`)
	if len(rows) != len(want.Candidates) || len(rows) == 0 {
		t.Fatalf("%d rows, native %d", len(rows), len(want.Candidates))
	}
	for i, r := range rows {
		w := want.Candidates[i]
		var cost float64
		if _, err := fmt.Sscan(r.Cost, &cost); err != nil || r.Solute != w.Solute || math.Abs(cost-w.System.CostUSDPerM3) > 1e-6*w.System.CostUSDPerM3 {
			t.Errorf("row %d: page %s %s USD/m³, native %s %g", i+1, r.Solute, r.Cost, w.Solute, w.System.CostUSDPerM3)
		}
	}
}
