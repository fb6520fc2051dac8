package fit

import (
	"context"
	"errors"
	"strings"
	"testing"

	"drawsift/engine/errs"
	"drawsift/engine/scenario"
)

// fieldOf resolves spec and returns the error's field (fails when it
// resolves).
func fieldOf(t *testing.T, name string, spec *Spec) (string, string) {
	t.Helper()
	_, err := Resolve(spec)
	var ie *errs.InputError
	if !errors.As(err, &ie) {
		t.Errorf("%s: want an input error, got %v", name, err)
		return "", ""
	}
	return ie.Field, ie.Error()
}

// TestBadInput: every refusal names the row and the field (common
// practice; issue 13's bad-input list).
func TestBadInput(t *testing.T) {
	good := func() []Row { return simulate(t, stepped, 2, 0.4, 500, "real") }
	cases := []struct {
		name, field, text string
		spec              func() *Spec
	}{
		{"negative water flux", "data[3].water_flux_lmh", "outside", func() *Spec {
			r := good()
			r[3].WaterFluxLMH = ptr(-2)
			return &Spec{Data: r}
		}},
		{"zero reverse flux", "data[1].reverse_solute_flux_gmh", "outside", func() *Spec {
			r := good()
			r[1].ReverseSoluteFluxGMH = ptr(0)
			return &Spec{Data: r}
		}},
		{"missing water flux", "data[2].water_flux_lmh", "required", func() *Spec {
			r := good()
			r[2].WaterFluxLMH = nil
			return &Spec{Data: r}
		}},
		{"unknown solute", "data[0].draw.solute", "", func() *Spec {
			r := good()
			r[0].Draw = &scenario.Concentration{Solute: "NaCI2", Concentration: ptr(1), Unit: "mol/L"}
			return &Spec{Data: r}
		}},
		{"bad unit", "data[4].feed.unit", "", func() *Spec {
			r := good()
			r[4].Feed.Unit = "mol/m3"
			return &Spec{Data: r}
		}},
		{"fewer points than parameters", "data", "cannot determine", func() *Spec {
			r := good()[:1]
			r[0].ReverseSoluteFluxGMH = nil
			return &Spec{Data: r}
		}},
		{"fixed parameter without a value", "membrane.s_um", "not fitted", func() *Spec {
			return &Spec{Data: good(), Parameters: []string{"a", "b"}}
		}},
		{"unknown parameter", "parameters[1]", "unknown", func() *Spec {
			return &Spec{Data: good(), Parameters: []string{"a", "k"}}
		}},
		{"confidence", "confidence", "outside", func() *Spec {
			return &Spec{Data: good(), Confidence: ptr(95)}
		}},
		{"bootstrap budget", "bootstrap.samples", "budget", func() *Spec {
			return &Spec{Data: good(), Bootstrap: &BootstrapSpec{Samples: ptr(10000)}}
		}},
		{"both data and csv", "csv", "not both", func() *Spec {
			return &Spec{Data: good(), CSV: membranes2021}
		}},
		{"no data", "data", "no measurements", func() *Spec { return &Spec{} }},
		{"csv decimal comma with comma separator", "data[0]", "decimal comma", func() *Spec {
			return &Spec{CSV: "orientation,draw_solute,draw_concentration_mol_per_l,water_flux_lmh\nAL-FS,NaCl,0,5,8.5\n"}
		}},
		{"csv quoted decimal comma", "data[0].water_flux_lmh", "ambiguous", func() *Spec {
			return &Spec{CSV: "orientation,draw_solute,draw_concentration_mol_per_l,water_flux_lmh\nAL-FS,NaCl,0.5,\"8,5\"\n"}
		}},
		{"csv mixed separators", "data[1].water_flux_lmh", "mixes", func() *Spec {
			return &Spec{CSV: "orientation;draw_solute;draw_concentration_mol_per_l;water_flux_lmh\nAL-FS;NaCl;0,5;8,5\nAL-FS;NaCl;1,0;1.008,5\n"}
		}},
		{"csv unknown column", "csv", "unknown column", func() *Spec {
			return &Spec{CSV: "orientation,draw_solute,draw_concentration_mol_per_l,water_flux_lmh,flux2\nAL-FS,NaCl,0.5,8.5,1\n"}
		}},
		{"csv ambiguous molar unit", "csv", "ambiguous", func() *Spec {
			return &Spec{CSV: "orientation,draw_solute,draw_concentration_m,water_flux_lmh\nAL-FS,NaCl,0.5,8.5\n"}
		}},
		{"csv row error names its line", "data[1].water_flux_lmh", "CSV line 3", func() *Spec {
			return &Spec{CSV: "orientation,draw_solute,draw_concentration_mol_per_l,water_flux_lmh\nAL-FS,NaCl,0.5,8.5\nAL-FS,NaCl,1,-3\n"}
		}},
	}
	for _, c := range cases {
		f, msg := fieldOf(t, c.name, c.spec())
		if f != c.field || !strings.Contains(msg, c.text) {
			t.Errorf("%s: field %q (%s), want %q containing %q", c.name, f, msg, c.field, c.text)
		}
	}
}

