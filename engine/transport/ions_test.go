package transport

import (
	"math"
	"strconv"
	"testing"

	"drawsift/engine/internal/reftable"
)

// ionSystem builds the four-ion test system of testdata/ions_scipy.py:
// Na⁺, Mg²⁺, Cl⁻, SO₄²⁻; a draw of NaCl + y MgCl2 at formula-unit
// concentration cd, a feed of MgSO4 + x NaCl at cf, π by Young's rule
// over the two solutions with the script's test law (nonlinear).
func ionSystem(ori Orientation, k float64, b, d [4]float64, cd, y, cf, x, dpBar, aLMHbar, sUM float64) *Input {
	z := [4]int{1, 2, -1, -2}
	names := [4]string{"Na+", "Mg+2", "Cl-", "SO4-2"}
	cD := [4]float64{cd, y * cd, cd * (1 + 2*y), 0}
	cF := [4]float64{x * cf, cf, x * cf, cf}
	rule := NewMixingRule(4)
	gD := rule.AddSolution(nonlinear(2+3*y), 2+3*y)
	gF := -1
	if cf > 0 {
		gF = rule.AddSolution(nonlinear(2+2*x), 2+2*x)
	}
	in := &Input{AMPerSPa: aLMHbar * lmhb, SM: sUM * um, Orientation: ori, DeltaPPa: dpBar * bar,
		KDrawMPerS: k, KFeedMPerS: k, FacePi: rule.Pi}
	for i := 0; i < 4; i++ {
		in.Species = append(in.Species, Species{Name: names[i], Charge: z[i], DrawBulkMolPerM3: cD[i], FeedBulkMolPerM3: cF[i],
			BMPerS: b[i] * lmh, DM2PerS: d[i]})
		sd := 0.0
		switch {
		case cD[i] > 0 && cF[i] > 0:
			sd = cD[i] / (cD[i] + cF[i])
		case cD[i] > 0:
			sd = 1
		}
		rule.SetShare(gD, i, sd)
		if gF >= 0 && (cD[i] > 0 || cF[i] > 0) {
			rule.SetShare(gF, i, 1-sd)
		}
	}
	// The script puts the first species with the draw.
	return in
}

// TestIonsSciPy compares the coupled multi-ion solve with an independent
// solution of the same equations by nested scipy.optimize.brentq
// (testdata/ions_scipy.py, its table testdata/ions_scipy.csv): both
// orientations, with and without external CP, equal and unequal ion B and
// D, draws and feeds sharing ions or not, ΔP 0 and 8 bar. Jw, the membrane
// potential and every ion flux agree to 1e-8 relative (issue #11).
func TestIonsSciPy(t *testing.T) {
	head, rows, err := reftable.Read("../../testdata/ions_scipy.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) < 500 {
		t.Fatalf("only %d rows", len(rows))
	}
	// The script's B and D sets (its header).
	bSets := [][4]float64{{0.3, 0.3, 0.3, 0.3}, {0.3, 0.005, 0.3, 0.05}, {1.0, 0.02, 0.4, 0.01}}
	dSets := [][4]float64{{1.5e-9, 1.5e-9, 1.5e-9, 1.5e-9}, {1.33e-9, 0.71e-9, 2.03e-9, 1.07e-9}}
	worst := 0.0
	var coupled int
	for n, row := range rows {
		num := func(col string) float64 {
			v, err := strconv.ParseFloat(row[head[col]], 64)
			if err != nil {
				t.Fatalf("row %d %s: %v", n, col, err)
			}
			return v
		}
		ori, _ := ParseOrientation(row[head["orientation"]])
		k := math.Inf(1)
		if row[head["external_cp"]] == "1" {
			k = 2e-5
		}
		in := ionSystem(ori, k, bSets[int(num("b_set"))], dSets[int(num("d_set"))], num("draw_c_mol_m3"), num("draw_mgcl2_per_unit"),
			num("feed_c_mol_m3"), num("feed_nacl_per_unit"), num("delta_p_bar"), num("a_lmh_per_bar"), num("s_um"))
		r, err := Solve(in)
		if err != nil {
			t.Fatalf("row %d: %v", n, err)
		}
		jw := num("jw_m_per_s")
		if !closeTo(r.JwMPerS, jw, 1e-8, 1e-15) {
			t.Errorf("row %d: Jw = %.12g, SciPy %.12g", n, r.JwMPerS, jw)
		}
		worst = math.Max(worst, math.Abs(r.JwMPerS-jw)/math.Abs(jw))
		if u := num("potential"); math.Abs(r.Potential-u) > 1e-8*math.Abs(u)+1e-12 {
			t.Errorf("row %d: potential %.12g, SciPy %.12g", n, r.Potential, u)
		}
		if r.Potential != 0 {
			coupled++
		}
		scale := 0.0
		for _, col := range []string{"n_na", "n_mg", "n_cl", "n_so4"} {
			scale = math.Max(scale, math.Abs(num(col)))
		}
		for i, col := range []string{"n_na", "n_mg", "n_cl", "n_so4"} {
			if want := num(col); !closeTo(r.Species[i].FluxMolPerM2S, want, 1e-8, 1e-6*scale) {
				t.Errorf("row %d: %s = %.12g, SciPy %.12g", n, in.Species[i].Name, r.Species[i].FluxMolPerM2S, want)
			}
		}
	}
	if coupled < len(rows)/2 {
		t.Errorf("only %d of %d rows have a membrane potential", coupled, len(rows))
	}
	t.Logf("%d rows (%d coupled): worst relative difference in Jw %.2g", len(rows), coupled, worst)
}

