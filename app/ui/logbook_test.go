package ui

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
	"alvea/physio"
)

// Passphrases of these tests are invented; they pass the vault's rules.
const uiTestPass = "otter under the old stone bridge"

// testSession is a vault session on a memory store, with the OWASP minimum
// Argon2id settings (m = 19 MiB, t = 2, p = 1) so tests stay quick.
func testSession(store logbook.Store) *vaultSession {
	return newVaultSession(func(context.Context) (logbook.Store, error) { return store, nil }, logbook.MinimumKDF)
}

// mountLogbook loads the screen in go-app's test engine and runs its
// OnMount with the context go-app gives it (natively the engine does not
// call OnMount), then waits for it to open its store.
func mountLogbook(t *testing.T, s *vaultSession) (*logbookScreen, app.TestEngine) {
	t.Helper()
	l := newLogbookWith(s)
	p, e := mount(t, l)
	l.OnMount(p.ctx)
	e.ConsumeAll()
	return l, e
}

var noEvent = app.Event{Value: app.Undefined()}

func lbHTML(l *logbookScreen) string { return app.HTMLString(l.Render()) }

func TestLogbookCreateRefusesWeakAndMismatchedPassphrases(t *testing.T) {
	l, e := mountLogbook(t, testSession(logbook.NewMemStore()))
	if l.phase != phaseEmpty || !strings.Contains(lbHTML(l), "Create the logbook") {
		t.Fatalf("an empty store shows phase %v:\n%s", l.phase, lbHTML(l))
	}
	// Each refusal of the vault's rules (RECORD-MODEL.md, Vault) gets its
	// own sentence, not the generic one.
	for _, c := range []struct{ pass, want string }{
		{"short one", "at least 10 characters"},
		{"aaaaaaaaaaaa", "repeats one character"},
		{"qwertyuiop", "keyboard or alphabet run"},
		{"2024-12-31!!", "only digits or punctuation"},
		{"password123", "commonest passwords"},
	} {
		l.access = accessForm{pass: c.pass, again: c.pass}
		l.create(l.mctx, noEvent)
		e.ConsumeAll()
		if !strings.Contains(l.access.createMessage, c.want) {
			t.Errorf("passphrase %q: message %q, want it to say %q", c.pass, l.access.createMessage, c.want)
		}
		if l.phase != phaseEmpty {
			t.Fatalf("passphrase %q created a vault", c.pass)
		}
	}
	l.access = accessForm{pass: uiTestPass, again: uiTestPass + " "}
	l.create(l.mctx, noEvent)
	e.ConsumeAll()
	if !strings.Contains(l.access.againMessage, "differ") || l.phase != phaseEmpty {
		t.Errorf("mismatched passphrases: message %q, phase %v", l.access.againMessage, l.phase)
	}
	l.access = accessForm{pass: uiTestPass, again: uiTestPass}
	l.create(l.mctx, noEvent)
	e.ConsumeAll()
	if l.phase != phaseUnlocked || l.access.pass != "" {
		t.Fatalf("a good passphrase: phase %v, passphrase kept in the form: %v", l.phase, l.access.pass != "")
	}
	if !strings.Contains(lbHTML(l), "No transport yet") {
		t.Errorf("the new logbook does not show its empty list:\n%s", lbHTML(l))
	}
}

// openTestTransport creates a vault and starts a transport through the
// screen's start form.
func openTestTransport(t *testing.T, l *logbookScreen, e app.TestEngine) {
	t.Helper()
	createTestVault(l, e)
	l.view = viewStart
	l.start = lbStartFormFor("Rotor wing", "Mesa clinic", "Bay hospital")
	l.startTransport(l.mctx, noEvent)
	e.ConsumeAll()
	if l.view != viewRecord || l.record.transport == nil {
		t.Fatalf("start transport: view %q, problem %q", l.view, l.problem)
	}
}

// createTestVault creates the vault through the screen's create form.
func createTestVault(l *logbookScreen, e app.TestEngine) {
	l.access = accessForm{pass: uiTestPass, again: uiTestPass}
	l.create(l.mctx, noEvent)
	e.ConsumeAll()
}

