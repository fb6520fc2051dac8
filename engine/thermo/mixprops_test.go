package thermo

import (
	"math"
	"testing"

	"drawsift/engine/library"
	"drawsift/engine/warn"
)

// One component: the mixture rules reduce to the single-solute models of
// density.go and transport_props.go (the same library records), for every
// record kind in the library — Laliberté–Cooper and apparent-molar-volume
// densities, Laliberté and tabulated viscosities, the seawater
// pseudo-solute, and records without a model — at 5, 25 and 60 °C, from
// dilute to past each fit's range. Identity of the rules (exact in
// arithmetic): 1e-12 relative.
func TestMixPropsSingleComponentLimit(t *testing.T) {
	lib, err := library.Default()
	if err != nil {
		t.Fatal(err)
	}
	worst := 0.0
	for _, s := range lib.All() {
		if s.Osmotic.Kind == library.ModelMixture {
			continue // seawater by composition: TestSeawater* below
		}
		for _, tc := range []float64{5, 25, 60} {
			tK := tc + ZeroCelsiusK
			x, err := NewSolution(s, tK)
			if err != nil {
				t.Fatal(err)
			}
			p, err := NewMixProps([]*library.Solute{s}, tK)
			if err != nil {
				t.Fatal(err)
			}
			b, err := p.Blend([]float64{1})
			if err != nil {
				t.Fatal(err)
			}
			top := x.CapMolPerKg()
			if math.IsInf(top, 0) || top > 30 {
				top = 30
			}
			for _, fr := range []float64{0, 1e-6, 0.01, 0.1, 0.3, 0.6, 0.9, 1, 1.2} {
				m := fr * top
				w := x.MassFraction(m)
				rho, _, eta := b.Props(w)
				rho2, eta2 := p.PropsAt([]float64{w})
				wantRho, wantEta := x.DensityKgPerM3(m), x.ViscosityPaS(m)
				for _, d := range []float64{rho/wantRho - 1, eta/wantEta - 1, rho2/wantRho - 1, eta2/wantEta - 1} {
					worst = math.Max(worst, math.Abs(d))
					if !(math.Abs(d) <= 1e-12) {
						t.Errorf("%s %g °C, m = %g: mixture ρ = %.15g, η = %.15g; single solute ρ = %.15g, η = %.15g",
							s.ID, tc, m, rho, eta, wantRho, wantEta)
					}
				}
			}
		}
	}
	t.Logf("single-component limit: worst relative difference %.2g", worst)
}

// dρ/dw_s along a fixed blend against a central difference (h = 1e-6 in
// w_s; truncation and rounding well below 1e-6 relative).
func TestMixBlendDensityDerivative(t *testing.T) {
	sw, err := NewSeawaterBlend(298.15)
	if err != nil {
		t.Fatal(err)
	}
	blends := map[string]*MixBlend{"seawater": sw}
	for name, c := range map[string]struct {
		ids   []string
		moles []float64
	}{
		"NaCl+MgCl2 9:1":    {[]string{"NaCl", "MgCl2"}, []float64{9, 1}},
		"NaCl+glucose 1:1":  {[]string{"NaCl", "glucose"}, []float64{1, 1}},
		"KCl+CaCl2+NH4HCO3": {[]string{"KCl", "CaCl2", "NH4HCO3"}, []float64{1, 1, 1}},
	} {
		p, err := NewMixProps(mixSalts(t, c.ids...), 313.15)
		if err != nil {
			t.Fatal(err)
		}
		if blends[name], err = p.BlendFromMoles(c.moles); err != nil {
			t.Fatal(err)
		}
	}
	const h = 1e-6
	for name, b := range blends {
		for _, w := range []float64{0.001, 0.035, 0.1, 0.2, 0.3} {
			_, d := b.DensityKgPerM3(w)
			hi, _ := b.DensityKgPerM3(w + h)
			lo, _ := b.DensityKgPerM3(w - h)
			fd := (hi - lo) / (2 * h)
			if math.Abs(d/fd-1) > 1e-6 {
				t.Errorf("%s at w_s = %g: dρ/dw = %.9g, central difference %.9g", name, w, d, fd)
			}
		}
	}
}

