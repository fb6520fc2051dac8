package fit

import (
	"testing"
)

// TestRecoversNoiseFree: fit(simulate(p)) returns p to 1e-6 on noise-free
// data, in both orientations (each alone and mixed) and under both
// osmotic models (issue 13's first check; the data are our own synthetic
// set, simulated by the flux operation's path).
func TestRecoversNoiseFree(t *testing.T) {
	want := [3]float64{2.2, 0.45, 480}
	sets := map[string][]cond{
		"AL-FS": {{"AL-FS", 0.5, 0}, {"AL-FS", 1, 0}, {"AL-FS", 1.5, 0}, {"AL-FS", 2, 0}},
		"AL-DS": {{"AL-DS", 0.5, 0.02}, {"AL-DS", 1, 0.02}, {"AL-DS", 1.5, 0.1}, {"AL-DS", 2, 0.1}},
		"both":  stepped,
	}
	for name, conds := range sets {
		for _, model := range []string{"real", "van-t-hoff"} {
			rows := simulate(t, conds, want[0], want[1], want[2], model)
			res := runFit(t, &Spec{Data: rows, OsmoticModel: model})
			t.Logf("%s %s: %v after %d iterations, %d evaluations, %d starts", name, model, res.Solver.Status, res.Solver.Iterations, res.Solver.Evaluations, res.Starts)
			for j := range nParams {
				if e := relErr(res.Params[j].Value, want[j]); e > 1e-6 {
					t.Errorf("%s %s: %s = %.9g, want %g (rel %.2g; %s after %d iterations)", name, model, ParamNames[j], res.Params[j].Value, want[j], e, res.Solver.Status, res.Solver.Iterations)
				}
			}
		}
	}
}
