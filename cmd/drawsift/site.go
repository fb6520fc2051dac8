package main

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/base64"
	"encoding/hex"
	"fmt"
	"io"
	"io/fs"
	"net/http"
	"os"
	"path"
	"path/filepath"
	"strings"
	"sync"
	"time"

	"drawsift/site"
)

// siteCSP is the page's Content-Security-Policy: its own scripts, styles
// and worker only; WebAssembly compilation ('wasm-unsafe-eval', not
// 'unsafe-eval'); no inline script or style; network requests to its own
// origin only. data: and blob: images let a chart be drawn on a canvas for
// PNG export.
const siteCSP = "default-src 'none'; script-src 'self' 'wasm-unsafe-eval'; worker-src 'self'; " +
	"connect-src 'self'; style-src 'self'; img-src 'self' data: blob:; manifest-src 'self'; " +
	"base-uri 'none'; form-action 'none'; frame-ancestors 'none'"

// contentTypes maps the extensions the site uses to their media types, so
// that nothing depends on the host's MIME tables.
var contentTypes = map[string]string{
	".html":        "text/html; charset=utf-8",
	".js":          "text/javascript; charset=utf-8",
	".css":         "text/css; charset=utf-8",
	".svg":         "image/svg+xml",
	".png":         "image/png",
	".json":        "application/json",
	".webmanifest": "application/manifest+json",
	".wasm":        "application/wasm",
}

// siteFile is one file ready to serve: its bytes, the gzip form when that
// is smaller, its media type and an ETag.
type siteFile struct {
	body, gz, br []byte
	ctype        string
	etag         string
	mod          time.Time
}

// newSiteFile makes the file name holding b, with its gzip form (gzip -9)
// when that is smaller; gz, when not nil, is that form already made.
func newSiteFile(name string, b, gz []byte, mod time.Time) *siteFile {
	sum := sha256.Sum256(b)
	f := &siteFile{body: b, gz: gz, ctype: contentTypes[path.Ext(name)], mod: mod,
		etag: `"` + base64.RawURLEncoding.EncodeToString(sum[:12]) + `"`}
	if f.ctype == "" {
		f.ctype = "application/octet-stream"
	}
	if gz == nil && len(b) > 1024 && path.Ext(name) != ".png" {
		var buf bytes.Buffer
		zw, _ := gzip.NewWriterLevel(&buf, gzip.BestCompression)
		zw.Write(b)
		zw.Close()
		if buf.Len() < len(b) {
			f.gz = buf.Bytes()
		}
	}
	return f
}

// siteHandler serves the embedded page, the engine's wasm and the
// toolchain's wasm_exec.js (both build products, read from disk and
// re-read when they change).
type siteHandler struct {
	static   map[string]*siteFile // "/index.html" → file
	wasmPath string
	execPath string

	mu    sync.Mutex
	disk  map[string]*siteFile // build products by path
	stamp map[string]time.Time
}

// newSiteHandler serves the static page, the engine's listings (made by
// this build's engine: listings.go) and the engine's wasm, read from
// wasmPath (a build product; `make wasm`), with wasm_exec.js from the same
// directory. A missing wasm is not an error here (the API still serves):
// its URL answers 404 with a hint, and the page says the engine is missing.
func newSiteHandler(wasmPath string) (http.Handler, error) {
	h := &siteHandler{static: map[string]*siteFile{}, wasmPath: wasmPath,
		execPath: filepath.Join(filepath.Dir(wasmPath), "wasm_exec.js"),
		disk:     map[string]*siteFile{}, stamp: map[string]time.Time{}}
	start := time.Now()
	err := fs.WalkDir(site.FS, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := fs.ReadFile(site.FS, p)
		if err != nil {
			return err
		}
		h.static["/"+p] = newSiteFile(p, b, nil, start)
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("site files: %w", err)
	}
	if h.static["/index.html"] == nil {
		return nil, fmt.Errorf("site files: index.html is missing")
	}
	l, err := listings()
	if err != nil {
		return nil, err
	}
	h.static["/"+listingsFile] = newSiteFile(listingsFile, l, nil, start)
	// The build products are read now, not on the first visitor's request
	// (the wasm's checks take tens of ms, and a gzip -9 of it when `make
	// wasm` wrote none, over a second); one missing is read when it appears.
	for _, p := range []string{h.wasmPath, h.execPath} {
		h.fromDisk(p)
	}
	return h, nil
}

