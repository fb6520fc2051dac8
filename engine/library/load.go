package library

import (
	"bytes"
	"fmt"
	"math"
	"sort"
	"strings"
	"sync"

	"drawsift/data"
	"drawsift/engine/internal/jsonx"
)

// solutesFile is the on-disk shape of data/solutes.json.
type solutesFile struct {
	SchemaVersion int      `json:"schema_version"`
	Solutes       []Solute `json:"solutes"`
}

// Library is a validated, indexed set of solutes.
type Library struct {
	solutes []*Solute
	index   map[string]*Solute // lower-cased ID and aliases
}

var (
	defaultOnce sync.Once
	defaultLib  *Library
	defaultErr  error
)

// Default returns the embedded library, loaded and validated once.
func Default() (*Library, error) {
	defaultOnce.Do(func() {
		b, err := data.FS.ReadFile("solutes.json")
		if err != nil {
			defaultErr = err
			return
		}
		defaultLib, defaultErr = Parse(b)
		if defaultErr == nil {
			defaultErr = defaultLib.linkCompositions()
		}
	})
	return defaultLib, defaultErr
}

// linkCompositions gives each mixture record the ions of its composition
// feed (the feed presets load separately, so this runs once both exist).
func (l *Library) linkCompositions() error {
	for _, s := range l.solutes {
		if s.Osmotic.Kind != ModelMixture {
			continue
		}
		f, ok := LookupFeed(s.Osmotic.CompositionFeed)
		if !ok {
			return fmt.Errorf("solute %q: composition feed %q not found", s.ID, s.Osmotic.CompositionFeed)
		}
		if err := s.setComposition(f); err != nil {
			return err
		}
	}
	return nil
}

// MustDefault is Default for callers that cannot proceed without the
// embedded data; it panics if the embedded file is broken, which the
// package tests rule out.
func MustDefault() *Library {
	l, err := Default()
	if err != nil {
		panic("library: embedded solutes.json: " + err.Error())
	}
	return l
}

// Parse decodes and validates a solutes file. Unknown fields are errors.
func Parse(b []byte) (*Library, error) {
	dec := jsonx.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	var f solutesFile
	if err := dec.Decode(&f); err != nil {
		return nil, fmt.Errorf("solutes: %w", err)
	}
	return New(f.Solutes)
}

// New validates the solutes and indexes them by ID and alias.
func New(solutes []Solute) (*Library, error) {
	l := &Library{index: map[string]*Solute{}}
	for i := range solutes {
		s := &solutes[i]
		if err := s.Validate(); err != nil {
			return nil, err
		}
		for _, key := range append([]string{s.ID}, s.Aliases...) {
			k := Key(key)
			if other, dup := l.index[k]; dup {
				return nil, fmt.Errorf("solute %q: name %q already used by %q", s.ID, key, other.ID)
			}
			l.index[k] = s
		}
		l.solutes = append(l.solutes, s)
	}
	return l, nil
}

// Key normalises a solute name for look-up: case-insensitive, blanks,
// tabs, underscores, hyphens and the middle dot ignored. It is a single
// hand-written pass (no replacer is built per call): a name already in
// its key form (lower-case ASCII with nothing to drop) is returned without
// allocating, so matching lists of names stays linear and cheap.
func Key(name string) string {
	name = strings.TrimSpace(name)
	clean := true
	for i := 0; i < len(name); i++ {
		c := name[i]
		if c >= 0x80 || c == ' ' || c == '\t' || c == '_' || c == '-' || c >= 'A' && c <= 'Z' {
			clean = false
			break
		}
	}
	if clean {
		return name
	}
	var b strings.Builder
	b.Grow(len(name))
	ascii := true
	for _, r := range name {
		switch r {
		case ' ', '\t', '·', '_', '-':
			continue
		}
		if r >= 0x80 {
			ascii = false
		} else if r >= 'A' && r <= 'Z' {
			r += 'a' - 'A'
		}
		b.WriteRune(r)
	}
	if ascii {
		return b.String()
	}
	return strings.ToLower(b.String())
}

// Lookup finds a solute by ID or alias, case-insensitively.
func (l *Library) Lookup(name string) (*Solute, bool) {
	s, ok := l.index[Key(name)]
	return s, ok
}

// All returns the solutes in file order.
func (l *Library) All() []*Solute { return l.solutes }

// IDs returns the solute IDs, sorted.
func (l *Library) IDs() []string {
	ids := make([]string, len(l.solutes))
	for i, s := range l.solutes {
		ids[i] = s.ID
	}
	sort.Strings(ids)
	return ids
}

// Nu returns the number of ions per formula unit (the van 't Hoff factor):
// Σ count over Ions, or OsmoticModel.VantHoffNu, or 1 for a non-electrolyte.
func (s *Solute) Nu() float64 {
	if s.Osmotic.VantHoffNu > 0 {
		return s.Osmotic.VantHoffNu
	}
	n := 0
	for _, ion := range s.Ions {
		n += ion.Count
	}
	if n == 0 {
		return 1
	}
	return float64(n)
}

// MolarMassKgPerMol is the molar mass in SI units.
func (s *Solute) MolarMassKgPerMol() float64 { return s.MolarMassGPerMol / 1000 }

