package ui

import (
	"encoding/json"
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
	"alvea/physio"
)

// startForm opens a transport from the current Brief: the plan document and
// physio's result are snapshotted with the engine version; the cylinders on
// board come from the Brief's supply lines.
type startForm struct {
	vehicle, crew         string
	origin, originElev    string
	dest, destElev        string
	age, sex, weight      string
	identifying           string
	snapshot              *logbook.Brief
	cylinders             []logbook.CylinderSpec
	briefNote             string // what the Brief gave, or why no snapshot
	originMsg, destMsg    string
	weightMsg, vehicleMsg string
	// at is when the transport opened, as hh:mm (blank = now): a crew that
	// starts the log after taking the patient on gives the real time
	// (lbEntryTime; the same rule as the record view's time control).
	at, atMsg string
	// The elevations as the Brief gave them, to tell them from the crew's.
	briefOriginElev, briefDestElev string
}

// typed reports whether the crew has filled in any field of the form (an
// elevation as the Brief gave it is not the crew's).
func (f startForm) typed() bool {
	return f.vehicle != "" || f.crew != "" || f.origin != "" || f.originElev != f.briefOriginElev || f.dest != "" ||
		f.destElev != f.briefDestElev || f.age != "" || f.sex != "" || f.weight != "" || f.identifying != "" || f.at != ""
}

// prepareStart reads the current Brief draft and computes its plan; what
// the crew had typed into the form before leaving it (stashUnsaved) is put
// back over it.
func (l *logbookScreen) prepareStart(ctx app.Context) {
	l.start = l.startFromBrief(ctx)
	l.start.briefOriginElev, l.start.briefDestElev = l.start.originElev, l.start.destElev
	if kept, ok := l.session.takeStart(); ok {
		l.start = kept.over(l.start)
		l.status = "What you had typed for this transport is back in its fields; the plan kept with it is the Brief as it is now."
	}
}

// over returns fresh (the form as the Brief gives it now) with the fields
// the crew typed into f. An elevation the crew did not change from the
// Brief's follows the Brief; one they changed stays theirs. The messages
// are dropped: they are given again when the form is sent.
func (f startForm) over(fresh startForm) startForm {
	g := fresh
	g.vehicle, g.crew, g.origin, g.dest = f.vehicle, f.crew, f.origin, f.dest
	g.age, g.sex, g.weight, g.identifying, g.at = f.age, f.sex, f.weight, f.identifying, f.at
	if f.originElev != f.briefOriginElev {
		g.originElev = f.originElev
	}
	if f.destElev != f.briefDestElev {
		g.destElev = f.destElev
	}
	return g
}

// startFromBrief is the start form as the current Brief draft gives it.
func (l *logbookScreen) startFromBrief(ctx app.Context) startForm {
	f := startForm{}
	d, found, err := draftStoreFor(l.session).Load(ctx)
	if err != nil || !found {
		f.briefNote = "No Brief has been filled in: the transport starts without a plan snapshot."
		return f
	}
	m := buildBrief(d, l.units)
	if m.doc != nil {
		au := l.units.AltitudeUnit
		if e := m.doc.Route.OriginElevationFt; e != nil {
			f.originElev = lbAltitudeText(physio.Feet(*e), au)
		}
		if e := m.doc.Route.DestinationElevationFt; e != nil {
			f.destElev = lbAltitudeText(physio.Feet(*e), au)
		}
		f.cylinders = lbCylindersFromPlan(m.doc)
	}
	if !m.ok() {
		f.briefNote = "The Brief is not complete (" + strconv.Itoa(len(m.order)+len(m.other)) + " item(s) to fix): the transport starts without a plan snapshot. Fix the Brief first to keep one."
		return f
	}
	plan, err1 := json.Marshal(m.doc)
	result, err2 := json.Marshal(m.result)
	if err1 != nil || err2 != nil {
		f.briefNote = "The Brief could not be recorded: the transport starts without a plan snapshot."
		return f
	}
	f.snapshot = &logbook.Brief{Plan: plan, Result: result, EngineVersion: physio.EngineVersion}
	f.briefNote = "The current Brief (plan and result, engine " + physio.EngineVersion + ") is kept with the transport."
	return f
}

