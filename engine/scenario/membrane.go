package scenario

import (
	"fmt"
	"math"
	"strconv"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/species"
	"drawsift/engine/thermo"
	"drawsift/engine/warn"
	"drawsift/engine/water"
)

// MembraneSpec is a membrane as a request gives it: a preset, custom
// values, or a preset with some values overridden. The JSON names are the
// contract's (engine/api re-exports the type).
type MembraneSpec struct {
	Preset     string   `json:"preset,omitempty"`
	ALMHPerBar *float64 `json:"a_lmh_per_bar,omitempty"`
	// BLMH: in a flux request, B for the draw solute (omitted → the
	// preset's measured value for that solute or an estimate,
	// library.BEstimateRule). In a screen, the membrane's NaCl B unless
	// b_nacl_lmh is also given; then B for every candidate.
	BLMH *float64 `json:"b_lmh,omitempty"`
	// BNaClLMH is the membrane's NaCl B, the base of the estimate for other
	// solutes (custom membranes).
	BNaClLMH *float64 `json:"b_nacl_lmh,omitempty"`
	SUM      *float64 `json:"s_um,omitempty"`
	// ReferenceTemperatureC is the temperature A and B were measured at
	// (omitted: the preset's, or for a custom membrane the operating
	// temperature). The activation energies replace the default rules of
	// Membrane.AtTemperature.
	ReferenceTemperatureC *float64 `json:"reference_temperature_c,omitempty"`
	AActivationKJPerMol   *float64 `json:"a_activation_energy_kj_per_mol,omitempty"`
	BActivationKJPerMol   *float64 `json:"b_activation_energy_kj_per_mol,omitempty"`
	// BByIonLMH and BBySoluteLMH give B for single ions (by symbol,
	// "Mg+2") and for solutes moved as one unit (by ID), overriding the
	// estimate (library.HinderedRule) and the preset's values.
	BByIonLMH    map[string]float64 `json:"b_by_ion_lmh,omitempty"`
	BBySoluteLMH map[string]float64 `json:"b_by_solute_lmh,omitempty"`
}

// Membrane is a resolved membrane, in SI.
type Membrane struct {
	Record   *library.Membrane // the preset, or nil for a custom membrane
	AMPerSPa float64
	SM       float64
	// B holds the NaCl B and the measured B by solute (m/s). Measured
	// values of a preset hold only while its NaCl B is not overridden.
	B library.SoluteB
	// BKnown: a NaCl B is known (from the preset or b_nacl_lmh), so B for
	// other solutes can be estimated.
	BKnown bool
	// BGivenMPerS is the request's b_lmh in m/s, when given.
	BGivenMPerS *float64
	// UserIonB and UserB: the request's B by ion symbol and by solute ID
	// (m/s).
	UserIonB, UserB map[string]float64
	// Relative standard deviations for robustness (the preset's, or the
	// custom-membrane defaults).
	ARelSD, BRelSD, SRelSD float64
	// RefK is the temperature A and B hold at (0: the operating
	// temperature); EA and EB (J/mol, when given) replace the default
	// temperature rules. AtTemperature sets Temperature.
	RefK, EA, EB float64
	HasEA, HasEB bool
	Temperature  Temperature
}

// Temperature says how A and B were carried from the temperature of
// their measurement to the operating one.
type Temperature struct {
	RefK, TK         float64
	FactorA, FactorB float64
	Rule             string
}

