// Package cli runs Alvea's terminal commands (alvea plan, alvea audit).
//
// TEMPORARY STUB written by the app frame so `alvea plan` is wired: the
// transport-plan work replaces this file whole with the real Plan.
package cli

import (
	"fmt"
	"io"
)

// Plan runs `alvea plan`. Stub: reports that the command is not built yet.
func Plan(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fmt.Fprintln(stderr, "alvea plan: not available in this build yet")
	return 2
}
