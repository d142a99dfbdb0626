package ui

import (
	"context"
	"fmt"
	"strconv"
	"strings"
	"time"

	"alvea/app/logbook"
)

// Late entries. A crew busy with the patient taps "Lift-off" ten minutes
// late, or writes a reading up afterwards: the time control lets them give
// when it happened as a clock time. The record keeps both times (Entry.At as
// given, Entry.Written by the vault), and the timeline shows the second
// beside the first when they differ by more than lbLateMark.

// lbLateMark is how far an entry's record may be written after the time it
// carries before the timeline marks it "entered HH:MM". An entry timed now is
// written within seconds of its tap (the store's write, a short wait while
// the logbook is busy), and a clock time typed to the minute can be up to
// 59 s earlier than the moment it was meant for; three minutes clears both,
// so the mark never appears on an entry timed now, yet it shows a time given
// a few minutes back, which an auditor reading the timeline needs to see.
const lbLateMark = 3 * time.Minute

// lbLookBack is how far back a typed time may reach: a clock time names a
// moment only within one day.
const lbLookBack = 24 * time.Hour

// lbEntryTime resolves the time control's text for an entry saved at now.
// Blank gives (zero, false, nil): the entry is timed now. Otherwise text is
// a 24-hour clock time "hh:mm" (local time of the tablet, as now's
// location), resolved to the latest moment at or before now with that clock
// time: 23:50 typed at 00:10 is yesterday 23:50. Refused, with a sentence
// naming field, the allowed range and the format: text that is not hh:mm
// from 00:00 to 23:59; a clock time the day skipped (summer time began);
// a time more than 24 h before now (only across the day summer time
// ends); a time before opened (the transport's opening entry; zero: no
// such bound).
func lbEntryTime(field, text string, now, opened time.Time) (time.Time, bool, error) {
	text = strings.TrimSpace(text)
	if text == "" {
		return time.Time{}, false, nil
	}
	hour, minute, ok := lbParseClock(text)
	if !ok {
		return time.Time{}, false, fmt.Errorf("%s: %q is not a clock time. Type hh:mm in 24-hour time, 00:00 to 23:59 (for example 09:05), or leave it blank for now.", field, text)
	}
	y, mo, d := now.Date()
	at := time.Date(y, mo, d, hour, minute, 0, 0, now.Location())
	if at.After(now) {
		at = time.Date(y, mo, d-1, hour, minute, 0, 0, now.Location())
	}
	if at.Hour() != hour || at.Minute() != minute {
		// The clock skipped this time (summer time began): no moment has it.
		return time.Time{}, false, fmt.Errorf("%s: %s did not occur on %s (the clock skipped it when summer time began). Give a time within the last 24 hours as hh:mm (24-hour), or leave it blank for now.", field, text, at.Format("2006-01-02"))
	}
	if now.Sub(at) > lbLookBack {
		return time.Time{}, false, fmt.Errorf("%s: %s would be %s, more than 24 h ago. Give a time within the last 24 hours as hh:mm (24-hour), or leave it blank for now.", field, text, lbDayMinute(at))
	}
	if err := lbBeforeOpening(field, text, at, opened); err != nil {
		return time.Time{}, false, err
	}
	return at, true, nil
}

// lbBeforeOpening refuses a time at (typed as text in the control named
// field) before the transport opened (zero opened: no bound).
func lbBeforeOpening(field, text string, at, opened time.Time) error {
	if opened.IsZero() || !at.Before(opened) {
		return nil
	}
	return fmt.Errorf("%s: %s (%s) is before the transport opened (%s). Give a time from the opening to now as hh:mm (24-hour), or leave it blank for now.", field, text, lbDayMinute(at), lbDayMinute(opened)+":"+opened.Local().Format("05"))
}

// lbParseClock reads "h:mm" or "hh:mm", hours 0–23, minutes 00–59.
func lbParseClock(text string) (hour, minute int, ok bool) {
	hs, ms, found := strings.Cut(text, ":")
	if !found || len(hs) < 1 || len(hs) > 2 || len(ms) != 2 {
		return 0, 0, false
	}
	for _, c := range hs + ms {
		if c < '0' || c > '9' {
			return 0, 0, false
		}
	}
	hour, _ = strconv.Atoi(hs)
	minute, _ = strconv.Atoi(ms)
	if hour > 23 || minute > 59 {
		return 0, 0, false
	}
	return hour, minute, true
}

