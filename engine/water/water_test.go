package water

import (
	"encoding/csv"
	"fmt"
	"math"
	"os"
	"strconv"
	"testing"
)

// referenceCSV is produced by testdata/water_iapws.py with python3-iapws
// (Debian package 1.5.3-1, iapws.__version__ 1.5.2): IAPWS-95 density,
// IAPWS 2008 viscosity and IAPWS 1997 dielectric constant at 0.101325 MPa,
// 0–100 °C in steps of 5 °C.
const referenceCSV = "../../testdata/water_iapws95.csv"

// within reports whether got equals want to within tol, taken as an
// absolute tolerance when |want| < 1 and relative to |want| otherwise.
func within(got, want, tol float64) bool {
	if math.IsNaN(got) || math.IsInf(got, 0) {
		return false
	}
	scale := math.Max(1, math.Abs(want))
	return math.Abs(got-want) <= tol*scale
}

// relDev returns (got − want)/want.
func relDev(got, want float64) float64 { return (got - want) / want }

type referenceRow struct {
	tC, density, molarVolume, viscosity, dielectric float64
}

func readReference(t *testing.T) []referenceRow {
	t.Helper()
	f, err := os.Open(referenceCSV)
	if err != nil {
		t.Fatalf("reference table: %v (regenerate with /usr/bin/python3 testdata/water_iapws.py)", err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	r.FieldsPerRecord = 5
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatalf("reference table: %v", err)
	}
	want := []string{"t_c", "density_kg_per_m3", "molar_volume_m3_per_mol", "viscosity_pa_s", "dielectric"}
	if len(recs) < 2 {
		t.Fatalf("reference table: %d records, want a header and rows", len(recs))
	}
	for i, h := range want {
		if recs[0][i] != h {
			t.Fatalf("reference table column %d = %q, want %q", i, recs[0][i], h)
		}
	}
	var rows []referenceRow
	for n, rec := range recs[1:] {
		var v [5]float64
		for i, s := range rec {
			v[i], err = strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatalf("reference table row %d column %q: %v", n+1, want[i], err)
			}
		}
		rows = append(rows, referenceRow{v[0], v[1], v[2], v[3], v[4]})
	}
	// 0, 5, …, 100 °C.
	if len(rows) != 21 || rows[0].tC != 0 || rows[20].tC != 100 {
		t.Fatalf("reference table covers %d rows from %g to %g °C, want 21 rows 0–100 °C",
			len(rows), rows[0].tC, rows[len(rows)-1].tC)
	}
	return rows
}

