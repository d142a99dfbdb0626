package ui

import (
	"sync"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// sessionDraftStore keeps the Brief draft without putting patient values in
// plain browser storage: the route, legs, supply and policy go to the base
// store (localStorage), the patient block is held in memory by the vault
// session only, and is dropped when the crew locks the logbook.
//
// A patient block a previous version left in localStorage is moved into
// memory on first load and removed from localStorage.
//
// Limits (see the report of this change): the patient block does not
// survive a reload. Keeping it across reloads inside the vault needs a
// sealed slot outside the append-only chain, which package logbook does
// not offer yet.
type sessionDraftStore struct {
	base    DraftStore
	session *vaultSession
}

var _ DraftStore = sessionDraftStore{}

// draftPatients holds the patient block per session.
var draftPatients = struct {
	sync.Mutex
	m map[*vaultSession]*PatientDraft
}{m: map[*vaultSession]*PatientDraft{}}

// draftStoreFor returns the Brief's draft store bound to a vault session.
func draftStoreFor(s *vaultSession) DraftStore {
	return sessionDraftStore{base: localDraftStore{}, session: s}
}

func (d sessionDraftStore) Load(ctx app.Context) (BriefDraft, bool, error) {
	draft, found, err := d.base.Load(ctx)
	if err != nil {
		return draft, found, err
	}
	empty := NewBriefDraft().Patient
	draftPatients.Lock()
	held := draftPatients.m[d.session]
	if held == nil && draft.Patient != empty {
		// Move a plain-storage patient block into memory.
		p := draft.Patient
		held = &p
		draftPatients.m[d.session] = held
	}
	draftPatients.Unlock()
	if draft.Patient != empty {
		ctx.LocalStorage().Del(draftPatientKey)
	}
	if held != nil {
		draft.Patient = *held
	} else {
		draft.Patient = empty
	}
	return draft, found, nil
}

func (d sessionDraftStore) Save(ctx app.Context, draft BriefDraft) error {
	p := draft.Patient
	draftPatients.Lock()
	draftPatients.m[d.session] = &p
	draftPatients.Unlock()
	d.session.Touch()
	draft.Patient = NewBriefDraft().Patient
	return d.base.Save(ctx, draft)
}

// forgetDraftPatient drops the patient block held for the session.
func forgetDraftPatient(s *vaultSession) {
	draftPatients.Lock()
	delete(draftPatients.m, s)
	draftPatients.Unlock()
}
