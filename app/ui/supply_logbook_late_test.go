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

// A reading given a Read at goes to the logbook at that time (the
// Logbook's rule, lbEntryTime; DEVELOPERS.md, late entries), the same time
// the countdown counts from. Refused before the transport's opening, with
// the field, the range and the format named, what was typed kept and
// nothing recorded or saved; read at 09:02 and typed at 09:12, the
// countdown shows 10 minutes less than at the reading, and the logbook has
// the reading at 09:02, a late entry. A correction within the minute keeps
// that time; the next reading, a change of cylinder typed later, takes no
// time from it. The times are our own scenario (opened 08:00, typed at
// 09:12).
func TestSupplyLateReading(t *testing.T) {
	s, sess, ctx, e, id, clock := supplyLateSetup(t, logbook.NewMemStore())
	html := rendered(t, s)
	if strings.Contains(html, `id="supply-log-at"`) {
		t.Error("the logbook card still has a time control of its own")
	}
	if note := plainText(html, "supply-log-time-note"); !strings.Contains(note, "Read at") || strings.Contains(note, "more time than is left") {
		t.Errorf("the card's note is %q", note)
	}
	if note := plainText(html, "supply-read-at-note"); !strings.Contains(note, "nor before the open transport's opening") {
		t.Errorf("the reading's note is %q", note)
	}

	s.edit(ctx, FieldSupplyReadAt, "07:55")
	s.edit(ctx, FieldSupplyGauge, "1500")
	s.edit(ctx, FieldSupplyFlow, "10")
	html = rendered(t, s)
	msg := plainText(html, FieldSupplyReadAt+"-msg")
	for _, want := range []string{"Read at: 07:55 (2030-05-06 07:55) is before the transport opened (2030-05-06 08:00:00)", "Give a time from the opening to now as hh:mm (24-hour)"} {
		if !strings.Contains(msg, want) {
			t.Errorf("the refusal %q lacks %q", msg, want)
		}
	}
	if len(s.session.Readings) != 0 || s.readAtText != "07:55" || s.gaugeText != "1500" || s.flowText != "10" || strings.Contains(html, `id="supply-log-save"`) {
		t.Errorf("refused: readings %+v, fields %q %q %q", s.session.Readings, s.readAtText, s.gaugeText, s.flowText)
	}

	s.edit(ctx, FieldSupplyReadAt, "09:02")
	// REFERENCES §7: E cylinder 0.28 L/psi, residual 200 psi: (1500 − 200)
	// × 0.28 ÷ 10 L/min = 36.4 min from 09:02: 26 min left at 09:12, the
	// change at 09:38.
	if got := countdownShown(t, s); got["supply-minutes"] != "26" || got["supply-minutes-reading"] != "36" || got["supply-change-at"] != "09:38" {
		t.Errorf("the countdown of the reading read at 09:02: %v", got)
	}
	s.logReading(ctx)
	e.ConsumeAll()
	tr := transportOf(t, sess, id)
	if len(tr.Gauges) != 1 || !tr.Gauges[0].At.Equal(at0506(9, 2)) {
		t.Fatalf("the late reading: %+v (problem %q), want one at 09:02", tr.Gauges, s.link.problem)
	}
	if st := s.link.status; !strings.Contains(st, "for 09:02") || !strings.Contains(st, "a late entry, written at 09:12:00") {
		t.Errorf("status %q does not name the time given and the time written", st)
	}
	if r, _ := s.session.lastReading(); r.Log == nil || r.Log.Seq != tr.Gauges[0].Seq || !r.At().Equal(at0506(9, 2)) {
		t.Errorf("the reading is not marked saved, or lost its time: %+v", r)
	}
	if s.readAtText != "09:02" {
		t.Errorf("Read at shows %q after saving, want the reading's 09:02", s.readAtText)
	}

	// Corrected within the minute: the correction keeps 09:02.
	s.edit(ctx, FieldSupplyGauge, "1450")
	s.logReading(ctx)
	e.ConsumeAll()
	tr = transportOf(t, sess, id)
	if len(tr.Gauges) != 1 || len(tr.Amendments) != 1 || !tr.Gauges[0].At.Equal(at0506(9, 2)) {
		t.Errorf("the corrected late reading: %+v (problem %q), want it still at 09:02", tr.Gauges, s.link.problem)
	}

	// 09:20: the change to cylinder 2 is a new reading, timed now.
	*clock = at0506(9, 20)
	s.pickInUse(ctx, 1)
	e.ConsumeAll()
	tr = transportOf(t, sess, id)
	if len(tr.Events) != 1 || !tr.Events[0].At.Equal(at0506(9, 20)) || tr.Events[0].Value.Cylinder != "E2" {
		t.Errorf("the cylinder change after the late reading: %+v, want E2 at 09:20", tr.Events)
	}
	if r, _ := s.session.lastReading(); r.Cylinder != 1 || r.ReadGiven() || s.readAtText != "" {
		t.Errorf("the new cylinder's reading took the old time: %+v, Read at %q", r, s.readAtText)
	}
}

