module drawsift

go 1.26

require (
	github.com/chromedp/cdproto v0.160.1 // indirect
	github.com/chromedp/chromedp v0.23.1 // indirect
	github.com/go-json-experiment/json v0.0.0-20260213210345-44df1a37e875 // indirect
	github.com/goccy/go-json v0.12.0 // indirect
	github.com/syumai/workers v0.33.0 // indirect
	gonum.org/v1/gonum v0.17.0 // indirect
)
