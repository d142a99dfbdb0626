package ui

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/physio"
)

// briefResult is the Brief's result area. With any field invalid it shows
// what to fix and no number at all; otherwise the go / no-go summary, the
// warnings and every figure of the plan, each with its "How".
type briefResult struct {
	app.Compo
	Rev int
	s   *briefState
}

// Status texts of the summary line.
var statusText = map[string]string{
	physio.StatusGo:      "GO: nothing found against the plan",
	physio.StatusCaution: "GO, WITH CAUTIONS: read them below",
	physio.StatusNoGo:    "NO-GO: the plan as written does not hold",
}

// OnMount and OnDismount keep the panel's context, so a keystroke can
// flag the panel alone for an update (see briefState.typed).
func (c *briefResult) OnMount(ctx app.Context) { c.s.resultCtx, c.s.resultUp = ctx, true }
func (c *briefResult) OnDismount()             { c.s.resultUp = false }

func (c *briefResult) Render() app.UI {
	s := c.s
	m := s.model
	body := []app.UI{app.H2().Class("alv-card-title").ID("b-result-title").Text("Plan")}
	if !m.ok() {
		body = append(body, s.fixList())
	} else {
		body = append(body, s.summary(m.result)...)
	}
	return app.Section().ID("b-result").Class("alv-card b-result").Aria("labelledby", "b-result-title").Body(body...)
}

// fixList says what to fix; it never shows a number computed from the form.
func (s *briefState) fixList() app.UI {
	m := s.model
	items := make([]app.UI, 0, len(m.order)+len(m.other))
	for _, id := range m.order {
		id := id
		where := m.labels[id]
		text := m.msgs[id]
		if where != "" {
			text = where + ": " + text
		}
		items = append(items, app.Li().Body(
			app.Button().Type("button").Class("b-fix-link").Text(text).
				OnClick(func(ctx app.Context, e app.Event) {
					el := app.Window().GetElementByID(id)
					if el.Truthy() {
						el.Call("focus")
					}
				}, app.EventScope("fix", id)),
		))
	}
	for _, o := range m.other {
		items = append(items, app.Li().Text(o))
	}
	return app.Div().ID("b-fix").Class("b-fix").Body(
		app.P().ID("b-status").Class("b-status").DataSet("status", "incomplete").Attr("role", "status").
			Text(fmt.Sprintf("No plan yet: %d thing(s) to fix or fill in.", len(items))),
		app.P().Text("The plan appears when every field is valid. Tap an item to go to its field."),
		app.Ul().Class("b-fix-list").Body(items...),
	)
}

