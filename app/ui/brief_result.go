package ui

import (
	"bytes"
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
// flag the panel alone for an update, or write into it directly (see
// briefState.typed); once the panel is on screen its texts are written
// and its shape kept (afterRender).
func (c *briefResult) OnMount(ctx app.Context) {
	s := c.s
	s.resultCtx, s.resultUp = ctx, true
	s.shownShape, s.syncQueued, s.sentOK = s.shownShape[:0], false, false
	s.queueAfterRender()
}

func (c *briefResult) OnDismount() { c.s.resultUp = false }

func (c *briefResult) Render() app.UI {
	s := c.s
	s.queueAfterRender()
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
		items = append(items, app.Li().Body(
			app.Button().ID("b-fix-"+id).Type("button").Class("b-fix-link").Text(fixText(m, id)).
				OnClick(func(ctx app.Context, e app.Event) {
					el := app.Window().GetElementByID(id)
					if el.Truthy() {
						el.Call("focus")
					}
				}, app.EventScope("fix", id)),
		))
	}
	for i, o := range m.other {
		items = append(items, app.Li().ID("b-fix-other"+strconv.Itoa(i)).Text(o))
	}
	return app.Div().ID("b-fix").Class("b-fix").Body(
		app.P().ID("b-status").Class("b-status").DataSet("status", "incomplete").Attr("role", "status").
			Text(fixStatus(len(items))),
		app.P().Text("The plan appears when every field is valid. Tap an item to go to its field."),
		app.Ul().Class("b-fix-list").Body(items...),
	)
}

// fixText is the fix list's line for field id: where it is, and what to fix.
func fixText(m *briefModel, id string) string {
	if where := m.labels[id]; where != "" {
		return where + ": " + m.msgs[id]
	}
	return m.msgs[id]
}

// fixStatus is the status line above a fix list of n items.
func fixStatus(n int) string {
	return "No plan yet: " + strconv.Itoa(n) + " thing(s) to fix or fill in."
}

// panelCaps is how many places the panel keeps for each of its lists (the
// warnings, the cylinders, the assumptions, each leg's options): the most
// it has drawn for this Brief. A list that shrinks keeps its places,
// hidden and empty, so a keystroke that takes a warning away, or brings
// it back, changes no element of the panel, only texts and attributes
// (the direct path). A list that outgrows its places gives the panel a
// new shape, drawn by go-app.
type panelCaps struct {
	warn, cyl, assume int
	opts              []int // by leg
}

// grow makes room for the lists of r (when the panel is drawn).
func (c *panelCaps) grow(r *physio.PlanResult) {
	c.warn = max(c.warn, len(r.Warnings))
	c.cyl = max(c.cyl, len(r.Cylinders))
	c.assume = max(c.assume, len(r.Assumptions))
	for len(c.opts) < len(r.Legs) {
		c.opts = append(c.opts, 0)
	}
	for i, l := range r.Legs {
		c.opts[i] = max(c.opts[i], len(l.Options))
	}
}

// optsAt is the places kept for leg i's options.
func (c *panelCaps) optsAt(i int) int {
	if i < len(c.opts) {
		return c.opts[i]
	}
	return 0
}

// hiddenAttr is the value of the hidden attribute: "true", or none.
func hiddenAttr(hidden bool) string {
	if hidden {
		return "true"
	}
	return ""
}

