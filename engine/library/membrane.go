package library

import (
	"fmt"
	"math"
)

// Membrane is a generic FO membrane preset (no brand names) or a user's
// custom membrane, as stored in data/membranes.json.
type Membrane struct {
	ID          string `json:"id"`
	Name        string `json:"name"`
	Description string `json:"description"`
	// Chemistry: "cellulose-triacetate" or "thin-film-composite".
	Chemistry string `json:"chemistry"`
	// Water permeability A, NaCl permeability B and structural parameter S,
	// as measured in FO tests.
	ALMHPerBar float64 `json:"a_lmh_per_bar"`
	BNaClLMH   float64 `json:"b_nacl_lmh"`
	SUM        float64 `json:"s_um"`
	// ReferenceTemperatureC is the temperature of the test behind A and B;
	// the engine carries them to the operating temperature
	// (scenario.Membrane.AtTemperature).
	ReferenceTemperatureC float64 `json:"reference_temperature_c"`
	// BBySolute holds measured B (LMH) for other solutes, keyed by solute ID.
	BBySolute map[string]float64 `json:"b_by_solute_lmh,omitempty"`
	// BByIon holds measured B (LMH) for ions, keyed by symbol ("Mg+2").
	BByIon map[string]float64 `json:"b_by_ion_lmh,omitempty"`
	// Uncertainty: relative standard deviations used by robustness runs.
	ARelSD float64 `json:"a_rel_sd"`
	BRelSD float64 `json:"b_rel_sd"`
	SRelSD float64 `json:"s_rel_sd"`
	// Conditions of the measurement behind the numbers.
	TestConditions string            `json:"test_conditions"`
	Sources        map[string]string `json:"sources"`
}

// Validate checks a membrane record.
func (m *Membrane) Validate() error {
	if m.ID == "" {
		return fmt.Errorf("membrane with empty id")
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"a_lmh_per_bar", m.ALMHPerBar}, {"b_nacl_lmh", m.BNaClLMH}, {"s_um", m.SUM}} {
		if !(f.v > 0) || math.IsInf(f.v, 0) {
			return fmt.Errorf("membrane %q: %s must be positive and finite", m.ID, f.name)
		}
	}
	for k, b := range m.BBySolute {
		if !(b >= 0) || math.IsInf(b, 0) {
			return fmt.Errorf("membrane %q: b_by_solute_lmh[%q] must be ≥ 0", m.ID, k)
		}
	}
	for k, b := range m.BByIon {
		if !(b >= 0) || math.IsInf(b, 0) {
			return fmt.Errorf("membrane %q: b_by_ion_lmh[%q] must be ≥ 0", m.ID, k)
		}
	}
	if len(m.Sources) == 0 {
		return fmt.Errorf("membrane %q: sources are required", m.ID)
	}
	if !(m.ReferenceTemperatureC >= 0 && m.ReferenceTemperatureC <= 100) || m.Sources["reference_temperature_c"] == "" {
		return fmt.Errorf("membrane %q: reference_temperature_c (0–100 °C) and its source are required", m.ID)
	}
	return nil
}

// BEstimateRule documents how B is estimated for a solute without a
// measured value (HinderedRule).
const BEstimateRule = HinderedRule

// SoluteB is a membrane's permeability to each solute and ion: the values
// measured for some solutes or ions, and the NaCl value that HinderedRule
// scales for the rest. All are in one unit (LMH in a record, m/s in the
// engine); For and Ion answer in that unit.
type SoluteB struct {
	NaCl     float64
	Measured map[string]float64 // by solute ID
	ByIon    map[string]float64 // by ion symbol
}

// SoluteB returns the record's B values, in LMH.
func (m *Membrane) SoluteB() SoluteB {
	return SoluteB{NaCl: m.BNaClLMH, Measured: m.BBySolute, ByIon: m.BByIon}
}

// For returns B for solute s as one unit, and whether it is an estimate:
//
//	B_j = B_measured,j                       when the membrane has one
//	B_j = B_NaCl                             for NaCl
//	B_j = SaltB of its two ions' B (Ion)      for a salt of two ions
//	B_j = B_NaCl · HinderedFactor(D⁰_j)      otherwise (HinderedRule)
//
// A blend's B is its parts' B weighted by mass, Σ_k (x_k M_k/M) B_k, which
// gives the blend's reverse mass flux exactly when the parts share one
// concentration profile; it is an estimate when any part's is. The
// transport model moves ions one by one (Ion); For serves a solute moved
// as one unit (a feed given by its equivalent NaCl, a custom solute with
// no ions).
func (b *SoluteB) For(s *Solute) (v float64, estimated bool) {
	if v, ok := b.Measured[s.ID]; ok {
		return v, false
	}
	if s.IsBlend() {
		for _, c := range s.Components {
			bk, est := b.For(c.Solute)
			v += c.MoleFraction * c.Solute.MolarMassGPerMol / s.MolarMassGPerMol * bk
			estimated = estimated || est
		}
		return v, estimated
	}
	if Key(s.ID) == "nacl" {
		return b.NaCl, false
	}
	if len(s.Ions) == 2 {
		i0, i1 := s.Ions[0], s.Ions[1]
		b0, o0 := b.Ion(i0.Symbol, i0.DiffusivityM2PerS)
		b1, o1 := b.Ion(i1.Symbol, i1.DiffusivityM2PerS)
		return SaltB(i0.Charge, i1.Charge, b0, b1), o0.Estimated() || o1.Estimated()
	}
	return b.NaCl * HinderedFactor(s.Diffusivity.D0M2PerS), true
}

var membranePresets = presetFile[Membrane]{name: "membranes",
	id: func(m *Membrane) string { return m.ID }, validate: (*Membrane).Validate}

// Membranes returns the embedded membrane presets in file order.
func Membranes() ([]*Membrane, error) { return membranePresets.all() }

// LookupMembrane finds a preset by ID, case-insensitively.
func LookupMembrane(id string) (*Membrane, bool) { return membranePresets.lookup(id) }
