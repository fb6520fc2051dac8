//go:build !js

package site_test

import (
	"context"
	"encoding/json"
	"io/fs"
	"net/http"
	"net/http/httptest"
	"os"
	"strings"
	"sync/atomic"
	"testing"

	"github.com/chromedp/chromedp"

	"drawsift/engine/api"
	"drawsift/site"
)

// siteMux serves the page's own files, index.html at /, and the
// toolchain's wasm_exec.js of the build: what a host adds (the engine's
// wasm, its listings) the caller registers.
func siteMux(t testing.TB, p pageProducts) *http.ServeMux {
	t.Helper()
	index, err := fs.ReadFile(site.FS, "index.html")
	if err != nil {
		t.Fatal(err)
	}
	mux := http.NewServeMux()
	mux.Handle("/", http.FileServerFS(site.FS))
	mux.HandleFunc("/{$}", func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Content-Type", "text/html; charset=utf-8")
		w.Write(index)
	})
	mux.HandleFunc("/wasm_exec.js", func(w http.ResponseWriter, r *http.Request) { http.ServeFile(w, r, p.exec) })
	return mux
}

// engineListings is the listings object the host sends (as
// cmd/drawsift/listings.go makes it), with version v.
func engineListings(t testing.TB, v string) map[string]any {
	t.Helper()
	l := map[string]any{"version": v}
	for _, op := range []string{api.OpDefaults, api.OpPresets, api.OpSolutes} {
		b, e := api.Dispatch(context.Background(), op, nil)
		if e != nil {
			t.Fatal(e)
		}
		var m any
		if err := json.Unmarshal(b, &m); err != nil {
			t.Fatal(err)
		}
		l[op] = m
	}
	return l
}

// TestPageListings: the page builds its form from the engine's listings
// sent with it and checks them against its engine after the first
// ranking — served (listings.json) and from the single-file page (inline)
// alike. Listings of another version are not used; listings of the same
// version that differ from the engine's are found, said, and not used
// again after a reload.
func TestPageListings(t *testing.T) {
	p := pageBuild(t)

	t.Run("served and bundle", func(t *testing.T) {
		url, _ := startServe(t, p)
		for _, u := range []string{url, "file://" + p.bundle} {
			b := browser(t)
			b.do(t, chromedp.Navigate(u))
			b.waitRun(t, "")
			b.waitFor(t, `document.body.dataset.listings !== undefined`)
			if got := eval[string](t, b, `document.body.dataset.listings`); got != "checked" {
				t.Errorf("%s: data-listings %q, want checked (banner %q)", u, got, eval[string](t, b, `document.getElementById("banner").textContent`))
			}
		}
	})

	t.Run("another version or other contents", func(t *testing.T) {
		wasm, err := os.ReadFile(p.wasm)
		if err != nil {
			t.Fatal(err)
		}
		var body atomic.Pointer[[]byte]
		set := func(l map[string]any) {
			b, err := json.Marshal(l)
			if err != nil {
				t.Fatal(err)
			}
			body.Store(&b)
		}
		mux := siteMux(t, p)
		mux.HandleFunc("/drawsift.wasm", func(w http.ResponseWriter, r *http.Request) {
			w.Header().Set("Content-Type", "application/wasm")
			w.Write(wasm)
		})
		mux.HandleFunc("/listings.json", func(w http.ResponseWriter, r *http.Request) {
			w.Header().Set("Content-Type", "application/json")
			w.Header().Set("Cache-Control", "no-store")
			w.Write(*body.Load())
		})
		srv := httptest.NewServer(mux)
		defer srv.Close()
		b := browser(t)

		// Another version: the page asks its engine, and checks nothing.
		set(engineListings(t, "9.9.9"))
		b.do(t, chromedp.Navigate(srv.URL+"/"))
		b.waitRun(t, "")
		b.waitFor(t, `document.body.dataset.warm === "done"`)
		if got := eval[string](t, b, `String(document.body.dataset.listings)`); got != "undefined" {
			t.Errorf("listings of another version: data-listings %q, want none", got)
		}

		// The same version, one solute renamed: the form shows it until
		// the check finds the difference; after a reload the engine's
		// names are back.
		l := engineListings(t, api.EngineVersion)
		l[api.OpSolutes].(map[string]any)["solutes"].([]any)[0].(map[string]any)["name"] = "altered name"
		set(l)
		b.do(t, chromedp.Reload())
		b.waitRun(t, "")
		b.waitFor(t, `document.body.dataset.listings !== undefined`)
		if got := eval[string](t, b, `document.body.dataset.listings`); got != "differ" {
			t.Errorf("altered listings: data-listings %q, want differ", got)
		}
		if msg := eval[string](t, b, `document.getElementById("banner").textContent`); !strings.Contains(msg, "differ from its engine") {
			t.Errorf("altered listings: the banner says %q", msg)
		}
		b.do(t, chromedp.Reload())
		b.waitRun(t, "")
		b.waitFor(t, `document.body.dataset.warm === "done"`)
		if got := eval[string](t, b, `String(document.body.dataset.listings)`); got != "undefined" {
			t.Errorf("after the reload: data-listings %q, want none (read from the engine)", got)
		}
		if html := eval[string](t, b, `document.body.innerHTML`); strings.Contains(html, "altered name") {
			t.Error("after the reload the page still shows the altered listings")
		}
	})
}
