package logbook

import (
	"testing"
	"time"

	"alvea/physio"
)

// Latest is the record carrying the latest time once corrections are
// applied (a corrected record at its correction's time, a withdrawn one
// left out), the later record on a tie: what bounds a close (the late-entry
// rule, DEVELOPERS.md). The times are a scenario of our own.
func TestTransportLatest(t *testing.T) {
	v, _ := newTestVault(t)
	t0 := time.Date(2031, 3, 14, 10, 0, 0, 0, time.UTC)
	id := NewTransportID(t0)
	add := func(e *Entry) uint64 {
		t.Helper()
		e.Transport = id
		ie, err := v.Append(ctx, e)
		if err != nil {
			t.Fatal(err)
		}
		return ie.Seq
	}
	latest := func() (uint64, time.Time) {
		t.Helper()
		tr, err := v.Transport(ctx, id)
		if err != nil {
			t.Fatal(err)
		}
		seq, at, ok := tr.Latest()
		if !ok {
			t.Fatal("no latest record")
		}
		return seq, at
	}
	open := add(&Entry{Kind: KindOpen, At: t0, Open: &Opening{Vehicle: "Test van", Origin: Place{Name: "A"}, Destination: Place{Name: "B"}}})
	if seq, at := latest(); seq != open || !at.Equal(t0) {
		t.Fatalf("only the opening: R%d at %v", seq, at)
	}
	gauge := add(&Entry{Kind: KindGauge, At: t0.Add(30 * time.Minute), Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Psi(1500)}})
	note := add(&Entry{Kind: KindNote, At: t0.Add(20 * time.Minute), Note: &Note{Text: "written late"}})
	if seq, _ := latest(); seq != gauge {
		t.Errorf("the reading at 10:30 is not the latest: R%d", seq)
	}
	// The reading corrected to 10:15: the note (10:20) is now the latest.
	add(&Entry{Kind: KindAmend, At: t0.Add(15 * time.Minute), Amends: gauge, Reason: "wrong time", Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Psi(1500)}})
	if seq, at := latest(); seq != note || !at.Equal(t0.Add(20*time.Minute)) {
		t.Errorf("after correcting the reading to 10:15: R%d at %v, want the note R%d", seq, at, note)
	}
	// A second note at the same 10:20: the later record wins the tie.
	tie := add(&Entry{Kind: KindNote, At: t0.Add(20 * time.Minute), Note: &Note{Text: "same minute"}})
	if seq, _ := latest(); seq != tie {
		t.Errorf("on a tie: R%d, want the later record R%d", seq, tie)
	}
	// Both notes withdrawn: the corrected reading (10:15) is the latest.
	for _, s := range []uint64{tie, note} {
		add(&Entry{Kind: KindAmend, At: t0.Add(20 * time.Minute), Amends: s, Reason: "not for this transport", Void: true})
	}
	if seq, at := latest(); seq != gauge || !at.Equal(t0.Add(15*time.Minute)) {
		t.Errorf("with the notes withdrawn: R%d at %v, want the reading R%d at 10:15", seq, at, gauge)
	}
}
