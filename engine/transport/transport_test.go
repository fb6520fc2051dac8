package transport

import (
	"errors"
	"math"
	"testing"

	"drawsift/engine/errs"
)

// Specific reverse solute flux: for a van 't Hoff draw and ΔP = 0 the model
// gives Js/Jw = B/(A·ν·R·T) exactly, independent of S, k, concentrations and
// orientation — Phillip, Yong & Elimelech (2010), Environ. Sci. Technol.
// 44:5170 (citation from memory). The feed may hold the draw solute too.
func TestSpecificReverseFluxPhillip(t *testing.T) {
	cases := 0
	for _, ori := range []Orientation{ALFS, ALDS} {
		for _, sUM := range []float64{50, 400, 3000} {
			for _, k := range []float64{math.Inf(1), 1e-4, 1e-5} {
				for _, cDraw := range []float64{50, 1000, 5000} {
					for _, feedFrac := range []float64{0, 0.2, 0.5} {
						for _, nu := range []float64{2, 3} {
							const aLMHbar, bLMH = 2.0, 0.4
							in := oneSpecies(aLMHbar, bLMH, sUM, ori, cDraw, feedFrac*cDraw, vantHoff(nu))
							in.KDrawMPerS, in.KFeedMPerS = k, k
							r := mustSolve(t, in)
							want := bLMH * lmh / (aLMHbar * lmhb * nu * rt) // mol/m³
							got := r.JsMolPerM2S / r.JwMPerS
							if !closeTo(got, want, 1e-9, 0) {
								t.Errorf("%v S=%g k=%g c=%g feed=%g ν=%g: Js/Jw = %.12g, want %.12g",
									ori, sUM, k, cDraw, feedFrac, nu, got, want)
							}
							cases++
						}
					}
				}
			}
		}
	}
	t.Logf("%d cases", cases)
}

// Closed form for B = 0, no external CP, pure-water feed, AL-FS, van 't Hoff
// draw: Jw = A·π_D·exp(−Jw·K) ⇒ Jw = W(A·π_D·K)/K with K = S/D —
// McCutcheon & Elimelech (2006), J. Membr. Sci. 284:237.
func TestLambertWClosedFormMcCutcheon(t *testing.T) {
	for _, aLMHbar := range []float64{0.1, 1, 10} {
		for _, sUM := range []float64{50, 500, 3000} {
			for _, c := range []float64{10, 500, 5000} {
				in := oneSpecies(aLMHbar, 0, sUM, ALFS, c, 0, vantHoff(2))
				r := mustSolve(t, in)
				k := sUM * um / dNaCl
				a := aLMHbar * lmhb
				want := lambertW(a*2*rt*c*k) / k
				if !closeTo(r.JwMPerS, want, 1e-9, 0) {
					t.Errorf("A=%g S=%g c=%g: Jw = %.12g, want %.12g", aLMHbar, sUM, c, r.JwMPerS, want)
				}
				if r.JsMolPerM2S != 0 {
					t.Errorf("B = 0 but Js = %g", r.JsMolPerM2S)
				}
			}
		}
	}
}

// Loeb et al. (1997), J. Membr. Sci. 129:243 (expression from memory): with
// no external CP and a pure-water feed in AL-FS,
//
//	K = (1/Jw)·ln[(B + A·π_D)/(B + Jw)] = S/D
//
// for a van 't Hoff draw, for any B > 0.
func TestLoebIdentity(t *testing.T) {
	for _, aLMHbar := range []float64{0.5, 2, 8} {
		for _, bLMH := range []float64{0.01, 0.5, 5} {
			for _, sUM := range []float64{100, 700, 3000} {
				for _, c := range []float64{100, 1000, 4000} {
					in := oneSpecies(aLMHbar, bLMH, sUM, ALFS, c, 0, vantHoff(2))
					r := mustSolve(t, in)
					a, b, jw := aLMHbar*lmhb, bLMH*lmh, r.JwMPerS
					kLoeb := math.Log((b+a*2*rt*c)/(b+jw)) / jw
					if want := sUM * um / dNaCl; !closeTo(kLoeb, want, 1e-9, 0) {
						t.Errorf("A=%g B=%g S=%g c=%g: K_Loeb = %.12g, want S/D = %.12g", aLMHbar, bLMH, sUM, c, kLoeb, want)
					}
				}
			}
		}
	}
}