func (s *briefState) summary(r *physio.PlanResult) []app.UI {
	out := []app.UI{
		app.P().ID("b-status").Class("b-status").DataSet("status", r.Status).Attr("role", "status").Text(statusText[r.Status]),
	}
	// Key figures.
	figs := []app.UI{}
	if r.CabinAltitudeFt != nil {
		figs = append(figs, s.fig("b-r-cabin", "Cabin altitude", r.Explain["cabin_altitude_ft"]))
	}
	figs = append(figs,
		s.fig("b-r-highest", "Highest altitude", r.Explain["highest_altitude_ft"]),
		s.fig("b-r-fio2", "FiO2 needed (highest leg)", r.Explain["fio2_needed"]),
		s.fig("b-r-need", "Oxygen needed with reserve", r.Explain["oxygen_needed_l"]),
		s.fig("b-r-usable", "Usable oxygen on board", r.Explain["oxygen_usable_l"]),
		s.fig("b-r-margin", "Margin", r.Explain["oxygen_margin_l"]),
		s.fig("b-r-calc", "Oxygen for the legs (no reserve)", r.Explain["oxygen_calculated_l"]),
		s.fig("b-r-maxcabin", "FiO2 1.0 holds the ground state up to", r.Explain["max_cabin_altitude_ft"]),
	)
	if r.MaxCruiseAltitudeFt != nil {
		label := "Highest cruise for that cabin"
		if r.MaxCruiseAtCeiling {
			label += " (no limit below the model's ceiling)"
		}
		figs = append(figs, s.fig("b-r-maxcruise", label, r.Explain["max_cruise_altitude_ft"]))
	}
	if r.SupplyExhaustedMin != nil {
		figs = append(figs, s.fig("b-r-exhausted", "Supply reaches the residual at minute", r.Explain["supply_exhausted_minute"]))
	}
	out = append(out, app.Div().Class("b-figs b-key").Body(figs...))

	// Warnings.
	if len(r.Warnings) > 0 {
		items := make([]app.UI, 0, len(r.Warnings))
		for _, w := range r.Warnings {
			items = append(items, app.Li().Class("b-warn").DataSet("severity", w.Severity).DataSet("code", w.Code).Body(
				app.Span().Class("b-sev").Text(severityText(w.Severity)),
				app.Text(" "+w.Message),
			))
		}
		out = append(out, app.H3().Text("Warnings"), app.Ul().ID("b-warnings").Class("b-warnings").Body(items...))
	}

	// Legs.
	legs := make([]app.UI, 0, len(r.Legs))
	for i, l := range r.Legs {
		legs = append(legs, &briefLegPart{I: i, Key: s.legKey(i, l), s: s})
	}
	out = append(out, app.H3().Text("Legs"), app.Div().Class("b-legs-result").Body(legs...))

	// Ground state.
	out = append(out, &briefPart{Name: partGround, Key: s.partKey(partGround, r), s: s})

	// Cylinders.
	if len(r.Cylinders) > 0 {
		rows := make([]app.UI, 0, len(r.Cylinders))
		for _, cy := range r.Cylinders {
			rows = append(rows, app.Tr().Body(
				app.Th().Scope("row").Text(fmt.Sprintf("%d. %s", cy.Order, cy.Name)),
				app.Td().Class("alv-num-cell").Body(s.inline(fmt.Sprintf("b-r-cyl%d-usable", cy.Order), "usable", cy.Explain["usable_l"])),
				app.Td().Class("alv-num-cell").Text(minuteText(cy.StartMinute)),
				app.Td().Class("alv-num-cell").Text(changeText(cy, r)),
			))
		}
		out = append(out, app.H3().Text("Cylinders in order of use"), app.Table().Class("alv-table b-cyl-table").Body(
			app.THead().Body(app.Tr().Body(
				app.Th().Scope("col").Text("Cylinder"), app.Th().Scope("col").Text("Usable"),
				app.Th().Scope("col").Text("Opened"), app.Th().Scope("col").Text("At the residual"),
			)),
			app.TBody().Body(rows...),
		))
	}

	// Trapped gas, and the assumptions.
	out = append(out,
		&briefPart{Name: partGas, Key: s.partKey(partGas, r), s: s},
		&briefPart{Name: partAssume, Key: s.partKey(partAssume, r), s: s},
	)
	out = append(out, app.P().Class("alv-note b-plan-caution").Text(r.Caution))
	return out
}

// Parts of the result panel that one keystroke seldom changes.
const (
	partGround = "ground" // the patient on the ground
	partGas    = "gas"    // trapped gas
	partAssume = "assume" // defaults and method assumptions
)

// briefPart is such a part as its own component: Key is everything it
// shows, as text, so an unchanged part is passed over. Render reads the
// part from the current plan.
type briefPart struct {
	app.Compo
	Name, Key string
	s         *briefState
}