func lbStartFormFor(vehicle, origin, dest string) startForm {
	return startForm{vehicle: vehicle, crew: "ab cd", origin: origin, originElev: "6000", dest: dest, destElev: "0",
		age: string(logbook.AgeAdult), sex: string(logbook.SexFemale), weight: "70",
		cylinders: []logbook.CylinderSpec{{Label: "E1", Size: "E"}}}
}

func TestLogbookStartRecordAndCorrect(t *testing.T) {
	store := logbook.NewMemStore()
	s := testSession(store)
	l, e := mountLogbook(t, s)
	openTestTransport(t, l, e)
	tr := l.record.transport
	// 6000 ft typed under the default feet display: 6000 × 0.3048 m
	// (the international foot, NIST SP 811 appendix B) = 1828.8 m.
	if got := tr.Opening.Origin.Elevation.Metres(); got < 1828.79 || got > 1828.81 {
		t.Errorf("origin elevation = %v m, want 1828.8 m", got)
	}
	if tr.Opening.Patient.WeightKg != 70 || tr.Opening.Patient.AgeBand != logbook.AgeAdult || strings.Join(tr.Opening.Crew, " ") != "AB CD" {
		t.Errorf("opening = %+v", tr.Opening)
	}

	l.record.gaugeCyl, l.record.gaugeText = "E1", "1800"
	l.saveGauge(l.mctx, noEvent)
	e.ConsumeAll()
	l.record.obs = lbObsForm{spo2: "94", fio2: "0.3", rr: "16", etco2: "35"}
	l.saveObs(l.mctx, noEvent)
	e.ConsumeAll()
	l.record.noteText = "calm flight"
	l.saveNote(l.mctx, noEvent)
	e.ConsumeAll()
	if l.record.gaugeText != "" || l.record.noteText != "" {
		t.Error("a saved entry's form was not cleared")
	}
	// Correct the gauge reading (R2): the original stays, the correction
	// is a new record pointing at it.
	l.record.amendSeq, l.record.amendReason, l.record.amendText = 2, "misread", "1700"
	l.saveAmend(l.mctx, noEvent)
	e.ConsumeAll()
	page := lbHTML(l)
	for _, want := range []string{"Gauge E1: 1800 psi", "SpO2 94 %", "FiO2 0.30", "RR 16/min", "EtCO2 35 mmHg",
		"Note: calm flight", "Correction of R2 (misread): Gauge E1: 1700 psi", "corrected by R5"} {
		if !strings.Contains(page, want) {
			t.Errorf("the timeline lacks %q", want)
		}
	}
	// What the screen shows is what the vault holds.
	v, _ := s.Vault()
	got, err := v.Transport(context.Background(), l.record.id)
	if err != nil || len(got.History) != 5 || len(got.Amendments) != 1 {
		t.Fatalf("vault holds %d records, %d amendments (err %v)", len(got.History), len(got.Amendments), err)
	}

	// Close: the entry forms go; the list flags the transport closed and
	// corrected.
	l.record.outcome = "handed over"
	l.save(l.mctx, "close", func() (*logbook.Entry, error) {
		return &logbook.Entry{Kind: logbook.KindClose, Close: &logbook.Closing{Outcome: l.record.outcome}}, nil
	}, nil)
	e.ConsumeAll()
	if strings.Contains(lbHTML(l), "Save note") {
		t.Error("a closed transport still offers entries")
	}
	l.view = viewList
	l.refresh(l.mctx)
	e.ConsumeAll()
	page = lbHTML(l)
	for _, want := range []string{"Mesa clinic → Bay hospital", "Rotor wing", "closed", "corrected", "1 of 1 transports"} {
		if !strings.Contains(page, want) {
			t.Errorf("the list lacks %q", want)
		}
	}
	l.list.search = "nowhere"
	if page = lbHTML(l); !strings.Contains(page, "0 of 1 transports") {
		t.Error("search did not filter the list")
	}
}

// failingStore refuses appends as a full browser store does.
type failingStore struct {
	logbook.Store
	fail bool
}