// Validate checks a record for internal consistency: finite, positive
// numbers where required, a known model kind with its parameters,
// electroneutral ions, and a source for every group of numbers.
func (s *Solute) Validate() error {
	bad := func(field, format string, a ...any) error {
		return fmt.Errorf("solute %q: %s: %s", s.ID, field, fmt.Sprintf(format, a...))
	}
	if s.ID == "" {
		return fmt.Errorf("solute with empty id (name %q)", s.Name)
	}
	if !(s.MolarMassGPerMol > 0) || math.IsInf(s.MolarMassGPerMol, 0) {
		return bad("molar_mass_g_per_mol", "must be a positive finite number, got %v", s.MolarMassGPerMol)
	}
	if len(s.Components) > 0 {
		return bad("components", "a library record is one solute; blends are built from records by the engine")
	}
	charge := 0
	for _, ion := range s.Ions {
		if ion.Count <= 0 || ion.Charge == 0 {
			return bad("ions", "ion %q needs a non-zero charge and a positive count", ion.Symbol)
		}
		charge += ion.Charge * ion.Count
	}
	if charge != 0 {
		return bad("ions", "not electroneutral (net charge %d)", charge)
	}
	m := s.Osmotic
	switch m.Kind {
	case ModelPitzer:
		if len(s.Ions) != 2 {
			return bad("ions", "a Pitzer single-electrolyte record needs exactly one cation and one anion")
		}
		if !(m.Alpha1 > 0) {
			return bad("osmotic_model.alpha1", "must be positive")
		}
		if m.Beta2 != 0 && !(m.Alpha2 > 0) {
			return bad("osmotic_model.alpha2", "must be positive when beta2 is set")
		}
		if !(m.MaxMolalityMolPerKg > 0) {
			return bad("osmotic_model.max_molality_mol_per_kg", "must be positive")
		}
		if t := m.Temperature; t != nil {
			want := map[string]int{TempLinear: 0, TempQuadratic: 3, TempHolmesMesmer: 6}
			n, ok := want[t.Kind]
			if !ok {
				return bad("osmotic_model.temperature.kind", "unknown %q", t.Kind)
			}
			if n > 0 && (len(t.Beta0Coeffs) != n || len(t.Beta1Coeffs) != n || len(t.CPhiCoeffs) != n) {
				return bad("osmotic_model.temperature", "%s needs %d coefficients per parameter", t.Kind, n)
			}
			if !(t.MaxC > t.MinC) {
				return bad("osmotic_model.temperature", "max_c must exceed min_c")
			}
		}
	case ModelPhiPolynomial:
		if len(m.PhiCoefficients) == 0 || !(m.MaxMolalityMolPerKg > 0) {
			return bad("osmotic_model", "phi-polynomial needs phi_coefficients and max_molality_mol_per_kg")
		}
	case ModelNorrish:
		if !(m.MaxMolalityMolPerKg > 0) {
			return bad("osmotic_model", "norrish needs max_molality_mol_per_kg")
		}
	case ModelSeawater:
	case ModelMixture:
		if m.CompositionFeed == "" {
			return bad("osmotic_model.composition_feed", "a mixture record names the feed record that holds its composition")
		}
	case ModelTable:
		if m.Table == nil || len(m.Table.Points) < 2 {
			return bad("osmotic_model.table", "needs at least two points")
		}
		prevC, prevP := 0.0, 0.0
		for i, p := range m.Table.Points {
			if !(p.Concentration > prevC) || !(p.OsmoticPressureBar > prevP) {
				return bad(fmt.Sprintf("osmotic_model.table.points[%d]", i),
					"concentration and osmotic pressure must both increase and be positive")
			}
			prevC, prevP = p.Concentration, p.OsmoticPressureBar
		}
	case ModelNone:
		if m.Reason == "" {
			return bad("osmotic_model.reason", "a record without a model must say why")
		}
	default:
		return bad("osmotic_model.kind", "unknown %q", m.Kind)
	}
	if !s.Solubility.Miscible && len(s.Solubility.Points) == 0 {
		return bad("solubility", "needs at least one point or miscible: true")
	}
	for i := 1; i < len(s.Solubility.Points); i++ {
		if !(s.Solubility.Points[i].TemperatureC > s.Solubility.Points[i-1].TemperatureC) {
			return bad("solubility.points", "temperatures must increase")
		}
	}
	if a := s.Solubility.SaturatedWaterActivity; a != nil {
		if s.Solubility.Miscible || len(s.Solubility.Points) == 0 {
			return bad("solubility.saturated_water_activity", "needs solubility points: it is the water activity at saturation")
		}
		if !(a.MinC >= 0 && a.MaxC <= 100 && a.MinC <= a.MaxC) || !(a.UncertaintyPercentRH > 0 && a.UncertaintyPercentRH < 100) {
			return bad("solubility.saturated_water_activity", "needs 0 ≤ min_c ≤ max_c ≤ 100 °C and 0 < uncertainty_percent_rh < 100")
		}
		for _, tC := range []float64{a.MinC, a.MaxC} {
			if aw, _ := a.At(tC); !(aw > 0 && aw < 1) {
				return bad("solubility.saturated_water_activity", "a_percent·exp(b_k/T)/100 must lie in (0, 1) over %g–%g °C, got %v at %g °C", a.MinC, a.MaxC, aw, tC)
			}
		}
	}
	if !(s.Diffusivity.D0M2PerS > 0 && s.Diffusivity.D0M2PerS < 1e-8) {
		return bad("diffusivity.d0_m2_per_s", "must be in (0, 1e-8) m²/s, got %v", s.Diffusivity.D0M2PerS)
	}
	if p := s.Price; p != nil && !(p.USDPerKgMin > 0 && p.USDPerKgMax >= p.USDPerKgMin) {
		return bad("price", "needs 0 < usd_per_kg_min ≤ usd_per_kg_max")
	}
	for _, f := range s.HazardFlags {
		if !IsHazardFlag(f) {
			return bad("hazard_flags", "unknown flag %q (known: %s)", f, strings.Join(HazardFlags, ", "))
		}
	}
	if len(s.Sources) == 0 {
		return bad("sources", "every record names its sources")
	}
	return nil
}
