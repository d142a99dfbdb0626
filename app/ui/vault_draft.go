package ui

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// The Brief draft without patient values in plain browser storage.
//
// vaultDraftStore keeps the route, legs, supply and policy in localStorage
// (localDraftStore: they say nothing about the patient) and the patient
// block in the vault session:
//
//   - in memory, always, for the life of the page: the Brief, the Supply
//     screen and "start transport" read it from there;
//   - and, while the vault is unlocked, sealed in the vault's draft slot
//     (logbook.Vault.SaveDraft), written a moment after the last edit like
//     the rest of the draft. That copy survives a reload and a browser
//     restart, and is read back when the vault is unlocked.
//
// While the vault is locked or absent the block is kept in memory only, and
// the Brief's patient card says so: a reload then loses it.
//
// At unlock (or create, or import) the session brings the two together:
// if no patient value is held in memory (a reload), the saved block is
// restored; if the crew typed values while the vault was locked, those on
// screen win and are saved into the vault. Unlocking never overwrites what
// the crew can see.
//
// Locking (the button, or the idle time on the apron) drops the key but
// keeps the patient block in memory: the values are on the Brief's screen
// anyway, and wiping a half-typed brief because the tablet sat idle for
// five minutes would cost the crew more than it protects. What lock does
// change: nothing more is saved, and the note on the patient card comes
// back, until the vault is unlocked again. A reload clears the memory.
//
// A patient block an earlier version left in plain localStorage
// (draftPatientKey) is moved into memory (unless values are already held)
// and deleted from localStorage at the first load; it reaches the vault at
// the next unlock.
type vaultDraftStore struct {
	session *vaultSession
}

var _ DraftStore = vaultDraftStore{}

// draftStoreFor returns the Brief's draft store bound to a vault session.
func draftStoreFor(s *vaultSession) DraftStore { return vaultDraftStore{session: s} }

func (d vaultDraftStore) Load(ctx app.Context) (BriefDraft, bool, error) {
	draft, found, err := localDraftStore{}.Load(ctx)
	if old, ok := takeOldPatient(ctx); ok {
		if d.session.adoptOldPatient(old) && d.session.unlocked() != nil {
			ctx.Async(func() { d.session.saveDraftPatientLogged(context.Background()) })
		}
	}
	if p, ok := d.session.DraftPatient(); ok {
		draft.Patient = p
		found = true
	}
	return draft, found, err
}

// Preload reads the draft without a Context (browser only; see
// preload.go): localStorage's part and the patient block the session holds.
// A patient block an earlier version left in localStorage is not moved
// here: Load does it, and the Brief then renders again.
func (d vaultDraftStore) Preload() (BriefDraft, bool, error) {
	draft, found, err := localDraftStore{}.Preload()
	if p, ok := d.session.DraftPatient(); ok {
		draft.Patient = p
		found = true
	}
	return draft, found, err
}

func (d vaultDraftStore) Save(ctx app.Context, draft BriefDraft) error {
	err := localDraftStore{}.Save(ctx, draft)
	if d.session.KeepDraftPatient(draft.Patient) && d.session.unlocked() != nil {
		// The vault blocks on IndexedDB: write from a goroutine. Go runs it
		// up to its first wait before handing back to the browser, so a
		// save started as the page is hidden has its write issued.
		ctx.Async(func() { d.session.saveDraftPatientLogged(context.Background()) })
	}
	return err
}

// patientEmpty reports whether no patient value is typed (where they were
// measured is a choice, not a value).
func patientEmpty(p PatientDraft) bool {
	for _, e := range []Entry{p.FiO2, p.PaO2, p.SpO2, p.PaCO2, p.RQ, p.Temperature, p.Hb, p.Age} {
		if e.T != "" {
			return false
		}
	}
	return true
}

// DraftPatient returns the patient block held in memory, and whether one
// is held.
func (s *vaultSession) DraftPatient() (PatientDraft, bool) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.patient, s.patientSet
}

// KeepDraftPatient holds p in memory and reports whether it differs from
// what was held (then a save into the vault is due). It never blocks.
func (s *vaultSession) KeepDraftPatient(p PatientDraft) bool {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.patientSet && s.patient == p {
		return false
	}
	s.patient, s.patientSet = p, true
	s.patientGen++
	return true
}