func (s *briefState) summary(r *physio.PlanResult) []app.UI {
	s.caps.grow(r)
	caps := &s.caps
	out := []app.UI{
		app.P().ID("b-status").Class("b-status").DataSet("status", r.Status).Attr("role", "status").Text(statusText[r.Status]),
	}
	// Key figures.
	keys := s.keyFigs(r, nil)
	figs := make([]app.UI, 0, len(keys))
	for _, f := range keys {
		figs = append(figs, s.fig(f))
	}
	out = append(out, app.Div().Class("b-figs b-key").Body(figs...))

	// Warnings.
	if caps.warn > 0 {
		items := make([]app.UI, 0, caps.warn)
		for i := 0; i < caps.warn; i++ {
			w := s.warnSlot(r, i)
			li := app.Li().ID(w.id).Class("b-warn").DataSet("severity", w.severity).DataSet("code", w.code)
			if w.gone {
				li = li.Hidden(true)
			}
			items = append(items, li.Body(
				app.Span().ID(w.id+"-sev").Class("b-sev").Text(w.sevText),
				app.Span().ID(w.id+"-msg").Text(warnGap+w.msg),
			))
		}
		title := app.H3().ID("b-warn-title").Text("Warnings")
		list := app.Ul().ID("b-warnings").Class("b-warnings")
		if len(r.Warnings) == 0 {
			title, list = title.Hidden(true), list.Hidden(true)
		}
		out = append(out, title, list.Body(items...))
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
	if caps.cyl > 0 {
		rows := make([]app.UI, 0, caps.cyl)
		for k := 0; k < caps.cyl; k++ {
			c := cylSlot(r, k)
			tr := app.Tr().ID(c.id)
			if c.usable.gone {
				tr = tr.Hidden(true)
			}
			rows = append(rows, tr.Body(
				app.Th().ID(c.id+"-name").Scope("row").Text(c.name),
				app.Td().Class("alv-num-cell").Body(s.inline(c.usable)),
				app.Td().ID(c.id+"-open").Class("alv-num-cell").Text(c.opened),
				app.Td().ID(c.id+"-change").Class("alv-num-cell").Text(c.change),
			))
		}
		title := app.H3().ID("b-cyl-title").Text("Cylinders in order of use")
		table := app.Table().ID("b-cyl-table").Class("alv-table b-cyl-table")
		if len(r.Cylinders) == 0 {
			title, table = title.Hidden(true), table.Hidden(true)
		}
		out = append(out, title, table.Body(
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
	out = append(out, app.P().ID("b-r-caution").Class("alv-note b-plan-caution").Text(r.Caution))
	return out
}

// partFig is one figure of the panel: its id, label and figure; gone when
// the plan has no such figure (its place is kept, hidden and empty).
type partFig struct {
	id, label string
	f         physio.Figure
	gone      bool
}

// explained is the figure key of explain as a partFig, gone when absent.
func explained(id, label string, explain physio.Explanation, key string) partFig {
	f, ok := explain.Get(key)
	return partFig{id: id, label: label, f: f, gone: !ok}
}

// keyFigs appends the panel's key figures, in order, to buf.
func (s *briefState) keyFigs(r *physio.PlanResult, buf []partFig) []partFig {
	cruise := "Highest cruise for that cabin"
	if r.MaxCruiseAtCeiling {
		cruise += " (no limit below the model's ceiling)"
	}
	out := append(buf,
		explained("b-r-cabin", "Cabin altitude", r.Explain, "cabin_altitude_ft"),
		explained("b-r-highest", "Highest altitude", r.Explain, "highest_altitude_ft"),
		explained("b-r-fio2", "FiO2 needed (highest leg)", r.Explain, "fio2_needed"),
		explained("b-r-need", "Oxygen needed with reserve", r.Explain, "oxygen_needed_l"),
		explained("b-r-usable", "Usable oxygen on board", r.Explain, "oxygen_usable_l"),
		explained("b-r-margin", "Margin", r.Explain, "oxygen_margin_l"),
		explained("b-r-calc", "Oxygen for the legs (no reserve)", r.Explain, "oxygen_calculated_l"),
		explained("b-r-maxcabin", "FiO2 1.0 holds the ground state up to", r.Explain, "max_cabin_altitude_ft"),
		explained("b-r-maxcruise", cruise, r.Explain, "max_cruise_altitude_ft"),
		explained("b-r-exhausted", "Supply reaches the residual at minute", r.Explain, "supply_exhausted_minute"),
	)
	// The result's own fields say which figures it has.
	keys := out[len(buf):]
	keys[0].gone = r.CabinAltitudeFt == nil
	keys[8].gone = r.MaxCruiseAltitudeFt == nil
	keys[9].gone = r.SupplyExhaustedMin == nil
	return out
}

// warnRow is the i-th place of the warnings list as shown.
type warnRow struct {
	id, severity, code, sevText, msg string
	gone                             bool
}

// warnSlot is the i-th place of the warnings list. Its message is shown
// after a space (warnGap), which the caller writes.
func (s *briefState) warnSlot(r *physio.PlanResult, i int) warnRow {
	id := indexedID("b-warn", i, "")
	if i >= len(r.Warnings) {
		return warnRow{id: id, gone: true}
	}
	w := r.Warnings[i]
	return warnRow{id: id, severity: w.Severity, code: w.Code, sevText: severityText(w.Severity), msg: s.inUnits(w.Message)}
}

// warnGap stands between a warning's severity and its message.
const warnGap = " "

// cylRow is the k-th place of the cylinders table as shown.
type cylRow struct {
	id, name, opened, change string
	usable                   partFig
}

func cylSlot(r *physio.PlanResult, k int) cylRow {
	id, usableID := indexedID("b-r-cyl", k+1, ""), indexedID("b-r-cyl", k+1, "-usable")
	if k >= len(r.Cylinders) {
		return cylRow{id: id, usable: partFig{id: usableID, label: "usable", gone: true}}
	}
	cy := r.Cylinders[k]
	return cylRow{id: id, name: cylName(cy), opened: minuteText(cy.StartMinute), change: changeText(cy, r),
		usable: explained(usableID, "usable", cy.Explain, "usable_l")}
}

func cylName(cy physio.PlanCylinderResult) string {
	return strconv.Itoa(cy.Order) + ". " + cy.Name
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
		for _, f := range s.partFigs(partGround, r, nil) {
			figs = append(figs, s.fig(f))
		}
		body = append(body, app.H3().ID("b-r-g-title").Text(groundTitle(r)), app.Div().Class("b-figs").Body(figs...))
	case partGas:
		figs := make([]app.UI, 0, 4)
		for _, f := range s.partFigs(partGas, r, nil) {
			figs = append(figs, s.fig(f))
		}
		body = append(body, app.H3().Text("Trapped gas, origin to highest altitude"),
			app.Div().Class("b-figs").Body(figs...),
			app.P().ID("b-r-tg-caution").Class("alv-note").Text(r.TrappedGas.Caution),
		)
	case partAssume:
		if n := s.caps.assume; n > 0 {
			items := make([]app.UI, 0, n)
			for i := 0; i < n; i++ {
				li := app.Li().ID("b-r-assume" + strconv.Itoa(i)).Text(assumptionAt(r, i))
				if i >= len(r.Assumptions) {
					li = li.Hidden(true)
				}
				items = append(items, li)
			}
			d := app.Details().ID("b-r-assumptions").Class("alv-how b-assume")
			if len(r.Assumptions) == 0 {
				d = d.Hidden(true)
			}
			body = append(body, d.Body(
				app.Summary().ID("b-r-assume-sum").Text(assumptionsTitle(len(r.Assumptions))),
				app.Ul().Body(items...),
			))
		}
	}
	return app.Div().Class("b-part").Body(body...)
}

func groundTitle(r *physio.PlanResult) string {
	return "Patient on the ground (" + r.Ground.MeasuredAt + ")"
}

// assumptionAt is the i-th assumption as listed, "" past the last.
func assumptionAt(r *physio.PlanResult, i int) string {
	if i >= len(r.Assumptions) {
		return ""
	}
	a := r.Assumptions[i]
	return a.Path + " = " + a.Value + ": " + a.Reason
}

func assumptionsTitle(n int) string {
	return "Defaults and method assumptions (" + strconv.Itoa(n) + ")"
}

// partFigs appends the figures of a part, in order, to buf.
func (s *briefState) partFigs(name string, r *physio.PlanResult, buf []partFig) []partFig {
	switch name {
	case partGround:
		g := r.Ground.Explain
		return append(buf,
			explained("b-r-g-pao2a", "PAO2 (alveolar)", g, "pao2_alveolar_mmhg"),
			explained("b-r-g-pao2", "PaO2 from SpO2", g, "pao2_arterial_mmhg"),
			explained("b-r-g-spo2", "SpO2 from PaO2", g, "spo2_percent"),
			explained("b-r-g-aa", "a/A ratio", g, "aa_ratio"),
			explained("b-r-g-grad", "A-a gradient", g, "aa_gradient_mmhg"),
			explained("b-r-g-gradexp", "Upper normal A-a gradient for age", g, "expected_aa_gradient_mmhg"),
			explained("b-r-g-cao2", "Oxygen content", g, "cao2_ml_dl"),
		)
	case partGas:
		tg := r.TrappedGas
		return append(buf,
			explained("b-r-tg-ratio", "Expansion ratio", tg.Explain, "ratio"),
			explained("b-r-tg-cuff", "A "+tg.CuffMl.String()+" mL air pocket becomes", tg.Explain, "cuff_at_altitude_ml"),
			explained("b-r-tg-ptx", "A "+tg.PneumothoraxMl.String()+" mL pneumothorax becomes", tg.Explain, "pneumothorax_at_altitude_ml"),
			explained("b-r-tg-rigid", "Sealed rigid space: overpressure up to", tg.Explain, "rigid_overpressure_cmh2o"),
		)
	}
	return buf
}

// figKey writes out what a figure shows, for the key of its part.
func (s *briefState) figKey(b *strings.Builder, f partFig) {
	num, unit, note := s.figTexts(f)
	b.WriteString("|" + f.id + " " + f.label + " " + num + " " + unit + " " + note)
	switch {
	case f.gone:
		b.WriteString(" gone")
	case s.open[f.id+"-how"]:
		b.WriteString(" open " + strconv.Itoa(s.rev)) // an open "How" shows the inputs: redraw
	}
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
		b.WriteString(strconv.Itoa(max(s.caps.assume, len(r.Assumptions))))
		for _, a := range r.Assumptions {
			b.WriteString("|" + a.Path + "=" + a.Value + ":" + a.Reason)
		}
		return b.String()
	}
	for _, f := range s.partFigs(name, r, nil) {
		s.figKey(&b, f)
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

// legFig is one figure of a leg's result: what it is (the end of its id,
// from its dash), its label, and its key in the leg's Explain.
type legFig struct{ what, label, key string }

var legFigs = []legFig{
	{"-alt", "Altitude", "altitude_ft"},
	{"-pb", "Barometric pressure", "pressure_mmhg"},
	{"-fio2", "FiO2 needed", "fio2_needed"},
	{"-fio2low", "FiO2 of the set-up (low end)", "fio2_delivered_low"},
	{"-pao2a", "PAO2 at the set-up", "pao2_mmhg"},
	{"-pao2", "PaO2 expected", "pao2_expected_mmhg"},
	{"-spo2", "SpO2 expected", "spo2_expected_percent"},
	{"-lpm", "Oxygen flow", "oxygen_lpm"},
	{"-litres", "Oxygen for the leg", "oxygen_l"},
	{"-cao2", "Oxygen content expected", "cao2_expected_ml_dl"},
}

// legPartFigs appends the figures of leg i's result, in order, to buf.
func legPartFigs(i int, l physio.PlanLegResult, buf []partFig) []partFig {
	for _, lf := range legFigs {
		buf = append(buf, explained(indexedID("b-r-leg", i, lf.what), lf.label, l.Explain, lf.key))
	}
	return buf
}

// legTitle is the heading of a leg's result.
func legTitle(i int, l physio.PlanLegResult) string {
	return "Leg " + strconv.Itoa(i+1) + " · " + whereText(l.Where) + " · " + l.Minutes.String() + " min · " + deviceName(l.Device)
}

// legKey writes out everything the leg's result shows: its title, each
// figure as shown (number, unit, note, "How" open), the verdict and the
// options with the places kept for them.
func (s *briefState) legKey(i int, l physio.PlanLegResult) string {
	var b strings.Builder
	b.WriteString(legTitle(i, l))
	for _, f := range legPartFigs(i, l, nil) {
		s.figKey(&b, f)
	}
	b.WriteString("|")
	b.WriteString(strconv.FormatBool(l.FiO2Possible))
	b.WriteString(strconv.FormatBool(l.Delivers))
	b.WriteString(optionsTitle(l))
	b.WriteString(strconv.Itoa(s.caps.optsAt(i)))
	for _, o := range l.Options {
		b.WriteByte('|')
		b.WriteString(optionText(o))
	}
	return b.String()
}

// legResultID is the id of an element of leg i's result; what starts
// with its dash ("-title"), or is "" for the prefix of them all.
func legResultID(i int, what string) string { return indexedID("b-r-leg", i, what) }

func (s *briefState) legResult(i int, l physio.PlanLegResult) app.UI {
	id := func(what string) string { return legResultID(i, "-"+what) }
	lf := legPartFigs(i, l, nil)
	figs := make([]app.UI, 0, len(lf))
	for _, f := range lf {
		figs = append(figs, s.fig(f))
	}
	verdict, cls := legVerdict(l)
	body := []app.UI{
		app.H4().ID(id("title")).Class("b-leg-title").Text(legTitle(i, l)),
		app.Div().Class("b-figs b-small").Body(figs...),
		app.P().ID(id("verdict")).Class(cls).Text(verdict),
	}
	if n := s.caps.optsAt(i); n > 0 {
		opts := make([]app.UI, 0, n)
		for j := 0; j < n; j++ {
			li := app.Li().ID(id("opt" + strconv.Itoa(j))).Text(optionAt(l, j))
			if j >= len(l.Options) {
				li = li.Hidden(true)
			}
			opts = append(opts, li)
		}
		title := app.P().ID(id("optitle")).Class("b-options-title").Text(optionsTitle(l))
		list := app.Ul().ID(id("options")).Class("b-options")
		if len(l.Options) == 0 {
			title, list = title.Hidden(true), list.Hidden(true)
		}
		body = append(body, title, list.Body(opts...))
	}
	return app.Div().Class("b-leg-result").ID(id("box")).Body(body...)
}

// legVerdict is a leg's verdict line and its classes.
func legVerdict(l physio.PlanLegResult) (text, class string) {
	switch {
	case !l.FiO2Possible:
		return "Even FiO2 1.0 cannot hold the ground state on this leg.", "b-verdict b-bad"
	case !l.Delivers:
		return "The set-up may deliver less FiO2 than needed.", "b-verdict b-bad"
	}
	return "The set-up covers the FiO2 needed.", "b-verdict b-ok"
}

// optionsTitle introduces a leg's options.
func optionsTitle(l physio.PlanLegResult) string {
	return "Options that would deliver FiO2 " + l.FiO2Needed.String() + " — options, not orders; local protocol and medical direction decide:"
}

// optionAt is the j-th option of the leg as listed, "" past the last.
func optionAt(l physio.PlanLegResult, j int) string {
	if j >= len(l.Options) {
		return ""
	}
	return optionText(l.Options[j])
}

func optionText(o physio.PlanOption) string {
	var buf [160]byte
	b := append(buf[:0], deviceName(o.Device)...)
	b = append(b, " at "...)
	b = o.OxygenLpm.AppendText(b)
	b = append(b, " L/min oxygen"...)
	if o.TotalLpm.Cmp(o.OxygenLpm.Decimal) != 0 {
		b = append(b, ", "...)
		b = o.TotalLpm.AppendText(b)
		b = append(b, " L/min total"...)
	}
	b = append(b, " (FiO2 "...)
	b = o.FiO2Low.AppendText(b)
	if o.FiO2High.Cmp(o.FiO2Low.Decimal) != 0 {
		b = append(b, " to "...)
		b = o.FiO2High.AppendText(b)
	}
	return string(append(b, ')'))
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
		t += " (leg " + strconv.Itoa(*cy.ChangeLeg+1) + ")"
	}
	return t
}

// ---- figures and their "How" ----

// shownFigure returns a figure's number and unit in the display units.
// A converted number is rounded in the figure's own direction, so the
// safe side holds after conversion too.
func (s *briefState) shownFigure(f physio.Figure) (num, unit, note string) {
	switch {
	case f.Unit == "ft" && s.settings.AltitudeUnit == UnitM:
		if d, ok := physio.Round(physio.Feet(f.Value.InexactFloat64()).Metres(), 0, roundingOf(f.Rounding)); ok {
			return d.String(), "m", "converted from " + f.Value.String() + " ft"
		}
	case f.Unit == "mmHg" && s.settings.GasUnit == UnitKPa:
		if d, ok := physio.Round(physio.MmHg(f.Value.InexactFloat64()).Kilopascals(), 1, roundingOf(f.Rounding)); ok {
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

// figTexts is what a figure shows: its number, unit and conversion note
// in the display units; nothing for a figure the plan does not have.
func (s *briefState) figTexts(f partFig) (num, unit, note string) {
	if f.gone {
		return "", "", ""
	}
	return s.shownFigure(f.f)
}

// fig renders one figure: label, large number, unit, and its "How".
func (s *briefState) fig(f partFig) app.UI { return s.figure(f, false) }

// inline renders a figure inside a table cell.
func (s *briefState) inline(f partFig) app.UI { return s.figure(f, true) }

func (s *briefState) figure(f partFig, inline bool) app.UI {
	num, unit, note := s.figTexts(f)
	c := &briefFig{ID: f.id, Label: f.label, Num: num, Unit: unit, Note: note, Inline: inline, Gone: f.gone, s: s}
	if !f.gone && s.open[f.id+"-how"] {
		how := f.f
		c.How = &how
	}
	return c
}

// briefFig is one figure of the result panel as its own component: when
// the plan is recomputed, a figure whose text is the same (most of them,
// for one keystroke) is passed over after comparing a few strings. The
// figure itself is kept only while its "How" is open (How), since only
// then is it drawn. A figure the plan does not have (Gone) keeps its
// place, hidden and empty.
type briefFig struct {
	app.Compo
	ID, Label, Num, Unit, Note string
	Inline, Gone               bool
	How                        *physio.Figure
	s                          *briefState
}

func (c *briefFig) Render() app.UI {
	id, s := c.ID, c.s
	if c.Inline {
		return app.Div().ID(id).Body(
			app.Span().ID(id+"-v").Class("b-cell-num").Text(c.Num),
			app.Span().ID(id+"-u").Text(" "+c.Unit),
			s.how(id, c.Label, c.How, c.Note),
		)
	}
	box := app.Div().Class("b-fig").ID(id)
	if c.Gone {
		box = box.Hidden(true)
	}
	return box.Body(
		app.Span().ID(id+"-l").Class("b-fig-label").Text(c.Label),
		app.Div().Class("alv-result").Body(
			app.Span().ID(id+"-v").Class("alv-num").Text(c.Num),
			app.Span().ID(id+"-u").Class("alv-unit").Text(c.Unit),
		),
		s.how(id, c.Label, c.How, c.Note),
	)
}

// how is the "How" disclosure of a figure: the formula, the inputs it
// used, the source and the rounding. Its body is built only while open.
func (s *briefState) how(id, label string, f *physio.Figure, note string) app.UI {
	hid := id + "-how"
	open := s.open[hid] && f != nil
	body := []app.UI{app.Summary().Body(app.Text("How"), app.Span().ID(hid+"-sr").Class("b-sr").Text(": "+label))}
	if open {
		inputs := make([]app.UI, 0, len(f.Inputs))
		for k, in := range f.Inputs {
			inputs = append(inputs, app.Li().ID(hid+"-in"+strconv.Itoa(k)).Text(s.inputLine(in)))
		}
		dl := []app.UI{
			app.Dt().Text("Formula"), app.Dd().ID(hid + "-formula").Class("b-formula").Text(f.Formula),
		}
		if len(inputs) > 0 {
			dl = append(dl, app.Dt().Text("Inputs"), app.Dd().Body(app.Ul().Body(inputs...)))
		}
		dl = append(dl,
			app.Dt().Text("Source"), app.Dd().ID(hid+"-src").Text(f.Source),
			app.Dt().Text("Rounding"), app.Dd().ID(hid+"-rnd").Text(roundingText(f.Rounding)),
		)
		if note != "" {
			dl = append(dl, app.Dt().Text("Units"), app.Dd().ID(hid+"-units").Text(note))
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

// inputLine is a figure's input as its "How" lists it.
func (s *briefState) inputLine(in physio.FigureInput) string {
	return in.Name + " = " + s.inputText(in)
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

// ---- the direct path ----
//
// A keystroke that leaves the panel's shape as it is (the same figures,
// legs, warnings, cylinders, open "How"s, or the same fix list) changes
// only texts and a few attributes. Those are written straight into the
// elements on screen, in the task of the keystroke, by one call to the
// page script (window.alveaSetTexts in web/alvea.js); go-app's update of
// the panel is then not needed (briefState.typed). go-app's copy of the
// panel then holds older texts, so the texts are written after every
// recompute (showPlan) and again after every render of the panel
// (afterRender): whatever go-app writes or skips, the screen ends on the
// current plan.

// Separators of a packed panel. No text of the panel holds them (pack
// reports one that does, and the panel then takes go-app's update).
const (
	packRec   = '\x1e' // between records
	packField = '\x1f' // between the fields of a record
)

// panelPack is the result panel written out: one record per text or
// attribute the plan decides, "id␟text" (the text of the element's only
// child, a text node) or "id␟value␟attribute" (an empty value: no such
// attribute). The panel's shape is the ids and attribute names of those
// records in order (appendShape); two packs of the same shape differ only
// in texts and values. Its buffers are reused from one keystroke to the
// next.
type panelPack struct {
	recs  []byte
	offs  []int     // where each record starts in recs
	texts []span    // where each record's text or value is in recs
	figs  []partFig // the figures being written out (a buffer)
}

// span is a part of recs, [from, to).
type span struct{ from, to int }

func (p *panelPack) reset() {
	p.recs, p.offs, p.texts = p.recs[:0], p.offs[:0], p.texts[:0]
}

// A text that holds a separator cannot be sent: the page would cut it in
// two. Only the texts sent are looked at (a keystroke sends a few dozen
// records of several hundred; in wasm, looking at every text took a third
// of the pack).

// textOK reports whether record i's text holds no separator.
func (p *panelPack) textOK(i int) bool {
	t := p.recs[p.texts[i].from:p.texts[i].to]
	return bytes.IndexByte(t, packRec) < 0 && bytes.IndexByte(t, packField) < 0
}

// bad reports whether any text holds a separator.
func (p *panelPack) bad() bool {
	for i := range p.texts {
		if !p.textOK(i) {
			return true
		}
	}
	return false
}

// text records the text of the element whose id is the parts of id joined.
func (p *panelPack) text(value string, id ...string) { p.put("", value, "", id) }

// text2 records a text made of two parts (no string is built for it).
func (p *panelPack) text2(a, b string, id ...string) { p.put("", a, b, id) }

// attr records an attribute of the element whose id is the parts of id.
func (p *panelPack) attr(name, value string, id ...string) { p.put(name, value, "", id) }

func (p *panelPack) put(name, a, b string, id []string) {
	if len(p.recs) > 0 {
		p.recs = append(p.recs, packRec)
	}
	p.offs = append(p.offs, len(p.recs))
	for _, part := range id {
		p.recs = append(p.recs, part...)
	}
	p.recs = append(p.recs, packField)
	start := len(p.recs)
	p.recs = append(p.recs, a...)
	p.recs = append(p.recs, b...)
	p.texts = append(p.texts, span{start, len(p.recs)})
	if name != "" {
		p.recs = append(p.recs, packField)
		p.recs = append(p.recs, name...)
	}
}

// recEnd is where record i ends in recs (before the separator that
// follows it).
func (p *panelPack) recEnd(i int) int {
	if i+1 < len(p.offs) {
		return p.offs[i+1] - 1
	}
	return len(p.recs)
}

// appendShape appends p's shape to dst: each record's id, then its
// attribute name when it has one, each followed by a space.
func (p *panelPack) appendShape(dst []byte) []byte {
	for i, from := range p.offs {
		dst = append(dst, p.recs[from:p.texts[i].from-1]...)
		dst = append(dst, ' ')
		if name := p.recs[p.texts[i].to:p.recEnd(i)]; len(name) > 0 {
			dst = append(dst, name[1:]...) // after its separator
			dst = append(dst, ' ')
		}
	}
	return dst
}

// sameKey reports whether record i of p and of q have the same id and
// attribute name (and so the same place in the shape).
func (p *panelPack) sameKey(q *panelPack, i int) bool {
	return bytes.Equal(p.recs[p.offs[i]:p.texts[i].from], q.recs[q.offs[i]:q.texts[i].from]) &&
		bytes.Equal(p.recs[p.texts[i].to:p.recEnd(i)], q.recs[q.texts[i].to:q.recEnd(i)])
}

// record returns the i-th record.
func (p *panelPack) record(i int) []byte { return p.recs[p.offs[i]:p.recEnd(i)] }

// changedSince compares p with prev, the pack last sent. When both have
// the same shape (same), it writes into out the records of p that differ
// from prev's and returns them; ok is false when one of those holds a
// separator. The shape is compared on the way: a record that is the same
// bytes with its text at the same place is the same key.
func (p *panelPack) changedSince(prev *panelPack, out []byte) (changed []byte, same, ok bool) {
	out = out[:0]
	if len(p.offs) != len(prev.offs) {
		return out, false, true
	}
	for i, from := range p.offs {
		r, pr := p.record(i), prev.record(i)
		if bytes.Equal(r, pr) {
			if p.texts[i].from-from != prev.texts[i].from-prev.offs[i] || p.texts[i].to-from != prev.texts[i].to-prev.offs[i] {
				return out, false, true // the same bytes cut elsewhere
			}
			continue
		}
		if !p.sameKey(prev, i) {
			return out, false, true
		}
		if !p.textOK(i) {
			return out, true, false
		}
		if len(out) > 0 {
			out = append(out, packRec)
		}
		out = append(out, r...)
	}
	return out, true, true
}

// pack writes out every text and attribute of the result panel that the
// plan decides, by element id: what briefResult renders for the same
// state (TestBriefPackMatchesRender checks both against each other). A
// list that has outgrown its places (panelCaps) gets records for the
// places it needs, so its shape differs from the panel's.
func (s *briefState) pack(p *panelPack) {
	p.reset()
	m := s.model
	if !m.ok() {
		p.text(fixStatus(len(m.order)+len(m.other)), "b-status")
		p.attr("data-status", "incomplete", "b-status")
		for _, id := range m.order {
			p.text(fixText(m, id), "b-fix-", id)
		}
		for i, o := range m.other {
			p.text(o, "b-fix-other", strconv.Itoa(i))
		}
		return
	}
	r := m.result
	caps := &s.caps
	p.text(statusText[r.Status], "b-status")
	p.attr("data-status", r.Status, "b-status")
	p.figs = s.keyFigs(r, p.figs[:0])
	for _, f := range p.figs {
		s.packFig(p, f, false)
	}
	if n := max(caps.warn, len(r.Warnings)); n > 0 {
		none := hiddenAttr(len(r.Warnings) == 0)
		p.attr("hidden", none, "b-warn-title")
		p.attr("hidden", none, "b-warnings")
		for i := 0; i < n; i++ {
			w := s.warnSlot(r, i)
			p.attr("hidden", hiddenAttr(w.gone), w.id)
			p.attr("data-severity", w.severity, w.id)
			p.attr("data-code", w.code, w.id)
			p.text(w.sevText, w.id, "-sev")
			p.text2(warnGap, w.msg, w.id, "-msg")
		}
	}
	for i, l := range r.Legs {
		s.packLeg(p, i, l)
	}
	p.text(groundTitle(r), "b-r-g-title")
	p.figs = s.partFigs(partGround, r, p.figs[:0])
	for _, f := range p.figs {
		s.packFig(p, f, false)
	}
	if n := max(caps.cyl, len(r.Cylinders)); n > 0 {
		none := hiddenAttr(len(r.Cylinders) == 0)
		p.attr("hidden", none, "b-cyl-title")
		p.attr("hidden", none, "b-cyl-table")
		for k := 0; k < n; k++ {
			c := cylSlot(r, k)
			p.attr("hidden", hiddenAttr(c.usable.gone), c.id)
			p.text(c.name, c.id, "-name")
			s.packFig(p, c.usable, true)
			p.text(c.opened, c.id, "-open")
			p.text(c.change, c.id, "-change")
		}
	}
	p.figs = s.partFigs(partGas, r, p.figs[:0])
	for _, f := range p.figs {
		s.packFig(p, f, false)
	}
	p.text(r.TrappedGas.Caution, "b-r-tg-caution")
	if n := max(caps.assume, len(r.Assumptions)); n > 0 {
		p.attr("hidden", hiddenAttr(len(r.Assumptions) == 0), "b-r-assumptions")
		p.text(assumptionsTitle(len(r.Assumptions)), "b-r-assume-sum")
		for i := 0; i < n; i++ {
			id := strconv.Itoa(i)
			p.attr("hidden", hiddenAttr(i >= len(r.Assumptions)), "b-r-assume", id)
			p.text(assumptionAt(r, i), "b-r-assume", id)
		}
	}
	p.text(r.Caution, "b-r-caution")
}

// packLeg writes out one leg's result (legResult).
func (s *briefState) packLeg(p *panelPack, i int, l physio.PlanLegResult) {
	pre := legResultID(i, "-")
	p.text(legTitle(i, l), pre, "title")
	p.figs = legPartFigs(i, l, p.figs[:0])
	for _, f := range p.figs {
		s.packFig(p, f, false)
	}
	verdict, cls := legVerdict(l)
	p.text(verdict, pre, "verdict")
	p.attr("class", cls, pre, "verdict")
	if n := max(s.caps.optsAt(i), len(l.Options)); n > 0 {
		none := hiddenAttr(len(l.Options) == 0)
		p.attr("hidden", none, pre, "optitle")
		p.text(optionsTitle(l), pre, "optitle")
		p.attr("hidden", none, pre, "options")
		for j := 0; j < n; j++ {
			id := strconv.Itoa(j)
			p.attr("hidden", hiddenAttr(j >= len(l.Options)), pre, "opt", id)
			p.text(optionAt(l, j), pre, "opt", id)
		}
	}
}

// packFig writes out one figure (briefFig) and, while it is open, its "How".
func (s *briefState) packFig(p *panelPack, f partFig, inline bool) {
	id := f.id
	num, unit, note := s.figTexts(f)
	if inline {
		p.text(num, id, "-v")
		p.text2(" ", unit, id, "-u")
	} else {
		p.attr("hidden", hiddenAttr(f.gone), id)
		p.text(f.label, id, "-l")
		p.text(num, id, "-v")
		p.text(unit, id, "-u")
	}
	p.text2(": ", f.label, id, "-how-sr")
	if f.gone || !s.open[id+"-how"] {
		return
	}
	p.text(f.f.Formula, id, "-how-formula")
	for k, in := range f.f.Inputs {
		p.text(s.inputLine(in), id, "-how-in", strconv.Itoa(k))
	}
	p.text(f.f.Source, id, "-how-src")
	p.text(roundingText(f.f.Rounding), id, "-how-rnd")
	if note != "" {
		p.text(note, id, "-how-units")
	}
}

// showPlan writes the current plan's texts into the result panel on
// screen, and reports whether that was the whole update: the plan's shape
// is the one on screen, and every element named took its text. Only the
// records that changed since the last write are sent when the shape is
// the same; everything is sent after a change of shape, after a write the
// page refused, and after every render (afterRender).
func (s *briefState) showPlan() bool {
	if !s.resultUp {
		s.sentOK = false // a panel drawn later holds texts never sent
		return false
	}
	p := &s.panel
	s.pack(p)
	recs, same, ok := p.recs, false, true
	if s.sentOK {
		s.diff, same, ok = p.changedSince(&s.sent, s.diff)
	}
	shown := false
	if same {
		recs, shown = s.diff, s.sentShown
	} else {
		ok = !p.bad()
		s.scratch = p.appendShape(s.scratch[:0])
		shown = len(s.shownShape) > 0 && bytes.Equal(s.scratch, s.shownShape)
	}
	if !ok {
		s.sentOK = false
		return false
	}
	s.sentOK = len(recs) == 0 || s.writePanel(recs)
	s.sentShown = shown
	s.panel, s.sent = s.sent, s.panel
	return s.sentOK && shown
}

// afterRender runs once go-app has drawn the panel: it writes every text
// again (go-app skips a text its copy already holds, and a node it reuses
// for another figure can hold a text written directly), and keeps the
// shape now on screen.
func (s *briefState) afterRender(app.Context) {
	s.syncQueued = false
	s.shownShape = s.shownShape[:0]
	s.sentOK = false
	if !s.resultUp {
		return
	}
	p := &s.panel
	s.pack(p)
	if p.bad() {
		return
	}
	if !s.writePanel(p.recs) {
		if app.IsClient || s.writeTexts != nil {
			app.Log("brief: the result panel lacks an element the plan names; keystrokes take the full update")
		}
		return
	}
	s.sentOK, s.sentShown = true, true
	s.panel, s.sent = s.sent, s.panel
	s.shownShape = s.sent.appendShape(s.shownShape)
}

// queueAfterRender has afterRender run after the frame that draws the panel.
func (s *briefState) queueAfterRender() {
	if s.resultUp && !s.syncQueued {
		s.syncQueued = true
		s.resultCtx.Defer(s.afterRender)
	}
}

// writePanel hands the packed panel to the page.
func (s *briefState) writePanel(recs []byte) bool {
	if s.writeTexts != nil {
		return s.writeTexts(string(recs))
	}
	return setPanelTexts(recs)
}

// panelSetter is window.alveaSetTexts, once found.
var panelSetter app.Value

// setPanelTexts calls window.alveaSetTexts (web/alvea.js) with the packed
// panel. Natively, or before the script has run, it reports false.
func setPanelTexts(recs []byte) bool {
	if !app.IsClient || len(recs) == 0 {
		return false
	}
	if panelSetter == nil {
		f := app.Window().Get("alveaSetTexts")
		if f.Type() != app.TypeFunction {
			return false
		}
		panelSetter = f
	}
	return panelSetter.Invoke(string(recs)).Bool()
}
