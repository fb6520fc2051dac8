//go:build nofit

package api

import "context"

// FitInBuild reports whether this build carries the fit operation.
const FitInBuild = false

// fitOp is left out of builds tagged nofit: the page's main engine, which
// must stay inside its download budget; the page loads the full engine
// (drawsift-fit.wasm) for its Fit tab.
func fitOp(ctx context.Context, body []byte, progress func(done, total int)) (any, *Error) {
	return nil, &Error{Field: "operation", Message: "the fit operation is not in this build of the engine (the page's Fit tab loads drawsift-fit.wasm; the CLI, the HTTP API and the edge carry it)", Kind: KindNotFound}
}