// Ideal semipermeable membrane without polarization: S → 0, k → ∞, B = 0
// gives Jw → A·(π_D − π_F − ΔP), with π the full non-linear value at the
// bulk concentrations (McCutcheon & Elimelech 2006, limit of their eq. for
// K → 0; a limit of the model itself). The deviation must shrink with S (∝ S).
func TestLimitNoPolarization(t *testing.T) {
	for _, ori := range []Orientation{ALFS, ALDS} {
		for _, dp := range []float64{0, 10 * bar, -5 * bar} {
			prevErr := math.Inf(1)
			for _, sUM := range []float64{1, 1e-3, 1e-6, 1e-9} {
				in := oneSpecies(1.5, 0, sUM, ori, 2000, 0, nonlinear(2))
				in.DeltaPPa = dp
				in.Species = append(in.Species, Species{Name: "feed", FeedBulkMolPerM3: 300, BMPerS: 0, DM2PerS: 1e-9, Pi: nonlinear(3)})
				r := mustSolve(t, in)
				piD, _ := nonlinear(2)(2000)
				piF, _ := nonlinear(3)(300)
				want := in.AMPerSPa * (piD - piF - dp)
				relErr := math.Abs(r.JwMPerS-want) / math.Abs(want)
				if sUM == 1e-9 && relErr > 1e-9 {
					t.Errorf("%v ΔP=%g S=%g µm: Jw = %.12g, want → %.12g", ori, dp, sUM, r.JwMPerS, want)
				}
				if !(relErr < prevErr) && relErr > 1e-14 {
					t.Errorf("%v ΔP=%g: deviation %g at S=%g µm did not shrink (was %g)", ori, dp, relErr, sUM, prevErr)
				}
				prevErr = relErr
			}
		}
	}
}

// Monotonicity (common practice): Jw rises with draw
// concentration and falls with S, in both orientations, with ECP and B.
func TestMonotoneInDrawAndS(t *testing.T) {
	for _, ori := range []Orientation{ALFS, ALDS} {
		prev := math.Inf(-1)
		for c := 100.0; c <= 5000; c += 100 {
			in := oneSpecies(2, 0.5, 500, ori, c, 50, nonlinear(2))
			in.KDrawMPerS, in.KFeedMPerS = 3e-5, 3e-5
			r := mustSolve(t, in)
			if !(r.JwMPerS > prev) {
				t.Errorf("%v: Jw(c=%g) = %g not above Jw at the previous c (%g)", ori, c, r.JwMPerS, prev)
			}
			prev = r.JwMPerS
		}
		prev = math.Inf(1)
		for s := 20.0; s <= 3000; s *= 1.25 {
			in := oneSpecies(2, 0.5, s, ori, 1000, 50, nonlinear(2))
			in.KDrawMPerS, in.KFeedMPerS = 3e-5, 3e-5
			r := mustSolve(t, in)
			if !(r.JwMPerS < prev) {
				t.Errorf("%v: Jw(S=%g µm) = %g not below Jw at the previous S (%g)", ori, s, r.JwMPerS, prev)
			}
			prev = r.JwMPerS
		}
	}
}

