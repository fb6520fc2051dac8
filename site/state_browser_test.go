//go:build !js

package site_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// TestPageImportsHold: a valid minimal scenario (no membrane, no channel)
// imports, ranks and prints without a false error; a share link that
// inflates far past any scenario is stopped while it is read; an
// inherited key such as __proto__ is refused by name like any unknown key.
func TestPageImportsHold(t *testing.T) {
	b, run := openServed(t)
	dir := t.TempDir()
	f := filepath.Join(dir, "minimal.json")
	os.WriteFile(f, []byte(`{"candidates": ["NaCl", "KCl"]}`), 0o644)
	b.do(t, chromedp.Evaluate[chromedp.Void](`document.getElementById("banner").hidden = true`),
		chromedp.SetUploadFiles(chromedp.ID("file-import"), []string{f}))
	b.waitRun(t, run)
	if msg := eval[string](t, b, `document.getElementById("banner").hidden ? "" : document.getElementById("banner").textContent`); msg != "" {
		t.Errorf("minimal import: banner %q", msg)
	}
	if n := len(eval[[]pageRow](t, b, jsRows)); n != 2 {
		t.Errorf("minimal import ranks %d candidates, want 2", n)
	}
	sameRanking(t, eval[[]pageRow](t, b, jsRows), native(t, pageScenario(t, b)))
	b.do(t, chromedp.Evaluate[chromedp.Void](`window.dispatchEvent(new Event("beforeprint"))`))
	if eval[int](t, b, `document.querySelectorAll("#rp-results table.ranking tbody tr").length`) != 2 {
		t.Error("the minimal scenario does not print")
	}

	// __proto__ names no field of a scenario.
	f = filepath.Join(dir, "proto.json")
	os.WriteFile(f, []byte(`{"__proto__": {"x": 1}, "candidates": ["NaCl"]}`), 0o644)
	b.do(t, chromedp.Evaluate[chromedp.Void](`document.getElementById("banner").hidden = true`),
		chromedp.SetUploadFiles(chromedp.ID("file-import"), []string{f}))
	b.waitFor(t, `!document.getElementById("banner").hidden`)
	if msg := eval[string](t, b, `document.getElementById("banner").textContent`); !strings.Contains(msg, "__proto__") || !strings.Contains(msg, "Nothing was changed") {
		t.Errorf("__proto__ import: %q", msg)
	}

	// A link of about 100 KB that inflates to about 100 MB.
	got := eval[string](t, b, `(async () => {
		const big = new TextEncoder().encode('{"candidates":["' + "N".repeat(100 * 1024 * 1024) + '"]}');
		const z = await new Response(new Blob([big]).stream().pipeThrough(new CompressionStream("deflate-raw"))).arrayBuffer();
		let s = "", u = new Uint8Array(z);
		for (let i = 0; i < u.length; i += 0x8000) s += String.fromCharCode.apply(null, u.subarray(i, i + 0x8000));
		const frag = "z" + btoa(s).replace(/\+/g, "-").replace(/\//g, "_").replace(/=+$/, "");
		try { await window.DrawsiftStore.decodeShare(frag); return "decoded " + frag.length; } catch (e) { return e.message + " (" + frag.length + ")"; }
	})()`)
	if !strings.Contains(got, "expands past") {
		t.Errorf("inflating link: %q", got)
	}
}

// TestPageRestartChecksVersion: a worker restart (after a cancel the
// engine could not honour) that meets another engine version, or fails,
// is reported on the page, and every later call fails with that reason
// instead of computing with a mismatched engine.
func TestPageRestartChecksVersion(t *testing.T) {
	b, _ := openServed(t)
	got := eval[string](t, b, `(async () => {
		const e = window.DrawsiftPage.state.engine;
		const real = e.start.bind(e);
		e.start = async () => { await real(); throw new Error("The engine (version 9.9.9) does not match this page"); };
		await e.restart();
		const r = await e.call("defaults", {});
		return [document.body.dataset.engine, document.getElementById("banner").textContent, String(r.ok), r.data.error.message].join(" | ");
	})()`)
	parts := strings.Split(got, " | ")
	if len(parts) != 4 || parts[0] != "failed" || !strings.Contains(parts[1], "9.9.9") || parts[2] != "false" || !strings.Contains(parts[3], "does not match") {
		t.Errorf("after a restart with another version: %q", got)
	}
}

