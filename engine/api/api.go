// Package api is Drawsift's contract: the request and response types shared
// by the page, the CLI and the HTTP API, and the one Dispatch every front
// end calls. It is the only engine package that knows JSON.
package api

import (
	"context"
	"drawsift/engine/limits"
	"errors"
	"fmt"
	"math"
	"runtime/debug"
	"sort"
	"strings"
	"sync"

	"drawsift/engine/errs"
	"drawsift/engine/internal/jsonx"
	"drawsift/engine/library"
)

// EngineVersion identifies the engine build in every response; the page
// compares it with the version of the wasm it loaded.
const EngineVersion = "0.1.0"

// Operation names accepted by Dispatch (also the HTTP paths /v1/<op>).
const (
	OpOsmotic = "osmotic"
	OpFlux    = "flux"
	OpScreen  = "screen"
	OpSolutes = "solutes"
	OpPresets = "presets"
	OpHealth  = "health"
	// OpDefaults reports the engine's defaults and limits.
	OpDefaults = "defaults"
	// OpBatch runs a list of osmotic and flux requests in one call.
	OpBatch = "batch"
	// OpFit fits a membrane's A, B and S to measured fluxes.
	OpFit = "fit"
	// OpModule rates or designs a module (plug flow along the area).
	OpModule = "module"
)

// Operations lists every operation Dispatch runs.
var Operations = []string{OpOsmotic, OpFlux, OpScreen, OpSolutes, OpPresets, OpDefaults, OpBatch, OpFit, OpModule, OpRobustnessMerge, OpHealth}

// Error kinds, mapped to HTTP statuses by the hosts.
const (
	KindInvalid  = "invalid"  // 400
	KindNotFound = "notfound" // 404: unknown operation
	KindInternal = "internal" // 500
	// KindTimeout: the request's deadline passed before it finished
	// (field "deadline"); hosts answer 504.
	KindTimeout = "timeout"
)

// Error is the contract's error object: {"error": {"field", "message", "limit"}}.
type Error struct {
	Field   string `json:"field"`
	Message string `json:"message"`
	Limit   any    `json:"limit,omitempty"`
	Kind    string `json:"-"`
	// detail holds what an internal error hides from users, for host logs.
	detail string
}

// Detail returns the internal details of a KindInternal error (a panic's
// value and stack, or the failing step) for host logs; users only see
// "internal error".
func (e *Error) Detail() string { return e.detail }

func (e *Error) Error() string {
	if e.Field == "" {
		return e.Message
	}
	return e.Field + ": " + e.Message
}

// ErrorBody wraps an Error as it travels.
type ErrorBody struct {
	Error *Error `json:"error"`
}

// Invalid returns a KindInvalid error on field.
func Invalid(field string, limit any, format string, a ...any) *Error {
	return &Error{Field: field, Message: fmt.Sprintf(format, a...), Limit: limit, Kind: KindInvalid}
}

// Dispatch runs one operation on a JSON request and returns the JSON
// response. On failure it returns the encoded error object and the
// *Error (whose Kind selects the HTTP status). A panic inside the engine
// becomes a KindInternal error: the message says "internal error" and the
// details are kept for host logs in the returned error's Detail.
func Dispatch(ctx context.Context, op string, body []byte) (out []byte, e *Error) {
	return DispatchProgress(ctx, op, body, nil)
}

// DispatchProgress is Dispatch with a progress callback for long
// operations (a screen's robustness run reports done of total samples);
// progress may be nil. Cancelling ctx stops a long operation.
func DispatchProgress(ctx context.Context, op string, body []byte, progress func(done, total int)) (out []byte, e *Error) {
	defer func() {
		if r := recover(); r != nil {
			e = panicError(r)
			out = encodeError(e)
		}
	}()
	resp, e := answer(ctx, op, body, progress)
	if e != nil {
		return encodeError(e), e
	}
	return encodeResponse(resp)
}

