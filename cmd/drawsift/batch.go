package main

// Batch screening: drawsift screen reads many scenarios (a JSON array or
// NDJSON, one scenario per line) and streams one result per scenario, in
// input order, as NDJSON or CSV. With --remote URL the same scenarios go to
// a running HTTP API (drawsift serve or the edge build), a bounded number at
// a time, with retries on network errors and 5xx answers. Each scenario is
// independent: one failure is reported on its line and the batch goes on.

import (
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math/rand/v2"
	"net/http"
	"net/url"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"time"

	"drawsift/engine/api"
)

// batchFlags are the screen command's batch and remote flags.
type batchFlags struct {
	remote      string
	concurrency int
	retries     int
	timeout     time.Duration
	// backoff is the first retry delay; it doubles per attempt (tests
	// shorten it).
	backoff time.Duration
}

// addBatchFlags registers the batch flags on the screen command.
func addBatchFlags(fs *flag.FlagSet) *batchFlags {
	b := &batchFlags{backoff: 250 * time.Millisecond}
	fs.StringVar(&b.remote, "remote", "", "send the scenarios to the HTTP API at `URL` (e.g. http://127.0.0.1:8080) instead of computing here")
	fs.IntVar(&b.concurrency, "concurrency", 0, "scenarios in flight at once, `N` (default 4 with --remote, else the number of CPUs)")
	fs.IntVar(&b.retries, "retries", 3, "retries per scenario on a network error or a 5xx answer (with --remote)")
	fs.DurationVar(&b.timeout, "timeout", time.Minute, "time limit per remote request")
	return b
}

// Limits on the batch flags.
const (
	maxConcurrency = 256
	maxRetries     = 10
)

// batchInput is the kind of input the screen command was given.
type batchInput int

const (
	singleInput batchInput = iota // one JSON object: the ordinary path
	arrayInput                    // a JSON array of scenarios
	ndjsonInput                   // one scenario per line
)

// splitBatch tells a single request from a batch and splits a batch into
// its scenarios. A JSON array must be well formed as a whole: the error
// names the first element that is not. NDJSON lines are kept as they are;
// a malformed line becomes that scenario's error.
func splitBatch(body []byte) ([][]byte, batchInput, *api.Error) {
	trimmed := bytes.TrimSpace(body)
	if len(trimmed) > 0 && trimmed[0] == '[' {
		items, e := splitArray(trimmed)
		return items, arrayInput, e
	}
	first, rest, _ := bytes.Cut(trimmed, []byte{'\n'})
	if len(bytes.TrimSpace(rest)) == 0 || !json.Valid(first) {
		return [][]byte{body}, singleInput, nil
	}
	var items [][]byte
	for _, line := range bytes.Split(trimmed, []byte{'\n'}) {
		if line = bytes.TrimSpace(line); len(line) > 0 {
			items = append(items, line)
		}
	}
	return items, ndjsonInput, nil
}

// splitArray splits a JSON array into its elements.
func splitArray(b []byte) ([][]byte, *api.Error) {
	dec := json.NewDecoder(bytes.NewReader(b))
	if _, err := dec.Token(); err != nil { // '['
		return nil, api.Invalid("[0]", nil, "malformed JSON array: %v", err)
	}
	var items [][]byte
	for dec.More() {
		var raw json.RawMessage
		if err := dec.Decode(&raw); err != nil {
			return nil, api.Invalid(fmt.Sprintf("[%d]", len(items)), nil, "malformed scenario %d in the array: %v", len(items), err)
		}
		items = append(items, raw)
	}
	if _, err := dec.Token(); err != nil { // ']'
		return nil, api.Invalid(fmt.Sprintf("[%d]", len(items)), nil, "malformed JSON array after scenario %d: %v", len(items)-1, err)
	}
	if _, err := dec.Token(); err != io.EOF {
		return nil, api.Invalid("", nil, "unexpected data after the JSON array")
	}
	if len(items) == 0 {
		return nil, api.Invalid("[0]", "≥ 1 scenario", "the array holds no scenario")
	}
	return items, nil
}

// outcome is the answer to one scenario.
type outcome struct {
	body []byte // a response, or an encoded {"error": {...}} object
	// failed is set for an error answer; transport for one that never got
	// a verdict (network error or 5xx after every retry).
	failed, transport bool
}

// caller answers one scenario.
type caller func(ctx context.Context, body []byte) outcome

