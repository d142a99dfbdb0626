package logbook

import (
	"context"
	"encoding/json"
	"errors"
	"strings"
	"testing"
	"time"

	"alvea/physio"
)

const testPass = "gentle-fjord-lantern-42" // test-only passphrase

var ctx = context.Background()

func newTestVault(t testing.TB) (*Vault, *memStore) {
	t.Helper()
	s := NewMemStore().(*memStore)
	v, err := Create(ctx, s, testPass, MinimumKDF)
	if err != nil {
		t.Fatal(err)
	}
	v.SetAutoLock(0, nil)
	return v, s
}

func ptr[T any](v T) *T { return &v }

// sampleTransport appends a transport of our own invention (demo data) and
// returns its id. Records: R(n+1) open, then event, gauges, observation,
// note, close: 8 records.
func sampleTransport(t testing.TB, v *Vault, start time.Time) TransportID {
	t.Helper()
	id := NewTransportID(start)
	add := func(e *Entry) {
		t.Helper()
		e.Transport = id
		if _, err := v.Append(ctx, e); err != nil {
			t.Fatal(err)
		}
	}
	add(&Entry{Kind: KindOpen, At: start, Open: &Opening{
		Vehicle: "twin turboprop, pressurised", Crew: []string{"AB", "CD"},
		Origin:      Place{Name: "Hill Clinic", Elevation: physio.Metres(1450), ElevationKnown: true},
		Destination: Place{Name: "Coast Hospital", Elevation: physio.Metres(12), ElevationKnown: true},
		Patient:     Patient{AgeBand: AgeAdult, Sex: SexFemale, WeightKg: 70},
		Brief:       &Brief{Plan: json.RawMessage(`{"version":1}`), Result: json.RawMessage(`{"litres":900}`), EngineVersion: "test"},
		Cylinders:   []CylinderSpec{{Label: "A", Size: "E"}, {Label: "B", WaterCapacity: physio.Litres(10)}},
	}})
	add(&Entry{Kind: KindEvent, At: start.Add(10 * time.Minute), Event: &Event{Type: EventLiftOff}})
	add(&Entry{Kind: KindGauge, At: start.Add(5 * time.Minute), Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Psi(2000)}})
	add(&Entry{Kind: KindGauge, At: start.Add(65 * time.Minute), Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Psi(1500)}})
	add(&Entry{Kind: KindObserve, At: start.Add(30 * time.Minute), Observe: &Observation{SpO2: ptr(physio.Percent(93)), FiO2: ptr(physio.FractionOf(0.4)), Device: "simple mask", Flow: ptr(physio.LitresPerMinute(6))}})
	add(&Entry{Kind: KindNote, At: start.Add(40 * time.Minute), Note: &Note{Text: "light turbulence on descent"}})
	add(&Entry{Kind: KindEvent, At: start.Add(70 * time.Minute), Event: &Event{Type: EventLanding}})
	add(&Entry{Kind: KindClose, At: start.Add(90 * time.Minute), Close: &Closing{Outcome: "handed over"}})
	return id
}

var t0 = time.Date(2031, 3, 14, 8, 0, 0, 0, time.UTC)

func TestCreateUnlockLock(t *testing.T) {
	v, s := newTestVault(t)
	id := sampleTransport(t, v, t0)

	w, err := Open(ctx, s)
	if err != nil {
		t.Fatal(err)
	}
	if !w.Locked() {
		t.Fatal("opened vault should be locked")
	}
	if _, err := w.List(ctx); !errors.Is(err, ErrLocked) {
		t.Fatalf("List while locked: %v, want ErrLocked", err)
	}
	if err := w.Unlock(ctx, testPass+"x"); !errors.Is(err, ErrUnlock) {
		t.Fatalf("wrong passphrase: %v, want ErrUnlock", err)
	}
	if err := w.Unlock(ctx, testPass); err != nil {
		t.Fatal(err)
	}
	l, err := w.List(ctx)
	if err != nil || len(l.Problems) != 0 || len(l.Transports) != 1 || l.Head != 8 {
		t.Fatalf("list: %+v %v", l, err)
	}
	ts := l.Transports[0]
	if ts.ID != id || ts.Vehicle != "twin turboprop, pressurised" || ts.Origin != "Hill Clinic" || !ts.IsClosed() || ts.Entries != 8 {
		t.Errorf("summary %+v", ts)
	}
	keys := w.keys
	w.Lock()
	if !w.Locked() || keys.data[0]|keys.data[31]|keys.seal[0]|keys.head[5] != 0 {
		t.Error("Lock left key bytes")
	}
	for _, b := range keys.data {
		if b != 0 {
			t.Fatal("data key not zeroed")
		}
	}
}

