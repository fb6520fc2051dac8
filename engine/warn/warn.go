// Package warn holds the engine's warnings as values: each layer appends
// a Warning with a code saying what it is about, and the hosts print its
// text. No layer re-derives a warning from another's text, so a warning
// raised anywhere reaches the CLI, the HTTP API and the page unchanged.
package warn

import (
	"fmt"
	"slices"
)

// Code says what a warning is about; callers may test it.
type Code string

// Codes.
const (
	// Model validity.
	Extrapolated   Code = "extrapolated"    // past a model's data or fit range
	Bridged        Code = "bridged"         // between a model's data limit and a measured saturated solution
	Temperature25C Code = "temperature-25c" // 25 °C data used at another temperature
	NoModel        Code = "no-model"        // van 't Hoff only: no non-ideal model
	Solubility     Code = "solubility"      // at or past solubility
	ModelNote      Code = "model-note"      // other remarks of a solute's model
	BEstimated     Code = "b-estimated"     // B scaled from NaCl's
	NoPrice        Code = "no-price"        // no price on record
	FlowRegime     Code = "flow-regime"     // Reynolds number between laminar and turbulent
	Unverified     Code = "unverified"      // a correlation quoted from memory
	ReverseFlow    Code = "reverse-flow"    // water flows from draw to feed
	Unused         Code = "unused"          // an input that has no effect
	Regeneration   Code = "regeneration"    // about the regeneration estimate
	Scaling        Code = "scaling"         // mineral saturation
	// FeedToDraw: solute crossing from the feed into the draw makes a
	// derived ratio (flux efficiency, SRSF) leave its usual range.
	FeedToDraw Code = "feed-to-draw"
)

// Warning is one warning: its code, what it concerns (a solute ID, "feed",
// "k_draw"; may be empty) and the text a person reads.
type Warning struct {
	Code    Code
	Subject string
	Text    string
}

// New returns a warning with a formatted text.
func New(code Code, subject, format string, a ...any) Warning {
	return Warning{Code: code, Subject: subject, Text: fmt.Sprintf(format, a...)}
}

// String is the text as hosts print it: "subject: text" when the subject is
// not already the text's first word.
func (w Warning) String() string {
	if w.Subject == "" || len(w.Text) > len(w.Subject) && w.Text[:len(w.Subject)] == w.Subject {
		return w.Text
	}
	return w.Subject + ": " + w.Text
}

// About returns a copy of w concerning subject.
func (w Warning) About(subject string) Warning {
	w.Subject = subject
	return w
}

// Strings prints a list, dropping exact repeats, in order; never nil.
func Strings(ws []Warning) []string {
	out := make([]string, 0, len(ws))
	for _, w := range ws {
		s := w.String()
		if !slices.Contains(out, s) {
			out = append(out, s)
		}
	}
	return out
}

// Has reports whether ws holds a warning with the code.
func Has(ws []Warning, code Code) bool {
	return slices.ContainsFunc(ws, func(w Warning) bool { return w.Code == code })
}
