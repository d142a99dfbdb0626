package ui

import (
	"context"
	"errors"
	"fmt"
	"math"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
)

// The Supply screen's link to the Logbook. While the vault is unlocked and
// a transport is open (not closed) in it, a gauge reading typed on Supply
// can be saved to that transport as a gauge entry — built by the Logbook's
// own lbGaugeEntry, with the cylinder mapped to the transport's cylinder of
// the same place in the list and of the same kind — and a change of the
// cylinder in use is saved as a cylinder-change event. An entry is shown
// as saved only once the vault's Append returned (for IndexedDB: its
// transaction completed); a refused write says why and the reading stays
// on Supply. With the vault locked, absent, or no transport open, the
// readings are kept on this tablet only, and the screen says so.
//
// When several transports are open, the one opened last is used; the
// screen names it.
//
// A reading is saved timed when its gauge was read (SupplyReading.At: the
// reading's own Read at, resolved by the Logbook's rule, lbEntryTime; blank,
// when it was typed here), so that the countdown and the record agree; a
// time given is a late entry, marked so in the Logbook's timeline. A
// change of cylinder is saved timed as the new cylinder's first reading.
// The card has no time control of its own. A cylinder change the logbook
// did not take (its Read at refused, the logbook busy, a full disk) stays
// offered with a button until saved: picking the same cylinder again
// cannot repeat it.

// SupplyLogMark records where a reading was saved in the Logbook: the
// transport and the record number. It holds no value of the reading.
type SupplyLogMark struct {
	Transport string `json:"transport"`
	Seq       uint64 `json:"seq"`
}

// supplyLink is what the Supply screen knows of the Logbook.
type supplyLink struct {
	phase     vaultPhase
	transport *logbook.Transport // the open transport; nil when none
	gen       int                // bumped by every refresh; an older answer is dropped
	busy      string             // what is being saved; "" when idle
	status    string             // the last saved entry (role=status)
	problem   string             // the last refusal (role=alert)

	change supplyChange // a cylinder change not yet in the logbook
}

// supplyChange is a change of the cylinder in use that the logbook has not
// taken yet (zero: none).
type supplyChange struct {
	transport logbook.TransportID // the open transport when it was made
	cylinder  int                 // index in the Supply list
	at        time.Time           // when it was made: its first reading's time; zero until that has one
	given     bool                // at was given as Read at (a late entry)
}

// sameShown reports whether l and m draw the same (the refresh count
// aside).
func (l supplyLink) sameShown(m supplyLink) bool {
	l.gen = m.gen
	return l == m
}

// open returns the open transport when the vault is unlocked.
func (l *supplyLink) open() *logbook.Transport {
	if l.phase != phaseUnlocked {
		return nil
	}
	return l.transport
}

// watchLogbook follows the vault session: every change of phase or content
// reads the open transport again.
func (s *supply) watchLogbook(ctx app.Context) {
	if s.vault == nil {
		return
	}
	s.unsub = s.vault.Subscribe(func() {
		ctx.Dispatch(func(ctx app.Context) { s.refreshLogbook(ctx) })
	})
	s.refreshLogbook(ctx)
}

// refreshLogbook reads the phase and, when unlocked, the open transport.
func (s *supply) refreshLogbook(ctx app.Context) {
	if s.vault == nil {
		return
	}
	phase, _ := s.vault.Phase()
	s.link.gen++
	gen := s.link.gen
	if phase == phaseUnknown {
		// Nobody opened the store yet (the Logbook was not visited):
		// open it once; the session then reports its phase to us.
		ctx.Async(func() { s.vault.Load(context.Background()) })
	}
	if phase != phaseUnlocked {
		s.link.phase, s.link.transport = phase, nil
		return
	}
	ctx.Async(func() {
		tr, err := s.openTransport(context.Background())
		ctx.Dispatch(func(ctx app.Context) {
			if gen != s.link.gen {
				return
			}
			s.link.phase = phaseUnlocked
			s.link.transport = tr
			if err != nil {
				s.link.phase, _ = s.vault.Phase()
				s.link.transport = nil
			}
		})
	})
}

