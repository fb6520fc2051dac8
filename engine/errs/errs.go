// Package errs holds the engine's two error types, shared by every engine
// package and converted to the contract's error object in one place
// (engine/api): *InputError for an input outside what a model or solver
// accepts, and *ConvergenceError for a solver that stopped without meeting
// its tolerance. Neither ever carries NaN or Inf: a non-finite offending
// value travels as text.
package errs

import (
	"errors"
	"fmt"
	"math"
	"strconv"
)

// ErrInvalidInput is what every *InputError unwraps to when it has no
// cause of its own: errors.Is(err, ErrInvalidInput) tells input errors
// from engine faults.
var ErrInvalidInput = errors.New("invalid input")

// ErrNotConverged is what every *ConvergenceError unwraps to.
var ErrNotConverged = errors.New("solver did not converge")

// InputError reports an input outside its allowed range, in the manner of
// strconv.NumError: which field, what value, which limit.
//
// Field uses the contract's JSON names ("membrane.a_lmh_per_bar",
// "draw.concentration"); a caller that knows more of the path adds it with
// Prefix. Value is the offending number in the unit the field name
// carries; Text holds the offending value instead when it is not a finite
// number (NaN, ±Inf, an unknown name), so Value is then 0. Limit states the
// bound that was crossed in the field's units: a string such as
// "0–100 °C", or the list of accepted names.
type InputError struct {
	Field string
	Value float64
	Text  string
	Limit any
	Msg   string
	Err   error
}

// Invalid returns an *InputError on field for the number v (sent as Text
// when it is not finite), with the limit and a message.
func Invalid(field string, v float64, limit any, format string, a ...any) *InputError {
	e := &InputError{Field: field, Limit: limit, Msg: fmt.Sprintf(format, a...)}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		e.Text = strconv.FormatFloat(v, 'g', -1, 64)
	} else {
		e.Value = v
	}
	return e
}

// InvalidText returns an *InputError on field for a non-numeric value.
func InvalidText(field, text string, limit any, format string, a ...any) *InputError {
	return &InputError{Field: field, Text: text, Limit: limit, Msg: fmt.Sprintf(format, a...)}
}

func (e *InputError) Error() string {
	if e.Msg == "" {
		// A bare range error: "field = value: must be limit".
		v := strconv.FormatFloat(e.Value, 'g', -1, 64)
		if e.Text != "" {
			v = strconv.Quote(e.Text)
		}
		return fmt.Sprintf("%s = %s: must be %s", e.Field, v, LimitText(e.Limit))
	}
	msg := e.Msg
	got := ""
	switch {
	case e.Text != "":
		got = fmt.Sprintf("got %q", e.Text)
	case e.Value != 0:
		got = fmt.Sprintf("got %g", e.Value)
	}
	lim := ""
	if s := LimitText(e.Limit); s != "" {
		lim = "limit " + s
	}
	tail := ""
	switch {
	case got != "" && lim != "":
		tail = " (" + got + ", " + lim + ")"
	case got != "":
		tail = " (" + got + ")"
	case lim != "":
		tail = " (" + lim + ")"
	}
	if e.Field == "" {
		return msg + tail
	}
	return e.Field + ": " + msg + tail
}

// Unwrap returns the cause, or ErrInvalidInput.
func (e *InputError) Unwrap() error {
	if e.Err != nil {
		return e.Err
	}
	return ErrInvalidInput
}

// Prefix returns a copy of e whose field is prefix.field (or prefix alone
// when e names no field).
func (e *InputError) Prefix(prefix string) *InputError {
	c := *e
	c.Field = Join(prefix, e.Field)
	return &c
}

// LimitText renders a limit for a message ("" for none).
func LimitText(limit any) string {
	switch l := limit.(type) {
	case nil:
		return ""
	case string:
		return l
	case []string:
		s := ""
		for i, x := range l {
			if i > 0 {
				s += ", "
			}
			s += x
		}
		return "one of " + s
	default:
		return fmt.Sprint(l)
	}
}

// Join joins two parts of a field path with a dot, skipping empty parts.
func Join(prefix, field string) string {
	switch {
	case prefix == "":
		return field
	case field == "":
		return prefix
	}
	return prefix + "." + field
}

// ConvergenceError reports that a solver stopped without meeting its
// tolerance, in the manner of gonum's optimize.Status: which solver, after
// how many iterations, how far from the answer. Residual is the solver's
// own measure (relative where the solver says so) and always finite.
type ConvergenceError struct {
	Solver     string
	Iterations int
	Residual   float64
	// Reason says why it stopped ("iteration limit", "no sign change").
	Reason string
}

func (e *ConvergenceError) Error() string {
	r := e.Reason
	if r == "" {
		r = "iteration limit"
	}
	return fmt.Sprintf("%s did not converge (%s) after %d iterations (residual %.3g)", e.Solver, r, e.Iterations, e.Residual)
}

// Unwrap returns ErrNotConverged.
func (e *ConvergenceError) Unwrap() error { return ErrNotConverged }
