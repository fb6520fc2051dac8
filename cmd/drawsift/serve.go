package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"log"
	"net"
	"net/http"
	"os"
	"os/signal"
	"path/filepath"
	"strings"
	"syscall"
	"time"

	"drawsift/engine/api/httpapi"
)

const serveUsage = `usage: drawsift serve [--addr 127.0.0.1:8080] [--wasm PATH] [--cors ORIGIN] [--max-body BYTES]
                      [--deadline 1m] [--max-heavy N] [--heavy-queue N] [--queue-wait 10s]

Serves the JSON API at /v1/ (POST /v1/osmotic, /v1/flux, /v1/screen,
/v1/batch; GET /v1/solutes, /v1/presets, /v1/defaults, /v1/health) and the
page at /, until SIGINT or SIGTERM.

Every request runs under --deadline (past it: 504, field "deadline").
Screens and batches compute at most --max-heavy at once, sharing all cores
but one (which stays free for the other endpoints), with up to
--heavy-queue more waiting at most --queue-wait for a slot; beyond that
they are refused with 503 and Retry-After. The other endpoints never wait
for a slot.
`

// Server timeouts: generous for a screen, short for slow or idle clients.
const (
	readHeaderTimeout = 5 * time.Second
	readTimeout       = 30 * time.Second
	writeTimeout      = 2 * time.Minute
	idleTimeout       = 2 * time.Minute
	shutdownTimeout   = 10 * time.Second
	maxHeaderBytes    = 64 << 10
	// A deadline outside these bounds is a slip (seconds for minutes).
	minDeadline = time.Second
	maxDeadline = time.Hour
	// maxHeavySlots bounds --max-heavy and --heavy-queue.
	maxHeavySlots = 1024
)

// serveConfig is what the serve flags set.
type serveConfig struct {
	addr    string
	wasm    string
	cors    []string
	maxBody int64
	// Admission, as httpapi.Options reads it (0 → its default): deadline
	// per request, heavy slots, the queue behind them (< 0: none) and the
	// longest wait in it.
	deadline   time.Duration
	maxHeavy   int
	heavyQueue int
	queueWait  time.Duration
}

// writeTimeoutFor keeps the server's write timeout past the deadline, so
// that a request stopped by its deadline can still send its 504.
func writeTimeoutFor(deadline time.Duration) time.Duration {
	return max(writeTimeout, deadline+30*time.Second)
}

