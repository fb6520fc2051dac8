package scenario

import (
	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/thermo"
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
	// Relative standard deviations for robustness (the preset's, or the
	// custom-membrane defaults).
	ARelSD, BRelSD, SRelSD float64
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
	}
	if spec.BLMH != nil {
		if err := limits.MembraneB.Check(*spec.BLMH); err != nil {
			return nil, err
		}
		b := *spec.BLMH * thermo.MPerSPerLMH
		m.BGivenMPerS = &b
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

// Preset returns the preset's ID, or "custom".
func (m *Membrane) Preset() string {
	if m.Record != nil {
		return m.Record.ID
	}
	return "custom"
}
