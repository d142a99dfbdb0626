package ui

import (
	"fmt"
	"reflect"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/physio"
)

// Field and element ids of the Supply screen (used by its tests).
const (
	FieldSupplyGauge  = "supply-gauge"
	FieldSupplyFlow   = "supply-flow"
	FieldSupplyReadAt = "supply-read-at"
)

// supplyReadAtField names the reading's time in its refusals.
const supplyReadAtField = "Read at"

// supplyTick is how often the countdown is redrawn from the device clock.
const supplyTick = 15 * time.Second

// supply is the Supply screen: the cylinders on board and a live countdown
// from the gauge reading and flow of the cylinder in use, with a plot of
// the oxygen remaining against the clock.
type supply struct {
	app.Compo
	supplyShown

	confirmNew bool // "new transport" tapped: asking before clearing
	now        func() time.Time
	tick       time.Duration // 0: no ticking (component tests)
	shown      time.Time     // the clock time of the last redraw
	stop       chan struct{}
	rendered   bool // the first render has read what is saved

	vault   *vaultSession // the Logbook's vault session; nil: no Logbook
	unsub   func()
	mctx    app.Context // the component's own context, for work that outlives an event
	mounted bool        // mctx is set
	link    supplyLink
}

// supplyShown is what the Supply screen draws from what it loads: the
// settings, its session and the parts of the Brief draft it takes, and the
// fields as that gives them.
type supplyShown struct {
	settings Settings
	session  SupplySession
	fromPlan bool      // the cylinders come from the Brief draft
	legs     []legBand // legs of the Brief draft, if any
	policy   *supplyPolicy

	gaugeText, flowText string // the fields as typed
	messages            FieldErrors

	// readAtText is the Read at field: when the gauge was read, as hh:mm
	// (blank: as it is typed). readAtFor is the reading it timed (its
	// AtUnixMilli), or 0 while it waits for the next reading: a new
	// reading does not take the time given for an older one.
	readAtText string
	readAtFor  int64
}

func newSupply() *supply {
	s := &supply{now: time.Now, tick: supplyTick, vault: theVault}
	s.load(DefaultSettings(), defaultSupplySession())
	return s
}

func (s *supply) load(st Settings, session SupplySession) {
	s.settings = st
	s.session = session
	s.messages = FieldErrors{}
	if s.now == nil {
		s.now = time.Now
	}
	s.shown = s.now()
	if r, ok := session.lastReading(); ok {
		s.gaugeText = shownPressure(r.Gauge, r.GaugeUnit, st.PressureUnit)
		s.flowText = r.Flow
		s.session.InUse = r.Cylinder
		s.readAtText, s.readAtFor = "", 0
		if r.ReadGiven() {
			s.readAtText, s.readAtFor = lbClockMinute(r.At()), r.AtUnixMilli
		}
	} else {
		s.gaugeText, s.flowText = "", ""
		s.readAtText, s.readAtFor = "", 0
	}
}

// restore shows the settings st, the session and the Brief draft's parts
// (found false: no draft), as a new screen would, and reports whether that
// changed anything drawn from them.
func (s *supply) restore(st Settings, session SupplySession, parts draftParts, found bool) bool {
	next := &supply{now: s.now}
	next.load(st, session)
	if found {
		next.adoptParts(parts)
	}
	if reflect.DeepEqual(next.supplyShown, s.supplyShown) {
		return false
	}
	s.supplyShown, s.shown = next.supplyShown, next.shown
	return true
}

// preload reads the settings, the session and the Brief draft before the
// first render, in the browser (see preload.go). Anything it cannot read
// leaves the defaults, and OnMount's load then renders again as before.
func (s *supply) preload() {
	if !app.IsClient {
		return
	}
	s.preloadFrom(windowStorage{}, theVault)
}

func (s *supply) preloadFrom(ls storageGetter, vault *vaultSession) {
	st, ok := settingsFrom(ls)
	if !ok {
		return
	}
	session, ok := supplySessionFrom(ls)
	if !ok {
		return
	}
	parts, found := draftPlanFrom(ls, st, vault)
	s.restore(st, session, parts, found)
}

func (s *supply) OnMount(ctx app.Context) {
	s.mctx, s.mounted = ctx, true
	link := s.link
	parts, found := draftPlan(ctx)
	changed := s.restore(LoadSettings(ctx), loadSupplySession(ctx), parts, found)
	ctx.ObserveState(SettingsKey, &s.settings).OnChange(func() { s.unitsChanged() })
	s.watchLogbook(ctx)
	if !changed && link.sameShown(s.link) {
		// The first render already showed all of it (preload): nothing
		// to draw again.
		ctx.PreventUpdate()
	}
	if s.tick > 0 {
		stop := make(chan struct{})
		s.stop = stop
		ctx.Async(func() {
			t := time.NewTicker(s.tick)
			defer t.Stop()
			for {
				select {
				case <-stop:
					return
				case <-t.C:
					// Only the shown clock changes: the fields keep their
					// text and the focus stays where the crew left it.
					ctx.Dispatch(func(ctx app.Context) { s.shown = s.now() })
				}
			}
		})
	}
}

