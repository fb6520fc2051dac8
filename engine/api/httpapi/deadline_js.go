//go:build js

package httpapi

import (
	"context"
	"time"
)

// withDeadline is the request's context with its deadline read from the
// clock only. Under js/wasm a timer is a pending JavaScript timeout that
// outlives the request: the edge glue ends the Go program once the answer
// is sent, and the timeout firing later throws "Go program has already
// exited" (seen under Node). The engine polls ctx.Err(), which reads the
// clock, so no timer is needed.
func withDeadline(ctx context.Context, d time.Duration) (context.Context, context.CancelFunc) {
	return clockCtx{Context: ctx, deadline: time.Now().Add(d)}, func() {}
}
