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

// Pressure and flux conversions used at the boundaries.
const (
	// MPerSPerLMH: 1 L m⁻² h⁻¹ = 1e-3 m³ / (m² · 3600 s).
	MPerSPerLMH = 1e-3 / 3600
	// PerPaPerPerBar converts A from LMH/bar to m s⁻¹ Pa⁻¹.
	MPerSPaPerLMHPerBar = MPerSPerLMH / PascalPerBar
)
