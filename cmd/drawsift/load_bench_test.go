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
	"syscall"
	"testing"
	"time"
)

// Loopback load benchmarks of drawsift serve (issue #15: cheap endpoints
// stay responsive under heavy ones). They report latencies as metrics and
// assert nothing about time; README.md quotes their figures.
//
//	go test -run '^$' -bench 'HealthUnderHeavy|MixedLoad' -benchtime 2000x ./cmd/drawsift/
//
// Each sub-benchmark starts its own server on 127.0.0.1 with the default
// admission (one heavy slot per core, 32 waiters per slot); the load
// stops when the sub-benchmark ends.

// heavyScreen: a robustness run of the whole library, 1,000 samples
// (about 0.3 s of every core).
const benchHeavy = `{"uncertainty":{"samples":1000}}`

// benchClient is a client with room for every connection of a benchmark.
func benchClient(conns int) *http.Client {
	return &http.Client{Timeout: 2 * time.Minute, Transport: &http.Transport{
		MaxConnsPerHost: conns, MaxIdleConnsPerHost: conns, DisableCompression: true}}
}

// hit sends one request and returns its status and latency (status 0 for
// a transport error).
func hit(ctx context.Context, c *http.Client, method, url, body string) (int, time.Duration) {
	req, _ := http.NewRequestWithContext(ctx, method, url, strings.NewReader(body))
	if body != "" {
		req.Header.Set("Content-Type", "application/json")
	}
	t0 := time.Now()
	resp, err := c.Do(req)
	if err != nil {
		return 0, time.Since(t0)
	}
	io.Copy(io.Discard, resp.Body)
	resp.Body.Close()
	return resp.StatusCode, time.Since(t0)
}

// reportLatency reports p50 and p99 of lat in microseconds under name.
func reportLatency(b *testing.B, name string, lat []time.Duration) {
	if len(lat) == 0 {
		return
	}
	slices.Sort(lat)
	pct := func(p float64) float64 { return float64(lat[int(p*float64(len(lat)-1))].Microseconds()) }
	b.ReportMetric(pct(0.50), name+"-p50-µs")
	b.ReportMetric(pct(0.99), name+"-p99-µs")
}

// reportRSS reports the process's peak resident memory (server and
// clients together: they share the test process).
func reportRSS(b *testing.B) {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) == nil {
		b.ReportMetric(float64(ru.Maxrss)/1024, "peak-rss-MB")
	}
}

// BenchmarkHealthUnderHeavy: GET /v1/health from 4 clients, b.N requests
// in all, while `heavy` clients keep robustness screens running (0: the
// idle server). Reports the health latency and how the heavy requests were
// answered. "slots=1024" lifts the admission limit, for comparison: every
// heavy request computes at once, as before the limit.
func BenchmarkHealthUnderHeavy(b *testing.B) {
	for _, tc := range []struct{ heavy, slots int }{{0, 0}, {8, 0}, {8, maxHeavySlots}} {
		heavy := tc.heavy
		name := fmt.Sprintf("heavy=%d", heavy)
		if tc.slots > 0 {
			name += fmt.Sprintf("/slots=%d", tc.slots)
		}
		b.Run(name, func(b *testing.B) {
			base, _ := startServe(b, serveConfig{maxHeavy: tc.slots})
			c := benchClient(heavy + 4)
			defer c.CloseIdleConnections()
			ctx, stop := context.WithCancel(context.Background())
			var wg sync.WaitGroup
			var ok, busy, other atomic.Int64
			first := make(chan struct{})
			var once sync.Once
			for range heavy {
				wg.Add(1)
				go func() {
					defer wg.Done()
					for ctx.Err() == nil {
						st, _ := hit(ctx, c, "POST", base+"/v1/screen", benchHeavy)
						switch {
						case ctx.Err() != nil:
						case st == http.StatusOK:
							ok.Add(1)
							once.Do(func() { close(first) })
						case st == http.StatusServiceUnavailable:
							busy.Add(1)
						default:
							other.Add(1)
						}
					}
				}()
			}
			if heavy > 0 {
				<-first // the heavy load is running
			}
			lat := make([]time.Duration, b.N)
			var next atomic.Int64
			var hw sync.WaitGroup
			b.ResetTimer()
			for range 4 {
				hw.Add(1)
				go func() {
					defer hw.Done()
					for i := next.Add(1) - 1; i < int64(b.N); i = next.Add(1) - 1 {
						st, d := hit(context.Background(), c, "GET", base+"/v1/health", "")
						if st != http.StatusOK {
							b.Errorf("health answered %d", st)
						}
						lat[i] = d
					}
				}()
			}
			hw.Wait()
			b.StopTimer()
			stop()
			wg.Wait()
			reportLatency(b, "health", lat)
			if heavy > 0 {
				b.ReportMetric(float64(ok.Load()), "heavy-200")
				b.ReportMetric(float64(busy.Load()), "heavy-503")
				b.ReportMetric(float64(other.Load()), "heavy-other")
			}
			reportRSS(b)
		})
	}
}