// lbCylindersFromPlan lists the Brief's cylinders, one per cylinder on board,
// labelled by kind and number (E1, E2, …).
func lbCylindersFromPlan(doc *physio.PlanDocument) []logbook.CylinderSpec {
	var out []logbook.CylinderSpec
	seen := map[string]int{}
	for _, s := range doc.Supply {
		n := 1
		if s.Count != nil && *s.Count > 0 {
			n = *s.Count
		}
		for i := 0; i < n && len(out) < 32; i++ {
			c := logbook.CylinderSpec{}
			base := s.Name
			switch {
			case s.Size != "":
				c.Size = string(s.Size)
				if base == "" {
					base = string(s.Size)
				}
			case s.WaterCapacityL != nil:
				c.WaterCapacity = physio.Litres(*s.WaterCapacityL)
				if base == "" {
					base = strconv.FormatFloat(*s.WaterCapacityL, 'f', -1, 64) + "L"
				}
			case s.LabelContentsL != nil && s.LabelPressureBar != nil:
				c.NominalContents = physio.Litres(*s.LabelContentsL)
				c.NominalPressure = physio.Bar(*s.LabelPressureBar)
				if base == "" {
					base = "cyl"
				}
			default:
				continue
			}
			seen[base]++
			c.Label = base + strconv.Itoa(seen[base])
			out = append(out, c)
		}
	}
	return out
}

var lbAgeBands = []choice{
	{"", "Not given"}, {string(logbook.AgeNeonate), "Neonate (< 28 days)"}, {string(logbook.AgeInfant), "Infant (< 1 year)"},
	{string(logbook.AgeChild), "Child (1–11)"}, {string(logbook.AgeAdolescent), "Adolescent (12–17)"},
	{string(logbook.AgeAdult), "Adult (18–64)"}, {string(logbook.AgeOlderAdult), "Older adult (65+)"},
}

var lbSexes = []choice{{"", "Not given"}, {string(logbook.SexFemale), "Female"}, {string(logbook.SexMale), "Male"}, {string(logbook.SexOther), "Other"}}

func lbSelectField(id, label, current string, options []choice, onPick func(ctx app.Context, v string)) app.UI {
	opts := make([]app.UI, 0, len(options))
	for _, o := range options {
		opts = append(opts, app.Option().Value(o.Value).Text(o.Label).Selected(o.Value == current))
	}
	return app.Div().Class("alv-field").Body(
		app.Label().For(id).Text(label),
		app.Select().ID(id).Class("alv-input").Body(opts...).
			OnChange(func(ctx app.Context, e app.Event) { onPick(ctx, ctx.JSSrc().Get("value").String()) }),
	)
}

func (l *logbookScreen) renderStart() app.UI {
	f := &l.start
	au := l.units.AltitudeUnit
	return app.Div().Class("lb-body").Body(
		l.nav(),
		app.Form().ID("lb-start").Class("alv-card").OnSubmit(l.startTransport).Body(
			app.H2().Class("alv-card-title").Text("Start transport"),
			app.P().ID("lb-start-brief").Class("alv-note").Text(f.briefNote),
			app.If(len(f.cylinders) > 0, func() app.UI {
				return app.P().Class("alv-note").Text("Cylinders on board: " + lbCylindersText(f.cylinders))
			}),
			app.Div().Class("lb-start-grid").Body(
				textField("lb-vehicle", "Vehicle or aircraft", f.vehicle, f.vehicleMsg, func(ctx app.Context, t string) { f.vehicle, f.vehicleMsg = t, "" }),
				textField("lb-crew", "Crew initials (space between)", f.crew, "", func(ctx app.Context, t string) { f.crew = t }),
				textField("lb-origin", "Origin", f.origin, "", func(ctx app.Context, t string) { f.origin = t }),
				numberField("lb-origin-elev", "Origin elevation", au, f.originElev, f.originMsg, func(ctx app.Context, t string) { f.originElev, f.originMsg = t, "" }),
				textField("lb-dest", "Destination", f.dest, "", func(ctx app.Context, t string) { f.dest = t }),
				numberField("lb-dest-elev", "Destination elevation", au, f.destElev, f.destMsg, func(ctx app.Context, t string) { f.destElev, f.destMsg = t, "" }),
			),
			app.FieldSet().Class("alv-fieldset").Body(
				app.Legend().Text("Patient (kept minimal)"),
				app.Div().Class("lb-start-grid").Body(
					lbSelectField("lb-age", "Age band", f.age, lbAgeBands, func(ctx app.Context, v string) { f.age = v }),
					lbSelectField("lb-sex", "Sex", f.sex, lbSexes, func(ctx app.Context, v string) { f.sex = v }),
					numberField("lb-weight", "Weight", "kg", f.weight, f.weightMsg, func(ctx app.Context, t string) { f.weight, f.weightMsg = t, "" }),
				),
				app.Div().Class("alv-field").Body(
					app.Label().For("lb-ident").Text("Identifying text (optional)"),
					app.Input().ID("lb-ident").Class("alv-input alv-input-text").Type("text").Attr("autocomplete", "off").
						Aria("describedby", "lb-ident-warn").Value(f.identifying).
						OnInput(func(ctx app.Context, e app.Event) { f.identifying = ctx.JSSrc().Get("value").String() }),
					app.P().ID("lb-ident-warn").Class("lb-ident-warn").Text("Stored encrypted, but it identifies the patient: anyone with the passphrase, and any auditor you send a bundle to, reads it. Leave it empty unless your service requires it."),
				),
			),
			textField("lb-start-at", "Opened at (hh:mm, 24-hour; blank = now)", f.at, f.atMsg, func(ctx app.Context, t string) { f.at, f.atMsg = t, "" }),
			app.Button().Type("submit").ID("lb-start-go").Class("alv-button alv-primary").Text("Start transport").Disabled(l.busy != ""),
		),
	)
}

