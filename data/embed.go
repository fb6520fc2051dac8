// Package data embeds Drawsift's property data: solutes, membranes and feeds,
// with their JSON Schemas. Every number in them names its source.
package data

import "embed"

// FS holds the JSON data files and their schemas.
//
//go:embed *.json
var FS embed.FS
