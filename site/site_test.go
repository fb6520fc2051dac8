package site_test

import (
	"io/fs"
	"regexp"
	"strings"
	"testing"

	"drawsift/engine/api"
	"drawsift/site"
)

// TestPageVersionIsEngineVersion: the page checks the wasm it loads
// against the version in index.html, so that version must be the engine's.
func TestPageVersionIsEngineVersion(t *testing.T) {
	b, err := fs.ReadFile(site.FS, "index.html")
	if err != nil {
		t.Fatal(err)
	}
	m := regexp.MustCompile(`<meta name="drawsift-engine-version" content="([^"]+)">`).FindSubmatch(b)
	if m == nil {
		t.Fatal("index.html has no drawsift-engine-version meta")
	}
	if string(m[1]) != api.EngineVersion {
		t.Errorf("index.html says engine %s; the engine is %s", m[1], api.EngineVersion)
	}
	// The engine's download starts from the head (a preload), at the URL
	// engine.js fetches: the same version.
	if !strings.Contains(string(b), `<link rel="preload" href="drawsift.wasm?v=`+api.EngineVersion+`" as="fetch" type="application/wasm" crossorigin>`) {
		t.Errorf("index.html does not preload drawsift.wasm?v=%s", api.EngineVersion)
	}
}

// TestPageNoForeignOrigins: the page's files name no other origin, no
// inline script or handler, and no eval.
func TestPageNoForeignOrigins(t *testing.T) {
	re := regexp.MustCompile(`(?i)(https?:)?//[a-z0-9.-]+\.[a-z]{2,}`)
	err := fs.WalkDir(site.FS, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, _ := fs.ReadFile(site.FS, p)
		s := string(b)
		for _, m := range re.FindAllString(s, -1) {
			if m != "http://www.w3.org" {
				t.Errorf("%s names another origin: %s", p, m)
			}
		}
		for _, bad := range []string{"eval(", "new Function", "innerHTML", "outerHTML =", "document.write"} {
			if strings.Contains(s, bad) {
				t.Errorf("%s uses %s", p, bad)
			}
		}
		if strings.HasSuffix(p, ".html") {
			if regexp.MustCompile(`<script>|<script [^>]*>[^<]`).MatchString(s) || regexp.MustCompile(`\son[a-z]+=`).MatchString(s) || strings.Contains(s, " style=") {
				t.Errorf("%s has inline script, style or event handlers", p)
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
}

// TestDemoScenarioRuns: the demo the page loads on a first visit is a
// valid scenario for the engine and ranks several candidates.
func TestDemoScenarioRuns(t *testing.T) {
	b, err := fs.ReadFile(site.FS, "demo.json")
	if err != nil {
		t.Fatal(err)
	}
	out, e := api.Dispatch(t.Context(), api.OpScreen, b)
	if e != nil {
		t.Fatalf("demo.json: %s", out)
	}
	if n := strings.Count(string(out), `"rank":`); n < 5 {
		t.Errorf("the demo ranks %d candidates", n)
	}
}

// TestServiceWorkerCachesEveryFile: the service worker's list (sw.js
// FILES) holds every file the page loads — index.html's scripts, style,
// icon and manifest, the worker with its wasm_exec.js, the demo and the
// engine — so that the page works offline after one visit; and each
// listed site file exists.
func TestServiceWorkerCachesEveryFile(t *testing.T) {
	read := func(name string) string {
		b, err := fs.ReadFile(site.FS, name)
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	m := regexp.MustCompile(`(?s)const FILES = \[(.*?)\];`).FindStringSubmatch(read("sw.js"))
	if m == nil {
		t.Fatal("sw.js has no FILES list")
	}
	cached := map[string]bool{}
	for _, q := range regexp.MustCompile(`"([^"]+)"`).FindAllStringSubmatch(m[1], -1) {
		cached[q[1]] = true
	}
	want := []string{"./", "worker.js", "wasm_exec.js", "demo.json", "drawsift.wasm?v=", "listings.json?v="}
	for _, r := range regexp.MustCompile(`(?:src|href)="([A-Za-z0-9_.-]+)"`).FindAllStringSubmatch(read("index.html"), -1) {
		want = append(want, r[1])
	}
	for _, w := range want {
		if !cached[w] {
			t.Errorf("sw.js does not cache %s", w)
		}
	}
	for f := range cached {
		switch f {
		case "./", "wasm_exec.js", "drawsift.wasm?v=", "listings.json?v=": // the page itself and what the host makes
			continue
		}
		if _, err := fs.Stat(site.FS, f); err != nil {
			t.Errorf("sw.js caches %s, which the site does not have", f)
		}
	}
}
