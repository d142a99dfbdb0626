package ui

import (
	"cmp"
	"context"
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
	"alvea/physio"
)

// recordState is the transport on screen and its entry forms. Form values
// are cleared only when their entry is saved: a refused write leaves them
// on screen.
type recordState struct {
	id        logbook.TransportID
	transport *logbook.Transport

	otherText string
	gaugeCyl  string
	gaugeText string
	obs       lbObsForm
	noteText  string
	outcome   string

	// atText is the time control: blank means now; otherwise a clock time
	// "hh:mm" that the next entry saved from a form or a one-tap button
	// carries (lbEntryTime). It goes back to blank once that entry is
	// saved, so the tap after it is not backdated by accident.
	atText string
	atMsg  string // why the typed time was refused ("" = not refused)

	amendSeq    uint64 // the record being corrected (0: none)
	amendReason string
	amendVoid   bool
	amendText   string // replacement note text or gauge reading

	saving  string // what is being saved, shown until the store confirms
	pending string // an entry refused by the store, still on screen
	saved   uint64 // the last record the store confirmed
}

type lbObsForm struct {
	spo2, fio2, device, flow, rr, etco2, hr string
}

// typed reports whether any form of the record view holds the crew's
// typing, or an entry the store refused.
func (r recordState) typed() bool {
	return r.otherText != "" || r.gaugeText != "" || r.obs != (lbObsForm{}) || r.noteText != "" ||
		r.outcome != "" || r.amendSeq != 0 || r.pending != "" || r.atText != ""
}

func (l *logbookScreen) openTransport(ctx app.Context, id logbook.TransportID) {
	l.stashUnsaved()
	l.record = recordState{id: id}
	l.view = viewRecord
	l.status, l.problem = "", ""
	l.takeUnsaved()
	l.loadTransport(ctx)
}

// loadTransport reads the transport's records (decrypting its bodies).
func (l *logbookScreen) loadTransport(ctx app.Context) {
	id := l.record.id
	var tr *logbook.Transport
	l.run(ctx, "Opening the transport…", func(c context.Context) error {
		v, err := l.session.Vault()
		if err != nil {
			return err
		}
		tr, err = v.Transport(c, id)
		return err
	}, func(ctx app.Context, err error) {
		if err != nil {
			l.problem = vaultActionMessage(err)
			return
		}
		if l.record.id == id {
			l.record.transport = tr
			if l.record.gaugeCyl == "" && len(tr.Cylinders) > 0 {
				l.record.gaugeCyl = tr.Cylinders[0].Label
			}
		}
	})
}

