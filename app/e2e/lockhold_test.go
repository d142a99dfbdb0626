//go:build !wasm

package e2e

import (
	"strings"
	"testing"
)

// A note typed and not saved when the logbook locks is hidden with the
// transport, and the next unlock brings the crew back to the same
// transport with the note in its field; saved then, it is in the timeline
// once. Issue 5: nothing is lost; a lock hides what was decrypted.
func TestLogbookLockKeepsTypedNote(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	b.startTransport("Fixed wing", "Ridge strip", "Coast base")
	before := len(b.savedSeqs())
	const typed = "typed-before-lock-7Q"
	b.typeInto("#lb-note-text", typed)
	b.tap("#lb-lock")
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 10e9)
	if got := eval[string](b, `document.body.innerText`); strings.Contains(got, typed) || strings.Contains(got, "Ridge strip") {
		t.Fatal("locked: the note or the transport is still on screen")
	}
	if got := b.text("#lb-status"); !strings.Contains(got, "comes back when you unlock") {
		t.Errorf("locked: the status says %q", got)
	}
	b.unlock(testPass)
	b.waitLB("the transport again", `document.querySelector("#lb-note-text") !== null && document.querySelector("#lb-timeline li[data-seq]") !== null && !document.querySelector(".lb-busy")`, 20e9)
	if got := eval[string](b, `document.querySelector("#lb-note-text").value`); got != typed {
		t.Fatalf("unlocked: the note field holds %q, want %q", got, typed)
	}
	b.tap("#lb-note-go")
	b.waitSeqs(before + 1)
	if n := strings.Count(b.timelineText(), typed); n != 1 {
		t.Errorf("the note is in the timeline %d time(s), want once", n)
	}
}
