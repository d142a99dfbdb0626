package logbook

import (
	"context"
	"errors"
	"fmt"
	"slices"
	"time"

	"alvea/physio"
)

// Timed is one item of a transport as it stands after corrections: the
// record it came from, when it happened, its value, and the amendments that
// changed it (in order).
type Timed[T any] struct {
	Seq       uint64
	At        time.Time
	Value     T
	AmendedBy []uint64
}

// Amendment is one correction, for the record view and the audit.
type Amendment struct {
	Seq     uint64 // the amendment's record
	Amends  uint64 // the record corrected
	Written time.Time
	Reason  string
	Void    bool
	// AfterClose: appended after the transport was closed.
	AfterClose bool
}

// Transport is a transport folded from its records: every correction
// applied, withdrawn entries left out. History keeps every record as
// written, so nothing is hidden.
type Transport struct {
	ID           TransportID
	Opened       time.Time
	Opening      Opening
	Briefs       []Timed[Brief] // the opening Brief (if any) then in-flight Briefs
	Cylinders    []CylinderSpec // at opening, then added
	Events       []Timed[Event]
	Gauges       []Timed[GaugeReading]
	Observations []Timed[Observation]
	Notes        []Timed[Note]
	Closed       time.Time // zero while open
	Closing      *Closing
	Amendments   []Amendment
	History      []*Entry  // every readable record of the transport, in order
	Problems     []Problem // records of this transport that could not be read

	latestSeq uint64    // the record carrying the latest time (Latest)
	latestAt  time.Time // its time, as folded
}

// Latest returns the record that carries the latest time of the folded
// transport, and that time: a corrected record at its correction's time, a
// withdrawn one left out, the later record on a tie. ok is false when no
// record is left.
func (t *Transport) Latest() (seq uint64, at time.Time, ok bool) {
	return t.latestSeq, t.latestAt, t.latestSeq != 0
}

// Transport reads every record of transport id and folds them. Unreadable
// records are named in Transport.Problems; the rest are used.
func (v *Vault) Transport(ctx context.Context, id TransportID) (*Transport, error) {
	v.mu.Lock()
	defer v.mu.Unlock()
	if v.keys == nil {
		return nil, ErrLocked
	}
	v.lastUse = v.now()
	if !v.loaded {
		if err := v.load(ctx); err != nil {
			return nil, err
		}
	}
	t := &Transport{ID: id}
	for _, ie := range v.entries {
		if ie.Transport != id {
			continue
		}
		e, err := v.readLocked(ctx, ie.Seq)
		if err != nil {
			var de *DamageError
			if !errors.As(err, &de) {
				return nil, err
			}
			t.Problems = append(t.Problems, de.Problems...)
			continue
		}
		t.History = append(t.History, e)
	}
	if len(t.History) == 0 && len(t.Problems) == 0 {
		return nil, fmt.Errorf("%w: transport %s", ErrNotFound, id)
	}
	t.fold()
	return t, nil
}

// Fold builds a Transport from its records (in record order) without a
// vault: the audit uses it on entries it already holds.
func Fold(entries []*Entry) *Transport {
	t := &Transport{}
	if len(entries) > 0 {
		t.ID = entries[0].Transport
	}
	t.History = entries
	t.fold()
	return t
}

