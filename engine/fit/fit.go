package fit

import (
	"context"
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"drawsift/engine/thermo"
	"drawsift/engine/transport"
	"drawsift/engine/warn"

	"gonum.org/v1/gonum/stat/distuv"
)

// Estimate is one parameter's result.
type Estimate struct {
	Value  float64
	Fitted bool
	// HasInterval: SE, Low and High are set (a fitted parameter with
	// degrees of freedom left and a non-singular covariance).
	HasInterval     bool
	SE, Low, High   float64
	AtBound         bool
	Bootstrap       *Interval
	LowerBound      float64
	UpperBound      float64
	RelativeSEInLog float64
}

// Interval is a bootstrap's percentile interval and standard deviation.
type Interval struct {
	Low, High, SE float64
}

// PointResult is one row's measured and fitted fluxes.
type PointResult struct {
	Row             int
	Orientation     string
	Jw, JwFit, SdJw float64
	Js, JsFit, SdJs float64
	HasJs           bool
}

// BootstrapStats describe a bootstrap run.
type BootstrapStats struct {
	Samples, Failed int
	Seed            uint64
}

// Result is a finished fit.
type Result struct {
	Params [nParams]Estimate
	// Free names the fitted parameters, the order of Correlation.
	Free        []string
	Correlation [][]float64
	Points      []PointResult
	// Goodness of fit.
	Observations, DOF          int
	ChiSquare, ReducedChiSq    float64
	RMSEJwLMH, RMSEJsGMH       float64
	HasJs                      bool
	TQuantile                  float64
	Solver                     SolverStats
	Starts                     int
	Bootstrap                  *BootstrapStats
	Warnings                   []warn.Warning
	Confidence                 float64
	OsmoticModel, IntervalKind string
}

// Run fits the problem. progress (may be nil) hears the bootstrap's
// progress; cancelling ctx stops it.
func Run(ctx context.Context, p *Problem, progress func(done, total int)) (*Result, error) {
	theta, st, starts, err := p.solve()
	if err != nil {
		return nil, err
	}
	res := &Result{Solver: st, Starts: starts, Confidence: p.Confidence, OsmoticModel: p.Model.String(),
		Observations: p.observations, DOF: p.observations - len(p.free), Free: p.Free(),
		IntervalKind: "Wald interval in ln p: exp(ln p ± t·SE(ln p)), Student's t at n − p degrees of freedom"}
	if p.AbsoluteSD {
		res.IntervalKind = "Wald interval in ln p: exp(ln p ± z·SE(ln p)), normal quantile (stated uncertainties taken as absolute)"
	}
	res.Warnings = append(res.Warnings, p.Warnings...)
	v := p.full(theta)
	if err := p.describe(&v, res); err != nil {
		return nil, err
	}
	w := p.newWork()
	// The Jacobian at the solution for the covariance.
	var jst SolverStats
	if err := p.jacobian(theta, nil, w, &jst); err != nil {
		return nil, err
	}
	p.uncertainty(theta, w, res)
	p.identifiability(res)
	if st.Status == "max-iterations" {
		res.Warnings = append(res.Warnings, warn.New(Identifiability, "solver", "the fit stopped after %d iterations without converging: treat the values as approximate", st.Iterations))
	}
	if p.Bootstrap > 0 {
		if err := p.bootstrap(ctx, theta, res, progress); err != nil {
			return nil, err
		}
	}
	return res, nil
}

// solve finds the minimum from the best starting points.
func (p *Problem) solve() ([]float64, SolverStats, int, error) {
	starts, err := p.startingPoints()
	if err != nil {
		return nil, SolverStats{}, 0, err
	}
	w := p.newWork()
	var best []float64
	var bestSt SolverStats
	total := SolverStats{}
	for _, th := range starts {
		st, err := p.minimise(th, nil, w)
		if err != nil {
			return nil, st, 0, err
		}
		total.Iterations += st.Iterations
		total.Evaluations += st.Evaluations
		if best == nil || st.Cost < bestSt.Cost {
			best, bestSt = th, st
		}
	}
	bestSt.Iterations, bestSt.Evaluations = total.Iterations, total.Evaluations
	return best, bestSt, len(starts), nil
}

