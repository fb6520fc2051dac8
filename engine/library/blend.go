package library

import (
	"fmt"
	"math"
	"strings"
)

// ModelMixture marks a solute that is a mixture of ions: a blend of
// library solutes at a fixed mole ratio, or seawater by its Reference
// Composition. Its osmotic pressure comes from the mixed-electrolyte model
// (engine/thermo), not from a single-salt record.
const ModelMixture = "mixture"

// FamilyBlend is the family of blends built by NewBlend.
const FamilyBlend = "blend"

// Component is one part of a blend: a library solute and its mole fraction
// of the blend's formula unit (one mole of blend holds MoleFraction mol of
// Solute).
type Component struct {
	Solute       *Solute `json:"-"`
	ID           string  `json:"solute"`
	MoleFraction float64 `json:"mole_fraction"`
}

// IonShare is one ion of a solute per formula unit: PerUnit mol of ion per
// mol of solute (the ion's count for a salt; fractional for a blend or
// for seawater, whose formula unit is one mole of dissolved particles).
type IonShare struct {
	Symbol  string
	Charge  int
	PerUnit float64
	// DiffusivityM2PerS is the limiting ionic diffusion coefficient at
	// 25 °C where the record gives it (0 when unknown).
	DiffusivityM2PerS float64
	// MolarMassGPerMol is the ion's molar mass where the record gives it
	// (ion compositions; 0 for a salt's ions).
	MolarMassGPerMol float64
}

// IonShares returns the solute's ions per formula unit, merged by symbol
// in first-seen order: a salt's ions with their counts, a blend's ions
// summed over its components, seawater's Reference Composition (one mole
// of particles per formula unit). A non-electrolyte has none.
func (s *Solute) IonShares() []IonShare {
	if s.composition != nil {
		return s.composition
	}
	out := make([]IonShare, 0, len(s.Ions))
	for _, ion := range s.Ions {
		out = append(out, IonShare{Symbol: ion.Symbol, Charge: ion.Charge, PerUnit: float64(ion.Count), DiffusivityM2PerS: ion.DiffusivityM2PerS})
	}
	return out
}

// IsBlend reports whether s is a blend of library solutes (NewBlend).
func (s *Solute) IsBlend() bool { return len(s.Components) > 0 }

// NewBlend builds the record of a blend of parts at the given mole
// fractions (which must be positive and sum to 1 within 1e-6; they are
// normalised). The record's numbers are derived from its parts:
//
//	M = Σ x_k M_k;  ν = Σ x_k ν_k;  price range = Σ (x_k M_k/M) price_k
//
// (the mass-weighted price, when every part has one); the ions are the
// parts' ions per formula unit; hazard flags and hazards are the union;
// regeneration routes are those every part shares; the solubility and
// osmotic data are left to the mixture model (engine/thermo), which
// reads the parts. Sources name the parts' records.
func NewBlend(id string, parts []*Solute, moleFractions []float64) (*Solute, error) {
	if len(parts) < 2 || len(parts) != len(moleFractions) {
		return nil, fmt.Errorf("a blend needs two or more parts, each with a mole fraction")
	}
	sum := 0.0
	seen := map[*Solute]bool{}
	for k, p := range parts {
		x := moleFractions[k]
		if !(x > 0) || x > 1 || math.IsInf(x, 0) {
			return nil, fmt.Errorf("part %d (%s): mole fraction %v is not in (0, 1]", k, p.ID, x)
		}
		if p.IsBlend() || p.Osmotic.Kind == ModelMixture {
			return nil, fmt.Errorf("part %d (%s) is itself a mixture; give its parts instead", k, p.ID)
		}
		if seen[p] {
			return nil, fmt.Errorf("part %d (%s) is listed twice", k, p.ID)
		}
		seen[p] = true
		sum += x
	}
	if math.Abs(sum-1) > 1e-6 {
		return nil, fmt.Errorf("mole fractions sum to %.6g, not 1", sum)
	}
	b := &Solute{ID: id, Family: FamilyBlend, Sources: map[string]string{}}
	var names, formulas []string
	var nu, mass float64
	index := map[string]int{}
	hazards, flags := map[string]bool{}, map[string]bool{}
	routes := map[string]int{}
	priced := true
	var pMin, pMax float64
	for k, p := range parts {
		x := moleFractions[k] / sum
		b.Components = append(b.Components, Component{Solute: p, ID: p.ID, MoleFraction: x})
		names = append(names, fmt.Sprintf("%s %s", trimNumber(x), p.Name))
		formulas = append(formulas, p.Formula)
		nu += x * p.Nu()
		mass += x * p.MolarMassGPerMol
		for _, ion := range p.IonShares() {
			i, ok := index[ion.Symbol]
			if !ok {
				i = len(b.composition)
				index[ion.Symbol] = i
				b.composition = append(b.composition, IonShare{Symbol: ion.Symbol, Charge: ion.Charge, DiffusivityM2PerS: ion.DiffusivityM2PerS})
			}
			b.composition[i].PerUnit += x * ion.PerUnit
		}
		for _, h := range p.Hazards {
			if !hazards[h] {
				hazards[h] = true
				b.Hazards = append(b.Hazards, h)
			}
		}
		for _, f := range p.HazardFlags {
			if !flags[f] {
				flags[f] = true
				b.HazardFlags = append(b.HazardFlags, f)
			}
		}
		for _, r := range p.Regeneration {
			routes[r]++
		}
		if p.Price == nil {
			priced = false
		}
		b.Sources["components."+p.ID] = "the library record of " + p.ID
	}
	b.Name = "blend: " + strings.Join(names, " + ")
	b.Formula = strings.Join(formulas, " + ")
	b.MolarMassGPerMol = mass
	b.Osmotic = OsmoticModel{Kind: ModelMixture, VantHoffNu: nu}
	for _, p := range parts {
		for _, r := range p.Regeneration {
			if routes[r] == len(parts) {
				b.Regeneration = append(b.Regeneration, r)
				routes[r] = 0
			}
		}
	}
	if priced {
		year := 0
		for k, p := range parts {
			wk := moleFractions[k] / sum * p.MolarMassGPerMol / mass
			pMin += wk * p.Price.USDPerKgMin
			pMax += wk * p.Price.USDPerKgMax
			year = max(year, p.Price.Year)
		}
		b.Price = &Price{USDPerKgMin: pMin, USDPerKgMax: pMax, Year: year, Grade: "mass-weighted from the parts"}
	}
	b.Notes = "Blend at a fixed mole ratio: " + strings.Join(names, ", ") + ". Osmotic pressure from the mixed-electrolyte model; density and viscosity from the multicomponent rules."
	return b, nil
}

