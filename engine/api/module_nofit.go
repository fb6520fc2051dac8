//go:build nofit

package api

import (
	"context"

	"drawsift/engine/scenario"
)

// ModuleInBuild reports whether this build carries the module operation.
const ModuleInBuild = false

// moduleOp is left out of builds tagged nofit, as the fit operation is:
// the page's main engine must stay inside its download budget; the
// page's on-demand engine (drawsift-fit.wasm), the CLI, the HTTP API and
// the edge carry it.
func moduleOp(ctx context.Context, body []byte) (any, *Error) {
	return nil, &Error{Field: "operation", Message: "the module operation is not in this build of the engine (the page's on-demand engine drawsift-fit.wasm, the CLI, the HTTP API and the edge carry it)", Kind: KindNotFound}
}

// systemStage needs the module operation: left out alike.
func systemStage(context.Context, *ScreenRequest, *scenario.Info, *ScreenResponse, func(int, int)) *Error {
	return &Error{Field: "system", Message: "plant-scale rating (the system object and basis) is not in this build of the engine (the page's on-demand engine drawsift-fit.wasm, the CLI, the HTTP API and the edge carry it)", Kind: KindNotFound}
}
