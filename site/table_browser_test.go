//go:build !js

package site_test

import (
	"encoding/json"
	"math"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"

	"drawsift/engine/api"
	"drawsift/engine/thermo"
	"drawsift/engine/water"
)

// TestPageTrustMarks: every ranked row shows the engine's trust marks (a
// symbol with its words as text), the legend beside the table lists each
// mark present, and the CSV and the printed report carry them. The demo
// ranks NH4HCO3, which has no non-ideal model (van 't Hoff only).
func TestPageTrustMarks(t *testing.T) {
	b, _ := openServed(t)
	want := nativeJSON[api.ScreenResponse](t, api.OpScreen, nativeRequest(pageScenario(t, b)))
	type row struct {
		Solute string   `json:"solute"`
		Codes  []string `json:"codes"`
		Words  string   `json:"words"`
	}
	rows := eval[[]row](t, b, `Array.from(document.querySelectorAll("#ranking tbody tr")).map(tr => { const m = tr.querySelector("th .trust");
		return {solute: tr.dataset.solute, codes: m ? Array.from(m.querySelectorAll(".trust-mark")).map(s => s.dataset.code) : [], words: m ? m.textContent : ""}; })`)
	if len(rows) != len(want.Candidates) {
		t.Fatalf("page %d rows, engine %d", len(rows), len(want.Candidates))
	}
	byID := map[string]row{}
	for _, r := range rows {
		byID[r.Solute] = r
	}
	codes := map[string]bool{}
	for _, c := range want.Candidates {
		var wc []string
		for _, m := range c.Trust {
			wc = append(wc, m.Code)
			codes[m.Code] = true
			if !strings.Contains(byID[c.Solute].Words, m.Text) {
				t.Errorf("%s: the mark %s has no text equivalent %q in %q", c.Solute, m.Code, m.Text, byID[c.Solute].Words)
			}
		}
		if got := byID[c.Solute].Codes; !slices.Equal(got, wc) && !(len(got) == 0 && len(wc) == 0) {
			t.Errorf("%s: page marks %v, engine %v", c.Solute, got, wc)
		}
	}
	if !slices.Contains(byID["NH4HCO3"].Codes, "van-t-hoff") {
		t.Errorf("NH4HCO3 (van 't Hoff only) marks %v", byID["NH4HCO3"].Codes)
	}
	legend := eval[[]string](t, b, `Array.from(document.querySelectorAll("#trust-legend li")).map(li => li.dataset.code)`)
	for c := range codes {
		if !slices.Contains(legend, c) {
			t.Errorf("legend %v lacks %s", legend, c)
		}
	}
	b.screenshot(t, "trust")
	csv := eval[string](t, b, `window.DrawsiftPage.rankingCSV(window.DrawsiftPage.state.result)`)
	if !strings.Contains(csv, "van-t-hoff") || !strings.Contains(csv, "no non-ideal osmotic model") {
		t.Errorf("the CSV lacks the trust column or its legend:\n%s", csv)
	}
	b.do(t, chromedp.Evaluate[chromedp.Void](`window.dispatchEvent(new Event("beforeprint"))`))
	if n := eval[int](t, b, `document.querySelectorAll('#rp-results tr[data-solute="NH4HCO3"] .trust-mark[data-code="van-t-hoff"]').length + document.querySelectorAll('#rp-results .trust-legend li[data-code="van-t-hoff"]').length`); n != 2 {
		t.Errorf("the report holds %d of the NH4HCO3 mark and its legend entry, want 2", n)
	}
}

// nativeRequest strips what the page adds to a stored scenario (as native does).
func nativeRequest(sc map[string]any) map[string]any {
	req := map[string]any{}
	for k, v := range sc {
		req[k] = v
	}
	delete(req, "uncertainty")
	return req
}

