//go:build !stdjson

// Package jsonx is the one place that chooses the JSON library.
//
// By default it is github.com/goccy/go-json (about 3.7× faster than
// encoding/json for our payloads, tooling.md §2). The page's wasm is built
// with -tags stdjson and uses encoding/json instead, because go-json adds
// about 1 MB gzip to a js/wasm binary and the page has a 1.5 MB budget.
// Both expose the same API used here.
package jsonx

import json "github.com/goccy/go-json"

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
const Library = "github.com/goccy/go-json"
