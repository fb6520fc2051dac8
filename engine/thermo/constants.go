// Package thermo computes the osmotic properties of draw solutions: the
// osmotic coefficient and water activity (Pitzer single-electrolyte model,
// non-electrolyte fits, the Sharqawy seawater correlation, measured π(c)
// tables), the osmotic pressure beside its van 't Hoff value, solution
// density and viscosity, and conversions between concentration units.
//
// Everything inside is SI: mol/kg, mol/m³, kg/m³, Pa, Pa·s, K. Names at the
// boundary carry their unit.
package thermo

// Physical constants. Unit conversions are in units.go.
const (
	// AvogadroConstant N_A in mol⁻¹ (exact: defining constant of the 2019
	// SI; BIPM, The International System of Units, 9th ed., 2019, Table 1).
	AvogadroConstant = 6.02214076e23
	// BoltzmannConstant k_B in J K⁻¹ (exact: defining constant of the 2019
	// SI; same table).
	BoltzmannConstant = 1.380649e-23
	// GasConstant R = N_A·k_B in J mol⁻¹ K⁻¹: 8.31446261815324, exact
	// (CODATA 2018 lists it as exact; the product of two exact constants,
	// evaluated exactly by the compiler).
	GasConstant = AvogadroConstant * BoltzmannConstant
	// ElementaryCharge e in C (exact: defining constant of the 2019 SI;
	// same table); Faraday F = N_A·e in C/mol, exact.
	ElementaryCharge = 1.602176634e-19
	Faraday          = AvogadroConstant * ElementaryCharge
	// ZeroCelsiusK is 0 °C in kelvin (exact by definition).
	ZeroCelsiusK = 273.15
	// ReferenceK is 25 °C, the reference temperature of the 25 °C data.
	ReferenceK = 298.15
)
