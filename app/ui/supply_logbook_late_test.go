package ui

import (
	"context"
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// supplyLateSetup creates a vault on store whose clock and Supply's are one
// stopped clock at 2030-05-06 09:12, opens a transport of two E cylinders
// at 08:00, and mounts Supply on that session with two E cylinders (a
// scenario of our own).
func supplyLateSetup(t *testing.T, store logbook.Store) (*supply, *vaultSession, app.Context, app.TestEngine, logbook.TransportID, *time.Time) {
	t.Helper()
	clock := time.Date(2030, 5, 6, 8, 0, 0, 0, time.Local)
	sess := testSession(store)
	sess.now = func() time.Time { return clock }
	sess.SetIdle(0)
	c := context.Background()
	if err := sess.Create(c, uiTestPass); err != nil {
		t.Fatal(err)
	}
	id := logbook.NewTransportID(clock)
	open := &logbook.Entry{Transport: id, Kind: logbook.KindOpen, At: clock, Open: &logbook.Opening{
		Vehicle: "Test aircraft", Origin: logbook.Place{Name: "Field A"}, Destination: logbook.Place{Name: "Field B"}, Cylinders: twoE}}
	if _, err := sess.Append(c, open); err != nil {
		t.Fatal(err)
	}
	clock = time.Date(2030, 5, 6, 9, 12, 0, 0, time.Local)
	s := &supply{tick: 0, vault: sess}
	s.now = func() time.Time { return clock }
	p, e := mount(t, s)
	s.OnMount(p.ctx)
	e.ConsumeAll()
	s.addCylinder(p.ctx, noEvent) // a second E, as in the transport
	if s.link.open() == nil {
		t.Fatal("Supply does not see the open transport")
	}
	return s, sess, p.ctx, e, id, &clock
}

func at0506(hh, mm int) time.Time { return time.Date(2030, 5, 6, hh, mm, 0, 0, time.Local) }

// Supply's logbook card takes a late time by the Logbook's rule (lbEntryTime;
// DEVELOPERS.md, late entries): a malformed time and one before the
// opening are refused with the Logbook's sentences under the card's own
// field name, the time kept in its field, the reading kept and nothing
// saved; a good time times the reading, the field goes back to blank, and
// the next entry (a cylinder change) is timed when it was made. A
// correction of the late reading keeps its time. The times are our own
// scenario (opened 08:00, typed at 09:12).
func TestSupplyLateReading(t *testing.T) {
	s, sess, ctx, e, id, _ := supplyLateSetup(t, logbook.NewMemStore())
	html := rendered(t, s)
	for _, want := range []string{`id="supply-log-at"`, `id="supply-log-at-note"`, "Time for the logbook (hh:mm, 24-hour; blank = now)", "not before the transport opened"} {
		if !strings.Contains(html, want) {
			t.Errorf("the card lacks %q", want)
		}
	}
	s.edit(ctx, FieldSupplyGauge, "1500")
	s.edit(ctx, FieldSupplyFlow, "10")

	for _, c := range []struct{ typed, want string }{
		// The Logbook's refusals (app/ui/logbook_when.go), with this field's name.
		{"9.02", "is not a clock time. Type hh:mm in 24-hour time, 00:00 to 23:59"},
		{"07:55", "is before the transport opened (2030-05-06 08:00:00)"},
	} {
		s.link.atText = c.typed
		s.logReading(ctx)
		e.ConsumeAll()
		p := s.link.problem
		for _, want := range []string{"Time for the logbook", c.want, "Nothing was saved to the logbook", "the reading is kept"} {
			if !strings.Contains(p, want) {
				t.Errorf("%q: the refusal %q lacks %q", c.typed, p, want)
			}
		}
		if s.link.atText != c.typed || s.link.atMsg == "" {
			t.Errorf("%q refused: the field holds %q, its message %q", c.typed, s.link.atText, s.link.atMsg)
		}
		if r, _ := s.session.lastReading(); r.Log != nil || r.Gauge != "1500" {
			t.Errorf("%q refused: the reading is %+v", c.typed, r)
		}
		html := rendered(t, s)
		if !strings.Contains(html, `id="supply-log-at-msg"`) || !strings.Contains(html, `id="supply-log-save"`) {
			t.Errorf("%q refused: the field's message or the save button is not shown", c.typed)
		}
		if tr := transportOf(t, sess, id); len(tr.History) != 1 {
			t.Fatalf("%q refused: the transport holds %d records", c.typed, len(tr.History))
		}
	}

	s.link.atText = "09:02"
	s.logReading(ctx)
	e.ConsumeAll()
	tr := transportOf(t, sess, id)
	if len(tr.Gauges) != 1 || !tr.Gauges[0].At.Equal(at0506(9, 2)) {
		t.Fatalf("the late reading: %+v (problem %q), want one at 09:02", tr.Gauges, s.link.problem)
	}
	if s.link.atText != "" || s.link.atMsg != "" {
		t.Errorf("after saving the field holds %q (%q), want blank", s.link.atText, s.link.atMsg)
	}
	if st := s.link.status; !strings.Contains(st, "for 09:02") || !strings.Contains(st, "a late entry, written at 09:12:00") {
		t.Errorf("status %q does not name the time given and the time written", st)
	}
	if r, _ := s.session.lastReading(); r.Log == nil || r.Log.Seq != tr.Gauges[0].Seq {
		t.Errorf("the reading is not marked saved: %+v", r)
	}

	// Corrected within the minute, untimed: the correction keeps 09:02.
	s.edit(ctx, FieldSupplyGauge, "1450")
	s.logReading(ctx)
	e.ConsumeAll()
	tr = transportOf(t, sess, id)
	if len(tr.Gauges) != 1 || len(tr.Amendments) != 1 || !tr.Gauges[0].At.Equal(at0506(9, 2)) {
		t.Errorf("the corrected late reading: %+v (problem %q), want it still at 09:02", tr.Gauges, s.link.problem)
	}

	// The next entry, with the field blank, is timed when it was made.
	s.pickInUse(ctx, 1)
	e.ConsumeAll()
	tr = transportOf(t, sess, id)
	if len(tr.Events) != 1 || !tr.Events[0].At.Equal(at0506(9, 12)) || tr.Events[0].Value.Cylinder != "E2" {
		t.Errorf("the cylinder change after the late reading: %+v, want E2 at 09:12", tr.Events)
	}
}

// A cylinder change whose time is refused, or that the store refuses, is
// not lost: it is offered with a button (picking the same cylinder again
// does nothing) until the logbook takes it, once.
func TestSupplyLateCylinderChange(t *testing.T) {
	store := &failingStore{Store: logbook.NewMemStore()}
	s, sess, ctx, e, id, clock := supplyLateSetup(t, store)
	s.edit(ctx, FieldSupplyGauge, "1500")
	s.edit(ctx, FieldSupplyFlow, "10")

	s.link.atText = "25:00"
	s.pickInUse(ctx, 1)
	e.ConsumeAll()
	if !strings.Contains(s.link.problem, "Time for the logbook") || !strings.Contains(s.link.problem, "00:00 to 23:59") || s.link.atText != "25:00" {
		t.Errorf("a change with 25:00: problem %q, field %q", s.link.problem, s.link.atText)
	}
	if got := htmlText(rendered(t, s), "supply-log-change"); !strings.Contains(got, "cylinder 2") || !strings.Contains(got, "09:12") {
		t.Fatalf("the unsaved change is not offered: %q", got)
	}
	if tr := transportOf(t, sess, id); len(tr.Events) != 0 {
		t.Fatalf("a change with a refused time was saved: %+v", tr.Events)
	}

	// A full disk: refused by the store, still offered.
	*clock = at0506(9, 14)
	s.link.atText = "09:10"
	store.fail = true
	s.saveChange(ctx)
	e.ConsumeAll()
	if !strings.Contains(s.link.problem, "storage is full") || !strings.Contains(rendered(t, s), `id="supply-log-change"`) || s.link.atText != "09:10" {
		t.Errorf("a change on a full disk: problem %q, field %q, or no button", s.link.problem, s.link.atText)
	}

	store.fail = false
	s.saveChange(ctx)
	e.ConsumeAll()
	tr := transportOf(t, sess, id)
	if len(tr.Events) != 1 || !tr.Events[0].At.Equal(at0506(9, 10)) || tr.Events[0].Value.Cylinder != "E2" {
		t.Fatalf("the change saved again: %+v (problem %q), want one, E2 at 09:10", tr.Events, s.link.problem)
	}
	if strings.Contains(rendered(t, s), `id="supply-log-change"`) || s.link.atText != "" {
		t.Errorf("after saving the change it is still offered, or the field holds %q", s.link.atText)
	}
	s.saveChange(ctx)
	e.ConsumeAll()
	if n := len(transportOf(t, sess, id).Events); n != 1 {
		t.Errorf("%d change events, want 1", n)
	}
}

// A transport closed since Supply read it takes no new entry: the vault's
// transport is read when saving (the rule the Logbook keeps after a close).
func TestSupplyClosedSinceRead(t *testing.T) {
	s, sess, ctx, e, id, clock := supplyLateSetup(t, logbook.NewMemStore())
	s.edit(ctx, FieldSupplyGauge, "1500")
	s.edit(ctx, FieldSupplyFlow, "10")
	if _, err := sess.Append(context.Background(), &logbook.Entry{Transport: id, Kind: logbook.KindClose, At: *clock, Close: &logbook.Closing{Outcome: "handed over"}}); err != nil {
		t.Fatal(err)
	}
	s.logReading(ctx) // before Supply has read the transport again
	e.ConsumeAll()
	if !strings.Contains(s.link.problem, "closed at 2030-05-06 09:12") || !strings.Contains(s.link.problem, "takes no new entry") {
		t.Errorf("a reading for a transport closed since: problem %q", s.link.problem)
	}
	if tr := transportOf(t, sess, id); len(tr.Gauges) != 0 {
		t.Errorf("a reading was saved after the close: %+v", tr.Gauges)
	}
	if r, _ := s.session.lastReading(); r.Log != nil || r.Gauge != "1500" {
		t.Errorf("the reading on Supply is %+v", r)
	}
}