// TestPageNeverLosesWork: loading the demo, opening a share link and an
// unreadable saved scenario each keep the scenario they push aside and
// offer it back in one step; two tabs adding custom solutes keep both.
func TestPageNeverLosesWork(t *testing.T) {
	b, run := openServed(t)
	url := eval[string](t, b, `location.href.replace(/#.*$/, "")`)
	set := func(id, v string) {
		b.do(t, chromedp.Evaluate[chromedp.Void](`(e => { e.value = "`+v+`"; e.dispatchEvent(new Event("input", {bubbles: true})); })(document.getElementById("`+id+`"))`))
	}
	stored := func() float64 {
		sc := pageScenario(t, b)
		v, _ := sc["temperature_c"].(float64)
		return v
	}
	set("temp", "33")
	b.waitFor(t, `JSON.parse(localStorage.getItem("drawsift.scenario.v1")).temperature_c === 33`)
	run = b.waitRun(t, run)
	// The demo replaces it; one click brings it back.
	b.do(t, chromedp.Click(chromedp.ID("btn-demo")))
	b.waitFor(t, `!document.getElementById("undo").hidden && JSON.parse(localStorage.getItem("drawsift.scenario.v1")).temperature_c !== 33`)
	run = b.waitRun(t, run)
	b.do(t, chromedp.Click(chromedp.ID("btn-undo")))
	b.waitFor(t, `JSON.parse(localStorage.getItem("drawsift.scenario.v1")).temperature_c === 33`)
	b.waitRun(t, run)
	if v := eval[string](t, b, `document.getElementById("temp").value`); v != "33" {
		t.Errorf("after undo the form shows %q °C", v)
	}
	// A share link of another scenario: shown, the saved one kept.
	frag := eval[string](t, b, `window.DrawsiftStore.encodeShare({"candidates": ["NaCl", "KCl"], "temperature_c": 21})`)
	b.do(t, chromedp.Navigate(url+"#s="+frag))
	b.do(t, chromedp.Reload())
	b.waitRun(t, "")
	if stored() != 21 || !strings.Contains(eval[string](t, b, `document.getElementById("undo-text").textContent`), "kept") {
		t.Fatalf("the link's scenario: stored %v, undo %q", stored(), eval[string](t, b, `document.getElementById("undo-text").textContent`))
	}
	b.do(t, chromedp.Click(chromedp.ID("btn-undo")))
	b.waitFor(t, `JSON.parse(localStorage.getItem("drawsift.scenario.v1")).temperature_c === 33`)
	// An unreadable saved scenario is kept aside, said, and downloadable.
	b.do(t, chromedp.Navigate(url),
		chromedp.Evaluate[chromedp.Void](`localStorage.setItem("drawsift.scenario.v1", JSON.stringify({"temperature_c": "warm"}))`),
		chromedp.Reload())
	b.waitRun(t, "")
	if msg := eval[string](t, b, `document.getElementById("undo").hidden ? "" : document.getElementById("undo-text").textContent`); !strings.Contains(msg, "could not be read") {
		t.Errorf("unreadable saved scenario: %q", msg)
	}
	if got := eval[string](t, b, `localStorage.getItem("drawsift.scenario.backup.v1")`); !strings.Contains(got, "warm") {
		t.Errorf("the unreadable scenario is not kept: %q", got)
	}
	// Two tabs add custom solutes; both stay.
	ctx2, cancel := chromedp.NewContext(b.ctx)
	defer cancel()
	b2 := &browserSession{ctx: ctx2}
	b2.do(t, chromedp.Navigate(url))
	b2.waitFor(t, `document.body.dataset.engine === "ready" && !!document.body.dataset.run`)
	add := func(s *browserSession, id string) {
		s.do(t, chromedp.Evaluate[chromedp.Void](`(P => { P.state.custom.push({"id": "`+id+`", "molar_mass_g_per_mol": 100, "van_t_hoff_factor": 2, "diffusivity_m2_per_s": 1e-9, "miscible": true, "source": "test"}); P.saveCustom(); })(window.DrawsiftPage)`))
	}
	add(b2, "Tab-B")
	b.waitFor(t, `window.DrawsiftPage.state.custom.some(c => c.id === "Tab-B")`)
	add(b, "Tab-A")
	b2.waitFor(t, `window.DrawsiftPage.state.custom.some(c => c.id === "Tab-A")`)
	ids := eval[[]string](t, b, `JSON.parse(localStorage.getItem("drawsift.custom-solutes.v1")).map(c => c.id)`)
	if !strings.Contains(strings.Join(ids, ","), "Tab-A") || !strings.Contains(strings.Join(ids, ","), "Tab-B") {
		t.Errorf("stored custom solutes %v, want both tabs' additions", ids)
	}
}
