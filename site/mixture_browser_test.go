//go:build !js

package site_test

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"drawsift/engine/api"
)

// nativeSaturation is the part of a native screen the saturation table
// shows: the bulk feed's indices and each candidate's at the feed face.
type nativeSaturation struct {
	Feed       map[string]float64 `json:"feed_saturation_indices"`
	Candidates []struct {
		Solute  string `json:"solute"`
		Scaling []struct {
			Mineral string  `json:"mineral"`
			SI      float64 `json:"saturation_index"`
		} `json:"scaling"`
	} `json:"candidates"`
}

// nativeJSON runs op natively on body and decodes the answer into T.
func nativeJSON[T any](t testing.TB, op string, body any) T {
	t.Helper()
	b, _ := json.Marshal(body)
	out, e := api.Dispatch(context.Background(), op, b)
	if e != nil {
		t.Fatalf("native %s of %s: %s", op, b, out)
	}
	var v T
	if err := json.Unmarshal(out, &v); err != nil {
		t.Fatal(err)
	}
	return v
}

// TestPageBlend builds a blend in the page, sees it ranked as the engine
// ranks it natively, its saturation indices at the feed face and the
// bulk feed's, its properties and π curve beside its parts'; a bad share
// is refused beside the builder; the blend survives a reload and leaves
// with its button.
func TestPageBlend(t *testing.T) {
	b, run := openServed(t)
	const id = "NaCl+MgCl2 9:1"
	b.do(t, chromedp.Click(chromedp.ID("tab-candidates")),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("blend-box").open = true`))
	// The builder starts with NaCl 9 : MgCl2 1 by mole. A zero share first.
	b.do(t, chromedp.SetValue(chromedp.CSS(`#blend-parts tr:nth-child(2) [data-part="share"]`), "0"),
		chromedp.Click(chromedp.CSS(`#blend-form button[type=submit]`)))
	b.waitFor(t, `document.getElementById("blend-error").textContent !== ""`)
	if msg := eval[string](t, b, `document.getElementById("blend-error").textContent`); !strings.Contains(msg, "Part 2 (MgCl2)") || !strings.Contains(msg, "above 0") {
		t.Errorf("zero share: message %q", msg)
	}
	if eval[bool](t, b, `JSON.parse(localStorage.getItem("drawsift.scenario.v1")).candidates.some(c => typeof c === "object")`) {
		t.Fatal("a refused blend joined the scenario")
	}
	b.do(t, chromedp.SetValue(chromedp.CSS(`#blend-parts tr:nth-child(2) [data-part="share"]`), "1"),
		chromedp.Click(chromedp.CSS(`#blend-form button[type=submit]`)))
	b.waitFor(t, fmt.Sprintf(`!!document.querySelector('#blend-list li[data-blend=%q]')`, id))
	b.waitRun(t, run)
	if !eval[bool](t, b, fmt.Sprintf(`!!document.querySelector('#ranking tbody tr[data-solute=%q]')`, id)) {
		t.Fatalf("the blend is not in the ranked table")
	}
	sc := pageScenario(t, b)
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, sc))
	var blend map[string]any
	for _, c := range sc["candidates"].([]any) {
		if m, ok := c.(map[string]any); ok {
			blend = m
		}
	}
	if blend == nil || blend["id"] != id || fmt.Sprint(blend["blend"]) != "[map[mole_fraction:0.9 solute:NaCl] map[mole_fraction:0.1 solute:MgCl2]]" {
		t.Errorf("stored blend %v", blend)
	}

	// The saturation table: the bulk feed's indices and each candidate's
	// at the feed face, as the engine computes them.
	req := map[string]any{}
	for k, v := range sc {
		req[k] = v
	}
	delete(req, "uncertainty")
	want := nativeJSON[nativeSaturation](t, api.OpScreen, req)
	type cell struct {
		Where, Solute, Mineral string
		SI                     float64
	}
	cells := eval[[]cell](t, b, `(() => { const heads = Array.from(document.querySelectorAll("#scaling-table thead th")).map(th => th.textContent);
		return Array.from(document.querySelectorAll("#scaling-table tbody tr")).flatMap(tr => Array.from(tr.querySelectorAll("td")).map((td, i) =>
		({where: tr.dataset.where, solute: tr.dataset.solute || "", mineral: heads[i + 1], si: td.dataset.si === undefined ? NaN : Number(td.dataset.si)}))); })()`)
	if len(cells) == 0 {
		t.Fatal("the saturation table is empty for a seawater feed")
	}
	gypsum := false
	for _, c := range cells {
		w, ok := want.Feed[c.Mineral]
		if c.Where == "face" {
			ok = false
			for _, x := range want.Candidates {
				if x.Solute == c.Solute {
					for _, s := range x.Scaling {
						if s.Mineral == c.Mineral {
							w, ok = s.SI, true
						}
					}
				}
			}
		}
		if !ok {
			if !math.IsNaN(c.SI) {
				t.Errorf("%s %s %s: the page shows %g where the engine gives none", c.Where, c.Solute, c.Mineral, c.SI)
			}
			continue
		}
		if math.Abs(c.SI-w) > 1e-9 {
			t.Errorf("%s %s %s: SI %g on the page, %g native", c.Where, c.Solute, c.Mineral, c.SI, w)
		}
		gypsum = gypsum || c.Mineral == "gypsum" && c.Where == "bulk"
	}
	if !gypsum {
		t.Error("the bulk seawater feed's gypsum index is not shown")
	}
	b.do(t, chromedp.Click(chromedp.ID("tab-ranking")), chromedp.Evaluate[chromedp.Void](`document.getElementById("scaling-table").scrollIntoView()`))
	b.screenshot(t, "saturation")
	// Each supersaturated cell says so in words, not only by colour.
	if eval[bool](t, b, `Array.from(document.querySelectorAll("#scaling-table td.sat.over")).some(td => !td.textContent.includes("supersaturated"))`) {
		t.Error("a supersaturated cell lacks its text")
	}

	// The blend's properties: the engine's answer for the blend at 1 mol/L.
	b.do(t, chromedp.Click(chromedp.ID("tab-candidates")), chromedp.Click(chromedp.CSS(fmt.Sprintf(`#blend-list li[data-blend=%q] button`, id))))
	b.waitFor(t, `/^done-/.test(document.body.dataset.solution || "") && !document.getElementById("panel-solution").hidden`)
	tC := 25.0
	if v, ok := sc["temperature_c"].(float64); ok {
		tC = v
	}
	osm := nativeJSON[map[string]any](t, api.OpOsmotic, map[string]any{"id": id, "blend": blend["blend"], "concentration": 1, "unit": "mol/L", "temperature_c": tC})
	if got := eval[string](t, b, `document.querySelector('#sol-props dd[data-key="water_activity"]').textContent`); got != strconv.FormatFloat(osm["water_activity"].(float64), 'f', 4, 64) {
		t.Errorf("water activity on the page %q, native %v", got, osm["water_activity"])
	}
	if got := eval[string](t, b, `document.querySelector('#sol-props dd[data-key="model"]').textContent`); got != osm["model"] {
		t.Errorf("model on the page %q, native %v", got, osm["model"])
	}
	ions := eval[[]string](t, b, `Array.from(document.querySelectorAll("#sol-ions tbody th")).map(th => th.textContent)`)
	if strings.Join(ions, " ") != "Na+ Cl- Mg+2" {
		t.Errorf("ions %v, want Na+ Cl- Mg+2", ions)
	}
	parts := eval[[]string](t, b, `Array.from(document.querySelectorAll("#sol-parts tbody th")).map(th => th.textContent)`)
	if strings.Join(parts, " ") != "NaCl MgCl2" {
		t.Errorf("parts %v", parts)
	}
	// The π curve: the blend (real and van 't Hoff) beside each part alone.
	curves := eval[int](t, b, `document.querySelectorAll('#sol-plot [data-plot="solution-pi"] g[clip-path] path').length`)
	if curves != 4 {
		t.Errorf("the blend's π plot has %d curves, want 4 (blend, its van 't Hoff line, NaCl, MgCl2)", curves)
	}
	legend := eval[string](t, b, `document.querySelector('#sol-plot [data-plot="solution-pi"]').textContent`)
	for _, w := range []string{id, "NaCl alone", "MgCl2 alone"} {
		if !strings.Contains(legend, w) {
			t.Errorf("the π plot does not name %q", w)
		}
	}
	b.screenshot(t, "properties")
	// A concentration past halite's saturation is refused with the limit.
	b.do(t, chromedp.SetValue(chromedp.ID("sol-conc"), "9"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("sol-conc").dispatchEvent(new Event("input", {bubbles: true}))`))
	b.waitFor(t, `/^error-/.test(document.body.dataset.solution)`)
	if msg := eval[string](t, b, `document.getElementById("sol-error").textContent`); !strings.Contains(msg, "concentration") || !strings.Contains(msg, "limit") {
		t.Errorf("past solubility: %q", msg)
	}
	b.screenshot(t, "solution")

	// Kept over a reload; removed with its button.
	b.do(t, chromedp.Reload())
	run = b.waitRun(t, "")
	if !eval[bool](t, b, fmt.Sprintf(`!!document.querySelector('#ranking tbody tr[data-solute=%q]') && !!document.querySelector('#blend-list li[data-blend=%q]')`, id, id)) {
		t.Fatal("the blend is gone after a reload")
	}
	b.do(t, chromedp.Click(chromedp.ID("tab-candidates")),
		chromedp.Click(chromedp.CSS(fmt.Sprintf(`#blend-list li[data-blend=%q] button:last-child`, id))))
	b.waitRun(t, run)
	if eval[bool](t, b, fmt.Sprintf(`!!document.querySelector('#ranking tbody tr[data-solute=%q]')`, id)) {
		t.Error("the removed blend is still ranked")
	}
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, pageScenario(t, b)))
}
