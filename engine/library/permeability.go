package library

import (
	"math"
	"sync"
)

// Ion data for transport: molar mass and limiting diffusion coefficient.
//
// Molar masses are sums of the IUPAC standard atomic weights (abridged,
// common practice). D⁰ at 25 °C: CRC Handbook 92nd ed. pp. 5-77–5-79 as
// quoted in pyEQL's diffusion_coefficient.tsv (the values our salt records
// carry); Sr²⁺, CO₃²⁻, F⁻, OH⁻, H⁺ and B(OH)₄⁻ are from the same CRC table
// as we remember it (from memory).
type ionDatum struct {
	molarMassGPerMol float64
	d0M2PerS         float64
}

var ionTable = map[string]ionDatum{
	"H+":      {1.008, 9.311e-9},
	"Li+":     {6.94, 1.029e-9},
	"Na+":     {22.98977, 1.334e-9},
	"K+":      {39.0983, 1.957e-9},
	"NH4+":    {18.038, 1.957e-9},
	"Mg+2":    {24.305, 0.706e-9},
	"Ca+2":    {40.078, 0.792e-9},
	"Sr+2":    {87.62, 0.791e-9},
	"OH-":     {17.007, 5.273e-9},
	"F-":      {18.998, 1.475e-9},
	"Cl-":     {35.453, 2.032e-9},
	"Br-":     {79.904, 2.080e-9},
	"NO3-":    {62.004, 1.902e-9},
	"HCO3-":   {61.017, 1.185e-9},
	"CO3-2":   {60.008, 0.923e-9},
	"SO4-2":   {96.06, 1.065e-9},
	"HCOO-":   {45.017, 1.454e-9},
	"CH3COO-": {59.044, 1.089e-9},
	"B(OH)4-": {78.84, 1.0e-9},
}

// IonMolarMass returns the molar mass (g/mol) of a known ion.
func IonMolarMass(symbol string) (float64, bool) {
	d, ok := ionTable[symbol]
	return d.molarMassGPerMol, ok
}

// IonD0 returns the limiting diffusion coefficient (m²/s, 25 °C) of a
// known ion.
func IonD0(symbol string) (float64, bool) {
	d, ok := ionTable[symbol]
	return d.d0M2PerS, ok && d.d0M2PerS > 0
}

// HinderedRule is how B is estimated for an ion or solute with no measured
// value: hindered diffusion through a distribution of pores, scaled from
// the membrane's NaCl B,
//
//	B_j = B_NaCl · D⁰_j·H̄(r_j) / (D⁰_NaCl·H̄(r_NaCl)),
//
// with r_j the Stokes–Einstein radius from D⁰ at 25 °C, H(λ) the
// diffusive hindrance factor (partitioning × hindered diffusion,
// λ = r_j/r_p) of Dechadilok & Deen (2006, Ind. Eng. Chem. Res. 45:6953;
// polynomial coefficients from memory) and H̄ its mean over a log-normal
// distribution of pore radii (median PoreRadiusNM, geometric standard
// deviation exp(PoreSpread)). Na⁺ and Cl⁻ themselves take B_NaCl (an FO
// test of NaCl cannot tell its two ions apart).
const HinderedRule = "B scaled from the membrane's NaCl value by hindered diffusion through pores, " +
	"B_j = B_NaCl·D_j·H(r_j)/(D_NaCl·H(r_NaCl)) (Stokes–Einstein radius r from the limiting D; hindrance H of " +
	"Dechadilok & Deen 2006 averaged over a log-normal pore-radius distribution, median 0.35 nm, spread 0.20 — " +
	"assumed, not fitted to these membranes). Larger and more hydrated species (Mg²⁺, Ca²⁺, SO₄²⁻, sugars) " +
	"cross far more slowly than Na⁺ and Cl⁻; enter a measured B where you have one."

// Pore-size distribution of the estimate (assumed, marked in
// HinderedRule): a median of 0.35 nm (of the order of the effective pore
// radius usually quoted for polyamide and cellulose-acetate RO layers,
// 0.3–0.4 nm, from memory) and a spread of 0.20 in ln r give the
// published order of reverse solute fluxes at equal osmotic pressure
// (divalent salts and sugars below NaCl, NaHCO₃ below NaCl, KCl above it;
// Achilli, Cath & Childress 2010, J. Membr. Sci. 364:233, from memory) on
// every preset; TestPublishedRSFOrder checks it.
const (
	PoreRadiusNM = 0.35
	PoreSpread   = 0.20
)

