//go:build !nofit

package api

import "context"

// ModuleInBuild reports whether this build carries the module operation.
const ModuleInBuild = true

func moduleOp(ctx context.Context, body []byte) (any, *Error) {
	var req ModuleRequest
	if e := decode(body, &req); e != nil {
		return nil, e
	}
	return Module(ctx, &req)
}
