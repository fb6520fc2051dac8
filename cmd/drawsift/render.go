package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"
)

// render writes a successful response in the chosen format.
func render(w io.Writer, op, format string, resp []byte) error {
	switch format {
	case "json":
		var buf bytes.Buffer
		if err := json.Indent(&buf, resp, "", "  "); err != nil {
			return err
		}
		buf.WriteByte('\n')
		_, err := w.Write(buf.Bytes())
		return err
	case "csv", "table":
		switch op {
		case "screen", "robustness-merge":
			return renderScreen(w, format, resp)
		case "osmotic":
			return renderOsmotic(w, format, resp)
		case "module":
			return renderModule(w, format, resp)
		}
		kv, err := flatten(resp)
		if err != nil {
			return err
		}
		if format == "csv" {
			return writeCSV(w, kv)
		}
		return writeTable(w, kv)
	}
	return fmt.Errorf("unknown format %q", format)
}

// pair is one flattened field: its JSON path and its value as text.
type pair struct{ key, val string }

// flatten walks a JSON object in document order and returns its scalar
// leaves; nested objects are joined with "." and arrays of scalars with
// "; ". Arrays of objects are expanded with an index.
func flatten(b []byte) ([]pair, error) {
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.UseNumber()
	var out []pair
	var walk func(prefix string) error
	var value func(prefix string, tok json.Token) error
	value = func(prefix string, tok json.Token) error {
		switch t := tok.(type) {
		case json.Delim:
			switch t {
			case '{':
				return walk(prefix)
			case '[':
				var items []string
				i := 0
				for dec.More() {
					next, err := dec.Token()
					if err != nil {
						return err
					}
					if d, ok := next.(json.Delim); ok && (d == '{' || d == '[') {
						if err := value(fmt.Sprintf("%s[%d]", prefix, i), next); err != nil {
							return err
						}
					} else {
						items = append(items, scalar(next))
					}
					i++
				}
				if _, err := dec.Token(); err != nil { // ']'
					return err
				}
				if len(items) > 0 || i == 0 {
					out = append(out, pair{prefix, strings.Join(items, "; ")})
				}
				return nil
			}
		default:
			out = append(out, pair{prefix, scalar(t)})
		}
		return nil
	}
	walk = func(prefix string) error {
		for dec.More() {
			kt, err := dec.Token()
			if err != nil {
				return err
			}
			key := kt.(string)
			if prefix != "" {
				key = prefix + "." + key
			}
			vt, err := dec.Token()
			if err != nil {
				return err
			}
			if err := value(key, vt); err != nil {
				return err
			}
		}
		_, err := dec.Token() // '}'
		return err
	}
	tok, err := dec.Token()
	if err != nil {
		return nil, err
	}
	if d, ok := tok.(json.Delim); !ok || d != '{' {
		return nil, fmt.Errorf("response is not a JSON object")
	}
	return out, walk("")
}

func scalar(tok json.Token) string {
	switch v := tok.(type) {
	case json.Number:
		if f, err := v.Float64(); err == nil {
			return strconv.FormatFloat(f, 'g', 6, 64)
		}
		return v.String()
	case string:
		return v
	case bool:
		return strconv.FormatBool(v)
	case nil:
		return ""
	}
	return fmt.Sprint(tok)
}

// writeCSV writes one header row (the field names, units in them) and one
// value row.
func writeCSV(w io.Writer, kv []pair) error {
	cw := newCSV(w)
	writeKV(cw, kv)
	cw.Flush()
	return cw.Error()
}

// writeKV writes the header row of kv's keys and the row of its values.
func writeKV(cw *csvWriter, kv []pair) {
	keys, vals := make([]string, len(kv)), make([]string, len(kv))
	for i, p := range kv {
		keys[i], vals[i] = p.key, p.val
	}
	cw.Write(keys)
	cw.Write(vals)
}

// writeTable writes aligned "field  value" lines, sources last.
func writeTable(w io.Writer, kv []pair) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, p := range kv {
		if strings.HasPrefix(p.key, "sources") {
			continue
		}
		fmt.Fprintf(tw, "%s\t%s\n", plainText(p.key), plainText(p.val))
	}
	return tw.Flush()
}
