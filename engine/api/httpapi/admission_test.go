package httpapi

import (
	"bytes"
	"context"
	"io"
	"net/http"
	"net/http/httptest"
	"net/http/httptrace"
	"runtime"
	"strings"
	"sync"
	"testing"
	"time"

	"drawsift/engine/api"
)

// heavyScreen is a small screen: the admission tests hold it in the
// dispatch hook, so its cost does not matter.
const heavyScreen = `{"candidates":["NaCl","KCl"]}`

// blockingDispatch holds every heavy request until release is closed,
// signalling each start on started; cheap ones go to api.Dispatch.
func blockingDispatch(started chan<- string, release <-chan struct{}) func(context.Context, string, []byte) ([]byte, *api.Error) {
	return func(ctx context.Context, op string, body []byte) ([]byte, *api.Error) {
		if heavyOps[op] {
			started <- op
			<-release
		}
		return api.Dispatch(ctx, op, body)
	}
}

// TestHeavySlotsFullAnswer503: with every heavy slot taken and no queue,
// a further screen is refused at once with 503, Retry-After and the
// contract's error on field "server" naming the slots; cheap endpoints
// are answered meanwhile without waiting for a slot.
func TestHeavySlotsFullAnswer503(t *testing.T) {
	started := make(chan string, 4)
	release := make(chan struct{})
	h := New(Options{MaxHeavy: 1, HeavyQueue: -1, dispatch: blockingDispatch(started, release)})
	var wg sync.WaitGroup
	wg.Add(1)
	var first *bytes.Buffer
	var firstCode int
	go func() {
		defer wg.Done()
		rec := post(h, "/v1/screen", heavyScreen)
		first, firstCode = rec.Body, rec.Code
	}()
	<-started // the slot is taken
	rec := post(h, "/v1/screen", heavyScreen)
	e := mustError(t, rec, http.StatusServiceUnavailable, "server")
	if ra := rec.Header().Get("Retry-After"); ra != "1" {
		t.Errorf("Retry-After %q, want 1", ra)
	}
	if lim, _ := e.Error.Limit.(float64); lim != 1 || !strings.Contains(e.Error.Message, "retry") {
		t.Errorf("busy error: limit %v, message %q; want limit 1 and a retry hint", e.Error.Limit, e.Error.Message)
	}
	// A batch takes a heavy slot too.
	mustError(t, post(h, "/v1/batch", `[]`), http.StatusServiceUnavailable, "server")
	// Cheap endpoints do not wait behind the held slot.
	for _, p := range []string{"/v1/health", "/v1/defaults", "/v1/solutes", "/v1/presets"} {
		okJSON(t, do(h, http.MethodGet, p, "", nil))
	}
	okJSON(t, post(h, "/v1/osmotic", osmoticNaCl))
	okJSON(t, post(h, "/v1/flux", fluxBase))
	close(release)
	wg.Wait()
	if firstCode != http.StatusOK || !strings.Contains(first.String(), `"candidates"`) {
		t.Errorf("the admitted screen answered %d: %.200s", firstCode, first)
	}
	// The slot is free again.
	okJSON(t, post(h, "/v1/screen", heavyScreen))
}

// TestHeavyQueueWaitsForASlot: a heavy request that finds the slots full
// but room in the queue waits and is answered once a slot frees; past the
// queue's size the answer is 503.
func TestHeavyQueueWaitsForASlot(t *testing.T) {
	started := make(chan string, 4)
	release := make(chan struct{})
	h := New(Options{MaxHeavy: 1, HeavyQueue: 1, QueueWait: time.Hour, dispatch: blockingDispatch(started, release)}).(*handler)
	codes := make(chan int, 2)
	go func() { codes <- post(h, "/v1/screen", heavyScreen).Code }()
	<-started
	go func() { codes <- post(h, "/v1/screen", heavyScreen).Code }()
	// Wait for the second request to join the queue (the event: the
	// queue's one place is taken).
	for len(h.heavy.waiters) == 0 {
		runtime.Gosched()
	}
	mustError(t, post(h, "/v1/screen", heavyScreen), http.StatusServiceUnavailable, "server")
	close(release) // the first finishes, the queued one takes its slot
	for i := 0; i < 2; i++ {
		if c := <-codes; c != http.StatusOK {
			t.Errorf("a queued screen answered %d, want 200", c)
		}
	}
}

