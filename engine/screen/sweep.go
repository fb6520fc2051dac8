package screen

import (
	"context"
	"fmt"
	"math"
	"sync"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/thermo"
	"drawsift/engine/transport"
)

// SweepVariable is the quantity a sweep varies.
type SweepVariable int

// Sweep variables.
const (
	SweepConcentration SweepVariable = iota // draw concentration (in Unit); the basis is set aside
	SweepTemperature                        // K; the basis is re-applied at each point
	SweepS                                  // structural parameter S, m; basis re-applied
	SweepCrossflow                          // crossflow velocity on both sides, m/s; basis re-applied
)

// SweepSpec describes a sweep: Points values evenly spaced from From to
// To (inclusive), in SI except a concentration, which is in Unit.
type SweepSpec struct {
	Variable SweepVariable
	From, To float64
	Points   int
	Unit     thermo.Unit
}

// SweepPoint is one point of a series: the metrics, or why there are none.
type SweepPoint struct {
	X       float64
	Metrics *Metrics
	Reason  string
}

// SweepSeries is one candidate in one orientation across the sweep.
type SweepSeries struct {
	Solute      *library.Solute
	Orientation transport.Orientation
	Points      []SweepPoint
}

// MaxSweepWork bounds a sweep: candidates × orientations × points, each
// a solve and one point of the answer (about 350 bytes of JSON). The
// whole library in two orientations at 300 points fits; the error says
// how many points the scenario allows. It keeps a sweep's time and its
// answer (≈ 7 MB at the budget) bounded.
const MaxSweepWork = 20_000

// Sweep evaluates every candidate in every requested orientation across
// the values of one variable, for plots. A point that fails a hard limit
// carries its reason instead of metrics; the rest of the sweep goes on.
func Sweep(ctx context.Context, sc *Scenario, lib *library.Library, spec SweepSpec) ([]SweepSeries, error) {
	if err := CheckSweep(sc, spec); err != nil {
		return nil, err
	}
	local := *sc // the sweep varies its own copy
	xs := make([]float64, spec.Points)
	for i := range xs {
		xs[i] = spec.From + (spec.To-spec.From)*float64(i)/float64(spec.Points-1)
	}
	series := make([]SweepSeries, 0, len(sc.Candidates)*len(sc.Orientations))
	for _, s := range sc.Candidates {
		for _, o := range sc.Orientations {
			series = append(series, SweepSeries{Solute: s, Orientation: o, Points: make([]SweepPoint, spec.Points)})
		}
	}
	var e *env
	var err error
	if spec.Variable == SweepTemperature {
		// Every temperature prepares the scenario afresh: one point at a
		// time, every candidate.
		var scratch transport.Result
		for i, x := range xs {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
			local.TemperatureK = x
			if e, err = prepare(ctx, &local, lib); err != nil {
				return nil, err
			}
			sweepPoint(e, sc.Orientations, spec, series, 0, len(e.cands), i, x, &scratch)
		}
		return series, nil
	}
	if spec.Variable == SweepS {
		local.Membrane.SM = xs[0]
	}
	if spec.Variable == SweepCrossflow {
		local.Channel.VelocityMPerS, local.Channel.FeedVelocityMPerS = xs[0], 0
	}
	if e, err = prepare(ctx, &local, lib); err != nil {
		return nil, err
	}
	// The other variables keep the prepared candidates: they are shared out
	// among the cores (robustWorkers), each worker with its own copy of the
	// scenario and the env, so the series are the same whatever the count.
	n := len(e.cands)
	workers := min(robustWorkers(), n)
	var wg sync.WaitGroup
	failed := make([]error, workers)
	for wk := 0; wk < workers; wk++ {
		lo, hi := wk*n/workers, (wk+1)*n/workers
		w, ws := e, &local
		if workers > 1 {
			own := local
			ws = &own
			w = e.forWorker()
			w.sc = ws
		}
		wg.Add(1)
		go func(wk int) {
			defer wg.Done()
			var scratch transport.Result
			for i, x := range xs {
				if err := ctx.Err(); err != nil {
					failed[wk] = err
					return
				}
				switch spec.Variable {
				case SweepS:
					ws.Membrane.SM = x
				case SweepCrossflow:
					ws.Channel.VelocityMPerS = x
					if w.feedX != nil {
						mt, err := channelK(ws.Channel, true, w.feedX.DensityKgPerM3(w.feedM), w.feedX.ViscosityPaS(w.feedM), w.feedD)
						if err != nil {
							failed[wk] = err
							return
						}
						w.kFeed = mt.KMPerS
					}
				}
				sweepPoint(w, sc.Orientations, spec, series, lo, hi, i, x, &scratch)
			}
		}(wk)
	}
	wg.Wait()
	for _, err := range failed {
		if err != nil {
			return nil, err
		}
	}
	return series, nil
}