// AL-DS beats AL-FS for a pure-water feed when the support resistance S/D
// dominates the boundary-layer resistance 1/k: dilutive ICP on the draw side
// (AL-FS) hurts more than dilutive ECP (AL-DS) — McCutcheon & Elimelech 2006.
func TestALDSBeatsALFSForPureWaterFeed(t *testing.T) {
	for _, sUM := range []float64{300, 1000} { // S/D = 2e5 and 7e5 s/m
		for _, k := range []float64{1e-4, 1e-3} { // 1/k = 1e4 and 1e3 s/m
			for _, c := range []float64{500, 2000} {
				fs := oneSpecies(2, 0.3, sUM, ALFS, c, 0, nonlinear(2))
				fs.KDrawMPerS, fs.KFeedMPerS = k, k
				ds := *fs
				ds.Orientation = ALDS
				rfs, rds := mustSolve(t, fs), mustSolve(t, &ds)
				if !(rds.JwMPerS > rfs.JwMPerS) {
					t.Errorf("S=%g k=%g c=%g: AL-DS %g ≤ AL-FS %g", sUM, k, c, rds.JwMPerS, rfs.JwMPerS)
				}
			}
		}
	}
}

// Reverse flow is a result, not an error: ΔP above the osmotic difference
// gives Jw < 0 (Yip et al. 2011 sign convention), and so does a feed that
// is stronger than the draw. At ΔP equal to the bulk difference with no
// polarization and B = 0, Jw = 0 (zero flux at zero driving force).
func TestReverseFlow(t *testing.T) {
	piD, _ := nonlinear(2)(1000)
	for _, ori := range []Orientation{ALFS, ALDS} {
		in := oneSpecies(2, 0.3, 500, ori, 1000, 0, nonlinear(2))
		in.KDrawMPerS, in.KFeedMPerS = 5e-5, 5e-5
		in.DeltaPPa = piD + 10*bar
		r := mustSolve(t, in)
		if !(r.JwMPerS < 0) {
			t.Errorf("%v ΔP > π_D: Jw = %g, want < 0", ori, r.JwMPerS)
		}
		if !(r.PiDrawFacePa > r.PiDrawBulkPa) {
			t.Errorf("%v reverse flow should concentrate the draw face: %g ≤ %g", ori, r.PiDrawFacePa, r.PiDrawBulkPa)
		}

		in = oneSpecies(2, 0.3, 500, ori, 200, 1000, nonlinear(2))
		r = mustSolve(t, in)
		if !(r.JwMPerS < 0) || !(r.JsMolPerM2S < 0) {
			t.Errorf("%v feed stronger than draw: Jw = %g, Js = %g, want both < 0", ori, r.JwMPerS, r.JsMolPerM2S)
		}

		in = oneSpecies(2, 0, 1e-9, ori, 1000, 0, nonlinear(2))
		in.DeltaPPa = piD
		r = mustSolve(t, in)
		if math.Abs(r.JwMPerS) > 1e-12*in.AMPerSPa*piD {
			t.Errorf("%v ΔP = π_D: Jw = %g, want 0", ori, r.JwMPerS)
		}
	}
}

// Pure water on both sides with no pressure: Jw = 0 exactly (trivial path).
func TestPureWaterBothSides(t *testing.T) {
	in := oneSpecies(1, 0.3, 500, ALFS, 0, 0, vantHoff(2))
	r := mustSolve(t, in)
	if r.JwMPerS != 0 || r.JsMolPerM2S != 0 || r.Stats.Method != "trivial" {
		t.Errorf("got Jw=%g Js=%g method %q", r.JwMPerS, r.JsMolPerM2S, r.Stats.Method)
	}
	// Pressure alone drives water backwards through pure water: Jw = −A·ΔP.
	in.DeltaPPa = 3 * bar
	r = mustSolve(t, in)
	if want := -in.AMPerSPa * 3 * bar; !closeTo(r.JwMPerS, want, 1e-12, 0) {
		t.Errorf("pressure only: Jw = %g, want %g", r.JwMPerS, want)
	}
}

