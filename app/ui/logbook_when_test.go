package ui

import (
	"context"
	"strings"
	"testing"
	"time"
	_ "time/tzdata" // the zone database for the summer-time case below, on any machine

	"alvea/app/logbook"
)

// The late-entry rule (DEVELOPERS.md, Logbook): a clock time typed hh:mm
// resolves to the latest moment at or before now with that clock time; a
// malformed time, one more than 24 h ago and one before the opening are
// refused. The times are a scenario of our own; the expected moments follow
// from the rule by hand.
func TestLbEntryTime(t *testing.T) {
	loc := time.Local
	now := time.Date(2031, 3, 15, 0, 10, 30, 0, loc)
	opened := time.Date(2031, 3, 14, 23, 0, 0, 0, loc)
	for _, c := range []struct {
		text   string
		opened time.Time
		want   time.Time
	}{
		{"23:50", opened, time.Date(2031, 3, 14, 23, 50, 0, 0, loc)},     // typed at 00:10: yesterday
		{"00:10", opened, time.Date(2031, 3, 15, 0, 10, 0, 0, loc)},      // this minute: today
		{"0:05", opened, time.Date(2031, 3, 15, 0, 5, 0, 0, loc)},        // one-digit hour
		{" 23:00 ", opened, opened},                                      // the opening's own moment
		{"00:11", time.Time{}, time.Date(2031, 3, 14, 0, 11, 0, 0, loc)}, // one minute later than now: a day back (23 h 59 min)
	} {
		got, given, err := lbEntryTime("Time of the entry", c.text, now, c.opened)
		if err != nil || !given || !got.Equal(c.want) {
			t.Errorf("%q at %v: got %v, %v, %v; want %v", c.text, now, got, given, err, c.want)
		}
	}
	if got, given, err := lbEntryTime("Time of the entry", "  ", now, opened); err != nil || given || !got.IsZero() {
		t.Errorf("blank: got %v, %v, %v; want now (zero, not given)", got, given, err)
	}

	for _, bad := range []string{"25:00", "24:00", "12:60", "1230", "12:3", "ab:cd", "12:30:00", "-1:30", "12.30", "１２:３０"} {
		_, _, err := lbEntryTime("Time of the entry", bad, now, opened)
		if err == nil {
			t.Errorf("%q accepted", bad)
			continue
		}
		for _, want := range []string{"Time of the entry", "hh:mm", "00:00 to 23:59", "blank for now"} {
			if !strings.Contains(err.Error(), want) {
				t.Errorf("%q: message %q lacks %q", bad, err, want)
			}
		}
	}

	// 22:30 typed at 00:10 is yesterday 22:30, before the 23:00 opening.
	_, _, err := lbEntryTime("Time of the entry", "22:30", now, opened)
	if err == nil || !strings.Contains(err.Error(), "before the transport opened") || !strings.Contains(err.Error(), "2031-03-14 23:00:00") {
		t.Errorf("a time before the opening: %v", err)
	}
}

// On the night summer time ends the day has 25 hours, so yesterday's clock
// time can be more than 24 h back: refused. In the EU summer time ends on
// the last Sunday of October at 01:00 UTC (Directive 2000/84/EC, art. 2 and
// 3): 26 October 2031.
func TestLbEntryTimeMoreThanADay(t *testing.T) {
	berlin, err := time.LoadLocation("Europe/Berlin")
	if err != nil {
		t.Fatal(err)
	}
	now := time.Date(2031, 10, 26, 12, 0, 0, 0, berlin) // 11:00 UTC
	// 12:30 resolves to 25 October 12:30 CEST = 10:30 UTC, 24 h 30 min ago.
	_, _, err = lbEntryTime("Time of the entry", "12:30", now, time.Time{})
	if err == nil || !strings.Contains(err.Error(), "more than 24 h ago") || !strings.Contains(err.Error(), "hh:mm") {
		t.Errorf("a time 24 h 30 min back: %v", err)
	}
	// 11:30 is today, 30 min ago (the same day, after the change).
	got, _, err := lbEntryTime("Time of the entry", "11:30", now, time.Time{})
	if err != nil || now.Sub(got) != 30*time.Minute {
		t.Errorf("11:30 at 12:00: %v, %v", got, err)
	}
}

