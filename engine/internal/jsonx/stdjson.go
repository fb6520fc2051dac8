//go:build stdjson

package jsonx

import "encoding/json"

// Marshal, MarshalIndent, Unmarshal and NewDecoder are those of the chosen library.
var (
	Marshal       = json.Marshal
	MarshalIndent = json.MarshalIndent
	Unmarshal     = json.Unmarshal
	NewDecoder    = json.NewDecoder
	NewEncoder    = json.NewEncoder
	Valid         = json.Valid
)

// RawMessage is an undecoded JSON value of the chosen library.
type RawMessage = json.RawMessage

// Library names the JSON library in use, for reproducibility records.
const Library = "encoding/json"
