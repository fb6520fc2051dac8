//go:build !js

package site_test

import (
	"fmt"
	"slices"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"drawsift/engine/api"
)

// setField sets a form field through the DOM (an input event), as a user's
// edit does.
func setField(t testing.TB, b *browserSession, id, v string) {
	t.Helper()
	b.do(t, chromedp.Evaluate[chromedp.Void](fmt.Sprintf(`(e => { e.value = %q; e.dispatchEvent(new Event("input", {bubbles: true})); e.dispatchEvent(new Event("change", {bubbles: true})); })(document.getElementById(%q))`, v, id)))
}

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