func TestDamagedHeaderIsVague(t *testing.T) {
	v, s := newTestVault(t)
	sampleTransport(t, v, t0)
	var hdrLen int
	s.tamper(func(h, _ *[]byte, _ map[uint64]Sealed) { hdrLen = len(*h) })
	for i := 0; i < hdrLen; i++ {
		s.tamper(func(h, _ *[]byte, _ map[uint64]Sealed) { (*h)[i] ^= 0x01 })
		w, err := Open(ctx, s)
		if err != nil {
			t.Fatal(err)
		}
		if err := w.Unlock(ctx, testPass); err != ErrUnlock {
			t.Fatalf("header byte %d changed: %v, want exactly ErrUnlock", i, err)
		}
		s.tamper(func(h, _ *[]byte, _ map[uint64]Sealed) { (*h)[i] ^= 0x01 })
	}
}

func TestChangePassphrase(t *testing.T) {
	v, s := newTestVault(t)
	sampleTransport(t, v, t0)
	const next = "amber tide over the pass 7"
	if err := v.ChangePassphrase(ctx, "not-the-passphrase", next, MinimumKDF); !errors.Is(err, ErrUnlock) {
		t.Fatalf("wrong current passphrase: %v", err)
	}
	if err := v.ChangePassphrase(ctx, testPass, "password123", MinimumKDF); !errors.Is(err, ErrWeakPassphrase) {
		t.Fatalf("weak new passphrase: %v", err)
	}
	var before map[uint64]Sealed
	s.tamper(func(_, _ *[]byte, r map[uint64]Sealed) { before = clone(r) })
	if err := v.ChangePassphrase(ctx, testPass, next, KDFParams{Algorithm: PBKDF2SHA256, Iterations: 600_000}); err != nil {
		t.Fatal(err)
	}
	s.tamper(func(_, _ *[]byte, r map[uint64]Sealed) {
		for k, rec := range r {
			if string(rec.Body) != string(before[k].Body) || string(rec.Index) != string(before[k].Index) {
				t.Error("records changed by a passphrase change")
			}
		}
	})
	w, _ := Open(ctx, s)
	if err := w.Unlock(ctx, testPass); !errors.Is(err, ErrUnlock) {
		t.Error("old passphrase still opens")
	}
	if err := w.Unlock(ctx, next); err != nil {
		t.Fatal(err)
	}
	if w.KDF().Algorithm != PBKDF2SHA256 {
		t.Error("new KDF settings not stored")
	}
	if p, err := w.Verify(ctx); err != nil || len(p) != 0 {
		t.Fatalf("verify after change: %v %v", p, err)
	}
}

func clone(m map[uint64]Sealed) map[uint64]Sealed {
	out := map[uint64]Sealed{}
	for k, v := range m {
		out[k] = Sealed{Seq: v.Seq, Index: append([]byte(nil), v.Index...), Body: append([]byte(nil), v.Body...)}
	}
	return out
}

// problemsOf lists the vault's problems as "R3 damaged"-style strings.
func problemsOf(t *testing.T, v *Vault) []string {
	t.Helper()
	ps, err := v.Verify(ctx)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, p := range ps {
		out = append(out, p.Record()+" "+p.Kind.String())
	}
	return out
}

