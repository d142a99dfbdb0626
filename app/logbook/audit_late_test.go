package logbook

import (
	"strings"
	"testing"

	"alvea/physio"
)

// Late entries: the crew gives a reading or observation after a later one
// has been saved, so its record number is higher than its time order. The
// audit reads the transport as a course of events, by the time each entry
// carries (Entry.At), never by record number. The scenario is our own; the
// expected values are worked by hand below.
func TestAuditLateEntriesInTimeOrder(t *testing.T) {
	b := newAuditBuilder()
	openWith(b, CylinderSpec{Label: "A", Size: "E"})
	b.gauge(0, "A", physio.Psi(2000))
	b.spo2(0, 96)
	b.add(0, &Entry{Observe: &Observation{FiO2: ptr(physio.Fraction(0.3))}})
	b.spo2(20, 96)
	b.add(40, &Entry{Observe: &Observation{FiO2: ptr(physio.Fraction(0.5))}})
	b.gauge(60, "A", physio.Psi(1000))
	// Written up afterwards, appended after the later ones:
	lateGauge := b.gauge(30, "A", physio.Psi(1500))
	lateSpO2 := b.spo2(10, 88)
	lateFiO2 := b.add(25, &Entry{Observe: &Observation{FiO2: ptr(physio.Fraction(0.4))}})
	a := b.audit(AuditOptions{})

	// In time order the gauge reads 2000, 1500, 1000 psi: no rise. In
	// record order it would read 2000, 1000, 1500 and count a rise.
	if got := a.Oxygen.Cylinders[0].Rises; got != 0 {
		t.Errorf("gauge rises = %d, want 0 (the late reading R%d read in time order)", got, lateGauge)
	}
	// Cylinder factor method, E 0.28 L/psi (common practice):
	// (2000 − 1500) + (1500 − 1000) psi × 0.28 L/psi = 280 L.
	amountIs(t, "A used", a.Oxygen.Cylinders[0].UsedL, "280")
	// Target 94 % from the hand Brief. Sample and hold: 88 % at minute 10
	// holds to the next reading at 20: 10 min below, the run starting at
	// the late reading.
	amountIs(t, "minutes below", a.Course.MinutesBelowTarget, "10")
	if a.Course.LongestBelowRecord != RecordName(lateSpO2) {
		t.Errorf("longest run below target starts at %s, want %s", a.Course.LongestBelowRecord, RecordName(lateSpO2))
	}
	// FiO2 set-up: 0.3 at minute 0, 0.4 at 25 (late), 0.5 at 40.
	var minutes, records []string
	for _, c := range a.Course.SetupChanges {
		minutes, records = append(minutes, c.Minute.String()), append(records, c.Record)
	}
	if got, want := strings.Join(minutes, " "), "0 25 40"; got != want {
		t.Errorf("set-up changes at minutes %s, want %s (records %v)", got, want, records)
	}
	if len(records) == 3 && records[1] != RecordName(lateFiO2) {
		t.Errorf("the change at minute 25 is %s, want the late %s", records[1], RecordName(lateFiO2))
	}
	// The Review's plot series are in time order too.
	var fio2 []string
	for _, p := range a.Timeline.FiO2 {
		fio2 = append(fio2, p.Minute.String()+"="+p.Value.String())
	}
	if got, want := strings.Join(fio2, " "), "0=0.3 25=0.4 40=0.5"; got != want {
		t.Errorf("plot FiO2 series %s, want %s", got, want)
	}
	var spo2 []string
	for _, p := range a.Timeline.SpO2Percent {
		spo2 = append(spo2, p.Minute.String())
	}
	if got, want := strings.Join(spo2, " "), "0 10 20"; got != want {
		t.Errorf("plot SpO2 minutes %s, want %s", got, want)
	}
}