// save appends the entry built from the form. The entry is shown as saved
// only when the store confirms it; on any refusal the form keeps its values
// and the message says it was not saved.
func (l *logbookScreen) save(ctx app.Context, what string, build func() (*logbook.Entry, error), onSaved func()) {
	r := &l.record
	if l.busy != "" {
		// Never drop a tap silently: the entry stays in its form.
		l.problem = "Not saved yet: the logbook is busy (" + strings.TrimSuffix(l.busy, "…") + "). Your entry is still here; tap save again in a moment."
		return
	}
	// The last "Saved …" line goes: left beside a refusal of this entry,
	// it would read as if this one had been saved.
	l.status = ""
	e, err := build()
	if err != nil {
		l.problem = err.Error()
		return
	}
	e.Transport = r.id
	if t := r.transport; t != nil && !t.Closed.IsZero() && e.Kind != logbook.KindAmend {
		// The forms are gone once the transport is closed; this guards
		// any other way in (RECORD-MODEL: only corrections follow a close).
		l.problem = lbClosedRefusal(t) + " Nothing was saved."
		return
	}
	given := false // the entry carries a time typed in the time control
	if e.At.IsZero() {
		var opened time.Time
		if r.transport != nil {
			opened = r.transport.Opened
		}
		now := l.now()
		at, ok, err := lbEntryTime(lbAtField, r.atText, now, opened)
		if err != nil {
			r.atMsg = err.Error()
			l.problem = err.Error() + " Nothing was saved."
			return
		}
		e.At, given = now, ok
		if ok {
			e.At = at
		}
	}
	if e.Kind == logbook.KindClose && r.transport != nil {
		if msg := lbCloseRefusal(lbAtField, e.At, given, r.transport); msg != "" {
			r.atMsg = msg
			l.problem = msg + " Nothing was saved."
			return
		}
	}
	r.atMsg = ""
	r.saving, r.pending = what, ""
	var ie logbook.IndexEntry
	var tr *logbook.Transport
	l.run(ctx, "Saving "+what+"…", func(c context.Context) error {
		var err error
		if e.Kind == logbook.KindClose {
			// Checked again against the transport as the vault holds it
			// now: an entry saved from the Supply screen since this one
			// was read counts too.
			if err := lbCloseCheckStored(c, l.session, lbAtField, e, given); err != nil {
				return err
			}
		}
		if ie, err = l.session.Append(c, e); err != nil {
			return err
		}
		v, err := l.session.Vault()
		if err == nil {
			tr, _ = v.Transport(c, e.Transport)
		}
		return nil
	}, func(ctx app.Context, err error) {
		r.saving = ""
		var refused *lbRefusal
		if errors.As(err, &refused) {
			// Refused by the log's own rules, not by the store: the entry
			// stays in its form, a refused time in its field with the
			// reason beside it.
			if refused.ofTime {
				r.atMsg = refused.Error()
			}
			l.problem = refused.Error() + " Nothing was saved."
			return
		}
		if err != nil {
			r.pending = what
			l.problem = vaultMessage(err)
			return
		}
		r.saved = ie.Seq
		l.status = "Saved " + what + " as " + ie.Record() + " at " + lbClock(ie.At) + "."
		if given {
			l.status = "Saved " + what + " as " + ie.Record() + " for " + lbClockMinute(ie.At) + " (a late entry, written at " + lbClock(e.Written) + ")."
			r.atText = ""
			lbClearInputs("lb-at")
		}
		if tr != nil {
			r.transport = tr
		}
		if onSaved != nil {
			onSaved()
		}
	})
}

func (l *logbookScreen) renderRecord() app.UI {
	r := &l.record
	t := r.transport
	if t == nil {
		return app.Div().Class("lb-body").Body(l.nav(), app.P().Class("alv-lead").Text("Opening the transport…"))
	}
	o := t.Opening
	closed := !t.Closed.IsZero()
	return app.Div().Class("lb-body").Body(
		l.nav(),
		app.Div().Class("alv-card").Body(
			app.H2().Class("alv-card-title").ID("lb-record-title").Text(o.Origin.Name+" → "+o.Destination.Name),
			app.Dl().Class("lb-facts").Body(
				lbFact("Transport", string(t.ID)),
				lbFact("Opened", lbDayAndClock(t.Opened)),
				lbFact("Closed", lbDayAndClock(t.Closed)),
				lbFact("Vehicle", o.Vehicle),
				lbFact("Crew", strings.Join(o.Crew, " ")),
				lbFact("Patient", lbPatientText(o.Patient)),
				lbFact("Cylinders", lbCylindersText(t.Cylinders)),
				lbFact("Brief", lbBriefText(t.Briefs)),
			),
			app.If(o.Patient.Identifying != "", func() app.UI {
				return app.P().Class("lb-ident-warn").Text("This transport holds identifying patient text (stored encrypted).")
			}),
		),
		app.If(!closed, func() app.UI { return l.renderEntries() }),
		app.If(r.pending != "", func() app.UI {
			return app.P().ID("lb-unsaved").Class("alv-error").Attr("role", "alert").
				Text("Not saved: " + r.pending + ". The entry is still in its form below; save it again.")
		}),
		l.renderTimeline(),
		app.If(r.amendSeq != 0, func() app.UI { return l.renderAmend() }),
		app.If(!closed, func() app.UI { return l.renderClose() }),
	)
}