func (s *supply) OnDismount() {
	if s.unsub != nil {
		s.unsub()
		s.unsub = nil
	}
	if s.stop != nil {
		close(s.stop)
		s.stop = nil
	}
}

// supplyPolicy is the reserve policy of the Brief draft (its own, or the
// Settings' when it does not override them), which the countdown then uses
// so that it counts as the plan does.
type supplyPolicy struct {
	Residual physio.Pressure
	Added    time.Duration
	Text     string // the residual as the Brief gives it, with its unit
}

// adoptParts takes the cylinders (expanded by count), the legs and the
// reserve policy from the Brief draft, each when that part of the draft is
// complete. The patient is not needed.
func (s *supply) adoptParts(parts draftParts) {
	doc := parts.doc
	if !parts.supply || doc == nil || len(doc.Supply) == 0 {
		return
	}
	var cyls []SupplyCylinder
	for _, line := range doc.Supply {
		c := SupplyCylinder{Kind: string(line.Size)}
		if line.WaterCapacityL != nil {
			c.Kind = line.Name
			if c.Kind == "" {
				c.Kind = "WC " + strconv.FormatFloat(*line.WaterCapacityL, 'f', -1, 64) + " L"
			}
			c.WaterCapacity = strconv.FormatFloat(*line.WaterCapacityL, 'f', -1, 64)
		}
		switch {
		case line.PressurePsi != nil:
			c.Gauge, c.GaugeUnit = strconv.FormatFloat(*line.PressurePsi, 'f', -1, 64), UnitPsi
		case line.PressureBar != nil:
			c.Gauge, c.GaugeUnit = strconv.FormatFloat(*line.PressureBar, 'f', -1, 64), UnitBar
		}
		if _, err := c.physioCylinder(); err != nil || line.LabelContentsL != nil {
			return // a kind this screen cannot count: keep its own list
		}
		n := 1
		if line.Count != nil && *line.Count > 0 {
			n = *line.Count
		}
		for i := 0; i < n; i++ {
			cyls = append(cyls, c)
		}
	}
	s.fromPlan = true
	s.session.Cylinders = cyls
	if s.session.InUse >= len(cyls) {
		s.session.InUse = 0
	}
	s.legs = parts.draftLegs()
	s.policy = nil
	if pol := doc.Policy; parts.policy && pol != nil && pol.ReserveMinutes != nil {
		var sp supplyPolicy
		switch {
		case pol.ResidualPsi != nil:
			sp.Residual = physio.Psi(*pol.ResidualPsi)
			sp.Text = strconv.FormatFloat(*pol.ResidualPsi, 'f', -1, 64) + " " + UnitPsi
		case pol.ResidualBar != nil:
			sp.Residual = physio.Bar(*pol.ResidualBar)
			sp.Text = strconv.FormatFloat(*pol.ResidualBar, 'f', -1, 64) + " " + UnitBar
		default:
			return
		}
		sp.Added = time.Duration(*pol.ReserveMinutes * float64(time.Minute))
		s.policy = &sp
	}
}

// unitsChanged redraws the fields in the new display unit; a stored
// reading keeps the unit it was typed in.
func (s *supply) unitsChanged() {
	if r, ok := s.session.lastReading(); ok && s.messages[FieldSupplyGauge] == "" {
		s.gaugeText = shownPressure(r.Gauge, r.GaugeUnit, s.settings.PressureUnit)
	}
}

func (s *supply) residual() (physio.Pressure, time.Duration, string) {
	if s.policy != nil {
		return s.policy.Residual, s.policy.Added, ""
	}
	res, err := s.settings.SafeResidualPressure()
	if err != nil {
		return 0, 0, "The safe residual in Settings is not valid."
	}
	minutes, msg := ruleReserveMin.Check(s.settings.ReserveMinutes)
	if msg != "" {
		return 0, 0, "The added reserve time in Settings is not valid."
	}
	return res, time.Duration(minutes.IntPart()) * time.Minute, ""
}

