package transport

import (
	"math"
	"math/rand/v2"
	"testing"
)

// randomInput draws a valid input from the ranges of the screening use
// (published FO membrane ranges, e.g. Coday et al. 2013, widened): A 0.1–10 LMH/bar, B 0.01–5 LMH,
// S 50–3000 µm, draw 0.01–5 mol/L with a non-linear π, k 1e-6–1e-3 m/s or
// none, ΔP 0–50 bar, and a feed that is pure water, the draw solute, or a
// second solute, with π_F from 0 to 95 % of π_D.
func randomInput(rng *rand.Rand, in *Input, sp *[2]Species) {
	logU := func(lo, hi float64) float64 { return lo * math.Pow(hi/lo, rng.Float64()) }
	kOf := func() float64 {
		if rng.IntN(4) == 0 {
			return math.Inf(1)
		}
		return logU(1e-6, 1e-3)
	}
	in.AMPerSPa = logU(0.1, 10) * lmhb
	in.SM = logU(50, 3000) * um
	in.Orientation = Orientation(rng.IntN(2))
	in.DeltaPPa = 0
	if rng.IntN(3) != 0 {
		in.DeltaPPa = 50 * bar * rng.Float64()
	}
	in.KDrawMPerS, in.KFeedMPerS = kOf(), kOf()
	nuD := []float64{2, 3}[rng.IntN(2)]
	cD := logU(10, 5000)
	piDb, _ := nonlinear(nuD)(cD)
	sp[0] = Species{Name: "draw", DrawBulkMolPerM3: cD, BMPerS: logU(0.01, 5) * lmh,
		DM2PerS: logU(0.5e-9, 2e-9), Pi: nonlinear(nuD)}
	in.Species = sp[:1]
	frac := 0.95 * rng.Float64() // target π_F/π_D
	switch rng.IntN(3) {
	case 0: // pure water
	case 1: // draw solute in the feed: solve π(c) = frac·π_D by bisection
		sp[0].FeedBulkMolPerM3 = invertPi(nonlinear(nuD), frac*piDb, cD)
	case 2: // a second solute in the feed (sometimes also a little in the draw)
		nuF := []float64{2, 3}[rng.IntN(2)]
		piF := nonlinear(nuF)
		if rng.IntN(2) == 0 {
			piF = vantHoff(nuF)
		}
		cF := invertPi(piF, frac*piDb, 1e5)
		sp[1] = Species{Name: "feed", FeedBulkMolPerM3: cF, BMPerS: logU(0.01, 5) * lmh,
			DM2PerS: logU(0.5e-9, 2e-9), Pi: piF}
		if rng.IntN(4) == 0 {
			sp[1].DrawBulkMolPerM3 = 0.1 * cF * rng.Float64()
		}
		in.Species = sp[:2]
	}
}

// invertPi returns c in [0, hi] with pi(c) = target (bisection; pi monotone).
func invertPi(pi OsmoticFunc, target, hi float64) float64 {
	lo := 0.0
	for i := 0; i < 200 && hi-lo > 1e-12*hi; i++ {
		m := 0.5 * (lo + hi)
		if p, _ := pi(m); p < target {
			lo = m
		} else {
			hi = m
		}
	}
	return 0.5 * (lo + hi)
}

