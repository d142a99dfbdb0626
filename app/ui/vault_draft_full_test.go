package ui

import (
	"context"
	"fmt"
	"strings"
	"testing"

	"alvea/app/logbook"
)

// sideRefusingStore refuses writes of a side slot (the sealed Brief draft)
// as a full browser store does.
type sideRefusingStore struct {
	logbook.Store
	refuse bool
}

func (s *sideRefusingStore) PutSide(ctx context.Context, name string, blob []byte) error {
	if s.refuse {
		return fmt.Errorf("idb: abort: %w", logbook.ErrQuota)
	}
	return s.Store.PutSide(ctx, name, blob)
}

// A patient block the vault cannot store (a full disk) is said so on the
// patient card, while it is only in memory; the next change once there is
// room saves it and the note goes. Issue 5: a refused write gets a clear
// message and nothing is lost.
func TestBriefPatientNoteWhenDraftSlotRefused(t *testing.T) {
	store := &sideRefusingStore{Store: logbook.NewMemStore()}
	s := testSession(store)
	if err := s.Create(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	b, p, e := mountBrief(t, nil, s)
	edit(b, p, e, markedDraft())
	if b.s.patientNote != "" {
		t.Fatalf("saved: note %q", b.s.patientNote)
	}

	store.refuse = true
	d := markedDraft()
	d.Patient.PaO2 = Entry{"71", "mmHg"}
	edit(b, p, e, d)
	if b.s.patientNote != notePatientFull || !strings.Contains(patientCard(b), "storage is full") {
		t.Errorf("refused write: note %q", b.s.patientNote)
	}
	if b.s.draft.Patient.PaO2.T != "71" {
		t.Errorf("the value on screen was lost: %+v", b.s.draft.Patient.PaO2)
	}
	if sp, _ := savedDraft(t, store); sp.Patient.PaO2.T != ptMarker {
		t.Errorf("the slot changed on a refused write: %+v", sp.Patient.PaO2)
	}

	store.refuse = false
	d.Patient.PaO2 = Entry{"72", "mmHg"}
	edit(b, p, e, d)
	if b.s.patientNote != "" {
		t.Errorf("saved again: note %q", b.s.patientNote)
	}
	if sp, _ := savedDraft(t, store); sp.Patient.PaO2.T != "72" {
		t.Errorf("the next change was not saved: %+v", sp.Patient.PaO2)
	}
}