// edit handles typing into the gauge, flow or Read at field: valid fields
// become the current reading and are kept at once. Typed within
// readingMerge of the last reading (same cylinder), any of the three
// corrects it; later, a gauge or flow starts a new reading, timed as it is
// typed unless a time was given for it, and a Read at waits for the next
// reading (it can re-time the reading shown with a tap when it is earlier
// than that reading's time: retimeShown).
func (s *supply) edit(ctx app.Context, field, text string) {
	switch field {
	case FieldSupplyGauge:
		s.gaugeText = text
	case FieldSupplyFlow:
		s.flowText = text
	case FieldSupplyReadAt:
		s.readAtText = text
	}
	s.link.status, s.link.problem = "", ""
	s.commit(ctx, field == FieldSupplyReadAt)
}

// commit keeps the fields as the current reading when they are all valid
// and reports whether it did. timeEdit: the edit was to Read at, which
// outside the correction window only waits for the next reading.
func (s *supply) commit(ctx app.Context, timeEdit bool) bool {
	s.messages = FieldErrors{}
	unit := s.settings.PressureUnit
	in := s.session.InUse
	if in < 0 || in >= len(s.session.Cylinders) {
		return false
	}
	cyl, err := s.session.Cylinders[in].physioCylinder()
	if err != nil {
		s.messages[FieldSupplyGauge] = "This cylinder is not in the catalogue."
		return false
	}
	if _, msg := gaugeRule(cyl, unit).Check(s.gaugeText); msg != "" {
		s.messages[FieldSupplyGauge] = msg
	}
	if _, msg := ruleFlow.Check(s.flowText); msg != "" {
		s.messages[FieldSupplyFlow] = msg
	}
	now := s.now()
	r := SupplyReading{
		AtUnixMilli: now.UnixMilli(),
		Cylinder:    in,
		Gauge:       commaDecimal(strings.TrimSpace(s.gaugeText)),
		GaugeUnit:   unit,
		Flow:        commaDecimal(strings.TrimSpace(s.flowText)),
	}
	merge := s.session.merges(in, now)
	// A time alone, typed after the correction window while the fields
	// show the last reading as it was kept, is for the next reading.
	last, hasLast := s.session.lastReading()
	waits := timeEdit && !merge && hasLast && last.Cylinder == in && last.Gauge == r.Gauge && last.GaugeUnit == r.GaugeUnit && last.Flow == r.Flow
	switch {
	case waits:
		s.readAtFor = 0
	case !merge && !timeEdit && s.readAtFor != 0:
		// A new reading: the time given for an older one is not its time.
		s.readAtText, s.readAtFor = "", 0
	}
	// A waiting time is held to the readings before the one shown: earlier
	// than that one, it may be for the next cylinder's first reading, or
	// re-time the reading shown (renderReadAtNext offers it).
	read, given, msg := s.readTime(now, in, merge || waits)
	if msg != "" {
		s.messages[FieldSupplyReadAt] = msg
	}
	if len(s.messages) > 0 || waits {
		return false
	}
	s.shown = now
	if given {
		r.ReadUnixMilli = read.UnixMilli()
	}
	s.session.record(r)
	last, _ = s.session.lastReading()
	s.readAtFor = last.AtUnixMilli
	if c := &s.link.change; *c != (supplyChange{}) && c.at.IsZero() && c.cylinder == in {
		// A change of cylinder waiting for its time takes its first reading's.
		c.at, c.given = last.At(), last.ReadGiven()
	}
	saveSupplySession(ctx, s.session)
	return true
}

// readTime resolves Read at for a reading of cylinder typed at now (merge:
// it corrects the last reading) by the Logbook's rule (lbEntryTime: blank
// is now; hh:mm the latest such moment at or before now, at most 24 h
// back, not a clock time skipped by summer time; not before the open
// transport's opening, when there is one), and not before the previous
// reading of that cylinder: a reading dated before it would turn the
// cylinder's course back. The message names the field, the range and the
// format; "" when accepted.
func (s *supply) readTime(now time.Time, cylinder int, merge bool) (time.Time, bool, string) {
	var opened time.Time
	if t := s.link.open(); t != nil {
		opened = t.Opened
	}
	at, given, err := lbEntryTime(supplyReadAtField, s.readAtText, now, opened)
	if err != nil {
		return time.Time{}, false, err.Error()
	}
	if !given {
		return now, false, ""
	}
	if prev, ok := s.session.previousOf(cylinder, merge); ok && at.Before(prev.At()) {
		p := prev.At()
		return time.Time{}, false, fmt.Sprintf("%s: %s (%s) is before the previous reading of cylinder %d (%s). Give a time from %s to now as hh:mm (24-hour), or leave it blank for now.",
			supplyReadAtField, strings.TrimSpace(s.readAtText), lbDayMinute(at), cylinder+1, lbDayMinute(p)+":"+p.Local().Format("05"), lbClockMinute(p.Add(time.Minute-1)))
	}
	return at, true, ""
}