// startingPoints returns the best few points of a grid over ln A and
// ln S (a given starting value stands alone), with B from the median
// specific reverse solute flux (Js/Jw = B/(A·ν·R·T), Phillip et al. 2010)
// or a short grid without solute-flux data.
func (p *Problem) startingPoints() ([][]float64, error) {
	grid := func(j int, lo, hi float64, n int) []float64 {
		if !slices.Contains(p.free, j) {
			return []float64{p.fixed[j]}
		}
		if p.start[j] > 0 {
			return []float64{p.start[j]}
		}
		out := make([]float64, n)
		for i := range n {
			out[i] = lo * math.Pow(hi/lo, float64(i)/float64(n-1))
		}
		return out
	}
	as := grid(PA, 0.1, 20, 10)
	ss := grid(PS, 20, 10000, 12)
	// Median Js/Jw (mol/m³) over rows with solute-flux data, and ν·R·T.
	var ratio []float64
	nuRT := 0.0
	for i := range p.points {
		pt := &p.points[i]
		if pt.hasJs {
			ratio = append(ratio, pt.js/pt.gPerMol/(pt.jw*thermo.MPerSPerLMH))
			nuRT = pt.nu * thermo.GasConstant * pt.tK
		}
	}
	bFree := slices.Contains(p.free, PB)
	var bs []float64
	switch {
	case !bFree:
		bs = []float64{p.fixed[PB]}
	case p.start[PB] > 0:
		bs = []float64{p.start[PB]}
	case len(ratio) > 0:
		sort.Float64s(ratio)
		bs = []float64{0} // set from A below
	default:
		bs = []float64{0.03, 0.3, 3}
	}
	type cand struct {
		theta []float64
		cost  float64
	}
	var cands []cand
	w := p.newWork()
	for _, a := range as {
		for _, s := range ss {
			for _, b := range bs {
				if b == 0 {
					med := ratio[len(ratio)/2]
					b = med * a * thermo.MPerSPaPerLMHPerBar * nuRT / thermo.MPerSPerLMH
					b = min(max(b, lowerBound[PB]), upperBound[PB])
				}
				v := [nParams]float64{a, b, s}
				th := make([]float64, len(p.free))
				for i, j := range p.free {
					th[i] = math.Log(v[j])
				}
				c, err := p.cost(th, nil, w.r)
				if err != nil {
					return nil, err
				}
				if !math.IsNaN(c) && !math.IsInf(c, 0) {
					cands = append(cands, cand{th, c})
				}
			}
		}
	}
	if len(cands) == 0 {
		return nil, fmt.Errorf("fit: no finite starting point")
	}
	sort.SliceStable(cands, func(i, j int) bool { return cands[i].cost < cands[j].cost })
	out := [][]float64{}
	for _, c := range cands[:min(3, len(cands))] {
		out = append(out, c.theta)
	}
	return out, nil
}

// describe fills the per-point results and the goodness of fit at v.
func (p *Problem) describe(v *[nParams]float64, res *Result) error {
	if err := p.eval(v); err != nil {
		return err
	}
	chi, sw, sj, nj := 0.0, 0.0, 0.0, 0
	for i := range p.points {
		pt := &p.points[i]
		jw, js := pt.fluxes()
		pr := PointResult{Row: i, Orientation: pt.orient.String(), Jw: pt.jw, JwFit: jw, SdJw: pt.sdJw, JsFit: js, HasJs: pt.hasJs}
		chi += sq((jw - pt.jw) / pt.sdJw)
		sw += sq(jw - pt.jw)
		if pt.hasJs {
			pr.Js, pr.SdJs = pt.js, pt.sdJs
			chi += sq((js - pt.js) / pt.sdJs)
			sj += sq(js - pt.js)
			nj++
		}
		res.Points = append(res.Points, pr)
	}
	res.ChiSquare = chi
	if res.DOF > 0 {
		res.ReducedChiSq = chi / float64(res.DOF)
	}
	res.RMSEJwLMH = math.Sqrt(sw / float64(len(p.points)))
	if nj > 0 {
		res.HasJs = true
		res.RMSEJsGMH = math.Sqrt(sj / float64(nj))
	}
	for j := range nParams {
		res.Params[j] = Estimate{Value: v[j], Fitted: slices.Contains(p.free, j), LowerBound: lowerBound[j], UpperBound: upperBound[j]}
	}
	return nil
}

func sq(x float64) float64 { return x * x }

// quantile is the two-sided quantile of the intervals.
func (p *Problem) quantile(dof int) float64 {
	q := 0.5 + p.Confidence/2
	if p.AbsoluteSD {
		return distuv.UnitNormal.Quantile(q)
	}
	return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(dof)}.Quantile(q)
}

