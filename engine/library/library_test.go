package library

import (
	"fmt"
	"math"
	"reflect"
	"regexp"
	"sort"
	"strings"
	"testing"

	"drawsift/data"
	"drawsift/engine/internal/jsonx"
)

// requiredIDs are the solutes the screening catalogue must offer.
var requiredIDs = []string{
	"NaCl", "KCl", "LiCl", "MgCl2", "CaCl2", "NH4Cl",
	"Na2SO4", "K2SO4", "MgSO4", "(NH4)2SO4", "Li2SO4",
	"NaNO3", "KNO3", "NH4NO3", "Ca(NO3)2", "Mg(NO3)2", "LiNO3",
	"NaHCO3", "KHCO3", "NH4HCO3", "KBr", "NaBr",
	"HCOONa", "CH3COONa", "CH3COOK", "glucose", "sucrose", "glycerol", "seawater",
}

func mustLib(t *testing.T) *Library {
	t.Helper()
	l, err := Default()
	if err != nil {
		t.Fatalf("Default(): %v", err)
	}
	return l
}

func TestDefaultParses(t *testing.T) {
	l := mustLib(t)
	if n := len(l.All()); n < 27 {
		t.Fatalf("embedded library has %d solutes, want at least 27", n)
	}
	ids := l.IDs()
	if !sort.StringsAreSorted(ids) {
		t.Errorf("IDs() not sorted: %v", ids)
	}
	for _, id := range requiredIDs {
		s, ok := l.Lookup(id)
		if !ok {
			t.Errorf("required solute %q missing", id)
			continue
		}
		if s.ID != id {
			t.Errorf("Lookup(%q) returned %q, want the record with exactly that ID", id, s.ID)
		}
	}
	families := map[string]bool{"chloride": true, "sulfate": true, "nitrate": true, "bicarbonate": true,
		"bromide": true, "organic-salt": true, "non-electrolyte": true, "seawater": true}
	flags := map[string]bool{"oxidizer": true, "toxic": true, "corrosive": true, "ammonia-release": true,
		"nutrient": true, "scaling": true, "irritant": true, "flammable-decomposition": true}
	for _, s := range l.All() {
		if !families[s.Family] {
			t.Errorf("%s: unknown family %q", s.ID, s.Family)
		}
		for _, f := range s.HazardFlags {
			if !flags[f] {
				t.Errorf("%s: unknown hazard flag %q", s.ID, f)
			}
		}
		if len(s.Regeneration) == 0 {
			t.Errorf("%s: no regeneration route", s.ID)
		}
	}
}

func TestLookupCaseInsensitive(t *testing.T) {
	l := mustLib(t)
	for _, s := range l.All() {
		for _, name := range append([]string{s.ID}, s.Aliases...) {
			for _, q := range []string{name, strings.ToUpper(name), strings.ToLower(name), "  " + name + " "} {
				got, ok := l.Lookup(q)
				if !ok {
					t.Errorf("Lookup(%q) (name of %s) not found", q, s.ID)
					continue
				}
				if got != s {
					t.Errorf("Lookup(%q) = %s, want %s", q, got.ID, s.ID)
				}
			}
		}
	}
	if s, ok := l.Lookup("unobtainium chloride"); ok {
		t.Errorf("Lookup of an unknown name returned %s", s.ID)
	}
}

func TestCommonNames(t *testing.T) {
	l := mustLib(t)
	for name, want := range map[string]string{
		"sodium chloride":   "NaCl",
		"Epsom salt":        "MgSO4",
		"sodium formate":    "HCOONa",
		"NaHCO2":            "HCOONa",
		"NaHCO3":            "NaHCO3", // not to be confused with sodium formate
		"NaOAc":             "CH3COONa",
		"sodium acetate":    "CH3COONa",
		"KOAc":              "CH3COOK",
		"potassium acetate": "CH3COOK",
		"dextrose":          "glucose",
		"C6H12O6":           "glucose",
		"C12H22O11":         "sucrose",
		"glycerin":          "glycerol",
		"C3H8O3":            "glycerol",
		"ammonium sulfate":  "(NH4)2SO4",
		"(nh4)2so4":         "(NH4)2SO4",
		"calcium nitrate":   "Ca(NO3)2",
	} {
		s, ok := l.Lookup(name)
		if !ok || s.ID != want {
			got := "nothing"
			if ok {
				got = s.ID
			}
			t.Errorf("Lookup(%q) = %s, want %s", name, got, want)
		}
	}
}

