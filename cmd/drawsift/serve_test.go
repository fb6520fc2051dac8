package main

import (
	"bytes"
	"context"
	"io"
	"net"
	"net/http"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"
)

// startServe runs serve on a free loopback port until the test ends and
// returns its base URL.
func startServe(t testing.TB, cfg serveConfig) (string, *syncBuffer) {
	t.Helper()
	if cfg.addr == "" {
		cfg.addr = "127.0.0.1:0"
	}
	if cfg.maxBody == 0 {
		cfg.maxBody = 1 << 20
	}
	ctx, cancel := context.WithCancel(context.Background())
	addrc := make(chan string, 1)
	errc := make(chan error, 1)
	out := &syncBuffer{}
	go func() { errc <- serve(ctx, cfg, out, out, func(a string) { addrc <- a }) }()
	var addr string
	select {
	case addr = <-addrc:
	case err := <-errc:
		cancel()
		t.Fatalf("serve: %v", err)
	}
	t.Cleanup(func() {
		cancel()
		select {
		case err := <-errc:
			if err != nil {
				t.Errorf("serve returned %v on shutdown", err)
			}
		case <-time.After(15 * time.Second):
			t.Errorf("serve did not shut down")
		}
	})
	return "http://" + addr, out
}

// syncBuffer is a bytes.Buffer safe for the server's goroutines.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

func TestServeAPIAndPage(t *testing.T) {
	base, out := startServe(t, serveConfig{})
	if !strings.Contains(out.String(), base+"/") {
		t.Errorf("serve should print its URL %s/: %q", base, out.String())
	}
	resp, err := http.Get(base + "/v1/health")
	if err != nil {
		t.Fatal(err)
	}
	b, _ := io.ReadAll(resp.Body)
	resp.Body.Close()
	if resp.StatusCode != 200 || !strings.Contains(string(b), `"engine_version"`) {
		t.Errorf("health: %d %s", resp.StatusCode, b)
	}
	resp, err = http.Get(base + "/")
	if err != nil {
		t.Fatal(err)
	}
	b, _ = io.ReadAll(resp.Body)
	resp.Body.Close()
	if resp.StatusCode != 200 || !strings.Contains(strings.ToLower(string(b)), "<html") {
		t.Errorf("page: %d %.200s", resp.StatusCode, b)
	}
	// Unknown API paths are the API's 404 error object, not the page's.
	resp, err = http.Get(base + "/v1/nope")
	if err != nil {
		t.Fatal(err)
	}
	b, _ = io.ReadAll(resp.Body)
	resp.Body.Close()
	if resp.StatusCode != 404 || !strings.Contains(string(b), `"field":"path"`) {
		t.Errorf("unknown API path: %d %s", resp.StatusCode, b)
	}
}

func TestServeBusyPort(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	var stdout, stderr bytes.Buffer
	done := make(chan int, 1)
	wasm, _ := fakeBuild(t)
	go func() {
		done <- run([]string{"serve", "--addr", ln.Addr().String(), "--wasm", wasm}, nil, &stdout, &stderr)
	}()
	select {
	case code := <-done:
		if code != 1 {
			t.Errorf("exit %d, want 1", code)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("serve on a busy port did not return")
	}
	if !strings.Contains(stderr.String(), "already in use") || !strings.Contains(stderr.String(), ln.Addr().String()) {
		t.Errorf("stderr should name the address and say it is in use: %q", stderr.String())
	}
}

func TestServeFlags(t *testing.T) {
	for _, args := range [][]string{
		{"serve", "--max-body", "0"},
		{"serve", "--addr"},
		{"serve", "extra"},
		{"serve", "--addr", "256.0.0.1:99999"},
		{"serve", "--deadline", "100ms"},
		{"serve", "--deadline", "3h"},
		{"serve", "--max-heavy", "0"},
		{"serve", "--heavy-queue", "-2"},
		{"serve", "--queue-wait", "0s"},
		{"serve", "--deadline", "5s", "--queue-wait", "10s"},
	} {
		var stdout, stderr bytes.Buffer
		if code := run(args, nil, &stdout, &stderr); code != 1 {
			t.Errorf("%v: exit %d, want 1 (stderr %q)", args, code, stderr.String())
		}
		// An admission flag's refusal names the flag (not a later check).
		if f := args[len(args)-2]; strings.Contains("--deadline --max-heavy --heavy-queue --queue-wait", f) && !strings.Contains(stderr.String(), f) {
			t.Errorf("%v: stderr %q does not name %s", args, stderr.String(), f)
		}
	}
}

// TestServeGracefulShutdown: a request in flight when the server is told
// to stop still gets its answer.
func TestServeGracefulShutdown(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	addrc := make(chan string, 1)
	errc := make(chan error, 1)
	go func() {
		errc <- serve(ctx, serveConfig{addr: "127.0.0.1:0", maxBody: 1 << 20}, io.Discard, io.Discard, func(a string) { addrc <- a })
	}()
	base := "http://" + <-addrc
	// A slow client: send the headers, then the body after shutdown began.
	pr, pw := io.Pipe()
	respc := make(chan *http.Response, 1)
	go func() {
		resp, err := http.Post(base+"/v1/osmotic", "application/json", pr)
		if err != nil {
			t.Errorf("in-flight request: %v", err)
		}
		respc <- resp
	}()
	time.Sleep(100 * time.Millisecond) // let the request reach the handler
	cancel()
	time.Sleep(100 * time.Millisecond)
	pw.Write([]byte(`{"solute":"NaCl","concentration":1,"unit":"mol/kg"}`))
	pw.Close()
	if resp := <-respc; resp != nil {
		b, _ := io.ReadAll(resp.Body)
		resp.Body.Close()
		if resp.StatusCode != 200 {
			t.Errorf("in-flight request: %d %s", resp.StatusCode, b)
		}
	}
	if err := <-errc; err != nil {
		t.Errorf("serve: %v", err)
	}
	if _, err := http.Get(base + "/v1/health"); err == nil {
		t.Errorf("server still answers after shutdown")
	}
}

// Started where the page's engine is not (another directory, an installed
// binary), serve refuses at once and says how to fix it, rather than
// serving a page that waits for an engine that never comes.
func TestServeWithoutEngine(t *testing.T) {
	var stdout, stderr bytes.Buffer
	missing := filepath.Join(t.TempDir(), "drawsift.wasm")
	if code := run([]string{"serve", "--addr", "127.0.0.1:0", "--wasm", missing}, nil, &stdout, &stderr); code != 1 {
		t.Fatalf("exit %d, want 1", code)
	}
	if msg := stderr.String(); !strings.Contains(msg, "engine is missing") || !strings.Contains(msg, missing) || !strings.Contains(msg, "make wasm") {
		t.Errorf("stderr %q", msg)
	}
}