// Zero and degenerate inputs give finite values: pure water at w_s = 0 (and
// NaN), components with a zero share, all-zero mass fractions, a total
// above the clamp, and a Laliberté record with a negative exponent
// (KHCO3, v2 < 0) near infinite dilution.
func TestMixPropsZeroAndDegenerate(t *testing.T) {
	p, err := NewMixProps(mixSalts(t, "NaCl", "KHCO3", "glucose", "KCl"), 298.15)
	if err != nil {
		t.Fatal(err)
	}
	b, err := p.Blend([]float64{1, 0, 0, 0})
	if err != nil {
		t.Fatal(err)
	}
	k, err := p.Blend([]float64{0, 1, 0, 0})
	if err != nil {
		t.Fatal(err)
	}
	finite := func(what string, vs ...float64) {
		t.Helper()
		for _, v := range vs {
			if math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 && v != 0 {
				t.Errorf("%s: %v", what, vs)
			}
		}
	}
	for _, w := range []float64{0, 1e-300, 1e-12, math.NaN(), -1, 0.5, 0.99, math.Inf(1)} {
		r, d, e := b.Props(w)
		finite("NaCl blend", r, d, e)
		r, d, e = k.Props(w)
		finite("KHCO3 blend", r, d, e)
	}
	water := func(r, e float64) bool { return math.Abs(r/p.rhoW-1) < 1e-15 && math.Abs(e/p.muW-1) < 1e-15 }
	r, e := p.PropsAt([]float64{0, 0, 0, 0})
	if !water(r, e) {
		t.Errorf("all-zero mass fractions: ρ = %g, η = %g; want pure water %g, %g", r, e, p.rhoW, p.muW)
	}
	r, e = p.PropsAt([]float64{0.05, math.NaN(), -0.1, 0.01})
	finite("PropsAt with NaN and negative entries", r, e)
	r0, _, e0 := b.Props(0)
	if !water(r0, e0) {
		t.Errorf("w_s = 0: ρ = %g, η = %g; want pure water", r0, e0)
	}
}

// Bad input names the field.
func TestMixPropsErrors(t *testing.T) {
	s := mixSalts(t, "NaCl", "MgCl2")
	if _, err := NewMixProps(s, 400); err == nil {
		t.Error("127 °C accepted")
	}
	if _, err := NewMixProps(nil, 298.15); err == nil {
		t.Error("empty mixture accepted")
	}
	p, err := NewMixProps(s, 298.15)
	if err != nil {
		t.Fatal(err)
	}
	for _, x := range [][]float64{{1}, {1, -1}, {0, 0}, {math.NaN(), 1}, {math.Inf(1), 1}} {
		if _, err := p.BlendFromMoles(x); err == nil {
			t.Errorf("blend %v accepted", x)
		}
	}
}

// Fallbacks and ranges are flagged: NH4HCO3 has no viscosity model (its η_i
// is water's), KHCO3's viscosity is fitted at 25 °C only, and a blend past
// a component's mass-fraction range says so with the share.
func TestMixPropsWarnings(t *testing.T) {
	p, err := NewMixProps(mixSalts(t, "NaCl", "NH4HCO3", "KHCO3"), 313.15)
	if err != nil {
		t.Fatal(err)
	}
	if !warn.Has(p.Warnings, warn.ModelNote) || !warn.Has(p.Warnings, warn.Extrapolated) {
		t.Errorf("warnings %v lack the NH4HCO3 fallback or the KHCO3 temperature range", warn.Strings(p.Warnings))
	}
	b, err := p.BlendFromMoles([]float64{1, 0, 0})
	if err != nil {
		t.Fatal(err)
	}
	if b.ValidMassFraction() != 0.2645 {
		t.Errorf("NaCl valid to %g; want 0.2645 (its viscosity fit)", b.ValidMassFraction())
	}
	if ws := b.RangeWarnings(nil, 0.2); len(ws) != 0 {
		t.Errorf("warnings inside the range: %v", warn.Strings(ws))
	}
	if ws := b.RangeWarnings(nil, 0.27); len(ws) != 2 {
		t.Errorf("NaCl at 27 wt%%: %v; want its density and viscosity fits flagged", warn.Strings(ws))
	}
}