func lbFact(label, value string) app.UI {
	if value == "" {
		value = "—"
	}
	return app.Div().Class("lb-fact").Body(app.Dt().Text(label), app.Dd().Text(value))
}

func lbPatientText(p logbook.Patient) string {
	var parts []string
	if p.AgeBand != "" {
		parts = append(parts, string(p.AgeBand))
	}
	if p.Sex != "" {
		parts = append(parts, string(p.Sex))
	}
	if p.WeightKg > 0 {
		parts = append(parts, strconv.FormatFloat(p.WeightKg, 'f', -1, 64)+" kg")
	}
	if p.Identifying != "" {
		parts = append(parts, p.Identifying)
	}
	return strings.Join(parts, ", ")
}

func lbCylindersText(cs []logbook.CylinderSpec) string {
	var parts []string
	for _, c := range cs {
		d := c.Label
		switch {
		case c.Size != "":
			d += " (size " + c.Size + ")"
		case c.WaterCapacity > 0:
			d += fmt.Sprintf(" (%g L water capacity)", c.WaterCapacity.Litres())
		}
		parts = append(parts, d)
	}
	return strings.Join(parts, ", ")
}

func lbBriefText(bs []logbook.Timed[logbook.Brief]) string {
	if len(bs) == 0 {
		return "no plan snapshot"
	}
	b := bs[len(bs)-1].Value
	s := "plan snapshot, engine " + b.EngineVersion
	if len(b.Result) == 0 {
		s += " (no result)"
	}
	if len(bs) > 1 {
		s += fmt.Sprintf("; amended %d time(s) in flight", len(bs)-1)
	}
	return s
}

// lbOneTap are the milestones saved with one tap, timed at the tap unless
// the time control gives another time.
var lbOneTap = []struct {
	Type  logbook.EventType
	Label string
}{
	{logbook.EventDepart, "Depart"},
	{logbook.EventLiftOff, "Lift-off"},
	{logbook.EventTopOfClimb, "Top of climb"},
	{logbook.EventTopOfDescent, "Top of descent"},
	{logbook.EventLanding, "Landing"},
	{logbook.EventArrive, "Arrive"},
	{logbook.EventHandover, "Handover"},
}

// tapEvent saves a one-tap milestone, timed now or at the time control's.
func (l *logbookScreen) tapEvent(ctx app.Context, typ logbook.EventType, label string) {
	l.save(ctx, strings.ToLower(label), func() (*logbook.Entry, error) {
		return &logbook.Entry{Kind: logbook.KindEvent, Event: &logbook.Event{Type: typ}}, nil
	}, nil)
}