func (f *failingStore) Append(ctx context.Context, rec logbook.Sealed, head []byte) error {
	if f.fail {
		return fmt.Errorf("idb: abort: %w", logbook.ErrQuota)
	}
	return f.Store.Append(ctx, rec, head)
}

func TestLogbookRefusedWriteKeepsEntryOnScreen(t *testing.T) {
	store := &failingStore{Store: logbook.NewMemStore()}
	l, e := mountLogbook(t, testSession(store))
	openTestTransport(t, l, e)
	store.fail = true
	l.record.noteText = "entry that cannot be stored"
	l.saveNote(l.mctx, noEvent)
	e.ConsumeAll()
	if l.record.noteText != "entry that cannot be stored" {
		t.Errorf("the unsaved note left its form: %q", l.record.noteText)
	}
	if !strings.Contains(l.problem, "storage is full") || !strings.Contains(l.problem, "NOT saved") {
		t.Errorf("problem = %q", l.problem)
	}
	page := lbHTML(l)
	if !strings.Contains(page, "Not saved: note") || strings.Contains(page, "Note: entry that cannot be stored") {
		t.Error("the screen shows an unsaved entry as saved, or does not say it is unsaved")
	}
	// Space again: the same entry saves.
	store.fail = false
	l.saveNote(l.mctx, noEvent)
	e.ConsumeAll()
	if !strings.Contains(lbHTML(l), "Note: entry that cannot be stored") || l.record.pending != "" {
		t.Errorf("the retried note is not shown saved (problem %q)", l.problem)
	}
}

func TestLogbookWrongPassphraseAndLock(t *testing.T) {
	store := logbook.NewMemStore()
	s := testSession(store)
	l, e := mountLogbook(t, s)
	openTestTransport(t, l, e)
	l.lockNow(l.mctx, noEvent)
	e.ConsumeAll()
	if l.phase != phaseLocked || l.list.listing != nil || l.record.transport != nil {
		t.Fatal("lock kept decrypted content on the screen")
	}
	if page := lbHTML(l); strings.Contains(page, "Mesa clinic") || !strings.Contains(page, "Unlock the logbook") {
		t.Errorf("the locked screen shows:\n%s", page)
	}
	header, head, _ := store.Meta(context.Background())
	l.access.unlock = "not the passphrase at all"
	l.unlock(l.mctx, noEvent)
	e.ConsumeAll()
	if l.phase != phaseLocked || l.problem != "Wrong passphrase, or the vault is damaged. Nothing was changed." {
		t.Errorf("wrong passphrase: phase %v, problem %q", l.phase, l.problem)
	}
	h2, hd2, _ := store.Meta(context.Background())
	if string(h2) != string(header) || string(hd2) != string(head) {
		t.Error("a wrong passphrase changed the stored header or head")
	}
	l.access.unlock = uiTestPass
	l.unlock(l.mctx, noEvent)
	e.ConsumeAll()
	if l.phase != phaseUnlocked || !strings.Contains(lbHTML(l), "Mesa clinic") {
		t.Errorf("unlock: phase %v, problem %q", l.phase, l.problem)
	}
}

func TestVaultSessionIdleLock(t *testing.T) {
	s := testSession(logbook.NewMemStore())
	if err := s.Create(context.Background(), uiTestPass); err != nil {
		t.Fatal(err)
	}
	locked := make(chan struct{}, 1)
	s.Subscribe(func() {
		if p, _ := s.Phase(); p == phaseLocked {
			select {
			case locked <- struct{}{}:
			default:
			}
		}
	})
	v, _ := s.Vault()
	// Not idle yet at the default time; idle after it (DefaultIdleLock,
	// 5 minutes, RECORD-MODEL.md).
	if v.LockIfIdle(time.Now().Add(logbook.DefaultIdleLock - time.Minute)) {
		t.Fatal("locked before the idle time")
	}
	if !v.LockIfIdle(time.Now().Add(logbook.DefaultIdleLock + time.Second)) {
		t.Fatal("not locked after the idle time")
	}
	<-locked
	if _, err := s.Vault(); !errors.Is(err, logbook.ErrLocked) {
		t.Errorf("after the idle lock the session still gives the vault (err %v)", err)
	}
}

