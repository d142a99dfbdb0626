package ui

import (
	"fmt"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/physio"
)

// The Brief's form cards. Each is a child component that redraws itself
// when its own fields change; Rev (the form's revision) and Msgs (the
// messages of its fields) tell the Brief when it must redraw for another
// reason. Event handlers carry an EventScope naming the field (and the
// display unit), because go-app keeps a handler whose code is the same
// and would otherwise keep one bound to a field that moved.

// msgSig returns the messages of the fields whose id starts with prefix,
// so a card redraws when one of them changes.
func (s *briefState) msgSig(prefix string) string {
	var b strings.Builder
	for _, id := range s.model.order {
		if strings.HasPrefix(id, prefix) {
			b.WriteString(id)
			b.WriteByte('=')
			b.WriteString(s.model.msgs[id])
			b.WriteByte(';')
		}
	}
	return b.String()
}

// numField renders a labelled numeric input: the value as typed (or
// converted to the display unit), the unit always visible beside it, the
// message (allowed range and unit) under it, all tied to the input by
// aria-describedby. Each is its own component (briefNum); set is kept by
// field id, so a field that moves to another place in its card writes
// where its id says.
func (s *briefState) numField(id string, spec fieldSpec, e Entry, required bool, set func(Entry)) app.UI {
	disp := displayUnit(spec.Kind, s.settings, spec)
	stored := disp
	switch spec.Kind {
	case qFraction, qPercent, qMinutes, qTempC, qFlow, qPlain:
		stored = "" // one unit only: nothing to remember
	}
	text, note := shownText(spec, e, disp)
	label := spec.Label
	if !required {
		label += " (optional)"
	}
	if s.setters == nil {
		s.setters = map[string]func(Entry){}
	}
	s.setters[id] = set
	return &briefNum{ID: id, Label: label, Disp: disp, Stored: stored, Text: text, Note: note, Msg: s.model.msgs[id], s: s}
}

// briefNum is one numeric field of the Brief. A keystroke that changes no
// field's message redraws nothing of the form (see briefState.typed): the
// text is already on screen, and Text is kept up to date here.
type briefNum struct {
	app.Compo
	ID, Label, Disp, Stored, Text, Note, Msg string
	s                                        *briefState
}

func (c *briefNum) onInput(ctx app.Context, ev app.Event) {
	s := c.s
	t := ctx.JSSrc().Get("value").String()
	if set := s.setters[c.ID]; set != nil {
		set(Entry{T: t, U: c.Stored})
	}
	s.changed(ctx)
	// As typed, the text is shown as it is, with no conversion note.
	narrow := c.Note == ""
	c.Text, c.Note = t, ""
	if narrow {
		s.typed(ctx)
	}
}

// OnUpdate writes the text onto the input when the form sets it (a
// loaded draft, other units): a keystroke that redrew nothing left
// go-app's copy of the value behind the screen's, so go-app's own
// comparison could skip it.
func (c *briefNum) OnUpdate(ctx app.Context) {
	if !app.IsClient {
		return
	}
	if el := app.Window().GetElementByID(c.ID); el.Truthy() && el.Get("value").String() != c.Text {
		el.Set("value", c.Text)
	}
}

func (c *briefNum) Render() app.UI {
	id, msg, note := c.ID, c.Msg, c.Note
	unitID, msgID, noteID := id+"-unit", id+"-msg", id+"-note"
	desc := unitID
	if msg != "" {
		desc += " " + msgID
	}
	if note != "" {
		desc += " " + noteID
	}
	input := app.Input().ID(id).Class("alv-input").Type("text").
		Attr("inputmode", "decimal").Attr("autocomplete", "off").Attr("spellcheck", "false").
		Value(c.Text).Aria("invalid", msg != "").Aria("describedby", desc).
		OnInput(c.onInput, app.EventScope(id, c.Stored))
	return app.Div().Class("alv-field b-field").Body(
		app.Label().For(id).Text(c.Label),
		app.Div().Class("alv-input-row").Body(
			input,
			app.Span().ID(unitID).Class("alv-unit").Text(c.Disp),
		),
		app.If(note != "", func() app.UI { return app.P().ID(noteID).Class("alv-note b-note").Text(note) }),
		app.If(msg != "", func() app.UI { return app.P().ID(msgID).Class("alv-error").Text(msg) }),
	)
}