func TestParseRejectsUnknownField(t *testing.T) {
	_, err := Parse([]byte(`{"schema_version":1,"solutes":[{"id":"X","molar_mass_g_per_mol":1,"bogus":1}]}`))
	if err == nil {
		t.Fatal("Parse accepted an unknown field")
	}
}

var indexRE = regexp.MustCompile(`\[\d+\]`)

// walk calls leaf for every numeric leaf below v and node for every path.
func walk(path string, v any, node func(path string), leaf func(path string)) {
	if path != "" {
		node(path)
	}
	join := func(k string) string {
		if path == "" {
			return k
		}
		return path + "." + k
	}
	switch x := v.(type) {
	case map[string]any:
		for k, c := range x {
			walk(join(k), c, node, leaf)
		}
	case []any:
		for i, c := range x {
			walk(fmt.Sprintf("%s[%d]", path, i), c, node, leaf)
		}
	case float64:
		leaf(path)
	}
}

func rawSolutes(t *testing.T) []map[string]any {
	t.Helper()
	b, err := data.FS.ReadFile("solutes.json")
	if err != nil {
		t.Fatal(err)
	}
	var raw struct {
		Solutes []map[string]any `json:"solutes"`
	}
	if err := jsonx.Unmarshal(b, &raw); err != nil {
		t.Fatal(err)
	}
	if len(raw.Solutes) == 0 {
		t.Fatal("no solutes in the raw file")
	}
	return raw.Solutes
}

// TestProvenance checks the project rule that every number in the data
// names its source: for each numeric leaf (e.g. "osmotic_model.beta0" or
// "solubility.points[0].molality_mol_per_kg") the record's sources map
// has a key that is the leaf's path, or a prefix of it, with index
// brackets removed; every source text is non-empty; and every source key
// names a field that exists in the record.
func TestProvenance(t *testing.T) {
	for _, rec := range rawSolutes(t) {
		id, _ := rec["id"].(string)
		srcRaw, ok := rec["sources"].(map[string]any)
		if !ok || len(srcRaw) == 0 {
			t.Errorf("%s: no sources map", id)
			continue
		}
		sources := map[string]string{}
		for k, v := range srcRaw {
			s, ok := v.(string)
			if !ok || strings.TrimSpace(s) == "" {
				t.Errorf("%s: source %q is empty or not text", id, k)
			}
			sources[k] = s
		}
		body := map[string]any{}
		for k, v := range rec {
			if k != "sources" {
				body[k] = v
			}
		}
		nodes := map[string]bool{}
		nLeaves := 0
		walk("", body,
			func(p string) { nodes[indexRE.ReplaceAllString(p, "")] = true },
			func(p string) {
				nLeaves++
				bare := indexRE.ReplaceAllString(p, "")
				for k := range sources {
					if bare == k || strings.HasPrefix(bare, k+".") {
						return
					}
				}
				t.Errorf("%s: number at %s has no source (no sources key is a prefix of %q)", id, p, bare)
			})
		if nLeaves == 0 {
			t.Errorf("%s: record has no numbers", id)
		}
		for k := range sources {
			if !nodes[k] {
				t.Errorf("%s: sources key %q names no field of the record", id, k)
			}
		}
	}
}

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// TestPitzerMayorgaConvention checks the 2-1 and 1-2 records that take
// their 25 °C parameters from Pitzer & Mayorga (1973) Table VI, which
// prints (4/3)β⁽⁰⁾, (4/3)β⁽¹⁾ and (2^{5/2}/3)C^φ: the stored plain values
// must be the tabulated ones times 3/4 and 3/2^{5/2}.
func TestPitzerMayorgaConvention(t *testing.T) {
	l := mustLib(t)
	cf := 3 / math.Pow(2, 2.5)
	// Tabulated values: Pitzer & Mayorga (1973) J. Phys. Chem. 77:2300,
	// Table VI, as transcribed in pytzer (PM73 functions).
	for _, c := range []struct {
		id           string
		b0, b1, cphi float64
	}{
		{"MgCl2", 0.4698, 2.242, 0.00979},
		{"CaCl2", 0.4212, 2.152, -0.00064},
		{"(NH4)2SO4", 0.0545, 0.878, -0.00219},
		{"Ca(NO3)2", 0.2811, 1.879, -0.03798},
		{"Mg(NO3)2", 0.4895, 2.113, -0.03889},
		{"Li2SO4", 0.1817, 1.694, -0.00753},
	} {
		s, ok := l.Lookup(c.id)
		if !ok {
			t.Errorf("%s missing", c.id)
			continue
		}
		m := s.Osmotic
		// Tolerance: the tabulated values have 3–4 significant figures;
		// HMW84's independently printed plain values (MgCl2, CaCl2) agree
		// with the conversion to that precision.
		const tol = 2e-3
		if relErr(m.Beta0, 0.75*c.b0) > tol || relErr(m.Beta1, 0.75*c.b1) > tol || relErr(m.CPhi, cf*c.cphi) > 5e-3 {
			t.Errorf("%s: stored %g / %g / %g, want plain %g / %g / %g", c.id,
				m.Beta0, m.Beta1, m.CPhi, 0.75*c.b0, 0.75*c.b1, cf*c.cphi)
		}
	}
}