// TestCSVUnits: the same data in mmol/L with semicolons and decimal
// commas, in M with brackets, and in the contract's spelling read alike
// (common unit spellings; never misread).
func TestCSVUnits(t *testing.T) {
	a, err := ParseCSV(membranes2021)
	if err != nil {
		t.Fatal(err)
	}
	b, err := ParseCSV("\ufefforientation;draw_solute;draw_concentration (M);feed_solute;feed_concentration_mmol_per_l;temperature (°C);water_flux (L/m2/h);reverse_solute_flux (g/m2/h)\n" +
		"# comment\nAL-DS;NaCl;0,5;NaCl;10;25;15,82;4,54\nAL-FS;NaCl;0,5;NaCl;10;25;8,51;2,74\n\nAL-DS;NaCl;2;NaCl;500;25;8,07;\nAL-FS;NaCl;2;NaCl;500;25;7,35;\n")
	if err != nil {
		t.Fatal(err)
	}
	if len(a) != 4 || len(b) != 4 {
		t.Fatalf("%d and %d rows", len(a), len(b))
	}
	off := false
	ra := runFit(t, &Spec{Data: a, ExternalCP: &off})
	rb := runFit(t, &Spec{Data: b, ExternalCP: &off})
	for j := range nParams {
		if e := relErr(rb.Params[j].Value, ra.Params[j].Value); e > 1e-9 {
			t.Errorf("%s: %g vs %g", ParamNames[j], rb.Params[j].Value, ra.Params[j].Value)
		}
	}
}

// TestWarnings: the identifiability warnings of issue 13 — S from AL-DS
// only, B without solute-flux data, too few concentration steps.
func TestWarnings(t *testing.T) {
	has := func(res *Result, subject string) bool {
		for _, w := range res.Warnings {
			if w.Code == Identifiability && w.Subject == subject {
				return true
			}
		}
		return false
	}
	ds := simulate(t, []cond{{"AL-DS", 0.5, 0.01}, {"AL-DS", 1, 0.01}, {"AL-DS", 2, 0.01}, {"AL-DS", 3, 0.01}}, 2, 0.4, 500, "real")
	if res := runFit(t, &Spec{Data: ds}); !has(res, "s") {
		t.Errorf("AL-DS only: no warning on S: %v", res.Warnings)
	}
	noJs := simulate(t, stepped, 2, 0.4, 500, "real")
	for i := range noJs {
		noJs[i].ReverseSoluteFluxGMH = nil
	}
	if res := runFit(t, &Spec{Data: noJs}); !has(res, "b") {
		t.Errorf("no Js: no warning on B: %v", res.Warnings)
	}
	two := simulate(t, []cond{{"AL-FS", 1, 0}, {"AL-FS", 2, 0}}, 2, 0.4, 500, "real")
	if res := runFit(t, &Spec{Data: two}); !has(res, "data") {
		t.Errorf("two conditions: no warning: %v", res.Warnings)
	}
	if res := runFit(t, &Spec{Data: simulate(t, stepped, 2, 0.4, 500, "real")}); len(res.Warnings) != 0 {
		t.Errorf("a well-designed set warns: %v", res.Warnings)
	}
}

// TestBootstrap: a seeded bootstrap reproduces, reports progress up to
// its total, and its intervals hold the estimate (Efron & Tibshirani
// 1993: percentile intervals; the check is self-consistency).
func TestBootstrap(t *testing.T) {
	rows := simulate(t, stepped, 2, 0.4, 500, "real")
	for i := range rows {
		rows[i].WaterFluxLMH = ptr(*rows[i].WaterFluxLMH * (1 + 0.02*float64(i%3-1)))
	}
	run := func() (*Result, int) {
		p, err := Resolve(&Spec{Data: rows, Bootstrap: &BootstrapSpec{Samples: ptr(200), Seed: ptr(7)}})
		if err != nil {
			t.Fatal(err)
		}
		last := 0
		res, err := Run(context.Background(), p, func(done, total int) {
			if total != 200 || done < last {
				t.Errorf("progress %d/%d after %d", done, total, last)
			}
			last = done
		})
		if err != nil {
			t.Fatal(err)
		}
		return res, last
	}
	a, last := run()
	b, _ := run()
	if last != 200 {
		t.Errorf("progress ended at %d", last)
	}
	for j := range nParams {
		ba, bb := a.Params[j].Bootstrap, b.Params[j].Bootstrap
		if ba == nil || *ba != *bb {
			t.Fatalf("%s: bootstrap %v vs %v", ParamNames[j], ba, bb)
		}
		if v := a.Params[j].Value; v < ba.Low || v > ba.High {
			t.Errorf("%s = %g outside its bootstrap interval [%g, %g]", ParamNames[j], v, ba.Low, ba.High)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	p, _ := Resolve(&Spec{Data: rows, Bootstrap: &BootstrapSpec{Samples: ptr(200)}})
	if _, err := Run(ctx, p, nil); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled bootstrap: %v", err)
	}
}

// BenchmarkFit3On8: a three-parameter fit on eight points, real osmotic
// model (issue 13's budget: < 50 ms native).
func BenchmarkFit3On8(b *testing.B) {
	rows := simulate(b, stepped, 2, 0.4, 500, "real")
	for i := range rows {
		rows[i].WaterFluxLMH = ptr(*rows[i].WaterFluxLMH * (1 + 0.02*float64(i%3-1)))
	}
	for b.Loop() {
		p, err := Resolve(&Spec{Data: rows})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := Run(context.Background(), p, nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkBootstrap1000: 1,000 resamples of the same fit.
func BenchmarkBootstrap1000(b *testing.B) {
	rows := simulate(b, stepped, 2, 0.4, 500, "real")
	for b.Loop() {
		p, err := Resolve(&Spec{Data: rows, Bootstrap: &BootstrapSpec{Samples: ptr(1000)}})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := Run(context.Background(), p, nil); err != nil {
			b.Fatal(err)
		}
	}
}