// choiceGroup renders a one-of-many choice as toggle buttons (at least
// 44 px), the chosen one aria-pressed, with its message when one is due.
// Buttons get the id prefix + "-" + value.
func (s *briefState) choiceGroup(id, legend, current string, options []choice, pick func(string)) app.UI {
	msg := s.model.msgs[id]
	buttons := make([]app.UI, 0, len(options))
	for _, o := range options {
		v := o.Value
		buttons = append(buttons, app.Button().ID(id+"-"+v).Type("button").Class("alv-seg-btn").
			Aria("pressed", v == current).Text(o.Label).
			OnClick(func(ctx app.Context, e app.Event) {
				pick(v)
				s.restructured(ctx)
			}, app.EventScope(id, v)))
	}
	fs := app.FieldSet().ID(id).Class("alv-fieldset b-choice")
	if msg != "" {
		fs = fs.Aria("describedby", id+"-msg")
	}
	return fs.Body(
		app.Legend().Text(legend),
		app.Div().Class("alv-seg").Body(buttons...),
		app.If(msg != "", func() app.UI { return app.P().ID(id + "-msg").Class("alv-error").Text(msg) }),
	)
}

// selectField renders a labelled <select>.
func (s *briefState) selectField(id, label, current string, options []choice, pick func(string)) app.UI {
	msg := s.model.msgs[id]
	opts := make([]app.UI, 0, len(options)+1)
	if current == "" {
		opts = append(opts, app.Option().Value("").Selected(true).Text("Choose…"))
	}
	for _, o := range options {
		opts = append(opts, app.Option().Value(o.Value).Selected(o.Value == current).Text(o.Label))
	}
	sel := app.Select().ID(id).Class("alv-input b-select").Aria("invalid", msg != "").
		OnChange(func(ctx app.Context, e app.Event) {
			pick(ctx.JSSrc().Get("value").String())
			s.restructured(ctx)
		}, app.EventScope(id))
	if msg != "" {
		sel = sel.Aria("describedby", id+"-msg")
	}
	return app.Div().Class("alv-field b-field").Body(
		app.Label().For(id).Text(label),
		sel.Body(opts...),
		app.If(msg != "", func() app.UI { return app.P().ID(id + "-msg").Class("alv-error").Text(msg) }),
	)
}

// ---- Route and aircraft ----

type briefRoute struct {
	app.Compo
	Rev  int
	Msgs string
	s    *briefState
}

func (c *briefRoute) Render() app.UI {
	s := c.s
	r := &s.draft.Route
	return app.Div().Class("alv-card b-card").ID("b-route").Body(
		app.H2().Class("alv-card-title").Text("Route and aircraft"),
		app.Div().Class("b-row").Body(
			s.numField(fidOrigin, specOrigin, r.Origin, true, func(e Entry) { r.Origin = e }),
			s.numField(fidDestination, specDestination, r.Destination, true, func(e Entry) { r.Destination = e }),
		),
		s.choiceGroup(fidCabinMode, "Aircraft cabin", r.Cabin, []choice{
			{CabinUnpressurised, "Unpressurised"}, {CabinPressurised, "Pressurised"}, {CabinStated, "Cabin altitude given"},
		}, func(v string) { r.Cabin = v }),
		app.Div().Class("b-row").Body(
			app.If(r.Cabin != "", func() app.UI {
				return s.numField(fidCruise, specCruise, r.Cruise, r.Cabin != CabinStated, func(e Entry) { r.Cruise = e })
			}),
			app.If(r.Cabin == CabinPressurised, func() app.UI {
				return s.numField(fidDiff, specDiff, r.Differential, true, func(e Entry) { r.Differential = e })
			}),
			app.If(r.Cabin == CabinStated, func() app.UI {
				return s.numField(fidCabin, specCabin, r.CabinAltitude, true, func(e Entry) { r.CabinAltitude = e })
			}),
		),
	)
}

// ---- Legs ----

type briefLegs struct {
	app.Compo
	Rev  int
	Msgs string
	s    *briefState
}

var whereChoices = []choice{
	{physio.WhereOrigin, "Ground at origin"}, {physio.WhereCabin, "In flight"}, {physio.WhereDestination, "Ground at destination"},
}

// deviceNames are the set-ups a leg can use, as the crew reads them.
var deviceNames = []choice{
	{string(physio.RoomAir), "Room air (no oxygen)"},
	{string(physio.NasalCannula), "Nasal cannula"},
	{string(physio.SimpleMask), "Simple face mask"},
	{string(physio.NonRebreather), "Non-rebreather mask"},
	{string(physio.Venturi), "Venturi mask"},
	{string(physio.Blender), "Air-oxygen blender"},
	{string(physio.HighFlow), "High-flow nasal cannula"},
	{string(physio.Ventilator), "Ventilator"},
}

