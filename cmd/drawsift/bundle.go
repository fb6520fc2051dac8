package main

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/base64"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"strings"

	"drawsift/site"
)

const bundleUsage = `usage: drawsift bundle -o FILE.html [--wasm PATH] [--wasm-exec PATH]

Writes the page as one self-contained HTML file that opens from file://
with no server: the engine's wasm gzip-compressed and base64-encoded
inside it, every script and style inline under a Content-Security-Policy
built from their SHA-256 hashes.
`

// runBundle is the bundle command.
func runBundle(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("bundle", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() { fmt.Fprint(fs.Output(), bundleUsage+"\nflags:\n"); fs.PrintDefaults() }
	out := fs.String("o", "", "write the page to `FILE`.html (required)")
	wasm := fs.String("wasm", "build/drawsift.wasm", "the page's engine `PATH`, as built by make wasm")
	exec := fs.String("wasm-exec", "", "`PATH` of wasm_exec.js from the toolchain that built the wasm (default: beside the wasm)")
	if wantsHelp(args) {
		fs.SetOutput(stdout)
		fs.Usage()
		return 0
	}
	if err := fs.Parse(args); err != nil {
		return 1
	}
	if *out == "" || fs.NArg() > 0 {
		fs.Usage()
		return 1
	}
	if *exec == "" {
		*exec = filepath.Join(filepath.Dir(*wasm), "wasm_exec.js")
	}
	wasmBytes, err := os.ReadFile(*wasm)
	if err != nil {
		fmt.Fprintf(stderr, "drawsift bundle: %v (build it with `make wasm`)\n", err)
		return 1
	}
	execJS, err := os.ReadFile(*exec)
	if err != nil {
		fmt.Fprintf(stderr, "drawsift bundle: %v (copy it from the toolchain: $(go env GOROOT)/lib/wasm/wasm_exec.js)\n", err)
		return 1
	}
	page, err := buildBundle(site.FS, wasmBytes, execJS)
	if err != nil {
		fmt.Fprintf(stderr, "drawsift bundle: %v\n", err)
		return 1
	}
	if err := os.WriteFile(*out, page, 0o644); err != nil {
		fmt.Fprintf(stderr, "drawsift bundle: %v\n", err)
		return 1
	}
	fmt.Fprintf(stdout, "drawsift bundle: wrote %s (%d bytes; engine %d bytes, %d gzip)\n", *out, len(page), len(wasmBytes), gzipLen(wasmBytes))
	return 0
}

var (
	reScriptSrc = regexp.MustCompile(`<script src="([a-z0-9_-]+\.js)" defer></script>\n?`)
	reStyle     = regexp.MustCompile(`<link rel="stylesheet" href="([a-z0-9_-]+\.css)">`)
	reIcon      = regexp.MustCompile(`<link rel="icon" href="([a-z0-9_-]+\.svg)" type="image/svg\+xml">`)
	reManifest  = regexp.MustCompile(`<link rel="manifest" href="[^"]*">\n?`)
	rePreload   = regexp.MustCompile(`<link rel="preload" [^>]*>\n?`)
)

// buildBundle turns the site's index.html into one self-contained page.
//
// The page's scripts move, in order, to the end of <body> as inline
// scripts (inline scripts cannot be deferred). The worker's source
// (wasm_exec.js, then worker.js), the demo scenario, and the wasm and
// the engine's listings (listings.go), both gzip-compressed, travel in
// <script> elements of non-script types, which the browser never runs;
// engine.js builds the worker from a Blob and decompresses the wasm and
// the listings with DecompressionStream. The manifest is dropped (file:// has no service
// worker), so is the wasm's preload, and the icon becomes a data: URL.
func buildBundle(files fs.FS, wasm, wasmExec []byte) ([]byte, error) {
	read := func(name string) (string, error) {
		b, err := fs.ReadFile(files, name)
		if err != nil {
			return "", fmt.Errorf("site file: %w", err)
		}
		return string(b), nil
	}
	html, err := read("index.html")
	if err != nil {
		return nil, err
	}
	var scripts []string
	for _, m := range reScriptSrc.FindAllStringSubmatch(html, -1) {
		js, err := read(m[1])
		if err != nil {
			return nil, err
		}
		scripts = append(scripts, js)
	}
	if len(scripts) == 0 {
		return nil, fmt.Errorf("index.html names no scripts")
	}
	html = reScriptSrc.ReplaceAllString(html, "")
	m := reStyle.FindStringSubmatch(html)
	if m == nil {
		return nil, fmt.Errorf("index.html names no stylesheet")
	}
	css, err := read(m[1])
	if err != nil {
		return nil, err
	}
	html = strings.Replace(html, m[0], "<style>"+css+"</style>", 1)
	if m := reIcon.FindStringSubmatch(html); m != nil {
		icon, err := read(m[1])
		if err != nil {
			return nil, err
		}
		html = strings.Replace(html, m[0], `<link rel="icon" href="data:image/svg+xml;base64,`+base64.StdEncoding.EncodeToString([]byte(icon))+`">`, 1)
	}
	html = reManifest.ReplaceAllString(html, "")
	html = rePreload.ReplaceAllString(html, "") // the wasm travels inside the page

	worker, err := read("worker.js")
	if err != nil {
		return nil, err
	}
	workerSrc := string(wasmExec) + "\n" + worker
	demo, err := read("demo.json")
	if err != nil {
		return nil, err
	}
	lists, err := listings()
	if err != nil {
		return nil, err
	}
	for _, s := range append([]string{css, workerSrc, demo}, scripts...) {
		if strings.Contains(strings.ToLower(s), "</script") || strings.Contains(strings.ToLower(s), "</style") {
			return nil, fmt.Errorf("a script or style contains a closing tag and cannot be inlined")
		}
	}
	// The wasm and the listings travel gzip-compressed in base64.
	packed := func(b []byte) string {
		var gz bytes.Buffer
		zw, _ := gzip.NewWriterLevel(&gz, gzip.BestCompression)
		zw.Write(b)
		zw.Close() // writes to memory: cannot fail
		return base64.StdEncoding.EncodeToString(gz.Bytes())
	}

	var tail strings.Builder
	tail.WriteString(`<script type="application/json" id="ds-demo">` + demo + "</script>\n")
	tail.WriteString(`<script type="application/octet-stream" id="ds-listings">` + packed(lists) + "</script>\n")
	tail.WriteString(`<script type="text/plain" id="ds-worker">` + workerSrc + "</script>\n")
	tail.WriteString(`<script type="application/octet-stream" id="ds-wasm">` + packed(wasm) + "</script>\n")
	hashes := []string{}
	for _, s := range scripts {
		tail.WriteString("<script>" + s + "</script>\n")
		hashes = append(hashes, "'"+sha256B64(s)+"'")
	}
	i := strings.LastIndex(html, "</body>")
	if i < 0 {
		return nil, fmt.Errorf("index.html has no </body>")
	}
	html = html[:i] + tail.String() + html[i:]

	// The policy: only these scripts and this style; the worker from a
	// Blob; wasm compilation; no network at all.
	csp := "default-src 'none'; script-src " + strings.Join(hashes, " ") + " 'wasm-unsafe-eval'; " +
		"style-src '" + sha256B64(css) + "'; worker-src blob:; img-src data: blob:; base-uri 'none'; form-action 'none'"
	meta := `<meta charset="utf-8">`
	if !strings.Contains(html, meta) {
		return nil, fmt.Errorf("index.html lacks %s", meta)
	}
	html = strings.Replace(html, meta, meta+"\n"+`<meta http-equiv="Content-Security-Policy" content="`+csp+`">`, 1)
	return []byte(html), nil
}

func sha256B64(s string) string {
	sum := sha256.Sum256([]byte(s))
	return "sha256-" + base64.StdEncoding.EncodeToString(sum[:])
}

func gzipLen(b []byte) int {
	var buf bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&buf, gzip.BestCompression)
	zw.Write(b)
	zw.Close()
	return buf.Len()
}