func (c *briefPart) Render() app.UI {
	s, r := c.s, c.s.model.result
	if r == nil {
		return app.Div()
	}
	body := []app.UI{}
	switch c.Name {
	case partGround:
		figs := make([]app.UI, 0, 7)
		for _, f := range s.partFigs(partGround, r) {
			figs = append(figs, s.fig(f.id, f.label, f.f))
		}
		body = append(body, app.H3().Text("Patient on the ground ("+r.Ground.MeasuredAt+")"), app.Div().Class("b-figs").Body(figs...))
	case partGas:
		figs := make([]app.UI, 0, 4)
		for _, f := range s.partFigs(partGas, r) {
			figs = append(figs, s.fig(f.id, f.label, f.f))
		}
		body = append(body, app.H3().Text("Trapped gas, origin to highest altitude"),
			app.Div().Class("b-figs").Body(figs...),
			app.P().Class("alv-note").Text(r.TrappedGas.Caution),
		)
	case partAssume:
		if len(r.Assumptions) > 0 {
			items := make([]app.UI, 0, len(r.Assumptions))
			for _, a := range r.Assumptions {
				items = append(items, app.Li().Text(a.Path+" = "+a.Value+": "+a.Reason))
			}
			body = append(body, app.Details().Class("alv-how b-assume").Body(
				app.Summary().Text("Defaults and method assumptions ("+strconv.Itoa(len(items))+")"),
				app.Ul().Body(items...),
			))
		}
	}
	return app.Div().Class("b-part").Body(body...)
}

// partFig is one figure of a part: its id, label and figure.
type partFig struct {
	id, label string
	f         physio.Figure
}

func (s *briefState) partFigs(name string, r *physio.PlanResult) []partFig {
	switch name {
	case partGround:
		g := r.Ground
		out := []partFig{{"b-r-g-pao2a", "PAO2 (alveolar)", g.Explain["pao2_alveolar_mmhg"]}}
		if f, ok := g.Explain["pao2_arterial_mmhg"]; ok {
			out = append(out, partFig{"b-r-g-pao2", "PaO2 from SpO2", f})
		}
		if f, ok := g.Explain["spo2_percent"]; ok {
			out = append(out, partFig{"b-r-g-spo2", "SpO2 from PaO2", f})
		}
		out = append(out,
			partFig{"b-r-g-aa", "a/A ratio", g.Explain["aa_ratio"]},
			partFig{"b-r-g-grad", "A-a gradient", g.Explain["aa_gradient_mmhg"]},
		)
		if f, ok := g.Explain["expected_aa_gradient_mmhg"]; ok {
			out = append(out, partFig{"b-r-g-gradexp", "Upper normal A-a gradient for age", f})
		}
		if f, ok := g.Explain["cao2_ml_dl"]; ok {
			out = append(out, partFig{"b-r-g-cao2", "Oxygen content", f})
		}
		return out
	case partGas:
		tg := r.TrappedGas
		return []partFig{
			{"b-r-tg-ratio", "Expansion ratio", tg.Explain["ratio"]},
			{"b-r-tg-cuff", "A " + tg.CuffMl.String() + " mL air pocket becomes", tg.Explain["cuff_at_altitude_ml"]},
			{"b-r-tg-ptx", "A " + tg.PneumothoraxMl.String() + " mL pneumothorax becomes", tg.Explain["pneumothorax_at_altitude_ml"]},
			{"b-r-tg-rigid", "Sealed rigid space: overpressure up to", tg.Explain["rigid_overpressure_cmh2o"]},
		}
	}
	return nil
}

// partKey writes out everything a part shows.
func (s *briefState) partKey(name string, r *physio.PlanResult) string {
	var b strings.Builder
	switch name {
	case partGround:
		b.WriteString(r.Ground.MeasuredAt)
	case partGas:
		b.WriteString(r.TrappedGas.Caution)
	case partAssume:
		for _, a := range r.Assumptions {
			b.WriteString(a.Path + "=" + a.Value + ":" + a.Reason + "|")
		}
		return b.String()
	}
	for _, f := range s.partFigs(name, r) {
		num, unit, note := s.shownFigure(f.f)
		b.WriteString("|" + f.id + " " + f.label + " " + num + " " + unit + " " + note)
		if s.open[f.id+"-how"] {
			b.WriteString(" open " + strconv.Itoa(s.rev)) // an open "How" shows the inputs: redraw
		}
	}
	return b.String()
}

// briefLegPart is one leg of the result panel as its own component. Key
// is everything the leg shows, as text; a leg whose Key is unchanged (the
// other legs, when one leg's figures change) is passed over. Render reads
// the leg from the current plan.
type briefLegPart struct {
	app.Compo
	I   int
	Key string
	s   *briefState
}

