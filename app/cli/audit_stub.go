package cli

// TEMPORARY STUB written by the app frame so `alvea audit` is wired: the
// audit work replaces this file whole with the real Audit.

import (
	"fmt"
	"io"
)

// Audit runs `alvea audit`. Stub: reports that the command is not built yet.
func Audit(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fmt.Fprintln(stderr, "alvea audit: not available in this build yet")
	return 2
}