// lbClockMinute is a time as the crew types it: hh:mm, local time.
func lbClockMinute(t time.Time) string { return t.Local().Format("15:04") }

// lbDayMinute names the day too, for refusals that cross midnight.
func lbDayMinute(t time.Time) string { return t.Local().Format("2006-01-02 15:04") }

// lbLateText is the timeline's mark for an entry written more than
// lbLateMark after the time it carries ("" for one timed as it happened).
func lbLateText(at, written time.Time) string {
	if written.IsZero() || written.Sub(at) <= lbLateMark {
		return ""
	}
	return "entered " + lbClockMinute(written)
}

// now is the screen's clock: the session's (a test's fixed clock, shared
// with the vault) or the tablet's.
func (l *logbookScreen) now() time.Time {
	if s := l.session; s != nil {
		s.mu.Lock()
		now := s.now
		s.mu.Unlock()
		if now != nil {
			return now()
		}
	}
	return time.Now()
}

// lbAtField names the Logbook's time control in its refusals.
const lbAtField = "Time of the entry"

// lbRefusal is an entry refused by the log's own rules (its time, a
// closed transport) in the work that saves it, told apart from a refusal
// by the store: nothing was written and the entry is not "not saved" in
// the store's sense, it needs the crew's change. ofTime: the time given
// is the reason, shown beside the time control.
type lbRefusal struct {
	text   string
	ofTime bool
}

func (r *lbRefusal) Error() string { return r.text }

// lbCloseRefusal returns why a close timed at (given: typed in the time
// control named field; otherwise the tablet's clock) cannot close t, or
// "". A close is the transport's last entry: at must not be before the
// latest entry t holds (Transport.Latest), so that the timeline, ordered by
// time, ends with it and the audit's "after the close" means what it says.
func lbCloseRefusal(field string, at time.Time, given bool, t *logbook.Transport) string {
	seq, latest, ok := t.Latest()
	if !ok || !at.Before(latest) {
		return ""
	}
	bound := lbDayMinute(latest) + ":" + latest.Local().Format("05")
	if !given {
		return fmt.Sprintf("%s: the tablet's clock reads %s, before %s, the latest entry of this transport (%s). A close comes after every entry: check the tablet's clock, or give the close's time as hh:mm (24-hour), from %s to now.", field, lbDayMinute(at), logbook.RecordName(seq), bound, lbClockMinute(latest.Add(time.Minute-1)))
	}
	return fmt.Sprintf("%s: a close at %s (%s) would come before %s, the latest entry of this transport (%s). A close comes after every entry: give a time from %s to now as hh:mm (24-hour), or leave it blank for now.", field, lbClockMinute(at), lbDayMinute(at), logbook.RecordName(seq), bound, lbClockMinute(latest.Add(time.Minute-1)))
}

// lbClosedRefusal says why t, closed, takes no new entry.
func lbClosedRefusal(t *logbook.Transport) string {
	return "This transport was closed at " + lbDayMinute(t.Closed) + ": it takes no new entry. A correction of one of its records is still possible (Correct, in the Logbook's timeline) and is flagged as made after the close."
}

// lbCloseCheckStored reads e's transport as the vault holds it and refuses
// (*lbRefusal) a new entry when it is closed, and a close timed before its
// latest entry (lbCloseRefusal). Corrections pass: they are allowed after
// the close, which the timeline and the audit flag.
func lbCloseCheckStored(c context.Context, s *vaultSession, field string, e *logbook.Entry, given bool) error {
	if e.Kind == logbook.KindAmend {
		return nil
	}
	v, err := s.Vault()
	if err != nil {
		return err
	}
	t, err := v.Transport(c, e.Transport)
	if err != nil {
		return err
	}
	if !t.Closed.IsZero() {
		return &lbRefusal{text: lbClosedRefusal(t)}
	}
	if e.Kind == logbook.KindClose {
		if msg := lbCloseRefusal(field, e.At, given, t); msg != "" {
			return &lbRefusal{text: msg, ofTime: true}
		}
	}
	return nil
}
