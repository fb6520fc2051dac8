package thermo

import (
	"errors"
	"math"
	"strings"
	"testing"

	"drawsift/engine/errs"
)

// wantConvergenceError checks that err is an *errs.ConvergenceError whose
// solver name contains solver and whose residual is finite.
func wantConvergenceError(t *testing.T, err error, solver string) {
	t.Helper()
	var ce *errs.ConvergenceError
	if !errors.As(err, &ce) {
		t.Fatalf("got %v, want an *errs.ConvergenceError", err)
	}
	if !strings.Contains(ce.Solver, solver) || ce.Reason == "" {
		t.Errorf("error %+v: want solver %q and a reason", ce, solver)
	}
	if math.IsNaN(ce.Residual) || math.IsInf(ce.Residual, 0) {
		t.Errorf("residual %g is not finite", ce.Residual)
	}
}

// The inverse π search that runs out of iterations reports it. Before the
// search used engine/internal/roots, its loop ended with `return m, nil`:
// the last iterate, reported as success. Two iterations cannot meet the
// 1e-13 tolerance from the van 't Hoff guess for NaCl at 1 mol/kg (φ ≈
// 0.94 puts the guess 6 % off); the default limit does.
func TestMolalityForPiReportsNonConvergence(t *testing.T) {
	x := mustSolution(t, naclPM73, referenceK)
	target := x.OsmoticPressurePa(1)
	_, err := x.molalityForPi(target, 2)
	wantConvergenceError(t, err, "osmotic-pressure inverse for NaCl")
	var ce *errs.ConvergenceError
	if errors.As(err, &ce) && !(ce.Residual > 1e-13 && ce.Iterations == 2) {
		t.Errorf("residual %g after %d iterations: want above the tolerance, after 2", ce.Residual, ce.Iterations)
	}
	m, err := x.MolalityForPi(target)
	if err != nil || !within(m, 1, 1e-12) {
		t.Errorf("default limit: m = %.15g, %v", m, err)
	}
}

// The density inverse (apparent-molar-volume model: Newton on K(w)) with a
// model that returns NaN reports it everywhere the inversion is used,
// instead of returning a mass fraction from a search that never met its
// tolerance (before: `return w, true` after the loop).
func TestDensityInverseReportsNonConvergence(t *testing.T) {
	x := mustSolution(t, libSolute(t, "glucose"), ReferenceK)
	if x.dens.kind != densAMV {
		t.Fatalf("glucose density kind %d, want the apparent molar volume model", x.dens.kind)
	}
	if _, err := x.ToMolality(100, GPerL); err != nil {
		t.Fatalf("intact model: %v", err)
	}
	x.dens.v1 = math.NaN()
	_, err := x.dens.massFraction(100, x.wCap)
	wantConvergenceError(t, err, "density inverse")
	_, err = x.ToMolality(100, GPerL)
	wantConvergenceError(t, err, "density inverse")
	if _, ok := x.MolalityFromMolarity(500); ok {
		t.Error("MolalityFromMolarity: ok with a failed inversion")
	}
	if pi, _ := x.OsmoticFunc(500); !math.IsNaN(pi) {
		t.Errorf("OsmoticFunc = %g with a failed inversion, want NaN (rejected by transport)", pi)
	}
}
