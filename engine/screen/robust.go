package screen

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"gonum.org/v1/gonum/stat/distuv"

	"drawsift/engine/errs"
	"drawsift/engine/transport"
	"drawsift/engine/warn"
)

// Robustness summarises a candidate's rank over the Monte Carlo samples.
type Robustness struct {
	PFirst float64 // fraction of all samples in which it ranked first
	PTop3  float64 // fraction of all samples in which it ranked in the top three
	// Rank quantiles over all samples (empirical: the smallest rank whose
	// cumulative frequency reaches p). A sample in which the candidate
	// failed a hard limit counts as rank n+1, behind every ranked one, so
	// a quantile of n+1 means "not ranked" in that share of samples.
	RankP05, RankMedian, RankP95 int
	// FailedFraction: samples where the candidate failed a hard limit; they
	// count neither towards PFirst nor PTop3.
	FailedFraction float64
	// RankCounts[r-1] is the number of samples in which it ranked r; the
	// last entry (r = n+1) counts the failed ones. The other figures
	// follow from it (RobustnessOf), and the counts of a run's parts add.
	RankCounts []int
}

// seedStream is the second PCG word; with the scenario's seed it fixes the
// random stream, so the same seed gives the same robustness figures.
const seedStream = 0x9e3779b97f4a7c15

// logNormalFactor returns a log-normal distribution with median 1 and
// relative standard deviation rsd: σ_ln = √ln(1 + rsd²).
func logNormalFactor(rsd float64, src rand.Source) distuv.LogNormal {
	return distuv.LogNormal{Mu: 0, Sigma: math.Sqrt(math.Log1p(rsd * rsd)), Src: src}
}

// robustness runs the Monte Carlo over the stated uncertainties: A, B
// and S of the membrane (one draw per sample, shared by every candidate),
// and per candidate its price (uniform over its range), its osmotic model
// (a log-normal factor on π), its diffusivity and, where its B is an
// estimate, that estimate's own error. Each sample re-solves
// what the perturbation changes — the basis concentration, the flux, and
// the metrics — then normalises, scores and ranks the candidates afresh.
//
// The samples are drawn in order from one PCG stream seeded by the
// scenario, a chunk at a time, and each chunk is then evaluated on every
// core (robustWorkers): the figures are integer counts over the samples,
// so they are bit for bit those of a single-core run, whatever the number
// of workers (a test holds this).
func (e *env) robustness(ctx context.Context, res *Result, progress func(done, total int)) error {
	return e.robustnessOn(ctx, res, progress, Cores(ctx))
}

// Cores is how many cores work under ctx may use: those of the Go
// runtime, at most the WithCores limit.
func Cores(ctx context.Context) int {
	w := robustWorkers()
	if n, ok := ctx.Value(coresKey{}).(int); ok && n > 0 {
		w = min(w, n)
	}
	return w
}

// coresKey carries the most cores one request's robustness run may use
// (WithCores).
type coresKey struct{}

// WithCores limits the robustness runs under ctx to n goroutines (a
// server sharing its cores between requests); the figures do not depend
// on it.
func WithCores(ctx context.Context, n int) context.Context {
	return context.WithValue(ctx, coresKey{}, n)
}

// robustWorkers is the number of goroutines evaluating samples: one per
// core the Go runtime may use (one in the browser, where js/wasm runs on
// one thread).
var robustWorkers = func() int { return max(1, runtime.GOMAXPROCS(0)) }

// robustChunk samples are drawn, then evaluated together: enough to keep
// every worker busy, few enough that their perturbations stay small in
// memory (chunk × candidates × 56 bytes).
const robustChunk = 256

// robustGrain is how many samples a worker claims at a time: few enough
// to balance the workers' ends of a chunk and to see a cancel soon (a
// sample of the whole library takes about half a millisecond), enough to
// keep the claims' shared counter cold.
const robustGrain = 4