// One salt whose ions share one B and one D is one solute: transported as
// ions under the composition π it gives today's single-species answer
// (issue #11 limit), in both orientations, with ECP, with the same salt in
// the feed (the shared case) and with ΔP.
func TestIonsSingleSaltLimit(t *testing.T) {
	for _, ori := range []Orientation{ALFS, ALDS} {
		for _, feed := range []float64{0, 150} {
			for _, dp := range []float64{0, 5} {
				one := oneSpecies(1.2, 0.4, 450, ori, 900, feed, nonlinear(2))
				one.KDrawMPerS, one.KFeedMPerS, one.DeltaPPa = 3e-5, 2e-5, dp*bar
				want := mustSolve(t, one)
				rule := NewMixingRule(2)
				g := rule.AddSolution(nonlinear(2), 2)
				rule.SetShare(g, 0, 1)
				rule.SetShare(g, 1, 1)
				ions := *one
				ions.FacePi = rule.Pi
				ions.Species = []Species{
					{Name: "Na+", Charge: 1, DrawBulkMolPerM3: 900, FeedBulkMolPerM3: feed, BMPerS: 0.4 * lmh, DM2PerS: dNaCl},
					{Name: "Cl-", Charge: -1, DrawBulkMolPerM3: 900, FeedBulkMolPerM3: feed, BMPerS: 0.4 * lmh, DM2PerS: dNaCl},
				}
				got := mustSolve(t, &ions)
				if !closeTo(got.JwMPerS, want.JwMPerS, 1e-9, 0) || got.Potential != 0 {
					t.Errorf("%v feed %g ΔP %g: Jw %.12g (u %g), single species %.12g", ori, feed, dp, got.JwMPerS, got.Potential, want.JwMPerS)
				}
				for i := range got.Species {
					if !closeTo(got.Species[i].FluxMolPerM2S, want.Species[0].FluxMolPerM2S, 1e-9, 1e-20) ||
						!closeTo(got.Species[i].DrawFaceMolPerM3, want.Species[0].DrawFaceMolPerM3, 1e-9, 0) {
						t.Errorf("%v feed %g ΔP %g: %s flux %.12g, single species %.12g", ori, feed, dp, ions.Species[i].Name,
							got.Species[i].FluxMolPerM2S, want.Species[0].FluxMolPerM2S)
					}
				}
			}
		}
	}
}