// ResolveMembrane reads a MembraneSpec: a preset, overridden field by
// field, every value checked against its Range.
func ResolveMembrane(spec *MembraneSpec) (*Membrane, error) {
	if spec == nil {
		return nil, errs.InvalidText("membrane", "", nil, "a membrane is required: {\"preset\": ID} or {\"a_lmh_per_bar\", \"b_lmh\", \"s_um\"}")
	}
	m := &Membrane{ARelSD: limits.ARelSD.Default, BRelSD: limits.BRelSD.Default, SRelSD: limits.SRelSD.Default}
	var aLMH, sUM, bNaCl float64
	if spec.Preset != "" {
		rec, ok := library.LookupMembrane(spec.Preset)
		if !ok {
			ids := []string{}
			all, _ := library.Membranes()
			for _, p := range all {
				ids = append(ids, p.ID)
			}
			return nil, errs.InvalidText("membrane.preset", spec.Preset, ids, "unknown membrane preset %q", spec.Preset)
		}
		m.Record = rec
		aLMH, bNaCl, sUM = rec.ALMHPerBar, rec.BNaClLMH, rec.SUM
		m.ARelSD, m.BRelSD, m.SRelSD = rec.ARelSD, rec.BRelSD, rec.SRelSD
		m.BKnown = true
		m.B.Measured = map[string]float64{}
		for k, v := range rec.BBySolute {
			m.B.Measured[k] = v * thermo.MPerSPerLMH
		}
		if len(rec.BByIon) > 0 {
			m.B.ByIon = map[string]float64{}
			for k, v := range rec.BByIon {
				m.B.ByIon[k] = v * thermo.MPerSPerLMH
			}
		}
	}
	if err := m.userB(spec); err != nil {
		return nil, err
	}
	for _, f := range []struct {
		r   *limits.Range
		v   *float64
		dst *float64
	}{{&limits.MembraneA, spec.ALMHPerBar, &aLMH}, {&limits.MembraneS, spec.SUM, &sUM}, {&limits.MembraneBNaCl, spec.BNaClLMH, &bNaCl}} {
		if f.v == nil {
			continue
		}
		if err := f.r.Check(*f.v); err != nil {
			return nil, err
		}
		*f.dst = *f.v
	}
	if spec.BNaClLMH != nil {
		m.BKnown = true
		m.B.Measured = nil // measured values belong to the preset's NaCl B
		m.B.ByIon = nil
	}
	if spec.BLMH != nil {
		if err := limits.MembraneB.Check(*spec.BLMH); err != nil {
			return nil, err
		}
		b := *spec.BLMH * thermo.MPerSPerLMH
		m.BGivenMPerS = &b
	}
	if m.Record != nil {
		m.RefK = m.Record.ReferenceTemperatureC + thermo.ZeroCelsiusK
	}
	if v := spec.ReferenceTemperatureC; v != nil {
		if err := limits.MembraneRefT.Check(*v); err != nil {
			return nil, err
		}
		m.RefK = *v + thermo.ZeroCelsiusK
	}
	for _, f := range []struct {
		r   *limits.Range
		v   *float64
		dst *float64
		has *bool
	}{{&limits.MembraneEA, spec.AActivationKJPerMol, &m.EA, &m.HasEA}, {&limits.MembraneEB, spec.BActivationKJPerMol, &m.EB, &m.HasEB}} {
		if f.v == nil {
			continue
		}
		if err := f.r.Check(*f.v); err != nil {
			return nil, err
		}
		*f.dst, *f.has = *f.v*1e3, true
	}
	if aLMH == 0 {
		return nil, errs.InvalidText(limits.MembraneA.Field, "", "> 0", "a_lmh_per_bar is required for a custom membrane")
	}
	if sUM == 0 {
		return nil, errs.InvalidText(limits.MembraneS.Field, "", "> 0", "s_um is required for a custom membrane")
	}
	m.AMPerSPa = aLMH * thermo.MPerSPaPerLMHPerBar
	m.SM = sUM * thermo.MPerUM
	m.B.NaCl = bNaCl * thermo.MPerSPerLMH
	return m, nil
}