func TestTamperNamedByRecord(t *testing.T) {
	cases := []struct {
		name string
		do   func(head *[]byte, r map[uint64]Sealed)
		want []string
	}{
		{"index byte changed", func(_ *[]byte, r map[uint64]Sealed) { r[3].Index[40] ^= 1 }, []string{"R3 damaged"}},
		{"body byte changed", func(_ *[]byte, r map[uint64]Sealed) { r[5].Body[30] ^= 1 }, []string{"R5 damaged"}},
		{"middle record removed", func(_ *[]byte, r map[uint64]Sealed) { delete(r, 4) }, []string{"R4 missing"}},
		{"last records removed (truncation)", func(_ *[]byte, r map[uint64]Sealed) { delete(r, 7); delete(r, 8) }, []string{"R7 missing"}},
		{"two records swapped (reordering)", func(_ *[]byte, r map[uint64]Sealed) {
			a, b := r[2], r[3]
			a.Seq, b.Seq = 3, 2
			r[2], r[3] = b, a
		}, []string{"R2 damaged", "R3 damaged"}},
		{"head changed", func(h *[]byte, _ map[uint64]Sealed) { (*h)[3] ^= 1 }, []string{"- head damaged"}},
		{"bodies swapped", func(_ *[]byte, r map[uint64]Sealed) {
			a, b := r[2], r[3]
			a.Body, b.Body = b.Body, a.Body
			r[2], r[3] = a, b
		}, []string{"R2 damaged", "R3 damaged"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			v, s := newTestVault(t)
			sampleTransport(t, v, t0)
			s.tamper(func(_, h *[]byte, r map[uint64]Sealed) { c.do(h, r) })
			got := problemsOf(t, v)
			if strings.Join(got, ", ") != strings.Join(c.want, ", ") {
				t.Errorf("problems %q, want %q", got, c.want)
			}
			// The rest stay readable.
			l, err := v.List(ctx)
			if err != nil || len(l.Transports) != 1 {
				t.Fatalf("list after damage: %v", err)
			}
		})
	}
}

func TestReplacedRecordBreaksChain(t *testing.T) {
	// A validly sealed R3 that does not follow R2 (as if a record had been
	// replaced by someone holding the key): R3 names the break, and R4,
	// which chained to the original R3, too.
	v, s := newTestVault(t)
	sampleTransport(t, v, t0)
	var saved Sealed
	s.tamper(func(_, _ *[]byte, r map[uint64]Sealed) { saved = r[3] })
	s.tamper(func(_, _ *[]byte, r map[uint64]Sealed) {
		plain, err := open(v.keys.seal, adIndex, v.hdr.vaultID, 3, saved.Index)
		if err != nil {
			t.Fatal(err)
		}
		ie, _ := parseIndex(3, plain)
		ie.prev[0] ^= 1
		r[3] = Sealed{Seq: 3, Index: seal(v.keys.seal, adIndex, v.hdr.vaultID, 3, ie.encode()), Body: saved.Body}
	})
	got := problemsOf(t, v)
	want := "R3 chain broken, R4 chain broken"
	if strings.Join(got, ", ") != want {
		t.Errorf("problems %q, want %q", got, want)
	}
}

