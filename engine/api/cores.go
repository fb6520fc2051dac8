package api

import (
	"context"

	"drawsift/engine/screen"
)

// WithCores limits the cores a request's robustness run uses under ctx
// to n (a server sharing its cores between concurrent requests). The
// answer does not depend on it: the figures are bit for bit the same on
// any number of cores.
func WithCores(ctx context.Context, n int) context.Context { return screen.WithCores(ctx, n) }
