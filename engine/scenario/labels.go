package scenario

import (
	"fmt"
	"unicode"
	"unicode/utf8"

	"drawsift/engine/errs"
)

// CheckLabel refuses a user-chosen identifier or name (a custom solute's
// id and name, a blend's id) holding a character that would hide what it
// says or change how it prints: control characters (NUL, ESC, DEL, the C1
// set; a terminal obeys ESC sequences), and Unicode format characters
// (category Cf: the bidirectional overrides and isolates U+202A–U+202E,
// U+2066–U+2069, the zero-width U+200B–U+200D, U+2060 and U+FEFF, the soft
// hyphen), with which "Na\u200bCl" looks like NaCl but is another solute;
// invalid UTF-8 too. The error names the field and the character.
func CheckLabel(field, s string) error {
	for i, r := range s {
		switch {
		case r == utf8.RuneError:
			if _, n := utf8.DecodeRuneInString(s[i:]); n <= 1 {
				return errs.InvalidText(field, "", labelLimit, "invalid UTF-8 at byte %d", i)
			}
		case unicode.IsControl(r) || unicode.Is(unicode.Cf, r):
			return errs.InvalidText(field, "", labelLimit, "character %s at byte %d is not allowed in an identifier or name (%s)", fmt.Sprintf("U+%04X", r), i, labelLimit)
		}
	}
	return nil
}

// labelLimit is the rule CheckLabel applies, as its errors state it.
const labelLimit = "printable characters only: no control characters (NUL, ESC, …), bidirectional overrides or zero-width characters"