// uncertainty sets standard errors, intervals and correlations from the
// Jacobian in w.
func (p *Problem) uncertainty(theta []float64, w *lmWork, res *Result) {
	k := len(p.free)
	h := make([]float64, k*k)
	g := make([]float64, k)
	normal(w.jac, make([]float64, p.observations), k, h, g)
	for i, j := range p.free {
		e := &res.Params[j]
		e.AtBound = math.Abs(theta[i]-math.Log(lowerBound[j])) < 1e-6 || math.Abs(theta[i]-math.Log(upperBound[j])) < 1e-6
		if e.AtBound {
			res.Warnings = append(res.Warnings, warn.New(Identifiability, ParamNames[j],
				"%s reached its bound (%g–%g): the data do not hold it inside the physical range; its interval is not reported", paramLabel(j), lowerBound[j], upperBound[j]))
		}
	}
	if res.DOF < 1 && !p.AbsoluteSD {
		res.Warnings = append(res.Warnings, warn.New(Identifiability, "data",
			"as many measured fluxes (%d) as parameters: the fit passes through the data and no interval can be given; add measurements", p.observations))
		return
	}
	inv, rcond, ok := symInverse(h, k)
	if !ok {
		res.Warnings = append(res.Warnings, warn.New(Identifiability, "parameters",
			"the data cannot separate the parameters %s (singular information matrix, reciprocal condition %.2g): fix one of them or add measurements that move them differently", strings.Join(p.Free(), ", "), rcond))
		return
	}
	s2 := 1.0
	if !p.AbsoluteSD {
		s2 = res.ChiSquare / float64(res.DOF)
	}
	res.TQuantile = p.quantile(res.DOF)
	res.Correlation = make([][]float64, k)
	for i := range k {
		res.Correlation[i] = make([]float64, k)
		for c := range k {
			res.Correlation[i][c] = inv[i*k+c] / math.Sqrt(inv[i*k+i]*inv[c*k+c])
		}
	}
	for i, j := range p.free {
		e := &res.Params[j]
		seLog := math.Sqrt(s2 * inv[i*k+i])
		e.RelativeSEInLog = seLog
		if e.AtBound || !(seLog < 50) {
			continue
		}
		e.HasInterval = true
		e.SE = e.Value * seLog
		e.Low = e.Value * math.Exp(-res.TQuantile*seLog)
		e.High = e.Value * math.Exp(res.TQuantile*seLog)
	}
}

func paramLabel(j int) string {
	return [nParams]string{"A", "B", "S"}[j]
}

// identifiability warns where the design of the data leaves a parameter
// poorly determined.
func (p *Problem) identifiability(res *Result) {
	free := func(j int) bool { return slices.Contains(p.free, j) }
	allDS, anyJs := true, false
	conds := map[string]bool{}
	for i := range p.points {
		pt := &p.points[i]
		if pt.orient != transport.ALDS {
			allDS = false
		}
		anyJs = anyJs || pt.hasJs
		conds[fmt.Sprintf("%d|%.6g|%.6g|%.6g", pt.orient, pt.drawC, pt.feedC, pt.tK)] = true
	}
	add := func(subject, format string, a ...any) {
		res.Warnings = append(res.Warnings, warn.New(Identifiability, subject, format, a...))
	}
	if free(PS) && allDS {
		add("s", "S from AL-DS data only is poorly identified: with the support facing a dilute feed, ICP barely changes the flux; add AL-FS measurements")
	}
	if free(PB) && !anyJs {
		add("b", "B is fitted without reverse solute flux data: only its small effect on the water flux determines it; add reverse_solute_flux_gmh")
	}
	if len(p.free) > 1 && len(conds) < len(p.free)+1 {
		add("data", "%d distinct test conditions for %d parameters: too few concentration steps to separate them (Tiraferri et al. 2013 use four draw concentrations)", len(conds), len(p.free))
	}
	for i := range res.Correlation {
		for c := i + 1; c < len(res.Correlation); c++ {
			if r := res.Correlation[i][c]; math.Abs(r) > 0.99 {
				add("correlation", "%s and %s are strongly correlated (r = %.3f): the data determine a combination of them better than either", paramLabel(p.free[i]), paramLabel(p.free[c]), r)
			}
		}
	}
	for _, j := range p.free {
		e := &res.Params[j]
		if e.HasInterval && e.RelativeSEInLog > 0.5 {
			add(ParamNames[j], "%s is poorly identified: its relative standard error is %.0f %%", paramLabel(j), 100*e.SE/e.Value)
		}
	}
}
