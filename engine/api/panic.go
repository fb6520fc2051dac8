package api

import "sync/atomic"

// lastPanic keeps the details of the last recovered panic for hosts to log
// (users only see "internal error").
var lastPanic atomic.Value

// LastInternalError returns the details of the most recent internal error,
// for host logs.
func LastInternalError() string {
	s, _ := lastPanic.Load().(string)
	return s
}