// Robustness property: every valid input converges to a relative residual
// below 1e-9, with finite results, and the reported state closes the water
// balance Jw = A·(π_d − π_f − ΔP) recomputed from the reported faces and the
// solute balance N = B·(c_f − c_d). 100 000 cases (10 000 with -short).
func TestRobustnessRandom(t *testing.T) {
	n := 100000
	if testing.Short() {
		n = 10000
	}
	rng := rand.New(rand.NewPCG(20240601, 7))
	var in Input
	var sp [2]Species
	var r Result
	maxIt, maxEval, sumEval, negative := 0, 0, 0, 0
	worst := 0.0
	for i := 0; i < n; i++ {
		randomInput(rng, &in, &sp)
		if err := SolveInto(&in, &r); err != nil {
			t.Fatalf("case %d: %v\ninput %+v %+v", i, err, in, in.Species)
		}
		vals := []float64{r.JwMPerS, r.JsMolPerM2S, r.PiFeedFacePa, r.PiDrawFacePa, r.PiFeedBulkPa, r.PiDrawBulkPa, r.Stats.Residual}
		for _, s := range r.Species {
			vals = append(vals, s.FluxMolPerM2S, s.FeedFaceMolPerM3, s.DrawFaceMolPerM3, s.SupportInterfaceMolPerM3)
		}
		for _, v := range vals {
			if !finite(v) {
				t.Fatalf("case %d: non-finite value in %+v", i, r)
			}
		}
		if r.Stats.Residual > 1e-9 {
			t.Fatalf("case %d: residual %g\ninput %+v %+v", i, r.Stats.Residual, in, in.Species)
		}
		// Independent closure check from the reported faces.
		var piD, piF float64
		for j, s := range r.Species {
			pd, _ := in.Species[j].Pi(s.DrawFaceMolPerM3)
			pf, _ := in.Species[j].Pi(s.FeedFaceMolPerM3)
			piD += pd
			piF += pf
			want := in.Species[j].BMPerS * (s.FeedFaceMolPerM3 - s.DrawFaceMolPerM3)
			cmax := math.Max(math.Max(s.FeedFaceMolPerM3, s.DrawFaceMolPerM3), math.Max(in.Species[j].DrawBulkMolPerM3, in.Species[j].FeedBulkMolPerM3))
			if math.Abs(s.FluxMolPerM2S-want) > 1e-12*in.Species[j].BMPerS*cmax {
				t.Fatalf("case %d species %d: N = %g, B·Δc = %g", i, j, s.FluxMolPerM2S, want)
			}
		}
		scale := in.AMPerSPa * (r.PiDrawBulkPa + r.PiFeedBulkPa + math.Abs(in.DeltaPPa))
		res := math.Abs(in.AMPerSPa*(piD-piF-in.DeltaPPa)-r.JwMPerS) / scale
		if res > 1e-9 {
			t.Fatalf("case %d: closure residual %g", i, res)
		}
		worst = math.Max(worst, r.Stats.Residual)
		maxIt = max(maxIt, r.Stats.Iterations)
		maxEval = max(maxEval, r.Stats.Evaluations)
		sumEval += r.Stats.Evaluations
		if r.JwMPerS < 0 {
			negative++
		}
	}
	t.Logf("%d cases (%d with Jw < 0): max iterations %d, max evaluations %d, mean evaluations %.2f, worst residual %.3g",
		n, negative, maxIt, maxEval, float64(sumEval)/float64(n), worst)
}

// The residual is strictly decreasing in Jw (the uniqueness argument in
// solver.go), sampled on a wide grid for random inputs.
func TestResidualMonotone(t *testing.T) {
	n := 2000
	if testing.Short() {
		n = 300
	}
	rng := rand.New(rand.NewPCG(99, 1))
	var in Input
	var sp [2]Species
	for i := 0; i < n; i++ {
		randomInput(rng, &in, &sp)
		var s solver
		s.setup(&in)
		scale := in.AMPerSPa * 600 * bar
		prev := math.Inf(1)
		for k := -200; k <= 200; k++ {
			j := scale * float64(k) / 100 // ±2 × a generous flux scale
			f, df := s.eval(j)
			if !finite(f) || !finite(df) {
				t.Fatalf("case %d: f(%g) = %g, f′ = %g", i, j, f, df)
			}
			if !(f < prev) {
				t.Fatalf("case %d: f not decreasing at J = %g: %g after %g\n%+v %+v", i, j, f, prev, in, in.Species)
			}
			prev = f
		}
	}
}