// BlendID names a blend by its parts and mole ratio, e.g. "NaCl+MgCl2 9:1"
// (ratios scaled so that the smallest is 1 and rounded to 3 significant
// figures).
func BlendID(ids []string, moleFractions []float64) string {
	lo := math.Inf(1)
	for _, x := range moleFractions {
		lo = math.Min(lo, x)
	}
	r := make([]string, len(moleFractions))
	for k, x := range moleFractions {
		r[k] = trimNumber(x / lo)
	}
	return strings.Join(ids, "+") + " " + strings.Join(r, ":")
}

// trimNumber formats v with 3 significant figures and no trailing zeros.
func trimNumber(v float64) string {
	s := fmt.Sprintf("%.3g", v)
	if strings.ContainsAny(s, "e") {
		return s
	}
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	return s
}

// setComposition gives s (a mixture record such as seawater) its ions per
// formula unit from a feed record's composition, normalised to one mole of
// particles per formula unit.
func (s *Solute) setComposition(f *Feed) error {
	total := 0.0
	for _, ion := range f.Ions {
		total += ion.Concentration / ion.MolarMassGPerMol
	}
	if !(total > 0) {
		return fmt.Errorf("solute %q: composition feed %q has no ions", s.ID, f.ID)
	}
	s.composition = nil
	for _, ion := range f.Ions {
		s.composition = append(s.composition, IonShare{Symbol: ion.Symbol, Charge: ion.Charge,
			PerUnit: ion.Concentration / ion.MolarMassGPerMol / total, MolarMassGPerMol: ion.MolarMassGPerMol})
	}
	return nil
}

// NewComposition builds a mixture record from a water's ion list (each
// ion's concentration in mg per unit of water, any unit, since only the
// proportions matter; the diffusivity is NaCl's): one formula unit is one mole of dissolved
// particles, its molar mass Σ mass / Σ mol. Its osmotic pressure comes
// from the mixed-electrolyte model over those ions; no solid limits it
// (the saturation indices report each mineral), so it is recorded as
// miscible.
func NewComposition(id, name string, ions []FeedIon) (*Solute, error) {
	var mass, mol float64
	for _, ion := range ions {
		if !(ion.MolarMassGPerMol > 0) || !(ion.Concentration >= 0) || math.IsInf(ion.Concentration, 0) {
			return nil, fmt.Errorf("ion %q needs a positive molar mass and a finite concentration ≥ 0", ion.Symbol)
		}
		mass += ion.Concentration
		mol += ion.Concentration / ion.MolarMassGPerMol
	}
	if !(mol > 0) {
		return nil, fmt.Errorf("the ion list holds no ions")
	}
	s := &Solute{ID: id, Name: name, Family: "water", Formula: "ion mixture", MolarMassGPerMol: mass / mol,
		Osmotic:    OsmoticModel{Kind: ModelMixture, VantHoffNu: 1},
		Solubility: Solubility{Miscible: true},
		Sources: map[string]string{"osmotic_model": "mixed-electrolyte model over the water's ion list",
			"diffusivity": "NaCl's record: a mixed water taken to diffuse as sodium chloride (common practice, as for seawater)"}}
	if lib, err := Default(); err == nil {
		if nacl, ok := lib.Lookup("NaCl"); ok {
			s.Diffusivity = Diffusivity{D0M2PerS: nacl.Diffusivity.D0M2PerS, Points: nacl.Diffusivity.Points}
		}
	}
	for _, ion := range ions {
		if ion.Concentration > 0 {
			s.composition = append(s.composition, IonShare{Symbol: ion.Symbol, Charge: ion.Charge,
				PerUnit: ion.Concentration / ion.MolarMassGPerMol / mol, MolarMassGPerMol: ion.MolarMassGPerMol})
		}
	}
	return s, nil
}

// TotalMmol returns a feed's total ion amount, Σ c_i/M_i, in mmol per
// unit of feed (per litre for mg/L ions, per kg for mg/kg).
func (f *Feed) TotalMmol() float64 {
	sum := 0.0
	for _, ion := range f.Ions {
		sum += ion.Concentration / ion.MolarMassGPerMol
	}
	return sum
}