func TestLogbookImportVerifiesFirst(t *testing.T) {
	// A bundle from another vault.
	src, err := logbook.Create(context.Background(), logbook.NewMemStore(), uiTestPass, logbook.MinimumKDF)
	if err != nil {
		t.Fatal(err)
	}
	id := logbook.NewTransportID(time.Now())
	if _, err := src.Append(context.Background(), &logbook.Entry{Transport: id, Kind: logbook.KindOpen, At: time.Now(),
		Open: &logbook.Opening{Vehicle: "Boat", Origin: logbook.Place{Name: "Isle"}, Destination: logbook.Place{Name: "Port"}}}); err != nil {
		t.Fatal(err)
	}
	var bundle strings.Builder
	if err := src.Export(context.Background(), &bundle); err != nil {
		t.Fatal(err)
	}
	data := []byte(bundle.String())

	store := logbook.NewMemStore()
	l, e := mountLogbook(t, testSession(store))
	old := lbReadFile
	defer func() { lbReadFile = old }()
	// A changed byte: refused, nothing written.
	bad := append([]byte(nil), data...)
	bad[len(bad)-40] ^= 0x80
	lbReadFile = func(context.Context, string) ([]byte, error) { return bad, nil }
	l.access.importPass = uiTestPass
	l.importBundle(l.mctx, noEvent)
	e.ConsumeAll()
	if !strings.Contains(l.problem, "Nothing was written") {
		t.Errorf("changed bundle: problem %q", l.problem)
	}
	if _, _, err := store.Meta(context.Background()); !errors.Is(err, logbook.ErrNoVault) {
		t.Fatalf("a refused bundle wrote to the store (%v)", err)
	}
	lbReadFile = func(context.Context, string) ([]byte, error) { return data, nil }
	l.access.importPass = uiTestPass
	l.importBundle(l.mctx, noEvent)
	e.ConsumeAll()
	if l.phase != phaseUnlocked || !strings.Contains(lbHTML(l), "Isle → Port") {
		t.Errorf("import: phase %v, problem %q", l.phase, l.problem)
	}
}

func TestLbWithUnit(t *testing.T) {
	for _, c := range []struct{ in, unit, want string }{
		{"1800", "psi", "1800 psi"},
		{" 124 ", "bar", "124 bar"},
		{"124 bar", "psi", "124 bar"},
		{"40%", "%", "40%"},
		{"", "psi", ""},
	} {
		if got := lbWithUnit(c.in, c.unit); got != c.want {
			t.Errorf("lbWithUnit(%q, %q) = %q, want %q", c.in, c.unit, got, c.want)
		}
	}
}

func TestLbCylindersFromPlan(t *testing.T) {
	two, wc := 2, 10.0
	doc := &physio.PlanDocument{Supply: []physio.PlanSupply{
		{Size: "E", Count: &two},
		{WaterCapacityL: &wc},
	}}
	got := lbCylindersFromPlan(doc)
	var labels []string
	for _, c := range got {
		labels = append(labels, c.Label)
	}
	if strings.Join(labels, ",") != "E1,E2,10L1" || got[0].Size != "E" || got[2].WaterCapacity.Litres() != 10 {
		t.Errorf("cylinders = %+v", got)
	}
}