// Seawater by composition (SeawaterSalts, Reilly–Wood–Robinson pairing of
// the Millero et al. 2008 Reference Composition): shares sum to 1, the mass
// moved from pairs without a library salt is small.
func TestSeawaterSalts(t *testing.T) {
	salts, err := SeawaterSalts()
	if err != nil {
		t.Fatal(err)
	}
	sum, sub := 0.0, 0.0
	for _, s := range salts {
		sum += s.MassShare
		sub += s.SubstitutedShare
		t.Logf("%-7s %.5f (substituted %.5f)", s.Solute.ID, s.MassShare, s.SubstitutedShare)
	}
	if math.Abs(sum-1) > 1e-14 {
		t.Errorf("shares sum to %g", sum)
	}
	if sub > 0.01 {
		t.Errorf("%.2f %% of the salt mass substituted", 100*sub)
	}
	t.Logf("substituted: %.3f %% of the salt mass", 100*sub)
}

// Published mixed-salt data: densities and viscosities of KCl + CaCl2 + H2O
// at 303.15 and 313.15 K, 0.5–3.5 mol/kg of each salt ("Experimental
// measurements and modelling of viscosity and density of calcium and
// potassium chlorides ternary solutions", Sci. Rep. 10 (2020), article
// s41598-020-73484-4, Tables 5 and 7, experimental columns; copied into
// testdata/mixed_kcl_cacl2_scirep2020.csv). The rules predict them from the
// binary records alone (no ternary parameter). Tolerances are what the
// rules achieve, inside what the sources claim for mixtures (Laliberté &
// Cooper 2004: standard deviation 1.39 kg/m³ over 1600 mixture points):
// density within 3 kg/m³ (measured worst 2.6), viscosity within 3.5 %
// (measured worst 3.2 %). One published density, KCl 2.5 + CaCl2 0.5
// mol/kg, lies off its row's trend at both temperatures (steps of
// 0.0217 g/cm³ between neighbours of 0.013–0.018; the authors' own
// prediction, 1.1339 g/cm³ at 303.15 K, misses it too): it is held to
// 5 kg/m³ (measured 4.7) and named here rather than dropped.
func TestMixPropsKClCaCl2Published(t *testing.T) {
	var worstRho, worstEta float64
	for _, r := range readCSV(t, "../../testdata/mixed_kcl_cacl2_scirep2020.csv") {
		tK, m1, m2, wantRho, wantEta := r[0], r[1], r[2], r[3]*1000, r[4]*1e-3
		salts := mixSalts(t, "KCl", "CaCl2")
		p, err := NewMixProps(salts, tK)
		if err != nil {
			t.Fatal(err)
		}
		// Mass fractions from molalities: per kg of water, 1 + Σ mᵢMᵢ kg.
		k1, k2 := m1*salts[0].MolarMassKgPerMol(), m2*salts[1].MolarMassKgPerMol()
		mass := 1 + k1 + k2
		rho, eta := p.PropsAt([]float64{k1 / mass, k2 / mass})
		tolRho := 3.0
		if m1 == 2.5 && m2 == 0.5 {
			tolRho = 5
		} else {
			worstRho = math.Max(worstRho, math.Abs(rho-wantRho))
		}
		dEta := eta/wantEta - 1
		worstEta = math.Max(worstEta, math.Abs(dEta))
		if math.Abs(rho-wantRho) > tolRho || math.Abs(dEta) > 0.035 {
			t.Errorf("%g K, KCl %g + CaCl2 %g mol/kg: ρ = %.1f kg/m³ (published %.1f), η = %.4f mPa·s (published %.4f, %+.1f %%)",
				tK, m1, m2, rho, wantRho, eta*1e3, wantEta*1e3, 100*dEta)
		}
	}
	t.Logf("KCl + CaCl2 (Sci. Rep. 2020): worst |Δρ| %.2f kg/m³ (outlier row apart), worst |Δη/η| %.2f %%", worstRho, 100*worstEta)
}

