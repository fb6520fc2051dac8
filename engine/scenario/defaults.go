// Package scenario resolves what every calculation needs from a request's
// choices — presets, defaults, B per solute, k from a channel, the osmotic
// model, the feed's ions — once, for every operation (flux, screen, and
// the module and fit operations to come), and holds the one table of
// defaults and limits (limits.go) that the page reads through the
// defaults operation.
//
// It sits between the contract (engine/api, which knows JSON and maps the
// request's fields here) and the calculations (engine/screen,
// engine/transport, engine/thermo). Values it takes are in the contract's
// units, as its Range table states them; what it returns is SI.
package scenario

import (
	"drawsift/engine/limits"
	"strings"

	"drawsift/engine/errs"
	"drawsift/engine/library"
	"drawsift/engine/screen"
	"drawsift/engine/transport"
)

// Defaults that are not numbers. Each numeric default lives in its Range.
const (
	// DefaultMembranePreset is used when a scenario names no membrane.
	DefaultMembranePreset = "tfc-standard"
	// DefaultFeedPreset is used when a scenario names no feed.
	DefaultFeedPreset = "deionised-water"
	// DefaultOrientation ranks the candidates when none is named.
	DefaultOrientation = "AL-FS"
)

// OsmoticModel is how π is computed.
type OsmoticModel int

// Osmotic models.
const (
	Real     OsmoticModel = iota // the solute's non-ideal model (default)
	VantHoff                     // π = ν c R T
)

// OsmoticModelNames are the accepted names, the default first.
var OsmoticModelNames = []string{"real", "van-t-hoff"}

func (m OsmoticModel) String() string { return OsmoticModelNames[m] }

// OsmoticModelAliases are the other accepted spellings, by the name they
// stand for.
var OsmoticModelAliases = map[string]string{"vant-hoff": "van-t-hoff", "van't-hoff": "van-t-hoff", "ideal": "van-t-hoff"}

// ParseOsmoticModel reads an osmotic-model name or alias, case-insensitively
// ("" → real).
func ParseOsmoticModel(name string) (OsmoticModel, error) {
	k := strings.ToLower(strings.TrimSpace(name))
	if a, ok := OsmoticModelAliases[k]; ok {
		k = a
	}
	switch k {
	case "", "real":
		return Real, nil
	case "van-t-hoff":
		return VantHoff, nil
	}
	return Real, errs.InvalidText("osmotic_model", name, OsmoticModelNames, "unknown osmotic model %q", name)
}

// OrientationNames are the accepted orientations, the default first.
var OrientationNames = []string{"AL-FS", "AL-DS"}

// ParseOrientation reads an orientation on field ("" → AL-FS).
func ParseOrientation(field, name string) (transport.Orientation, error) {
	if name == "" {
		name = DefaultOrientation
	}
	o, err := transport.ParseOrientation(name)
	if err != nil {
		return o, errs.InvalidText(field, name, OrientationNames, "unknown orientation %q", name)
	}
	return o, nil
}

// Table is every default and list of accepted names, for the defaults
// operation: what the page shows before the user changes anything, and
// the limits it checks beside each field.
type Table struct {
	Ranges           []*limits.Range
	Weights          screen.Weights
	ParetoObjectives []screen.Objective
	MembranePreset   string
	FeedPreset       string
	Orientation      string
	Orientations     []string
	OsmoticModel     string
	OsmoticModels    []string
	HazardFlags      []string
}

// Defaults returns the table.
func Defaults() Table {
	return Table{
		Ranges:           limits.Ranges(),
		Weights:          screen.DefaultWeights,
		ParetoObjectives: append([]screen.Objective(nil), screen.DefaultPareto...),
		MembranePreset:   DefaultMembranePreset,
		FeedPreset:       DefaultFeedPreset,
		Orientation:      DefaultOrientation,
		Orientations:     append([]string(nil), OrientationNames...),
		OsmoticModel:     OsmoticModelNames[0],
		OsmoticModels:    append([]string(nil), OsmoticModelNames...),
		HazardFlags:      append([]string(nil), library.HazardFlags...),
	}
}