// Start transport from the current Brief: the plan document, physio's
// result for it and the engine version go into the open record; the
// result is what physio.ComputePlan gives for that same document (one
// engine for the screen, the log and the audit).
func TestLogbookStartFromBrief(t *testing.T) {
	s := testSession(logbook.NewMemStore())
	l, e := mountLogbook(t, s)
	l.access = accessForm{pass: uiTestPass, again: uiTestPass}
	l.create(l.mctx, noEvent)
	e.ConsumeAll()
	if err := draftStoreFor(s).Save(l.mctx, scenarioDraft()); err != nil {
		t.Fatal(err)
	}
	l.prepareStart(l.mctx)
	f := l.start
	if f.snapshot == nil {
		t.Fatalf("no snapshot: %s", f.briefNote)
	}
	if f.snapshot.EngineVersion != physio.EngineVersion {
		t.Errorf("engine version %q", f.snapshot.EngineVersion)
	}
	doc, err := physio.ParsePlan(f.snapshot.Plan)
	if err != nil {
		t.Fatalf("the snapshot's plan does not parse: %v", err)
	}
	res, err := physio.ComputePlan(doc)
	if err != nil {
		t.Fatal(err)
	}
	again, _ := json.Marshal(res)
	if string(again) != string(f.snapshot.Result) {
		t.Error("the snapshot's result is not what physio computes for its plan")
	}
	// The scenario has 3 D cylinders and its origin at 500 ft.
	if got := lbCylindersText(f.cylinders); got != "D1 (size D), D2 (size D), D3 (size D)" {
		t.Errorf("cylinders %q", got)
	}
	if f.originElev != "500 ft" || f.destElev != "3000 ft" {
		t.Errorf("elevations %q, %q", f.originElev, f.destElev)
	}
	l.start.vehicle, l.start.origin, l.start.dest = "Jet", "Low field", "High field"
	l.startTransport(l.mctx, noEvent)
	e.ConsumeAll()
	tr := l.record.transport
	if tr == nil || len(tr.Briefs) != 1 || string(tr.Briefs[0].Value.Plan) != string(f.snapshot.Plan) || len(tr.Cylinders) != 3 {
		t.Fatalf("the open record lacks the Brief snapshot or cylinders (problem %q)", l.problem)
	}
}

func TestLogbookChangePassphrase(t *testing.T) {
	store := logbook.NewMemStore()
	s := testSession(store)
	l, e := mountLogbook(t, s)
	openTestTransport(t, l, e)
	const next = "kettle whistling on the night ferry"
	l.manage = manageForm{current: "not the passphrase at all", next: next, again: next}
	l.changePassphrase(l.mctx, noEvent)
	e.ConsumeAll()
	if l.problem != "Wrong passphrase, or the vault is damaged. Nothing was changed." {
		t.Errorf("wrong current passphrase: %q", l.problem)
	}
	l.manage = manageForm{current: uiTestPass, next: "password123", again: "password123"}
	l.changePassphrase(l.mctx, noEvent)
	if !strings.Contains(l.manage.nextMsg, "commonest") {
		t.Errorf("weak new passphrase: %q", l.manage.nextMsg)
	}
	l.manage = manageForm{current: uiTestPass, next: next, again: next}
	l.changePassphrase(l.mctx, noEvent)
	e.ConsumeAll()
	if l.problem != "" || !strings.Contains(l.status, "Passphrase changed") {
		t.Fatalf("change: status %q, problem %q", l.status, l.problem)
	}
	// A fresh session on the same store: the old passphrase fails, the new
	// one opens the same records.
	s2 := testSession(store)
	if err := s2.Unlock(context.Background(), uiTestPass); !errors.Is(err, logbook.ErrUnlock) {
		t.Errorf("old passphrase after the change: %v", err)
	}
	if err := s2.Unlock(context.Background(), next); err != nil {
		t.Fatalf("new passphrase: %v", err)
	}
	v, _ := s2.Vault()
	if lst, err := v.List(context.Background()); err != nil || len(lst.Transports) != 1 {
		t.Errorf("after the change: %v transports, err %v", lst, err)
	}
}