func (l *logbookScreen) renderEntries() app.UI {
	r := &l.record
	u := l.units
	events := make([]app.UI, 0, len(lbOneTap))
	for _, ev := range lbOneTap {
		ev := ev
		events = append(events, app.Button().Type("button").ID("lb-ev-"+string(ev.Type)).Class("alv-button lb-tap").
			Text(ev.Label).Disabled(l.busy != "").
			OnClick(func(ctx app.Context, e app.Event) { l.tapEvent(ctx, ev.Type, ev.Label) }))
	}
	var cylInput app.UI
	if t := r.transport; t != nil && len(t.Cylinders) > 0 {
		opts := make([]app.UI, 0, len(t.Cylinders))
		for _, c := range t.Cylinders {
			opts = append(opts, app.Option().Value(c.Label).Text(c.Label).Selected(c.Label == r.gaugeCyl))
		}
		cylInput = app.Div().Class("alv-field").Body(
			app.Label().For("lb-gauge-cyl").Text("Cylinder"),
			app.Select().ID("lb-gauge-cyl").Class("alv-input").Body(opts...).
				OnChange(func(ctx app.Context, e app.Event) { r.gaugeCyl = ctx.JSSrc().Get("value").String() }),
		)
	} else {
		cylInput = textField("lb-gauge-cyl", "Cylinder label", r.gaugeCyl, "", func(ctx app.Context, t string) { r.gaugeCyl = t })
	}
	return app.Div().Class("alv-grid").Body(
		app.Div().Class("alv-card lb-when").Body(
			app.H2().Class("alv-card-title").Text("Time of the next entry"),
			textField("lb-at", "Time (hh:mm, 24-hour; blank = now)", r.atText, r.atMsg, func(ctx app.Context, t string) { r.atText, r.atMsg = t, "" }),
			app.P().ID("lb-at-note").Class("alv-note").Text("Leave blank to time entries now. For a late entry, type when it happened (within the last 24 hours, not before the transport opened): the next event, reading, observation, note or close saved takes that time, is marked as entered late, and the field goes back to blank."),
		),
		app.Div().Class("alv-card").Body(
			app.H2().Class("alv-card-title").Text("Events"),
			app.Div().Class("lb-taps").Body(events...),
			app.Form().ID("lb-other").Class("lb-inline").OnSubmit(func(ctx app.Context, e app.Event) {
				e.PreventDefault()
				l.save(ctx, "event", func() (*logbook.Entry, error) {
					return &logbook.Entry{Kind: logbook.KindEvent, Event: &logbook.Event{Type: logbook.EventOther, Text: strings.TrimSpace(r.otherText)}}, nil
				}, func() { r.otherText = ""; lbClearInputs("lb-other-text") })
			}).Body(
				textField("lb-other-text", "Other event", r.otherText, "", func(ctx app.Context, t string) { r.otherText = t }),
				app.Button().Type("submit").ID("lb-other-go").Class("alv-button").Text("Save event"),
			),
		),
		app.Form().ID("lb-gauge").Class("alv-card").OnSubmit(l.saveGauge).Body(
			app.H2().Class("alv-card-title").Text("Gauge reading"),
			cylInput,
			numberField("lb-gauge-p", "Gauge", u.PressureUnit, r.gaugeText, "", func(ctx app.Context, t string) { r.gaugeText = t }),
			app.Button().Type("submit").ID("lb-gauge-go").Class("alv-button alv-primary").Text("Save reading"),
		),
		app.Form().ID("lb-obs").Class("alv-card").OnSubmit(l.saveObs).Body(
			app.H2().Class("alv-card-title").Text("Observations"),
			app.Div().Class("lb-obs-grid").Body(
				numberField("lb-obs-spo2", "SpO2", "%", r.obs.spo2, "", func(ctx app.Context, t string) { r.obs.spo2 = t }),
				numberField("lb-obs-fio2", "FiO2 (0.4 or 40 %)", "", r.obs.fio2, "", func(ctx app.Context, t string) { r.obs.fio2 = t }),
				textField("lb-obs-device", "Device", r.obs.device, "", func(ctx app.Context, t string) { r.obs.device = t }),
				numberField("lb-obs-flow", "O2 flow", "L/min", r.obs.flow, "", func(ctx app.Context, t string) { r.obs.flow = t }),
				numberField("lb-obs-rr", "Resp. rate", "/min", r.obs.rr, "", func(ctx app.Context, t string) { r.obs.rr = t }),
				numberField("lb-obs-etco2", "EtCO2", u.GasUnit, r.obs.etco2, "", func(ctx app.Context, t string) { r.obs.etco2 = t }),
				numberField("lb-obs-hr", "Heart rate", "/min", r.obs.hr, "", func(ctx app.Context, t string) { r.obs.hr = t }),
			),
			app.Button().Type("submit").ID("lb-obs-go").Class("alv-button alv-primary").Text("Save observations"),
		),
		app.Form().ID("lb-note").Class("alv-card").OnSubmit(l.saveNote).Body(
			app.H2().Class("alv-card-title").Text("Note"),
			app.Div().Class("alv-field").Body(
				app.Label().For("lb-note-text").Text("Note"),
				app.Textarea().ID("lb-note-text").Class("alv-input lb-textarea").Attr("rows", 3).
					Text(r.noteText).
					OnInput(func(ctx app.Context, e app.Event) { r.noteText = ctx.JSSrc().Get("value").String() }),
			),
			app.Button().Type("submit").ID("lb-note-go").Class("alv-button alv-primary").Text("Save note"),
		),
	)
}

