package module

import (
	"errors"
	"math"
	"strconv"
	"testing"

	"drawsift/engine/errs"
	"drawsift/engine/internal/reftable"
	"drawsift/engine/transport"
)

var (
	flows        = []Flow{Co, Counter}
	orientations = []transport.Orientation{transport.ALFS, transport.ALDS}
)

// TestBalances: water and the solute are conserved over the module to
// 1e-8 relative (issue #12's check) in both flows, orientations and osmotic
// laws, from a small module to one near its cap.
func TestBalances(t *testing.T) {
	for _, fl := range flows {
		for _, ori := range orientations {
			for _, law := range []transport.OsmoticFunc{vantHoff(2), nonlinear(2)} {
				for _, a := range []float64{0.01, 1, 5, 20} {
					r := mustSolve(t, testProblem(fl, ori, law, 100), a)
					if r.WaterBalance > 1e-8 || r.SpeciesBalance > 1e-8 {
						t.Errorf("%s %s A=%g: water balance %.2g, species %.2g", fl, ori, a, r.WaterBalance, r.SpeciesBalance)
					}
					if !(r.PermeateM3PerS > 0) || r.Recovery > r.RecoveryCap {
						t.Errorf("%s %s A=%g: recovery %g, cap %g", fl, ori, a, r.Recovery, r.RecoveryCap)
					}
				}
			}
		}
	}
}

// TestSmallModuleIsLocalFlux: a module of 1e-6 m² draws area × the local
// flux at its inlets (the flux model's own answer), to 1e-5 relative.
func TestSmallModuleIsLocalFlux(t *testing.T) {
	for _, fl := range flows {
		for _, ori := range orientations {
			p := testProblem(fl, ori, nonlinear(2), 100)
			in := p.Input
			in.Species = append([]transport.Species(nil), p.Input.Species...)
			loc, err := transport.Solve(&in)
			if err != nil {
				t.Fatal(err)
			}
			const a = 1e-6
			r := mustSolve(t, p, a)
			if want := a * loc.JwMPerS; !closeTo(r.PermeateM3PerS, want, 1e-5, 0) {
				t.Errorf("%s %s: permeate %.10g m³/s, area × Jw %.10g", fl, ori, r.PermeateM3PerS, want)
			}
			if want := -a * loc.JsMolPerM2S; !closeTo(r.ToDrawMolPerS[0], want, 1e-5, 0) {
				t.Errorf("%s %s: solute to the draw %.10g mol/s, area × N %.10g", fl, ori, r.ToDrawMolPerS[0], want)
			}
		}
	}
}

// TestCounterBeatsCo: at equal area counter-current draws at least as
// much as co-current (the driving force is spread more evenly; common
// practice for any exchanger, and issue #12's check).
func TestCounterBeatsCo(t *testing.T) {
	for _, ori := range orientations {
		for _, a := range []float64{0.1, 1, 3, 10, 30} {
			co := mustSolve(t, testProblem(Co, ori, nonlinear(2), 100), a)
			ct := mustSolve(t, testProblem(Counter, ori, nonlinear(2), 100), a)
			if ct.PermeateM3PerS < co.PermeateM3PerS*(1-1e-9) {
				t.Errorf("%s A=%g: counter %.8g < co %.8g m³/s", ori, a, ct.PermeateM3PerS, co.PermeateM3PerS)
			}
		}
	}
}

