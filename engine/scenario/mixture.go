package scenario

import (
	"bytes"
	"fmt"
	"math"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/internal/jsonx"
	"drawsift/engine/library"
	"drawsift/engine/limits"
	"drawsift/engine/thermo"
)

// MixturePart is one part of a mixture as a request gives it: a library
// solute at its own concentration in the mixture ("mol/kg" per kg of
// water; "mol/L", "g/L" per litre of the mixture; "g/kg", "wt%" per kg of
// the mixture).
type MixturePart struct {
	Solute        string   `json:"solute"`
	Concentration *float64 `json:"concentration"`
	Unit          string   `json:"unit"`
}

// BlendPart is one part of a screen candidate blend: a library solute and
// its mole fraction or mass fraction of the blend (one kind for every
// part; fractions are normalised when they sum to 1 within 1e-6).
type BlendPart struct {
	Solute       string   `json:"solute"`
	MoleFraction *float64 `json:"mole_fraction,omitempty"`
	MassFraction *float64 `json:"mass_fraction,omitempty"`
}

// Candidate is one screen candidate: a solute ID or alias (JSON: a
// string) or a blend (JSON: {"id", "blend": [parts]}).
type Candidate struct {
	ID    string      `json:"id"`
	Blend []BlendPart `json:"blend,omitempty"`
}

// UnmarshalJSON reads a string or a strict {"id", "blend"} object.
func (c *Candidate) UnmarshalJSON(b []byte) error {
	b = bytes.TrimSpace(b)
	if len(b) > 0 && b[0] == '"' {
		*c = Candidate{}
		return jsonx.Unmarshal(b, &c.ID)
	}
	type plain Candidate
	var p plain
	if err := jsonx.DecodeStrict(b, &p); err != nil {
		return err
	}
	*c = Candidate(p)
	return nil
}

// MarshalJSON writes a plain candidate as its ID string.
func (c Candidate) MarshalJSON() ([]byte, error) {
	if len(c.Blend) == 0 {
		return jsonx.Marshal(c.ID)
	}
	type plain Candidate
	return jsonx.Marshal(plain(c))
}

// unitBasis groups the concentration units by what they are per.
func unitBasis(u thermo.Unit) string {
	switch u {
	case thermo.MolPerKg:
		return "per kg of water (mol/kg)"
	case thermo.MolPerL, thermo.GPerL:
		return "per litre of the mixture (mol/L, g/L)"
	case thermo.GPerKg, thermo.WtPercent:
		return "per kg of the mixture (g/kg, wt%)"
	}
	return ""
}

// lookupPart finds a part's solute under field and refuses mixtures.
func lookupPart(field, name string, extra map[string]*library.Solute) (*library.Solute, error) {
	if s, ok := extra[library.Key(name)]; ok {
		return s, nil
	}
	s, err := LookupSolute(field, name)
	if err != nil {
		return nil, err
	}
	if s.Osmotic.Kind == library.ModelMixture {
		return nil, errs.InvalidText(field, name, nil, "%s is itself a mixture of ions and cannot be a part of one; give it alone, or list its salts", s.ID)
	}
	return s, nil
}