func (c *briefLegPart) Render() app.UI {
	r := c.s.model.result
	if r == nil || c.I >= len(r.Legs) {
		return app.Div().Class("b-leg-result")
	}
	return c.s.legResult(c.I, r.Legs[c.I])
}

// legFig is one figure of a leg's result: what it is (the end of its id),
// its label, and its key in the leg's Explain.
type legFig struct{ what, label, key string }

var legFigs = []legFig{
	{"alt", "Altitude", "altitude_ft"},
	{"pb", "Barometric pressure", "pressure_mmhg"},
	{"fio2", "FiO2 needed", "fio2_needed"},
	{"fio2low", "FiO2 of the set-up (low end)", "fio2_delivered_low"},
	{"pao2a", "PAO2 at the set-up", "pao2_mmhg"},
	{"pao2", "PaO2 expected", "pao2_expected_mmhg"},
	{"spo2", "SpO2 expected", "spo2_expected_percent"},
	{"lpm", "Oxygen flow", "oxygen_lpm"},
	{"litres", "Oxygen for the leg", "oxygen_l"},
}

// legTitle is the heading of a leg's result.
func legTitle(i int, l physio.PlanLegResult) string {
	return "Leg " + strconv.Itoa(i+1) + " · " + whereText(l.Where) + " · " + l.Minutes.String() + " min · " + deviceName(l.Device)
}

// legKey writes out everything the leg's result shows: its title, each
// figure as shown (number, unit, note, "How" open), the verdict and the
// options.
func (s *briefState) legKey(i int, l physio.PlanLegResult) string {
	var b strings.Builder
	b.WriteString(legTitle(i, l))
	pre := legResultID(i, "")
	fig := func(what, key string) {
		f, ok := l.Explain[key]
		if !ok {
			b.WriteString("|-")
			return
		}
		num, unit, note := s.shownFigure(f)
		b.WriteByte('|')
		b.WriteString(num)
		b.WriteByte(' ')
		b.WriteString(unit)
		b.WriteByte(' ')
		b.WriteString(note)
		if s.open[pre+what+"-how"] {
			b.WriteString(" open ")
			b.WriteString(strconv.Itoa(s.rev)) // an open "How" shows the inputs: redraw
		}
	}
	for _, lf := range legFigs {
		fig(lf.what, lf.key)
	}
	fig("cao2", "cao2_expected_ml_dl")
	b.WriteString("|")
	b.WriteString(strconv.FormatBool(l.FiO2Possible))
	b.WriteString(strconv.FormatBool(l.Delivers))
	b.WriteString(l.FiO2Needed.String())
	for _, o := range l.Options {
		b.WriteByte('|')
		b.WriteString(optionText(o))
	}
	return b.String()
}

func legResultID(i int, what string) string { return "b-r-leg" + strconv.Itoa(i) + "-" + what }

func (s *briefState) legResult(i int, l physio.PlanLegResult) app.UI {
	id := func(what string) string { return legResultID(i, what) }
	title := legTitle(i, l)
	figs := make([]app.UI, 0, len(legFigs)+1)
	for _, lf := range legFigs {
		figs = append(figs, s.fig(id(lf.what), lf.label, l.Explain[lf.key]))
	}
	if f, ok := l.Explain["cao2_expected_ml_dl"]; ok {
		figs = append(figs, s.fig(id("cao2"), "Oxygen content expected", f))
	}
	verdict := "The set-up covers the FiO2 needed."
	cls := "b-verdict b-ok"
	switch {
	case !l.FiO2Possible:
		verdict, cls = "Even FiO2 1.0 cannot hold the ground state on this leg.", "b-verdict b-bad"
	case !l.Delivers:
		verdict, cls = "The set-up may deliver less FiO2 than needed.", "b-verdict b-bad"
	}
	body := []app.UI{
		app.H4().Class("b-leg-title").Text(title),
		app.Div().Class("b-figs b-small").Body(figs...),
		app.P().ID(id("verdict")).Class(cls).Text(verdict),
	}
	if len(l.Options) > 0 {
		opts := make([]app.UI, 0, len(l.Options))
		for _, o := range l.Options {
			opts = append(opts, app.Li().Text(optionText(o)))
		}
		body = append(body,
			app.P().Class("b-options-title").Text("Options that would deliver FiO2 "+l.FiO2Needed.String()+" — options, not orders; local protocol and medical direction decide:"),
			app.Ul().ID(id("options")).Class("b-options").Body(opts...),
		)
	}
	return app.Div().Class("b-leg-result").ID(id("box")).Body(body...)
}

