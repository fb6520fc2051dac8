package main

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/base64"
	"encoding/hex"
	"io"
	"io/fs"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"drawsift/site"
)

// fakeBuild writes a stand-in wasm and wasm_exec.js (the handler serves
// bytes; it does not run them).
func fakeBuild(t *testing.T) (wasmPath string, wasm []byte) {
	t.Helper()
	dir := t.TempDir()
	wasm = bytes.Repeat([]byte("\x00asm\x01\x00\x00\x00 engine bytes "), 4000)
	wasmPath = filepath.Join(dir, "drawsift.wasm")
	if err := os.WriteFile(wasmPath, wasm, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "wasm_exec.js"), []byte("// wasm_exec.js stand-in\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	return wasmPath, wasm
}

func get(t *testing.T, h http.Handler, method, path string, hdr map[string]string) *http.Response {
	t.Helper()
	req := httptest.NewRequest(method, path, nil)
	for k, v := range hdr {
		req.Header.Set(k, v)
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec.Result()
}

func TestSiteHandlerServesPage(t *testing.T) {
	wasmPath, wasm := fakeBuild(t)
	h, err := newSiteHandler(wasmPath)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct{ path, ctype string }{
		{"/", "text/html; charset=utf-8"},
		{"/app.js", "text/javascript; charset=utf-8"},
		{"/core.js", "text/javascript; charset=utf-8"},
		{"/form.js", "text/javascript; charset=utf-8"},
		{"/results.js", "text/javascript; charset=utf-8"},
		{"/plots.js", "text/javascript; charset=utf-8"},
		{"/library.js", "text/javascript; charset=utf-8"},
		{"/report.js", "text/javascript; charset=utf-8"},
		{"/fit.js", "text/javascript; charset=utf-8"},
		{"/files.js", "text/javascript; charset=utf-8"},
		{"/worker.js", "text/javascript; charset=utf-8"},
		{"/sw.js", "text/javascript; charset=utf-8"},
		{"/app.css", "text/css; charset=utf-8"},
		{"/manifest.webmanifest", "application/manifest+json"},
		{"/icon.svg", "image/svg+xml"},
		{"/demo.json", "application/json"},
		{"/drawsift.wasm", "application/wasm"},
		{"/wasm_exec.js", "text/javascript; charset=utf-8"},
	} {
		r := get(t, h, "GET", tc.path, nil)
		if r.StatusCode != 200 {
			t.Errorf("%s: status %d", tc.path, r.StatusCode)
			continue
		}
		if got := r.Header.Get("Content-Type"); got != tc.ctype {
			t.Errorf("%s: Content-Type %q, want %q", tc.path, got, tc.ctype)
		}
		csp := r.Header.Get("Content-Security-Policy")
		for _, must := range []string{"default-src 'none'", "script-src 'self' 'wasm-unsafe-eval'", "connect-src 'self'", "frame-ancestors 'none'"} {
			if !strings.Contains(csp, must) {
				t.Errorf("%s: CSP %q lacks %q", tc.path, csp, must)
			}
		}
		for _, never := range []string{"unsafe-inline", "'unsafe-eval'", "http:", "https:", "*"} {
			if strings.Contains(csp, never) {
				t.Errorf("%s: CSP %q allows %q", tc.path, csp, never)
			}
		}
		if r.Header.Get("X-Content-Type-Options") != "nosniff" {
			t.Errorf("%s: no nosniff", tc.path)
		}
	}
	// The wasm travels gzip-compressed to a browser that accepts it, and
	// decompresses to the built file.
	r := get(t, h, "GET", "/drawsift.wasm", map[string]string{"Accept-Encoding": "gzip, deflate, br"})
	if r.Header.Get("Content-Encoding") != "gzip" {
		t.Fatalf("wasm not gzip-encoded: %v", r.Header)
	}
	zr, err := gzip.NewReader(r.Body)
	if err != nil {
		t.Fatal(err)
	}
	got, _ := io.ReadAll(zr)
	if !bytes.Equal(got, wasm) {
		t.Error("the gzip wasm does not decompress to the built file")
	}
	// Revalidation answers 304 with the same ETag.
	etag := r.Header.Get("ETag")
	if r := get(t, h, "GET", "/drawsift.wasm", map[string]string{"Accept-Encoding": "gzip", "If-None-Match": etag}); r.StatusCode != http.StatusNotModified {
		t.Errorf("revalidation: status %d", r.StatusCode)
	}
	// A rebuilt wasm is served at once.
	os.WriteFile(wasmPath, []byte("rebuilt"), 0o644)
	if b, _ := io.ReadAll(get(t, h, "GET", "/drawsift.wasm", nil).Body); string(b) != "rebuilt" {
		t.Errorf("after a rebuild the handler serves %q", b[:min(len(b), 20)])
	}
}

func TestSiteHandlerRefuses(t *testing.T) {
	wasmPath, _ := fakeBuild(t)
	h, err := newSiteHandler(wasmPath)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		method, path string
		status       int
	}{
		{"GET", "/nope.js", 404},
		{"GET", "/../go.mod", 404},
		{"GET", "/static/index.html", 404},
		{"POST", "/", 405},
		{"DELETE", "/app.js", 405},
	} {
		if r := get(t, h, tc.method, tc.path, nil); r.StatusCode != tc.status {
			t.Errorf("%s %s: status %d, want %d", tc.method, tc.path, r.StatusCode, tc.status)
		}
	}
	// A missing build is a 404 that says how to build it, not a failure
	// to start (the API still serves).
	h2, err := newSiteHandler(filepath.Join(t.TempDir(), "absent.wasm"))
	if err != nil {
		t.Fatal(err)
	}
	r := get(t, h2, "GET", "/drawsift.wasm", nil)
	b, _ := io.ReadAll(r.Body)
	if r.StatusCode != 404 || !strings.Contains(string(b), "make wasm") {
		t.Errorf("missing wasm: %d %q", r.StatusCode, b)
	}
}

// TestBundleIsSelfContained checks the single-file page: every script
// inline and listed by hash in its CSP, no 'unsafe-inline', no reference
// to another file, and the wasm inside decompresses to the original.
func TestBundleIsSelfContained(t *testing.T) {
	_, wasm := fakeBuild(t)
	page, err := buildBundle(site.FS, wasm, []byte("/* wasm_exec.js */ globalThis.Go = class {};\n"))
	if err != nil {
		t.Fatal(err)
	}
	html := string(page)
	m := regexp.MustCompile(`<meta http-equiv="Content-Security-Policy" content="([^"]+)">`).FindStringSubmatch(html)
	if m == nil {
		t.Fatal("no CSP meta")
	}
	csp := m[1]
	if strings.Contains(csp, "unsafe-inline") || strings.Contains(csp, "'unsafe-eval'") {
		t.Errorf("CSP %q", csp)
	}
	if i, j := strings.Index(html, "Content-Security-Policy"), strings.Index(html, "<script"); i > j {
		t.Error("the CSP comes after a script")
	}
	// Every executable script's hash is in the policy, and nothing else runs.
	scripts := regexp.MustCompile(`(?s)<script( [^>]*)?>(.*?)</script>`).FindAllStringSubmatch(html, -1)
	exec := 0
	for _, s := range scripts {
		if strings.Contains(s[1], "type=") {
			if !regexp.MustCompile(`type="(text/plain|application/octet-stream|application/json)"`).MatchString(s[1]) {
				t.Errorf("script with attributes %q", s[1])
			}
			continue
		}
		if strings.Contains(s[1], "src=") {
			t.Errorf("script loads a file: %q", s[1])
		}
		exec++
		sum := sha256.Sum256([]byte(s[2]))
		if h := "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"; !strings.Contains(csp, h) {
			t.Errorf("script %d's hash %s is not in the CSP", exec, h)
		}
	}
	// One inline script for each script index.html names, in its order.
	index, err := fs.ReadFile(site.FS, "index.html")
	if err != nil {
		t.Fatal(err)
	}
	names := reScriptSrc.FindAllStringSubmatch(string(index), -1)
	if len(names) < 4 || exec != len(names) {
		t.Errorf("%d executable scripts, want one for each of the %d scripts of index.html", exec, len(names))
	}
	at := 0
	for _, n := range names {
		js, err := fs.ReadFile(site.FS, n[1])
		if err != nil {
			t.Fatal(err)
		}
		i := strings.Index(html[at:], "<script>"+string(js)+"</script>")
		if i < 0 {
			t.Errorf("%s is not inlined after the scripts before it", n[1])
			continue
		}
		at += i
	}
	style := regexp.MustCompile(`(?s)<style>(.*?)</style>`).FindStringSubmatch(html)
	if style == nil {
		t.Fatal("no inline style")
	}
	sum := sha256.Sum256([]byte(style[1]))
	if !strings.Contains(csp, "style-src 'sha256-"+base64.StdEncoding.EncodeToString(sum[:])+"'") {
		t.Error("the style's hash is not the CSP's style-src")
	}
	for _, ref := range []string{`src="`, `href="app.css"`, `rel="manifest"`, `href="icon.svg"`} {
		if strings.Contains(html, ref) {
			t.Errorf("the bundle still refers to a file: %s", ref)
		}
	}
	b64 := regexp.MustCompile(`(?s)<script type="application/octet-stream" id="ds-wasm">(.*?)</script>`).FindStringSubmatch(html)
	if b64 == nil {
		t.Fatal("no embedded wasm")
	}
	gz, err := base64.StdEncoding.DecodeString(b64[1])
	if err != nil {
		t.Fatal(err)
	}
	zr, err := gzip.NewReader(bytes.NewReader(gz))
	if err != nil {
		t.Fatal(err)
	}
	if got, _ := io.ReadAll(zr); !bytes.Equal(got, wasm) {
		t.Error("the embedded wasm does not decompress to the original")
	}
}

func TestBundleCommand(t *testing.T) {
	wasmPath, _ := fakeBuild(t)
	out := filepath.Join(t.TempDir(), "page.html")
	var stdout, stderr bytes.Buffer
	if code := run([]string{"bundle", "-o", out, "--wasm", wasmPath}, nil, &stdout, &stderr); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr.String())
	}
	if fi, err := os.Stat(out); err != nil || fi.Size() < 10000 {
		t.Fatalf("bundle: %v", err)
	}
	stderr.Reset()
	if code := run([]string{"bundle", "-o", out, "--wasm", filepath.Join(t.TempDir(), "none.wasm")}, nil, &stdout, &stderr); code != 1 || !strings.Contains(stderr.String(), "make wasm") {
		t.Errorf("missing wasm: exit %d, %q", code, stderr.String())
	}
	if code := run([]string{"bundle"}, nil, &stdout, &stderr); code != 1 {
		t.Errorf("no -o: exit %d", code)
	}
}