// A reading given a time before the transport opened (typed here before
// the transport was started in the Logbook) is not saved to it: the
// Logbook's sentence, the reading kept on this tablet.
func TestSupplyReadBeforeOpening(t *testing.T) {
	s, sess, ctx, e, id, _ := supplyLateSetup(t, logbook.NewMemStore())
	s.session.record(SupplyReading{AtUnixMilli: at0506(9, 12).UnixMilli(), ReadUnixMilli: at0506(7, 50).UnixMilli(), Gauge: "1500", GaugeUnit: UnitPsi, Flow: "10"})
	s.logReading(ctx)
	e.ConsumeAll()
	if p := s.link.problem; !strings.Contains(p, "Read at: 07:50 (2030-05-06 07:50) is before the transport opened") || !strings.Contains(p, "the reading is kept on this tablet") {
		t.Errorf("problem %q", p)
	}
	if tr := transportOf(t, sess, id); len(tr.Gauges) != 0 {
		t.Errorf("saved: %+v", tr.Gauges)
	}
}

// A change of cylinder takes the new cylinder's first reading's time: Read
// at typed for it before choosing it times both. With Read at refused, the
// change is not saved but offered with a button, and takes the time once
// Read at is right; a change the store refuses stays offered until the
// logbook takes it, once.
func TestSupplyLateCylinderChange(t *testing.T) {
	store := &failingStore{Store: logbook.NewMemStore()}
	s, sess, ctx, e, id, clock := supplyLateSetup(t, store)
	s.edit(ctx, FieldSupplyGauge, "1500")
	s.edit(ctx, FieldSupplyFlow, "10") // typed 09:12

	*clock = at0506(9, 14)
	s.edit(ctx, FieldSupplyReadAt, "09:11") // before the reading of cylinder 1: fine for cylinder 2
	if r, _ := s.session.lastReading(); r.ReadGiven() {
		t.Fatalf("a time typed for the next reading moved this one: %+v", r)
	}
	s.edit(ctx, FieldSupplyReadAt, "25:00")
	s.pickInUse(ctx, 1)
	e.ConsumeAll()
	if !strings.Contains(s.messages[FieldSupplyReadAt], "00:00 to 23:59") || !strings.Contains(s.link.problem, "Read at, which is refused") {
		t.Errorf("a change with Read at 25:00: message %q, problem %q", s.messages[FieldSupplyReadAt], s.link.problem)
	}
	if got := htmlText(rendered(t, s), "supply-log-change"); !strings.Contains(got, "cylinder 2") {
		t.Fatalf("the unsaved change is not offered: %q", got)
	}
	if tr := transportOf(t, sess, id); len(tr.Events) != 0 {
		t.Fatalf("a change with a refused time was saved: %+v", tr.Events)
	}
	s.saveChange(ctx) // still no time
	e.ConsumeAll()
	if tr := transportOf(t, sess, id); len(tr.Events) != 0 {
		t.Fatalf("a change with no time was saved: %+v", tr.Events)
	}

	s.edit(ctx, FieldSupplyReadAt, "09:10")
	if r, _ := s.session.lastReading(); r.Cylinder != 1 || !r.At().Equal(at0506(9, 10)) {
		t.Fatalf("cylinder 2's reading: %+v (messages %v)", r, s.messages)
	}
	store.fail = true
	s.saveChange(ctx)
	e.ConsumeAll()
	if !strings.Contains(s.link.problem, "storage is full") || !strings.Contains(rendered(t, s), `id="supply-log-change"`) {
		t.Errorf("a change on a full disk: problem %q, or no button", s.link.problem)
	}
	store.fail = false
	s.saveChange(ctx)
	e.ConsumeAll()
	tr := transportOf(t, sess, id)
	if len(tr.Events) != 1 || !tr.Events[0].At.Equal(at0506(9, 10)) || tr.Events[0].Value.Cylinder != "E2" {
		t.Fatalf("the change saved again: %+v (problem %q), want one, E2 at 09:10", tr.Events, s.link.problem)
	}
	if strings.Contains(rendered(t, s), `id="supply-log-change"`) {
		t.Error("after saving the change it is still offered")
	}
	s.saveChange(ctx)
	e.ConsumeAll()
	if n := len(transportOf(t, sess, id).Events); n != 1 {
		t.Errorf("%d change events, want 1", n)
	}

	// Typed first, Read at times the change saved as the cylinder is chosen.
	*clock = at0506(9, 30)
	s.edit(ctx, FieldSupplyReadAt, "09:25")
	s.pickInUse(ctx, 0)
	e.ConsumeAll()
	tr = transportOf(t, sess, id)
	if len(tr.Events) != 2 || !tr.Events[1].At.Equal(at0506(9, 25)) || tr.Events[1].Value.Cylinder != "E1" {
		t.Errorf("a change with Read at 09:25: %+v (problem %q)", tr.Events, s.link.problem)
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

// A Read at typed after the correction window waits for the next reading;
// when it is earlier than the reading shown (the gauge was read before it
// was typed, and the crew noticed late), a button re-times that reading
// instead: the countdown counts from the earlier time (less time left, the
// safe side), and the logbook, which had the reading at its typing time,
// gets a correction at the earlier time. A later time gives no such button
// (it would leave more time). Check values: REFERENCES §7 [calc], an E
// cylinder at 1500 psi, residual 200 psi, 10 L/min lasts (1500 − 200) ×
// 0.28 ÷ 10 = 36.4 min; read at 09:02 and seen at 09:15, 23 min are left
// (rounded down) and the change is due at 09:38 (09:02 + 36.4, truncated).
func TestSupplyRetimeShownReading(t *testing.T) {
	s, sess, ctx, e, id, clock := supplyLateSetup(t, logbook.NewMemStore())
	typeReading(s, ctx, [2]string{FieldSupplyGauge, "1500"}, [2]string{FieldSupplyFlow, "10"}) // typed 09:12
	s.logReading(ctx)
	e.ConsumeAll()
	if tr := transportOf(t, sess, id); len(tr.Gauges) != 1 || !tr.Gauges[0].At.Equal(at0506(9, 12)) {
		t.Fatalf("the reading was not saved at 09:12: %+v (problem %q)", tr.Gauges, s.link.problem)
	}

	*clock = at0506(9, 15)
	s.edit(ctx, FieldSupplyReadAt, "09:13") // later than the reading: waits, no button
	if page := rendered(t, s); !strings.Contains(page, `id="supply-read-at-next"`) || strings.Contains(page, `id="supply-read-at-retime"`) {
		t.Fatalf("a later Read at: the waiting note or a re-time button is wrong:\n%s", htmlText(page, "supply-read-at-next"))
	}
	s.edit(ctx, FieldSupplyReadAt, "09:02")
	if got := htmlText(rendered(t, s), "supply-read-at-retime"); !strings.Contains(got, "read at 09:02") {
		t.Fatalf("no button to re-time the reading shown to 09:02: %q", got)
	}
	if r, _ := s.session.lastReading(); r.ReadGiven() {
		t.Fatalf("the reading was re-timed before the tap: %+v", r)
	}
	s.retimeShown(ctx, noEvent)
	if r, _ := s.session.lastReading(); len(s.session.Readings) != 1 || !r.At().Equal(at0506(9, 2)) || r.Log != nil || r.Corrects == nil {
		t.Fatalf("after the tap: %+v", s.session.Readings)
	}
	if got := countdownShown(t, s); got["supply-minutes"] != "23" || got["supply-change-at"] != "09:38" {
		t.Errorf("the countdown from 09:02 at 09:15: %v, want 23 min and change at 09:38", got)
	}
	if page := rendered(t, s); strings.Contains(page, `id="supply-read-at-next"`) || strings.Contains(page, `id="supply-read-at-retime"`) {
		t.Error("the time given to the reading shown is still said to wait")
	}
	s.logReading(ctx)
	e.ConsumeAll()
	tr := transportOf(t, sess, id)
	if len(tr.Amendments) != 1 || len(tr.Gauges) != 1 || !tr.Gauges[0].At.Equal(at0506(9, 2)) {
		t.Fatalf("the logbook's reading is not corrected to 09:02: gauges %+v, %d amendments (problem %q)", tr.Gauges, len(tr.Amendments), s.link.problem)
	}
}