func optionText(o physio.PlanOption) string {
	fio2 := o.FiO2Low.String()
	if o.FiO2High.Cmp(o.FiO2Low.Decimal) != 0 {
		fio2 += " to " + o.FiO2High.String()
	}
	t := fmt.Sprintf("%s at %s L/min oxygen", deviceName(o.Device), o.OxygenLpm)
	if o.TotalLpm.Cmp(o.OxygenLpm.Decimal) != 0 {
		t += fmt.Sprintf(", %s L/min total", o.TotalLpm)
	}
	return t + " (FiO2 " + fio2 + ")"
}

func whereText(w string) string {
	for _, c := range whereChoices {
		if c.Value == w {
			return c.Label
		}
	}
	return w
}

func severityText(sev string) string {
	switch sev {
	case physio.SeverityNoGo:
		return "NO-GO"
	case physio.SeverityCaution:
		return "CAUTION"
	}
	return "NOTE"
}

func minuteText(n *physio.Number) string {
	if n == nil {
		return "—"
	}
	return "minute " + n.String()
}

func changeText(cy physio.PlanCylinderResult, r *physio.PlanResult) string {
	if cy.ChangeMinute == nil {
		return "not during the transport"
	}
	t := "minute " + cy.ChangeMinute.String()
	if cy.ChangeLeg != nil && *cy.ChangeLeg >= 0 && *cy.ChangeLeg < len(r.Legs) {
		t += fmt.Sprintf(" (leg %d)", *cy.ChangeLeg+1)
	}
	return t
}

// ---- figures and their "How" ----

// shownFigure returns a figure's number and unit in the display units.
// A converted number is rounded in the figure's own direction, so the
// safe side holds after conversion too.
func (s *briefState) shownFigure(f physio.Figure) (num, unit, note string) {
	r := roundingOf(f.Rounding)
	v := f.Value.InexactFloat64()
	switch {
	case f.Unit == "ft" && s.settings.AltitudeUnit == UnitM:
		if d, ok := physio.Round(physio.Feet(v).Metres(), 0, r); ok {
			return d.String(), "m", "converted from " + f.Value.String() + " ft"
		}
	case f.Unit == "mmHg" && s.settings.GasUnit == UnitKPa:
		if d, ok := physio.Round(physio.MmHg(v).Kilopascals(), 1, r); ok {
			return d.String(), "kPa", "converted from " + f.Value.String() + " mmHg"
		}
	}
	return f.Value.String(), f.Unit, ""
}

func roundingOf(s string) physio.Rounding {
	switch s {
	case "up":
		return physio.RoundUp
	case "down":
		return physio.RoundDown
	}
	return physio.RoundNearest
}

// fig renders one figure: label, large number, unit, and its "How".
func (s *briefState) fig(id, label string, f physio.Figure) app.UI {
	return s.figure(id, label, f, false)
}

// inline renders a figure inside a table cell.
func (s *briefState) inline(id, label string, f physio.Figure) app.UI {
	return s.figure(id, label, f, true)
}

func (s *briefState) figure(id, label string, f physio.Figure, inline bool) app.UI {
	num, unit, note := s.shownFigure(f)
	c := &briefFig{ID: id, Label: label, Num: num, Unit: unit, Note: note, Inline: inline, s: s}
	if s.open[id+"-how"] {
		c.How = &f
	}
	return c
}

