// Package httpapi serves the Drawsift contract over HTTP: one
// http.Handler used unchanged by the native server (drawsift serve) and by
// the edge-worker build (wasm/edge). It only decodes the transport, calls
// api.Dispatch and writes the answer; the science and the JSON request
// decoding live in the engine.
//
// Routes (one table, routes below):
//
//	POST /v1/osmotic   osmotic properties of one solution
//	POST /v1/flux      FO water and solute flux
//	POST /v1/screen    rank candidate draw solutes for a scenario
//	GET  /v1/solutes   the solute library with its sources
//	GET  /v1/presets   the membrane and feed presets with their sources
//	GET  /v1/defaults  the engine's defaults and limits
//	POST /v1/batch     many osmotic and flux requests in one call
//	POST /v1/fit       fit a membrane's A, B and S to measured fluxes
//	POST /v1/module    rate or design a module (plug flow along the area)
//	GET  /v1/health    status and engine version
//
// Every failure is the contract's error object,
// {"error": {"field", "message", "limit"}}, with the status chosen in one
// table (statusOf). Each response carries an X-Request-Id header; an
// internal error (500) also carries it in the body so that a user can quote
// it, while the details go only to Options.Logf.
//
// Every request runs under a deadline (Options.Timeout): past it the
// engine stops at its next check and the answer is a 504 error object on
// field "deadline" stating the limit. The operations whose cost grows with
// the request — screen (robustness runs and sweeps included), batch, fit and module —
// are admitted through a fixed number of slots (Options.MaxHeavy; by
// default one per core but one, the heavy requests sharing those cores and
// the last kept for the cheap ones) with a short, bounded queue; when both
// are full the
// answer is a 503 error object with Retry-After. The cheap operations
// (health, defaults, solutes, presets, osmotic, flux) never wait for a
// slot, so they stay responsive while heavy work runs. A batch is written
// as it is computed (api.BatchStream): its memory is one answer, not the
// batch.
//
// Beyond the admission slots, the handler keeps no state between
// requests. It imports only the standard library and engine/api, so it
// compiles for js/wasm.
package httpapi

import (
	"bytes"
	"context"
	"crypto/rand"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"mime"
	"net/http"
	"runtime"
	"runtime/debug"
	"strconv"
	"strings"
	"sync"
	"time"

	"drawsift/engine/api"
)

// DefaultMaxBodyBytes caps a request body (1 MiB): a screen scenario is a
// few kilobytes; a client splits a large sweep into many requests.
const DefaultMaxBodyBytes = 1 << 20

// Admission defaults (see Options).
const (
	// DefaultTimeout: a robustness run at the work budget takes a few
	// seconds on one core; a minute leaves room on a busy machine.
	DefaultTimeout = time.Minute
	// DefaultHeavyQueue waiters per slot: enough that a few dozen
	// clients each with a screen in flight (a batch client sends 4 at a
	// time) wait their turn rather than being refused, few enough that a
	// flood is refused at once and the bodies held waiting stay bounded
	// (each ≤ MaxBodyBytes).
	DefaultHeavyQueue = 32
	// DefaultQueueWait bounds the wait for a slot.
	DefaultQueueWait = 10 * time.Second
)

// RequestIDHeader names the header that carries the request id both ways:
// a client may send its own (see validRequestID), else one is generated.
const RequestIDHeader = "X-Request-Id"

// Options configure the handler. The zero value is a working, closed
// configuration: 1 MiB body cap, no CORS, no logging.
type Options struct {
	// MaxBodyBytes caps a request body; ≤ 0 means DefaultMaxBodyBytes.
	MaxBodyBytes int64
	// CORSOrigins lists the origins allowed to call the API from a browser
	// ("*" allows any). Empty (the default) sends no CORS headers, and
	// browsers then refuse cross-origin calls.
	CORSOrigins []string
	// Logf receives the details of internal errors, tagged with the
	// request id. Nil discards them.
	Logf func(format string, args ...any)
	// Timeout is each request's deadline, from the end of its body to
	// its answer; 0 means DefaultTimeout, < 0 no deadline.
	Timeout time.Duration
	// MaxHeavy is the number of heavy requests (screen, batch, fit) computed
	// at once; ≤ 0 means DefaultMaxHeavy(). Together they use at most
	// heavyCores() cores (each request's robustness run gets its share),
	// so one core is always left for the cheap requests.
	MaxHeavy int
	// HeavyQueue is how many more heavy requests may wait for a slot;
	// 0 means DefaultHeavyQueue × MaxHeavy, < 0 none (answer 503 at once).
	HeavyQueue int
	// QueueWait is the longest a heavy request waits for a slot before
	// the 503; ≤ 0 means DefaultQueueWait.
	QueueWait time.Duration

	// dispatch replaces api.Dispatch in this package's tests.
	dispatch func(ctx context.Context, op string, body []byte) ([]byte, *api.Error)
}