// TestTable13Derivatives checks the conversion of Pitzer (1991) ch. 3
// Table 13's third column (C = C^φ/(2√|z_M z_X|)) into dC^φ/dT, and that
// its β columns are stored as printed (already plain: they equal 3/4 ×
// Silvester & Pitzer 1978 Table II, e.g. Na2SO4 3.156e-3 × 3/4 = 2.367e-3).
func TestTable13Derivatives(t *testing.T) {
	l := mustLib(t)
	// Printed values: Pitzer (1991) Table 13, as transcribed in pytzer
	// (P91_Ch3_T13_I/II).
	for _, c := range []struct {
		id              string
		db0, db1, c, zz float64
	}{
		{"CaCl2", -0.561e-3, 2.66e-3, -0.723e-4, 2},
		{"Na2SO4", 2.367e-3, 5.63e-3, -1.725e-4, 2},
		{"Li2SO4", 0.506e-3, 1.41e-3, -0.825e-4, 2},
		{"MgSO4", -0.690e-3, 1.530e-2, 0.131e-3, 4},
	} {
		s, _ := l.Lookup(c.id)
		tf := s.Osmotic.Temperature
		if tf == nil || tf.Kind != TempLinear {
			t.Errorf("%s: want a linear temperature fit", c.id)
			continue
		}
		want := 2 * math.Sqrt(c.zz) * c.c
		if relErr(tf.DBeta0DT, c.db0) > 1e-9 || relErr(tf.DBeta1DT, c.db1) > 1e-9 || relErr(tf.DCPhiDT, want) > 1e-3 {
			t.Errorf("%s: stored %g / %g / %g, want %g / %g / %g", c.id, tf.DBeta0DT, tf.DBeta1DT, tf.DCPhiDT, c.db0, c.db1, want)
		}
		if !(tf.MaxMolalityMolPerKg > 0) {
			t.Errorf("%s: Table 13 lists a maximum molality; temperature.max_molality_mol_per_kg not set", c.id)
		}
	}
}

// waterDensity20C is ρ of pure water at 20 °C, kg/m³ (IAPWS-95 value
// 998.207, from memory).
const waterDensity20C = 998.207

