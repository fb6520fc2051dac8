package thermo

import "fmt"

// InputError reports an input outside what the models accept. Field uses
// the contract's JSON names (e.g. "concentration", "temperature_c").
type InputError struct {
	Field string
	Value float64
	// Limit states the bound that was crossed, in the field's units.
	Limit string
	Msg   string
}

func (e *InputError) Error() string {
	if e.Limit != "" {
		return fmt.Sprintf("%s: %s (got %g, limit %s)", e.Field, e.Msg, e.Value, e.Limit)
	}
	return fmt.Sprintf("%s: %s (got %g)", e.Field, e.Msg, e.Value)
}