// TestDeadlineAnswers504: a request still computing at its deadline is
// stopped by the engine's own context checks and answered 504 with the
// contract's error on field "deadline", stating the server's limit. The
// hook waits for the deadline (the event), then runs the real engine.
func TestDeadlineAnswers504(t *testing.T) {
	h := New(Options{Timeout: 50 * time.Millisecond, dispatch: func(ctx context.Context, op string, body []byte) ([]byte, *api.Error) {
		awaitDeadline(ctx)
		return api.Dispatch(ctx, op, body)
	}})
	scenario := `{"uncertainty":{"samples":1000}}` // the whole library with robustness
	e := mustError(t, post(h, "/v1/screen", scenario), http.StatusGatewayTimeout, "deadline")
	if e.Error.Limit != "50ms" || !strings.Contains(e.Error.Message, "50ms") {
		t.Errorf("deadline error states limit %v, message %q; want 50ms in both", e.Error.Limit, e.Error.Message)
	}
	sweep := `{"candidates":["NaCl"],"sweep":{"variable":"concentration","from":0.1,"to":2,"points":50,"unit":"mol/L"}}`
	mustError(t, post(h, "/v1/screen", sweep), http.StatusGatewayTimeout, "deadline")
	mustError(t, post(h, "/v1/batch", `[{"op":"osmotic","body":`+osmoticNaCl+`}]`), http.StatusGatewayTimeout, "deadline")
}

// awaitDeadline returns once ctx's deadline has passed. Natively the
// context's timer closes Done; under js/wasm the request context has no
// timer (deadline_js.go: its Err reads the clock), so Done is nil and the
// wait sleeps until the stated deadline, then until Err reports it.
func awaitDeadline(ctx context.Context) {
	if done := ctx.Done(); done != nil {
		<-done
		return
	}
	dl, _ := ctx.Deadline()
	for ctx.Err() == nil {
		time.Sleep(time.Until(dl) + time.Millisecond)
	}
}

// TestBatchStreamedAsDispatched: the streamed batch answer is byte for
// byte the one Dispatch returns (plus the closing newline).
func TestBatchStreamedAsDispatched(t *testing.T) {
	body := `[{"op":"osmotic","body":` + osmoticNaCl + `},{"op":"flux","body":` + fluxBase + `},` +
		`{"op":"screen","body":{}},{"op":"osmotic","body":{"solute":"Unobtainium","concentration":1,"unit":"mol/kg"}}]`
	want, e := api.Dispatch(context.Background(), api.OpBatch, []byte(body))
	if e != nil {
		t.Fatal(e)
	}
	rec := post(New(Options{}), "/v1/batch", body)
	if rec.Code != http.StatusOK || rec.Header().Get("Content-Type") != "application/json" {
		t.Fatalf("status %d, Content-Type %q", rec.Code, rec.Header().Get("Content-Type"))
	}
	if got := rec.Body.String(); got != string(want)+"\n" {
		t.Errorf("streamed batch differs from Dispatch:\n got %.300s\nwant %.300s", got, want)
	}
	for _, b := range []string{`[]`} {
		want, _ := api.Dispatch(context.Background(), api.OpBatch, []byte(b))
		if got := post(New(Options{}), "/v1/batch", b).Body.String(); got != string(want)+"\n" {
			t.Errorf("batch %s: got %q, want %q", b, got, want)
		}
	}
	// A malformed batch is refused before anything is written: a 400.
	mustError(t, post(New(Options{}), "/v1/batch", `{"op":"osmotic"}`), http.StatusBadRequest, "batch")
}