// TestLaliberteNaClDensity checks that the stored Laliberté parameters are
// in the units the laliberte-cooper-2004 formula expects, against the CRC
// Handbook 102nd ed. table "Concentrative properties of aqueous solutions"
// (20 °C; NaCl rows at 16, 20 and 26 mass %, as transcribed in the open
// CRC-Solution-Properties data set). Tolerance 1 kg/m³ ≈ 0.1 %, the
// accuracy Laliberté & Cooper (2004) report for their fits.
func TestLaliberteNaClDensity(t *testing.T) {
	s, _ := mustLib(t).Lookup("NaCl")
	d := s.Density
	if d == nil || d.Kind != DensityLaliberteCooper {
		t.Fatal("NaCl needs a laliberte-cooper-2004 density model")
	}
	for _, c := range []struct{ w, rho float64 }{{0.16, 1116.2}, {0.20, 1147.8}, {0.26, 1197.2}} {
		const tC = 20
		app := (d.C0*c.w + d.C1) * math.Exp(1e-6*(tC+d.C4)*(tC+d.C4)) / (c.w + d.C2 + d.C3*tC)
		rho := 1 / ((1-c.w)/waterDensity20C + c.w/app)
		if math.Abs(rho-c.rho) > 1.0 {
			t.Errorf("NaCl w=%g, 20 °C: ρ = %.1f kg/m³, CRC %.1f", c.w, rho, c.rho)
		}
	}
}

// TestApparentMolarVolumeDensity checks the V_φ fits of glucose and
// glycerol against the CRC densities they were fitted to (same CRC table,
// 20 °C). Tolerance 1 kg/m³ (the fits reproduce the table within 0.6).
func TestApparentMolarVolumeDensity(t *testing.T) {
	l := mustLib(t)
	for _, c := range []struct {
		id     string
		m, rho float64 // mol/kg, kg/m³
	}{
		{"glucose", 0.617, 1037.5}, {"glucose", 2.379, 1124.6}, {"glucose", 5.551, 1223.5},
		{"glycerol", 1.207, 1021.5}, {"glycerol", 4.223, 1066.4}, {"glycerol", 10.024, 1120.0},
	} {
		s, _ := l.Lookup(c.id)
		d := s.Density
		if d == nil || d.Kind != DensityApparentMolarVolume {
			t.Errorf("%s: want an apparent-molar-volume density", c.id)
			continue
		}
		vol := 1/waterDensity20C + c.m*(d.V0CM3PerMol+d.V1*c.m)*1e-6 // m³ per kg water
		rho := (1 + c.m*s.MolarMassKgPerMol()) / vol
		if math.Abs(rho-c.rho) > 1.0 {
			t.Errorf("%s m=%g, 20 °C: ρ = %.1f kg/m³, CRC %.1f", c.id, c.m, rho, c.rho)
		}
	}
}

// TestNaClSolubility checks the stored 25 °C point against Potter, Babcock
// & Brown (1977): wt % = 26.218 + 0.0072 t + 0.000106 t².
func TestNaClSolubility(t *testing.T) {
	s, _ := mustLib(t).Lookup("NaCl")
	found := false
	for _, p := range s.Solubility.Points {
		if p.TemperatureC != 25 {
			continue
		}
		found = true
		w := (26.218 + 0.0072*25 + 0.000106*25*25) / 100
		want := w / ((1 - w) * s.MolarMassKgPerMol())
		if math.Abs(p.MolalityMolPerKg-want) > 2e-3 {
			t.Errorf("NaCl solubility at 25 °C = %g mol/kg, Potter et al. give %.4f", p.MolalityMolPerKg, want)
		}
	}
	if !found {
		t.Error("NaCl has no 25 °C solubility point")
	}
}