// runBatch is the hook of the screen command. It handles a batch, or a
// single request with --remote; for a single local request it returns
// handled=false and the ordinary path goes on.
func (b *batchFlags) runBatch(op string, body []byte, format string, stdout, stderr io.Writer) (code int, handled bool) {
	items, kind, e := splitBatch(body)
	if e != nil {
		writeErr(stdout, e)
		return 2, true
	}
	if kind == singleInput && b.remote == "" {
		return 0, false
	}
	if b.concurrency < 0 || b.concurrency > maxConcurrency {
		fmt.Fprintf(stderr, "drawsift %s: --concurrency %d is outside 1–%d\n", op, b.concurrency, maxConcurrency)
		return 1, true
	}
	if b.retries < 0 || b.retries > maxRetries {
		fmt.Fprintf(stderr, "drawsift %s: --retries %d is outside 0–%d\n", op, b.retries, maxRetries)
		return 1, true
	}
	if b.timeout <= 0 {
		fmt.Fprintf(stderr, "drawsift %s: --timeout must be positive (got %v)\n", op, b.timeout)
		return 1, true
	}
	call := localCaller(op)
	conc := b.concurrency
	if b.remote != "" {
		rc, err := b.remoteCaller(op, stderr)
		if err != nil {
			fmt.Fprintf(stderr, "drawsift %s: %v\n", op, err)
			return 1, true
		}
		call = rc
		if conc == 0 {
			conc = 4
		}
	} else if conc == 0 {
		conc = runtime.GOMAXPROCS(0)
	}
	ctx := context.Background()
	if kind == singleInput {
		o := call(ctx, body)
		if o.failed {
			stdout.Write(o.body)
			fmt.Fprintln(stdout)
			if o.transport {
				return 1, true
			}
			return 2, true
		}
		if err := render(stdout, op, format, o.body); err != nil {
			fmt.Fprintf(stderr, "drawsift %s: %v\n", op, err)
			return 1, true
		}
		return 0, true
	}
	if format == "table" {
		fmt.Fprintf(stderr, "drawsift %s: --format table is for one scenario; use json (NDJSON) or csv for a batch\n", op)
		return 1, true
	}
	var sink batchSink = &ndjsonSink{w: stdout}
	if format == "csv" {
		sink = &csvSink{w: newCSV(stdout)}
	}
	var failed, lost int
	err := forEachOrdered(ctx, items, conc, call, func(i int, o outcome) error {
		if o.failed {
			failed++
			if o.transport {
				lost++
			}
		}
		return sink.write(i, o)
	})
	if err == nil {
		err = sink.flush()
	}
	if err != nil {
		fmt.Fprintf(stderr, "drawsift %s: writing results: %v\n", op, err)
		return 1, true
	}
	if failed > 0 {
		fmt.Fprintf(stderr, "drawsift %s: %d of %d scenarios failed (see their \"error\" lines)\n", op, failed, len(items))
	}
	switch {
	case lost > 0:
		return 1, true
	case failed > 0:
		return 2, true
	}
	return 0, true
}

// reorderWindow is how many scenarios past the oldest unwritten one may
// be started, per scenario in flight: the outcomes held in memory at
// once are at most conc × reorderWindow, however slow one scenario is.
const reorderWindow = 4

// forEachOrdered calls call on every item with at most conc in flight and
// hands the outcomes to emit in input order, as soon as each one and all
// before it are done. An item starts only within a window of
// conc × reorderWindow items from the oldest one not yet emitted, so a
// slow item holds back at most that many finished outcomes, never the
// whole batch. It stops early only if emit fails.
func forEachOrdered(ctx context.Context, items [][]byte, conc int, call caller, emit func(int, outcome) error) error {
	return forEachWindow(ctx, items, conc, conc*reorderWindow, call, emit)
}

// forEachWindow is forEachOrdered with the window given (≥ conc).
func forEachWindow(ctx context.Context, items [][]byte, conc, window int, call caller, emit func(int, outcome) error) error {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	window = max(window, conc, 1)
	// done[i%window] carries item i's outcome: an item starts only once
	// the one window places before it was emitted, so slots never clash.
	done := make([]chan outcome, min(window, len(items)))
	for i := range done {
		done[i] = make(chan outcome, 1)
	}
	sem := make(chan struct{}, conc)     // in flight
	slots := make(chan struct{}, window) // started, not yet emitted
	var wg sync.WaitGroup
	go func() {
		for i := range items {
			select {
			case slots <- struct{}{}:
			case <-ctx.Done():
				return
			}
			select {
			case sem <- struct{}{}:
			case <-ctx.Done():
				return
			}
			wg.Add(1)
			go func(i int) {
				defer wg.Done()
				o := call(ctx, items[i])
				<-sem
				done[i%len(done)] <- o
			}(i)
		}
	}()
	defer wg.Wait()
	for i := range items {
		o := <-done[i%len(done)]
		<-slots
		if err := emit(i, o); err != nil {
			return err
		}
	}
	return nil
}