// openTransport finds the transport opened last that is not closed, and
// reads it.
func (s *supply) openTransport(c context.Context) (*logbook.Transport, error) {
	v, err := s.vault.Vault()
	if err != nil {
		return nil, err
	}
	list, err := v.List(c)
	if err != nil {
		return nil, err
	}
	open := list.Filter(logbook.Filter{OpenOnly: true}) // newest first
	if len(open) == 0 {
		return nil, nil
	}
	return v.Transport(c, open[0].ID)
}

// supplyCylinderLabel maps cylinder i of the Supply list onto the open
// transport's cylinders: the one at the same place in the list, which must
// be of the same kind (both lists come from the Brief's supply lines,
// expanded by count, in the same order). Otherwise it says why.
func supplyCylinderLabel(t *logbook.Transport, cyls []SupplyCylinder, i int) (string, string) {
	if i < 0 || i >= len(cyls) {
		return "", "Choose the cylinder in use."
	}
	if len(t.Cylinders) == 0 {
		return "", "The open transport lists no cylinders, so this reading cannot be given to one."
	}
	if i >= len(t.Cylinders) {
		return "", fmt.Sprintf("Cylinder %d here has no match in the open transport, which lists %d cylinder(s): %s.", i+1, len(t.Cylinders), lbCylindersText(t.Cylinders))
	}
	tc := t.Cylinders[i]
	mine, err1 := cyls[i].physioCylinder()
	theirs, err2 := tc.Physio()
	same := err1 == nil && err2 == nil && mine.Size == theirs.Size &&
		math.Abs(mine.WaterCapacity.Litres()-theirs.WaterCapacity.Litres()) < 1e-9 &&
		mine.NominalContents == theirs.NominalContents
	if !same {
		return "", fmt.Sprintf("Cylinder %d here (%s) is not the open transport's cylinder %d (%s): the cylinders changed after the transport started.",
			i+1, cyls[i].Kind, i+1, lbCylindersText([]logbook.CylinderSpec{tc}))
	}
	return tc.Label, ""
}

// logReading saves the last reading to the open transport: a gauge entry,
// or, for a reading that corrects one already saved, a correction of it.
func (s *supply) logReading(ctx app.Context) {
	r, ok := s.session.lastReading()
	t := s.link.open()
	switch {
	case !ok || t == nil || r.Log != nil || len(s.messages) > 0:
		return
	case s.link.busy != "":
		s.link.problem = "Not saved yet: the logbook is busy (" + s.link.busy + "). The reading is kept here; save it again in a moment."
		return
	}
	label, problem := supplyCylinderLabel(t, s.session.Cylinders, r.Cylinder)
	if problem != "" {
		s.link.problem = "Not saved to the logbook: " + problem + " The reading is kept on this tablet."
		return
	}
	e, err := lbGaugeEntry(label, r.Gauge, r.GaugeUnit)
	if err != nil {
		s.link.problem = "Not saved to the logbook: " + err.Error() + "."
		return
	}
	at, given := r.At(), r.ReadGiven()
	if given {
		// The transport may have opened after the reading was typed here:
		// its opening bounds a reading saved to it, with the Logbook's
		// sentence.
		if err := lbBeforeOpening(supplyReadAtField, lbClockMinute(at), at, t.Opened); err != nil {
			s.link.problem = err.Error() + " Nothing was saved to the logbook; the reading is kept on this tablet."
			return
		}
	}
	e.Transport, e.At = t.ID, at
	what := "reading of " + label
	if c := r.Corrects; c != nil {
		// The reading saved a moment ago was corrected on this screen: the
		// logbook keeps both, the new one pointing at the old. Untimed, the
		// correction keeps the time of the record it corrects (as the
		// Logbook's corrections do), so a reading saved late stays where
		// it was put.
		if !given {
			at = supplyRecordAt(t, c.Seq, r.At())
		}
		e = &logbook.Entry{Kind: logbook.KindAmend, Transport: logbook.TransportID(c.Transport), At: at,
			Amends: c.Seq, Reason: "gauge reading corrected on the Supply screen", Gauge: e.Gauge}
		what = "correction of " + logbook.RecordName(c.Seq)
	}
	key := r.AtUnixMilli
	s.appendEntry(ctx, what, e, given, func(ctx app.Context, ie logbook.IndexEntry) {
		for i := range s.session.Readings {
			if s.session.Readings[i].AtUnixMilli == key {
				s.session.Readings[i].Log = &SupplyLogMark{Transport: string(e.Transport), Seq: ie.Seq}
			}
		}
		saveSupplySession(ctx, s.session)
	})
}

