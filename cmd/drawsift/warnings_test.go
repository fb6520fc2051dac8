package main

import (
	"bytes"
	"strings"
	"testing"
)

// Every warning the engine raises reaches the CLI's table and CSV, not
// only its JSON: the demo screen's channel correlation is quoted from
// memory, and the screen says so.
func TestScreenWarningsInEveryFormat(t *testing.T) {
	for _, format := range []string{"table", "csv", "json"} {
		var out, errb bytes.Buffer
		if code := run([]string{"screen", "--demo", "--format", format}, strings.NewReader(""), &out, &errb); code != 0 {
			t.Fatalf("%s: exit %d: %s", format, code, errb.String())
		}
		if !strings.Contains(out.String(), "Sherwood correlation quoted from memory") {
			t.Errorf("%s output lacks the engine's mass-transfer warning", format)
		}
	}
}