// The coupled solution balances (issue #11): no net electric current
// (Σ z·N = 0 to 1e-12 of Σ|z·N|), every ion's flux equals both its
// unstirred-layer balance and the Goldman flux at the faces it leaves, each
// to 1e-12 relative, and Jw = A(π_d − π_f − ΔP) to the solver's tolerance. A reversed problem
// (feed and draw exchanged) mirrors it.
func TestIonsBalances(t *testing.T) {
	b := [4]float64{1.0, 0.02, 0.4, 0.01}
	d := [4]float64{1.33e-9, 0.71e-9, 2.03e-9, 1.07e-9}
	for _, ori := range []Orientation{ALFS, ALDS} {
		for _, dp := range []float64{0, 40} {
			in := ionSystem(ori, 2e-5, b, d, 800, 0.3, 300, 0.5, dp, 1.5, 600)
			r := mustSolve(t, in)
			var cur, abs float64
			for i, sp := range in.Species {
				sr := r.Species[i]
				cur += float64(sp.Charge) * sr.FluxMolPerM2S
				abs += math.Abs(float64(sp.Charge) * sr.FluxMolPerM2S)
				// Goldman flux at the faces.
				w := float64(sp.Charge) * r.Potential
				gp, _ := ghk(w)
				gm, _ := ghk(-w)
				ghkN := sp.BMPerS * (gp*sr.FeedFaceMolPerM3 - gm*sr.DrawFaceMolPerM3)
				// Unstirred layers: c_f = cF·e^{J R_f} − N(e^{J R_f} − 1)/J.
				rs := in.SM / sp.DM2PerS
				rf, rdd := 1/in.KFeedMPerS, rs+1/in.KDrawMPerS
				if ori == ALDS {
					rf, rdd = rs+1/in.KFeedMPerS, 1/in.KDrawMPerS
				}
				j := r.JwMPerS
				cf := sp.FeedBulkMolPerM3*math.Exp(j*rf) - sr.FluxMolPerM2S*math.Expm1(j*rf)/j
				cd := sp.DrawBulkMolPerM3*math.Exp(-j*rdd) - sr.FluxMolPerM2S*math.Expm1(-j*rdd)/j
				scale := math.Abs(sp.BMPerS * (sr.FeedFaceMolPerM3 + sr.DrawFaceMolPerM3))
				if math.Abs(ghkN-sr.FluxMolPerM2S) > 1e-12*scale {
					t.Errorf("%v ΔP %g %s: flux %g, Goldman at the faces %g", ori, dp, sp.Name, sr.FluxMolPerM2S, ghkN)
				}
				cs := sp.FeedBulkMolPerM3 + sp.DrawBulkMolPerM3
				if math.Abs(cf-sr.FeedFaceMolPerM3) > 1e-12*cs || math.Abs(cd-sr.DrawFaceMolPerM3) > 1e-12*cs {
					t.Errorf("%v ΔP %g %s: faces %g %g, layer balances give %g %g", ori, dp, sp.Name, sr.FeedFaceMolPerM3, sr.DrawFaceMolPerM3, cf, cd)
				}
			}
			if math.Abs(cur) > 1e-12*abs || abs == 0 || r.Potential == 0 {
				t.Errorf("%v ΔP %g: net current %g of %g (u %g)", ori, dp, cur, abs, r.Potential)
			}
			// Water: to the solver's tolerance, 1e-12 of A·(π_D,b + π_F,b + |ΔP|).
			scale := in.AMPerSPa * (r.PiDrawBulkPa + r.PiFeedBulkPa + math.Abs(in.DeltaPPa))
			if drive := in.AMPerSPa * (r.PiDrawFacePa - r.PiFeedFacePa - in.DeltaPPa); math.Abs(drive-r.JwMPerS) > 1e-12*scale {
				t.Errorf("%v ΔP %g: Jw %g, A·Δπ %g", ori, dp, r.JwMPerS, drive)
			}
			// Mirror: swap the streams and the orientation; fluxes and the
			// potential change sign.
			m := *in
			m.Species = append([]Species(nil), in.Species...)
			for i := range m.Species {
				m.Species[i].DrawBulkMolPerM3, m.Species[i].FeedBulkMolPerM3 = in.Species[i].FeedBulkMolPerM3, in.Species[i].DrawBulkMolPerM3
			}
			m.Orientation = 1 - ori
			m.DeltaPPa = -in.DeltaPPa
			m.KDrawMPerS, m.KFeedMPerS = in.KFeedMPerS, in.KDrawMPerS
			mr := mustSolve(t, &m)
			if !closeTo(mr.JwMPerS, -r.JwMPerS, 1e-9, 1e-15) || !closeTo(mr.Potential, -r.Potential, 1e-8, 1e-12) {
				t.Errorf("%v ΔP %g mirror: Jw %g vs %g, u %g vs %g", ori, dp, mr.JwMPerS, r.JwMPerS, mr.Potential, r.Potential)
			}
			for i := range mr.Species {
				if !closeTo(mr.Species[i].FluxMolPerM2S, -r.Species[i].FluxMolPerM2S, 1e-8, 1e-15) {
					t.Errorf("%v ΔP %g mirror: %s %g vs %g", ori, dp, in.Species[i].Name, mr.Species[i].FluxMolPerM2S, r.Species[i].FluxMolPerM2S)
				}
			}
		}
	}
}