func deviceName(d physio.Device) string {
	for _, c := range deviceNames {
		if c.Value == string(d) {
			return c.Label
		}
	}
	return string(d)
}

func (c *briefLegs) Render() app.UI {
	s := c.s
	legs := make([]app.UI, 0, len(s.draft.Legs))
	for i := range s.draft.Legs {
		legs = append(legs, c.leg(i))
	}
	msg := s.model.msgs[fidLegsList]
	return app.Div().Class("alv-card b-card").ID("b-legs").Body(
		app.H2().Class("alv-card-title").Text("Legs"),
		app.P().Class("alv-note").Text("Each stage of the transport, in order, with the oxygen set-up used on it."),
		app.Div().Body(legs...),
		app.If(msg != "", func() app.UI { return app.P().ID(fidLegsList + "-msg").Class("alv-error").Text(msg) }),
		app.Button().ID("b-leg-add").Type("button").Class("alv-button").Text("Add a leg").
			OnClick(func(ctx app.Context, e app.Event) {
				if len(s.draft.Legs) >= 50 {
					return
				}
				s.draft.Legs = append(s.draft.Legs, LegDraft{Where: physio.WhereCabin})
				s.restructured(ctx)
			}, app.EventScope("b-leg-add")),
	)
}

func (c *briefLegs) leg(i int) app.UI {
	s := c.s
	l := &s.draft.Legs[i]
	dev := physio.Device(l.Device)
	fields := []app.UI{
		s.numField(legID(i, "min"), specMinutes, l.Minutes, true, func(e Entry) { s.draft.Legs[i].Minutes = e }),
		s.selectField(legID(i, "device"), "Oxygen set-up", l.Device, deviceNames, func(v string) { s.draft.Legs[i].Device = v }),
	}
	switch dev {
	case physio.NasalCannula, physio.SimpleMask, physio.NonRebreather, physio.Blender, physio.HighFlow, physio.Venturi:
		fields = append(fields, s.numField(legID(i, "flow"), flowSpec(dev), l.Flow, true, func(e Entry) { s.draft.Legs[i].Flow = e }))
	}
	var extra app.UI
	switch dev {
	case physio.Venturi:
		opts := make([]choice, 0, len(physio.VenturiSettings))
		for _, v := range physio.VenturiSettings {
			t := fmtNum(v.Value())
			min, _ := physio.VenturiMinimumFlow(v)
			opts = append(opts, choice{t, fmt.Sprintf("%s (≥ %s L/min)", t, fmtNum(min.LitresPerMinute()))})
		}
		extra = s.choiceGroup(legID(i, "fio2"), "Venturi valve (FiO2, and its minimum oxygen flow)", strings.TrimSpace(l.FiO2.T), opts,
			func(v string) { s.draft.Legs[i].FiO2 = Entry{T: v} })
	case physio.Blender, physio.HighFlow:
		fields = append(fields, s.numField(legID(i, "fio2"), specLegFiO2, l.FiO2, true, func(e Entry) { s.draft.Legs[i].FiO2 = e }))
	case physio.Ventilator:
		fields = append(fields,
			s.numField(legID(i, "mv"), specMinuteVol, l.MinuteVolume, true, func(e Entry) { s.draft.Legs[i].MinuteVolume = e }),
			s.numField(legID(i, "fio2"), specLegFiO2, l.FiO2, true, func(e Entry) { s.draft.Legs[i].FiO2 = e }),
			s.numField(legID(i, "bias"), specBias, l.BiasFlow, false, func(e Entry) { s.draft.Legs[i].BiasFlow = e }),
			s.numField(legID(i, "leak"), specLeak, l.Leak, false, func(e Entry) { s.draft.Legs[i].Leak = e }),
			s.numField(legID(i, "drivegas"), specDriveGas, l.DriveGas, false, func(e Entry) { s.draft.Legs[i].DriveGas = e }),
		)
		extra = s.choiceGroup(legID(i, "drive"), "Ventilator FiO2 made by", l.Drive, []choice{
			{string(physio.DriveBlending), "Blending air"}, {string(physio.DriveOxygen), "Oxygen drive"},
		}, func(v string) { s.draft.Legs[i].Drive = v })
	}
	title := fmt.Sprintf("Leg %d", i+1)
	return app.FieldSet().Class("b-leg").ID(legID(i, "box")).Body(
		app.Legend().Class("b-leg-title").Text(title),
		s.choiceGroup(legID(i, "where"), "Where", l.Where, whereChoices, func(v string) { s.draft.Legs[i].Where = v }),
		app.Div().Class("b-row").Body(fields...),
		app.If(extra != nil, func() app.UI { return extra }),
		app.Button().ID(legID(i, "remove")).Type("button").Class("alv-button b-remove").
			Aria("label", "Remove "+strings.ToLower(title[:1])+title[1:]).Text("Remove leg").
			OnClick(func(ctx app.Context, e app.Event) {
				if i >= len(s.draft.Legs) {
					return
				}
				s.draft.Legs = append(s.draft.Legs[:i:i], s.draft.Legs[i+1:]...)
				s.restructured(ctx)
			}, app.EventScope(legID(i, "remove"))),
	)
}

