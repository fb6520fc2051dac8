module drawsift

go 1.26.0

// Each direct requirement and why (DEVELOPERS.md, "Build details").
require (
	github.com/chromedp/cdproto v0.160.1 // browser tests only (site/): DevTools calls (print media, network log, downloads)
	github.com/chromedp/chromedp v0.23.1 // browser tests only (site/): drives headless Chromium
	github.com/goccy/go-json v0.12.0 // engine/internal/jsonx on native hosts: ≈3.7× faster than encoding/json for our payloads
	github.com/syumai/workers v0.33.0 // wasm/edge: the edge-worker host; later versions are not served here
	gonum.org/v1/gonum v0.17.0 // engine numerics: monotone interpolation, quadrature, Monte Carlo distributions
)

require (
	github.com/BurntSushi/toml v1.4.1-0.20240526193622-a339e1f7089c // indirect
	github.com/go-json-experiment/json v0.0.0-20260213210345-44df1a37e875 // indirect
	golang.org/x/exp/typeparams v0.0.0-20231108232855-2478ac86f678 // indirect
	golang.org/x/mod v0.41.0 // indirect
	golang.org/x/sync v0.23.0 // indirect
	golang.org/x/tools v0.51.0 // indirect
	honnef.co/go/tools v0.8.2 // indirect
)

// staticcheck for make check (go tool staticcheck); its modules are the
// indirect requirements above.
tool honnef.co/go/tools/cmd/staticcheck