// TestAgainstIAPWS compares every function with python3-iapws over 0–100 °C.
func TestAgainstIAPWS(t *testing.T) {
	rows := readReference(t)
	for _, c := range []struct {
		name string
		f    func(float64) float64
		ref  func(referenceRow) float64
		tol  float64 // relative
	}{
		// Kell (1975) vs IAPWS-95. Required by the product: molar volume
		// within 0.05 %. Measured max |deviation|: 1.5e-5 (at 100 °C; Go
		// 1.26, linux/amd64 and js/wasm), which includes the 0.7 ppm
		// molar-mass difference (18.01528 vs IAPWS-95's 18.015268 g/mol).
		{"MolarVolume", MolarVolume, func(r referenceRow) float64 { return r.molarVolume }, 5e-4},
		// The same comparison, tight enough to catch a misprinted Kell
		// coefficient (the 16.897850e-3 denominator misprint is 6.5e-4 off
		// at 100 °C). Kell's t is IPTS-68 and is used with ITS-90 here
		// (≤ ~2e-5 at 100 °C). Measured: 1.5e-5 (at 100 °C).
		{"Density", Density, func(r referenceRow) float64 { return r.density }, 3e-5},
		// IAPWS 2008 on both sides; only the density input differs (Kell vs
		// IAPWS-95, ≤ 1.5e-5, amplified about twofold by μ̄1) and μ̄2 = 1
		// exactly here (CSV header). Measured: 3.0e-5 (at 100 °C). The
		// product asks for 0.5 %; 1e-4 is used because anything above it can
		// only be a coefficient typo.
		{"Viscosity", Viscosity, func(r referenceRow) float64 { return r.viscosity }, 1e-4},
		// IAPWS 1997 on both sides, density input differs as above.
		// Measured: 2.0e-5 (at 100 °C). The product asks for 0.5 % (the
		// spread between measured data sets is of that order: Malmberg &
		// Maryott differ by ≤ 0.35 %, see TestDielectricMalmbergMaryott);
		// 1e-4 catches coefficient typos.
		{"DielectricConstant", DielectricConstant, func(r referenceRow) float64 { return r.dielectric }, 1e-4},
	} {
		t.Run(c.name, func(t *testing.T) {
			var worst, worstT float64
			for _, r := range rows {
				tK := r.tC + celsiusOffsetK
				got, want := c.f(tK), c.ref(r)
				d := relDev(got, want)
				if math.Abs(d) > math.Abs(worst) || math.IsNaN(d) {
					worst, worstT = d, r.tC
				}
				if math.IsNaN(got) || math.IsInf(got, 0) || math.Abs(d) > c.tol {
					t.Errorf("%s(%g °C) = %.10g, want %.10g (python3-iapws), rel. dev. %.2e > %.1e",
						c.name, r.tC, got, want, d, c.tol)
				}
			}
			t.Logf("%s: max rel. dev. %.2e at %g °C (tol %.1e)", c.name, worst, worstT, c.tol)
		})
	}
}

// TestPublishedPoints checks single published values.
func TestPublishedPoints(t *testing.T) {
	for _, c := range []struct {
		name      string
		f         func(float64) float64
		tC        float64
		want, tol float64 // tol relative
	}{
		// IAPWS-95 (Wagner & Pruß 2002, J. Phys. Chem. Ref. Data 31:387) at
		// 25 °C and 0.1 MPa: 997.047 kg/m³ (python3-iapws 1.5.2 gives
		// 997.04704; at 0.101325 MPa 997.04764). Kell's equation gives
		// 997.0449: his 1975 density scale sits ~3 ppm below IAPWS-95 at
		// 25 °C. Tolerance 5e-6 covers that and the 0.6 ppm pressure shift,
		// and is wider than the 5e-7 printed precision.
		{"Density", Density, 25, 997.047, 5e-6},
		// IAPWS 2008 viscosity at 20 °C, 0.101325 MPa: 1.0016 mPa·s, the value
		// ISO/TR 3666 adopts for calibration (from memory); python3-iapws
		// gives 1.001596 mPa·s. Tolerance = the printed precision, ±0.5 in
		// the last digit (5e-5 relative).
		{"Viscosity", Viscosity, 20, 1.0016e-3, 5e-5},
		// IAPWS 1997 dielectric release at 25 °C, 0.101325 MPa: 78.408
		// (python3-iapws 1.5.2). Printed to 5 figures: tolerance 1e-5.
		{"DielectricConstant", DielectricConstant, 25, 78.408, 1e-5},
		// Malmberg & Maryott (1956, J. Res. NBS 56:1), measured: 78.30 at
		// 25 °C (from memory). The IAPWS 1997 fit of all data sets lies
		// 0.13 % above it here; tolerance 0.2 %.
		{"DielectricConstant/MalmbergMaryott", DielectricConstant, 25, 78.30, 2e-3},
	} {
		got := c.f(c.tC + celsiusOffsetK)
		if d := relDev(got, c.want); math.IsNaN(d) || math.Abs(d) > c.tol {
			t.Errorf("%s(%g °C) = %.7g, want %.7g ± %.1e (rel. dev. %.2e)", c.name, c.tC, got, c.want, c.tol, d)
		}
	}
}