// TestRecoveryCap: the osmotic-equilibrium cap of a van 't Hoff solute in
// both streams, in closed form from the water balance alone (no solute
// crossing): co-current, c_d·Q_d/(Q_d+P) = c_f·Q_f/(Q_f−P) gives
// P = Q_d·Q_f·(c_d−c_f)/(c_d·Q_d+c_f·Q_f); counter-current, the lesser of
// P₁ = Q_d·(c_d−c_f)/c_f (the leaving draw meets the fresh feed) and
// P₂ = Q_f·(1−c_f/c_d) (the fresh draw meets the leaving feed). With B = 0
// a large module approaches it from below.
func TestRecoveryCap(t *testing.T) {
	for _, fl := range flows {
		for _, qf := range []float64{20, 40, 120} {
			p := testProblem(fl, transport.ALFS, vantHoff(2), 100)
			p.FeedInM3PerS = qf * perLH
			p.Input.Species[0].BMPerS = 0
			qd, cd, cf := p.DrawInM3PerS, 1000.0, 100.0
			q := p.FeedInM3PerS
			want := qd * q * (cd - cf) / (cd*qd + cf*q)
			if fl == Counter {
				want = min(qd*(cd-cf)/cf, q*(1-cf/cd))
			}
			c, err := RecoveryCap(p)
			if err != nil {
				t.Fatal(err)
			}
			if !closeTo(c.PermeateM3PerS, want, 1e-9, 0) {
				t.Errorf("%s Qf=%g L/h: cap %.12g, closed form %.12g (%s)", fl, qf, c.PermeateM3PerS, want, c.Pinch)
			}
			r := mustSolve(t, p, 200)
			if r.PermeateM3PerS > c.PermeateM3PerS*(1+1e-9) || r.PermeateM3PerS < 0.9*c.PermeateM3PerS {
				t.Errorf("%s Qf=%g L/h: 200 m² permeate %.8g against the cap %.8g", fl, qf, r.PermeateM3PerS, c.PermeateM3PerS)
			}
		}
	}
}

// TestDesignInvertsRating: the area designed for a recovery, rated,
// gives that recovery; and a target past the cap is the contract's error
// naming the field.
func TestDesignInvertsRating(t *testing.T) {
	for _, fl := range flows {
		for _, rec := range []float64{0.05, 0.4, 0.75} {
			p := testProblem(fl, transport.ALFS, nonlinear(2), 100)
			d, err := Design(p, Target{Recovery: rec})
			if err != nil {
				t.Fatalf("%s %g: %v", fl, rec, err)
			}
			r := mustSolve(t, testProblem(fl, transport.ALFS, nonlinear(2), 100), d.AreaM2)
			if !closeTo(r.Recovery, rec, 1e-6, 0) || !closeTo(d.Recovery, rec, 1e-6, 0) {
				t.Errorf("%s: designed %.6g m² for %g; rated %.10g (design %.10g)", fl, d.AreaM2, rec, r.Recovery, d.Recovery)
			}
		}
		p := testProblem(fl, transport.ALFS, nonlinear(2), 100)
		_, err := Design(p, Target{Recovery: 0.95})
		var ie *errs.InputError
		if !errors.As(err, &ie) || ie.Field != "target.recovery" {
			t.Errorf("%s: a target past the cap gave %v", fl, err)
		}
	}
}

// TestBadProblem: non-positive flows and areas, and a draw no stronger
// than the feed, are input errors naming the field.
func TestBadProblem(t *testing.T) {
	for _, tc := range []struct {
		field string
		edit  func(*Problem) float64
	}{
		{"draw.flow_l_per_h", func(p *Problem) float64 { p.DrawInM3PerS = 0; return 1 }},
		{"feed.flow_l_per_h", func(p *Problem) float64 { p.FeedInM3PerS = -1; return 1 }},
		{"area_m2", func(p *Problem) float64 { return 0 }},
		{"area_m2", func(p *Problem) float64 { return math.NaN() }},
		{"draw.concentration", func(p *Problem) float64 { p.Input.Species[0].FeedBulkMolPerM3 = 1000; return 1 }},
	} {
		p := testProblem(Counter, transport.ALFS, vantHoff(2), 100)
		a := tc.edit(p)
		_, err := Solve(p, a)
		var ie *errs.InputError
		if !errors.As(err, &ie) || ie.Field != tc.field {
			t.Errorf("%s: got %v", tc.field, err)
		}
	}
}