func (t *Transport) fold() {
	current := map[uint64]*Entry{}
	amendedBy := map[uint64][]uint64{}
	voided := map[uint64]bool{}
	var order []uint64
	closed := false
	for _, e := range t.History {
		if e.Kind != KindAmend {
			c := *e
			current[e.Seq] = &c
			order = append(order, e.Seq)
			if e.Kind == KindClose {
				closed = true
			}
			continue
		}
		t.Amendments = append(t.Amendments, Amendment{Seq: e.Seq, Amends: e.Amends, Written: e.Written, Reason: e.Reason, Void: e.Void, AfterClose: closed})
		target, ok := current[e.Amends]
		if !ok {
			continue
		}
		amendedBy[e.Amends] = append(amendedBy[e.Amends], e.Seq)
		if e.Void {
			voided[e.Amends] = true
			continue
		}
		voided[e.Amends] = false
		r := *target
		r.At = e.At
		r.Open, r.Event, r.Gauge, r.Observe, r.Note, r.Cylinder, r.Brief, r.Close = e.Open, e.Event, e.Gauge, e.Observe, e.Note, e.Cylinder, e.Brief, e.Close
		current[e.Amends] = &r
	}
	for _, seq := range order {
		if voided[seq] {
			continue
		}
		e := current[seq]
		if t.latestSeq == 0 || !e.At.Before(t.latestAt) {
			t.latestSeq, t.latestAt = seq, e.At
		}
		by := amendedBy[seq]
		switch e.Kind {
		case KindOpen:
			t.Opened, t.Opening = e.At, *e.Open
			t.Cylinders = append(t.Cylinders, e.Open.Cylinders...)
			if e.Open.Brief != nil {
				t.Briefs = append(t.Briefs, Timed[Brief]{seq, e.At, *e.Open.Brief, by})
			}
		case KindBrief:
			t.Briefs = append(t.Briefs, Timed[Brief]{seq, e.At, *e.Brief, by})
		case KindCylinder:
			t.Cylinders = append(t.Cylinders, *e.Cylinder)
		case KindEvent:
			t.Events = append(t.Events, Timed[Event]{seq, e.At, *e.Event, by})
		case KindGauge:
			t.Gauges = append(t.Gauges, Timed[GaugeReading]{seq, e.At, *e.Gauge, by})
		case KindObserve:
			t.Observations = append(t.Observations, Timed[Observation]{seq, e.At, *e.Observe, by})
		case KindNote:
			t.Notes = append(t.Notes, Timed[Note]{seq, e.At, *e.Note, by})
		case KindClose:
			t.Closed, t.Closing = e.At, e.Close
		}
	}
	byTime := func(a, b time.Time) int { return a.Compare(b) }
	slices.SortStableFunc(t.Events, func(a, b Timed[Event]) int { return byTime(a.At, b.At) })
	slices.SortStableFunc(t.Gauges, func(a, b Timed[GaugeReading]) int { return byTime(a.At, b.At) })
	slices.SortStableFunc(t.Observations, func(a, b Timed[Observation]) int { return byTime(a.At, b.At) })
}

// CylinderUse is the oxygen a cylinder gave during a transport, from its
// gauge readings.
type CylinderUse struct {
	Label    string
	Spec     *CylinderSpec // nil when readings name a cylinder never defined
	Method   string        // physio's counting method name
	Readings []Timed[GaugeReading]
	// Used is the free oxygen the cylinder gave, unrounded: the sum, over
	// consecutive readings in time order, of the fall in contents
	// (physio Cylinder.Contents). A reading higher than the one before is
	// counted in Rises and adds nothing: a refill, a swap under the same
	// label, or a misread for the auditor to look at.
	Used  physio.Volume
	Rises int
	Err   error // the definition or a reading could not be counted
}

// CylinderUse returns, per cylinder label, the oxygen used according to the
// gauge readings: cylinders in definition order, then labels that appear
// only in readings. Rounding is left to the caller (the audit rounds used
// oxygen up: the safe side when judging a plan).
func (t *Transport) CylinderUse() []CylinderUse {
	var out []CylinderUse
	pos := map[string]int{}
	for i := range t.Cylinders {
		c := t.Cylinders[i]
		if _, dup := pos[c.Label]; dup {
			continue
		}
		pos[c.Label] = len(out)
		out = append(out, CylinderUse{Label: c.Label, Spec: &c})
	}
	for _, g := range t.Gauges {
		i, ok := pos[g.Value.Cylinder]
		if !ok {
			i = len(out)
			pos[g.Value.Cylinder] = i
			out = append(out, CylinderUse{Label: g.Value.Cylinder, Err: fmt.Errorf("%w: cylinder %q has readings but no definition", ErrInvalid, g.Value.Cylinder)})
		}
		out[i].Readings = append(out[i].Readings, g)
	}
	for i := range out {
		u := &out[i]
		if u.Spec == nil {
			continue
		}
		cyl, err := u.Spec.Physio()
		if err != nil {
			u.Err = err
			continue
		}
		u.Method = cyl.Method()
		var prev physio.Volume
		for j, r := range u.Readings {
			c, err := cyl.Contents(r.Value.Pressure)
			if err != nil {
				u.Err = fmt.Errorf("logbook: %s: %w", RecordName(r.Seq), err)
				break
			}
			if j > 0 {
				if c > prev {
					u.Rises++
				} else {
					u.Used += prev - c
				}
			}
			prev = c
		}
	}
	return out
}
