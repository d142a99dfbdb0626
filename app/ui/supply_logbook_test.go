package ui

import (
	"context"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
	"alvea/physio"
)

// supplyWithLogbook creates a vault on store, opens a transport with the
// given cylinders (none: no transport), and mounts Supply on that session
// with a stopped clock.
func supplyWithLogbook(t *testing.T, store logbook.Store, cyls ...logbook.CylinderSpec) (*supply, *vaultSession, app.Context, app.TestEngine, logbook.TransportID) {
	t.Helper()
	sess := testSession(store)
	c := context.Background()
	if err := sess.Create(c, uiTestPass); err != nil {
		t.Fatal(err)
	}
	var id logbook.TransportID
	if len(cyls) > 0 {
		id = logbook.NewTransportID(time.Now())
		open := &logbook.Entry{Transport: id, Kind: logbook.KindOpen, At: time.Now(), Open: &logbook.Opening{
			Vehicle: "Test aircraft", Origin: logbook.Place{Name: "Field A"}, Destination: logbook.Place{Name: "Field B"}, Cylinders: cyls}}
		if _, err := sess.Append(c, open); err != nil {
			t.Fatal(err)
		}
	}
	now := time.Date(2030, 5, 6, 9, 0, 0, 0, time.Local)
	s := &supply{tick: 0, vault: sess}
	s.now = func() time.Time { return now }
	p, e := mount(t, s)
	s.OnMount(p.ctx)
	e.ConsumeAll()
	return s, sess, p.ctx, e, id
}