// The day summer time begins (EU: last Sunday of March at 01:00 UTC,
// Directive 2000/84/EC art. 2: 30 March 2031) the Berlin clock goes from
// 02:00 to 03:00, so 02:30 never happens that day: refused, not moved.
func TestLbEntryTimeSkippedByTheClock(t *testing.T) {
	berlin, err := time.LoadLocation("Europe/Berlin")
	if err != nil {
		t.Fatal(err)
	}
	now := time.Date(2031, 3, 30, 4, 0, 0, 0, berlin)
	_, _, err = lbEntryTime("Time of the entry", "02:30", now, time.Time{})
	if err == nil || !strings.Contains(err.Error(), "did not occur on 2031-03-30") || !strings.Contains(err.Error(), "hh:mm") {
		t.Errorf("02:30 on the day the clock skips it: %v", err)
	}
	// 01:30 happened (CET), 2 h 30 min of clock time but 1 h 30 min ago.
	got, _, err := lbEntryTime("Time of the entry", "01:30", now, time.Time{})
	if err != nil || now.Sub(got) != 90*time.Minute {
		t.Errorf("01:30 at 04:00 that day: %v (%v ago), %v", got, now.Sub(got), err)
	}
}

func TestLbLateText(t *testing.T) {
	at := time.Date(2031, 3, 14, 10, 2, 0, 0, time.Local)
	if s := lbLateText(at, at.Add(lbLateMark)); s != "" {
		t.Errorf("written %v after: %q, want no mark", lbLateMark, s)
	}
	if s := lbLateText(at, time.Time{}); s != "" {
		t.Errorf("no written time: %q", s)
	}
	if s := lbLateText(at, at.Add(10*time.Minute)); s != "entered 10:12" {
		t.Errorf("written 10 min after: %q, want \"entered 10:12\"", s)
	}
}

// A lift-off tapped at 10:12 with 10:02 in the time control is saved for
// 10:02, written 10:12; the control goes back to blank; the timeline shows
// it in time order, before an observation saved earlier for 10:05, with
// the "entered" mark; a malformed time saves nothing.
func TestLogbookLateEntry(t *testing.T) {
	store := logbook.NewMemStore()
	s := testSession(store)
	clock := time.Date(2031, 3, 14, 10, 0, 0, 0, time.Local)
	s.now = func() time.Time { return clock }
	s.SetIdle(0)
	l, e := mountLogbook(t, s)
	openTestTransport(t, l, e)
	r := &l.record

	clock = clock.Add(5 * time.Minute) // 10:05
	r.obs = lbObsForm{spo2: "95"}
	l.saveObs(l.mctx, noEvent)
	e.ConsumeAll()

	clock = clock.Add(7 * time.Minute) // 10:12
	r.atText = "10:2"
	l.tapEvent(l.mctx, logbook.EventLiftOff, "Lift-off")
	e.ConsumeAll()
	if !strings.Contains(l.problem, "Time of the entry") || !strings.Contains(l.problem, "Nothing was saved") || r.atMsg == "" {
		t.Errorf("a malformed time: problem %q, field message %q", l.problem, r.atMsg)
	}
	if n := len(r.transport.History); n != 2 {
		t.Fatalf("a malformed time saved something: %d records", n)
	}

	r.atText = "10:02"
	l.problem = ""
	l.tapEvent(l.mctx, logbook.EventLiftOff, "Lift-off")
	e.ConsumeAll()
	if l.problem != "" {
		t.Fatalf("late lift-off refused: %s", l.problem)
	}
	if r.atText != "" || r.atMsg != "" {
		t.Errorf("the time control is %q after saving, want blank (now)", r.atText)
	}
	if !strings.Contains(l.status, "for 10:02") {
		t.Errorf("status %q does not name the time given", l.status)
	}
	v, _ := s.Vault()
	tr, err := v.Transport(context.Background(), r.id)
	if err != nil {
		t.Fatal(err)
	}
	lift := tr.History[len(tr.History)-1]
	if want := time.Date(2031, 3, 14, 10, 2, 0, 0, time.Local); !lift.At.Equal(want) || lift.Event == nil || lift.Event.Type != logbook.EventLiftOff {
		t.Errorf("saved %+v at %v, want lift-off at %v", lift.Event, lift.At, want)
	}
	if !lift.Written.Equal(clock) {
		t.Errorf("written %v, want %v", lift.Written, clock)
	}

	page := lbHTML(l)
	li := strings.Index(page, `data-seq="3"`)
	ob := strings.Index(page, `data-seq="2"`)
	if li < 0 || ob < 0 || li > ob {
		t.Errorf("the late lift-off (R3, 10:02) is not before the observation (R2, 10:05) in the timeline")
	}
	if strings.Count(page, "entered 10:12") != 1 {
		t.Errorf("the timeline does not mark the late entry once with \"entered 10:12\"")
	}

	// The next tap is timed now: no mark, At = the clock.
	clock = clock.Add(time.Minute)
	l.tapEvent(l.mctx, logbook.EventLanding, "Landing")
	e.ConsumeAll()
	tr, _ = v.Transport(context.Background(), r.id)
	if land := tr.History[len(tr.History)-1]; !land.At.Equal(clock) {
		t.Errorf("the tap after a late entry is timed %v, want now %v", land.At, clock)
	}
	if strings.Count(lbHTML(l), "lb-flag-late") != 1 {
		t.Error("an entry timed now is marked as entered late")
	}
}