// route is one entry of the route table.
type route struct {
	path   string
	method string
	op     string // the api.Dispatch operation
}

// routes is the route table: path and method → Dispatch operation. New
// endpoints are added here and nowhere else.
var routes = []route{
	{"/v1/" + api.OpOsmotic, http.MethodPost, api.OpOsmotic},
	{"/v1/" + api.OpFlux, http.MethodPost, api.OpFlux},
	{"/v1/" + api.OpScreen, http.MethodPost, api.OpScreen},
	{"/v1/" + api.OpSolutes, http.MethodGet, api.OpSolutes},
	{"/v1/" + api.OpPresets, http.MethodGet, api.OpPresets},
	{"/v1/" + api.OpDefaults, http.MethodGet, api.OpDefaults},
	{"/v1/" + api.OpBatch, http.MethodPost, api.OpBatch},
	{"/v1/" + api.OpFit, http.MethodPost, api.OpFit},
	{"/v1/" + api.OpModule, http.MethodPost, api.OpModule},
	{"/v1/" + api.OpRobustnessMerge, http.MethodPost, api.OpRobustnessMerge},
	{"/v1/" + api.OpHealth, http.MethodGet, api.OpHealth},
}

// lookup finds the route of a path.
func lookup(path string) (route, bool) {
	for _, rt := range routes {
		if rt.path == path {
			return rt, true
		}
	}
	return route{}, false
}

// Kinds of errors raised by the transport itself (the engine's kinds are
// api.KindInvalid, api.KindNotFound and api.KindInternal).
const (
	kindMethod    = "method"    // 405
	kindTooLarge  = "too-large" // 413
	kindMediaType = "media"     // 415
	kindBusy      = "busy"      // 503, with Retry-After
)

// statusOf maps every error kind to its HTTP status: the one place where
// that choice is made.
var statusOf = map[string]int{
	api.KindInvalid:  http.StatusBadRequest,
	api.KindNotFound: http.StatusNotFound,
	api.KindInternal: http.StatusInternalServerError,
	kindMethod:       http.StatusMethodNotAllowed,
	kindTooLarge:     http.StatusRequestEntityTooLarge,
	kindMediaType:    http.StatusUnsupportedMediaType,
	kindBusy:         http.StatusServiceUnavailable,
	api.KindTimeout:  http.StatusGatewayTimeout,
}

// status returns the HTTP status of an error kind; an unknown kind is a
// bug and answers 500.
func status(kind string) int {
	if s, ok := statusOf[kind]; ok {
		return s
	}
	return http.StatusInternalServerError
}

// handler is the http.Handler returned by New. Its fields are read-only
// after New.
type handler struct {
	maxBody int64
	origins map[string]bool
	anyOrig bool
	logf    func(format string, args ...any)
	// dispatch replaces the pooled api.AppendDispatch (tests); nil by default.
	dispatch func(ctx context.Context, op string, body []byte) ([]byte, *api.Error)
	// batch streams a batch answer (api.BatchStream); nil when dispatch
	// is replaced, and then batches go through dispatch.
	batch func(ctx context.Context, body []byte, w io.Writer) (bool, *api.Error)
	// sweep streams a screen with a sweep (api.ScreenStream); nil when
	// dispatch is replaced.
	sweep   func(ctx context.Context, body []byte, w io.Writer) (bool, *api.Error)
	timeout time.Duration
	heavy   *admission
	cores   int // per heavy request
}

// answerBuffers are the reused answer buffers; one that grew past
// maxPooledAnswer (a large screen) is left to the collector, so the pool
// holds at most a few small buffers per core.
var answerBuffers = sync.Pool{New: func() any { b := make([]byte, 0, 16<<10); return &b }}

const maxPooledAnswer = 256 << 10