// TestSiteHandlerPrecompressed serves the precompressed wasm that `make
// wasm` writes, brotli first, and ignores stale or broken ones, judged by
// content: a brotli copy older by the clock but made from this wasm is
// served; one without its digest, or made from another build, is not.
func TestSiteHandlerPrecompressed(t *testing.T) {
	wasmPath, wasm := fakeBuild(t)
	var gz bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&gz, gzip.BestCompression)
	zw.Write(wasm)
	zw.Close()
	os.WriteFile(wasmPath+".gz", gz.Bytes(), 0o644)
	os.WriteFile(wasmPath+".br", []byte("brotli bytes"), 0o644)
	sum := sha256.Sum256(wasm)
	os.WriteFile(wasmPath+".br.sha256", []byte(hex.EncodeToString(sum[:])+"  drawsift.wasm\n"), 0o644)
	old := time.Now().Add(-time.Hour) // the brotli tool's truncated times
	os.Chtimes(wasmPath+".br", old, old)
	os.Chtimes(wasmPath+".gz", old, old)
	h, _ := newSiteHandler(wasmPath)
	r := get(t, h, "GET", "/drawsift.wasm", map[string]string{"Accept-Encoding": "gzip, deflate, br"})
	if b, _ := io.ReadAll(r.Body); r.Header.Get("Content-Encoding") != "br" || string(b) != "brotli bytes" {
		t.Errorf("with br accepted: %q", r.Header.Get("Content-Encoding"))
	}
	r = get(t, h, "GET", "/drawsift.wasm", map[string]string{"Accept-Encoding": "gzip"})
	if b, _ := io.ReadAll(r.Body); r.Header.Get("Content-Encoding") != "gzip" || !bytes.Equal(b, gz.Bytes()) {
		t.Error("the precompressed gzip is not served")
	}
	// Without its digest a brotli copy is not served.
	os.Remove(wasmPath + ".br.sha256")
	h, _ = newSiteHandler(wasmPath)
	if r := get(t, h, "GET", "/drawsift.wasm", map[string]string{"Accept-Encoding": "br"}); r.Header.Get("Content-Encoding") == "br" {
		t.Error("a brotli copy without its digest is served")
	}
	os.WriteFile(wasmPath+".br.sha256", []byte(hex.EncodeToString(sum[:])+"  drawsift.wasm\n"), 0o644)
	h, _ = newSiteHandler(wasmPath)
	// A .gz that does not match the wasm is not served.
	os.WriteFile(wasmPath+".gz", []byte("junk"), 0o644)
	os.WriteFile(wasmPath, append(wasm, 'x'), 0o644) // a rebuild: the brotli copy and its digest are of the old one
	r = get(t, h, "GET", "/drawsift.wasm", map[string]string{"Accept-Encoding": "gzip, br"})
	zr, err := gzip.NewReader(r.Body)
	if err != nil || r.Header.Get("Content-Encoding") != "gzip" {
		t.Fatalf("after a rebuild: %v %q", err, r.Header.Get("Content-Encoding"))
	}
	if b, _ := io.ReadAll(zr); !bytes.Equal(b, append(wasm, 'x')) {
		t.Error("after a rebuild the served wasm is stale")
	}
}