// Mirror symmetry of the model (derived in layers.go): reversing the process
// — swapping feed and draw, AL-FS ↔ AL-DS, k_F ↔ k_D and ΔP → −ΔP — reverses
// Jw and every N and swaps the faces. Checks the Jw < 0 branch against the
// Jw > 0 branch.
func TestMirrorSymmetry(t *testing.T) {
	in := &Input{AMPerSPa: 2.5 * lmhb, SM: 600 * um, Orientation: ALFS, DeltaPPa: 4 * bar,
		KDrawMPerS: 2e-5, KFeedMPerS: 7e-5,
		Species: []Species{
			{DrawBulkMolPerM3: 1500, FeedBulkMolPerM3: 40, BMPerS: 0.6 * lmh, DM2PerS: 1.5e-9, Pi: nonlinear(2)},
			{FeedBulkMolPerM3: 80, BMPerS: 0.05 * lmh, DM2PerS: 0.9e-9, Pi: nonlinear(3)},
		}}
	mir := &Input{AMPerSPa: in.AMPerSPa, SM: in.SM, Orientation: ALDS, DeltaPPa: -in.DeltaPPa,
		KDrawMPerS: in.KFeedMPerS, KFeedMPerS: in.KDrawMPerS,
		Species: []Species{
			{DrawBulkMolPerM3: 40, FeedBulkMolPerM3: 1500, BMPerS: 0.6 * lmh, DM2PerS: 1.5e-9, Pi: nonlinear(2)},
			{DrawBulkMolPerM3: 80, BMPerS: 0.05 * lmh, DM2PerS: 0.9e-9, Pi: nonlinear(3)},
		}}
	r, m := mustSolve(t, in), mustSolve(t, mir)
	if !closeTo(m.JwMPerS, -r.JwMPerS, 1e-10, 0) {
		t.Fatalf("Jw %g vs mirrored %g", r.JwMPerS, m.JwMPerS)
	}
	for i := range r.Species {
		a, b := r.Species[i], m.Species[i]
		if !closeTo(b.FluxMolPerM2S, -a.FluxMolPerM2S, 1e-9, 1e-15) ||
			!closeTo(b.FeedFaceMolPerM3, a.DrawFaceMolPerM3, 1e-9, 1e-9) ||
			!closeTo(b.DrawFaceMolPerM3, a.FeedFaceMolPerM3, 1e-9, 1e-9) ||
			!closeTo(b.SupportInterfaceMolPerM3, a.SupportInterfaceMolPerM3, 1e-9, 1e-9) {
			t.Errorf("species %d: %+v vs mirrored %+v", i, a, b)
		}
	}
}

// The reported profile satisfies the layer equations it came from:
// N = B·(c_f − c_d) across the active layer, Jw = A·(π_d − π_f − ΔP), and
// c_out − u = (c_in − u)·exp(Jw·R) across the support and its boundary layer
// (u = N/Jw) — the convection–diffusion balance of Tiraferri et al. 2011.
func TestProfileConsistency(t *testing.T) {
	for _, ori := range []Orientation{ALFS, ALDS} {
		for _, dp := range []float64{0, 150 * bar} { // second: reverse flow
			in := oneSpecies(3, 0.8, 700, ori, 1800, 150, nonlinear(2))
			in.KDrawMPerS, in.KFeedMPerS, in.DeltaPPa = 4e-5, 2e-5, dp
			r := mustSolve(t, in)
			sp, s := in.Species[0], r.Species[0]
			if got, want := s.FluxMolPerM2S, sp.BMPerS*(s.FeedFaceMolPerM3-s.DrawFaceMolPerM3); !closeTo(got, want, 1e-12, 1e-15) {
				t.Errorf("%v: N = %g, B·Δc = %g", ori, got, want)
			}
			pf, _ := sp.Pi(s.FeedFaceMolPerM3)
			pd, _ := sp.Pi(s.DrawFaceMolPerM3)
			// Tolerance: the solver's residual bound, 1e-12·A·(π_Db + π_Fb + |ΔP|).
			scale := in.AMPerSPa * (r.PiDrawBulkPa + r.PiFeedBulkPa + math.Abs(dp))
			if want := in.AMPerSPa * (pd - pf - dp); math.Abs(r.JwMPerS-want) > 2e-12*scale {
				t.Errorf("%v: Jw = %g, A·Δπ_faces = %g", ori, r.JwMPerS, want)
			}
			jw, u := r.JwMPerS, s.FluxMolPerM2S/r.JwMPerS
			rs := in.SM / sp.DM2PerS
			var face, bulk, rbl float64
			if ori == ALFS { // face → support → BL → draw bulk, along +x
				face, bulk, rbl = s.DrawFaceMolPerM3, sp.DrawBulkMolPerM3, 1/in.KDrawMPerS
				ci := s.SupportInterfaceMolPerM3
				if want := u + (face-u)*math.Exp(jw*rs); !closeTo(ci, want, 1e-9, 1e-9) {
					t.Errorf("%v ΔP=%g: support interface %g, from support %g", ori, dp, ci, want)
				}
				if want := u + (ci-u)*math.Exp(jw*rbl); !closeTo(bulk, want, 1e-9, 1e-9) {
					t.Errorf("%v ΔP=%g: bulk %g, from BL %g", ori, dp, bulk, want)
				}
			} else { // feed bulk → BL → support → face, along +x
				face, bulk, rbl = s.FeedFaceMolPerM3, sp.FeedBulkMolPerM3, 1/in.KFeedMPerS
				ci := s.SupportInterfaceMolPerM3
				if want := u + (bulk-u)*math.Exp(jw*rbl); !closeTo(ci, want, 1e-9, 1e-9) {
					t.Errorf("%v ΔP=%g: support interface %g, from BL %g", ori, dp, ci, want)
				}
				if want := u + (ci-u)*math.Exp(jw*rs); !closeTo(face, want, 1e-9, 1e-9) {
					t.Errorf("%v ΔP=%g: face %g, from support %g", ori, dp, face, want)
				}
			}
		}
	}
}