// pickInUse changes the cylinder in use; the gauge field then waits for its
// reading.
func (s *supply) pickInUse(ctx app.Context, i int) {
	if i == s.session.InUse || i < 0 || i >= len(s.session.Cylinders) {
		return
	}
	s.session.InUse = i
	c := s.session.Cylinders[i]
	s.gaugeText = shownPressure(c.Gauge, c.GaugeUnit, s.settings.PressureUnit)
	s.link.status, s.link.problem = "", ""
	kept := s.commit(ctx, false)
	saveSupplySession(ctx, s.session)
	// The change happened when the new cylinder was first read: its
	// reading's time. Read at refused, the change waits for it; other
	// fields refused, it is timed now, as a change always was.
	at, given := s.now(), false
	switch {
	case kept:
		r, _ := s.session.lastReading()
		at, given = r.At(), r.ReadGiven()
	case s.messages[FieldSupplyReadAt] != "":
		at = time.Time{}
	}
	s.logCylinderChange(ctx, i, at, given)
}

// The own cylinder list (used while no Brief draft gives one).

func (s *supply) cylinderKinds() []choice {
	out := []choice{}
	for _, size := range []physio.CylinderSize{physio.SizeD, physio.SizeE, physio.SizeM, physio.SizeG, physio.SizeH} {
		out = append(out, choice{string(size), string(size) + " (CGA size)"})
	}
	for _, c := range s.settings.Cylinders {
		out = append(out, choice{c.Name, c.Name + " (" + c.WaterCapacity + " L water)"})
	}
	return out
}

func (s *supply) setKind(ctx app.Context, i int, kind string) {
	if i < 0 || i >= len(s.session.Cylinders) {
		return
	}
	c := SupplyCylinder{Kind: kind, Gauge: s.session.Cylinders[i].Gauge, GaugeUnit: s.session.Cylinders[i].GaugeUnit}
	for _, own := range s.settings.Cylinders {
		if own.Name == kind {
			c.WaterCapacity = own.WaterCapacity
		}
	}
	s.session.Cylinders[i] = c
	saveSupplySession(ctx, s.session)
}

func (s *supply) setStartGauge(ctx app.Context, i int, text string) {
	if i < 0 || i >= len(s.session.Cylinders) {
		return
	}
	// Kept as typed: read through gaugeRule's Check wherever it is used, so
	// the comma of "1,800" is not turned into a decimal point mid-typing
	// (after "1," the field showed "1." and the reading became 1.8 psi).
	s.session.Cylinders[i].Gauge = strings.TrimSpace(text)
	s.session.Cylinders[i].GaugeUnit = s.settings.PressureUnit
	saveSupplySession(ctx, s.session)
}

func (s *supply) addCylinder(ctx app.Context, e app.Event) {
	c := SupplyCylinder{Kind: string(physio.SizeE), Gauge: "2000", GaugeUnit: UnitPsi}
	if n := len(s.session.Cylinders); n > 0 {
		c = s.session.Cylinders[n-1]
	}
	s.session.Cylinders = append(s.session.Cylinders, c)
	saveSupplySession(ctx, s.session)
}

func (s *supply) removeCylinder(ctx app.Context, i int) {
	if len(s.session.Cylinders) <= 1 || i < 0 || i >= len(s.session.Cylinders) {
		return
	}
	s.session.Cylinders = append(s.session.Cylinders[:i:i], s.session.Cylinders[i+1:]...)
	if s.session.InUse >= len(s.session.Cylinders) {
		s.session.InUse = len(s.session.Cylinders) - 1
	}
	saveSupplySession(ctx, s.session)
}

// askNewTransport asks, in the page, before the readings are cleared.
func (s *supply) askNewTransport(ctx app.Context, e app.Event) {
	s.confirmNew = true
	// Take the focus to the question's safe answer once it is drawn.
	ctx.Defer(func(ctx app.Context) {
		if el := app.Window().GetElementByID("supply-new-keep"); el.Truthy() {
			el.Call("focus")
		}
	})
}

// newTransport clears the readings (the cylinders stay), once confirmed.
func (s *supply) newTransport(ctx app.Context, e app.Event) {
	s.confirmNew = false
	s.session.Readings = nil
	s.session.InUse = 0
	s.gaugeText, s.flowText = "", ""
	s.readAtText, s.readAtFor = "", 0
	s.messages = FieldErrors{}
	saveSupplySession(ctx, s.session)
}