// TestPageColumns: the user hides a column and it stays hidden over a
// reload; solute and score cannot be hidden and stay in view while the
// table scrolls sideways on a tablet; every heading has a definition (its
// tooltip and an entry in the glossary); ◆ is explained beside the table.
func TestPageColumns(t *testing.T) {
	b, _ := openServed(t)
	if n := eval[int](t, b, `document.querySelectorAll("#col-boxes input:disabled").length`); n != 2 {
		t.Errorf("%d fixed columns in the chooser, want 2 (solute, score)", n)
	}
	b.do(t, chromedp.Evaluate[chromedp.Void](`document.getElementById("col-chooser").open = true`),
		chromedp.Click(chromedp.CSS(`#col-boxes input[data-key="viscosity_mpa_s"]`)))
	b.waitFor(t, `!document.querySelector('#ranking thead th[data-key="viscosity_mpa_s"]')`)
	b.do(t, chromedp.Reload())
	b.waitRun(t, "")
	if eval[bool](t, b, `!!document.querySelector('#ranking thead th[data-key="viscosity_mpa_s"]') || document.querySelector('#col-boxes input[data-key="viscosity_mpa_s"]').checked`) {
		t.Error("the hidden column is back after a reload")
	}
	heads := eval[[]string](t, b, `Array.from(document.querySelectorAll("#ranking thead th button")).map(b => b.dataset.key + "=" + (b.title || ""))`)
	gloss := eval[[]string](t, b, `Array.from(document.querySelectorAll("#glossary-list dt[data-key]")).map(d => d.dataset.key)`)
	for _, hd := range heads {
		k, def, _ := strings.Cut(hd, "=")
		if len(def) < 15 {
			t.Errorf("heading %s has no definition: %q", k, def)
		}
		if !slices.Contains(gloss, k) {
			t.Errorf("the glossary lacks %s: %v", k, gloss)
		}
	}
	if !slices.Contains(gloss, "viscosity_mpa_s") {
		t.Error("the glossary drops a hidden column")
	}
	if k := eval[string](t, b, `document.getElementById("pareto-key").textContent`); !strings.Contains(k, "◆") || !strings.Contains(k, "Pareto") {
		t.Errorf("◆ is not explained beside the table: %q", k)
	}
	// Sideways scroll at 768 px: solute and score keep their place.
	if _, err := chromedp.Call(b.ctx, emulation.SetDeviceMetricsOverride, emulation.SetDeviceMetricsOverrideParams{Width: 768, Height: 900, DeviceScaleFactor: 1}); err != nil {
		t.Fatal(err)
	}
	b.waitFor(t, `innerWidth === 768`)
	b.do(t, chromedp.Evaluate[chromedp.Void](`document.getElementById("col-chooser").open = false; document.querySelector("#col-boxes input[data-key='viscosity_mpa_s']").click()`))
	b.waitFor(t, `!!document.querySelector('#ranking thead th[data-key="viscosity_mpa_s"]')`)
	pos := `(() => { const w = document.querySelector("#panel-ranking .table-wrap"), r = document.querySelector("#ranking tbody tr");
		return [w.scrollWidth - w.clientWidth, r.querySelector("th").getBoundingClientRect().left - w.getBoundingClientRect().left, r.querySelector("td.score").getBoundingClientRect().left - w.getBoundingClientRect().left]; })()`
	before := eval[[]float64](t, b, pos)
	if before[0] < 50 {
		t.Fatalf("at 768 px the table does not scroll sideways (%v px): nothing to check", before[0])
	}
	b.do(t, chromedp.Evaluate[chromedp.Void](`(w => { w.scrollLeft = w.scrollWidth; })(document.querySelector("#panel-ranking .table-wrap"))`))
	b.waitFor(t, `(w => w.scrollLeft > 0)(document.querySelector("#panel-ranking .table-wrap"))`)
	after := eval[[]float64](t, b, pos)
	if d1, d2 := after[1]-before[1], after[2]-before[2]; d1 < -1 || d1 > 1 || d2 < -1 || d2 > 1 {
		t.Errorf("solute and score moved by %.0f and %.0f px while the table scrolled", d1, d2)
	}
	// The sticky cells are opaque and do not overlap each other.
	if bad := eval[string](t, b, `(() => { const r = document.querySelector("#ranking tbody tr"), th = r.querySelector("th").getBoundingClientRect(), sc = r.querySelector("td.score").getBoundingClientRect();
		return th.right > sc.left + 1 ? "overlap " + th.right + " > " + sc.left : getComputedStyle(r.querySelector("td.score")).backgroundColor === "rgba(0, 0, 0, 0)" ? "transparent" : ""; })()`); bad != "" {
		t.Errorf("sticky columns: %s", bad)
	}
	b.screenshot(t, "scrolled")
}

