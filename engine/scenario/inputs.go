package scenario

import (
	"drawsift/engine/limits"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/thermo"
)

// LookupSolute finds a library solute by ID or alias; the error names
// field and lists the known IDs.
func LookupSolute(field, name string) (*library.Solute, error) {
	if strings.TrimSpace(name) == "" {
		return nil, errs.InvalidText(field, name, nil, "a solute is required (e.g. \"NaCl\")")
	}
	lib, err := library.Default()
	if err != nil {
		return nil, err
	}
	s, ok := lib.Lookup(name)
	if !ok {
		if near := nearestSolute(lib, name); near != "" {
			return nil, errs.InvalidText(field, name, nil, "unknown solute %q; did you mean %q? Known: %s", name, near, strings.Join(lib.IDs(), ", "))
		}
		return nil, errs.InvalidText(field, name, nil, "unknown solute %q; known: %s", name, strings.Join(lib.IDs(), ", "))
	}
	return s, nil
}

// TemperatureK returns a request's temperature in kelvin (TemperatureC's
// default when omitted).
func TemperatureK(field string, tC *float64) (float64, error) {
	t := limits.TemperatureC.Default
	if tC != nil {
		t = *tC
	}
	if err := limits.TemperatureC.CheckAt(field, t); err != nil {
		return 0, err
	}
	return t + thermo.ZeroCelsiusK, nil
}

// ParseConcentration checks a value/unit pair under prefix ("draw",
// "feed", "" for the top level).
func ParseConcentration(prefix string, v *float64, unit string) (float64, thermo.Unit, error) {
	if v == nil {
		return 0, 0, errs.InvalidText(errs.Join(prefix, "concentration"), "", nil, "a concentration is required")
	}
	if !limits.Concentration.Contains(*v) {
		return 0, 0, errs.Invalid(errs.Join(prefix, "concentration"), *v, limits.Concentration.Text(), "concentration must be a finite, non-negative number (got %g)", *v)
	}
	if unit == "" {
		return 0, 0, errs.InvalidText(errs.Join(prefix, "unit"), "", thermo.UnitNames(), "a unit is required")
	}
	u, scale, err := thermo.ParseScaledUnit(unit)
	if err != nil {
		return 0, 0, errs.InvalidText(errs.Join(prefix, "unit"), unit, thermo.UnitNames(), "%v", err)
	}
	return *v * scale, u, nil
}

// optional checks an optional number against r under field (nil stays nil).
func optional(r *limits.Range, field string, v *float64) error {
	if v == nil {
		return nil
	}
	return r.CheckAt(field, *v)
}

// nearestSolute is the library ID or alias closest to name when it is
// within two edits (case-insensitive; "NaCI" → "NaCl"), else "".
func nearestSolute(lib *library.Library, name string) string {
	best, bestD := "", 3
	q := strings.ToLower(strings.TrimSpace(name))
	for _, s := range lib.All() {
		for _, c := range append([]string{s.ID}, s.Aliases...) {
			if d := editDistance(q, strings.ToLower(c)); d < bestD {
				best, bestD = s.ID, d
			}
		}
	}
	return best
}

// editDistance is the Levenshtein distance of a and b (runes), capped
// early at 3: names longer apart than that are not suggestions.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	if d := len(ra) - len(rb); d > 2 || d < -2 {
		return 3
	}
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}