// briefFig is one figure of the result panel as its own component: when
// the plan is recomputed, a figure whose text is the same (most of them,
// for one keystroke) is passed over after comparing a few strings. The
// figure itself is kept only while its "How" is open (How), since only
// then is it drawn.
type briefFig struct {
	app.Compo
	ID, Label, Num, Unit, Note string
	Inline                     bool
	How                        *physio.Figure
	s                          *briefState
}

func (c *briefFig) Render() app.UI {
	id, s := c.ID, c.s
	if c.Inline {
		return app.Div().ID(id).Body(
			app.Span().ID(id+"-v").Class("b-cell-num").Text(c.Num),
			app.Text(" "+c.Unit),
			s.how(id, c.Label, c.How, c.Note),
		)
	}
	unit := c.Unit
	return app.Div().Class("b-fig").ID(id).Body(
		app.Span().Class("b-fig-label").Text(c.Label),
		app.Div().Class("alv-result").Body(
			app.Span().ID(id+"-v").Class("alv-num").Text(c.Num),
			app.If(unit != "", func() app.UI { return app.Span().ID(id + "-u").Class("alv-unit").Text(unit) }),
		),
		s.how(id, c.Label, c.How, c.Note),
	)
}

// how is the "How" disclosure of a figure: the formula, the inputs it
// used, the source and the rounding. Its body is built only while open.
func (s *briefState) how(id, label string, f *physio.Figure, note string) app.UI {
	hid := id + "-how"
	open := s.open[hid] && f != nil
	body := []app.UI{app.Summary().Body(app.Text("How"), app.Span().Class("b-sr").Text(": "+label))}
	if open {
		inputs := make([]app.UI, 0, len(f.Inputs))
		for _, in := range f.Inputs {
			t := in.Name + " = " + s.inputText(in)
			inputs = append(inputs, app.Li().Text(t))
		}
		dl := []app.UI{
			app.Dt().Text("Formula"), app.Dd().Class("b-formula").Text(f.Formula),
		}
		if len(inputs) > 0 {
			dl = append(dl, app.Dt().Text("Inputs"), app.Dd().Body(app.Ul().Body(inputs...)))
		}
		dl = append(dl,
			app.Dt().Text("Source"), app.Dd().Text(f.Source),
			app.Dt().Text("Rounding"), app.Dd().Text(roundingText(f.Rounding)),
		)
		if note != "" {
			dl = append(dl, app.Dt().Text("Units"), app.Dd().Text(note))
		}
		body = append(body, app.Dl().Class("b-how").Body(dl...))
	}
	return app.Details().ID(hid).Class("alv-how").Open(open).
		OnToggle(func(ctx app.Context, e app.Event) {
			now := ctx.JSSrc().Get("open").Bool()
			if now == s.open[hid] {
				ctx.PreventUpdate()
				return
			}
			s.open[hid] = now
		}, app.EventScope(hid)).
		Body(body...)
}

// inputText writes a figure's input in the display units (to the nearest:
// an input is shown, not decided on).
func (s *briefState) inputText(in physio.FigureInput) string {
	switch {
	case in.Unit == "ft" && s.settings.AltitudeUnit == UnitM:
		if d, ok := physio.Round(physio.Feet(in.Value).Metres(), 1, physio.RoundNearest); ok {
			return d.String() + " m"
		}
	case in.Unit == "mmHg" && s.settings.GasUnit == UnitKPa:
		if d, ok := physio.Round(physio.MmHg(in.Value).Kilopascals(), 2, physio.RoundNearest); ok {
			return d.String() + " kPa"
		}
	}
	if in.Unit == "" {
		return fmtNum(in.Value)
	}
	return fmtNum(in.Value) + " " + in.Unit
}

func roundingText(r string) string {
	switch r {
	case "up":
		return "up, the safe side for this number"
	case "down":
		return "down, the safe side for this number"
	case "nearest":
		return "to the nearest; no decision rests on its last digit"
	}
	return strings.TrimSpace(r)
}
