// Package thermo computes the osmotic properties of draw solutions: the
// osmotic coefficient and water activity (Pitzer single-electrolyte model,
// non-electrolyte fits, the Sharqawy seawater correlation, measured π(c)
// tables), the osmotic pressure beside its van 't Hoff value, solution
// density and viscosity, and conversions between concentration units.
//
// Everything inside is SI: mol/kg, mol/m³, kg/m³, Pa, Pa·s, K. Names at the
// boundary carry their unit.
package thermo

// Physical constants.
const (
	// GasConstant R in J mol⁻¹ K⁻¹ (exact since the 2019 SI redefinition:
	// N_A·k_B, CODATA 2018).
	GasConstant = 8.31446261815324
	// ZeroCelsiusK is 0 °C in kelvin (exact by definition).
	ZeroCelsiusK = 273.15
	// PascalPerBar (exact).
	PascalPerBar = 1e5
	// PascalPerAtm (exact, standard atmosphere).
	PascalPerAtm = 101325
	// ReferenceK is 25 °C, the reference temperature of the 25 °C data.
	ReferenceK = 298.15
)