// lbReadPlace reads a place's elevation in the display unit ("" = not
// given); which is "origin" or "destination", for the message.
func lbReadPlace(which, name, elev, unit string) (logbook.Place, string) {
	p := logbook.Place{Name: strings.TrimSpace(name)}
	if strings.TrimSpace(elev) == "" {
		return p, ""
	}
	a, err := physio.ParseAltitude(lbWithUnit(elev, unit))
	if err != nil {
		label := "Origin elevation"
		if which == "destination" {
			label = "Destination elevation"
		}
		return p, lbParseRefusal(label, "open."+which+".elevation_m", elev, err).Error()
	}
	p.Elevation, p.ElevationKnown = a, true
	return p, ""
}

func (l *logbookScreen) startTransport(ctx app.Context, e app.Event) {
	e.PreventDefault()
	f := &l.start
	au := l.units.AltitudeUnit
	origin, om := lbReadPlace("origin", f.origin, f.originElev, au)
	dest, dm := lbReadPlace("destination", f.dest, f.destElev, au)
	f.originMsg, f.destMsg = om, dm
	var weight float64
	if t := strings.TrimSpace(f.weight); t != "" {
		// A plain decimal, as every other field reads: strconv would take
		// "7e1", "0x1p6" or "Inf" as a weight without a word.
		w, ok := bareDecimal(t)
		if !ok {
			f.weightMsg = lbNotANumber("Weight", "open.patient.weight_kg", t)
		}
		weight = w.InexactFloat64()
	}
	if strings.TrimSpace(f.vehicle) == "" {
		f.vehicleMsg = "Name the vehicle or aircraft type."
	}
	now := l.now()
	at, given, err := lbEntryTime("Opened at", f.at, now, time.Time{})
	f.atMsg = ""
	if err != nil {
		f.atMsg = err.Error()
	}
	if om != "" || dm != "" || f.weightMsg != "" || f.vehicleMsg != "" || f.atMsg != "" {
		return
	}
	if given {
		now = at
	}
	id := logbook.NewTransportID(now)
	entry := &logbook.Entry{Transport: id, Kind: logbook.KindOpen, At: now, Open: &logbook.Opening{
		Vehicle:     strings.TrimSpace(f.vehicle),
		Crew:        strings.Fields(strings.ToUpper(f.crew)),
		Origin:      origin,
		Destination: dest,
		Patient: logbook.Patient{AgeBand: logbook.AgeBand(f.age), Sex: logbook.Sex(f.sex), WeightKg: weight,
			Identifying: strings.TrimSpace(f.identifying)},
		Brief:     f.snapshot,
		Cylinders: f.cylinders,
	}}
	l.record = recordState{id: id}
	l.save(ctx, "start of transport", func() (*logbook.Entry, error) { return entry, nil }, func() {
		l.start = startForm{}
		l.view = viewRecord
		if t := l.record.transport; t != nil && len(t.Cylinders) > 0 {
			l.record.gaugeCyl = t.Cylinders[0].Label
		}
	})
}