// TestDeadlineReadFromTheClock: the request context reports its deadline
// from the clock even before (or without) its timer firing, which under
// js/wasm a CPU-bound loop never lets happen.
func TestDeadlineReadFromTheClock(t *testing.T) {
	ctx := clockCtx{Context: context.Background(), deadline: time.Now().Add(-time.Millisecond)}
	if err := ctx.Err(); err != context.DeadlineExceeded {
		t.Errorf("a past deadline: Err() = %v, want context.DeadlineExceeded", err)
	}
	if d, ok := ctx.Deadline(); !ok || !d.Equal(ctx.deadline) {
		t.Errorf("Deadline() = %v, %v", d, ok)
	}
	live := clockCtx{Context: context.Background(), deadline: time.Now().Add(time.Hour)}
	if err := live.Err(); err != nil {
		t.Errorf("a deadline an hour away: Err() = %v", err)
	}
}

// TestOversizedBodyKeepsTheConnection: a body a little over the cap is
// read to its end before the 413, so the client's next request goes over
// the same connection (the edge runtime closed it silently otherwise); a
// body past 4 × the cap is left unread and the 413 says Connection: close.
func TestOversizedBodyKeepsTheConnection(t *testing.T) {
	const limit = 1 << 10
	srv := httptest.NewServer(New(Options{MaxBodyBytes: limit}))
	defer srv.Close()
	client := srv.Client()
	send := func(body string) (int, bool, bool) {
		var reused bool
		trace := &httptrace.ClientTrace{GotConn: func(i httptrace.GotConnInfo) { reused = i.Reused }}
		req, _ := http.NewRequestWithContext(httptrace.WithClientTrace(context.Background(), trace), http.MethodPost, srv.URL+"/v1/osmotic", strings.NewReader(body))
		req.Header.Set("Content-Type", "application/json")
		resp, err := client.Do(req)
		if err != nil {
			t.Fatal(err)
		}
		io.Copy(io.Discard, resp.Body)
		resp.Body.Close()
		return resp.StatusCode, reused, resp.Close
	}
	if st, _, _ := send(osmoticNaCl); st != http.StatusOK {
		t.Fatalf("first request: %d", st)
	}
	if st, _, closed := send(strings.Repeat(" ", 2*limit) + osmoticNaCl); st != http.StatusRequestEntityTooLarge || closed {
		t.Fatalf("2 × the cap: status %d, connection closed %v; want 413 with the connection kept", st, closed)
	}
	if st, reused, _ := send(osmoticNaCl); st != http.StatusOK || !reused {
		t.Errorf("after a drained 413: status %d, connection reused %v; want 200 on the same connection", st, reused)
	}
	if st, _, closed := send(strings.Repeat(" ", 8*limit)); st != http.StatusRequestEntityTooLarge || !closed {
		t.Errorf("8 × the cap: status %d, connection closed %v; want 413 with Connection: close", st, closed)
	}
	if st, _, _ := send(osmoticNaCl); st != http.StatusOK {
		t.Errorf("after a closed 413: %d", st)
	}
}

// TestSweepStreamedAsDispatched: a screen with a sweep is streamed, byte
// for byte the answer Dispatch returns (plus the closing newline); a sweep
// refused by its checks is a 400 before anything is written.
func TestSweepStreamedAsDispatched(t *testing.T) {
	body := `{"candidates": ["NaCl", "MgCl2", "KCl"], "sweep": {"variable": "concentration", "from": 0.1, "to": 2, "unit": "mol/L", "points": 6}}`
	want, e := api.Dispatch(context.Background(), api.OpScreen, []byte(body))
	if e != nil {
		t.Fatal(e)
	}
	rec := post(New(Options{}), "/v1/screen", body)
	if rec.Code != http.StatusOK || rec.Header().Get("Content-Type") != "application/json" || rec.Header().Get("Content-Length") != "" {
		t.Fatalf("status %d, Content-Type %q, Content-Length %q", rec.Code, rec.Header().Get("Content-Type"), rec.Header().Get("Content-Length"))
	}
	if got := rec.Body.String(); got != string(want)+"\n" {
		t.Errorf("streamed sweep differs from Dispatch:\n got %.300s\nwant %.300s", got, want)
	}
	mustError(t, post(New(Options{}), "/v1/screen", `{"sweep": {"variable": "concentration", "from": 0.1, "to": 2, "unit": "mol/L", "points": 1000}}`), http.StatusBadRequest, "sweep.points")
}
