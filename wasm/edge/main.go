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
package main

import (
	"log"
	"os"
	"strings"

	"github.com/syumai/workers"
	"github.com/syumai/workers/cloudflare"

	"drawsift/engine/api/httpapi"
)

func main() {
	logger := log.New(os.Stderr, "drawsift edge: ", 0)
	workers.Serve(httpapi.New(httpapi.Options{
		CORSOrigins: origins(cloudflare.Getenv("DRAWSIFT_CORS_ORIGINS")),
		Logf:        logger.Printf,
	}))
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