// Seawater by composition (NewSeawaterBlend) against TEOS-10 density
// (IOC, SCOR & IAPSO 2010; gsw.rho_t_exact from Debian's python3-gsw, in
// testdata/seawater_teos10.csv made by testdata/seawater_teos10.py), every
// row of 5–70 g/kg at 0–40 °C. TEOS-10 is good to about ±0.004 kg/m³ here,
// so this measures our model: within 0.5 kg/m³ (0.05 %) at 10–40 °C
// (measured worst 0.45), within 1.1 kg/m³ (0.1 %) at 0 and 5 °C (measured
// worst 1.04 at 70 g/kg, 0 °C), where several component fits begin above
// the temperature (CaCl2 density from 15 °C, KCl from 5 °C) and are
// extrapolated, flagged. Laliberté & Cooper (2004) give a standard
// deviation of 1.39 kg/m³ for their mixture predictions. For comparison, the
// Sharqawy et al. (2010) fit in seawater.go deviates from TEOS-10 by up to
// 0.72 kg/m³ on the same rows.
func TestSeawaterBlendTEOS10Density(t *testing.T) {
	var worstWarm, worstCold float64
	for _, r := range readCSV(t, "../../testdata/seawater_teos10.csv") {
		sa, tc, want := r[0], r[1], r[3]
		if tc > 40 {
			continue
		}
		b, err := NewSeawaterBlend(tc + ZeroCelsiusK)
		if err != nil {
			t.Fatal(err)
		}
		rho, _ := b.DensityKgPerM3(sa / 1000)
		d := math.Abs(rho - want)
		tol := 0.5
		if tc < 10 {
			tol = 1.1
			worstCold = math.Max(worstCold, d)
		} else {
			worstWarm = math.Max(worstWarm, d)
		}
		if d > tol {
			t.Errorf("seawater %g g/kg, %g °C: ρ = %.4f kg/m³ by composition, TEOS-10 %.4f", sa, tc, rho, want)
		}
	}
	t.Logf("seawater density by composition vs TEOS-10: worst %.3f kg/m³ at 10–40 °C, %.3f at 0–5 °C", worstWarm, worstCold)
}

// Seawater by composition against the Sharqawy, Lienhard & Zubair (2010)
// correlations of seawater.go (density eq. 8: ±0.1 %, 0–160 g/kg; viscosity
// eqs. 22–23: ±1.5 %, 0–150 g/kg), 10–80 °C. Measured: density within
// 0.08 % up to 120 g/kg and 0.31 % at 160 g/kg (the mixture denser);
// viscosity within 0.8 % up to 100 g/kg, rising to 2.2 % (25 °C) – 3.0 %
// (0 °C) at 150 g/kg (the mixture more viscous). The tolerances state these
// findings: the two models part beyond about 120 g/kg, more than either
// claims, and neither is checked against brine data here.
func TestSeawaterBlendSharqawy(t *testing.T) {
	for _, tc := range []float64{0, 10, 25, 40, 60, 80} {
		b, err := NewSeawaterBlend(tc + ZeroCelsiusK)
		if err != nil {
			t.Fatal(err)
		}
		muW := b.p.muW
		for _, s := range []float64{5, 20, 35, 50, 70, 100, 120, 150, 160} {
			w := s / 1000
			rho, _, eta := b.Props(w)
			sh, _ := seawaterDensity(w, tc)
			dRho := rho/sh - 1
			tolRho := 0.001
			if s > 120 {
				tolRho = 0.0035
			}
			if math.Abs(dRho) > tolRho {
				t.Errorf("%g °C, %g g/kg: ρ = %.3f by composition, Sharqawy %.3f (%+.3f %%)", tc, s, rho, sh, 100*dRho)
			}
			if s > 150 {
				continue
			}
			shEta := muW * seawaterRelViscosity(w, tc)
			dEta := eta/shEta - 1
			tolEta := 0.01
			if s > 100 {
				tolEta = 0.035
			}
			if math.Abs(dEta) > tolEta {
				t.Errorf("%g °C, %g g/kg: η = %.5g mPa·s by composition, Sharqawy %.5g (%+.2f %%)", tc, s, eta*1e3, shEta*1e3, 100*dEta)
			}
		}
	}
}