func TestAppendRules(t *testing.T) {
	v, _ := newTestVault(t)
	id := sampleTransport(t, v, t0)
	other := NewTransportID(t0)
	cases := []struct {
		name string
		e    Entry
	}{
		{"event for unknown transport", Entry{Transport: other, Kind: KindNote, At: t0, Note: &Note{Text: "x"}}},
		{"second open", Entry{Transport: id, Kind: KindOpen, At: t0, Open: &Opening{}}},
		{"amend missing record", Entry{Transport: id, Kind: KindAmend, At: t0, Amends: 99, Reason: "typo", Note: &Note{Text: "x"}}},
		{"amend with wrong kind", Entry{Transport: id, Kind: KindAmend, At: t0, Amends: 3, Reason: "typo", Note: &Note{Text: "x"}}},
		{"amend without reason", Entry{Transport: id, Kind: KindAmend, At: t0, Amends: 3, Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Psi(1900)}}},
		{"gauge out of range", Entry{Transport: id, Kind: KindGauge, At: t0, Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Bar(400)}}},
		{"spo2 as percent", Entry{Transport: id, Kind: KindObserve, At: t0, Observe: &Observation{SpO2: ptr(physio.FractionOf(93))}}},
		{"bad transport id", Entry{Transport: "T20310314-AAAAAA0", Kind: KindNote, At: t0, Note: &Note{Text: "x"}}},
		{"two payloads", Entry{Transport: id, Kind: KindNote, At: t0, Note: &Note{Text: "x"}, Close: &Closing{}}},
		{"no time", Entry{Transport: id, Kind: KindNote, Note: &Note{Text: "x"}}},
	}
	for _, c := range cases {
		e := c.e
		_, err := v.Append(ctx, &e)
		var fe *FieldError
		if !errors.As(err, &fe) || !errors.Is(err, ErrInvalid) {
			t.Errorf("%s: %v, want a *FieldError", c.name, err)
		}
	}
	if l, _ := v.List(ctx); l.Head != 8 {
		t.Errorf("refused entries were stored: head %d", l.Head)
	}
}

func TestAmendAndFold(t *testing.T) {
	v, _ := newTestVault(t)
	id := sampleTransport(t, v, t0)
	// R4 (A at 1500 psi) was misread: it was 1400 psi. After closing.
	if _, err := v.Append(ctx, &Entry{Transport: id, Kind: KindAmend, At: t0.Add(65 * time.Minute), Amends: 4, Reason: "gauge misread",
		Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Psi(1400)}}); err != nil {
		t.Fatal(err)
	}
	if _, err := v.Append(ctx, &Entry{Transport: id, Kind: KindAmend, At: t0, Amends: 6, Reason: "wrong transport", Void: true}); err != nil {
		t.Fatal(err)
	}
	// Readings of cylinder B (10 L water capacity): 200 → 150 bar.
	for i, bar := range []float64{200, 180, 150} {
		if _, err := v.Append(ctx, &Entry{Transport: id, Kind: KindGauge, At: t0.Add(time.Duration(i) * time.Minute), Gauge: &GaugeReading{Cylinder: "B", Pressure: physio.Bar(bar)}}); err != nil {
			t.Fatal(err)
		}
	}
	tr, err := v.Transport(ctx, id)
	if err != nil {
		t.Fatal(err)
	}
	if len(tr.Notes) != 0 || len(tr.Amendments) != 2 || !tr.Amendments[0].AfterClose {
		t.Errorf("fold: notes %d amendments %+v", len(tr.Notes), tr.Amendments)
	}
	if len(tr.History) != 13 {
		t.Errorf("history %d records, want 13", len(tr.History))
	}
	use := tr.CylinderUse()
	if len(use) != 2 {
		t.Fatalf("cylinder use %+v", use)
	}
	// Cylinder factor E = 0.28 L/psi (common practice): (2000 − 1400) psi ×
	// 0.28 = 168 L. Water capacity: 10 L × (200 − 150) bar = 500 L
	// (common practice, V×P).
	for _, c := range []struct {
		got, want float64
	}{{use[0].Used.Litres(), 168}, {use[1].Used.Litres(), 500}} {
		if d := c.got - c.want; d > 1e-9 || d < -1e-9 || use[0].Err != nil || use[1].Err != nil {
			t.Errorf("used %v L, want %v L (%v %v)", c.got, c.want, use[0].Err, use[1].Err)
		}
	}
	l, _ := v.List(ctx)
	s := l.Transports[0]
	if !s.Amended || !s.ChangedAfterClose {
		t.Errorf("summary flags %+v", s)
	}
}

func TestAutoLock(t *testing.T) {
	v, _ := newTestVault(t)
	locked := 0
	v.SetAutoLock(5*time.Minute, func() { locked++ })
	now := time.Now()
	if v.LockIfIdle(now.Add(4 * time.Minute)) {
		t.Error("locked before the idle time")
	}
	if !v.LockIfIdle(now.Add(6*time.Minute)) || !v.Locked() || locked != 1 {
		t.Error("not locked after the idle time")
	}
}