// current computes the countdown from the last reading, if the fields are
// valid; otherwise the message to show instead of numbers.
func (s *supply) current() (countdown, string) {
	if len(s.messages) > 0 {
		return countdown{}, "Correct the marked field to see the countdown."
	}
	r, ok := s.session.lastReading()
	if !ok {
		return countdown{}, "Enter the gauge reading and flow of the cylinder in use."
	}
	residual, added, msg := s.residual()
	if msg != "" {
		return countdown{}, msg
	}
	return computeCountdown(supplyInputs{Cylinders: s.session.Cylinders, Reading: r, Residual: residual, AddedMin: added})
}

func (s *supply) Render() app.UI {
	if !s.rendered {
		s.rendered = true
		s.preload()
	}
	cd, msg := s.current()
	return app.Section().Class("alv-screen alv-supply").Aria("labelledby", "supply-title").Body(
		app.H1().ID("supply-title").Text("Supply"),
		newCaution(""),
		app.Div().Class("alv-grid").Body(
			s.renderReading(),
			s.renderCountdown(cd, msg),
		),
		s.renderPlot(cd, msg),
		s.renderCylinders(),
	)
}

func (s *supply) renderReading() app.UI {
	unit := s.settings.PressureUnit
	choices := make([]choice, len(s.session.Cylinders))
	for i, c := range s.session.Cylinders {
		choices[i] = choice{strconv.Itoa(i), fmt.Sprintf("%d · %s", i+1, c.Kind)}
	}
	return app.Form().ID("supply-reading").Class("alv-card").OnSubmit(func(ctx app.Context, e app.Event) {
		e.PreventDefault()
		s.logReading(ctx)
	}).Body(
		app.H2().Class("alv-card-title").Text("Gauge reading"),
		segmented("supply-inuse", "Cylinder in use", strconv.Itoa(s.session.InUse), choices,
			func(ctx app.Context, v string) {
				i, _ := strconv.Atoi(v)
				s.pickInUse(ctx, i)
			}),
		app.Div().Class("alv-form-row").Body(
			numberField(FieldSupplyGauge, "Gauge", unit, s.gaugeText, s.messages[FieldSupplyGauge],
				func(ctx app.Context, v string) { s.edit(ctx, FieldSupplyGauge, v) }),
			numberField(FieldSupplyFlow, "Flow", "L/min", s.flowText, s.messages[FieldSupplyFlow],
				func(ctx app.Context, v string) { s.edit(ctx, FieldSupplyFlow, v) }),
			textField(FieldSupplyReadAt, "Read at (hh:mm, 24-hour; blank = now)", s.readAtText, s.messages[FieldSupplyReadAt],
				func(ctx app.Context, v string) { s.edit(ctx, FieldSupplyReadAt, v) }),
		),
		s.renderReadAtNext(),
		app.P().ID("supply-read-at-note").Class("alv-note").Text(s.readAtNote()),
		s.renderLogbook(),
	)
}

// readAtNote says what Read at does, with the bounds it is held to.
func (s *supply) readAtNote() string {
	bounds := "within the last 24 hours, not before this cylinder's previous reading"
	if s.link.open() != nil {
		bounds += " nor before the open transport's opening"
	}
	return "Kept on this device as you type. Read at is when the gauge was read, if not just now (" + bounds +
		"): the countdown counts from it, and the logbook takes it for this reading and for a change to this cylinder. " +
		"Within a minute of typing a reading, a change to any of these fields corrects it; after that, a new gauge or flow is a new reading, timed now unless you give its time, and a Read at waits for the next reading (or, earlier than the reading shown, can re-time it with its button)."
}

// renderReadAtNext says that a time typed after the correction window is
// kept for the next reading, not given to the one shown; when the time is
// earlier than the reading shown, a button re-times that reading instead
// (retimeShown).
func (s *supply) renderReadAtNext() app.UI {
	text := strings.TrimSpace(s.readAtText)
	_, shown := s.session.lastReading()
	return app.If(text != "" && s.readAtFor == 0 && shown && s.messages[FieldSupplyReadAt] == "", func() app.UI {
		note := app.P().ID("supply-read-at-next").Class("alv-note").Attr("role", "status").
			Text("Read at " + text + " is kept for the next reading (the one shown was typed more than a minute ago, and keeps its time): type its gauge or flow, or choose the cylinder.")
		at, ok := s.retimeTo()
		if !ok {
			return note
		}
		return app.Div().Body(note,
			app.Button().ID("supply-read-at-retime").Type("button").Class("alv-button").
				Text("Or: the reading shown was read at "+lbClockMinute(at)+" (re-time it; less time left)").
				OnClick(s.retimeShown))
	})
}

