package ui

import (
	"context"
	"encoding/json"
	"errors"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// The patient marker of these tests: a PaO2 no other field holds (an
// invented value, demo data).
const ptMarker = "61.37"

func markedDraft() BriefDraft {
	d := scenarioDraft()
	d.Patient.PaO2 = Entry{ptMarker, "mmHg"}
	return d
}

// testClock is a clock the tests move by hand (the vault's timer may read
// it from another goroutine).
type testClock struct {
	mu sync.Mutex
	t  time.Time
}

func (c *testClock) now() time.Time { c.mu.Lock(); defer c.mu.Unlock(); return c.t }
func (c *testClock) add(d time.Duration) {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.t = c.t.Add(d)
}

// mountBrief loads a Brief on session in a new test engine and runs what
// OnMount runs natively: load and follow. from, when given, is the context
// of an earlier engine whose localStorage keys of the app are carried over,
// as a reload keeps the browser's localStorage (and nothing in memory).
func mountBrief(t *testing.T, from *app.Context, s *vaultSession) (*brief, *ctxProbe, app.TestEngine) {
	t.Helper()
	b := newBriefOn(s)
	p, e := mount(t, b)
	if from != nil {
		for _, k := range []string{draftKey, draftPatientKey, SettingsKey} {
			var raw json.RawMessage
			if (*from).LocalStorage().Contains(k) && (*from).LocalStorage().Get(k, &raw) == nil {
				p.ctx.LocalStorage().Set(k, raw)
			}
		}
	}
	b.load(p.ctx)
	b.follow(p.ctx)
	e.ConsumeAll()
	return b, p, e
}

// edit puts the draft on the Brief as typed and saves it at once (the
// debounce is a timer; flush is what it runs).
func edit(b *brief, p *ctxProbe, e app.TestEngine, d BriefDraft) {
	b.s.draft = d
	b.s.pending = true
	b.s.flush(p.ctx)
	e.ConsumeAll()
}

func patientCard(b *brief) string {
	return app.HTMLString(&briefPatient{Note: b.s.patientNote, s: b.s})
}

// savedDraft unlocks a second handle on store and reads the draft slot, as
// the next page load would.
func savedDraft(t *testing.T, store logbook.Store) (storedPatient, error) {
	t.Helper()
	v, err := logbook.Open(context.Background(), store)
	if err != nil {
		t.Fatal(err)
	}
	if err := v.Unlock(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	defer v.Lock()
	plain, err := v.LoadDraft(context.Background())
	if err != nil {
		return storedPatient{}, err
	}
	var sp storedPatient
	if err := json.Unmarshal(plain, &sp); err != nil {
		t.Fatal(err)
	}
	return sp, nil
}

// plainFind lists where marker appears in plain: localStorage (the keys the
// app writes), and every byte the vault's store holds.
func plainFind(t *testing.T, ctx app.Context, store logbook.Store, marker string) []string {
	t.Helper()
	var found []string
	for _, k := range []string{draftKey, draftPatientKey, SettingsKey} {
		var raw json.RawMessage
		ctx.LocalStorage().Get(k, &raw)
		if strings.Contains(string(raw), marker) {
			found = append(found, "localStorage "+k)
		}
	}
	c := context.Background()
	header, head, _ := store.Meta(c)
	blobs := map[string][]byte{"header": header, "head": head}
	items, _ := store.Index(c)
	for _, it := range items {
		body, _ := store.Body(c, it.Seq)
		blobs[logbook.RecordName(it.Seq)+" index"] = it.Index
		blobs[logbook.RecordName(it.Seq)+" body"] = body
	}
	if side, err := store.GetSide(c, "draft"); err == nil {
		blobs["draft slot"] = side
	}
	for name, b := range blobs {
		if strings.Contains(string(b), marker) {
			found = append(found, "store "+name)
		}
	}
	return found
}

// A patient value typed on the Brief with the logbook unlocked is sealed in
// the vault's draft slot, and nowhere in plain. After a reload (a new
// session on the same storage: memory gone) the route comes back at once
// and the patient block is empty with the note; unlocking brings it back
// on the mounted Brief.
func TestBriefPatientSealedAcrossReload(t *testing.T) {
	store := logbook.NewMemStore()
	s1 := testSession(store)
	b, p, e := mountBrief(t, nil, s1)
	if b.s.patientNote != notePatientNoVault || !strings.Contains(patientCard(b), notePatientNoVault) {
		t.Fatalf("no vault: note %q", b.s.patientNote)
	}
	if err := s1.Create(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	if b.s.patientNote != "" || strings.Contains(patientCard(b), `id="b-pt-kept"`) {
		t.Errorf("unlocked: the note is still shown: %q", b.s.patientNote)
	}
	edit(b, p, e, markedDraft())
	sp, err := savedDraft(t, store)
	if err != nil || sp.Patient.PaO2.T != ptMarker || sp.Patient.FiO2.T != "0.28" {
		t.Fatalf("draft slot = %+v, %v", sp.Patient, err)
	}
	if where := plainFind(t, p.ctx, store, ptMarker); len(where) > 0 {
		t.Errorf("the patient marker is stored in plain: %v", where)
	}
	// The check can fail: the marker in plain storage is found.
	p.ctx.LocalStorage().Set(draftPatientKey, storedPatient{Schema: draftSchema, Patient: markedDraft().Patient})
	if len(plainFind(t, p.ctx, store, ptMarker)) == 0 {
		t.Fatal("plainFind does not see a plain value")
	}
	p.ctx.LocalStorage().Del(draftPatientKey)

	// Reload: a new session on the same store and localStorage.
	s2 := testSession(store)
	b2, _, e := mountBrief(t, &p.ctx, s2)
	if b2.s.draft.Route != scenarioDraft().Route || len(b2.s.draft.Legs) != 3 {
		t.Errorf("route not restored before unlock: %+v", b2.s.draft.Route)
	}
	if !patientEmpty(b2.s.draft.Patient) {
		t.Errorf("patient values before unlock: %+v", b2.s.draft.Patient)
	}
	if b2.s.patientNote != notePatientLocked || !strings.Contains(patientCard(b2), notePatientLocked) {
		t.Errorf("locked: note %q", b2.s.patientNote)
	}
	if err := s2.Unlock(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	if got := b2.s.draft.Patient; got.PaO2 != (Entry{ptMarker, "mmHg"}) || got.FiO2.T != "0.28" || got.SpO2.T != "94" {
		t.Errorf("after unlock the Brief shows patient %+v", got)
	}
	if b2.s.patientNote != "" {
		t.Errorf("after unlock: note %q", b2.s.patientNote)
	}
	if !b2.s.model.ok() {
		t.Errorf("the restored Brief does not compute: %v", b2.s.model.msgs)
	}
}

// Lock keeps what is on screen (and in memory) but saves nothing more;
// values typed while locked win over the saved ones at the next unlock.
func TestBriefLockKeepsScreenStopsSaving(t *testing.T) {
	store := logbook.NewMemStore()
	s := testSession(store)
	if err := s.Create(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	b, p, e := mountBrief(t, nil, s)
	edit(b, p, e, markedDraft())
	s.Lock()
	e.ConsumeAll()
	if b.s.draft.Patient.PaO2.T != ptMarker {
		t.Errorf("lock wiped the patient block on screen: %+v", b.s.draft.Patient)
	}
	if held, ok := s.DraftPatient(); !ok || held.PaO2.T != ptMarker {
		t.Errorf("lock dropped the block from memory: %+v", held)
	}
	if b.s.patientNote != notePatientLocked {
		t.Errorf("locked: note %q", b.s.patientNote)
	}
	d := markedDraft()
	d.Patient.PaO2 = Entry{"70", "mmHg"}
	edit(b, p, e, d)
	if sp, _ := savedDraft(t, store); sp.Patient.PaO2.T != ptMarker {
		t.Errorf("saved while locked: %+v", sp.Patient.PaO2)
	}
	if err := s.Unlock(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	if b.s.draft.Patient.PaO2.T != "70" {
		t.Errorf("unlock replaced the values on screen: %+v", b.s.draft.Patient.PaO2)
	}
	if sp, _ := savedDraft(t, store); sp.Patient.PaO2.T != "70" {
		t.Errorf("the values typed while locked were not saved at unlock: %+v", sp.Patient.PaO2)
	}
}

// A patient block an earlier version left in plain localStorage is moved
// into memory, deleted from localStorage, and sealed in the vault at the
// next unlock.
func TestOldPlainPatientBlockMigrated(t *testing.T) {
	store := logbook.NewMemStore()
	s := testSession(store)
	if err := s.Create(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	s.Lock()
	seed, _ := mount(t, app.Div())
	ls := seed.ctx.LocalStorage()
	ls.Set(draftKey, storedDraft{Schema: draftSchema, Route: scenarioDraft().Route, Legs: scenarioDraft().Legs})
	ls.Set(draftPatientKey, storedPatient{Schema: draftSchema, Patient: markedDraft().Patient})

	b, p, e := mountBrief(t, &seed.ctx, s)
	ls = p.ctx.LocalStorage()
	if b.s.draft.Patient.PaO2.T != ptMarker {
		t.Errorf("the old block was not taken: %+v", b.s.draft.Patient)
	}
	if ls.Contains(draftPatientKey) {
		t.Error("the old plain block is still in localStorage")
	}
	if _, err := savedDraft(t, store); !errors.Is(err, logbook.ErrNoDraft) {
		t.Errorf("saved before unlock: %v", err)
	}
	if err := s.Unlock(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	if sp, err := savedDraft(t, store); err != nil || sp.Patient.PaO2.T != ptMarker {
		t.Errorf("the migrated block is not in the vault: %+v %v", sp.Patient, err)
	}
	if where := plainFind(t, p.ctx, store, ptMarker); len(where) > 0 {
		t.Errorf("marker in plain after migration: %v", where)
	}
}

// A saved draft that no longer opens is dropped at unlock; the vault and
// the Brief carry on without it.
func TestDamagedDraftSlotDropped(t *testing.T) {
	store := logbook.NewMemStore()
	s := testSession(store)
	if err := s.Create(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	store.PutSide(context.Background(), "draft", []byte("not a sealed draft, 24 bytes at least......"))
	s.Lock()
	if err := s.Unlock(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	if _, err := store.GetSide(context.Background(), "draft"); !errors.Is(err, logbook.ErrNotFound) {
		t.Errorf("the damaged draft was kept: %v", err)
	}
	if p, ok := s.DraftPatient(); ok && !patientEmpty(p) {
		t.Errorf("patient values from a damaged draft: %+v", p)
	}
}

// The frame offers a Lock button (a real button, its name the visible
// text) only while the logbook is unlocked; it locks. The idle time comes
// from Settings; any tap or key in the frame postpones the lock, driven by
// a hand-moved clock.
func TestFrameLockButtonIdleAndTouch(t *testing.T) {
	clock := &testClock{t: time.Date(2031, 6, 1, 9, 0, 0, 0, time.UTC)}
	s := testSession(logbook.NewMemStore())
	s.now = clock.now
	f := newFrameOn("/settings", s)
	p, e := mount(t, f)
	f.OnMount(p.ctx)
	e.ConsumeAll()
	if strings.Contains(app.HTMLString(f.Render()), "frame-lock") {
		t.Fatal("Lock offered with no vault")
	}
	if s.IdleLock() != 5*time.Minute {
		t.Errorf("default idle time %v, want 5 min", s.IdleLock())
	}
	if err := s.Create(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	html := app.HTMLString(f.Render())
	tag := regexp.MustCompile(`<button[^>]*id="frame-lock"[^>]*>Lock</button>`).FindString(html)
	if tag == "" {
		t.Fatalf("no Lock button while unlocked:\n%s", html)
	}
	for _, attr := range []string{`type="button"`, `aria-label="Lock logbook"`, "alv-button"} { // .alv-button: min-height 48 px in web/alvea.css
		if !strings.Contains(tag, attr) {
			t.Errorf("the Lock button lacks %s: %s", attr, tag)
		}
	}

	// Settings: 1 minute, applied to the unlocked vault at once.
	st := LoadSettings(p.ctx)
	st.AutoLockMinutes = "1"
	if err := SaveSettings(p.ctx, st); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	v, err := s.Vault()
	if err != nil {
		t.Fatal(err)
	}
	if s.IdleLock() != time.Minute || v.IdleLock() != time.Minute {
		t.Fatalf("idle time %v / vault %v, want 1 min", s.IdleLock(), v.IdleLock())
	}
	clock.add(50 * time.Second)
	f.touch(p.ctx, noEvent) // a tap anywhere
	e.ConsumeAll()
	clock.add(50 * time.Second)
	if v.LockIfIdle(clock.now()) {
		t.Fatal("locked 50 s after a tap")
	}
	clock.add(11 * time.Second)
	if !v.LockIfIdle(clock.now()) {
		t.Fatal("not locked 61 s after the last tap")
	}
	e.ConsumeAll()
	if strings.Contains(app.HTMLString(f.Render()), "frame-lock") {
		t.Error("Lock still offered after the idle lock")
	}

	// The button locks.
	if err := s.Unlock(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	if !strings.Contains(app.HTMLString(f.Render()), "frame-lock") {
		t.Fatal("no Lock button after unlock")
	}
	f.lock(p.ctx, noEvent)
	e.ConsumeAll()
	if ph, _ := s.Phase(); ph != phaseLocked {
		t.Errorf("phase after Lock: %v", ph)
	}
	if _, err := s.Vault(); !errors.Is(err, logbook.ErrLocked) {
		t.Errorf("the vault key is still usable: %v", err)
	}
	if strings.Contains(app.HTMLString(f.Render()), "frame-lock") {
		t.Error("Lock still offered when locked")
	}
}

// The Settings screen's auto-lock field: a bad value shows its range and
// unit and is not saved; a good one is saved.
func TestSettingsScreenAutoLockField(t *testing.T) {
	sc := newSettingsScreen()
	p, e := mount(t, sc)
	sc.edit(p.ctx, FieldAutoLock, "90")
	e.ConsumeAll()
	if msg := sc.messages[FieldAutoLock]; !strings.Contains(msg, "between 1 and 60 min") {
		t.Errorf("message %q", msg)
	}
	if LoadSettings(p.ctx).AutoLockMinutes != "5" {
		t.Error("an invalid idle time was saved")
	}
	html := app.HTMLString(sc.Render())
	// go-app writes attributes in no fixed order: match the message
	// element by its parts, not as one string.
	msgElem := regexp.MustCompile(`<p [^>]*id="set-autolock-msg"[^>]*>Auto-lock must be between 1 and 60 min`)
	if !msgElem.MatchString(html) || !strings.Contains(msgElem.FindString(html), `role="alert"`) ||
		!strings.Contains(html, `aria-describedby="set-autolock-unit set-autolock-msg"`) {
		t.Errorf("the field does not show its message")
	}
	sc.edit(p.ctx, FieldAutoLock, "2")
	e.ConsumeAll()
	if got := LoadSettings(p.ctx); got.AutoLockMinutes != "2" || got.AutoLock() != 2*time.Minute {
		t.Errorf("saved %q", got.AutoLockMinutes)
	}
	if _, bad := sc.messages[FieldAutoLock]; bad {
		t.Error("the message stays after a valid value")
	}
}

// The patient card's note follows the session: none while unlocked; how to
// keep the values otherwise, by why they are not kept.
func TestPatientNoteByPhase(t *testing.T) {
	noStorage := newVaultSession(func(context.Context) (logbook.Store, error) {
		return nil, errors.New("no IndexedDB in this browser")
	}, logbook.MinimumKDF)
	noStorage.Load(context.Background())
	empty := testSession(logbook.NewMemStore())
	empty.Load(context.Background())
	store := logbook.NewMemStore()
	locked := testSession(store)
	if err := locked.Create(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	unlocked := testSession(store)
	if err := unlocked.Unlock(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	locked.Lock()
	for _, c := range []struct {
		name string
		s    *vaultSession
		want string
	}{
		{"not opened yet", testSession(logbook.NewMemStore()), notePatientLocked},
		{"no storage", noStorage, notePatientNoStore},
		{"no logbook", empty, notePatientNoVault},
		{"locked", locked, notePatientLocked},
		{"unlocked", unlocked, ""},
	} {
		if got := patientNoteFor(c.s); got != c.want {
			t.Errorf("%s: note %q, want %q", c.name, got, c.want)
		}
	}
	if patientNoteFor(nil) != "" {
		t.Error("a Brief with no session shows a note")
	}
}