// The start form's "Opened at" follows the same rule: a malformed time is
// refused in its field and no transport is started; a good one times the
// opening.
func TestLogbookStartOpenedAt(t *testing.T) {
	s := testSession(logbook.NewMemStore())
	clock := time.Date(2031, 3, 14, 10, 0, 0, 0, time.Local)
	s.now = func() time.Time { return clock }
	l, e := mountLogbook(t, s)
	l.access = accessForm{pass: uiTestPass, again: uiTestPass}
	l.create(l.mctx, noEvent)
	e.ConsumeAll()
	l.view = viewStart
	l.start = lbStartFormFor("Rotor wing", "Mesa clinic", "Bay hospital")
	l.start.at = "9h45"
	l.startTransport(l.mctx, noEvent)
	e.ConsumeAll()
	if !strings.Contains(l.start.atMsg, "Opened at") || !strings.Contains(l.start.atMsg, "hh:mm") || l.view != viewStart {
		t.Fatalf("a malformed opening time: message %q, view %q", l.start.atMsg, l.view)
	}
	l.start.at = "9:45"
	l.startTransport(l.mctx, noEvent)
	e.ConsumeAll()
	if l.view != viewRecord || l.record.transport == nil {
		t.Fatalf("start with 9:45: view %q, problem %q", l.view, l.problem)
	}
	if want := time.Date(2031, 3, 14, 9, 45, 0, 0, time.Local); !l.record.transport.Opened.Equal(want) {
		t.Errorf("opened %v, want %v", l.record.transport.Opened, want)
	}
	// An entry before that opening is refused.
	l.record.atText = "09:40"
	l.tapEvent(l.mctx, logbook.EventDepart, "Depart")
	e.ConsumeAll()
	if !strings.Contains(l.problem, "before the transport opened") || len(l.record.transport.History) != 1 {
		t.Errorf("an entry before the opening: problem %q, %d records", l.problem, len(l.record.transport.History))
	}
}

// Whatever is typed into a time control, lbEntryTime never panics, and a
// time it accepts is at or before now, at most 24 h back, not before the
// opening, on the whole minute, and shows on the clock as what was typed
// (hh:mm, a leading zero optional). Blank is now. Refusals name the field.
// Zones: a fixed one, and one with summer time when the system has it.
func FuzzLbEntryTime(f *testing.F) {
	zones := []*time.Location{time.FixedZone("UTC+05:45", 5*3600+45*60)}
	if z, err := time.LoadLocation("Europe/Berlin"); err == nil {
		zones = append(zones, z)
	}
	base := time.Date(2031, 3, 30, 0, 0, 0, 0, time.UTC).Unix() // a day summer time begins in Europe
	f.Add("02:30", int64(3*3600), int64(0), uint8(1))
	f.Add("23:50", int64(600), int64(3600), uint8(0))
	f.Add(" 9:05 ", int64(86400), int64(-86400), uint8(1))
	f.Add("24:00", int64(0), int64(0), uint8(0))
	f.Add("", int64(0), int64(0), uint8(0))
	f.Fuzz(func(t *testing.T, text string, nowOff, openedOff int64, zone uint8) {
		loc := zones[int(zone)%len(zones)]
		now := time.Unix(base+nowOff%(400*86400), 0).In(loc)
		var opened time.Time
		if openedOff != 0 {
			opened = now.Add(-time.Duration(openedOff%(3*86400)) * time.Second)
		}
		at, given, err := lbEntryTime("Time of the entry", text, now, opened)
		if err != nil {
			if given || !strings.HasPrefix(err.Error(), "Time of the entry: ") {
				t.Fatalf("%q: refused with given=%v, %q", text, given, err)
			}
			return
		}
		if !given {
			if strings.TrimSpace(text) != "" {
				t.Fatalf("%q: taken as blank", text)
			}
			return
		}
		h, m, ok := lbParseClock(strings.TrimSpace(text))
		switch {
		case !ok:
			t.Fatalf("%q: accepted though not a clock time", text)
		case at.After(now) || now.Sub(at) > lbLookBack:
			t.Fatalf("%q at %v: %v is not within the last 24 h", text, now, at)
		case !opened.IsZero() && at.Before(opened):
			t.Fatalf("%q: %v is before the opening %v", text, at, opened)
		case at.Second() != 0 || at.Nanosecond() != 0:
			t.Fatalf("%q: %v is not on the minute", text, at)
		}
		if local := at.In(loc); local.Hour() != h || local.Minute() != m {
			t.Fatalf("%q: resolved to %v, which the clock shows otherwise", text, local)
		}
	})
}