// retimeTo returns the time Read at gives when the reading shown could
// take it instead of waiting for the next: valid by readTime's rule
// against the readings before it, and earlier than the reading's time
// (the safe side: it leaves less time, never more).
func (s *supply) retimeTo() (time.Time, bool) {
	last, ok := s.session.lastReading()
	if !ok || last.Cylinder != s.session.InUse {
		return time.Time{}, false
	}
	at, given, msg := s.readTime(s.now(), last.Cylinder, true)
	if msg != "" || !given || !at.Before(last.At()) {
		return time.Time{}, false
	}
	return at, true
}

// retimeShown gives the reading shown the earlier time Read at holds: its
// gauge was read before it was typed, and the crew says so after the
// correction window. The countdown counts from it; a reading already in
// the logbook is corrected there at the next save.
func (s *supply) retimeShown(ctx app.Context, e app.Event) {
	at, ok := s.retimeTo()
	if !ok {
		return
	}
	s.session.retimeLast(at)
	last, _ := s.session.lastReading()
	s.readAtFor, s.shown = last.AtUnixMilli, s.now()
	s.link.status, s.link.problem = "", ""
	saveSupplySession(ctx, s.session)
}

func (s *supply) renderCountdown(cd countdown, msg string) app.UI {
	card := app.Div().Class("alv-card alv-countdown").ID("supply-countdown").Aria("live", "polite")
	if msg != "" {
		return card.Body(
			app.H2().Class("alv-card-title").Text("Countdown"),
			app.P().ID("supply-countdown-msg").Class("alv-empty").Text(msg),
		)
	}
	residual := s.settings.SafeResidualShown() + " " + s.settings.PressureUnit
	policyFrom := "Settings"
	if s.policy != nil {
		residual, policyFrom = s.policy.Text, "the Brief's reserve policy"
	}
	usable, _ := physio.Round(cd.InUseUsable.Litres(), 0, physio.RoundDown)
	total, _ := physio.Round(cd.TotalUsable.Litres(), 0, physio.RoundDown)
	reserveL, _ := physio.Round(cd.Reserve.Litres(), 0, physio.RoundUp)
	reserveAt := hhmm(cd.ReserveAt())
	if cd.ReserveReach {
		reserveAt = "now"
	}
	return card.DataSet("reading-at", strconv.FormatInt(cd.ReadingAt.UnixMilli(), 10)).Body(
		app.H2().Class("alv-card-title").Text("Countdown"),
		app.Div().Class("alv-figures").Body(
			figure("supply-minutes", "Minutes left on the cylinder in use", strconv.FormatInt(cd.MinutesLeft(s.shown), 10), "min"),
			figure("supply-change-at", "Change cylinder at", hhmm(cd.ChangeAt()), ""),
			figure("supply-reserve-at", "Reserve reached at", reserveAt, ""),
		),
		app.P().Class("alv-note").Body(
			app.Text("At the reading ("+hhmm(cd.ReadingAt)+"): "),
			app.Span().ID("supply-minutes-reading").Text(strconv.FormatInt(cd.MinutesAtReading(), 10)),
			app.Text(" min to "+residual+"; "),
			app.Span().ID("supply-usable").Text(usable.String()),
			app.Text(" L usable in it, "),
			app.Span().ID("supply-total").Text(total.String()),
			app.Text(" L on board."),
		),
		how("How",
			app.P().Text("Usable litres above the safe residual ("+residual+", from "+policyFrom+"): cylinder factor (L/psi) × (gauge − residual) for CGA sizes, water capacity (L) × (gauge − residual in bar) for others (common practice)."),
			app.P().Text("Minutes left = usable litres ÷ flow, counted from when the gauge was read (Read at; blank: when it was typed, on the device clock); rounded down, and clock times truncated to the minute (earlier is the safe side)."),
			app.P().Text(fmt.Sprintf("Reserve: the added reserve time of %s (%s min) at the current flow = %s L. Cylinders after the one in use count at their starting gauge; cylinders before it count as spent.",
				policyFrom, strconv.FormatFloat(cd.ReserveAddMin.Minutes(), 'f', -1, 64), reserveL.String())),
		),
	)
}

// figure is one large computed number with its label and unit.
func figure(id, label, value, unit string) app.UI {
	return app.Div().Class("alv-figure").Body(
		app.Span().Class("alv-figure-label").ID(id+"-label").Text(label),
		app.Div().Class("alv-result").Body(
			app.Span().Class("alv-num").ID(id).Aria("labelledby", id+"-label").Text(value),
			app.If(unit != "", func() app.UI { return app.Span().Class("alv-unit").Text(unit) }),
		),
	)
}