// AppendDispatch is DispatchProgress appending the answer (the same bytes)
// to dst, for a caller that reuses its buffers: the encoding is written
// into dst's room instead of a fresh copy of its own, which is a fifth of
// a flux request's time and most of its garbage.
func AppendDispatch(ctx context.Context, dst []byte, op string, body []byte, progress func(done, total int)) (out []byte, e *Error) {
	n := len(dst)
	defer func() {
		if r := recover(); r != nil {
			e = panicError(r)
			out = append(dst[:n], encodeError(e)...)
		}
	}()
	resp, e := answer(ctx, op, body, progress)
	if e != nil {
		return append(dst, encodeError(e)...), e
	}
	w := appender{dst}
	if err := jsonx.NewEncoder(&w).Encode(resp); err != nil {
		b, e := encodeResponse(resp) // the same failure, worded by encodeResponse
		return append(dst[:n], b...), e
	}
	return w.b[:len(w.b)-1], nil // the encoder's newline dropped, as Marshal has none
}

// appender is an io.Writer appending to its slice.
type appender struct{ b []byte }

func (a *appender) Write(p []byte) (int, error) {
	a.b = append(a.b, p...)
	return len(p), nil
}

// panicError is the KindInternal error of a panic inside the engine.
func panicError(r any) *Error {
	return &Error{Message: "internal error", Kind: KindInternal, detail: fmt.Sprintf("panic: %v\n%s", r, debug.Stack())}
}

// answer decodes a request and runs its operation.
func answer(ctx context.Context, op string, body []byte, progress func(done, total int)) (resp any, e *Error) {
	switch op {
	case OpOsmotic:
		var req OsmoticRequest
		if e = decode(body, &req); e == nil {
			resp, e = Osmotic(&req)
		}
	case OpFlux:
		var req FluxRequest
		if e = decode(body, &req); e == nil {
			resp, e = Flux(&req)
		}
	case OpScreen:
		var req ScreenRequest
		if e = decode(body, &req); e == nil {
			resp, e = Screen(ctx, &req, progress)
		}
	case OpSolutes:
		resp, e = Solutes()
	case OpPresets:
		resp, e = Presets()
	case OpDefaults:
		resp = Defaults()
	case OpBatch:
		var items []BatchItem
		if e = decode(body, &items); e == nil {
			resp, e = Batch(ctx, items, progress)
		} else {
			e.Field = errs.Join("batch", e.Field)
		}
	case OpFit:
		resp, e = fitOp(ctx, body, progress)
	case OpModule:
		resp, e = moduleOp(ctx, body)
	case OpRobustnessMerge:
		var req RobustnessMergeRequest
		if e = decode(body, &req); e == nil {
			resp, e = RobustnessMerge(&req)
		}
	case OpHealth:
		resp = Health{Status: "ok", EngineVersion: EngineVersion, JSON: jsonx.Library}
	default:
		e = &Error{Field: "operation", Message: fmt.Sprintf("unknown operation %q (one of %s)", op, strings.Join(Operations, ", ")), Kind: KindNotFound}
	}
	return resp, e
}

// encodeResponse encodes a response. The last guard of "never NaN or
// Inf": a non-finite number that got past every range becomes the
// contract's error naming the result field, never a failed encoding.
func encodeResponse(resp any) ([]byte, *Error) {
	b, err := jsonx.Marshal(resp)
	if err != nil {
		var e *Error
		if p := nonFinitePath(resp); p != "" {
			e = nonFiniteError(p, "marshal: "+err.Error())
		} else {
			e = &Error{Message: "internal error", Kind: KindInternal, detail: "marshal: " + err.Error()}
		}
		return encodeError(e), e
	}
	return b, nil
}

func encodeError(e *Error) []byte {
	b, err := jsonx.Marshal(ErrorBody{Error: e})
	if err != nil {
		return []byte(`{"error":{"field":"","message":"internal error"}}`)
	}
	return b
}