// answer runs one operation; the answer is valid until done is called.
func (h *handler) answer(ctx context.Context, op string, body []byte) (out []byte, e *api.Error, done func()) {
	if h.dispatch != nil {
		out, e = h.dispatch(ctx, op, body)
		return out, e, func() {}
	}
	bp := answerBuffers.Get().(*[]byte)
	out, e = api.AppendDispatch(ctx, (*bp)[:0], op, body, nil)
	return out, e, func() {
		if cap(out) <= maxPooledAnswer {
			*bp = out[:0]
			answerBuffers.Put(bp)
		}
	}
}

// heavyCores is how many cores the heavy requests share: all but one,
// which stays free for the cheap requests (one on a single core).
func heavyCores() int { return max(1, runtime.GOMAXPROCS(0)-1) }

// DefaultMaxHeavy is the default number of heavy slots: one per core the
// heavy requests share, each request's robustness run then on one core.
func DefaultMaxHeavy() int { return heavyCores() }

// heavyOps are the operations admitted through the slots: their cost
// grows with the request (candidates × samples, sweep points, items).
var heavyOps = map[string]bool{api.OpScreen: true, api.OpBatch: true, api.OpFit: true, api.OpModule: true}

// New returns the API handler. It serves the paths in the route table
// (mount it at "/v1/" or at the root) and answers every other path with a
// 404 error object.
func New(opts Options) http.Handler {
	h := &handler{
		maxBody:  opts.MaxBodyBytes,
		logf:     opts.Logf,
		dispatch: opts.dispatch,
		origins:  map[string]bool{},
	}
	if h.maxBody <= 0 {
		h.maxBody = DefaultMaxBodyBytes
	}
	if h.logf == nil {
		h.logf = func(string, ...any) {}
	}
	if h.dispatch == nil {
		h.batch = func(ctx context.Context, body []byte, w io.Writer) (bool, *api.Error) {
			return api.BatchStream(ctx, body, w, nil)
		}
		h.sweep = func(ctx context.Context, body []byte, w io.Writer) (bool, *api.Error) {
			return api.ScreenStream(ctx, body, w, nil)
		}
	}
	switch {
	case opts.Timeout == 0:
		h.timeout = DefaultTimeout
	case opts.Timeout > 0:
		h.timeout = opts.Timeout
	}
	slots := opts.MaxHeavy
	if slots <= 0 {
		slots = DefaultMaxHeavy()
	}
	h.cores = max(1, heavyCores()/slots)
	queue := opts.HeavyQueue
	switch {
	case queue == 0:
		queue = DefaultHeavyQueue * slots
	case queue < 0:
		queue = 0
	}
	wait := opts.QueueWait
	if wait <= 0 {
		wait = DefaultQueueWait
	}
	h.heavy = newAdmission(slots, queue, wait)
	for _, o := range opts.CORSOrigins {
		o = strings.TrimRight(strings.TrimSpace(o), "/")
		switch o {
		case "":
		case "*":
			h.anyOrig = true
		default:
			h.origins[o] = true
		}
	}
	return h
}