// renderPlot draws the oxygen on board against the clock: the readings,
// the projection from the last one at its flow, the reserve line and the
// legs of the Brief draft's plan.
func (s *supply) renderPlot(cd countdown, msg string) app.UI {
	card := app.Div().Class("alv-card")
	title := app.H2().Class("alv-card-title").Text("Oxygen on board")
	if msg != "" || len(s.session.Readings) == 0 {
		return card.Body(title, app.P().Class("alv-empty").Text("The plot appears with the first valid reading."))
	}
	residual, added, rmsg := s.residual()
	if rmsg != "" {
		return card.Body(title, app.P().Class("alv-empty").Text(rmsg))
	}
	// The clock starts at the earliest reading; the points go in the order
	// the gauges were read (a reading given an earlier time may follow one
	// of another cylinder in the list).
	start := s.session.Readings[0].At()
	for _, r := range s.session.Readings {
		if r.At().Before(start) {
			start = r.At()
		}
	}
	minutesFrom := func(t time.Time) float64 { return t.Sub(start).Minutes() }
	var readings []plotPoint
	for _, r := range s.session.Readings {
		c, m := computeCountdown(supplyInputs{Cylinders: s.session.Cylinders, Reading: r, Residual: residual, AddedMin: added})
		if m != "" {
			continue
		}
		l, _ := physio.Round(c.TotalUsable.Litres(), 0, physio.RoundDown)
		readings = append(readings, plotPoint{minutesFrom(r.At()), l.InexactFloat64()})
	}
	sort.SliceStable(readings, func(i, j int) bool { return readings[i].X < readings[j].X })
	at := minutesFrom(cd.ReadingAt)
	total, _ := physio.Round(cd.TotalUsable.Litres(), 0, physio.RoundDown)
	reserve, _ := physio.Round(cd.Reserve.Litres(), 0, physio.RoundUp)
	projection := []plotPoint{{at, total.InexactFloat64()}}
	if !cd.ReserveReach {
		projection = append(projection, plotPoint{at + cd.ToReserve.Minutes(), reserve.InexactFloat64()})
	}
	projection = append(projection, plotPoint{at + cd.ToEmpty.Minutes(), 0})
	xMax := at + cd.ToEmpty.Minutes()
	var bands []plotBand
	for _, l := range s.legs {
		x0 := l.Start
		x1 := x0 + l.Minutes
		bands = append(bands, plotBand{X0: x0, X1: x1, Label: l.Label})
		if x1 > xMax {
			xMax = x1
		}
	}
	yMax := total.InexactFloat64()
	for _, p := range readings {
		if p.Y > yMax {
			yMax = p.Y
		}
	}
	spec := plotSpec{
		ID:    "supply-plot",
		Title: "Oxygen on board against the clock",
		Desc: fmt.Sprintf("%d readings. At the last reading, %s L usable on board; at %s L/min the reserve of %s L is reached at %s and every cylinder is at the residual at %s.",
			len(readings), total.String(), strconv.FormatFloat(cd.Flow.LitresPerMinute(), 'f', -1, 64), reserve.String(), hhmm(cd.ReserveAt()), hhmm(cd.EmptyAt())),
		X:      plotAxis{Label: "Clock time", Unit: "local", Min: 0, Max: xMax, Format: axisClock, ClockRef: start},
		Y:      plotAxis{Label: "Usable oxygen on board", Unit: "L", Min: 0, Max: yMax},
		Lines:  []plotLine{{Name: "Readings", Class: "alv-plot-line-1", Points: readings, Markers: true}, {Name: "Projection at the current flow", Class: "alv-plot-proj", Points: projection}},
		HMarks: []plotHMark{{Y: reserve.InexactFloat64(), Label: "Reserve " + reserve.String() + " L"}},
		VMarks: []plotVMark{{X: minutesFrom(cd.ChangeAt()), Label: "Change " + hhmm(cd.ChangeAt())}},
		Bands:  bands,
	}
	note := "Legs are marked when the Brief has a plan; the first reading starts the transport clock."
	if len(bands) > 0 {
		note = "Legs from the Brief's plan, counted from the first reading."
	}
	return card.Body(title, plotFigure(spec), app.P().Class("alv-note").Text(note))
}

