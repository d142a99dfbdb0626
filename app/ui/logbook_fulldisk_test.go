package ui

import (
	"strings"
	"testing"

	"alvea/app/logbook"
)

// After an entry is saved, the next one refused by a full store must not
// leave the earlier "Saved …" line on screen beside it: that line reads as
// if the refused entry had been saved. The same holds for a refused start
// of transport.
func TestLogbookRefusalLeavesNoEarlierSavedLine(t *testing.T) {
	store := &failingStore{Store: logbook.NewMemStore()}
	l, e := mountLogbook(t, testSession(store))
	openTestTransport(t, l, e)
	l.record.noteText = "saved while there is space"
	l.saveNote(l.mctx, noEvent)
	e.ConsumeAll()
	if !strings.HasPrefix(l.status, "Saved note as R2 ") {
		t.Fatalf("the first note: status %q, problem %q", l.status, l.problem)
	}

	store.fail = true
	l.record.noteText = "refused for lack of space"
	l.saveNote(l.mctx, noEvent)
	e.ConsumeAll()
	if !strings.Contains(l.problem, "storage is full") {
		t.Fatalf("the refused note: problem %q", l.problem)
	}
	if strings.Contains(l.status, "Saved") {
		t.Errorf("a refused note is shown beside %q", l.status)
	}

	store.fail = false
	l.record.noteText = "saved again"
	l.saveNote(l.mctx, noEvent)
	e.ConsumeAll()
	store.fail = true
	l.view = viewStart
	l.start = lbStartFormFor("Rotor wing", "Bay hospital", "Mesa clinic")
	l.startTransport(l.mctx, noEvent)
	e.ConsumeAll()
	if !strings.Contains(l.problem, "storage is full") || l.view != viewStart || l.start.origin != "Bay hospital" {
		t.Fatalf("the refused start: view %q, problem %q, form %+v", l.view, l.problem, l.start)
	}
	if strings.Contains(l.status, "Saved") {
		t.Errorf("a refused start of transport is shown beside %q", l.status)
	}
}