// A lock in the middle of an entry (the Lock button, or the idle time)
// hides it with everything else, and the next unlock brings the crew back
// to the same transport with what they had typed and not saved: nothing
// typed is lost to a lock. Issue 5: nothing is lost; a lock drops what
// was decrypted.
func TestLogbookLockKeepsUnsavedEntry(t *testing.T) {
	s := testSession(logbook.NewMemStore())
	l, e := mountLogbook(t, s)
	openTestTransport(t, l, e)
	id := l.record.id
	l.record.noteText = "typed before the lock"
	l.record.gaugeText = "1700"
	s.Lock()
	e.ConsumeAll()
	page := lbHTML(l)
	if l.record.transport != nil || strings.Contains(page, "Mesa clinic") || strings.Contains(page, "typed before the lock") {
		t.Fatalf("locked: the screen still shows the transport or the entry:\n%s", page)
	}
	if !strings.Contains(l.status, "comes back when you unlock") {
		t.Errorf("locked: the status does not say the entry is kept: %q", l.status)
	}
	l.access.unlock = uiTestPass
	l.unlock(l.mctx, noEvent)
	e.ConsumeAll()
	if l.view != viewRecord || l.record.id != id || l.record.transport == nil {
		t.Fatalf("unlocked: view %q, transport %v (problem %q)", l.view, l.record.transport != nil, l.problem)
	}
	if l.record.noteText != "typed before the lock" || l.record.gaugeText != "1700" {
		t.Errorf("unlocked: the forms hold %q and %q", l.record.noteText, l.record.gaugeText)
	}
	if !strings.Contains(lbHTML(l), "typed before the lock") {
		t.Error("unlocked: the note typed before the lock is not back in its field")
	}
	// Saved now, it is in the transport once.
	l.saveNote(l.mctx, noEvent)
	e.ConsumeAll()
	if !strings.Contains(lbHTML(l), "Note: typed before the lock") {
		t.Errorf("the note kept across the lock does not save (problem %q)", l.problem)
	}
}

// A start of transport being filled in when the logbook locks comes back
// at the next unlock.
func TestLogbookLockKeepsStartForm(t *testing.T) {
	s := testSession(logbook.NewMemStore())
	l, e := mountLogbook(t, s)
	createTestVault(l, e)
	l.view = viewStart
	l.start = lbStartFormFor("Rotor wing", "Mesa clinic", "Bay hospital")
	l.lockNow(l.mctx, noEvent)
	e.ConsumeAll()
	if strings.Contains(lbHTML(l), "Mesa clinic") {
		t.Fatal("locked: the start form is still shown")
	}
	l.access.unlock = uiTestPass
	l.unlock(l.mctx, noEvent)
	e.ConsumeAll()
	if l.view != viewStart || l.start.origin != "Mesa clinic" || l.start.vehicle != "Rotor wing" {
		t.Errorf("unlocked: view %q, start form %+v", l.view, l.start)
	}
}

// headerRefusingStore refuses the vault header's write, as a full browser
// store does when the logbook is created.
type headerRefusingStore struct{ logbook.Store }

func (headerRefusingStore) PutHeader(context.Context, []byte) error {
	return fmt.Errorf("idb: abort: %w", logbook.ErrQuota)
}

// A full disk when the logbook is created gets the full-disk sentence for
// an action, not the one for an entry (there is no entry to save again).
// Issue 5: a full disk or a refused write gets a clear message.
func TestLogbookCreateOnFullDisk(t *testing.T) {
	l, e := mountLogbook(t, testSession(headerRefusingStore{logbook.NewMemStore()}))
	l.access = accessForm{pass: uiTestPass, again: uiTestPass}
	l.create(l.mctx, noEvent)
	e.ConsumeAll()
	if l.phase == phaseUnlocked {
		t.Fatal("the logbook was created though its header was refused")
	}
	if !strings.Contains(l.problem, "storage is full: this was NOT done") || strings.Contains(l.problem, "entry") {
		t.Errorf("create on a full disk says %q", l.problem)
	}
	if got := vaultActionMessage(errors.New("idb: transaction aborted")); strings.Contains(got, "entry") || !strings.Contains(got, "transaction aborted") {
		t.Errorf("another failure of an action says %q", got)
	}
}

