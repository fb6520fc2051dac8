package library

import (
	"fmt"
	"math"
)

// Feed is a feed-water preset as stored in data/feeds.json: how its
// osmotic pressure is computed and its major ions, which the screen's
// scaling check meets with the reverse-fluxed draw ions.
type Feed struct {
	ID          string      `json:"id"`
	Name        string      `json:"name"`
	Description string      `json:"description"`
	Osmotic     FeedOsmotic `json:"osmotic"`
	PH          float64     `json:"ph"`
	// IonUnit is "mg/L" (per litre of feed) or "mg/kg" (per kg of feed).
	IonUnit string `json:"ion_unit"`
	// ReferenceSalinityGPerKg, when positive, is the salinity at which the
	// ion list is given; the list scales with the feed's own salinity.
	ReferenceSalinityGPerKg float64           `json:"reference_salinity_g_per_kg,omitempty"`
	Ions                    []FeedIon         `json:"ions"`
	Sources                 map[string]string `json:"sources"`
}

// Feed osmotic methods.
const (
	FeedOsmoticNone           = "none"            // pure water
	FeedOsmoticSolute         = "solute"          // a library solute at a concentration
	FeedOsmoticEquivalentNaCl = "equivalent-nacl" // NaCl at half the total ion molarity
	FeedOsmoticIons           = "ions"            // the mixed-electrolyte model over the feed's ions
)

// FeedOsmotic says how the feed's osmotic pressure is computed.
type FeedOsmotic struct {
	Method        string  `json:"method"`
	Solute        string  `json:"solute,omitempty"`
	Concentration float64 `json:"concentration,omitempty"`
	Unit          string  `json:"unit,omitempty"`
}

// FeedIon is one dissolved ion of a feed.
type FeedIon struct {
	Symbol           string  `json:"symbol"`
	Charge           int     `json:"charge"`
	MolarMassGPerMol float64 `json:"molar_mass_g_per_mol"`
	Concentration    float64 `json:"concentration"` // in the feed's IonUnit
}

// IonAmount is one ion of a feed in mol per litre or per kg of feed.
type IonAmount struct {
	Symbol string
	Charge int
	Mol    float64
}

// IonsAt returns the feed's ions in mol per unit of feed (per kg for
// IonUnit "mg/kg", else per litre), scaled to salinityGPerKg when the
// record gives its ions at a reference salinity:
//
//	c_i = (w_i / M_i) · S / S_ref
//
// (the constant-proportion composition of seawater, Millero et al. 2008
// Deep-Sea Res. I 55:50). A negative salinityGPerKg, or a record without
// a reference salinity, gives the ions as listed; zero gives none.
func (f *Feed) IonsAt(salinityGPerKg float64) []IonAmount {
	scale := 1.0
	if f.ReferenceSalinityGPerKg > 0 && salinityGPerKg >= 0 {
		scale = salinityGPerKg / f.ReferenceSalinityGPerKg
	}
	out := make([]IonAmount, len(f.Ions))
	for i, ion := range f.Ions {
		out[i] = IonAmount{Symbol: ion.Symbol, Charge: ion.Charge, Mol: ion.Concentration / ion.MolarMassGPerMol / 1000 * scale}
	}
	return out
}

// IonsPerKg reports whether IonsAt is per kg of feed (else per litre).
func (f *Feed) IonsPerKg() bool { return f.IonUnit == "mg/kg" }

// EquivalentNaClRule names the approximation behind FeedOsmoticEquivalentNaCl.
const EquivalentNaClRule = "feed osmotic pressure as NaCl of equal total ion molarity (c_NaCl = Σc_i/2), " +
	"evaluated with NaCl's own osmotic coefficient: equal van 't Hoff osmolarity, common practice for dilute mixed waters"

// EquivalentNaClMolPerL returns Σ c_i / 2 in mol/L for a feed whose ions
// are in mg/L (the NaCl molarity of equal van 't Hoff osmolarity). For
// mg/kg ions it uses 1 kg ≈ 1 L, adequate for the dilute waters this rule
// is meant for.
func (f *Feed) EquivalentNaClMolPerL() float64 {
	sum := 0.0
	for _, ion := range f.Ions {
		sum += ion.Concentration / ion.MolarMassGPerMol / 1000
	}
	return sum / 2
}

// ChargeImbalance returns (Σ cations − Σ anions)/(Σ cations + Σ anions) in
// equivalents; 0 for a feed without ions.
func (f *Feed) ChargeImbalance() float64 {
	var pos, neg float64
	for _, ion := range f.Ions {
		eq := ion.Concentration / ion.MolarMassGPerMol * float64(ion.Charge)
		if eq > 0 {
			pos += eq
		} else {
			neg -= eq
		}
	}
	if pos+neg == 0 {
		return 0
	}
	return (pos - neg) / (pos + neg)
}

// Validate checks a feed record.
func (f *Feed) Validate() error {
	if f.ID == "" {
		return fmt.Errorf("feed with empty id")
	}
	bad := func(field, format string, a ...any) error {
		return fmt.Errorf("feed %q: %s: %s", f.ID, field, fmt.Sprintf(format, a...))
	}
	switch f.Osmotic.Method {
	case FeedOsmoticNone, FeedOsmoticEquivalentNaCl:
	case FeedOsmoticIons:
		if len(f.Ions) == 0 {
			return bad("osmotic", "method ions needs ions")
		}
	case FeedOsmoticSolute:
		if f.Osmotic.Solute == "" || f.Osmotic.Unit == "" || !(f.Osmotic.Concentration >= 0) {
			return bad("osmotic", "method solute needs solute, concentration and unit")
		}
	default:
		return bad("osmotic.method", "unknown %q", f.Osmotic.Method)
	}
	if !(f.PH >= 0 && f.PH <= 14) {
		return bad("ph", "must be within 0–14")
	}
	if f.IonUnit != "mg/L" && f.IonUnit != "mg/kg" {
		return bad("ion_unit", "must be mg/L or mg/kg")
	}
	if f.ReferenceSalinityGPerKg < 0 || math.IsInf(f.ReferenceSalinityGPerKg, 0) {
		return bad("reference_salinity_g_per_kg", "must be positive when set")
	}
	for _, ion := range f.Ions {
		if ion.Symbol == "" || ion.Charge == 0 || !(ion.MolarMassGPerMol > 0) || !(ion.Concentration >= 0) || math.IsInf(ion.Concentration, 0) {
			return bad("ions", "ion %q needs a symbol, a non-zero charge, a positive molar mass and a concentration ≥ 0", ion.Symbol)
		}
	}
	if len(f.Sources) == 0 {
		return bad("sources", "every record names its sources")
	}
	return nil
}

var feedPresets = presetFile[Feed]{name: "feeds",
	id: func(f *Feed) string { return f.ID }, validate: (*Feed).Validate}

// Feeds returns the embedded feed presets in file order.
func Feeds() ([]*Feed, error) { return feedPresets.all() }

// LookupFeed finds a feed preset by ID, case-insensitively.
func LookupFeed(id string) (*Feed, bool) { return feedPresets.lookup(id) }