// TestNernstHartley checks the stored infinite-dilution salt diffusivities
// against D = (|z+|+|z−|) D+ D− / (|z+| D+ + |z−| D−) from the stored
// ionic values, and NaCl/MgCl2/MgSO4 against the CRC infinite-dilution
// values 1.610, 1.249, 0.849 ×10⁻⁹ m²/s (from memory).
func TestNernstHartley(t *testing.T) {
	l := mustLib(t)
	for _, s := range l.All() {
		if len(s.Ions) != 2 {
			continue
		}
		p, m := s.Ions[0], s.Ions[1]
		if p.Charge < 0 {
			p, m = m, p
		}
		zp, zm := float64(p.Charge), -float64(m.Charge)
		want := (zp + zm) * p.DiffusivityM2PerS * m.DiffusivityM2PerS / (zp*p.DiffusivityM2PerS + zm*m.DiffusivityM2PerS)
		if relErr(s.Diffusivity.D0M2PerS, want) > 1e-3 {
			t.Errorf("%s: d0 = %g, Nernst–Hartley gives %g", s.ID, s.Diffusivity.D0M2PerS, want)
		}
	}
	for id, want := range map[string]float64{"NaCl": 1.610e-9, "MgCl2": 1.249e-9, "MgSO4": 0.849e-9} {
		s, _ := l.Lookup(id)
		if relErr(s.Diffusivity.D0M2PerS, want) > 2e-3 {
			t.Errorf("%s: d0 = %g, CRC %g", id, s.Diffusivity.D0M2PerS, want)
		}
	}
}

// TestMolarMass recomputes a few molar masses from IUPAC standard atomic
// weights (conventional values).
func TestMolarMass(t *testing.T) {
	l := mustLib(t)
	const (
		H, C, N, O, Na, Mg, S, Cl, K = 1.008, 12.011, 14.007, 15.999, 22.98976928, 24.305, 32.06, 35.45, 39.0983
	)
	for id, want := range map[string]float64{
		"NaCl":      Na + Cl,
		"MgSO4":     Mg + S + 4*O,
		"(NH4)2SO4": 2*(N+4*H) + S + 4*O,
		"CH3COOK":   2*C + 3*H + 2*O + K,
		"sucrose":   12*C + 22*H + 11*O,
	} {
		s, _ := l.Lookup(id)
		if math.Abs(s.MolarMassGPerMol-want) > 1e-3 {
			t.Errorf("%s: molar mass %g, want %g", id, s.MolarMassGPerMol, want)
		}
	}
}

// TestSchemaMatchesTypes keeps data/solutes.schema.json in step with the
// Go types: each object definition lists exactly the JSON fields of its
// struct.
func TestSchemaMatchesTypes(t *testing.T) {
	b, err := data.FS.ReadFile("solutes.schema.json")
	if err != nil {
		t.Fatal(err)
	}
	var schema struct {
		Defs map[string]struct {
			Properties map[string]any `json:"properties"`
		} `json:"$defs"`
	}
	if err := jsonx.Unmarshal(b, &schema); err != nil {
		t.Fatal(err)
	}
	for def, typ := range map[string]reflect.Type{
		"solute":         reflect.TypeOf(Solute{}),
		"ion":            reflect.TypeOf(Ion{}),
		"osmoticModel":   reflect.TypeOf(OsmoticModel{}),
		"temperatureFit": reflect.TypeOf(TemperatureFit{}),
		"piTable":        reflect.TypeOf(PiTable{}),
		"density":        reflect.TypeOf(DensityModel{}),
		"viscosity":      reflect.TypeOf(ViscosityModel{}),
		"solubility":     reflect.TypeOf(Solubility{}),
		"diffusivity":    reflect.TypeOf(Diffusivity{}),
		"price":          reflect.TypeOf(Price{}),
	} {
		d, ok := schema.Defs[def]
		if !ok {
			t.Errorf("schema has no $defs/%s", def)
			continue
		}
		var want, got []string
		for i := 0; i < typ.NumField(); i++ {
			if name := strings.Split(typ.Field(i).Tag.Get("json"), ",")[0]; typ.Field(i).IsExported() && name != "-" {
				want = append(want, name)
			}
		}
		for k := range d.Properties {
			got = append(got, k)
		}
		sort.Strings(want)
		sort.Strings(got)
		if !reflect.DeepEqual(want, got) {
			t.Errorf("$defs/%s properties %v, Go type %s has %v", def, got, typ.Name(), want)
		}
	}
}