func (s *supply) renderCylinders() app.UI {
	unit := s.settings.PressureUnit
	rows := make([]app.UI, 0, len(s.session.Cylinders))
	kinds := s.cylinderKinds()
	for i, c := range s.session.Cylinders {
		i, c := i, c
		id := fmt.Sprintf("supply-cyl-%d", i)
		var kindCell, gaugeCell app.UI
		gauge := shownPressure(c.Gauge, c.GaugeUnit, unit)
		if s.fromPlan {
			kindCell = app.Text(c.Kind)
			gaugeCell = app.Text(gauge + " " + unit)
		} else {
			opts := make([]app.UI, 0, len(kinds))
			for _, k := range kinds {
				opts = append(opts, app.Option().Value(k.Value).Selected(k.Value == c.Kind).Text(k.Label))
			}
			kindCell = app.Select().ID(id+"-kind").Class("alv-select").Aria("label", fmt.Sprintf("Cylinder %d size", i+1)).
				OnChange(func(ctx app.Context, e app.Event) { s.setKind(ctx, i, ctx.JSSrc().Get("value").String()) }).
				Body(opts...)
			msg := ""
			if cyl, err := c.physioCylinder(); err == nil {
				_, msg = gaugeRule(cyl, unit).Check(gauge)
			}
			gaugeCell = numberField(id+"-gauge", fmt.Sprintf("Cylinder %d gauge at the start", i+1), unit, gauge, msg,
				func(ctx app.Context, v string) { s.setStartGauge(ctx, i, v) })
		}
		usable := "—"
		if res, _, m := s.residual(); m == "" {
			if v, m := usableAt(c, c.Gauge, c.GaugeUnit, res); m == "" {
				if d, ok := physio.Round(v.Litres(), 0, physio.RoundDown); ok {
					usable = d.String() + " L"
				}
			}
		}
		row := app.Tr().Body(
			app.Th().Scope("row").Text(strconv.Itoa(i+1)),
			app.Td().Body(kindCell),
			app.Td().Body(gaugeCell),
			app.Td().Class("alv-num-cell").ID(id+"-usable").Text(usable),
			app.Td().Body(app.If(!s.fromPlan && len(s.session.Cylinders) > 1, func() app.UI {
				return app.Button().Type("button").Class("alv-button").ID(id+"-remove").
					Aria("label", fmt.Sprintf("Remove cylinder %d", i+1)).Text("Remove").
					OnClick(func(ctx app.Context, e app.Event) { s.removeCylinder(ctx, i) })
			})),
		)
		rows = append(rows, row)
	}
	source := "Your list (the Brief's plan gives it when there is one). Cylinders are used in this order."
	if s.fromPlan {
		source = "From the Brief's plan; change them there. Cylinders are used in this order."
	}
	return app.Div().Class("alv-card").Body(
		app.H2().Class("alv-card-title").Text("Cylinders on board"),
		app.P().Class("alv-note").Text(source),
		app.Table().Class("alv-table alv-cyl-table").Body(
			app.THead().Body(app.Tr().Body(
				app.Th().Scope("col").Text("#"),
				app.Th().Scope("col").Text("Size"),
				app.Th().Scope("col").Text("Gauge at the start"),
				app.Th().Scope("col").Text("Usable above residual"),
				app.Th().Scope("col").Body(app.Span().Class("alv-sr").Text("Actions")),
			)),
			app.TBody().Body(rows...),
		),
		app.Div().Class("alv-actions").Body(
			app.If(!s.fromPlan, func() app.UI {
				return app.Button().ID("supply-add").Type("button").Class("alv-button").Text("Add cylinder").OnClick(s.addCylinder)
			}),
			app.Button().ID("supply-new").Type("button").Class("alv-button").Text("New transport (clear readings)").
				Aria("expanded", ariaBool(s.confirmNew)).Aria("controls", "supply-new-confirm").OnClick(s.askNewTransport),
		),
		app.If(s.confirmNew, func() app.UI { return s.renderConfirmNew() }),
	)
}

// renderConfirmNew is the in-page question before the readings are
// cleared: two buttons, neither pre-chosen by a second tap on the same spot.
func (s *supply) renderConfirmNew() app.UI {
	n := len(s.session.Readings)
	q := fmt.Sprintf("Clear the %d reading(s) of this transport from this tablet?", n)
	if n == 0 {
		q = "There is no reading to clear. Start a new transport anyway?"
	}
	detail := "The cylinders stay. Readings already saved to a transport in the Logbook stay there."
	return app.Div().ID("supply-new-confirm").Class("alv-confirm").Attr("role", "alertdialog").
		Aria("labelledby", "supply-new-q").Aria("describedby", "supply-new-detail").Body(
		app.P().ID("supply-new-q").Class("alv-confirm-q").Text(q),
		app.P().ID("supply-new-detail").Class("alv-note").Text(detail),
		app.Div().Class("alv-actions").Body(
			app.Button().ID("supply-new-keep").Type("button").Class("alv-button alv-primary").Text("Keep the readings").
				OnClick(func(ctx app.Context, e app.Event) { s.confirmNew = false }),
			app.Button().ID("supply-new-clear").Type("button").Class("alv-button alv-danger").Text("Clear the readings").
				OnClick(s.newTransport),
		),
	)
}