// runServe is the serve command: it parses the flags and serves until
// SIGINT or SIGTERM.
func runServe(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("serve", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() { fmt.Fprint(fs.Output(), serveUsage+"\nflags:\n"); fs.PrintDefaults() }
	var cfg serveConfig
	fs.StringVar(&cfg.addr, "addr", "127.0.0.1:8080", "listen on `HOST:PORT` (port 0 picks a free one)")
	fs.StringVar(&cfg.wasm, "wasm", "build/drawsift.wasm", "serve the page's engine from `PATH`, built by make wasm")
	cors := fs.String("cors", "", "allow browser calls from `ORIGIN` (comma-separated list, or *); off by default")
	fs.Int64Var(&cfg.maxBody, "max-body", httpapi.DefaultMaxBodyBytes, "cap request bodies at `BYTES`")
	fs.DurationVar(&cfg.deadline, "deadline", httpapi.DefaultTimeout, "stop any request still computing after `DURATION` (504); 1s–1h")
	fs.IntVar(&cfg.maxHeavy, "max-heavy", httpapi.DefaultMaxHeavy(), "compute at most `N` screens and batches at once (default: the cores less one, which stays free for the other endpoints)")
	queueFlag := fs.Int("heavy-queue", -1, "let `N` more screens and batches wait for a slot (default 32 × --max-heavy; 0: refuse at once)")
	fs.DurationVar(&cfg.queueWait, "queue-wait", httpapi.DefaultQueueWait, "the longest a queued screen or batch waits for a slot, `DURATION`, before its 503")
	if wantsHelp(args) {
		fs.SetOutput(stdout)
		fs.Usage()
		return 0
	}
	if err := fs.Parse(args); err != nil {
		return 1
	}
	if cfg.deadline < minDeadline || cfg.deadline > maxDeadline {
		fmt.Fprintf(stderr, "drawsift serve: --deadline %v is outside %v–%v\n", cfg.deadline, minDeadline, maxDeadline)
		return 1
	}
	if cfg.maxHeavy < 1 || cfg.maxHeavy > maxHeavySlots {
		fmt.Fprintf(stderr, "drawsift serve: --max-heavy %d is outside 1–%d\n", cfg.maxHeavy, maxHeavySlots)
		return 1
	}
	switch q := *queueFlag; {
	case q == -1:
		cfg.heavyQueue = 0 // httpapi's default
	case q == 0:
		cfg.heavyQueue = -1 // httpapi: no queue
	case q < 0 || q > maxHeavySlots:
		fmt.Fprintf(stderr, "drawsift serve: --heavy-queue %d is outside 0–%d\n", q, maxHeavySlots)
		return 1
	default:
		cfg.heavyQueue = q
	}
	if cfg.queueWait <= 0 || cfg.queueWait > cfg.deadline {
		fmt.Fprintf(stderr, "drawsift serve: --queue-wait %v must be positive and at most --deadline (%v)\n", cfg.queueWait, cfg.deadline)
		return 1
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "drawsift serve: unexpected argument %q\n", fs.Arg(0))
		return 1
	}
	if cfg.maxBody <= 0 {
		fmt.Fprintf(stderr, "drawsift serve: --max-body must be a positive number of bytes (got %d)\n", cfg.maxBody)
		return 1
	}
	// The page without its engine would wait for it forever: say so now.
	for _, p := range []string{cfg.wasm, filepath.Join(filepath.Dir(cfg.wasm), "wasm_exec.js")} {
		if _, err := os.Stat(p); err != nil {
			wd, _ := os.Getwd()
			fmt.Fprintf(stderr, "drawsift serve: the page's engine is missing: %s not found (working directory %s).\n"+
				"Build it with `make wasm` in the Drawsift checkout and run from there, or pass --wasm PATH to the built drawsift.wasm (wasm_exec.js beside it).\n", p, wd)
			return 1
		}
	}
	for _, o := range strings.Split(*cors, ",") {
		if o = strings.TrimSpace(o); o != "" {
			cfg.cors = append(cfg.cors, o)
		}
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	if err := serve(ctx, cfg, stdout, stderr, nil); err != nil {
		fmt.Fprintf(stderr, "drawsift serve: %v\n", err)
		return 1
	}
	return 0
}

// newServeHandler mounts the API at /v1/ and the page at /.
func newServeHandler(cfg serveConfig, logf func(string, ...any)) (http.Handler, error) {
	site, err := newSiteHandler(cfg.wasm)
	if err != nil {
		return nil, err
	}
	mux := http.NewServeMux()
	mux.Handle("/v1/", httpapi.New(httpapi.Options{MaxBodyBytes: cfg.maxBody, CORSOrigins: cfg.cors, Logf: logf,
		Timeout: cfg.deadline, MaxHeavy: cfg.maxHeavy, HeavyQueue: cfg.heavyQueue, QueueWait: cfg.queueWait}))
	mux.Handle("/", site)
	return mux, nil
}

// serve listens on cfg.addr and serves until ctx ends, then shuts down
// gracefully. ready, if not nil, receives the bound address once the
// listener is open. A busy port is an error returned at once.
func serve(ctx context.Context, cfg serveConfig, stdout, stderr io.Writer, ready func(addr string)) error {
	logger := log.New(stderr, "drawsift serve: ", log.LstdFlags)
	h, err := newServeHandler(cfg, logger.Printf)
	if err != nil {
		return err
	}
	ln, err := net.Listen("tcp", cfg.addr)
	if err != nil {
		if errors.Is(err, syscall.EADDRINUSE) {
			return fmt.Errorf("cannot listen on %s: the address is already in use (another server is running there; choose another with --addr HOST:PORT)", cfg.addr)
		}
		return fmt.Errorf("cannot listen on %s: %v", cfg.addr, err)
	}
	addr := ln.Addr().String()
	if host, _, _ := net.SplitHostPort(addr); !net.ParseIP(host).IsLoopback() {
		fmt.Fprintf(stderr, "drawsift serve: warning: %s is reachable from other machines; the API has no authentication\n", addr)
	}
	srv := &http.Server{
		Handler:           h,
		ReadHeaderTimeout: readHeaderTimeout,
		ReadTimeout:       readTimeout,
		WriteTimeout:      writeTimeoutFor(cfg.deadline),
		IdleTimeout:       idleTimeout,
		MaxHeaderBytes:    maxHeaderBytes,
		ErrorLog:          logger,
	}
	fmt.Fprintf(stdout, "drawsift serve: page at http://%s/ , API at http://%s/v1/ (Ctrl-C stops)\n", addr, addr)
	if ready != nil {
		ready(addr)
	}
	errc := make(chan error, 1)
	go func() { errc <- srv.Serve(ln) }()
	select {
	case err := <-errc:
		return err
	case <-ctx.Done():
	}
	fmt.Fprintln(stdout, "drawsift serve: shutting down")
	sctx, cancel := context.WithTimeout(context.Background(), shutdownTimeout)
	defer cancel()
	if err := srv.Shutdown(sctx); err != nil {
		return fmt.Errorf("shutdown: %v", err)
	}
	if err := <-errc; err != nil && !errors.Is(err, http.ErrServerClosed) {
		return err
	}
	return nil
}