// logCylinderChange saves a change of the cylinder in use as an event at
// at (given: a time the crew gave; zero: not known yet, the change waits
// for its first reading).
func (s *supply) logCylinderChange(ctx app.Context, i int, at time.Time, given bool) {
	t := s.link.open()
	if t == nil {
		return
	}
	s.link.change = supplyChange{transport: t.ID, cylinder: i, at: at, given: given}
	s.saveChange(ctx)
}

// saveChange saves the cylinder change not yet in the logbook, timed as
// the new cylinder's first reading; refused, it stays offered.
func (s *supply) saveChange(ctx app.Context) {
	c := s.link.change
	t := s.link.open()
	if c == (supplyChange{}) || t == nil || t.ID != c.transport {
		return
	}
	if s.link.busy != "" {
		s.link.problem = "The cylinder change was not saved to the logbook: it was busy (" + s.link.busy + "). Save it again with the button in a moment."
		return
	}
	label, problem := supplyCylinderLabel(t, s.session.Cylinders, c.cylinder)
	if problem != "" {
		s.link.change = supplyChange{} // saving again would not change that
		s.link.problem = "The cylinder change was not saved to the logbook: " + problem
		return
	}
	at, given := c.at, c.given
	if at.IsZero() {
		s.link.problem = "The cylinder change was not saved to the logbook: its time is the new cylinder's Read at, which is refused. Correct it, then save the change with the button."
		return
	}
	if given {
		if err := lbBeforeOpening(supplyReadAtField, lbClockMinute(at), at, t.Opened); err != nil {
			s.link.problem = err.Error() + " The cylinder change was not saved to the logbook."
			return
		}
	}
	e := &logbook.Entry{Transport: t.ID, Kind: logbook.KindEvent, At: at,
		Event: &logbook.Event{Type: logbook.EventCylinderChange, Cylinder: label}}
	s.appendEntry(ctx, "change to cylinder "+label, e, given, func(app.Context, logbook.IndexEntry) {
		if s.link.change == c {
			s.link.change = supplyChange{}
		}
	})
}

// supplyRecordAt is the time record seq of t carries, or else.
func supplyRecordAt(t *logbook.Transport, seq uint64, otherwise time.Time) time.Time {
	for _, e := range t.History {
		if e.Seq == seq {
			return e.At
		}
	}
	return otherwise
}

