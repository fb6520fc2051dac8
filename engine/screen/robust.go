package screen

import (
	"context"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/stat/distuv"

	"drawsift/engine/transport"
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
// Sampling is sequential from one PCG stream seeded by the scenario, so a
// run is reproducible bit for bit on one platform.
func (e *env) robustness(ctx context.Context, res *Result, progress func(done, total int)) error {
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
	cands := make([]*candidate, n)
	names := make([]string, n)
	for k := range res.Ranked {
		c := &e.cands[res.Ranked[k].ci]
		cands[k] = c
		names[k] = c.sol.ID
		rsd := u.OsmoticRelSD
		if u.DefaultOsmotic {
			rsd = c.osmRelSD
		}
		dPi[k] = logNormalFactor(rsd, src)
	}
	vals := make([][NumObjectives]float64, n)
	known := make([][NumObjectives]bool, n)
	norm := make([][NumObjectives]float64, n)
	ok := make([]bool, n)
	scores := make([]float64, n)
	idx := make([]int, n)
	// hist[k*(n+1) + rank-1] counts candidate k's ranks; the last bin of
	// each row counts the samples in which it failed.
	hist := make([]int, n*(n+1))
	fails := make([]int, n)
	perts := make([]perturb, n)
	var m Metrics
	var scratch transport.Result
	var contrib [NumObjectives]float64
	ori := e.sc.Orientations[0]
	every := total / 100
	if every < 1 {
		every = 1
	}
	defer func() {
		for k := range cands {
			cands[k].pi.f = 1
		}
	}()
	for s := 0; s < total; s++ {
		if s%8 == 0 {
			if err := ctx.Err(); err != nil {
				return err
			}
		}
		fA, fB, fS := dA.Rand(), dB.Rand(), dS.Rand()
		for k, c := range cands {
			p := &perts[k]
			fBk := fB
			if c.bEstimated && u.EstimatedBRelSD > 0 {
				fBk *= dBest.Rand()
			}
			*p = perturb{fA: fA, fB: fBk, fS: fS, fPi: dPi[k].Rand(), fD: dD.Rand(), price: -1}
			if c.hasPrice {
				if u.Prices {
					p.price = c.priceMin + (c.priceMax-c.priceMin)*unif.Rand()
				} else {
					p.price = 0.5 * (c.priceMin + c.priceMax)
				}
			}
		}
		for k, c := range cands {
			ex := e.evaluate(c, ori, &perts[k], &m, &scratch)
			ok[k] = ex == nil
			for o := Objective(0); o < NumObjectives; o++ {
				if ok[k] {
					vals[k][o], known[k][o] = m.Objective(o)
				} else {
					vals[k][o], known[k][o] = 0, false
				}
			}
		}
		Normalise(vals, known, norm)
		for k := range cands {
			idx[k] = k
			if ok[k] {
				scores[k] = Score(&norm[k], &e.sc.Weights, &contrib)
			} else {
				scores[k] = -1
				fails[k]++
			}
		}
		order(idx, scores, names)
		for r, k := range idx {
			if ok[k] {
				hist[k*(n+1)+r]++ // failed candidates sort last, so r counts ranked ones only
			} else {
				hist[k*(n+1)+n]++
			}
		}
		if progress != nil && ((s+1)%every == 0 || s+1 == total) {
			progress(s+1, total)
		}
	}
	res.Samples = total
	for k := range res.Ranked {
		h := hist[k*(n+1) : (k+1)*(n+1)]
		rb := &Robustness{FailedFraction: float64(fails[k]) / float64(total)}
		rb.PFirst = float64(h[0]) / float64(total)
		top3 := 0
		for r := 0; r < 3 && r < n; r++ { // h[n] (failures) never counts
			top3 += h[r]
		}
		rb.PTop3 = float64(top3) / float64(total)
		rb.RankP05 = rankQuantile(h, total, 0.05)
		rb.RankMedian = rankQuantile(h, total, 0.50)
		rb.RankP95 = rankQuantile(h, total, 0.95)
		res.Ranked[k].Robustness = rb
	}
	return nil
}

// rankQuantile returns the smallest rank (1-based) whose cumulative count
// reaches p·total.
func rankQuantile(h []int, total int, p float64) int {
	need := p * float64(total)
	cum := 0
	for r, c := range h {
		cum += c
		if float64(cum) >= need && cum > 0 {
			return r + 1
		}
	}
	return len(h)
}