func (h *handler) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	id := requestID(r)
	w.Header().Set(RequestIDHeader, id)
	defer func() {
		if p := recover(); p != nil {
			if p == http.ErrAbortHandler {
				panic(p)
			}
			h.logf("request %s: panic: %v\n%s", id, p, debug.Stack())
			// Headers may already be written; if so this body is lost,
			// but the connection still ends cleanly.
			h.writeError(w, id, &api.Error{Message: "internal error", Kind: api.KindInternal})
		}
	}()
	h.cors(w, r)

	rt, ok := lookup(r.URL.Path)
	if !ok {
		h.writeError(w, id, &api.Error{Field: "path", Message: fmt.Sprintf("no endpoint %q; endpoints: %s", r.URL.Path, endpointList()), Kind: api.KindNotFound})
		return
	}
	if r.Method == http.MethodOptions && h.corsEnabled() {
		// A CORS preflight: the headers were set by h.cors.
		w.Header().Set("Allow", rt.method+", OPTIONS")
		w.WriteHeader(http.StatusNoContent)
		return
	}
	if r.Method != rt.method {
		w.Header().Set("Allow", rt.method)
		h.writeError(w, id, &api.Error{Field: "method", Limit: rt.method, Kind: kindMethod,
			Message: fmt.Sprintf("%s is not allowed on %s; use %s", r.Method, r.URL.Path, rt.method)})
		return
	}
	var body []byte
	if rt.method == http.MethodPost {
		if e := checkContentType(r.Header.Get("Content-Type")); e != nil {
			h.writeError(w, id, e)
			return
		}
		var e *api.Error
		if body, e = h.readBody(w, r); e != nil {
			h.writeError(w, id, e)
			return
		}
	}
	ctx := r.Context()
	if h.timeout > 0 {
		var cancel context.CancelFunc
		ctx, cancel = withDeadline(ctx, h.timeout)
		defer cancel()
	}
	if heavyOps[rt.op] {
		release, e := h.heavy.acquire(ctx)
		if e != nil {
			if e.Kind == kindBusy {
				w.Header().Set("Retry-After", strconv.Itoa(h.heavy.retryAfter()))
			}
			h.writeError(w, id, h.timed(e))
			return
		}
		defer release()
		ctx = api.WithCores(ctx, h.cores)
	}
	if rt.op == api.OpBatch && h.batch != nil {
		h.streamBatch(ctx, w, id, body)
		return
	}
	// A screen with a sweep is written a block of series at a time (the
	// same bytes); the key's mere presence is enough to choose the path.
	if rt.op == api.OpScreen && h.sweep != nil && bytes.Contains(body, []byte(`"sweep"`)) {
		h.stream(ctx, w, id, body, "screen", h.sweep)
		return
	}
	out, e, done := h.answer(ctx, rt.op, body)
	defer done()
	if e != nil {
		if e.Kind == api.KindInternal {
			h.logf("request %s: %s: internal error: %s", id, rt.op, e.Detail())
		}
		h.writeError(w, id, h.timed(e))
		return
	}
	writeJSON(w, http.StatusOK, out)
}

// streamBatch writes a batch's answer as it is computed. An error before
// the first answer gets its own status; after it, the array is completed
// (items past the deadline answer ok false with the deadline error).
func (h *handler) streamBatch(ctx context.Context, w http.ResponseWriter, id string, body []byte) {
	h.stream(ctx, w, id, body, "batch", h.batch)
}

// stream writes a streamed answer (a batch, or a screen's sweep): an
// error before the first byte gets its own status; after it, the answer
// is completed by the operation itself.
func (h *handler) stream(ctx context.Context, w http.ResponseWriter, id string, body []byte, what string,
	run func(context.Context, []byte, io.Writer) (bool, *api.Error)) {
	sw := &startWriter{w: w}
	started, e := run(ctx, body, sw)
	if e != nil && !started {
		h.writeError(w, id, h.timed(e))
		return
	}
	if e != nil {
		h.logf("request %s: %s: %s", id, what, e.Message)
		return
	}
	w.Write([]byte{'\n'}) // every JSON answer ends with a newline
}

// startWriter sends the 200 headers with the first bytes of a streamed
// answer.
type startWriter struct {
	w       http.ResponseWriter
	started bool
}

func (s *startWriter) Write(p []byte) (int, error) {
	if !s.started {
		s.started = true
		hd := s.w.Header()
		hd.Set("Content-Type", "application/json")
		hd.Set("X-Content-Type-Options", "nosniff")
		hd.Set("Cache-Control", "no-store")
		s.w.WriteHeader(http.StatusOK)
	}
	return s.w.Write(p)
}

// clockCtx reads its deadline from the clock. Under js/wasm (the edge
// build) a context's timer fires only when the running goroutine yields,
// which a CPU-bound engine loop does not: without the clock, a sweep ran
// on past its deadline (seen in the platform's runtime). The engine's
// ctx.Err() checks therefore compare the time. See withDeadline.
type clockCtx struct {
	context.Context
	deadline time.Time
}

func (c clockCtx) Deadline() (time.Time, bool) { return c.deadline, true }

func (c clockCtx) Err() error {
	if err := c.Context.Err(); err != nil {
		return err
	}
	if !time.Now().Before(c.deadline) {
		return context.DeadlineExceeded
	}
	return nil
}

// timed states the deadline in a timeout error.
func (h *handler) timed(e *api.Error) *api.Error {
	if e.Kind != api.KindTimeout || h.timeout <= 0 {
		return e
	}
	c := *e
	c.Limit = h.timeout.String()
	c.Message = fmt.Sprintf("the request did not finish within the server's deadline of %s; ask for less work (fewer uncertainty.samples, sweep.points, candidates or batch items)", h.timeout)
	return &c
}