// TestReleaseCheckValues checks the density-explicit formulations against
// the verification values printed in the IAPWS releases, independently of
// Kell's density. The releases print 9 significant figures.
func TestReleaseCheckValues(t *testing.T) {
	for _, c := range []struct {
		name         string
		f            func(rho, tK float64) float64
		rho, tK      float64
		want, tolRel float64
	}{
		// IAPWS 2008 viscosity release, check table (μ in µPa·s, μ̄2 = 1 at
		// these states). 889.735100 is also quoted in python3-iapws 1.5.2's
		// _Viscosity docstring; the other two are from memory and agree with
		// python3-iapws to all printed digits (1437.649467, 307.883622).
		{"viscosity", viscosity, 998, 298.15, 889.735100e-6, 1e-8},
		{"viscosity", viscosity, 1200, 298.15, 1437.649467e-6, 1e-8},
		{"viscosity", viscosity, 1000, 373.15, 307.883622e-6, 1e-8},
		// IAPWS 1997 dielectric release, check table, as quoted in
		// python3-iapws 1.5.2's _Dielectric docstring. The 873.15 K row
		// tests the high-power terms that are small in liquid water.
		{"dielectric", dielectric, 999.242866, 298.15, 78.5907250, 1e-8},
		{"dielectric", dielectric, 26.0569558, 873.15, 1.12620970, 1e-8},
	} {
		got := c.f(c.rho, c.tK)
		if d := relDev(got, c.want); math.IsNaN(d) || math.Abs(d) > c.tolRel {
			t.Errorf("%s(ρ=%g, T=%g) = %.10g, want %.10g (rel. dev. %.2e)", c.name, c.rho, c.tK, got, c.want, d)
		}
	}
}

// TestDielectricMalmbergMaryott compares with the polynomial fit of
// Malmberg & Maryott (1956, J. Res. NBS 56:1) to their measurements,
// 0–100 °C (coefficients from memory):
//
//	ε = 87.740 − 0.40008 t + 9.398×10⁻⁴ t² − 1.410×10⁻⁶ t³
//
// an independent source for the whole range. The two differ by up to 0.35 %
// (at 100 °C, computed here); tolerance 0.5 %, the product requirement.
func TestDielectricMalmbergMaryott(t *testing.T) {
	for tC := 0.0; tC <= 100; tC += 2.5 {
		want := 87.740 + tC*(-0.40008+tC*(9.398e-4+tC*(-1.410e-6)))
		got := DielectricConstant(tC + celsiusOffsetK)
		if d := relDev(got, want); math.IsNaN(d) || math.Abs(d) > 5e-3 {
			t.Errorf("DielectricConstant(%g °C) = %.5g, Malmberg & Maryott %.5g (rel. dev. %.2e)", tC, got, want, d)
		}
	}
}

// TestShape checks properties that hold for liquid water over the range:
// every value finite and positive, the density maximum near 3.98 °C (Kell
// 1975 gives 3.98 °C, from memory; common knowledge), viscosity and
// permittivity falling with temperature, and V_m·ρ = M.
func TestShape(t *testing.T) {
	const steps = 10000
	var tMax, rhoMax float64
	prevEta, prevEps := math.Inf(1), math.Inf(1)
	for k := 0; k <= steps; k++ {
		tK := MinTemperatureK + (MaxTemperatureK-MinTemperatureK)*float64(k)/steps
		if k == steps {
			tK = MaxTemperatureK
		}
		if !InRange(tK) {
			t.Fatalf("InRange(%v) = false", tK)
		}
		rho, vm, eta, eps := Density(tK), MolarVolume(tK), Viscosity(tK), DielectricConstant(tK)
		for _, v := range []float64{rho, vm, eta, eps} {
			if math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 {
				t.Fatalf("at %v K: ρ=%v V=%v μ=%v ε=%v, want finite and positive", tK, rho, vm, eta, eps)
			}
		}
		if rho > rhoMax {
			rhoMax, tMax = rho, tK
		}
		if eta >= prevEta || eps >= prevEps {
			t.Fatalf("at %v K: μ or ε not decreasing (μ %v→%v, ε %v→%v)", tK, prevEta, eta, prevEps, eps)
		}
		prevEta, prevEps = eta, eps
		if !within(vm*rho, MolarMassKgPerMol, 1e-15) {
			t.Fatalf("at %v K: V_m·ρ = %v, want %v", tK, vm*rho, MolarMassKgPerMol)
		}
	}
	if tC := tMax - celsiusOffsetK; math.Abs(tC-3.98) > 0.02 {
		t.Errorf("density maximum at %.3f °C, want 3.98 ± 0.02 °C", tC)
	}
}

