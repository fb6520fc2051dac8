package thermo

import (
	"fmt"
	"strings"
)

// Unit is a concentration unit of the contract.
type Unit int

// Concentration units. Mass-based "g/kg" and "wt%" are per kilogram of
// solution (the salinity convention); "mol/kg" is per kilogram of water.
const (
	MolPerKg   Unit = iota // molality, mol per kg of water
	MolPerL                // molarity, mol per litre of solution
	GPerL                  // grams of solute per litre of solution
	GPerKg                 // grams of solute per kg of solution
	WtPercent              // mass percent of solute in solution
	OsmolPerKg             // osmolality ν·m·φ, osmol per kg of water
)

var unitNames = [...]string{"mol/kg", "mol/L", "g/L", "g/kg", "wt%", "osmol/kg"}

// String returns the contract's spelling of the unit.
func (u Unit) String() string {
	if int(u) < len(unitNames) {
		return unitNames[u]
	}
	return fmt.Sprintf("Unit(%d)", int(u))
}

// UnitNames lists the accepted unit spellings.
func UnitNames() []string { return unitNames[:] }

// ParseUnit reads a contract unit, case-insensitively ("mol/l", "M" and
// "m" are not accepted: the case of a lone letter is too easy to get wrong).
func ParseUnit(s string) (Unit, error) {
	k := strings.ToLower(strings.ReplaceAll(strings.TrimSpace(s), " ", ""))
	switch k {
	case "mol/kg":
		return MolPerKg, nil
	case "mol/l":
		return MolPerL, nil
	case "g/l":
		return GPerL, nil
	case "g/kg":
		return GPerKg, nil
	case "wt%", "%", "wt.%", "mass%":
		return WtPercent, nil
	case "osmol/kg", "osm/kg":
		return OsmolPerKg, nil
	}
	return 0, fmt.Errorf("unknown unit %q (accepted: %s)", s, strings.Join(unitNames[:], ", "))
}

// ParseScaledUnit accepts the units of ParseUnit and the common
// submultiples and symbols of the trade: M (mol/L), mM and mmol/L
// (10⁻³ mol/L), mmol/kg (10⁻³ mol/kg), mg/L (10⁻³ g/L), mg/kg (10⁻³ g/kg)
// and mOsm/kg (10⁻³ osmol/kg). It returns the unit and the factor that
// takes a value into it. "M" and "mM" are case-sensitive (a lower-case m
// is the molal symbol in some texts, so "m" alone is refused).
func ParseScaledUnit(s string) (Unit, float64, error) {
	t := strings.ReplaceAll(strings.TrimSpace(s), " ", "")
	switch t {
	case "M":
		return MolPerL, 1, nil
	case "mM":
		return MolPerL, 1e-3, nil
	}
	switch strings.ToLower(t) {
	case "mmol/l":
		return MolPerL, 1e-3, nil
	case "mmol/kg":
		return MolPerKg, 1e-3, nil
	case "mg/l":
		return GPerL, 1e-3, nil
	case "mg/kg":
		return GPerKg, 1e-3, nil
	case "mosm/kg", "mosmol/kg":
		return OsmolPerKg, 1e-3, nil
	}
	u, err := ParseUnit(s)
	if err != nil {
		return 0, 0, fmt.Errorf("unknown unit %q (accepted: %s, and M, mM, mmol/L, mmol/kg, mg/L, mg/kg, mOsm/kg)", s, strings.Join(unitNames[:], ", "))
	}
	return u, 1, nil
}

// Unit conversions: the engine's one table of them (DEVELOPERS.md,
// "SI inside, units in every name outside"). Each constant XPerY is the
// number of X in one Y, so a value in Y times XPerY is in X; every factor
// here is exact by the definitions of the units.
const (
	// PascalPerBar: 1 bar = 1e5 Pa (exact).
	PascalPerBar = 1e5
	// PascalPerKPa, PascalPerMPa: SI prefixes (exact).
	PascalPerKPa = 1e3
	PascalPerMPa = 1e6
	// PascalPerAtm: the standard atmosphere, 101 325 Pa (exact; 10th CGPM,
	// 1954, Resolution 4).
	PascalPerAtm = 101325
	// PascalPerPsi: one pound-force per square inch, 6894.757293168361… Pa
	// (exact from the international pound 0.45359237 kg and inch 0.0254 m
	// of 1959 and standard gravity 9.80665 m/s² (3rd CGPM, 1901); NIST
	// SP 811, 2008, appendix B.8, prints 6.894 757 E+03).
	PascalPerPsi = 0.45359237 * 9.80665 / (0.0254 * 0.0254)

	// SecondsPerHour (exact).
	SecondsPerHour = 3600
	// MPerSPerLMH: 1 L m⁻² h⁻¹ = 1e-3 m³ / (m² · 3600 s) in m/s.
	MPerSPerLMH = 1e-3 / SecondsPerHour
	// MPerSPaPerLMHPerBar converts A from LMH/bar to m s⁻¹ Pa⁻¹.
	MPerSPaPerLMHPerBar = MPerSPerLMH / PascalPerBar
	// MmolPerM2HPerMolPerM2S converts a molar flux from mol m⁻² s⁻¹ to
	// mmol m⁻² h⁻¹ (3.6e6).
	MmolPerM2HPerMolPerM2S = 1e3 * SecondsPerHour
	// GPerM2HPerKgPerM2S converts a mass flux from kg m⁻² s⁻¹ to g m⁻² h⁻¹
	// (gMH; 3.6e6). For a molar flux J (mol m⁻² s⁻¹) of a solute of molar
	// mass M (kg/mol): J·M·GPerM2HPerKgPerM2S.
	GPerM2HPerKgPerM2S = 1e3 * SecondsPerHour

	// MolPerM3PerMolPerL: 1 mol/L = 1000 mol/m³.
	MolPerM3PerMolPerL = 1e3
	// JPerKWh: 1 kWh = 3.6 MJ.
	JPerKWh = 1e3 * SecondsPerHour
	// MPaSPerPaS: 1 Pa·s = 1000 mPa·s (viscosity).
	MPaSPerPaS = 1e3
	// MPerMM, MPerUM: lengths in mm and µm (channel sizes, S) to metres.
	MPerMM = 1e-3
	MPerUM = 1e-6
)

// pressureUnits lists the accepted pressure units, their spelling in
// messages and their size in pascals.
var pressureUnits = [...]struct {
	name  string
	paPer float64
}{
	{"bar", PascalPerBar},
	{"kPa", PascalPerKPa},
	{"MPa", PascalPerMPa},
	{"atm", PascalPerAtm},
	{"psi", PascalPerPsi},
	{"Pa", 1},
}

// ParsePressureUnit returns the size in pascals of the pressure unit name
// (bar, kPa, MPa, atm, psi, Pa), case-insensitively and ignoring
// surrounding space; ok is false for any other name (the empty one
// included: a default unit is the caller's choice).
func ParsePressureUnit(name string) (paPer float64, ok bool) {
	k := strings.TrimSpace(name)
	for _, u := range pressureUnits {
		if strings.EqualFold(k, u.name) {
			return u.paPer, true
		}
	}
	return 0, false
}

// PressureUnitNames lists the accepted pressure units as spelled in
// messages: bar, kPa, MPa, atm, psi, Pa.
func PressureUnitNames() []string {
	names := make([]string, len(pressureUnits))
	for i, u := range pressureUnits {
		names[i] = u.name
	}
	return names
}