// CheckSweep is the sweep's own validation (points, range, work budget,
// the variable's conditions): what Sweep refuses before it computes, for
// a host that computes the sweep in parts (api.ScreenStream).
func CheckSweep(sc *Scenario, spec SweepSpec) error {
	if err := limits.SweepPoints.Check(float64(spec.Points)); err != nil {
		return err
	}
	if !(spec.From >= 0 && spec.To > spec.From) || math.IsInf(spec.To, 0) {
		return inputErr("sweep.to", "> from ≥ 0", "the sweep range must be finite and increasing")
	}
	if w := len(sc.Candidates) * len(sc.Orientations) * spec.Points; w > MaxSweepWork {
		per := len(sc.Candidates) * len(sc.Orientations)
		return &errs.InputError{Field: "sweep.points", Value: float64(spec.Points),
			Limit: fmt.Sprintf("≤ %d for %d candidates × %d orientations (candidates × orientations × points ≤ %d)", MaxSweepWork/per, len(sc.Candidates), len(sc.Orientations), MaxSweepWork),
			Msg:   "the sweep is past its work budget"}
	}
	switch spec.Variable {
	case SweepTemperature:
		lo, hi := thermo.ZeroCelsiusK+thermo.MinTemperatureC, thermo.ZeroCelsiusK+thermo.MaxTemperatureC
		if spec.From < lo || spec.To > hi {
			return inputErr("sweep.to", "0–100 °C", "the temperature sweep must stay within 0–100 °C")
		}
	case SweepS:
		if !(spec.From > 0) {
			return inputErr("sweep.from", "> 0 µm", "S must be positive")
		}
	case SweepCrossflow:
		if !(spec.From > 0) {
			return inputErr("sweep.from", "> 0 m/s", "the crossflow velocity must be positive")
		}
		if math.IsInf(sc.KDrawMPerS, 1) && math.IsInf(sc.KFeedMPerS, 1) {
			return inputErr("sweep.variable", nil, "a crossflow sweep needs external concentration polarization: external_cp is false, so crossflow has no effect")
		}
		if sc.KDrawMPerS != 0 || sc.KFeedMPerS != 0 {
			return inputErr("sweep.variable", nil, "a crossflow sweep needs k from the channel: omit k_draw_m_per_s and k_feed_m_per_s")
		}
	}
	return nil
}

// sweepPoint evaluates candidates lo..hi−1 of e in every orientation at
// point i (value x) into their series.
func sweepPoint(e *env, oris []transport.Orientation, spec SweepSpec, series []SweepSeries, lo, hi, i int, x float64, scratch *transport.Result) {
	for ci := lo; ci < hi; ci++ {
		c := &e.cands[ci]
		for oi, o := range oris {
			pt := &series[ci*len(oris)+oi].Points[i]
			pt.X = x
			var m Metrics
			var ex *exclusion
			switch {
			case c.excl != nil:
				ex = c.excl
			case spec.Variable == SweepConcentration:
				mm, err := c.x.ToMolality(x, spec.Unit)
				if err != nil {
					ex = &exclusion{ReasonInsoluble, err.Error()}
				} else {
					ex = e.metricsAt(c, o, mm, &nominal, &m, scratch)
				}
			default:
				ex = e.evaluate(c, o, &nominal, &m, scratch)
			}
			if ex != nil {
				pt.Reason = ex.Error()
				continue
			}
			mc := m
			pt.Metrics = &mc
		}
	}
}