// TestPageScoreNormalisation: beside the score the page says it is
// relative to the screened set; choosing reference values in the scenario
// ranks as the engine does natively with the same field, records it in the
// stored scenario, shows NaCl (the reference) at 0.5 and says so.
func TestPageScoreNormalisation(t *testing.T) {
	b, run := openServed(t)
	if n := eval[string](t, b, `document.getElementById("score-note").textContent`); !strings.Contains(n, "relative to the screened set") {
		t.Errorf("score note %q", n)
	}
	if u := eval[string](t, b, `document.querySelector('#ranking thead th[data-key="score"]').textContent`); !strings.Contains(u, "within set") {
		t.Errorf("score heading %q", u)
	}
	b.do(t, chromedp.SetValue(chromedp.ID("score-norm"), "reference"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("score-norm").dispatchEvent(new Event("change", {bubbles: true}))`))
	b.waitRun(t, run)
	sc := pageScenario(t, b)
	if sc["score_normalisation"] != "reference" {
		t.Fatalf("stored scenario: score_normalisation %v", sc["score_normalisation"])
	}
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, sc))
	if s := eval[float64](t, b, `Number(document.querySelector('#ranking tbody tr[data-solute="NaCl"]').dataset.score)`); s < 0.5-1e-9 || s > 0.5+1e-9 {
		t.Errorf("NaCl, the reference, scores %v", s)
	}
	if n := eval[string](t, b, `document.getElementById("score-note").textContent`); !strings.Contains(n, "set-independent") || !strings.Contains(n, "NaCl") {
		t.Errorf("score note %q", n)
	}
	if u := eval[string](t, b, `document.querySelector('#ranking thead th[data-key="score"]').textContent`); !strings.Contains(u, "vs NaCl") {
		t.Errorf("score heading %q", u)
	}
}

// TestPageControls: the membrane menu puts what tells presets apart first
// (each option distinct within its first 24 characters, the full name as
// its title); the menus the engine fills say "Loading…" until it has.
func TestPageControls(t *testing.T) {
	b, _ := openServed(t)
	opts := eval[[][]string](t, b, `Array.from(document.querySelectorAll("#mem-preset option")).map(o => [o.textContent, o.title])`)
	seen := map[string]string{}
	for _, o := range opts {
		k := o[0]
		if r := []rune(k); len(r) > 24 {
			k = string(r[:24])
		}
		if prev, ok := seen[k]; ok {
			t.Errorf("membrane options %q and %q look the same in a narrow menu", prev, o[0])
		}
		seen[k] = o[0]
	}
	served := eval[string](t, b, `fetch("index.html").then(r => r.text())`)
	for _, id := range []string{"feed-preset", "mem-preset", "feed-unit", "basis-unit", "u-pressure", "score-norm"} {
		if !regexp.MustCompile(`<select id="` + id + `"[^>]*><option value="">Loading…</option>`).MatchString(served) {
			t.Errorf("the %s menu has no loading state before the engine answers", id)
		}
	}
}

// TestPageCustomOsmolality: a custom solute typed with decimal commas, its
// data as measured osmolality (mOsm/kg), and a hazard flag: the numbers
// are read as meant, the osmolality becomes π = R·T·ρ_w·osmolality (the
// engine's definition of π from water activity; ρ_w here from
// engine/water, IAPWS-95), the hazard flag reaches the engine, so
// excluding that hazard leaves the solute out.
func TestPageCustomOsmolality(t *testing.T) {
	b, run := openServed(t)
	b.do(t, chromedp.Click(chromedp.ID("tab-candidates")),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("custom-box").open = true`))
	for id, v := range map[string]string{"cs-id": "Draw-O", "cs-mm": "100,5", "cs-nu": "2", "cs-d": "1,2", "cs-sol": "5", "cs-pmin": "0,5", "cs-pmax": "1,5",
		"cs-table": "0,5; 900\n1,0; 1850\n1,5; 2900", "cs-table-t": "25"} {
		b.do(t, chromedp.SetValue(chromedp.ID(id), v))
	}
	b.do(t, chromedp.SetValue(chromedp.ID("cs-table-col"), "mosm"), chromedp.SetValue(chromedp.ID("cs-table-unit"), "mol/kg"),
		chromedp.Click(chromedp.ID("cs-hz-toxic")), chromedp.Click(chromedp.CSS(`#custom-form button[type=submit]`)))
	b.waitFor(t, `!!window.DrawsiftPage.state.custom.find(c => c.id === "Draw-O") || document.getElementById("cs-error").textContent !== ""`)
	if msg := eval[string](t, b, `document.getElementById("cs-error").textContent`); msg != "" {
		t.Fatalf("the custom solute was refused: %s", msg)
	}
	type point struct {
		C  float64 `json:"concentration"`
		Pi float64 `json:"osmotic_pressure_bar"`
	}
	var cs struct {
		M     float64  `json:"molar_mass_g_per_mol"`
		D     float64  `json:"diffusivity_m2_per_s"`
		PMin  float64  `json:"price_usd_per_kg_min"`
		Flags []string `json:"hazard_flags"`
		Table struct {
			Points []point `json:"points"`
		} `json:"osmotic_table"`
	}
	js := eval[string](t, b, `JSON.stringify(window.DrawsiftPage.state.custom.find(c => c.id === "Draw-O"))`)
	if err := json.Unmarshal([]byte(js), &cs); err != nil {
		t.Fatal(err)
	}
	if cs.M != 100.5 || math.Abs(cs.D-1.2e-9) > 1e-21 || cs.PMin != 0.5 || !slices.Equal(cs.Flags, []string{"toxic"}) {
		t.Errorf("decimal commas or flags misread: %s", js)
	}
	tK := 298.15
	for i, mosm := range []float64{900, 1850, 2900} {
		want := thermo.GasConstant * tK * water.Density(tK) * mosm / 1000 / thermo.PascalPerBar
		if len(cs.Table.Points) != 3 || math.Abs(cs.Table.Points[i].Pi-want) > 1e-5*want {
			t.Errorf("point %d: %v, want π %.6g bar", i, cs.Table.Points, want)
		}
	}
	run = b.waitRun(t, run)
	if !eval[bool](t, b, `!!document.querySelector('#ranking tbody tr[data-solute="Draw-O"]')`) {
		t.Fatal("the custom solute is not ranked")
	}
	b.do(t, chromedp.Click(chromedp.ID("hz-toxic")))
	b.waitRun(t, run)
	if r := eval[string](t, b, `(li => li ? li.querySelector(".reason").textContent : "")(document.querySelector('#excluded li[data-solute="Draw-O"]'))`); !strings.Contains(r, "hazard") {
		t.Errorf("excluding toxic: Draw-O left out for %q", r)
	}
}
