//go:build !js

package httpapi

import (
	"context"
	"time"
)

// withDeadline is the request's context with its deadline, both as a
// timer (Done closes at the deadline, waking whatever waits on it) and
// read from the clock (clockCtx).
func withDeadline(ctx context.Context, d time.Duration) (context.Context, context.CancelFunc) {
	dl := time.Now().Add(d)
	c, cancel := context.WithDeadline(ctx, dl)
	return clockCtx{Context: c, deadline: dl}, cancel
}
