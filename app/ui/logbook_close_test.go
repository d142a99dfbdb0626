package ui

import (
	"context"
	"strings"
	"testing"
	"time"

	"alvea/app/logbook"
	"alvea/physio"
)

// closeTestTransport opens a transport at 10:00:00 on a stopped clock and
// saves a landing at 10:20:37 (R2), as a scenario of our own; it returns
// the screen, its engine, the session and a setter of the clock.
func closeTestTransport(t *testing.T) (*logbookScreen, *vaultSession, func(hh, mm, ss int), func()) {
	t.Helper()
	s := testSession(logbook.NewMemStore())
	clock := time.Date(2031, 3, 14, 10, 0, 0, 0, time.Local)
	s.now = func() time.Time { return clock }
	s.SetIdle(0)
	l, e := mountLogbook(t, s)
	openTestTransport(t, l, e)
	set := func(hh, mm, ss int) { clock = time.Date(2031, 3, 14, hh, mm, ss, 0, time.Local) }
	set(10, 20, 37)
	l.tapEvent(l.mctx, logbook.EventLanding, "Landing")
	e.ConsumeAll()
	if n := len(l.record.transport.History); n != 2 || l.problem != "" {
		t.Fatalf("the landing: %d records, problem %q", n, l.problem)
	}
	return l, s, set, e.ConsumeAll
}

// A close is the transport's last entry (the late-entry rule, DEVELOPERS.md:
// the timeline is a course of events ordered by the times entries carry).
// A close typed for 10:00, or for 10:20, with a landing already recorded at
// 10:20:37 is refused: the sentence names the field, the landing's record
// and time as the lower bound and the hh:mm format; the outcome and the
// time stay typed; nothing is saved. 10:21, the first clock minute after
// the landing, closes it. The times are our own scenario; the bounds follow
// from the rule by hand.
func TestLogbookCloseBeforeLatestEntry(t *testing.T) {
	l, s, set, consume := closeTestTransport(t)
	r := &l.record
	set(10, 30, 0)
	for _, typed := range []string{"10:00", "10:20"} {
		r.outcome, r.atText = "handed over", typed
		l.problem = ""
		l.saveClose(l.mctx, noEvent)
		consume()
		for _, want := range []string{"Time of the entry", "close at " + typed, "R2", "2031-03-14 10:20:37", "from 10:21 to now", "hh:mm", "Nothing was saved"} {
			if !strings.Contains(l.problem, want) {
				t.Errorf("a close at %s: the refusal %q lacks %q", typed, l.problem, want)
			}
		}
		if r.atMsg == "" || r.atText != typed || r.outcome != "handed over" {
			t.Errorf("a close at %s refused: time field %q (message %q), outcome %q; want both kept and the reason by the time", typed, r.atText, r.atMsg, r.outcome)
		}
		if tr := transportOf(t, s, r.id); len(tr.History) != 2 || !tr.Closed.IsZero() {
			t.Fatalf("a close at %s before the landing: the vault holds %d records, closed %v", typed, len(tr.History), tr.Closed)
		}
		if page := lbHTML(l); !strings.Contains(page, `id="lb-close"`) || !strings.Contains(page, `id="lb-at-msg"`) {
			t.Errorf("a close at %s refused: the close form or the time's message is gone", typed)
		}
	}

	r.atText = "10:21"
	l.problem = ""
	l.saveClose(l.mctx, noEvent)
	consume()
	tr := transportOf(t, s, r.id)
	if want := time.Date(2031, 3, 14, 10, 21, 0, 0, time.Local); l.problem != "" || !tr.Closed.Equal(want) {
		t.Fatalf("a close at 10:21: closed %v (want %v), problem %q", tr.Closed, want, l.problem)
	}
	if r.atText != "" || r.outcome != "" || r.atMsg != "" {
		t.Errorf("after the close the time control holds %q (message %q), the outcome %q; want both blank", r.atText, r.atMsg, r.outcome)
	}

	// After the close: a new entry is refused, whatever way it comes (the
	// forms are gone; this is the screen's own guard), the note kept; a
	// correction is still saved, flagged as after the close.
	r.noteText = "a note after the close"
	l.saveNote(l.mctx, noEvent)
	consume()
	if !strings.Contains(l.problem, "closed at 2031-03-14 10:21") || !strings.Contains(l.problem, "takes no new entry") || r.noteText != "a note after the close" {
		t.Errorf("a note after the close: problem %q, note field %q", l.problem, r.noteText)
	}
	if n := len(transportOf(t, s, r.id).History); n != 3 {
		t.Errorf("a note after the close was saved: %d records", n)
	}
	r.amendSeq, r.amendReason, r.amendVoid = 2, "landing tapped by mistake", true
	l.problem = ""
	l.saveAmend(l.mctx, noEvent)
	consume()
	tr = transportOf(t, s, r.id)
	if l.problem != "" || len(tr.Amendments) != 1 || !tr.Amendments[0].AfterClose {
		t.Errorf("a correction after the close: problem %q, amendments %+v; want one, flagged after the close", l.problem, tr.Amendments)
	}
}