// ---- Patient ----

type briefPatient struct {
	app.Compo
	Rev  int
	Msgs string
	Note string // values kept in memory only: why, and how to keep them
	s    *briefState
}

func (c *briefPatient) Render() app.UI {
	s := c.s
	p := &s.draft.Patient
	return app.Div().Class("alv-card b-card").ID("b-patient").Body(
		app.H2().Class("alv-card-title").Text("Patient on the ground"),
		app.P().Class("alv-note").Text("PaO2 and/or SpO2, with the FiO2 the patient breathed when they were measured."),
		app.If(c.Note != "", func() app.UI {
			return app.P().ID("b-pt-kept").Class("alv-note b-pt-kept").Attr("role", "status").Text(c.Note)
		}),
		app.Div().Class("b-row").Body(
			s.numField(fidPtFiO2, specPtFiO2, p.FiO2, true, func(e Entry) { p.FiO2 = e }),
			s.numField(fidPaO2, specPaO2, p.PaO2, false, func(e Entry) { p.PaO2 = e }),
			s.numField(fidSpO2, specSpO2, p.SpO2, false, func(e Entry) { p.SpO2 = e }),
			s.numField(fidPaCO2, specPaCO2, p.PaCO2, false, func(e Entry) { p.PaCO2 = e }),
			s.numField(fidRQ, specRQ, p.RQ, false, func(e Entry) { p.RQ = e }),
			s.numField(fidTemp, specTemp, p.Temperature, false, func(e Entry) { p.Temperature = e }),
			s.numField(fidHb, specHb, p.Hb, false, func(e Entry) { p.Hb = e }),
			s.numField(fidAge, specAge, p.Age, false, func(e Entry) { p.Age = e }),
		),
		s.choiceGroup("b-pt-at", "Measured at", p.MeasuredAt, []choice{
			{physio.WhereOrigin, "Origin field"}, {physio.WhereDestination, "Destination field"},
		}, func(v string) { p.MeasuredAt = v }),
	)
}

// ---- Cylinders on board ----

type briefSupply struct {
	app.Compo
	Rev  int
	Msgs string
	s    *briefState
}

// supplyChoices lists the built-in sizes and the Settings catalogue.
func (s *briefState) supplyChoices() []choice {
	out := make([]choice, 0, len(builtInSizes)+len(s.settings.Cylinders)+1)
	for _, size := range builtInSizes {
		f, err := physio.CylinderFactor(size)
		if err != nil {
			continue
		}
		out = append(out, choice{string(size), fmt.Sprintf("%s cylinder (factor %s L/psi)", size, fmtNum(f))})
	}
	for _, c := range s.settings.Cylinders {
		out = append(out, choice{catalogueKind + c.Name, fmt.Sprintf("%s (%s L water capacity)", c.Name, c.WaterCapacity)})
	}
	out = append(out, choice{SupplyWaterCapacity, "Other: by water capacity"})
	return out
}

