module drawsift

go 1.26

require (
	// chromedp drives headless Chromium in the page's browser tests (site/).
	github.com/chromedp/cdproto v0.160.1
	github.com/chromedp/chromedp v0.23.1
	// go-json: the engine's JSON (engine/internal/jsonx); the page's wasm
	// builds with -tags stdjson instead, to stay within its download budget.
	github.com/goccy/go-json v0.12.0
	// workers: the HTTP handler on the edge-worker platform (wasm/edge);
	// v0.33.0 is the newest version the module proxy here serves.
	github.com/syumai/workers v0.33.0
	// gonum: interpolation, statistics and linear algebra in the engine.
	gonum.org/v1/gonum v0.17.0
)

require github.com/go-json-experiment/json v0.0.0-20260213210345-44df1a37e875 // indirect