func TestOrientationParseAndString(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want Orientation
	}{{"AL-FS", ALFS}, {"al-fs", ALFS}, {" FO ", ALFS}, {"fo", ALFS}, {"AL-DS", ALDS}, {"pro", ALDS}, {"Al-Ds", ALDS}} {
		got, err := ParseOrientation(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("ParseOrientation(%q) = %v, %v", tc.in, got, err)
		}
	}
	if ALFS.String() != "AL-FS" || ALDS.String() != "AL-DS" {
		t.Errorf("String: %q %q", ALFS, ALDS)
	}
	_, err := ParseOrientation("sideways")
	var ie *errs.InputError
	if !errors.As(err, &ie) || ie.Field != "orientation" || !errors.Is(err, ErrInvalidInput) {
		t.Errorf("ParseOrientation(sideways) error = %v", err)
	}
}

func TestBadInput(t *testing.T) {
	good := func() *Input {
		return &Input{AMPerSPa: 1 * lmhb, SM: 500 * um, KDrawMPerS: 5e-5, KFeedMPerS: math.Inf(1),
			Species: []Species{{DrawBulkMolPerM3: 1000, BMPerS: 0.3 * lmh, DM2PerS: dNaCl, Pi: vantHoff(2)},
				{FeedBulkMolPerM3: 10, BMPerS: 0.1 * lmh, DM2PerS: 1e-9, Pi: vantHoff(3)}}}
	}
	nan := math.NaN()
	for _, tc := range []struct {
		name, field string
		mod         func(*Input)
	}{
		{"A zero", "membrane.a_lmh_per_bar", func(in *Input) { in.AMPerSPa = 0 }},
		{"A negative", "membrane.a_lmh_per_bar", func(in *Input) { in.AMPerSPa = -1 * lmhb }},
		{"A NaN", "membrane.a_lmh_per_bar", func(in *Input) { in.AMPerSPa = nan }},
		{"A huge", "membrane.a_lmh_per_bar", func(in *Input) { in.AMPerSPa = 1 }},
		{"S zero", "membrane.s_um", func(in *Input) { in.SM = 0 }},
		{"S Inf", "membrane.s_um", func(in *Input) { in.SM = math.Inf(1) }},
		{"B negative", "membrane.b_lmh", func(in *Input) { in.Species[0].BMPerS = -1e-9 }},
		{"B NaN", "membrane.b_lmh", func(in *Input) { in.Species[0].BMPerS = nan }},
		{"feed B negative", "feed.b_lmh", func(in *Input) { in.Species[1].BMPerS = -1 }},
		{"D zero", "diffusivity_m2_per_s", func(in *Input) { in.Species[0].DM2PerS = 0 }},
		{"feed D NaN", "feed.diffusivity_m2_per_s", func(in *Input) { in.Species[1].DM2PerS = nan }},
		{"k draw zero", "k_draw_m_per_s", func(in *Input) { in.KDrawMPerS = 0 }},
		{"k feed negative", "k_feed_m_per_s", func(in *Input) { in.KFeedMPerS = -1 }},
		{"k feed NaN", "k_feed_m_per_s", func(in *Input) { in.KFeedMPerS = nan }},
		{"draw negative", "draw.concentration", func(in *Input) { in.Species[0].DrawBulkMolPerM3 = -1 }},
		{"draw Inf", "draw.concentration", func(in *Input) { in.Species[0].DrawBulkMolPerM3 = math.Inf(1) }},
		{"feed NaN", "feed.concentration", func(in *Input) { in.Species[1].FeedBulkMolPerM3 = nan }},
		{"no species", "species", func(in *Input) { in.Species = nil }},
		{"too many species", "species", func(in *Input) {
			for len(in.Species) <= MaxSpecies {
				in.Species = append(in.Species, in.Species[0])
			}
		}},
		{"charged draw not neutral", "draw", func(in *Input) { in.Species[0].Charge = 1 }},
		{"charge out of range", "species[0].charge", func(in *Input) { in.Species[0].Charge = 5 }},
		{"nil Pi", "osmotic_model", func(in *Input) { in.Species[0].Pi = nil }},
		{"Pi NaN", "osmotic_model", func(in *Input) {
			in.Species[0].Pi = func(c float64) (float64, float64) { return nan, 0 }
		}},
		{"Pi negative", "feed.osmotic_model", func(in *Input) {
			in.Species[1].Pi = func(c float64) (float64, float64) { return -c, -1 }
		}},
		{"Pi Inf at faces", "osmotic_model", func(in *Input) {
			in.Species[0].Pi = func(c float64) (float64, float64) {
				if c > 1000 {
					return math.Inf(1), 0
				}
				return rt * c, rt
			}
			in.Orientation = ALDS
			in.Species[0].FeedBulkMolPerM3 = 999
		}},
		{"orientation", "orientation", func(in *Input) { in.Orientation = 7 }},
		{"ΔP NaN", "delta_p_bar", func(in *Input) { in.DeltaPPa = nan }},
	} {
		in := good()
		tc.mod(in)
		_, err := Solve(in)
		var ie *errs.InputError
		if !errors.As(err, &ie) {
			t.Errorf("%s: error %v, want *errs.InputError", tc.name, err)
			continue
		}
		if ie.Field != tc.field || ie.Limit == "" || !errors.Is(err, ErrInvalidInput) {
			t.Errorf("%s: field %q limit %q, want field %q", tc.name, ie.Field, ie.Limit, tc.field)
		}
		if !finite(ie.Value) {
			t.Errorf("%s: error carries a non-finite value: %v", tc.name, err)
		}
	}
	if _, err := Solve(good()); err != nil {
		t.Fatalf("good input: %v", err)
	}
	if _, err := Solve(nil); err == nil {
		t.Error("Solve(nil) succeeded")
	}
}

// SolveInto reuses the caller's Species slice and does not allocate.
func TestSolveIntoNoAllocs(t *testing.T) {
	in := oneSpecies(2, 0.3, 500, ALFS, 1000, 0, nonlinear(2))
	in.KDrawMPerS, in.KFeedMPerS = 5e-5, 5e-5
	var r Result
	r.Species = make([]SpeciesResult, 0, 2)
	if n := testing.AllocsPerRun(100, func() {
		if err := SolveInto(in, &r); err != nil {
			t.Fatal(err)
		}
	}); n != 0 {
		t.Errorf("SolveInto allocates %v times per call", n)
	}
}