// localCaller computes a scenario in this process.
func localCaller(op string) caller {
	return func(ctx context.Context, body []byte) outcome {
		out, e := api.Dispatch(ctx, op, body)
		if e != nil {
			return outcome{body: out, failed: true}
		}
		return outcome{body: out}
	}
}

// remoteCaller posts each scenario to the API at b.remote.
func (b *batchFlags) remoteCaller(op string, stderr io.Writer) (caller, error) {
	endpoint, err := endpointURL(b.remote, op)
	if err != nil {
		return nil, err
	}
	conc := max(b.concurrency, 4)
	client := &http.Client{
		Timeout: b.timeout,
		Transport: &http.Transport{
			Proxy:               http.ProxyFromEnvironment,
			MaxIdleConns:        conc,
			MaxIdleConnsPerHost: conc,
			IdleConnTimeout:     30 * time.Second,
		},
	}
	return func(ctx context.Context, body []byte) outcome {
		return b.post(ctx, client, endpoint, body)
	}, nil
}

// endpointURL turns --remote into the operation's URL: a base
// ("http://host:8080" or ".../v1") gets "/v1/<op>" appended; a full
// endpoint URL is kept.
func endpointURL(remote, op string) (string, error) {
	u, err := url.Parse(remote)
	if err != nil || (u.Scheme != "http" && u.Scheme != "https") || u.Host == "" {
		return "", fmt.Errorf("--remote %q is not an http:// or https:// URL", remote)
	}
	p := strings.TrimRight(u.Path, "/")
	switch {
	case strings.HasSuffix(p, "/v1/"+op):
	case strings.HasSuffix(p, "/v1"):
		p += "/" + op
	default:
		p += "/v1/" + op
	}
	u.Path = p
	return u.String(), nil
}

// post sends one scenario, retrying network errors, 429 and 5xx answers
// with exponential backoff and jitter (honouring Retry-After). A 4xx
// answer is the scenario's verdict and is not retried.
func (b *batchFlags) post(ctx context.Context, client *http.Client, endpoint string, body []byte) outcome {
	var last string
	for attempt := 0; ; attempt++ {
		wait, final, o := b.try(ctx, client, endpoint, body)
		if final {
			return o
		}
		last = string(o.body)
		if attempt >= b.retries {
			break
		}
		if wait <= 0 {
			wait = b.backoff << attempt
			wait += time.Duration(rand.Int64N(int64(wait)/2 + 1)) // jitter
		}
		select {
		case <-time.After(min(wait, 30*time.Second)):
		case <-ctx.Done():
			return remoteFailure(ctx.Err().Error())
		}
	}
	return remoteFailure(fmt.Sprintf("%s (after %d attempts)", last, b.retries+1))
}

// try makes one attempt. final reports a verdict (success or 4xx); else
// o.body holds the reason and wait a server-requested delay (or 0).
func (b *batchFlags) try(ctx context.Context, client *http.Client, endpoint string, body []byte) (wait time.Duration, final bool, o outcome) {
	req, err := http.NewRequestWithContext(ctx, http.MethodPost, endpoint, bytes.NewReader(body))
	if err != nil {
		return 0, true, remoteFailure(err.Error())
	}
	req.Header.Set("Content-Type", "application/json")
	req.Header.Set("Accept", "application/json")
	resp, err := client.Do(req)
	if err != nil {
		return 0, false, outcome{body: []byte(err.Error())}
	}
	defer resp.Body.Close()
	// Responses are bounded: the largest screen answer is far below this.
	data, err := io.ReadAll(io.LimitReader(resp.Body, maxRequestBytes))
	if err != nil {
		return 0, false, outcome{body: []byte("reading the answer: " + err.Error())}
	}
	data = bytes.TrimSpace(data)
	switch {
	case resp.StatusCode == http.StatusOK && json.Valid(data):
		return 0, true, outcome{body: data}
	case resp.StatusCode == http.StatusOK:
		// A 200 whose body is not JSON was cut short or mangled on the
		// way (a proxy, a worker that died mid-answer): try again.
		return 0, false, outcome{body: []byte(fmt.Sprintf("%s answered 200 with a body that is not JSON%s", endpoint, snippet(data)))}
	case resp.StatusCode == http.StatusGatewayTimeout && isErrorObject(data):
		// The server's deadline stopped the scenario: the same request
		// would stop there again, so this is its verdict.
		return 0, true, outcome{body: data, failed: true}
	case resp.StatusCode == http.StatusTooManyRequests || resp.StatusCode >= 500:
		return retryAfter(resp.Header.Get("Retry-After")), false,
			outcome{body: []byte(fmt.Sprintf("%s answered %s%s", endpoint, resp.Status, snippet(data)))}
	case isErrorObject(data):
		return 0, true, outcome{body: data, failed: true}
	}
	return 0, true, remoteFailure(fmt.Sprintf("%s answered %s without the API's error object%s", endpoint, resp.Status, snippet(data)))
}