func (l *logbookScreen) saveGauge(ctx app.Context, e app.Event) {
	e.PreventDefault()
	r := &l.record
	unit := l.units.PressureUnit
	l.save(ctx, "gauge reading", func() (*logbook.Entry, error) {
		return lbGaugeEntry(r.gaugeCyl, r.gaugeText, unit)
	}, func() { r.gaugeText = ""; lbClearInputs("lb-gauge-p") })
}

// lbGaugeEntry builds the gauge-reading entry of the cylinder labelled
// cylinder from text, a pressure typed in unit (psi or bar) unless it names
// its own. The Logbook's gauge form and the Supply screen both build their
// entries with it.
func lbGaugeEntry(cylinder, text, unit string) (*logbook.Entry, error) {
	p, err := physio.ParsePressure(lbWithUnit(text, unit))
	if err != nil {
		return nil, lbParseRefusal("Gauge reading", "gauge.pressure_pa", text, err)
	}
	return &logbook.Entry{Kind: logbook.KindGauge, Gauge: &logbook.GaugeReading{Cylinder: strings.TrimSpace(cylinder), Pressure: p}}, nil
}

// lbReadObservation reads the observation form; empty fields stay absent.
func lbReadObservation(f lbObsForm, gasUnit string) (*logbook.Observation, error) {
	o := &logbook.Observation{Device: strings.TrimSpace(f.device)}
	if t := strings.TrimSpace(f.spo2); t != "" {
		v, err := physio.ParseFraction(lbWithUnit(t, "%"))
		if err != nil {
			return nil, lbParseRefusal("SpO2", "observe.spo2", t, err)
		}
		o.SpO2 = &v
	}
	if t := strings.TrimSpace(f.fio2); t != "" {
		v, err := physio.ParseFraction(t)
		if err != nil {
			return nil, lbParseRefusal("FiO2", "observe.fio2", t, err)
		}
		o.FiO2 = &v
	}
	if t := strings.TrimSpace(f.flow); t != "" {
		v, err := physio.ParseFlow(lbWithUnit(t, "L/min"))
		if err != nil {
			return nil, lbParseRefusal("O2 flow", "observe.flow_lpm", t, err)
		}
		o.Flow = &v
	}
	if t := strings.TrimSpace(f.etco2); t != "" {
		v, err := physio.ParsePressure(lbWithUnit(t, gasUnit))
		if err != nil {
			return nil, lbParseRefusal("EtCO2", "observe.etco2_pa", t, err)
		}
		o.EtCO2 = &v
	}
	for _, n := range []struct {
		label, field, text string
		dst                **float64
	}{{"Respiratory rate", "observe.resp_rate", f.rr, &o.RespRate}, {"Heart rate", "observe.heart_rate", f.hr, &o.HeartRate}} {
		if t := strings.TrimSpace(n.text); t != "" {
			// A plain decimal (bareDecimal): strconv would take "1e1" or
			// "0x1p6" as 10 and 64 a minute without a word.
			d, ok := bareDecimal(t)
			if !ok {
				return nil, errors.New(lbNotANumber(n.label, n.field, t))
			}
			v := d.InexactFloat64()
			*n.dst = &v
		}
	}
	return o, nil
}

func (l *logbookScreen) saveObs(ctx app.Context, e app.Event) {
	e.PreventDefault()
	r := &l.record
	gas := l.units.GasUnit
	l.save(ctx, "observations", func() (*logbook.Entry, error) {
		o, err := lbReadObservation(r.obs, gas)
		if err != nil {
			return nil, err
		}
		return &logbook.Entry{Kind: logbook.KindObserve, Observe: o}, nil
	}, func() {
		r.obs = lbObsForm{device: r.obs.device}
		lbClearInputs("lb-obs-spo2", "lb-obs-fio2", "lb-obs-flow", "lb-obs-rr", "lb-obs-etco2", "lb-obs-hr")
	})
}