// ResolveMixture reads a request's mixture (fields under prefix) and
// returns the solution as one solute with its molality: a single part is
// that solute; two or more make a blend (library.NewBlend) at the mole
// ratio the concentrations give, with its total molality. Every part's
// concentration must be positive and all must share a basis (per kg of
// water, per litre of the mixture, or per kg of the mixture): per litre
// the mole ratio is that of the molarities and the total molarity is
// converted with the blend's density; per kg of the mixture, m_k =
// w_k/(M_k(1 − Σw)). The returned unit is the parts' unit, for limits in
// errors.
func ResolveMixture(prefix string, parts []MixturePart, tK float64) (*thermo.Solution, float64, thermo.Unit, error) {
	field := errs.Join(prefix, "mixture")
	if len(parts) == 0 {
		return nil, 0, 0, errs.InvalidText(field, "", nil, "a mixture needs at least one part: [{\"solute\", \"concentration\", \"unit\"}, …]")
	}
	if err := limits.MixtureParts.CheckAt(field, float64(len(parts))); err != nil {
		return nil, 0, 0, err
	}
	sols := make([]*library.Solute, len(parts))
	vals := make([]float64, len(parts))
	units := make([]thermo.Unit, len(parts))
	var unit thermo.Unit
	seen := map[*library.Solute]int{}
	for k, p := range parts {
		f := fmt.Sprintf("%s[%d]", field, k)
		s, err := lookupPart(f+".solute", p.Solute, nil)
		if err != nil {
			return nil, 0, 0, err
		}
		if j, dup := seen[s]; dup {
			return nil, 0, 0, errs.InvalidText(f+".solute", p.Solute, nil, "%s is listed twice (parts %d and %d); give each solute once", s.ID, j, k)
		}
		seen[s] = k
		v, u, err := ParseConcentration(f, p.Concentration, p.Unit)
		if err != nil {
			return nil, 0, 0, err
		}
		if u == thermo.OsmolPerKg {
			return nil, 0, 0, errs.InvalidText(f+".unit", p.Unit, []string{"mol/kg", "mol/L", "g/L", "g/kg", "wt%"}, "a part's concentration is its own amount, not an osmolality")
		}
		if !(v > 0) {
			return nil, 0, 0, errs.Invalid(f+".concentration", v, "> 0", "each part of a mixture needs a positive concentration (leave a part out to omit it)")
		}
		if k > 0 && unitBasis(u) != unitBasis(unit) {
			return nil, 0, 0, errs.InvalidText(f+".unit", p.Unit, unitBasis(unit), "every part of a mixture is given on one basis: part 0 is %s, this part %s", unitBasis(unit), unitBasis(u))
		}
		sols[k], vals[k], units[k] = s, v, u
		if k == 0 {
			unit = u
		}
	}
	if len(parts) == 1 {
		x, err := thermo.Prepared(sols[0], tK)
		if err != nil {
			return nil, 0, 0, prefixed(field+"[0]", err)
		}
		m, err := x.ToMolality(vals[0], unit)
		if err != nil {
			return nil, 0, 0, prefixed(field+"[0]", err)
		}
		return x, m, unit, nil
	}
	// Amounts in mol per basis unit, and what the total is in that basis.
	amount := make([]float64, len(parts))
	total, massSum := 0.0, 0.0
	for k, s := range sols {
		switch units[k] {
		case thermo.MolPerKg, thermo.MolPerL:
			amount[k] = vals[k]
		case thermo.GPerL:
			amount[k] = vals[k] / s.MolarMassGPerMol
		case thermo.GPerKg:
			amount[k] = vals[k] / s.MolarMassGPerMol
			massSum += vals[k] / 1000
		case thermo.WtPercent:
			amount[k] = vals[k] * 10 / s.MolarMassGPerMol
			massSum += vals[k] / 100
		}
		total += amount[k]
	}
	if massSum >= 1 {
		return nil, 0, 0, errs.Invalid(field, massSum, "< 1 kg of solute per kg of mixture", "the parts' mass fractions add up to %.4g: no water is left", massSum)
	}
	fr := make([]float64, len(parts))
	ids := make([]string, len(parts))
	for k := range amount {
		fr[k] = amount[k] / total
		ids[k] = sols[k].ID
	}
	b, err := library.NewBlend(library.BlendID(ids, fr), sols, fr)
	if err != nil {
		return nil, 0, 0, errs.InvalidText(field, "", nil, "%v", err)
	}
	x, err := thermo.NewSolution(b, tK)
	if err != nil {
		return nil, 0, 0, prefixed(field, err)
	}
	var m float64
	switch unit {
	case thermo.MolPerKg:
		m = total
	case thermo.MolPerL, thermo.GPerL:
		m, err = x.ToMolality(total, thermo.MolPerL)
		if err != nil {
			return nil, 0, 0, prefixed(field, err)
		}
	case thermo.GPerKg, thermo.WtPercent: // mol per kg of mixture → per kg of water
		m = total / (1 - massSum)
	}
	if sol := x.SolubilityMolPerKg(); m > sol*(1+1e-9) {
		k := x.LimitingPart()
		return nil, 0, 0, errs.Invalid(fmt.Sprintf("%s[%d].concentration", field, k), vals[k],
			trimLimit(vals[k]*sol/m)+" "+units[k].String(),
			"%s is beyond its solubility in this mixture at %.4g °C (each part within its own solubility; limit at this mixture's ratio)", sols[k].ID, tK-thermo.ZeroCelsiusK)
	}
	return x, m, unit, nil
}