// remoteFailure is the error object of a scenario the API never judged.
func remoteFailure(msg string) outcome {
	b, _ := json.Marshal(api.ErrorBody{Error: &api.Error{Field: "remote", Message: msg}})
	return outcome{body: b, failed: true, transport: true}
}

// isErrorObject reports whether b is {"error": {...}}.
func isErrorObject(b []byte) bool {
	var v struct {
		Error *struct {
			Message *string `json:"message"`
		} `json:"error"`
	}
	return json.Unmarshal(b, &v) == nil && v.Error != nil && v.Error.Message != nil
}

// retryAfter reads a Retry-After header given in seconds.
func retryAfter(h string) time.Duration {
	if s, err := strconv.Atoi(strings.TrimSpace(h)); err == nil && s >= 0 {
		return time.Duration(s) * time.Second
	}
	return 0
}

// snippet quotes the start of a body for an error message.
func snippet(b []byte) string {
	if len(b) == 0 {
		return ""
	}
	if len(b) > 200 {
		b = b[:200]
	}
	return ": " + strconv.Quote(string(b))
}

// batchSink writes outcomes in order.
type batchSink interface {
	write(i int, o outcome) error
	flush() error
}

// ndjsonSink writes one line per scenario:
// {"index": i, "result": {...}} or {"index": i, "error": {...}}.
type ndjsonSink struct{ w io.Writer }

func (s *ndjsonSink) write(i int, o outcome) error {
	var line []byte
	if o.failed {
		// o.body is {"error": {...}}: splice the index in front.
		line = fmt.Appendf(nil, `{"index":%d,%s`, i, bytes.TrimSpace(o.body)[1:])
	} else {
		line = fmt.Appendf(nil, `{"index":%d,"result":%s}`, i, o.body)
	}
	line = append(line, '\n')
	_, err := s.w.Write(line)
	return err
}

func (s *ndjsonSink) flush() error { return nil }

// csvSink writes the screen CSV columns (screenColumns) for every
// scenario, one row per ranked candidate and one per excluded solute,
// each prefixed by the scenario index; a failed scenario is one row with
// its error.
type csvSink struct {
	w      *csvWriter
	header bool
}

var csvLead = []string{"scenario", "error_field", "error_message"}

func (s *csvSink) write(i int, o outcome) error {
	if !s.header {
		head := append([]string{}, csvLead...)
		for _, c := range screenColumns {
			head = append(head, c.head)
		}
		s.w.Write(head)
		s.header = true
	}
	lead := []string{strconv.Itoa(i), "", ""}
	row := func(cells []string) []string { return append(append([]string{}, lead...), cells...) }
	if o.failed {
		var eb struct {
			Error api.Error `json:"error"`
		}
		if err := json.Unmarshal(o.body, &eb); err != nil {
			eb.Error.Message = string(o.body)
		}
		lead[1], lead[2] = eb.Error.Field, eb.Error.Message
		s.w.Write(row(make([]string, len(screenColumns))))
	} else {
		var r api.ScreenResponse
		if err := json.Unmarshal(o.body, &r); err != nil {
			return err
		}
		for k := range r.Candidates {
			cells := make([]string, len(screenColumns))
			for j, c := range screenColumns {
				cells[j] = c.val(&r.Candidates[k])
			}
			s.w.Write(row(cells))
		}
		for _, x := range r.Excluded {
			cells := make([]string, len(screenColumns))
			cells[1] = x.Solute
			cells[len(cells)-1] = x.Reason + ": " + x.Detail
			s.w.Write(row(cells))
		}
	}
	s.w.Flush()
	return s.w.Error()
}

func (s *csvSink) flush() error {
	s.w.Flush()
	return s.w.Error()
}