func (l *logbookScreen) saveNote(ctx app.Context, e app.Event) {
	e.PreventDefault()
	r := &l.record
	l.save(ctx, "note", func() (*logbook.Entry, error) {
		return &logbook.Entry{Kind: logbook.KindNote, Note: &logbook.Note{Text: strings.TrimSpace(r.noteText)}}, nil
	}, func() { r.noteText = ""; lbClearInputs("lb-note-text") })
}

// saveClose closes the transport, timed now or at the time control's; a
// time before the transport's latest entry is refused (lbCloseRefusal).
func (l *logbookScreen) saveClose(ctx app.Context, e app.Event) {
	e.PreventDefault()
	r := &l.record
	l.save(ctx, "close", func() (*logbook.Entry, error) {
		return &logbook.Entry{Kind: logbook.KindClose, Close: &logbook.Closing{Outcome: strings.TrimSpace(r.outcome)}}, nil
	}, func() { r.outcome = ""; lbClearInputs("lb-outcome") })
}

func (l *logbookScreen) renderClose() app.UI {
	r := &l.record
	return app.Form().ID("lb-close").Class("alv-card").OnSubmit(l.saveClose).Body(
		app.H2().Class("alv-card-title").Text("Close transport"),
		textField("lb-outcome", "Outcome", r.outcome, "", func(ctx app.Context, t string) { r.outcome = t }),
		app.Button().Type("submit").ID("lb-close-go").Class("alv-button").Text("Close transport"),
	)
}

// renderTimeline shows every readable record of the transport as a course
// of events: in the order of the times they carry (Entry.At), record number
// breaking ties, so a late entry stands where it happened, with its record
// number and an "entered HH:MM" mark (lbLateText). A correction carries the
// time of the record it corrects, so it follows that record; it is its own
// line pointing at it, and the corrected line stays, marked with the
// correction's record.
func (l *logbookScreen) renderTimeline() app.UI {
	t := l.record.transport
	amendedBy := map[uint64][]string{}
	for _, e := range t.History {
		if e.Kind == logbook.KindAmend {
			amendedBy[e.Amends] = append(amendedBy[e.Amends], logbook.RecordName(e.Seq))
		}
	}
	closed := !t.Closed.IsZero()
	items := make([]app.UI, 0, len(t.History))
	for _, e := range lbInTimeOrder(t.History) {
		e := e
		late := lbLateText(e.At, e.Written)
		cls := "lb-entry lb-kind-" + e.Kind.String()
		if len(amendedBy[e.Seq]) > 0 {
			cls += " lb-corrected"
		}
		items = append(items, app.Li().Class(cls).DataSet("seq", strconv.FormatUint(e.Seq, 10)).Body(
			app.Span().Class("lb-time alv-num-cell").Text(lbClock(e.At)),
			app.If(late != "", func() app.UI {
				return app.Span().Class("lb-flag lb-flag-late").Title("written to the log at " + lbClock(e.Written) + ", later than the time it gives").Text(late)
			}),
			app.Span().Class("lb-rec").Text(logbook.RecordName(e.Seq)),
			app.Span().Class("lb-what").Text(lbDescribe(e, l.units)),
			app.If(len(amendedBy[e.Seq]) > 0, func() app.UI {
				return app.Span().Class("lb-flag lb-flag-amended").Text("corrected by " + strings.Join(amendedBy[e.Seq], ", "))
			}),
			app.If(e.Kind != logbook.KindAmend && e.Kind != logbook.KindOpen, func() app.UI {
				return app.Button().Type("button").Class("alv-button lb-correct").ID("lb-correct-"+strconv.FormatUint(e.Seq, 10)).
					Aria("label", "Correct "+logbook.RecordName(e.Seq)).Text("Correct").
					OnClick(func(ctx app.Context, ev app.Event) {
						r := &l.record
						r.amendSeq, r.amendReason, r.amendVoid, r.amendText = e.Seq, "", false, ""
					})
			}),
		))
	}
	var probs []app.UI
	for _, p := range t.Problems {
		probs = append(probs, app.Li().Text(p.String()))
	}
	title := "Timeline"
	if closed {
		title = "Timeline (closed; a correction is still possible and is flagged as after the close)"
	}
	return app.Div().Class("alv-card").Body(
		app.H2().Class("alv-card-title").Text(title),
		app.Ol().ID("lb-timeline").Class("lb-timeline").Body(items...),
		app.If(len(probs) > 0, func() app.UI {
			return app.Div().Class("lb-warn").Attr("role", "alert").Body(
				app.P().Text("Records of this transport that could not be read:"), app.Ul().Body(probs...))
		}),
	)
}