// trimLimit formats a limit with 4 significant figures.
func trimLimit(v float64) string {
	s := fmt.Sprintf("%.4g", v)
	return strings.TrimSpace(s)
}

// ResolveBlend builds a screen candidate blend (field names under field):
// its parts from the library (or the request's custom solutes, extra, by
// key) at the given mole or mass fractions (converted to mole fractions:
// x_k ∝ w_k/M_k).
func ResolveBlend(field string, c *Candidate, extra map[string]*library.Solute) (*library.Solute, error) {
	if err := CheckLabel(errs.Join(field, "id"), c.ID); err != nil {
		return nil, err
	}
	if len(c.Blend) < 2 {
		return nil, errs.InvalidText(errs.Join(field, "blend"), "", nil, "a blend needs two or more parts: [{\"solute\", \"mole_fraction\"}, …]")
	}
	if err := limits.BlendParts.CheckAt(errs.Join(field, "blend"), float64(len(c.Blend))); err != nil {
		return nil, err
	}
	sols := make([]*library.Solute, len(c.Blend))
	fr := make([]float64, len(c.Blend))
	byMass := c.Blend[0].MassFraction != nil
	sum := 0.0
	for k, p := range c.Blend {
		f := errs.Join(field, fmt.Sprintf("blend[%d]", k))
		s, err := lookupPart(f+".solute", p.Solute, extra)
		if err != nil {
			return nil, err
		}
		v := p.MoleFraction
		name := "mole_fraction"
		if byMass {
			v, name = p.MassFraction, "mass_fraction"
		}
		if p.MoleFraction != nil && p.MassFraction != nil || v == nil {
			return nil, errs.InvalidText(f, "", nil, "give every part a mole_fraction, or every part a mass_fraction (part 0 sets which)")
		}
		if !(*v > 0 && *v <= 1) {
			return nil, errs.Invalid(f+"."+name, *v, "(0, 1]", "a fraction must lie in (0, 1] (got %g)", *v)
		}
		sols[k] = s
		fr[k] = *v
		sum += *v
	}
	if math.Abs(sum-1) > 1e-6 {
		return nil, errs.Invalid(errs.Join(field, "blend"), sum, "1 (within 1e-6)", "the parts' fractions sum to %.6g, not 1", sum)
	}
	if byMass {
		tot := 0.0
		for k, s := range sols {
			fr[k] /= s.MolarMassGPerMol
			tot += fr[k]
		}
		for k := range fr {
			fr[k] /= tot
		}
	} else {
		for k := range fr {
			fr[k] /= sum
		}
	}
	id := strings.TrimSpace(c.ID)
	if id == "" {
		ids := make([]string, len(sols))
		for k, s := range sols {
			ids[k] = s.ID
		}
		id = library.BlendID(ids, fr)
	}
	b, err := library.NewBlend(id, sols, fr)
	if err != nil {
		return nil, errs.InvalidText(errs.Join(field, "blend"), "", nil, "%v", err)
	}
	return b, nil
}