// The seawater blend's component ranges: the major salts stay inside their
// mass-fraction fits to 26.43 wt % (KCl density; NaCl viscosity 26.45 %),
// about 7.5 times seawater; NaHCO3 (viscosity to 8.44 wt %) and K2SO4
// (density to 15.15 wt %), 0.55 % of the salt mass, leave theirs first and
// are flagged.
func TestSeawaterBlendRanges(t *testing.T) {
	b, err := NewSeawaterBlend(298.15)
	if err != nil {
		t.Fatal(err)
	}
	if got := b.ValidMassFraction(); got != 0.0844 {
		t.Errorf("seawater blend valid to %g; want 0.0844 (NaHCO3 viscosity record)", got)
	}
	major := math.Inf(1)
	for i, r := range b.p.Ranges() {
		if b.f[i] > 0.01 {
			major = math.Min(major, math.Min(r.DensityMaxMassFraction, r.ViscosityMaxMassFraction))
		}
	}
	if major != 0.2643 {
		t.Errorf("major salts valid to %g; want 0.2643 (KCl density record)", major)
	}
	if ws := b.RangeWarnings(nil, 0.07); len(ws) != 0 {
		t.Errorf("70 g/kg flagged: %v", warn.Strings(ws))
	}
	if ws := b.RangeWarnings(nil, 0.1); len(ws) != 1 {
		t.Errorf("100 g/kg: %v; want NaHCO3's viscosity only", warn.Strings(ws))
	}
}

var mixSinkRho, mixSinkD, mixSinkEta float64

// One density + viscosity evaluation of seawater by composition (11 salts)
// at 35 g/kg.
func BenchmarkMixBlendProps(b *testing.B) {
	sw, err := NewSeawaterBlend(298.15)
	if err != nil {
		b.Fatal(err)
	}
	b.Run("seawater", func(b *testing.B) {
		b.ReportAllocs()
		for i := 0; i < b.N; i++ {
			mixSinkRho, mixSinkD, mixSinkEta = sw.Props(0.035)
		}
	})
	b.Run("seawater-density", func(b *testing.B) {
		b.ReportAllocs()
		for i := 0; i < b.N; i++ {
			mixSinkRho, mixSinkD = sw.DensityKgPerM3(0.035)
		}
	})
}

// BlendFromMoles keeps the mole ratio: the component molalities
// (f_i/M_i)·w/(1 − w) stand in the given ratio, and their sum is
// SaltMolPerKg·w/(1 − w) (definitions, exact up to rounding).
func TestMixBlendMoleRatio(t *testing.T) {
	p, err := NewMixProps(mixSalts(t, "NaCl", "MgCl2", "Na2SO4"), 298.15)
	if err != nil {
		t.Fatal(err)
	}
	x := []float64{0.7, 0.2, 0.1}
	b, err := p.BlendFromMoles(x)
	if err != nil {
		t.Fatal(err)
	}
	f := b.MassShares()
	sum := 0.0
	for i := range f {
		n := f[i] / p.comps[i].mKg
		sum += n
		if r := n / (f[0] / p.comps[0].mKg); math.Abs(r/(x[i]/x[0])-1) > 1e-14 {
			t.Errorf("component %d: mole ratio %g, want %g", i, r, x[i]/x[0])
		}
	}
	if math.Abs(sum/b.SaltMolPerKg()-1) > 1e-14 {
		t.Errorf("SaltMolPerKg = %g, Σ f_i/M_i = %g", b.SaltMolPerKg(), sum)
	}
}
