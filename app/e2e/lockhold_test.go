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

// A start of transport half typed survives a look at the Brief: the crew
// goes to the Brief screen and back, taps Start transport again, and what
// they typed is in its fields, with a status saying so. Issue 5: nothing
// typed is lost.
func TestLogbookStartFormKeptAcrossScreens(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	b.tap("#lb-nav-start")
	b.waitLB("the start form", `document.querySelector("#lb-start") !== null`, 10e9)
	typed := map[string]string{"#lb-vehicle": "Rotor wing 4K", "#lb-origin": "Valley ward", "#lb-weight": "58"}
	for _, sel := range []string{"#lb-vehicle", "#lb-origin", "#lb-weight"} {
		b.typeInto(sel, typed[sel])
	}
	b.tap("#tab-brief")
	b.waitLB("the Brief", `document.querySelector("#b-result") !== null && document.querySelector("#lb-start") === null`, 10e9)
	b.tap("#tab-logbook")
	b.waitLB("the list", `document.querySelector("#lb-nav-start") !== null && !document.querySelector(".lb-busy")`, 20e9)
	b.tap("#lb-nav-start")
	b.waitLB("the start form again", `document.querySelector("#lb-vehicle") !== null`, 10e9)
	for sel, want := range typed {
		if got := eval[string](b, `document.querySelector("`+sel+`").value`); got != want {
			t.Errorf("%s holds %q after a visit to the Brief, want %q", sel, got, want)
		}
	}
	if got := b.text("#lb-status"); !strings.Contains(got, "back in its fields") {
		t.Errorf("the status says %q", got)
	}
}