// decode reads a request strictly (unknown fields are errors).
func decode(body []byte, v any) *Error {
	if err := jsonx.DecodeStrict(body, v); err != nil {
		field, msg := jsonx.FieldOf(err)
		e := &Error{Field: field, Message: msg, Kind: KindInvalid}
		// A number of the wrong type or sign for its Go field (a seed of
		// −1 or 1.5) still states the field's range.
		if r := limits.Lookup(field); r != nil && !r.Count {
			e.Limit = r.Text()
			if strings.HasPrefix(msg, "wrong type") {
				e.Message = fmt.Sprintf("wrong type: %s must be a number, %s", field, r.Text())
			}
		}
		return e
	}
	return nil
}

// Health is the reply of the health operation.
type Health struct {
	Status        string `json:"status"`
	EngineVersion string `json:"engine_version"`
	JSON          string `json:"json_library"`
}

// Source names where a group of numbers came from.
type Source struct {
	Field     string `json:"field"`
	Reference string `json:"reference"`
}

// soluteSources lists a record's sources in a stable order, prefixed by
// the solute ID.
func soluteSources(s *library.Solute) []Source {
	if lib, err := library.Default(); err == nil {
		if own, ok := lib.Lookup(s.ID); ok && own == s {
			return cachedSources(s, func() []Source { return listSoluteSources(s) })
		}
	}
	return listSoluteSources(s)
}

// recordSources holds the sorted sources of the library's own solute and
// membrane records, which never change once loaded (a request's custom
// solute is listed afresh): a flux request no longer sorts them.
var recordSources sync.Map // record pointer → []Source

func cachedSources(key any, list func() []Source) []Source {
	if v, ok := recordSources.Load(key); ok {
		return v.([]Source)
	}
	v, _ := recordSources.LoadOrStore(key, list())
	return v.([]Source)
}

// membraneSources lists a membrane record's sources (a preset's cached).
func membraneSources(r *library.Membrane) []Source {
	list := func() []Source { return sortedSources("membrane."+r.ID, r.Sources) }
	if own, ok := library.LookupMembrane(r.ID); ok && own == r {
		return cachedSources(r, list)
	}
	return list()
}

func listSoluteSources(s *library.Solute) []Source {
	keys := make([]string, 0, len(s.Sources))
	for k := range s.Sources {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	out := make([]Source, 0, len(keys))
	for _, k := range keys {
		out = append(out, Source{Field: s.ID + "." + k, Reference: s.Sources[k]})
	}
	return out
}

// fromEngine converts an engine error into the contract error — the one
// converter from the engine's error types (engine/errs) — prefixing the
// field path of the request part it came from. An input error keeps its
// field and limit; a convergence failure or any other error is an engine
// fault (500), its details kept for host logs.
func fromEngine(prefix string, err error) *Error {
	var ae *Error
	if errors.As(err, &ae) {
		return ae
	}
	var ie *errs.InputError
	if errors.As(err, &ie) {
		var lim any
		if ie.Limit != nil && ie.Limit != "" {
			lim = ie.Limit
		}
		msg := ie.Msg
		if msg == "" {
			msg = ie.Error()
		}
		return &Error{Field: errs.Join(prefix, ie.Field), Message: msg, Limit: lim, Kind: KindInvalid}
	}
	if errors.Is(err, context.DeadlineExceeded) {
		return deadlineError()
	}
	if errors.Is(err, context.Canceled) {
		return &Error{Field: "", Message: "cancelled: " + err.Error(), Kind: KindInvalid}
	}
	var ce *errs.ConvergenceError
	if errors.As(err, &ce) {
		return &Error{Message: ce.Error(), Kind: KindInternal, detail: ce.Error()}
	}
	return &Error{Message: "internal error", Kind: KindInternal, detail: err.Error()}
}

// deadlineError is the contract's error for a request stopped by its
// deadline; a host that knows the deadline states it in Limit.
func deadlineError() *Error {
	return &Error{Field: "deadline", Kind: KindTimeout,
		Message: "the request did not finish within its deadline; ask for less work (fewer uncertainty.samples, sweep.points, candidates or batch items)"}
}

// finite reports whether every value is a finite float.
func finite(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}