// An entry typed and not saved stays with its transport when the crew
// goes to the list, to another transport, or to another screen, and is
// back in its field when that transport opens again; saved then, the
// field empties and nothing is held any more. Issue 5: nothing is lost.
func TestLogbookUnsavedEntryFollowsItsTransport(t *testing.T) {
	s := testSession(logbook.NewMemStore())
	l, e := mountLogbook(t, s)
	openTestTransport(t, l, e)
	id := l.record.id
	l.record.noteText = "typed, then the list"
	l.record.obs.spo2 = "91"
	l.show(l.mctx, viewList)
	if l.record.noteText != "" {
		t.Errorf("the list view still holds the note: %q", l.record.noteText)
	}
	l.openTransport(l.mctx, id)
	e.ConsumeAll()
	if l.record.noteText != "typed, then the list" || l.record.obs.spo2 != "91" || l.record.transport == nil {
		t.Fatalf("back in the transport: note %q, SpO2 %q, loaded %v", l.record.noteText, l.record.obs.spo2, l.record.transport != nil)
	}
	if !strings.Contains(l.status, "back in its fields") {
		t.Errorf("the status does not say the entry is back: %q", l.status)
	}

	// Another screen: this one goes, a new Logbook screen opens.
	l.OnDismount()
	l2, e2 := mountLogbook(t, s)
	if l2.view != viewList {
		t.Fatalf("the new screen shows %q", l2.view)
	}
	l2.openTransport(l2.mctx, id)
	e2.ConsumeAll()
	if l2.record.noteText != "typed, then the list" {
		t.Fatalf("after another screen: note %q", l2.record.noteText)
	}
	l2.saveNote(l2.mctx, noEvent)
	e2.ConsumeAll()
	if l2.record.noteText != "" || !strings.Contains(lbHTML(l2), "Note: typed, then the list") {
		t.Fatalf("the note kept does not save (problem %q)", l2.problem)
	}
	l2.show(l2.mctx, viewList)
	l2.openTransport(l2.mctx, id)
	e2.ConsumeAll()
	if l2.record.noteText != "" || l2.record.obs.spo2 != "91" {
		t.Errorf("after the save: note %q (want none), SpO2 %q (still unsaved, want kept)", l2.record.noteText, l2.record.obs.spo2)
	}
}

// A start of transport being typed survives the crew going to another
// view or screen (to check the Brief, say) and coming back: what they
// typed is back in its fields, over the Brief as it is then (a changed
// Brief gives the new snapshot and its elevations, unless the crew typed
// their own). Nothing is said to be back when nothing was typed.
func TestLogbookStartFormKeptAcrossViews(t *testing.T) {
	s := testSession(logbook.NewMemStore())
	l, e := mountLogbook(t, s)
	createTestVault(l, e)
	d := scenarioDraft()
	if err := draftStoreFor(s).Save(l.mctx, d); err != nil {
		t.Fatal(err)
	}
	l.show(l.mctx, viewStart)
	l.prepareStart(l.mctx)
	if l.start.typed() || l.status != "" {
		t.Fatalf("a form only the Brief filled in counts as typed (status %q)", l.status)
	}
	l.show(l.mctx, viewList) // nothing typed: nothing kept
	l.show(l.mctx, viewStart)
	l.prepareStart(l.mctx)
	if l.status != "" {
		t.Errorf("nothing was typed, yet the status says %q", l.status)
	}
	l.start.vehicle, l.start.origin, l.start.weight, l.start.destElev = "Rotor wing", "Mesa clinic", "71", "3100 ft"
	before := l.start.snapshot
	l.show(l.mctx, viewList)
	if l.start.typed() {
		t.Error("the start form is still on screen after leaving it")
	}
	// The crew changes the Brief's origin elevation meanwhile.
	d.Route.Origin = Entry{T: "800", U: "ft"}
	if err := draftStoreFor(s).Save(l.mctx, d); err != nil {
		t.Fatal(err)
	}
	l.show(l.mctx, viewStart)
	l.prepareStart(l.mctx)
	f := l.start
	if f.vehicle != "Rotor wing" || f.origin != "Mesa clinic" || f.weight != "71" {
		t.Errorf("typed fields not back: %+v", f)
	}
	if f.destElev != "3100 ft" {
		t.Errorf("the destination elevation the crew typed became %q", f.destElev)
	}
	if f.originElev != "800 ft" {
		t.Errorf("the origin elevation the crew left as the Brief gave it is %q, not the Brief's new 800 ft", f.originElev)
	}
	if f.snapshot == nil || before == nil || string(f.snapshot.Plan) == string(before.Plan) {
		t.Error("the plan kept with the transport is not the Brief as it is now")
	}
	if !strings.Contains(l.status, "back in its fields") {
		t.Errorf("status %q does not say the typing is back", l.status)
	}
	// Leaving the Logbook screen keeps it too.
	l.OnDismount()
	if _, ok := s.takeStart(); !ok {
		t.Error("leaving the Logbook screen did not keep the start form")
	}
}