// appendEntry appends e in a goroutine (the store blocks) and reports the
// outcome on screen only once the vault answered. given: e carries a time
// the crew gave (Read at), which the status names as a late entry.
// The transport is read first as the vault holds it: one closed since
// this screen read it takes no new entry (lbCloseCheckStored).
func (s *supply) appendEntry(ctx app.Context, what string, e *logbook.Entry, given bool, onSaved func(app.Context, logbook.IndexEntry)) {
	s.link.busy, s.link.status, s.link.problem = "saving the "+what, "", ""
	if s.mounted && s.Mounted() {
		ctx = s.mctx
	}
	ctx.Async(func() {
		c := context.Background()
		var ie logbook.IndexEntry
		err := lbCloseCheckStored(c, s.vault, supplyReadAtField, e, given)
		if err == nil {
			ie, err = s.vault.Append(c, e)
		}
		ctx.Dispatch(func(ctx app.Context) {
			s.link.busy = ""
			var refused *lbRefusal
			switch {
			case errors.As(err, &refused):
				s.link.problem = "Not saved to the logbook (" + what + "): " + refused.Error()
				return
			case err != nil:
				s.link.problem = "Not saved to the logbook (" + what + "): " + vaultMessage(err)
				return
			}
			s.link.status = "Saved to the logbook: " + what + ", record " + ie.Record() + ", at " + lbClock(ie.At) + "."
			if given {
				s.link.status = "Saved to the logbook: " + what + ", record " + ie.Record() + ", for " + lbClockMinute(ie.At) + " (a late entry, written at " + lbClock(e.Written) + ")."
			}
			if onSaved != nil {
				onSaved(ctx, ie)
			}
		})
	})
}

// renderLogbook is the line under the reading that says where it is kept,
// and the button that saves it to the open transport.
func (s *supply) renderLogbook() app.UI {
	l := &s.link
	t := l.open()
	var body []app.UI
	if t == nil {
		why := "no transport is open in the Logbook"
		switch l.phase {
		case phaseLocked:
			why = "the Logbook is locked"
		case phaseEmpty, phaseUnavailable:
			why = "there is no Logbook on this tablet"
		case phaseUnknown:
			why = "the Logbook is not open"
		}
		if s.vault == nil {
			why = "there is no Logbook here"
		}
		body = append(body, app.P().ID("supply-log-note").Class("alv-note").Text("Kept on this tablet only; not in a transport record ("+why+")."))
	} else {
		o := t.Opening
		body = append(body, app.P().ID("supply-log-open").Class("alv-note").
			Text("Open transport in the Logbook: "+o.Origin.Name+" → "+o.Destination.Name+" ("+string(t.ID)+")."))
		r, ok := s.session.lastReading()
		switch {
		case l.busy != "":
			body = append(body, app.P().ID("supply-log-busy").Class("alv-note").Text("Saving to the logbook…"))
		case ok && r.Log != nil:
			body = append(body, app.P().ID("supply-log-saved").Class("alv-note").
				Text("This reading is saved to the logbook (record "+logbook.RecordName(r.Log.Seq)+")."))
		case ok && len(s.messages) == 0:
			label := "Save reading to the logbook"
			if r.Corrects != nil {
				label = "Save the correction to the logbook"
			}
			body = append(body, app.Button().ID("supply-log-save").Type("submit").Class("alv-button alv-primary").Text(label))
		}
		if c := l.change; c != (supplyChange{}) && c.transport == t.ID && l.busy == "" {
			when := "its time to be given as Read at"
			if !c.at.IsZero() {
				when = hhmm(c.at)
			}
			body = append(body, app.Button().ID("supply-log-change").Type("button").Class("alv-button").
				Text(fmt.Sprintf("Save the change to cylinder %d (%s) to the logbook", c.cylinder+1, when)).
				OnClick(func(ctx app.Context, e app.Event) { s.saveChange(ctx) }))
		}
		body = append(body,
			app.P().ID("supply-log-time-note").Class("alv-note").Text("The logbook takes a reading at the time the countdown counts from: its Read at, or when it was typed here. A Read at given is a late entry there, marked as entered late. A change of cylinder is saved when you choose it, timed as that cylinder's first reading (give Read at before choosing it, or within a minute after)."),
		)
	}
	body = append(body,
		app.Div().ID("supply-log-status").Attr("role", "status").Class("alv-note").Text(l.status),
		app.If(l.problem != "", func() app.UI {
			return app.P().ID("supply-log-problem").Class("alv-error").Attr("role", "alert").Text(l.problem)
		}),
	)
	return app.Div().Class("alv-supply-log").Body(body...)
}