// admission bounds the heavy requests: slots computing at once, and a
// queue of waiters that each wait at most wait for a slot.
type admission struct {
	slots   chan struct{}
	waiters chan struct{}
	wait    time.Duration
}

func newAdmission(slots, queue int, wait time.Duration) *admission {
	return &admission{slots: make(chan struct{}, slots), waiters: make(chan struct{}, queue), wait: wait}
}

// acquire takes a slot, waiting in the queue if there is room in it; it
// returns the release function, or the busy error (or the ctx's).
func (a *admission) acquire(ctx context.Context) (func(), *api.Error) {
	release := func() { <-a.slots }
	select {
	case a.slots <- struct{}{}:
		return release, nil
	default:
	}
	select {
	case a.waiters <- struct{}{}:
	default:
		return nil, a.busy()
	}
	defer func() { <-a.waiters }()
	t := time.NewTimer(a.wait)
	defer t.Stop()
	select {
	case a.slots <- struct{}{}:
		return release, nil
	case <-t.C:
		return nil, a.busy()
	case <-ctx.Done():
		if errors.Is(ctx.Err(), context.DeadlineExceeded) {
			return nil, &api.Error{Field: "deadline", Kind: api.KindTimeout, Message: "the deadline passed while waiting for a slot"}
		}
		return nil, &api.Error{Field: "", Message: "cancelled while waiting for a slot", Kind: api.KindInvalid}
	}
}

func (a *admission) busy() *api.Error {
	return &api.Error{Field: "server", Limit: cap(a.slots), Kind: kindBusy,
		Message: fmt.Sprintf("the server is computing its %d screens and batches at once and %d more are waiting; retry after %d s",
			cap(a.slots), cap(a.waiters), a.retryAfter())}
}

// retryAfter is the Retry-After of a busy answer, in whole seconds.
func (a *admission) retryAfter() int { return 1 }

// readBody reads the request body up to the cap.
func (h *handler) readBody(w http.ResponseWriter, r *http.Request) ([]byte, *api.Error) {
	tooLarge := &api.Error{Field: "body", Limit: h.maxBody, Kind: kindTooLarge,
		Message: fmt.Sprintf("request body larger than %d bytes; split a large sweep into several requests", h.maxBody)}
	if r.Body == nil {
		if r.ContentLength > h.maxBody {
			return nil, tooLarge
		}
		return nil, nil
	}
	if r.ContentLength > h.maxBody {
		h.drain(w, r, r.ContentLength)
		return nil, tooLarge
	}
	// Read one byte past the cap to tell "exactly at the cap" from "over".
	b, err := io.ReadAll(io.LimitReader(r.Body, h.maxBody+1))
	if err != nil {
		var mb *http.MaxBytesError
		if errors.As(err, &mb) {
			return nil, tooLarge
		}
		return nil, &api.Error{Field: "body", Message: "reading the request body: " + err.Error(), Kind: api.KindInvalid}
	}
	if int64(len(b)) > h.maxBody {
		h.drain(w, r, -1)
		return nil, tooLarge
	}
	return b, nil
}

// drainFactor × the body cap is the most of an oversized body read and
// discarded so that the connection can carry the client's next request.
const drainFactor = 4

// drain reads what is left of an oversized body (n bytes declared, or
// -1 unknown) when it is at most drainFactor × the cap: the edge
// platform's runtime closes a connection whose request body was not read
// to its end without saying so, and a client that reused it got EOF on
// its next request. A larger body is left unread, and the answer says
// "Connection: close".
func (h *handler) drain(w http.ResponseWriter, r *http.Request, n int64) {
	limit := drainFactor * h.maxBody
	if n <= limit {
		m, _ := io.Copy(io.Discard, io.LimitReader(r.Body, limit+1))
		if m <= limit {
			return // read to its end
		}
	}
	w.Header().Set("Connection", "close")
}

