package cli

import (
	"io"
	"strconv"
	"strings"
	"unicode"
)

// printable returns free text read from a plan document or a bundle (a
// title, a vehicle, a place or cylinder name, a reason) fit to print on a
// terminal: control characters (a newline, a tab, an escape sequence that
// would recolour or clear the screen) and the bidirectional overrides that
// reorder what is shown are written as Go escapes (\n, \x1b, \u202e), so the
// text cannot forge a line of the report, break a table's columns or act
// on the terminal. Other text is returned unchanged.
func printable(s string) string {
	if strings.IndexFunc(s, hidden) < 0 {
		return s
	}
	var b strings.Builder
	for _, r := range s {
		if !hidden(r) {
			b.WriteRune(r)
			continue
		}
		q := strconv.QuoteRuneToASCII(r)
		b.WriteString(q[1 : len(q)-1])
	}
	return b.String()
}

func hidden(r rune) bool {
	return unicode.IsControl(r) || unicode.Is(unicode.Bidi_Control, r)
}

// stickyWriter keeps the first error of the writes through it, so that a
// report printed with many Fprintf calls (to a full disk, a closed pipe) is
// not taken as delivered when it was not.
type stickyWriter struct {
	w   io.Writer
	err error
}

func (s *stickyWriter) Write(p []byte) (int, error) {
	if s.err != nil {
		return 0, s.err
	}
	n, err := s.w.Write(p)
	s.err = err
	return n, err
}