// lbInTimeOrder returns the records ordered by the time they carry, record
// number breaking ties; history itself is left in record order.
func lbInTimeOrder(history []*logbook.Entry) []*logbook.Entry {
	out := slices.Clone(history)
	slices.SortStableFunc(out, func(a, b *logbook.Entry) int {
		if c := a.At.Compare(b.At); c != 0 {
			return c
		}
		return cmp.Compare(a.Seq, b.Seq)
	})
	return out
}

// lbDescribe is one entry's line in the timeline.
func lbDescribe(e *logbook.Entry, u Settings) string {
	switch e.Kind {
	case logbook.KindOpen:
		return "Opened: " + e.Open.Origin.Name + " → " + e.Open.Destination.Name
	case logbook.KindAmend:
		s := "Correction of " + logbook.RecordName(e.Amends) + " (" + e.Reason + "): "
		if e.Void {
			return s + "withdrawn"
		}
		return s + lbPayloadText(e, u)
	}
	return lbPayloadText(e, u)
}

func lbPayloadText(e *logbook.Entry, u Settings) string {
	switch {
	case e.Event != nil:
		s := "Event: " + string(e.Event.Type)
		if e.Event.Text != "" {
			s += " — " + e.Event.Text
		}
		if e.Event.Cylinder != "" {
			s += " (cylinder " + e.Event.Cylinder + ")"
		}
		return s
	case e.Gauge != nil:
		return "Gauge " + e.Gauge.Cylinder + ": " + lbPressureText(e.Gauge.Pressure, u.PressureUnit)
	case e.Observe != nil:
		o := e.Observe
		var p []string
		if o.SpO2 != nil {
			p = append(p, fmt.Sprintf("SpO2 %.0f %%", o.SpO2.Percent()))
		}
		if o.FiO2 != nil {
			p = append(p, fmt.Sprintf("FiO2 %.2f", o.FiO2.Value()))
		}
		if o.Device != "" {
			p = append(p, o.Device)
		}
		if o.Flow != nil {
			p = append(p, fmt.Sprintf("%g L/min", o.Flow.LitresPerMinute()))
		}
		if o.RespRate != nil {
			p = append(p, fmt.Sprintf("RR %g/min", *o.RespRate))
		}
		if o.EtCO2 != nil {
			p = append(p, "EtCO2 "+lbGasText(*o.EtCO2, u.GasUnit))
		}
		if o.HeartRate != nil {
			p = append(p, fmt.Sprintf("HR %g/min", *o.HeartRate))
		}
		return "Observations: " + strings.Join(p, ", ")
	case e.Note != nil:
		return "Note: " + e.Note.Text
	case e.Cylinder != nil:
		return "Cylinder added: " + lbCylindersText([]logbook.CylinderSpec{*e.Cylinder})
	case e.Brief != nil:
		return "Brief amended (engine " + e.Brief.EngineVersion + ")"
	case e.Close != nil:
		return "Closed: " + e.Close.Outcome
	case e.Open != nil:
		return "Opening corrected: " + e.Open.Origin.Name + " → " + e.Open.Destination.Name
	}
	return e.Kind.String()
}