// checkContentType accepts application/json (or a +json type) in UTF-8.
func checkContentType(ct string) *api.Error {
	bad := func(msg string) *api.Error {
		return &api.Error{Field: "Content-Type", Limit: "application/json", Kind: kindMediaType, Message: msg}
	}
	if ct == "" {
		return bad("a Content-Type header is required: application/json")
	}
	mt, params, err := mime.ParseMediaType(ct)
	if err != nil {
		return bad(fmt.Sprintf("malformed Content-Type %q: %v", ct, err))
	}
	if mt != "application/json" && !(strings.HasPrefix(mt, "application/") && strings.HasSuffix(mt, "+json")) {
		return bad(fmt.Sprintf("Content-Type %q is not JSON; send application/json", mt))
	}
	if cs, ok := params["charset"]; ok && !strings.EqualFold(cs, "utf-8") {
		return bad(fmt.Sprintf("charset %q is not supported; JSON is UTF-8", cs))
	}
	return nil
}

// writeError writes the contract's error object with the status of its
// kind. A 500 also carries the request id.
func (h *handler) writeError(w http.ResponseWriter, id string, e *api.Error) {
	st := status(e.Kind)
	body := errorBody{Error: errorObject{Field: e.Field, Message: e.Message, Limit: e.Limit}}
	if st == http.StatusInternalServerError {
		body.Error.Message = "internal error"
		body.Error.Field = ""
		body.Error.Limit = nil
		body.Error.RequestID = id
	}
	writeJSON(w, st, encodeError(body))
}

// errorObject is api.Error as it travels, plus the request id of a 500.
type errorObject struct {
	Field     string `json:"field"`
	Message   string `json:"message"`
	Limit     any    `json:"limit,omitempty"`
	RequestID string `json:"request_id,omitempty"`
}

type errorBody struct {
	Error errorObject `json:"error"`
}

func writeJSON(w http.ResponseWriter, status int, b []byte) {
	hd := w.Header()
	hd.Set("Content-Type", "application/json")
	hd.Set("Content-Length", strconv.Itoa(len(b)+1))
	hd.Set("X-Content-Type-Options", "nosniff")
	hd.Set("Cache-Control", "no-store")
	w.WriteHeader(status)
	w.Write(b)
	w.Write([]byte{'\n'})
}

// cors sets the CORS response headers when the request's Origin is allowed.
func (h *handler) cors(w http.ResponseWriter, r *http.Request) {
	if !h.corsEnabled() {
		return
	}
	hd := w.Header()
	hd.Add("Vary", "Origin")
	origin := r.Header.Get("Origin")
	if origin == "" {
		return
	}
	switch {
	case h.anyOrig:
		hd.Set("Access-Control-Allow-Origin", "*")
	case h.origins[origin]:
		hd.Set("Access-Control-Allow-Origin", origin)
	default:
		return
	}
	hd.Set("Access-Control-Expose-Headers", RequestIDHeader)
	if r.Method == http.MethodOptions {
		hd.Set("Access-Control-Allow-Methods", "GET, POST, OPTIONS")
		hd.Set("Access-Control-Allow-Headers", "Content-Type, "+RequestIDHeader)
		hd.Set("Access-Control-Max-Age", "600")
	}
}

func (h *handler) corsEnabled() bool { return h.anyOrig || len(h.origins) > 0 }

// requestID returns the client's X-Request-Id when it is short and plain,
// else a new random one.
func requestID(r *http.Request) string {
	if id := r.Header.Get(RequestIDHeader); validRequestID(id) {
		return id
	}
	var b [12]byte
	if _, err := rand.Read(b[:]); err != nil {
		return "unknown"
	}
	return hex.EncodeToString(b[:])
}

// validRequestID accepts 1–64 characters of [A-Za-z0-9._-], so that an id
// can be echoed into headers and logs without escaping.
func validRequestID(s string) bool {
	if len(s) == 0 || len(s) > 64 {
		return false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '.' || c == '_' || c == '-') {
			return false
		}
	}
	return true
}

// endpointList names the endpoints for the 404 message.
func endpointList() string {
	s := make([]string, len(routes))
	for i, rt := range routes {
		s[i] = rt.method + " " + rt.path
	}
	return strings.Join(s, ", ")
}

// encodeError encodes an error body. The transport's own errors use
// encoding/json, which every build links anyway (goccy/go-json imports it).
func encodeError(b errorBody) []byte {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(b); err != nil {
		return []byte(`{"error":{"field":"","message":"internal error"}}`)
	}
	return bytes.TrimRight(buf.Bytes(), "\n")
}