// adoptOldPatient holds a block migrated from plain storage, unless values
// are already held; it reports whether it took it.
func (s *vaultSession) adoptOldPatient(p PatientDraft) bool {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.patientSet && !patientEmpty(s.patient) {
		return false
	}
	s.patient, s.patientSet = p, true
	s.patientGen++
	return true
}

// SaveDraftPatient writes the block held in memory into the vault's draft
// slot, if it changed since the last write. It blocks on the store: call it
// from a goroutine. Writes are serialised and each writes the newest block,
// so the slot never ends older than memory. Locked: logbook.ErrLocked.
func (s *vaultSession) SaveDraftPatient(ctx context.Context) error {
	s.draftMu.Lock()
	defer s.draftMu.Unlock()
	v := s.unlocked()
	if v == nil {
		return logbook.ErrLocked
	}
	s.mu.Lock()
	p, gen, saved := s.patient, s.patientGen, s.savedGen
	s.mu.Unlock()
	if gen == saved {
		return nil
	}
	plain, err := json.Marshal(storedPatient{Schema: draftSchema, Patient: p})
	if err != nil {
		return fmt.Errorf("ui: encoding the patient draft: %w", err)
	}
	if err := v.SaveDraft(ctx, plain); err != nil {
		s.setDraftErr(err)
		return err
	}
	s.mu.Lock()
	if gen > s.savedGen {
		s.savedGen = gen
	}
	s.mu.Unlock()
	s.setDraftErr(nil)
	return nil
}

// setDraftErr records how the last write of the patient block ended and,
// when that changes between failed and saved, tells the screens: the
// Brief's patient card says the values are not kept (a full disk, say)
// until a write succeeds.
func (s *vaultSession) setDraftErr(err error) {
	s.mu.Lock()
	was := s.draftErr
	s.draftErr = err
	s.mu.Unlock()
	if (was == nil) != (err == nil) {
		s.notify()
	}
}

// DraftErr returns how the last write of the patient block failed (nil:
// it was saved, or none was due).
func (s *vaultSession) DraftErr() error {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.draftErr
}

// saveDraftPatientLogged saves and logs a failure. The log line names the
// error only (the vault's and the store's errors carry no patient value).
func (s *vaultSession) saveDraftPatientLogged(ctx context.Context) {
	if err := s.SaveDraftPatient(ctx); err != nil && !errors.Is(err, logbook.ErrLocked) {
		app.Log("ui: the patient draft was not saved in the logbook:", err)
	}
}

// restoreDraftPatient runs at unlock, before the screens hear of it: with
// no patient value in memory it restores the vault's saved block; with
// values in memory (typed while locked) it saves them. A saved block that
// no longer opens (damaged, or of an older shape) is dropped.
func (s *vaultSession) restoreDraftPatient(ctx context.Context, v *logbook.Vault) {
	s.mu.Lock()
	held := s.patientSet && !patientEmpty(s.patient)
	s.mu.Unlock()
	if held {
		s.mu.Lock()
		s.savedGen = 0 // whatever the slot holds is not what is on screen
		s.mu.Unlock()
		s.saveDraftPatientLogged(ctx)
		return
	}
	plain, err := v.LoadDraft(ctx)
	switch {
	case errors.Is(err, logbook.ErrNoDraft):
		return
	case errors.Is(err, logbook.ErrDamaged):
	case err != nil:
		app.Log("ui: reading the patient draft from the logbook:", err)
		return
	}
	var sp storedPatient
	if err != nil || json.Unmarshal(plain, &sp) != nil || sp.Schema != draftSchema {
		// No detail in the log: a decoding error could quote the text.
		app.Log("ui: the patient draft saved in the logbook cannot be used; it is dropped")
		if cerr := v.ClearDraft(ctx); cerr != nil {
			app.Log("ui: clearing the patient draft:", cerr)
		}
		return
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.patientSet && !patientEmpty(s.patient) {
		return // values typed meanwhile win
	}
	s.patient, s.patientSet = sp.Patient, true
	s.patientGen++
	s.savedGen = s.patientGen
}
