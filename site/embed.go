// Package site embeds Drawsift's static page (HTML, CSS, JS, worker,
// service worker, manifest). The engine's wasm is a build product, served
// beside these files by the hosts (see cmd/drawsift).
package site

import (
	"embed"
	"io/fs"
)

//go:embed static
var files embed.FS

// FS is the page's files, rooted at the site's top directory.
var FS, _ = fs.Sub(files, "static")
