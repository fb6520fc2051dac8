//go:build !js

package site_test

import (
	"bytes"
	"net/http"
	"net/http/httptest"
	"os"
	"strings"
	"sync/atomic"
	"testing"

	"github.com/chromedp/chromedp"

	"drawsift/engine/api"
)

// TestPageOfflineKeepsMatchingEngine (issue #15 item 10): the service
// worker caches only a set of files that matches the page's version. A
// server that sends an engine of another version (here the real engine
// with another version mark, so that it still runs) fails the install —
// no cache, and the page says why on body data-offline — and, once a
// matching set is cached, answers fetched later never replace it: offline,
// the page runs on the matching engine.
func TestPageOfflineKeepsMatchingEngine(t *testing.T) {
	p := pageBuild(t)
	good, err := os.ReadFile(p.wasm)
	if err != nil {
		t.Fatal(err)
	}
	mark := []byte("<drawsift-engine-version:" + api.EngineVersion + ">")
	if bytes.Count(good, mark) != 1 {
		t.Fatalf("the page's wasm carries %d version marks %q, want 1", bytes.Count(good, mark), mark)
	}
	otherVersion := strings.Repeat("9", len(api.EngineVersion))
	other := bytes.Replace(good, mark, []byte("<drawsift-engine-version:"+otherVersion+">"), 1)
	var wasm atomic.Pointer[[]byte]
	wasm.Store(&other)

	mux := siteMux(t, p)
	mux.HandleFunc("/drawsift.wasm", func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Content-Type", "application/wasm")
		w.Header().Set("Cache-Control", "no-cache")
		w.Write(*wasm.Load())
	})
	srv := httptest.NewServer(mux)
	defer srv.Close()
	b := browser(t)

	// 1. Another engine: the page computes online, the install refuses.
	b.do(t, chromedp.Navigate(srv.URL+"/"))
	b.waitFor(t, `document.body.dataset.offline === "refused"`)
	if msg := eval[string](t, b, `document.getElementById("offline-state").textContent`); !strings.Contains(msg, otherVersion) || !strings.Contains(msg, api.EngineVersion) {
		t.Errorf("the refusal %q does not name both versions", msg)
	}
	if n := eval[int](t, b, `caches.keys().then(k => k.length)`); n != 0 {
		t.Errorf("a refused install left %d caches", n)
	}

	// 2. The matching engine: the install caches the set.
	wasm.Store(&good)
	b.do(t, chromedp.Reload())
	b.waitFor(t, `document.body.dataset.offline === "ready"`)

	// 3. Another engine again, while online: the page gets it from the
	// network (network first), the cache keeps the matching one.
	wasm.Store(&other)
	b.do(t, chromedp.Reload())
	b.waitFor(t, `document.body.dataset.engine === "ready" && document.body.dataset.offline === "ready"`)
	const cachedMark = `caches.open("drawsift-" + %q).then(c => c.match("drawsift.wasm?v=" + %q)).then(r => r.arrayBuffer()).then(buf => {
		const s = new TextDecoder("latin1").decode(new Uint8Array(buf));
		const i = s.indexOf("<drawsift-engine-version:");
		return i < 0 ? "none" : s.slice(i + 25, s.indexOf(">", i));
	})`
	js := strings.NewReplacer("%q", `"`+api.EngineVersion+`"`).Replace(cachedMark)
	if v := eval[string](t, b, js); v != api.EngineVersion {
		t.Errorf("the cached engine is version %q, want %s", v, api.EngineVersion)
	}

	// 4. Offline: the page runs on the cached, matching engine.
	srv.Close()
	b.do(t, chromedp.Reload())
	b.waitRun(t, "")
	rows := eval[[]pageRow](t, b, jsRows)
	sameRanking(t, rows, native(t, pageScenario(t, b)))
	b.screenshot(t, "offline-matching")
}
