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