// fromDisk returns a build product, reloaded when its size or time changes.
func (h *siteHandler) fromDisk(p string) (*siteFile, error) {
	st, err := os.Stat(p)
	if err != nil {
		return nil, err
	}
	h.mu.Lock()
	defer h.mu.Unlock()
	if f := h.disk[p]; f != nil && h.stamp[p].Equal(st.ModTime()) && int64(len(f.body)) == st.Size() {
		return f, nil
	}
	b, err := os.ReadFile(p)
	if err != nil {
		return nil, err
	}
	// Precompressed forms written by `make wasm` (gzip -9, and brotli where
	// the brotli tool is installed) are used when they hold this very file,
	// checked by content, never by file time (the brotli tool keeps only
	// whole seconds of it): the gzip by decompressing it, the brotli (no
	// decoder in Go's standard library) by the SHA-256 of the file it was
	// made from, which `make wasm` writes beside it (.br.sha256). Without
	// a gzip that holds it, the file is compressed here.
	gz := readIf(p + ".gz")
	if gz != nil && !gunzipEqual(gz, b) {
		gz = nil
	}
	f := newSiteFile(p, b, gz, st.ModTime())
	if sum := readIf(p + ".br.sha256"); sum != nil && madeFrom(sum, b) {
		f.br = readIf(p + ".br")
	}
	h.disk[p], h.stamp[p] = f, st.ModTime()
	return f, nil
}

// readIf returns the contents of p, or nil if it cannot be read.
func readIf(p string) []byte {
	b, err := os.ReadFile(p)
	if err != nil {
		return nil
	}
	return b
}

// madeFrom reports whether sum (a hex SHA-256, as sha256sum prints it,
// first field) is the digest of b.
func madeFrom(sum, b []byte) bool {
	f := strings.Fields(string(sum))
	d := sha256.Sum256(b)
	return len(f) > 0 && strings.EqualFold(f[0], hex.EncodeToString(d[:]))
}

// gunzipEqual reports whether gz decompresses to want.
func gunzipEqual(gz, want []byte) bool {
	zr, err := gzip.NewReader(bytes.NewReader(gz))
	if err != nil {
		return false
	}
	got := make([]byte, len(want)+1) // one byte more: a longer stream is not equal
	n, err := io.ReadFull(zr, got)
	ended := err == io.ErrUnexpectedEOF || (n == 0 && err == io.EOF) // ReadFull's words for a stream that ended early
	return ended && n == len(want) && bytes.Equal(got[:n], want)
}

func (h *siteHandler) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	hd := w.Header()
	hd.Set("Content-Security-Policy", siteCSP)
	hd.Set("X-Content-Type-Options", "nosniff")
	hd.Set("Referrer-Policy", "no-referrer")
	hd.Set("Cross-Origin-Opener-Policy", "same-origin")
	if r.Method != http.MethodGet && r.Method != http.MethodHead {
		hd.Set("Allow", "GET, HEAD")
		http.Error(w, "method not allowed", http.StatusMethodNotAllowed)
		return
	}
	p := r.URL.Path
	if p == "/" {
		p = "/index.html"
	}
	var f *siteFile
	switch p {
	case "/drawsift.wasm", "/wasm_exec.js", "/drawsift-fit.wasm":
		src := h.wasmPath
		switch p {
		case "/wasm_exec.js":
			src = h.execPath
		case "/drawsift-fit.wasm":
			// The full engine for the Fit tab, built beside the page's.
			src = filepath.Join(filepath.Dir(h.wasmPath), "drawsift-fit.wasm")
		}
		var err error
		if f, err = h.fromDisk(src); err != nil {
			http.Error(w, fmt.Sprintf("%s is not built: run `make wasm` (looked for %s)", strings.TrimPrefix(p, "/"), filepath.Base(src)), http.StatusNotFound)
			return
		}
	default:
		f = h.static[p]
	}
	if f == nil {
		http.NotFound(w, r)
		return
	}
	// Always revalidate: a new build must reach the page at once (the
	// page also checks the engine's version against its own).
	hd.Set("Cache-Control", "no-cache")
	hd.Set("Vary", "Accept-Encoding")
	body, etag, enc := f.body, f.etag, ""
	switch {
	case f.br != nil && accepts(r, "br"):
		body, etag, enc = f.br, strings.TrimSuffix(f.etag, `"`)+`-br"`, "br"
	case f.gz != nil && accepts(r, "gzip"):
		body, etag, enc = f.gz, strings.TrimSuffix(f.etag, `"`)+`-gz"`, "gzip"
	}
	hd.Set("ETag", etag)
	if inm := r.Header.Get("If-None-Match"); inm != "" && strings.Contains(inm, etag) {
		w.WriteHeader(http.StatusNotModified)
		return
	}
	hd.Set("Content-Type", f.ctype)
	if enc != "" {
		hd.Set("Content-Encoding", enc)
	}
	hd.Set("Content-Length", fmt.Sprint(len(body)))
	if r.Method == http.MethodHead {
		return
	}
	w.Write(body)
}

// accepts reports whether the request accepts the content coding.
func accepts(r *http.Request, coding string) bool {
	for _, part := range strings.Split(r.Header.Get("Accept-Encoding"), ",") {
		enc, q, _ := strings.Cut(strings.TrimSpace(part), ";")
		if strings.EqualFold(strings.TrimSpace(enc), coding) && strings.ReplaceAll(strings.TrimSpace(q), " ", "") != "q=0" {
			return true
		}
	}
	return false
}
