package transport

import (
	"math"
	"math/rand/v2"
	"testing"
)

// pitzerForm is a benchmark workload with the cost and shape of a real
// non-ideal π (a square root, an exponential and a few divisions per call):
// the Pitzer (1973) single-salt osmotic coefficient for a 1-1 salt,
//
//	φ = 1 − A_φ·√m/(1 + b√m) + m·(β⁰ + β¹·e^{−α√m}) + m²·C^φ,
//
// with NaCl's 25 °C parameters β⁰ = 0.0765, β¹ = 0.2664, C^φ = 0.00127
// (Pitzer & Mayorga 1973, Table I), A_φ = 0.3915 (Pitzer 1991, Table 1),
// b = 1.2, α = 2, and π = ν·R·T·c·φ with m ≈ c/ρ_w. It is a timing workload
// only (molality and molarity are not distinguished); the thermodynamics
// lives in engine/thermo.
func pitzerForm(c float64) (float64, float64) {
	const (
		aPhi, b, alpha   = 0.3915, 1.2, 2.0
		beta0, beta1, cp = 0.0765, 0.2664, 0.00127
		rhoW             = 997.047 // kg/m³ at 25 °C, from memory
		k                = 2 * rt
	)
	m := c / rhoW
	s := math.Sqrt(m)
	den := 1 + b*s
	ex := math.Exp(-alpha * s)
	phi := 1 - aPhi*s/den + m*(beta0+beta1*ex) + m*m*cp
	// m·dφ/dm, written so that it is finite at m = 0.
	mdphi := -aPhi*s/(2*den*den) + m*(beta0+beta1*ex) - m*beta1*alpha*s*ex/2 + 2*m*m*cp
	return k * c * phi, k * (phi + mdphi)
}

var (
	sinkResult Result
	sinkF      float64
)

func benchInput(pi OsmoticFunc, ori Orientation) *Input {
	// A seawater-strength feed of the draw salt against a 2 mol/L draw, a
	// typical TFC membrane (within the published ranges, e.g. Coday et al. 2013,
	// Environ. Sci. Technol., SI Table S1) and ECP on both sides.
	return &Input{AMPerSPa: 2 * lmhb, SM: 500 * um, Orientation: ori,
		KDrawMPerS: 5e-5, KFeedMPerS: 5e-5,
		Species: []Species{{Name: "draw", DrawBulkMolPerM3: 2000, FeedBulkMolPerM3: 500,
			BMPerS: 0.4 * lmh, DM2PerS: dNaCl, Pi: pi}}}
}

// BenchmarkSolve times one flux solve per op. "nonlinear" uses pitzerForm
// (about the cost of a real π); "random" cycles through 1024 inputs drawn
// like the robustness test (reverse flow, two species, ΔP included).
func BenchmarkSolve(b *testing.B) {
	for _, tc := range []struct {
		name string
		pi   OsmoticFunc
		ori  Orientation
	}{
		{"vanthoff-ALFS", vantHoff(2), ALFS},
		{"vanthoff-ALDS", vantHoff(2), ALDS},
		{"nonlinear-ALFS", pitzerForm, ALFS},
		{"nonlinear-ALDS", pitzerForm, ALDS},
	} {
		b.Run(tc.name, func(b *testing.B) {
			in := benchInput(tc.pi, tc.ori)
			r := Result{Species: make([]SpeciesResult, 0, 2)}
			b.ReportAllocs()
			for b.Loop() {
				if err := SolveInto(in, &r); err != nil {
					b.Fatal(err)
				}
			}
			sinkResult = r
			b.ReportMetric(float64(r.Stats.Evaluations), "evals/solve")
		})
	}
	b.Run("random", func(b *testing.B) {
		rng := rand.New(rand.NewPCG(1, 2))
		ins := make([]Input, 1024)
		sps := make([][2]Species, len(ins))
		for i := range ins {
			randomInput(rng, &ins[i], &sps[i])
		}
		r := Result{Species: make([]SpeciesResult, 0, 2)}
		b.ReportAllocs()
		i := 0
		for b.Loop() {
			if err := SolveInto(&ins[i&1023], &r); err != nil {
				b.Fatal(err)
			}
			i++
		}
		sinkResult = r
	})
	b.Run("nonlinear-ALFS-Solve", func(b *testing.B) {
		in := benchInput(pitzerForm, ALFS)
		b.ReportAllocs()
		for b.Loop() {
			r, err := Solve(in)
			if err != nil {
				b.Fatal(err)
			}
			sinkResult = r
		}
	})
}

// BenchmarkOsmoticWorkload times one call of the benchmark π alone.
func BenchmarkOsmoticWorkload(b *testing.B) {
	c := 1000.0
	for b.Loop() {
		p, d := pitzerForm(c)
		sinkF += p + d
		c += 1e-9
	}
}
