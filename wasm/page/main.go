//go:build js && wasm

// Command page is the engine as the page's Web Worker runs it: a js/wasm
// build of engine/api.Dispatch, built with -tags stdjson (encoding/json
// keeps the download within its 1.5 MB gzip budget).
//
// It registers three functions on the worker's global object:
//
//	drawsiftCall(id, op, body, onProgress, onDone)  start an operation
//	drawsiftCancel(id)                              cancel it (its context)
//	drawsiftEngineVersion                           api.EngineVersion (a string)
//
// drawsiftCall returns at once; the operation runs on its own goroutine
// and ends with onDone(ok, text), text being the response or the
// contract's error object. Long operations report onProgress(fraction).
// While one runs it yields to the worker's event loop every few tens of
// milliseconds, so that a cancel message posted by the page is seen.
// Every operation, the plots' "batch" included, is api.DispatchProgress's:
// this file only moves text between JavaScript and the engine.
package main

import (
	"context"
	"encoding/json"
	"fmt"
	"sync"
	"syscall/js"
	"time"

	"drawsift/engine/api"
)

// versionMark is the engine version as the page's service worker reads it
// from the wasm's bytes before caching them (site/static/sw.js): a
// constant, so the linker stores it verbatim in the binary's data.
// The version the worker reports is read out of it, so the mark is the one
// copy of the version in the binary and cannot be dropped as unused.
const (
	markPrefix  = "<drawsift-engine-version:"
	versionMark = markPrefix + api.EngineVersion + ">"
)

func main() {
	g := js.Global()
	g.Set("drawsiftEngineVersion", versionMark[len(markPrefix):len(versionMark)-1])
	g.Set("drawsiftCall", js.FuncOf(call))
	g.Set("drawsiftCancel", js.FuncOf(cancel))
	if ready := g.Get("drawsiftReady"); ready.Type() == js.TypeFunction {
		ready.Invoke(api.EngineVersion)
	}
	select {}
}

var (
	mu      sync.Mutex
	running = map[string]context.CancelFunc{}
)

// call is drawsiftCall(id, op, body, onProgress, onDone).
func call(this js.Value, args []js.Value) any {
	if len(args) < 5 {
		panic("drawsiftCall(id, op, body, onProgress, onDone)")
	}
	id, op, body := args[0].String(), args[1].String(), []byte(args[2].String())
	onProgress, onDone := args[3], args[4]
	ctx, stop := context.WithCancel(context.Background())
	mu.Lock()
	running[id] = stop
	mu.Unlock()
	go func() {
		defer func() {
			mu.Lock()
			delete(running, id)
			mu.Unlock()
			stop()
		}()
		y := &yielder{last: time.Now()}
		progress := func(f float64) {
			if onProgress.Type() == js.TypeFunction {
				onProgress.Invoke(f)
			}
			y.maybe()
		}
		out, e := run(ctx, op, body, progress)
		onDone.Invoke(e == nil, string(out))
	}()
	return nil
}

// cancel is drawsiftCancel(id).
func cancel(this js.Value, args []js.Value) any {
	if len(args) < 1 {
		return false
	}
	mu.Lock()
	stop, ok := running[args[0].String()]
	mu.Unlock()
	if ok {
		stop()
	}
	return ok
}

// yielder lets the worker's event loop run now and then during a long
// computation: a goroutine that sleeps parks, the Go scheduler finds
// nothing else to run and returns to JavaScript until the timer fires.
type yielder struct{ last time.Time }

// yieldEvery bounds the time between two yields (a cancel waits at most
// about this long), and so the overhead (one timer, ~1–4 ms, per period).
const yieldEvery = 40 * time.Millisecond

func (y *yielder) maybe() {
	if time.Since(y.last) < yieldEvery {
		return
	}
	time.Sleep(time.Millisecond)
	y.last = time.Now()
}

// run answers one operation.
func run(ctx context.Context, op string, body []byte, progress func(float64)) (out []byte, e *api.Error) {
	defer func() {
		if r := recover(); r != nil {
			e = &api.Error{Message: "internal error", Kind: api.KindInternal}
			out = encodeError(e)
			fmt.Println("drawsift: internal error:", r)
		}
	}()
	out, e = api.DispatchProgress(ctx, op, body, func(done, total int) {
		if total > 0 {
			progress(float64(done) / float64(total))
		}
	})
	if e != nil && e.Kind == api.KindInternal {
		fmt.Println("drawsift: internal error:", e.Detail())
	}
	return out, e
}

func encodeError(e *api.Error) []byte {
	b, err := json.Marshal(api.ErrorBody{Error: e})
	if err != nil {
		return []byte(`{"error":{"field":"","message":"internal error"}}`)
	}
	return b
}