func (e *env) robustnessOn(ctx context.Context, res *Result, progress func(done, total int), workers int) error {
	u := e.sc.Uncertainty
	n := len(res.Ranked)
	total := u.Samples
	src := rand.NewPCG(e.sc.Seed, seedStream)
	unif := distuv.Uniform{Min: 0, Max: 1, Src: src}
	dA := logNormalFactor(u.ARelSD, src)
	dB := logNormalFactor(u.BRelSD, src)
	dS := logNormalFactor(u.SRelSD, src)
	dD := logNormalFactor(u.DiffusivityRelSD, src)
	dBest := logNormalFactor(u.EstimatedBRelSD, src)
	dPi := make([]distuv.LogNormal, n)
	ci := make([]int, n)
	for k := range res.Ranked {
		ci[k] = res.Ranked[k].ci
		c := &e.cands[ci[k]]
		rsd := u.OsmoticRelSD
		if u.DefaultOsmotic {
			rsd = c.osmRelSD
		}
		dPi[k] = logNormalFactor(rsd, src)
	}
	if n*total > MaxRobustWork {
		return &errs.InputError{Field: "uncertainty.samples", Value: float64(total),
			Limit: fmt.Sprintf("≤ %d for %d ranked candidates (candidates × samples ≤ %d)", MaxRobustWork/n, n, MaxRobustWork),
			Msg:   "the robustness run is past its work budget"}
	}
	// This run's part of the samples: s ≡ index (mod parts).
	parts, part := max(1, u.ShardCount), u.ShardIndex
	chunk := min(robustChunk, total)
	perts := make([]perturb, chunk*n)
	workers = max(1, min(workers, chunk))
	e.tabulateRanked(ctx, res, ci, workers)
	ws := make([]*robustWorker, workers)
	for i := range ws {
		ws[i] = newRobustWorker(e, ci)
		ws[i].ref = res.Reference
	}
	// Draw a chunk's perturbations, in the stream's order.
	draw := func(perts []perturb, size int) {
		for s := 0; s < size; s++ {
			fA, fB, fS := dA.Rand(), dB.Rand(), dS.Rand()
			for k, j := range ci {
				c := &e.cands[j]
				fBk := fB
				if c.bEstimated && u.EstimatedBRelSD > 0 {
					fBk *= dBest.Rand()
				}
				p := &perts[s*n+k]
				*p = perturb{fA: fA, fB: fBk, fS: fS, fPi: dPi[k].Rand(), fD: dD.Rand(), price: -1}
				if c.hasPrice {
					if u.Prices {
						p.price = c.priceMin + (c.priceMax-c.priceMin)*unif.Rand()
					} else {
						p.price = 0.5 * (c.priceMin + c.priceMax)
					}
				}
			}
		}
	}
	// While the workers evaluate one chunk, the next is drawn into the
	// other buffer (the stream's order is kept: chunks are drawn in turn).
	next := make([]perturb, len(perts))
	draw(perts, min(chunk, total))
	every := max(1, total/100)
	for done := 0; done < total; {
		if err := ctx.Err(); err != nil {
			return err
		}
		size := min(chunk, total-done)
		// Evaluate this part's samples of the chunk (first, first+parts, …):
		// each worker claims the next robustGrain of them until none are
		// left, so a worker whose core is slowed (a shared machine) takes
		// fewer instead of holding the others at the chunk's end. Which
		// worker evaluates a sample changes nothing: a sample's evaluation
		// reads no earlier sample's state, and the counts add.
		first := (part - done%parts + parts) % parts // the chunk's first sample of this part
		mine := max(0, (size-first+parts-1)/parts)   // how many of the chunk's samples are this part's
		evaluated := make(chan struct{})
		go func() {
			claimEach(ctx, workers, mine, robustGrain, func(w, j int) {
				s := first + j*parts
				ws[w].sample(perts[s*n : (s+1)*n])
			})
			close(evaluated)
		}()
		if rest := total - done - size; rest > 0 {
			draw(next, min(chunk, rest))
		}
		<-evaluated
		perts, next = next, perts
		before := done
		done += size
		if progress != nil && (done/every != before/every || done == total) {
			progress(done, total)
		}
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	// The counts are integers, so their sum is the same whatever the
	// number of workers (or parts, in MergeRobustness).
	counts := make([]int, n*(n+1))
	for _, w := range ws {
		for i, c := range w.counts {
			counts[i] += c
		}
	}
	res.Samples = 0
	for _, c := range counts[:n+1] {
		res.Samples += c
	}
	for k := range res.Ranked {
		rb := RobustnessOf(counts[k*(n+1) : (k+1)*(n+1)])
		res.Ranked[k].Robustness = &rb
	}
	return nil
}

// claimEach calls do(w, i) for every i < count on min(workers, count)
// goroutines (w: the goroutine's index, which owns its own scratch),
// each claiming the next grain indices at a time, so a goroutine on a
// slowed core takes fewer. Each goroutine stops at its next claim once
// ctx is done.
func claimEach(ctx context.Context, workers, count, grain int, do func(w, i int)) {
	var claimed atomic.Int64
	var wg sync.WaitGroup
	for w := range min(workers, count) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for ctx.Err() == nil {
				i0 := int(claimed.Add(int64(grain))) - grain
				if i0 >= count {
					return
				}
				for i := i0; i < min(i0+grain, count); i++ {
					do(w, i)
				}
			}
		}()
	}
	wg.Wait()
}

// RobustnessOf turns one candidate's rank counts (counts[r-1]: samples
// in which it ranked r among the n = len(counts)−1 candidates; counts[n]:
// samples in which it failed a hard limit) into its figures.
func RobustnessOf(counts []int) Robustness {
	n, total := len(counts)-1, 0
	for _, c := range counts {
		total += c
	}
	rb := Robustness{RankCounts: slices.Clone(counts)}
	if total == 0 || n < 1 {
		return rb
	}
	top3 := 0
	for _, c := range counts[:min(3, n)] {
		top3 += c
	}
	t := float64(total)
	rb.PFirst, rb.PTop3, rb.FailedFraction = float64(counts[0])/t, float64(top3)/t, float64(counts[n])/t
	rb.RankP05 = rankQuantile(counts, total, 0.05)
	rb.RankMedian = rankQuantile(counts, total, 0.50)
	rb.RankP95 = rankQuantile(counts, total, 0.95)
	return rb
}