// TestGunzipEqual: a precompressed copy is taken only when it holds the
// very bytes: not a stream one byte longer or shorter, nor one whose
// checksum fails.
func TestGunzipEqual(t *testing.T) {
	gz := func(b []byte) []byte {
		var buf bytes.Buffer
		zw := gzip.NewWriter(&buf)
		zw.Write(b)
		zw.Close()
		return buf.Bytes()
	}
	want := []byte("the engine's bytes")
	bad := gz(want)
	bad[len(bad)-8] ^= 1 // the CRC-32 in the trailer
	for _, c := range []struct {
		name string
		gz   []byte
		want []byte
		ok   bool
	}{
		{"same", gz(want), want, true},
		{"empty", gz(nil), nil, true},
		{"empty against bytes", gz(nil), want, false},
		{"longer", gz(append(append([]byte(nil), want...), 'x')), want, false},
		{"shorter", gz(want[:len(want)-1]), want, false},
		{"another", gz([]byte("the engine's byteZ")), want, false},
		{"bad checksum", bad, want, false},
		{"not gzip", []byte("junk"), want, false},
	} {
		if got := gunzipEqual(c.gz, c.want); got != c.ok {
			t.Errorf("%s: %v, want %v", c.name, got, c.ok)
		}
	}
}

// TestSiteHandlerServesFitEngine: the Fit tab's engine (drawsift-fit.wasm,
// built beside the page's by make wasm) is served from beside --wasm, as
// application/wasm, and a missing one is a 404 that says how to build it.
func TestSiteHandlerServesFitEngine(t *testing.T) {
	wasmPath, _ := fakeBuild(t)
	h, err := newSiteHandler(wasmPath)
	if err != nil {
		t.Fatal(err)
	}
	if r := get(t, h, "GET", "/drawsift-fit.wasm", nil); r.StatusCode != http.StatusNotFound {
		t.Errorf("missing fit engine: status %d", r.StatusCode)
	}
	fit := []byte("\x00asm\x01\x00\x00\x00 fit engine")
	if err := os.WriteFile(filepath.Join(filepath.Dir(wasmPath), "drawsift-fit.wasm"), fit, 0o644); err != nil {
		t.Fatal(err)
	}
	r := get(t, h, "GET", "/drawsift-fit.wasm", nil)
	body, _ := io.ReadAll(r.Body)
	if r.StatusCode != 200 || r.Header.Get("Content-Type") != "application/wasm" || !bytes.Equal(body, fit) {
		t.Errorf("fit engine: status %d, type %q, %d bytes", r.StatusCode, r.Header.Get("Content-Type"), len(body))
	}
}