func (c *briefSupply) Render() app.UI {
	s := c.s
	choices := s.supplyChoices()
	lines := make([]app.UI, 0, len(s.draft.Supply))
	for i := range s.draft.Supply {
		i := i
		l := &s.draft.Supply[i]
		spec := fieldSpec{Label: "Gauge reading", Kind: qGauge}
		fields := []app.UI{
			s.selectField(supplyID(i, "kind"), "Cylinder", l.Kind, choices, func(v string) { s.draft.Supply[i].Kind = v }),
		}
		if l.Kind == SupplyWaterCapacity {
			fields = append(fields, s.numField(supplyID(i, "wc"), specWaterCap, l.WaterCapacity, true, func(e Entry) { s.draft.Supply[i].WaterCapacity = e }))
		}
		fields = append(fields,
			s.numField(supplyID(i, "pressure"), spec, l.Pressure, true, func(e Entry) { s.draft.Supply[i].Pressure = e }),
			s.numField(supplyID(i, "count"), specCount, l.Count, true, func(e Entry) { s.draft.Supply[i].Count = e }),
		)
		lines = append(lines, app.FieldSet().Class("b-leg b-supply").ID(supplyID(i, "box")).Body(
			app.Legend().Class("b-leg-title").Text(fmt.Sprintf("Cylinder line %d", i+1)),
			app.Div().Class("b-row").Body(fields...),
			app.Button().ID(supplyID(i, "remove")).Type("button").Class("alv-button b-remove").
				Aria("label", fmt.Sprintf("Remove cylinder line %d", i+1)).Text("Remove line").
				OnClick(func(ctx app.Context, e app.Event) {
					if i >= len(s.draft.Supply) {
						return
					}
					s.draft.Supply = append(s.draft.Supply[:i:i], s.draft.Supply[i+1:]...)
					s.restructured(ctx)
				}, app.EventScope(supplyID(i, "remove"))),
		))
	}
	return app.Div().Class("alv-card b-card").ID("b-supply").Body(
		app.H2().Class("alv-card-title").Text("Cylinders on board"),
		app.P().Class("alv-note").Text("Used in this order, each down to the safe residual. Add your own cylinders in Settings."),
		app.Div().Body(lines...),
		app.Button().ID("b-sup-add").Type("button").Class("alv-button").Text("Add a cylinder line").
			OnClick(func(ctx app.Context, e app.Event) {
				if len(s.draft.Supply) >= 20 {
					return
				}
				s.draft.Supply = append(s.draft.Supply, SupplyDraft{Kind: "E", Count: Entry{T: "1"}})
				s.restructured(ctx)
			}, app.EventScope("b-sup-add")),
	)
}

// ---- Reserve policy ----

type briefPolicy struct {
	app.Compo
	Rev  int
	Msgs string
	s    *briefState
}

func (c *briefPolicy) Render() app.UI {
	s := c.s
	p := &s.draft.Policy
	st := s.settings
	mode := "settings"
	if p.Override {
		mode = "own"
	}
	return app.Div().Class("alv-card b-card").ID("b-policy").Body(
		app.H2().Class("alv-card-title").Text("Reserve policy"),
		s.choiceGroup("b-pol-mode", "Policy for this transport", mode, []choice{
			{"settings", "From Settings"}, {"own", "Own for this transport"},
		}, func(v string) {
			if v == "own" && !p.Override {
				// Start from the Settings values, in their own units.
				p.Residual = Entry{T: st.SafeResidual, U: st.SafeResidualUnit}
				p.Factor = Entry{T: st.ReserveFactor}
				p.Minutes = Entry{T: st.ReserveMinutes}
				p.SpO2Target = Entry{T: st.SpO2Target}
			}
			p.Override = v == "own"
		}),
		app.If(!p.Override, func() app.UI {
			return app.Dl().Class("b-policy-list").ID("b-pol-settings").Body(
				app.Dt().Text("Safe residual"), app.Dd().Text(st.SafeResidualShown()+" "+st.PressureUnit),
				app.Dt().Text("Reserve factor"), app.Dd().Text(st.ReserveFactor+" ×"),
				app.Dt().Text("Added reserve time"), app.Dd().Text(st.ReserveMinutes+" min"),
				app.Dt().Text("SpO2 target"), app.Dd().Text(st.SpO2Target+" %"),
			)
		}).Else(func() app.UI {
			return app.Div().Class("b-row").Body(
				s.numField(fidResidual, specResidual, p.Residual, true, func(e Entry) { p.Residual = e }),
				s.numField(fidFactor, specFactor, p.Factor, true, func(e Entry) { p.Factor = e }),
				s.numField(fidResMinutes, specResMinutes, p.Minutes, true, func(e Entry) { p.Minutes = e }),
				s.numField(fidSpO2Target, specSpO2Target, p.SpO2Target, true, func(e Entry) { p.SpO2Target = e }),
			)
		}),
	)
}
