package main

import (
	"context"
	"fmt"
	"io"
	"net/http"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
)

// TestBatchSlowScenarioBoundedWindow: while the first scenario is held,
// the batch starts at most window scenarios past it (so at most that many
// finished outcomes wait in memory), and once it is released every
// outcome comes out in input order with its own content.
func TestBatchSlowScenarioBoundedWindow(t *testing.T) {
	const n, conc, window = 200, 3, 8
	items := make([][]byte, n)
	for i := range items {
		items[i] = []byte(fmt.Sprint(i))
	}
	release := make(chan struct{})
	full := make(chan struct{})
	var started, emitted atomic.Int64
	var violation atomic.Value
	call := func(ctx context.Context, body []byte) outcome {
		var i int64
		fmt.Sscan(string(body), &i)
		if s := started.Add(1); i-emitted.Load() >= window {
			violation.Store(fmt.Sprintf("scenario %d started with %d emitted (window %d)", i, emitted.Load(), window))
		} else if s == window {
			close(full) // the window is full: scenarios 0 … window−1 started
		}
		if i == 0 {
			<-release
		}
		return outcome{body: []byte("r" + string(body))}
	}
	var got []string
	errc := make(chan error, 1)
	go func() {
		errc <- forEachWindow(context.Background(), items, conc, window, call, func(i int, o outcome) error {
			if string(o.body) != fmt.Sprintf("r%d", i) {
				return fmt.Errorf("outcome %d is %q", i, o.body)
			}
			got = append(got, string(o.body))
			emitted.Add(1)
			return nil
		})
	}()
	<-full
	if s := started.Load(); s != window {
		t.Errorf("%d scenarios started behind the held one, want the window's %d", s, window)
	}
	close(release)
	if err := <-errc; err != nil {
		t.Fatal(err)
	}
	if v := violation.Load(); v != nil {
		t.Error(v)
	}
	if len(got) != n {
		t.Errorf("%d outcomes, want %d", len(got), n)
	}
}

// TestBatchRemoteDeadlineIsAVerdict: a 504 carrying the API's deadline
// error is the scenario's answer (not retried: the same request would stop
// again); a 200 whose body is not JSON is retried.
func TestBatchRemoteDeadlineIsAVerdict(t *testing.T) {
	var mu sync.Mutex
	attempts := map[string]int{}
	srv := apiServer(t, func(h http.Handler) http.Handler {
		return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
			b, _ := io.ReadAll(r.Body)
			mu.Lock()
			attempts[string(b)]++
			n := attempts[string(b)]
			mu.Unlock()
			switch {
			case strings.Contains(string(b), "MgSO4"):
				w.Header().Set("Content-Type", "application/json")
				w.WriteHeader(http.StatusGatewayTimeout)
				io.WriteString(w, `{"error":{"field":"deadline","message":"the request did not finish within the server's deadline of 1m0s","limit":"1m0s"}}`)
			case n == 1:
				w.Header().Set("Content-Type", "application/json")
				io.WriteString(w, `{"candidates":[{"solute":`) // cut short
			default:
				r.Body = io.NopCloser(strings.NewReader(string(b)))
				h.ServeHTTP(w, r)
			}
		})
	})
	in := scenarioFor(0) + "\n" + scenarioFor(3) + "\n"
	code, out, errOut := runCLI(t, in, "screen", "--remote", srv.URL, "--retries", "2")
	if code != 2 {
		t.Errorf("exit %d, want 2 (one scenario failed with a verdict): %s", code, errOut)
	}
	lines := parseLines(t, out)
	if len(lines) != 2 || lines[0].Result == nil || lines[1].Error == nil || lines[1].Error.Field != "deadline" {
		t.Fatalf("unexpected lines: %s", out)
	}
	mu.Lock()
	defer mu.Unlock()
	if n := attempts[scenarioFor(3)]; n != 1 {
		t.Errorf("the deadline scenario was sent %d times, want 1", n)
	}
	if n := attempts[scenarioFor(0)]; n != 2 {
		t.Errorf("the cut-short scenario was sent %d times, want 2", n)
	}
}