// MaxRobustWork bounds a robustness run: ranked candidates × samples
// (the whole library at 100,000 samples is about 3 million). It keeps the
// run's time bounded; the error says how many samples the scenario's
// candidates allow.
const MaxRobustWork = 4_000_000

// robustWorker evaluates samples on its own copy of what an evaluation
// writes (the candidates' π factors, the scaling buffers, the Sherwood
// notes) and counts each candidate's ranks.
type robustWorker struct {
	e       *env
	cands   []*candidate
	names   []string
	vals    [][NumObjectives]float64
	known   [][NumObjectives]bool
	norm    [][NumObjectives]float64
	ok      []bool
	scores  []float64
	idx     []int
	m       Metrics
	scratch transport.Result
	contrib [NumObjectives]float64
	ref     *Reference // the nominal reference draw (NormaliseReference)
	// counts[k*(n+1) + r-1]: the samples in which candidate k ranked r
	// (r = n+1: it failed a hard limit).
	counts []int
}

func newRobustWorker(e *env, ci []int) *robustWorker {
	n := len(ci)
	we := e.forWorker()
	we.quiet = true // its exclusions count, their texts are never shown
	w := &robustWorker{e: we, cands: make([]*candidate, n), names: make([]string, n),
		vals: make([][NumObjectives]float64, n), known: make([][NumObjectives]bool, n), norm: make([][NumObjectives]float64, n),
		ok: make([]bool, n), scores: make([]float64, n), idx: make([]int, n), counts: make([]int, n*(n+1))}
	for k, j := range ci {
		w.cands[k] = &we.cands[j]
		w.names[k] = we.cands[j].sol.ID
	}
	return w
}

// sample evaluates, scores and ranks one sample's perturbations (one per
// candidate, in rank order of the nominal run) and counts each
// candidate's rank (n+1 where it failed).
func (w *robustWorker) sample(perts []perturb) {
	e, n := w.e, len(w.cands)
	ori := e.sc.Orientations[0]
	for k, c := range w.cands {
		ex := e.evaluate(c, ori, &perts[k], &w.m, &w.scratch)
		w.ok[k] = ex == nil
		for o := Objective(0); o < NumObjectives; o++ {
			if w.ok[k] {
				w.vals[k][o], w.known[k][o] = w.m.Objective(o)
			} else {
				w.vals[k][o], w.known[k][o] = 0, false
			}
		}
	}
	normaliseRows(e.sc.Normalisation, w.ref, w.vals, w.known, w.norm)
	for k := range w.cands {
		w.idx[k] = k
		if w.ok[k] {
			w.scores[k] = Score(&w.norm[k], &e.sc.Weights, &w.contrib)
		} else {
			w.scores[k] = -1
		}
	}
	order(w.idx, w.scores, w.names)
	for r, k := range w.idx {
		rank := r + 1 // failed candidates sort last, so r counts ranked ones only
		if !w.ok[k] {
			rank = n + 1
		}
		w.counts[k*(n+1)+rank-1]++
	}
}

// forWorker returns a copy of e that shares everything an evaluation
// only reads (the scenario, the prepared solutions, the feed) and owns
// what it writes: each candidate's π factor (and the function bound to
// it), the scaling model's buffers and the last solve's Sherwood notes.
func (e *env) forWorker() *env {
	w := *e
	w.kWarn = [2][]warn.Warning{}
	w.cands = append([]candidate(nil), e.cands...)
	for i := range w.cands {
		c := &w.cands[i]
		c.pi.f = 1
		c.piFn = c.pi.fn
		if c.layout != nil {
			c.layout = c.layout.Clone()
			c.facePi = c.layout.Rule.Pi
		}
	}
	if e.scale != nil {
		sm := *e.scale
		sm.m = make([]float64, len(e.scale.m))
		sm.work = make([]float64, len(e.scale.work))
		sm.si = make([]float64, len(e.scale.si))
		sm.has = make([]bool, len(e.scale.has))
		w.scale = &sm
	}
	return &w
}

// rankQuantile returns the smallest rank whose cumulative count reaches
// ⌈p·total⌉ (at least one sample): the ⌈p·total⌉-th of the sorted ranks.
func rankQuantile(counts []int, total int, p float64) int {
	need := max(1, min(total, int(math.Ceil(p*float64(total)))))
	cum := 0
	for r, c := range counts {
		if cum += c; cum >= need {
			return r + 1
		}
	}
	return len(counts)
}