// TestSciPyModule compares the module with an independent SciPy solution
// (testdata/module_scipy.py: solve_ivp DOP853 at rtol 1e-12, shooting by
// scipy.optimize.root; versions in the CSV header) for one solute in both
// streams, van 't Hoff and non-linear π, both orientations and flows, at
// 2 and 6 m²: outlet flows and molar flows to 1e-5 relative (issue #12's
// check; the agreement is far closer at the tolerance used here).
func TestSciPyModule(t *testing.T) {
	head, rows, err := reftable.Read("../../testdata/module_scipy.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) < 16 {
		t.Fatalf("only %d rows", len(rows))
	}
	worst := 0.0
	for n, row := range rows {
		num := func(col string) float64 {
			v, err := strconv.ParseFloat(row[head[col]], 64)
			if err != nil {
				t.Fatalf("row %d %s: %v", n, col, err)
			}
			return v
		}
		fl, err := ParseFlow("flow", row[head["flow"]])
		if err != nil {
			t.Fatal(err)
		}
		ori, err := transport.ParseOrientation(row[head["orientation"]])
		if err != nil {
			t.Fatal(err)
		}
		law := vantHoff(2)
		if row[head["model"]] == "nonlinear" {
			law = nonlinear(2)
		}
		k := num("k_m_per_s")
		p := &Problem{Input: transport.Input{AMPerSPa: num("a_m_per_s_pa"), SM: num("s_m"), Orientation: ori, KDrawMPerS: k, KFeedMPerS: k,
			Species: []transport.Species{{DrawBulkMolPerM3: num("draw_c_mol_m3"), FeedBulkMolPerM3: num("feed_c_mol_m3"),
				BMPerS: num("b_m_per_s"), DM2PerS: num("d_m2_per_s"), Pi: law}}},
			Flow: fl, DrawInM3PerS: num("draw_in_m3_per_s"), FeedInM3PerS: num("feed_in_m3_per_s"), Tol: 1e-11}
		r := mustSolve(t, p, num("area_m2"))
		for _, c := range []struct {
			name      string
			got, want float64
		}{
			{"draw out flow", r.DrawOut.M3PerS, num("draw_out_m3_per_s")},
			{"draw out solute", r.DrawOut.MolPerS[0], num("draw_out_mol_per_s")},
			{"feed out flow", r.FeedOut.M3PerS, num("feed_out_m3_per_s")},
			{"feed out solute", r.FeedOut.MolPerS[0], num("feed_out_mol_per_s")},
		} {
			if !closeTo(c.got, c.want, 1e-5, 0) {
				t.Errorf("row %d (%s %s %s %s m²): %s %.10g, SciPy %.10g", n, row[0], row[1], row[2], row[3], c.name, c.got, c.want)
			}
			worst = max(worst, math.Abs(c.got-c.want)/math.Abs(c.want))
		}
	}
	t.Logf("%d cases: worst relative difference %.2g", len(rows), worst)
}

// TestContinuationInArea: the fallback path of the counter-current
// shooting (continuation from a quarter of the area up) reaches the same
// module as the direct solve, to the boundary tolerance.
func TestContinuationInArea(t *testing.T) {
	for _, a := range []float64{1, 8} {
		p := testProblem(Counter, transport.ALFS, nonlinear(2), 100)
		direct := mustSolve(t, p, a)
		s, err := newSolver(testProblem(Counter, transport.ALFS, nonlinear(2), 100))
		if err != nil {
			t.Fatal(err)
		}
		s.area = a
		v := make([]float64, s.n+1)
		ok, err := s.continueInArea(v)
		if err != nil || !ok {
			t.Fatalf("A=%g: continuation %v %v", a, ok, err)
		}
		if got := v[0] * p.DrawInM3PerS; !closeTo(got, direct.PermeateM3PerS, 1e-6, 0) {
			t.Errorf("A=%g: continuation permeate %.10g, direct %.10g", a, got, direct.PermeateM3PerS)
		}
		if s.area != a {
			t.Errorf("area left at %g", s.area)
		}
	}
}