func transportOf(t *testing.T, sess *vaultSession, id logbook.TransportID) *logbook.Transport {
	t.Helper()
	v, err := sess.Vault()
	if err != nil {
		t.Fatal(err)
	}
	tr, err := v.Transport(context.Background(), id)
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

var twoE = []logbook.CylinderSpec{{Label: "E1", Size: "E"}, {Label: "E2", Size: "E"}}

// A reading typed on Supply is saved to the open transport as a gauge entry
// of the matching cylinder, shown as saved only once the vault has it; a
// correction typed within the minute is saved as a correction of that
// record; a change of cylinder is a cylinder-change event.
func TestSupplySavesToOpenTransport(t *testing.T) {
	s, sess, ctx, e, id := supplyWithLogbook(t, logbook.NewMemStore(), twoE...)
	if s.link.open() == nil || s.link.open().ID != id {
		t.Fatalf("the open transport is not found: %+v", s.link)
	}
	html := rendered(t, s)
	if !strings.Contains(html, "Field A → Field B") || !strings.Contains(html, string(id)) {
		t.Error("the open transport is not named")
	}
	s.edit(ctx, FieldSupplyGauge, "1500")
	s.edit(ctx, FieldSupplyFlow, "10")
	if !strings.Contains(rendered(t, s), `id="supply-log-save"`) {
		t.Fatal("no save button for a valid reading with a transport open")
	}
	s.logReading(ctx)
	if !strings.Contains(rendered(t, s), "Saving to the logbook") {
		t.Error("the reading is not shown as being saved while the vault writes")
	}
	e.ConsumeAll()
	r, _ := s.session.lastReading()
	if r.Log == nil || r.Log.Transport != string(id) {
		t.Fatalf("the reading is not marked saved: %+v (problem %q)", r, s.link.problem)
	}
	if !strings.Contains(s.link.status, "Saved to the logbook") || !strings.Contains(s.link.status, "E1") {
		t.Errorf("status = %q", s.link.status)
	}
	tr := transportOf(t, sess, id)
	if len(tr.Gauges) != 1 || tr.Gauges[0].Value.Cylinder != "E1" {
		t.Fatalf("gauge entries: %+v", tr.Gauges)
	}
	// GNU units: `units -d 15 -t '1500 psi' Pa` → 10342135.9397525.
	if p := tr.Gauges[0].Value.Pressure.Pascals(); math.Abs(p-10342135.9397525) > 1e-3 {
		t.Errorf("saved pressure %v Pa, want 1500 psi", p)
	}
	if !tr.Gauges[0].At.Equal(r.At().Truncate(time.Millisecond)) {
		t.Errorf("saved at %v, want the reading's time %v", tr.Gauges[0].At, r.At())
	}
	if !strings.Contains(rendered(t, s), `id="supply-log-saved"`) {
		t.Error("the saved reading is not shown as saved")
	}

	// A correction within the minute: saved as a correction of the record.
	s.edit(ctx, FieldSupplyGauge, "1450")
	r, _ = s.session.lastReading()
	if r.Log != nil || r.Corrects == nil || r.Corrects.Seq != tr.Gauges[0].Seq {
		t.Fatalf("the corrected reading does not point at the saved record: %+v", r)
	}
	s.logReading(ctx)
	e.ConsumeAll()
	tr = transportOf(t, sess, id)
	if len(tr.Gauges) != 1 || len(tr.Gauges[0].AmendedBy) != 1 {
		t.Fatalf("after the correction: %+v", tr.Gauges)
	}
	if p := tr.Gauges[0].Value.Pressure.Psi(); math.Abs(p-1450) > 1e-9 {
		t.Errorf("corrected pressure %v psi, want 1450", p)
	}

	// A second cylinder, then the change to it.
	s.addCylinder(ctx, noEvent)
	s.pickInUse(ctx, 1)
	e.ConsumeAll()
	tr = transportOf(t, sess, id)
	var changes []string
	for _, ev := range tr.Events {
		if ev.Value.Type == logbook.EventCylinderChange {
			changes = append(changes, ev.Value.Cylinder)
		}
	}
	if len(changes) != 1 || changes[0] != "E2" {
		t.Errorf("cylinder-change events %v, want [E2]", changes)
	}
	if !strings.Contains(s.link.status, "change to cylinder E2") {
		t.Errorf("status = %q", s.link.status)
	}
}

// A write the store refuses is shown as not saved, with the reason, and the
// reading stays on Supply; saving again once there is room works.
func TestSupplyRefusedWriteKeepsReading(t *testing.T) {
	store := &failingStore{Store: logbook.NewMemStore()}
	s, sess, ctx, e, id := supplyWithLogbook(t, store, twoE...)
	s.edit(ctx, FieldSupplyGauge, "1800")
	s.edit(ctx, FieldSupplyFlow, "6")
	store.fail = true
	s.logReading(ctx)
	e.ConsumeAll()
	r, ok := s.session.lastReading()
	if !ok || r.Log != nil || r.Gauge != "1800" {
		t.Fatalf("after a refused write the reading is %+v", r)
	}
	if !strings.Contains(s.link.problem, "Not saved to the logbook") || !strings.Contains(s.link.problem, "storage is full") {
		t.Errorf("problem = %q", s.link.problem)
	}
	html := rendered(t, s)
	if strings.Contains(html, `id="supply-log-saved"`) || !strings.Contains(html, `id="supply-log-problem"`) {
		t.Error("a refused reading is shown as saved, or the refusal is not shown")
	}
	if got := htmlText(html, "supply-minutes-reading"); got == "" {
		t.Error("the countdown went with the refused write")
	}
	store.fail = false
	s.logReading(ctx)
	e.ConsumeAll()
	if r, _ := s.session.lastReading(); r.Log == nil {
		t.Fatalf("the retried reading is not saved (problem %q)", s.link.problem)
	}
	if tr := transportOf(t, sess, id); len(tr.Gauges) != 1 {
		t.Errorf("%d gauge entries after a refusal and a retry, want 1", len(tr.Gauges))
	}
}

// With no transport open, the vault locked, or no Logbook, the reading is
// kept on this tablet and the screen says so; nothing is written.
func TestSupplyWithoutOpenTransport(t *testing.T) {
	s, sess, ctx, e, _ := supplyWithLogbook(t, logbook.NewMemStore())
	s.edit(ctx, FieldSupplyGauge, "1500")
	s.edit(ctx, FieldSupplyFlow, "10")
	html := rendered(t, s)
	if !strings.Contains(html, "Kept on this tablet only; not in a transport record (no transport is open in the Logbook)") {
		t.Errorf("no quiet note without a transport:\n%s", htmlText(html, "supply-log-note"))
	}
	if strings.Contains(html, `id="supply-log-save"`) {
		t.Error("a save button with no transport open")
	}
	s.logReading(ctx)
	e.ConsumeAll()
	if v, _ := sess.Vault(); v != nil {
		l, _ := v.List(context.Background())
		if len(l.Entries) != 0 {
			t.Errorf("%d records written with no transport open", len(l.Entries))
		}
	}

	sess.Lock()
	e.ConsumeAll()
	if got := htmlText(rendered(t, s), "supply-log-note"); !strings.Contains(got, "the Logbook is locked") {
		t.Errorf("locked: note %q", got)
	}

	bare, p, _, _ := mountSupply(t)
	bare.edit(p.ctx, FieldSupplyGauge, "1500")
	if got := htmlText(rendered(t, bare), "supply-log-note"); !strings.Contains(got, "Kept on this tablet only") {
		t.Errorf("no Logbook: note %q", got)
	}
}

// A cylinder that is not the transport's cylinder at the same place (a D
// in the record, an E here) is not given that label: the screen says why.
func TestSupplyCylinderMismatch(t *testing.T) {
	s, sess, ctx, e, id := supplyWithLogbook(t, logbook.NewMemStore(), logbook.CylinderSpec{Label: "D1", Size: "D"})
	s.edit(ctx, FieldSupplyGauge, "1500")
	s.edit(ctx, FieldSupplyFlow, "10")
	s.logReading(ctx)
	e.ConsumeAll()
	if !strings.Contains(s.link.problem, "is not the open transport's cylinder 1") {
		t.Errorf("problem = %q", s.link.problem)
	}
	if tr := transportOf(t, sess, id); len(tr.Gauges) != 0 {
		t.Errorf("a reading was saved to the wrong cylinder: %+v", tr.Gauges)
	}
	// Water capacity: the same capacity matches, another does not.
	tr := &logbook.Transport{Cylinders: []logbook.CylinderSpec{{Label: "W1", WaterCapacity: physio.Litres(10)}}}
	if l, msg := supplyCylinderLabel(tr, []SupplyCylinder{{Kind: "own", WaterCapacity: "10", Gauge: "200", GaugeUnit: UnitBar}}, 0); l != "W1" || msg != "" {
		t.Errorf("10 L = 10 L: %q %q", l, msg)
	}
	if l, _ := supplyCylinderLabel(tr, []SupplyCylinder{{Kind: "own", WaterCapacity: "5", Gauge: "200", GaugeUnit: UnitBar}}, 0); l != "" {
		t.Errorf("5 L mapped onto a 10 L cylinder as %q", l)
	}
}

// "New transport" asks first; keeping changes nothing, clearing empties the
// readings and the fields.
func TestSupplyNewTransportAsksFirst(t *testing.T) {
	s, p, _, _ := mountSupply(t)
	s.edit(p.ctx, FieldSupplyGauge, "2000")
	s.edit(p.ctx, FieldSupplyFlow, "10")
	s.askNewTransport(p.ctx, noEvent)
	html := rendered(t, s)
	if !strings.Contains(html, `id="supply-new-confirm"`) || !strings.Contains(html, `id="supply-new-keep"`) || !strings.Contains(html, `id="supply-new-clear"`) {
		t.Fatal("no question with two answers")
	}
	if len(s.session.Readings) != 1 {
		t.Fatal("the question cleared the readings before an answer")
	}
	s.confirmNew = false // "Keep the readings"
	if strings.Contains(rendered(t, s), `id="supply-new-confirm"`) || len(s.session.Readings) != 1 {
		t.Error("keep did not keep")
	}
	s.askNewTransport(p.ctx, noEvent)
	s.newTransport(p.ctx, noEvent)
	if len(s.session.Readings) != 0 || s.gaugeText != "" || s.flowText != "" || s.confirmNew {
		t.Errorf("after clear: %d readings, gauge %q, flow %q", len(s.session.Readings), s.gaugeText, s.flowText)
	}
}