// The idle time is read from the vault's clock: use and Touch postpone the
// lock, and the lock comes once the clock passes the idle time after the
// last use.
func TestAutoLockWithClock(t *testing.T) {
	v, _ := newTestVault(t)
	clock := t0
	v.SetClock(func() time.Time { return clock })
	v.SetAutoLock(time.Minute, nil)
	if v.IdleLock() != time.Minute {
		t.Errorf("IdleLock = %v", v.IdleLock())
	}
	clock = clock.Add(59 * time.Second)
	v.Touch()
	clock = clock.Add(59 * time.Second)
	if v.LockIfIdle(clock) {
		t.Fatal("locked 59 s after a touch")
	}
	if _, err := v.List(ctx); err != nil { // a use postpones it too
		t.Fatal(err)
	}
	if v.LockIfIdle(clock.Add(59 * time.Second)) {
		t.Fatal("locked 59 s after a use")
	}
	if !v.LockIfIdle(clock.Add(time.Minute)) || !v.Locked() {
		t.Error("not locked one minute after the last use")
	}
}

func TestListingFilter(t *testing.T) {
	v, _ := newTestVault(t)
	sampleTransport(t, v, t0)
	id2 := NewTransportID(t0.AddDate(0, 1, 0))
	if _, err := v.Append(ctx, &Entry{Transport: id2, Kind: KindOpen, At: t0.AddDate(0, 1, 0), Open: &Opening{Vehicle: "road ambulance", Origin: Place{Name: "Ridge Post"}, Destination: Place{Name: "Valley Base"}}}); err != nil {
		t.Fatal(err)
	}
	l, _ := v.List(ctx)
	if len(l.Transports) != 2 || l.Transports[0].ID != id2 {
		t.Fatalf("newest first: %+v", l.Transports)
	}
	if got := l.Filter(Filter{Text: "VALLEY"}); len(got) != 1 || got[0].ID != id2 {
		t.Errorf("text filter %+v", got)
	}
	if got := l.Filter(Filter{OpenOnly: true}); len(got) != 1 || got[0].ID != id2 {
		t.Errorf("open filter %+v", got)
	}
	if got := l.Filter(Filter{To: t0.AddDate(0, 0, 1)}); len(got) != 1 || got[0].ID == id2 {
		t.Errorf("date filter %+v", got)
	}
}

func TestPassphraseRules(t *testing.T) {
	refused := []string{"short", "password1234", "Password!!", "iloveyou2024", "qwertyuiop", "1234567890", "aaaaaaaaaaaa", "dragondragon", "0987654321", "8352917460"}
	for _, p := range refused {
		if err := CheckPassphrase(p); !errors.Is(err, ErrWeakPassphrase) {
			t.Errorf("%q accepted", p)
		}
	}
	for _, p := range []string{testPass, "Lantern over 3 quiet dunes", "correct horse battery staple"} {
		if err := CheckPassphrase(p); err != nil {
			t.Errorf("%q refused: %v", p, err)
		}
	}
	if _, err := Create(ctx, NewMemStore(), "abc", MinimumKDF); !errors.Is(err, ErrWeakPassphrase) {
		t.Error("Create accepted a short passphrase")
	}
}

func TestTransportID(t *testing.T) {
	for i := 0; i < 200; i++ {
		id := NewTransportID(t0)
		if err := id.Validate(); err != nil || !strings.HasPrefix(string(id), "T20310314-") {
			t.Fatalf("%s: %v", id, err)
		}
		// Any single character changed in the random part is caught by the
		// check character (Crockford mod-37 catches single substitutions).
		b := []byte(id)
		b[12] = crockford[(strings.IndexByte(crockford, b[12])+1)%32]
		if TransportID(b).Validate() == nil {
			t.Fatalf("%s: changed character not caught", b)
		}
	}
}