// StokesRadiusNM returns the Stokes–Einstein radius (nm) of a species of
// limiting diffusivity d0 (m²/s) at 25 °C: r = k_B·T/(6π·η_w·D⁰), η_w =
// 0.8900 mPa·s (water at 25 °C, IAPWS 2008 as carried by engine/water).
func StokesRadiusNM(d0 float64) float64 {
	const kT = 1.380649e-23 * 298.15
	const eta = 0.8900e-3
	return kT / (6 * math.Pi * eta * d0) * 1e9
}

// hindrance returns H(λ) = Φ·K_d of Dechadilok & Deen (2006): 1 at λ = 0,
// 0 from λ = 1.
func hindrance(l float64) float64 {
	if l <= 0 {
		return 1
	}
	if l >= 1 {
		return 0
	}
	h := 1 + 9.0/8*l*math.Log(l) + l*(-1.56034+l*(0.528155+l*(1.91521+l*(-2.81903+l*(0.270788+l*(1.10115+l*-0.435933))))))
	return math.Max(h, 0)
}

// meanHindrance averages H over the log-normal pore distribution
// (median PoreRadiusNM, ln-spread PoreSpread) by the trapezoidal rule on
// ±6 standard deviations (201 nodes; the integrand is smooth, so the rule
// is accurate far beyond the model's own).
func meanHindrance(rNM float64) float64 {
	const n = 201
	var sum, wsum float64
	for k := 0; k < n; k++ {
		x := -6 + 12*float64(k)/(n-1)
		w := math.Exp(-x * x / 2)
		if k == 0 || k == n-1 {
			w /= 2
		}
		sum += w * hindrance(rNM/(PoreRadiusNM*math.Exp(PoreSpread*x)))
		wsum += w
	}
	return sum / wsum
}

// naclD0 is NaCl's limiting diffusivity, the reference of HinderedRule
// (the library record's value: Nernst–Hartley from the CRC ionic D⁰).
const naclD0 = 1.611e-9

var naclHindrance = naclD0 * meanHindrance(StokesRadiusNM(naclD0))

// HinderedFactor returns B_j/B_NaCl by HinderedRule for a species of
// limiting diffusivity d0 (m²/s). Each value is computed once per process
// (a 201-node quadrature; the library holds a few dozen distinct D⁰;
// the memo keeps at most 1,024).
func HinderedFactor(d0 float64) float64 {
	if !(d0 > 0) {
		return 1
	}
	hinderedMu.Lock()
	f, ok := hinderedMemo[d0]
	hinderedMu.Unlock()
	if ok {
		return f
	}
	f = d0 * meanHindrance(StokesRadiusNM(d0)) / naclHindrance
	hinderedMu.Lock()
	if len(hinderedMemo) < 1024 { // custom solutes bring their own D⁰: bounded
		hinderedMemo[d0] = f
	}
	hinderedMu.Unlock()
	return f
}

var (
	hinderedMu   sync.Mutex
	hinderedMemo = map[float64]float64{}
)

// BOrigin says where a B comes from.
type BOrigin string

// The origins of B.
const (
	BMeasured  BOrigin = "measured"  // the membrane record's value for this solute
	BNaCl      BOrigin = "nacl"      // the membrane's NaCl B (Na⁺, Cl⁻, NaCl)
	BUser      BOrigin = "user"      // given in the request
	BEstimated BOrigin = "estimated" // HinderedRule
)

// Estimated reports whether the origin is an estimate.
func (o BOrigin) Estimated() bool { return o == BEstimated }

// Ion returns B for an ion by symbol (with its D⁰, 0 when unknown: the
// ion table's value is then used): B_NaCl for Na⁺ and Cl⁻, else
// HinderedRule.
func (b *SoluteB) Ion(symbol string, d0 float64) (float64, BOrigin) {
	if v, ok := b.ByIon[symbol]; ok {
		return v, BMeasured
	}
	if symbol == "Na+" || symbol == "Cl-" {
		return b.NaCl, BNaCl
	}
	if !(d0 > 0) {
		d0, _ = IonD0(symbol)
	}
	return b.NaCl * HinderedFactor(d0), BEstimated
}

// SaltB combines the B of a salt's two ions as they cross together with no
// electric current in the dilute limit (the Nernst–Hartley form, which the
// Goldman flux equation reduces to for equal faces):
//
//	B_salt = (|z₊| + |z₋|)·B₊·B₋ / (|z₊|·B₊ + |z₋|·B₋).
func SaltB(zc, za int, bc, ba float64) float64 {
	c, a := math.Abs(float64(zc)), math.Abs(float64(za))
	if bc == 0 || ba == 0 {
		return 0
	}
	return (c + a) * bc * ba / (c*bc + a*ba)
}
