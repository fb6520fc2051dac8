package main

import (
	"context"
	"fmt"
	"io"
	"net/http"
	"slices"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

// Loopback load test of drawsift serve: 10,000 mixed requests over 32
// concurrent connections to a real net/http server on 127.0.0.1. It checks
// that every answer has the status its request deserves (0 errors, 0
// 5xx) and logs requests/s and the p50 and p99 latencies; it asserts no
// timing. Bounded by the request count and by a time limit, after which it
// stops by itself.
//
//	go test -run TestLoadLoopback -v ./cmd/drawsift/
const (
	loadRequests    = 10000
	loadConnections = 32
	loadTimeLimit   = 3 * time.Minute
)

type loadRequest struct {
	method, path, body string
	status             int
}

// loadMix is the request mix, taken in turn: reads, every computation and
// a share of bad requests.
var loadMix = []loadRequest{
	{"GET", "/v1/health", "", 200},
	{"POST", "/v1/osmotic", `{"solute":"NaCl","concentration":1,"unit":"mol/kg","temperature_c":25}`, 200},
	{"POST", "/v1/flux", `{"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500},"orientation":"AL-FS","draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"},"feed":{"solute":"NaCl","concentration":0,"unit":"mol/L"},"temperature_c":25,"k_draw_m_per_s":5e-5,"k_feed_m_per_s":5e-5}`, 200},
	{"POST", "/v1/osmotic", `{"solute":"seawater","concentration":35,"unit":"g/kg","temperature_c":20}`, 200},
	{"POST", "/v1/flux", `{"membrane":{"preset":"tfc-standard"},"orientation":"AL-DS","draw":{"solute":"MgCl2","concentration":1.5,"unit":"mol/L"},"feed":{"solute":"seawater","concentration":35,"unit":"g/kg"}}`, 200},
	{"POST", "/v1/osmotic", `{"solute":"MgCl2","concentration":-1,"unit":"mol/kg"}`, 400},
	{"POST", "/v1/screen", `{"feed":{"solute":"seawater","concentration":35,"unit":"g/kg"},"membrane":{"a_lmh_per_bar":2,"b_lmh":0.4,"s_um":400},"orientation":"AL-FS","temperature_c":25,"candidates":["NaCl","MgCl2","Na2SO4"],"basis":{"kind":"osmotic-pressure","value":60,"unit":"bar"}}`, 200},
	{"POST", "/v1/osmotic", `{"solute":"KCl","concentration":50,"unit":"g/L"}`, 200},
	{"GET", "/v1/solutes", "", 200},
	{"POST", "/v1/flux", `{"membrane":{"a_lmh_per_bar":1},"orientation":"sideways"}`, 400},
}

func TestLoadLoopback(t *testing.T) {
	if testing.Short() {
		t.Skip("load test: skipped under -short")
	}
	base, _ := startServe(t, serveConfig{})
	client := &http.Client{
		Timeout: 30 * time.Second,
		Transport: &http.Transport{
			MaxConnsPerHost:     loadConnections,
			MaxIdleConnsPerHost: loadConnections,
			DisableCompression:  true,
		},
	}
	defer client.CloseIdleConnections()
	ctx, cancel := context.WithTimeout(context.Background(), loadTimeLimit)
	defer cancel()

	var next atomic.Int64
	latency := make([]time.Duration, loadRequests)
	var mu sync.Mutex
	var failures []string
	var fiveXX atomic.Int64
	fail := func(s string) {
		mu.Lock()
		defer mu.Unlock()
		if len(failures) < 10 {
			failures = append(failures, s)
		}
	}
	start := time.Now()
	var wg sync.WaitGroup
	for w := 0; w < loadConnections; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for ctx.Err() == nil {
				i := next.Add(1) - 1
				if i >= loadRequests {
					return
				}
				lr := loadMix[i%int64(len(loadMix))]
				req, _ := http.NewRequestWithContext(ctx, lr.method, base+lr.path, strings.NewReader(lr.body))
				if lr.body != "" {
					req.Header.Set("Content-Type", "application/json")
				}
				t0 := time.Now()
				resp, err := client.Do(req)
				if err != nil {
					fail(fmt.Sprintf("request %d %s: %v", i, lr.path, err))
					continue
				}
				_, err = io.Copy(io.Discard, resp.Body)
				resp.Body.Close()
				latency[i] = time.Since(t0)
				if resp.StatusCode >= 500 {
					fiveXX.Add(1)
				}
				if err != nil || resp.StatusCode != lr.status {
					fail(fmt.Sprintf("request %d %s: status %d (want %d), read error %v", i, lr.path, resp.StatusCode, lr.status, err))
				}
			}
		}()
	}
	wg.Wait()
	elapsed := time.Since(start)
	done := min(next.Load(), loadRequests)
	if done < loadRequests {
		t.Errorf("stopped by the %v time limit after %d of %d requests", loadTimeLimit, done, loadRequests)
	}
	if n := fiveXX.Load(); n > 0 {
		t.Errorf("%d answers were 5xx", n)
	}
	for _, f := range failures {
		t.Error(f)
	}
	lat := slices.Clone(latency[:done])
	slices.Sort(lat)
	pct := func(p float64) time.Duration { return lat[int(p*float64(len(lat)-1))] }
	t.Logf("%d requests, %d connections, 127.0.0.1: %.0f requests/s, p50 %v, p99 %v, max %v (elapsed %v)",
		done, loadConnections, float64(done)/elapsed.Seconds(), pct(0.50).Round(time.Microsecond),
		pct(0.99).Round(time.Microsecond), lat[len(lat)-1].Round(time.Microsecond), elapsed.Round(time.Millisecond))
}
