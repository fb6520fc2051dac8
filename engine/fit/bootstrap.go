package fit

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"

	"drawsift/engine/errs"
	"drawsift/engine/limits"
	"drawsift/engine/warn"
)

// BootstrapWork caps samples × measured fluxes: the work budget of one
// bootstrap (each resample is a fit from the estimate).
const BootstrapWork = 100000

func (p *Problem) bootstrapSpec(b *BootstrapSpec) error {
	n, err := limits.FitBootstrapSample.Or(b.Samples)
	if err != nil {
		return err
	}
	if w := n * float64(p.observations); w > BootstrapWork {
		return errs.Invalid("bootstrap.samples", n, fmt.Sprintf("≤ %d for %d measured fluxes", BootstrapWork/p.observations, p.observations),
			"%g resamples of %d measured fluxes exceed the work budget of %d", n, p.observations, BootstrapWork)
	}
	seed := limits.Seed.Default
	if b.Seed != nil {
		seed = *b.Seed
		if err := limits.Seed.CheckAt("bootstrap.seed", seed); err != nil {
			return err
		}
	}
	p.Bootstrap, p.Seed = int(n), uint64(seed)
	return nil
}

// bootstrap refits resampled data: the fitted fluxes plus the weighted
// residuals drawn with replacement (inflated by √(n/(n − p)) for the
// degrees of freedom the fit used; Efron & Tibshirani 1993 §9.5), each
// times its point's σ. Percentile intervals at the confidence level.
func (p *Problem) bootstrap(ctx context.Context, theta []float64, res *Result, progress func(done, total int)) error {
	m, k := p.observations, len(p.free)
	w := p.newWork()
	if _, err := p.cost(theta, nil, w.r); err != nil {
		return err
	}
	infl := 1.0
	if m > k {
		infl = math.Sqrt(float64(m) / float64(m-k))
	}
	resid := make([]float64, m)
	for i, r := range w.r {
		resid[i] = r * infl
	}
	// Fitted values and σ in observation order.
	fitted, sd := make([]float64, m), make([]float64, m)
	v := p.full(theta)
	if err := p.eval(&v); err != nil {
		return err
	}
	o := 0
	for i := range p.points {
		pt := &p.points[i]
		jw, js := pt.fluxes()
		fitted[o], sd[o] = jw, pt.sdJw
		o++
		if pt.hasJs {
			fitted[o], sd[o] = js, pt.sdJs
			o++
		}
	}
	rng := rand.New(rand.NewPCG(p.Seed, 0x6669742d626f6f74)) // "fit-boot"
	y := make([]float64, m)
	th := make([]float64, k)
	samples := make([][]float64, k)
	failed := 0
	for s := range p.Bootstrap {
		if s%16 == 0 {
			if err := ctx.Err(); err != nil {
				return err
			}
			if progress != nil {
				progress(s, p.Bootstrap)
			}
		}
		for i := range m {
			y[i] = fitted[i] + sd[i]*resid[rng.IntN(m)]
		}
		copy(th, theta)
		st, err := p.minimise(th, y, w)
		if err != nil || st.Status == "max-iterations" {
			failed++
			continue
		}
		for i := range k {
			samples[i] = append(samples[i], math.Exp(th[i]))
		}
	}
	if progress != nil {
		progress(p.Bootstrap, p.Bootstrap)
	}
	res.Bootstrap = &BootstrapStats{Samples: p.Bootstrap, Failed: failed, Seed: p.Seed}
	if len(samples[0]) < 10 {
		return nil
	}
	alpha := (1 - p.Confidence) / 2
	for i, j := range p.free {
		xs := samples[i]
		sort.Float64s(xs)
		mean, ss := 0.0, 0.0
		for _, x := range xs {
			mean += x
		}
		mean /= float64(len(xs))
		for _, x := range xs {
			ss += (x - mean) * (x - mean)
		}
		res.Params[j].Bootstrap = &Interval{Low: percentile(xs, alpha), High: percentile(xs, 1-alpha), SE: math.Sqrt(ss / float64(len(xs)-1))}
	}
	if failed > 0 {
		res.Warnings = append(res.Warnings, warn.New(warn.ModelNote, "bootstrap", "%d of %d resamples did not converge and were left out", failed, p.Bootstrap))
	}
	return nil
}

// percentile interpolates sorted xs at quantile q.
func percentile(xs []float64, q float64) float64 {
	pos := q * float64(len(xs)-1)
	i := int(math.Floor(pos))
	if i >= len(xs)-1 {
		return xs[len(xs)-1]
	}
	f := pos - float64(i)
	return xs[i]*(1-f) + xs[i+1]*f
}
