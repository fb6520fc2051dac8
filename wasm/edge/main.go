//go:build js && wasm

// Command edge is Drawsift's HTTP JSON API for the edge-worker platform:
// the handler of engine/api/httpapi, served through
// github.com/syumai/workers. Build it with `make edge` (see README.md in
// this directory).
//
// The platform starts a fresh instance of this program for every request
// (the generated worker.mjs does so), so no state survives between
// requests. Configuration comes from the worker's environment variables:
//
//	DRAWSIFT_CORS_ORIGINS   comma-separated origins allowed to call the API
//	                        from a browser, or "*"; unset → CORS off
//	DRAWSIFT_DEADLINE       each request's deadline as a Go duration (e.g.
//	                        "20s"); unset → httpapi.DefaultTimeout. Past it
//	                        the answer is the 504 error on field "deadline",
//	                        before the platform's own CPU limit cuts the
//	                        request off without the contract's error.
//
// The heavy-request slots of httpapi hold per instance, and an instance
// serves one request, so on this platform they never refuse: the
// platform's own scaling and limits take their place.
package main

import (
	"log"
	"os"
	"strings"
	"time"

	"github.com/syumai/workers"
	"github.com/syumai/workers/cloudflare"

	"drawsift/engine/api/httpapi"
)

func main() {
	logger := log.New(os.Stderr, "drawsift edge: ", 0)
	opts := httpapi.Options{
		CORSOrigins: origins(cloudflare.Getenv("DRAWSIFT_CORS_ORIGINS")),
		Logf:        logger.Printf,
	}
	if s := cloudflare.Getenv("DRAWSIFT_DEADLINE"); s != "" {
		d, err := time.ParseDuration(s)
		if err != nil || d <= 0 {
			logger.Printf("DRAWSIFT_DEADLINE %q is not a positive duration; using %v", s, httpapi.DefaultTimeout)
		} else {
			opts.Timeout = d
		}
	}
	workers.Serve(httpapi.New(opts))
}

// origins splits a comma-separated list.
func origins(s string) []string {
	var out []string
	for _, o := range strings.Split(s, ",") {
		if o = strings.TrimSpace(o); o != "" {
			out = append(out, o)
		}
	}
	return out
}
