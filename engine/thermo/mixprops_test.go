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
	p, err := NewMixProps(mixSalts(t, "NaCl", "KHCO3", "glucose", "seawater"), 298.15)
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
