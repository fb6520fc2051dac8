package main

import "io"

// indentWriter indents compact JSON as it is written, byte for byte as
// encoding/json.Indent(dst, src, "", "  ") would the whole (empty objects
// and arrays stay "{}" and "[]"), so that a streamed answer prints as the
// buffered one does.
type indentWriter struct {
	w          io.Writer
	depth      int
	inString   bool
	escape     bool
	needIndent bool
	buf        []byte
}

func (x *indentWriter) newline(depth int) {
	x.buf = append(x.buf, '\n')
	for i := 0; i < depth; i++ {
		x.buf = append(x.buf, ' ', ' ')
	}
}

func (x *indentWriter) Write(p []byte) (int, error) {
	x.buf = x.buf[:0]
	for _, c := range p {
		if x.inString {
			x.buf = append(x.buf, c)
			switch {
			case x.escape:
				x.escape = false
			case c == '\\':
				x.escape = true
			case c == '"':
				x.inString = false
			}
			continue
		}
		switch c {
		case ' ', '\t', '\n', '\r':
			continue
		}
		if x.needIndent && c != '}' && c != ']' {
			x.needIndent = false
			x.depth++
			x.newline(x.depth)
		}
		switch c {
		case '"':
			x.inString = true
			x.buf = append(x.buf, c)
		case '{', '[':
			x.needIndent = true
			x.buf = append(x.buf, c)
		case ',':
			x.buf = append(x.buf, c)
			x.newline(x.depth)
		case ':':
			x.buf = append(x.buf, c, ' ')
		case '}', ']':
			if x.needIndent {
				x.needIndent = false
			} else {
				x.depth--
				x.newline(x.depth)
			}
			x.buf = append(x.buf, c)
		default:
			x.buf = append(x.buf, c)
		}
	}
	if _, err := x.w.Write(x.buf); err != nil {
		return 0, err
	}
	return len(p), nil
}
