//go:build !js

package site_test

import (
	"fmt"
	"strings"
	"testing"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// TestPageWidths: from a 360 px phone to a 1,400 px laptop the page never
// scrolls sideways; the ranking table, wider than a phone, scrolls inside
// its own box. A screenshot of each width is kept.
func TestPageWidths(t *testing.T) {
	b, _ := openServed(t)
	for _, w := range []int64{360, 390, 768, 1400} {
		if _, err := chromedp.Call(b.ctx, emulation.SetDeviceMetricsOverride, emulation.SetDeviceMetricsOverrideParams{Width: w, Height: 844, DeviceScaleFactor: 1}); err != nil {
			t.Fatal(err)
		}
		b.waitFor(t, fmt.Sprintf(`innerWidth === %d`, w))
		if sw := eval[int](t, b, `document.documentElement.scrollWidth`); sw > int(w)+1 {
			wide := eval[[]string](t, b, `Array.from(document.querySelectorAll("body *")).filter(e => { const r = e.getBoundingClientRect(); return r.right > innerWidth + 1 && !(e.parentElement && e.parentElement.closest(".table-wrap")); }).slice(0, 12).map(e => e.tagName + "#" + e.id + "." + e.className + " " + Math.round(e.getBoundingClientRect().right))`)
			kids := eval[[]string](t, b, `[document.body.scrollWidth + " body"].concat(Array.from(document.querySelectorAll("body *")).filter(e => e.scrollWidth > innerWidth + 1 && getComputedStyle(e).overflowX === "visible").slice(0, 15).map(e => e.tagName + "#" + e.id + "." + e.className + " sw " + e.scrollWidth + " cw " + e.clientWidth))`)
			t.Errorf("at %d px the page is %d px wide; wider elements: %v %v", w, sw, wide, kids)
		}
		if w < 700 {
			box := eval[[]int](t, b, `(e => [e.scrollWidth, e.clientWidth])(document.querySelector("#panel-ranking .table-wrap"))`)
			if box[1] > int(w) || box[0] <= box[1] {
				t.Errorf("at %d px the ranking box is %d px wide holding %d px: it should scroll inside the page", w, box[1], box[0])
			}
		}
		b.screenshot(t, fmt.Sprintf("%dpx", w))
	}
}

// TestPageStaleResults: when the latest edit cannot be ranked (A = −2) the
// old ranking is dimmed and marked as belonging to an earlier scenario, and
// the CSV, the JSON and the printed report are withheld with a message;
// once the field is fixed, the marks go and exports work again.
func TestPageStaleResults(t *testing.T) {
	b, run := openServed(t)
	set := func(id, v string) {
		b.do(t, chromedp.Evaluate[chromedp.Void](fmt.Sprintf(`(e => { e.value = %q; e.dispatchEvent(new Event("input", {bubbles: true})); })(document.getElementById(%q))`, v, id)))
	}
	// Count the page's downloads.
	b.do(t, chromedp.Evaluate[chromedp.Void](`window.__downloads = 0; (d => { window.DrawsiftStore.download = function () { window.__downloads++; return d.apply(this, arguments); }; })(window.DrawsiftStore.download)`))
	set("mem-a", "-2")
	r := b.settle(t)
	if strings.HasPrefix(r, "done-") {
		t.Fatalf("A = −2 ranked: %s", r)
	}
	if !eval[bool](t, b, `document.body.dataset.stale === "true" && document.getElementById("results-area").classList.contains("stale") && !document.getElementById("stale-note").hidden`) {
		t.Fatal("the old ranking is not marked stale")
	}
	for _, id := range []string{"btn-csv", "btn-json"} {
		b.do(t, chromedp.Click(chromedp.ID(id)))
		if msg := eval[string](t, b, `document.getElementById("banner").textContent`); !strings.Contains(msg, "withheld") {
			t.Errorf("%s on stale results: banner %q", id, msg)
		}
	}
	// Printing (also from the browser's own menu: beforeprint) shows no results.
	b.do(t, chromedp.Evaluate[chromedp.Void](`window.dispatchEvent(new Event("beforeprint"))`))
	if eval[int](t, b, `document.querySelectorAll("#rp-results table").length`) != 0 || !strings.Contains(eval[string](t, b, `document.getElementById("rp-meta").textContent`), "No report") {
		t.Error("the printed report still holds the stale results")
	}
	if n := eval[int](t, b, `window.__downloads`); n != 0 {
		t.Errorf("%d downloads of stale results", n)
	}
	b.screenshot(t, "stale")
	set("mem-a", "1.63")
	b.waitRun(t, run)
	if eval[bool](t, b, `document.body.dataset.stale === "true" || !document.getElementById("stale-note").hidden`) {
		t.Error("the stale mark stays after a good run")
	}
	b.do(t, chromedp.Click(chromedp.ID("btn-json")))
	b.waitFor(t, `window.__downloads === 1`)
}