// AtTemperature carries A and every B (the NaCl B, the measured ones and
// a given b_lmh) from the temperature of their measurement, RefK, to tK:
//
//	A(T) = A(T_r) · η_w(T_r)/η_w(T)             water's viscosity rule
//	B(T) = B(T_r) · (T/T_r) · η_w(T_r)/η_w(T)   Stokes–Einstein
//
// or, with an activation energy E given, exp(−E/R·(1/T − 1/T_r)) for that
// parameter. Water permeation through polyamide tracks water's viscosity
// closely: the non-viscous share of its activation energy is 3.9–6.4
// kJ/mol for thin-film composite membranes (Sharma, Agrawal & Chellam
// 2003, J. Membr. Sci. 223:69); normalising permeability by water's
// viscosity is common practice in RO data normalisation. The B rule
// treats solute permeation as diffusion in the active layer's water
// (common practice); measured activation energies of salt permeation are
// often higher (from memory), which the override takes. Without a
// reference temperature (a custom membrane that states none) nothing
// changes. It returns a note of what was done, or nil.
func (m *Membrane) AtTemperature(tK float64) *warn.Warning {
	m.Temperature = Temperature{RefK: m.RefK, TK: tK, FactorA: 1, FactorB: 1,
		Rule: "A and B as given (no reference temperature: taken as measured at the operating temperature)"}
	if m.RefK == 0 {
		return nil
	}
	fluidity := water.Viscosity(m.RefK) / water.Viscosity(tK)
	arrhenius := func(e float64) float64 { return math.Exp(-e / thermo.GasConstant * (1/tK - 1/m.RefK)) }
	fa, ruleA := fluidity, "A by water's viscosity ratio"
	if m.HasEA {
		fa, ruleA = arrhenius(m.EA), fmt.Sprintf("A by Arrhenius, %g kJ/mol", m.EA/1e3)
	}
	fb, ruleB := tK/m.RefK*fluidity, "B by Stokes–Einstein (T/η_w)"
	if m.HasEB {
		fb, ruleB = arrhenius(m.EB), fmt.Sprintf("B by Arrhenius, %g kJ/mol", m.EB/1e3)
	}
	m.AMPerSPa *= fa
	m.B.NaCl *= fb
	scale := func(src map[string]float64) map[string]float64 {
		if src == nil {
			return nil
		}
		scaled := make(map[string]float64, len(src))
		for k, v := range src {
			scaled[k] = v * fb
		}
		return scaled
	}
	m.B.Measured, m.B.ByIon = scale(m.B.Measured), scale(m.B.ByIon)
	m.UserIonB, m.UserB = scale(m.UserIonB), scale(m.UserB)
	if m.BGivenMPerS != nil {
		b := *m.BGivenMPerS * fb
		m.BGivenMPerS = &b
	}
	refC, tC := m.RefK-thermo.ZeroCelsiusK, tK-thermo.ZeroCelsiusK
	m.Temperature.FactorA, m.Temperature.FactorB = fa, fb
	// "A and B measured at %.4g °C, carried to %.4g °C: %s (×%.4g), %s
	// (×%.4g)", joined by hand: every flux request states it.
	g4 := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
	m.Temperature.Rule = "A and B measured at " + g4(refC) + " °C, carried to " + g4(tC) + " °C: " +
		ruleA + " (×" + g4(fa) + "), " + ruleB + " (×" + g4(fb) + ")"
	if math.Abs(tK-m.RefK) < 1e-9 {
		return nil
	}
	return &warn.Warning{Code: warn.ModelNote, Subject: "membrane", Text: m.Temperature.Rule}
}

// BFor returns B (m/s) of the membrane for solute s and whether it is an
// estimate: the override (m/s) when given, else the measured value, NaCl's
// own, or the estimate of library.BEstimateRule. It fails, naming field,
// when no NaCl B is known to estimate from.
func (m *Membrane) BFor(field string, s *library.Solute, overrideMPerS *float64) (float64, bool, error) {
	if overrideMPerS != nil {
		return *overrideMPerS, false, nil
	}
	if b, ok := m.B.Measured[s.ID]; ok {
		return b, false, nil
	}
	if !m.BKnown {
		return 0, false, errs.InvalidText(field, "", "≥ 0", "B for %s is needed: give %s, or membrane.b_nacl_lmh to estimate it from the NaCl value", s.ID, field)
	}
	b, est := m.B.For(s)
	return b, est, nil
}

// Permeability returns the membrane's B data for species.NewTransport.
func (m *Membrane) Permeability() *species.Permeability {
	return &species.Permeability{B: m.B, UserIon: m.UserIonB, UserSolute: m.UserB, Known: m.BKnown}
}

// maxBEntries bounds each of the request's B maps.
const maxBEntries = 64

// userB reads the request's per-ion and per-solute B (LMH → m/s), each
// value within membrane.b_lmh's range and each ion a known one.
func (m *Membrane) userB(spec *MembraneSpec) error {
	read := func(field string, src map[string]float64, ion bool) (map[string]float64, error) {
		if len(src) == 0 {
			return nil, nil
		}
		if len(src) > maxBEntries {
			return nil, invalid(field, fmt.Sprintf("at most %d entries", maxBEntries), "%d entries", len(src))
		}
		out := make(map[string]float64, len(src))
		for k, v := range src {
			f := field + "." + k
			if ion {
				if _, ok := thermo.KnownIonCharge(k); !ok {
					return nil, invalid(f, thermo.KnownIonSymbols(), "unknown ion %q", k)
				}
			}
			r := limits.MembraneB
			r.Field = f
			if err := r.Check(v); err != nil {
				return nil, err
			}
			out[k] = v * thermo.MPerSPerLMH
		}
		return out, nil
	}
	var err error
	if m.UserIonB, err = read("membrane.b_by_ion_lmh", spec.BByIonLMH, true); err != nil {
		return err
	}
	m.UserB, err = read("membrane.b_by_solute_lmh", spec.BBySoluteLMH, false)
	return err
}

// Preset returns the preset's ID, or "custom".
func (m *Membrane) Preset() string {
	if m.Record != nil {
		return m.Record.ID
	}
	return "custom"
}