func TestInRange(t *testing.T) {
	for _, c := range []struct {
		tK   float64
		want bool
	}{
		{273.15, true}, {298.15, true}, {373.15, true},
		{math.Nextafter(273.15, 0), false}, {math.Nextafter(373.15, 1000), false},
		{0, false}, {-1, false}, {math.NaN(), false}, {math.Inf(1), false}, {math.Inf(-1), false},
	} {
		if got := InRange(c.tK); got != c.want {
			t.Errorf("InRange(%v) = %v, want %v", c.tK, got, c.want)
		}
	}
}

// TestSpecialCases checks the "Special cases are:" lists of the doc comments.
func TestSpecialCases(t *testing.T) {
	funcs := []struct {
		name string
		f    func(float64) float64
	}{{"Density", Density}, {"MolarVolume", MolarVolume}, {"Viscosity", Viscosity}, {"DielectricConstant", DielectricConstant}}
	for _, fn := range funcs {
		for _, x := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
			if got := fn.f(x); !math.IsNaN(got) {
				t.Errorf("%s(%v) = %v, want NaN", fn.name, x, got)
			}
		}
		// Just outside the range the formulas still give finite, physical-looking values.
		for _, tK := range []float64{270, 380} {
			if got := fn.f(tK); math.IsNaN(got) || math.IsInf(got, 0) || got <= 0 {
				t.Errorf("%s(%v) = %v, want the formula's finite value", fn.name, tK, got)
			}
		}
	}
	if got := DielectricConstant(dielectricSingularTempK); !math.IsInf(got, 1) {
		t.Errorf("DielectricConstant(228) = %v, want +Inf", got)
	}
	if got := DielectricConstant(200); !math.IsNaN(got) {
		t.Errorf("DielectricConstant(200) = %v, want NaN", got)
	}
}

// sink keeps benchmark results alive.
var sink float64

func benchmarkRange(b *testing.B, f func(float64) float64) {
	b.ReportAllocs()
	tK := MinTemperatureK
	for i := 0; i < b.N; i++ {
		sink += f(tK)
		tK += 0.37
		if tK > MaxTemperatureK {
			tK = MinTemperatureK
		}
	}
}

func BenchmarkDensity(b *testing.B)            { benchmarkRange(b, Density) }
func BenchmarkMolarVolume(b *testing.B)        { benchmarkRange(b, MolarVolume) }
func BenchmarkViscosity(b *testing.B)          { benchmarkRange(b, Viscosity) }
func BenchmarkDielectricConstant(b *testing.B) { benchmarkRange(b, DielectricConstant) }

func Example() {
	tK := 298.15 // 25 °C
	if !InRange(tK) {
		fmt.Println("temperature out of range")
		return
	}
	fmt.Printf("density %.4g kg/m³\n", Density(tK))
	fmt.Printf("molar volume %.4g m³/mol\n", MolarVolume(tK))
	fmt.Printf("viscosity %.4g Pa·s\n", Viscosity(tK))
	fmt.Printf("dielectric constant %.4g\n", DielectricConstant(tK))
	// Output:
	// density 997 kg/m³
	// molar volume 1.807e-05 m³/mol
	// viscosity 0.00089 Pa·s
	// dielectric constant 78.41
}