// mixCheap are the cheap requests of the mixed load, taken in turn.
var mixCheap = []struct{ method, path, body string }{
	{"GET", "/v1/health", ""},
	{"POST", "/v1/osmotic", `{"solute":"NaCl","concentration":1,"unit":"mol/kg","temperature_c":25}`},
	{"GET", "/v1/defaults", ""},
	{"POST", "/v1/flux", `{"membrane":{"a_lmh_per_bar":1,"b_lmh":0.3,"s_um":500},"orientation":"AL-FS","draw":{"solute":"NaCl","concentration":1,"unit":"mol/L"},"feed":{"solute":"NaCl","concentration":0,"unit":"mol/L"},"temperature_c":25,"k_draw_m_per_s":5e-5,"k_feed_m_per_s":5e-5}`},
	{"GET", "/v1/presets", ""},
	{"POST", "/v1/osmotic", `{"solute":"seawater","concentration":35,"unit":"g/kg","temperature_c":20}`},
	{"GET", "/v1/solutes", ""},
}

// mixHeavy is the heavy request of the mixed load: a robustness run of the
// whole library at 200 samples (about 60 ms of every core).
const mixHeavy = `{"uncertainty":{"samples":200}}`

// BenchmarkMixedLoad: b.N requests over 64 connections, every 20th a
// robustness screen (5 % heavy), the rest cheap; and the same cheap
// requests alone (heavy=0%) for the idle figures. Reports the cheap and
// heavy latencies and every status that is not 200.
func BenchmarkMixedLoad(b *testing.B) {
	for _, every := range []int{0, 20} {
		name := "heavy=0%"
		if every > 0 {
			name = fmt.Sprintf("heavy=%d%%", 100/every)
		}
		b.Run(name+"/conns=64", func(b *testing.B) {
			const conns = 64
			base, _ := startServe(b, serveConfig{})
			c := benchClient(conns)
			defer c.CloseIdleConnections()
			cheap := make([]time.Duration, 0, b.N)
			var heavy []time.Duration
			var mu sync.Mutex
			var busy, fail atomic.Int64
			var next atomic.Int64
			var wg sync.WaitGroup
			b.ResetTimer()
			for range conns {
				wg.Add(1)
				go func() {
					defer wg.Done()
					for i := next.Add(1) - 1; i < int64(b.N); i = next.Add(1) - 1 {
						isHeavy := every > 0 && i%int64(every) == int64(every-1)
						var st int
						var d time.Duration
						if isHeavy {
							st, d = hit(context.Background(), c, "POST", base+"/v1/screen", mixHeavy)
						} else {
							r := mixCheap[i%int64(len(mixCheap))]
							st, d = hit(context.Background(), c, r.method, base+r.path, r.body)
						}
						switch st {
						case http.StatusOK:
						case http.StatusServiceUnavailable:
							busy.Add(1)
						default:
							fail.Add(1)
						}
						mu.Lock()
						if isHeavy {
							heavy = append(heavy, d)
						} else {
							cheap = append(cheap, d)
						}
						mu.Unlock()
					}
				}()
			}
			wg.Wait()
			b.StopTimer()
			reportLatency(b, "cheap", cheap)
			reportLatency(b, "heavy", heavy)
			b.ReportMetric(float64(busy.Load()), "503s")
			b.ReportMetric(float64(fail.Load()), "other-non-200")
			reportRSS(b)
		})
	}
}