// The bound is the latest entry as the timeline reads the transport: a
// withdrawn record does not count; one saved from elsewhere (the Supply
// screen) after this screen read the transport does, checked against the
// vault at the moment of saving; and a close timed now on a clock set
// before the latest entry is refused with a word about the clock.
func TestLogbookCloseBoundIsTheLatestEntry(t *testing.T) {
	l, s, set, consume := closeTestTransport(t)
	r := &l.record
	set(10, 30, 0)

	// A gauge reading written by another screen for 10:25 (the Supply
	// screen appends through the same session).
	p := physio.Psi(1500)
	if _, err := s.Append(context.Background(), &logbook.Entry{Transport: r.id, Kind: logbook.KindGauge,
		At: time.Date(2031, 3, 14, 10, 25, 0, 0, time.Local), Gauge: &logbook.GaugeReading{Cylinder: "E1", Pressure: p}}); err != nil {
		t.Fatal(err)
	}
	if len(r.transport.History) != 2 {
		t.Fatalf("the screen already shows the reading saved elsewhere; the test needs it unseen")
	}
	r.atText = "10:22"
	l.saveClose(l.mctx, noEvent)
	consume()
	if !strings.Contains(l.problem, "R3") || !strings.Contains(l.problem, "10:25:00") || r.atMsg == "" || r.atText != "10:22" {
		t.Errorf("a close at 10:22 with a reading at 10:25 saved elsewhere: problem %q, field %q (%q)", l.problem, r.atText, r.atMsg)
	}
	if tr := transportOf(t, s, r.id); !tr.Closed.IsZero() || len(tr.History) != 3 {
		t.Fatalf("the close at 10:22 was saved: %d records, closed %v", len(tr.History), tr.Closed)
	}

	// Withdraw the reading (R3) and the landing (R2): the bound falls back
	// to the opening, 10:00:00, and a close at 10:10 goes in.
	l.loadTransport(l.mctx)
	consume()
	for _, seq := range []uint64{3, 2} {
		r.amendSeq, r.amendReason, r.amendVoid = seq, "not for this transport", true
		l.saveAmend(l.mctx, noEvent)
		consume()
	}
	if _, at, _ := r.transport.Latest(); !at.Equal(time.Date(2031, 3, 14, 10, 0, 0, 0, time.Local)) {
		t.Fatalf("latest entry after withdrawing R2 and R3: %v, want the opening 10:00:00", at)
	}

	// The tablet's clock set back before the opening: a close timed now
	// is refused, the sentence says to check the clock.
	set(9, 50, 0)
	r.atText, l.problem = "", ""
	l.saveClose(l.mctx, noEvent)
	consume()
	if !strings.Contains(l.problem, "clock reads 2031-03-14 09:50") || !strings.Contains(l.problem, "check the tablet's clock") || !strings.Contains(l.problem, "R1") {
		t.Errorf("a close timed now on a clock before the opening: %q", l.problem)
	}

	set(10, 30, 0)
	r.atText, l.problem = "10:10", ""
	l.saveClose(l.mctx, noEvent)
	consume()
	if tr := transportOf(t, s, r.id); l.problem != "" || !tr.Closed.Equal(time.Date(2031, 3, 14, 10, 10, 0, 0, time.Local)) {
		t.Errorf("a close at 10:10 after the later entries were withdrawn: problem %q, closed %v", l.problem, tr.Closed)
	}
}
