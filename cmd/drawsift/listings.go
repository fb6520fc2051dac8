package main

import (
	"context"
	"encoding/json"
	"fmt"

	"drawsift/engine/api"
)

// listingsFile names the engine's listings beside the page: the answers
// of its defaults, presets and solutes operations with the engine version,
// in one JSON object. The page builds its form from them while its own
// engine is still compiling, then checks them against that engine's
// answers once the first ranking is shown (app.js); a copy of another
// version is never used. The bundle carries the same object inline.
const listingsFile = "listings.json"

// listings returns the listings object of this build's engine.
func listings() ([]byte, error) {
	var l struct {
		Version  string          `json:"version"`
		Defaults json.RawMessage `json:"defaults"`
		Presets  json.RawMessage `json:"presets"`
		Solutes  json.RawMessage `json:"solutes"`
	}
	l.Version = api.EngineVersion
	for _, p := range []struct {
		op  string
		dst *json.RawMessage
	}{{api.OpDefaults, &l.Defaults}, {api.OpPresets, &l.Presets}, {api.OpSolutes, &l.Solutes}} {
		b, e := api.Dispatch(context.Background(), p.op, nil)
		if e != nil {
			return nil, fmt.Errorf("the engine's %s: %s", p.op, e.Message)
		}
		*p.dst = b
	}
	return json.Marshal(l)
}