// renderAmend is the correction form for one record: withdraw it, or (for
// notes and gauge readings) give the corrected value; a reason is required.
func (l *logbookScreen) renderAmend() app.UI {
	r := &l.record
	var target *logbook.Entry
	for _, e := range r.transport.History {
		if e.Seq == r.amendSeq {
			target = e
		}
	}
	if target == nil {
		return app.Text("")
	}
	canReplace := target.Kind == logbook.KindNote || target.Kind == logbook.KindGauge
	return app.Form().ID("lb-amend").Class("alv-card").OnSubmit(l.saveAmend).Body(
		app.H2().Class("alv-card-title").Text("Correct "+logbook.RecordName(target.Seq)),
		app.P().Class("alv-note").Text("The original stays in the log; the correction is a new record pointing at it. "+lbDescribe(target, l.units)),
		textField("lb-amend-reason", "Reason", r.amendReason, "", func(ctx app.Context, t string) { r.amendReason = t }),
		app.Div().Class("alv-field lb-check").Body(
			app.Input().Type("checkbox").ID("lb-amend-void").Checked(r.amendVoid || !canReplace).Disabled(!canReplace).
				OnChange(func(ctx app.Context, e app.Event) { r.amendVoid = ctx.JSSrc().Get("checked").Bool() }),
			app.Label().For("lb-amend-void").Text("Withdraw this entry (it was wrong or not for this transport)"),
		),
		app.If(canReplace && !r.amendVoid, func() app.UI {
			label, unit := "Corrected note", ""
			if target.Kind == logbook.KindGauge {
				label, unit = "Corrected gauge reading", l.units.PressureUnit
				return numberField("lb-amend-text", label, unit, r.amendText, "", func(ctx app.Context, t string) { r.amendText = t })
			}
			return textField("lb-amend-text", label, r.amendText, "", func(ctx app.Context, t string) { r.amendText = t })
		}),
		app.Div().Class("alv-update-actions").Body(
			app.Button().Type("submit").ID("lb-amend-go").Class("alv-button alv-primary").Text("Save correction"),
			app.Button().Type("button").ID("lb-amend-cancel").Class("alv-button").Text("Cancel").
				OnClick(func(ctx app.Context, e app.Event) { r.amendSeq = 0 }),
		),
	)
}

func (l *logbookScreen) saveAmend(ctx app.Context, e app.Event) {
	e.PreventDefault()
	r := &l.record
	var target *logbook.Entry
	for _, x := range r.transport.History {
		if x.Seq == r.amendSeq {
			target = x
		}
	}
	if target == nil {
		return
	}
	unit := l.units.PressureUnit
	l.save(ctx, "correction", func() (*logbook.Entry, error) {
		if strings.TrimSpace(r.amendReason) == "" {
			return nil, fmt.Errorf("Reason: say why this record is corrected")
		}
		a := &logbook.Entry{Kind: logbook.KindAmend, Amends: target.Seq, Reason: strings.TrimSpace(r.amendReason), At: target.At}
		switch {
		case r.amendVoid || (target.Kind != logbook.KindNote && target.Kind != logbook.KindGauge):
			a.Void = true
		case target.Kind == logbook.KindNote:
			a.Note = &logbook.Note{Text: strings.TrimSpace(r.amendText)}
		case target.Kind == logbook.KindGauge:
			p, err := physio.ParsePressure(lbWithUnit(r.amendText, unit))
			if err != nil {
				return nil, fmt.Errorf("Corrected gauge reading: %s", err.Error())
			}
			a.Gauge = &logbook.GaugeReading{Cylinder: target.Gauge.Cylinder, Pressure: p}
		}
		return a, nil
	}, func() {
		r.amendSeq, r.amendReason, r.amendText, r.amendVoid = 0, "", "", false
		lbClearInputs("lb-amend-reason", "lb-amend-text")
	})
}
