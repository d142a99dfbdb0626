package ui

import (
	"fmt"
	"reflect"
	"strconv"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/physio"
)

// Field ids of the Altitude screen (used by its tests).
const (
	FieldAltOrigin     = "alt-origin"
	FieldAltDest       = "alt-dest"
	FieldAltCruise     = "alt-cruise"
	FieldAltDiff       = "alt-diff"
	FieldAltCabinStat  = "alt-cabin-stated"
	FieldAltCabinLimit = "alt-cabin-limit"
	FieldAltFiO2       = "alt-fio2"
	FieldAltPaCO2      = "alt-paco2"
	FieldAltPaO2       = "alt-pao2-ground"
	FieldAltRQ         = "alt-rq"
	FieldAltTemp       = "alt-temp"
	FieldAltCuffMl     = "alt-cuff-ml"
	FieldAltPtxMl      = "alt-ptx-ml"
	FieldAltCuffP      = "alt-cuff-p"
)

// Kinds of field, by the display unit that applies.
const (
	kindAltitude = "altitude" // Settings.AltitudeUnit
	kindDiff     = "diff"     // Settings.PressureUnit
	kindGas      = "gas"      // Settings.GasUnit
	kindFixed    = "fixed"    // a unit of its own
)

// altField describes one input: its label, kind, the value it starts with
// (in Unit) and its allowed range per unit. An Optional field may be left
// empty.
type altField struct {
	ID, Label, Kind string
	Start, Unit     string // start value and the unit it is written in
	Rules           map[string]rangeRule
	Optional        bool
}

// Start values are a demonstration of our own (sea level to a 25 000 ft
// cruise with a 6 psi aircraft; a healthy adult breathing air) used when no
// Brief draft gives the route and patient. The 8 000 ft cabin limit is
// 14 CFR 25.841(a); the 10 mL cuff and 500 mL pneumothorax are the plan
// engine's worked examples; 25 cmH2O is a common cuff setting (common
// practice, from memory). RQ 0.8 and 37 °C are the plan engine's defaults
// (common practice); their ranges are the plan document's (physio).
var altFields = []altField{
	{ID: FieldAltOrigin, Label: "Origin field elevation", Kind: kindAltitude, Start: "0", Unit: UnitFeet, Rules: altitudeRules("Origin field elevation")},
	{ID: FieldAltDest, Label: "Destination field elevation", Kind: kindAltitude, Start: "0", Unit: UnitFeet, Rules: altitudeRules("Destination field elevation")},
	{ID: FieldAltCruise, Label: "Cruise altitude", Kind: kindAltitude, Start: "25000", Unit: UnitFeet, Rules: altitudeRules("Cruise altitude")},
	{ID: FieldAltDiff, Label: "Maximum pressure differential (0: unpressurised)", Kind: kindDiff, Start: "6", Unit: UnitPsi, Rules: map[string]rangeRule{
		UnitPsi: {Label: "Pressure differential", Min: "0", Max: "15", Unit: UnitPsi},
		UnitBar: {Label: "Pressure differential", Min: "0", Max: "1.03", Unit: UnitBar},
	}},
	{ID: FieldAltCabinStat, Label: "Cabin altitude stated by the pilot (optional)", Kind: kindAltitude, Unit: UnitFeet,
		Rules: altitudeRules("Stated cabin altitude"), Optional: true},
	{ID: FieldAltCabinLimit, Label: "Cabin altitude limit", Kind: kindAltitude, Start: "8000", Unit: UnitFeet, Rules: altitudeRules("Cabin altitude limit")},
	{ID: FieldAltFiO2, Label: "FiO2 breathed on the ground", Kind: kindFixed, Start: "0.21", Unit: "fraction", Rules: map[string]rangeRule{
		"fraction": {Label: "FiO2", Min: "0.21", Max: "1", Unit: "(fraction)"},
	}},
	{ID: FieldAltPaCO2, Label: "PaCO2 on the ground", Kind: kindGas, Start: "40", Unit: UnitMmHg, Rules: map[string]rangeRule{
		UnitMmHg: {Label: "PaCO2", Min: "10", Max: "150", Unit: UnitMmHg},
		UnitKPa:  {Label: "PaCO2", Min: "1.4", Max: "19.9", Unit: UnitKPa},
	}},
	{ID: FieldAltPaO2, Label: "PaO2 on the ground", Kind: kindGas, Start: "95", Unit: UnitMmHg, Rules: map[string]rangeRule{
		UnitMmHg: {Label: "PaO2", Min: "20", Max: "700", Unit: UnitMmHg},
		UnitKPa:  {Label: "PaO2", Min: "2.7", Max: "93.3", Unit: UnitKPa},
	}},
	{ID: FieldAltRQ, Label: "Respiratory quotient", Kind: kindFixed, Start: "0.8", Unit: "", Rules: map[string]rangeRule{
		"": {Label: "Respiratory quotient", Min: "0.7", Max: "1", Unit: "(ratio)"},
	}},
	{ID: FieldAltTemp, Label: "Body temperature", Kind: kindFixed, Start: "37", Unit: "°C", Rules: map[string]rangeRule{
		"°C": {Label: "Body temperature", Min: "25", Max: "45", Unit: "°C"},
	}},
	{ID: FieldAltCuffMl, Label: "Air in a tube cuff", Kind: kindFixed, Start: "10", Unit: "mL", Rules: map[string]rangeRule{
		"mL": {Label: "Cuff volume", Min: "1", Max: "50", Unit: "mL"},
	}},
	{ID: FieldAltPtxMl, Label: "Pneumothorax volume", Kind: kindFixed, Start: "500", Unit: "mL", Rules: map[string]rangeRule{
		"mL": {Label: "Pneumothorax volume", Min: "1", Max: "5000", Unit: "mL"},
	}},
	{ID: FieldAltCuffP, Label: "Cuff pressure set on the ground", Kind: kindFixed, Start: "25", Unit: "cmH2O", Rules: map[string]rangeRule{
		"cmH2O": {Label: "Cuff pressure", Min: "0", Max: "60", Unit: "cmH2O"},
	}},
}

// altitudeRules covers the standard atmosphere's domain in each unit,
// rounded inward (−610 to 20 000 m).
func altitudeRules(label string) map[string]rangeRule {
	return map[string]rangeRule{
		UnitFeet: {Label: label, Min: "-2000", Max: "65000", Unit: UnitFeet},
		UnitM:    {Label: label, Min: "-610", Max: "20000", Unit: UnitM},
	}
}

// altitude is the Altitude screen: cabin altitude both ways, alveolar and
// arterial oxygen and the expected SpO2 against altitude, and trapped-gas
// expansion for the route.
type altitude struct {
	app.Compo
	altitudeShown

	rendered bool // the first render has read what is saved
}

// altitudeShown is everything the Altitude screen draws from.
type altitudeShown struct {
	settings Settings
	text     map[string]string // each field as typed
	unit     map[string]string // the unit each field was typed in
	messages FieldErrors

	atDestination bool   // the ground values were measured at the destination
	routeFrom     bool   // the route came from the Brief draft
	patientFrom   bool   // the patient came from the Brief draft
	pao2Note      string // how the PaO2 field was filled, when not typed
}

func newAltitude() *altitude {
	a := &altitude{}
	a.load(DefaultSettings())
	return a
}

func (a *altitude) load(st Settings) {
	a.settings = st
	a.text, a.unit, a.messages = map[string]string{}, map[string]string{}, FieldErrors{}
	for _, f := range altFields {
		a.text[f.ID], a.unit[f.ID] = f.Start, f.Unit
	}
	a.showUnits()
}

func (a *altitude) OnMount(ctx app.Context) {
	parts, found := draftPlan(ctx)
	if !a.restore(LoadSettings(ctx), parts, found) {
		// The first render already showed all of it (preload): nothing
		// to draw again.
		ctx.PreventUpdate()
	}
	ctx.ObserveState(SettingsKey, &a.settings).OnChange(a.showUnits)
}

// restore shows the settings st and the Brief draft's parts (found false:
// no draft), as a new screen would, and reports whether that changed
// anything drawn.
func (a *altitude) restore(st Settings, parts draftParts, found bool) bool {
	next := &altitude{}
	next.load(st)
	if found {
		next.adoptParts(parts)
	}
	// The messages of empty required fields, as a render sets them.
	next.inputs()
	if reflect.DeepEqual(next.altitudeShown, a.altitudeShown) {
		return false
	}
	a.altitudeShown = next.altitudeShown
	return true
}

// preload reads the settings and the Brief draft before the first render,
// in the browser (see preload.go). Anything it cannot read leaves the
// defaults, and OnMount's load then renders again as before.
func (a *altitude) preload() {
	if !app.IsClient {
		return
	}
	a.preloadFrom(windowStorage{}, theVault)
}

func (a *altitude) preloadFrom(ls storageGetter, vault *vaultSession) {
	st, ok := settingsFrom(ls)
	if !ok {
		return
	}
	parts, found := draftPlanFrom(ls, st, vault)
	a.restore(st, parts, found)
}

// adoptParts fills the route and the patient from the Brief draft, each
// when that part of the draft is complete.
func (a *altitude) adoptParts(parts draftParts) {
	doc := parts.doc
	if doc == nil {
		return
	}
	set := func(id string, v *float64, unit string) {
		if v != nil {
			a.text[id], a.unit[id] = strconv.FormatFloat(*v, 'f', -1, 64), unit
			delete(a.messages, id)
		}
	}
	if parts.route {
		r := doc.Route
		set(FieldAltOrigin, r.OriginElevationFt, UnitFeet)
		set(FieldAltDest, r.DestinationElevationFt, UnitFeet)
		a.text[FieldAltCruise], a.unit[FieldAltCruise] = "", UnitFeet
		set(FieldAltCruise, r.CruiseAltitudeFt, UnitFeet)
		a.text[FieldAltDiff], a.unit[FieldAltDiff] = "0", UnitPsi // absent: unpressurised (the plan's rule)
		set(FieldAltDiff, r.MaxDifferentialPsi, UnitPsi)
		a.text[FieldAltCabinStat], a.unit[FieldAltCabinStat] = "", UnitFeet
		set(FieldAltCabinStat, r.CabinAltitudeFt, UnitFeet)
		a.routeFrom = true
	}
	if parts.patient && doc.Patient.FiO2 != nil {
		pt := doc.Patient
		// A value the Brief leaves out takes the plan engine's default.
		def := func(v *float64, d float64) *float64 {
			if v == nil {
				return &d
			}
			return v
		}
		set(FieldAltFiO2, pt.FiO2, "fraction")
		set(FieldAltPaCO2, def(pt.PaCO2MmHg, physio.DefaultPlanPaCO2MmHg), UnitMmHg)
		set(FieldAltRQ, def(pt.RQ, physio.DefaultRQ), "")
		set(FieldAltTemp, def(pt.TemperatureC, physio.DefaultPlanTemperatureC), "°C")
		a.atDestination = pt.MeasuredAt == physio.WhereDestination
		a.pao2Note = ""
		switch {
		case pt.PaO2MmHg != nil:
			set(FieldAltPaO2, pt.PaO2MmHg, UnitMmHg)
		case pt.SpO2Percent != nil:
			// As the plan engine does: PaO2 read off the standard
			// dissociation curve at the SpO2, here rounded down to
			// 0.1 mmHg (a lower PaO2 is the safe side).
			p, err := physio.PO2AtSaturation(physio.Percent(*pt.SpO2Percent))
			spo2 := strconv.FormatFloat(*pt.SpO2Percent, 'f', -1, 64)
			if err != nil {
				a.text[FieldAltPaO2], a.unit[FieldAltPaO2] = "", UnitMmHg
				a.pao2Note = "The Brief gives SpO2 " + spo2 + " % and no PaO2; SpO2 on the flat top of the dissociation curve cannot give a PaO2: enter a measured PaO2."
				break
			}
			d, _ := physio.Round(p.MmHg(), 1, physio.RoundDown)
			a.text[FieldAltPaO2], a.unit[FieldAltPaO2] = d.String(), UnitMmHg
			a.pao2Note = "PaO2 estimated from the Brief's SpO2 of " + spo2 + " % on the standard dissociation curve (Severinghaus 1979), rounded down; a measured PaO2 is better."
		}
		a.patientFrom = true
	}
	a.showUnits()
}

// displayUnit returns the unit a field is shown in now.
func (a *altitude) displayUnit(f altField) string {
	switch f.Kind {
	case kindAltitude:
		return a.settings.AltitudeUnit
	case kindDiff:
		return a.settings.PressureUnit
	case kindGas:
		return a.settings.GasUnit
	}
	return f.Unit
}

// showUnits converts every valid field into the display unit (rounded to
// the nearest 1 ft or m, 0.01 psi or bar, 1 mmHg or 0.1 kPa); an invalid
// field keeps its text and message.
func (a *altitude) showUnits() {
	for _, f := range altFields {
		to := a.displayUnit(f)
		from := a.unit[f.ID]
		if from == to || a.messages[f.ID] != "" {
			continue
		}
		v, msg := f.Rules[from].Check(a.text[f.ID])
		if msg != "" {
			continue
		}
		x := v.InexactFloat64()
		var out float64
		places := int32(0)
		switch f.Kind {
		case kindAltitude:
			h := physio.Feet(x)
			if from == UnitM {
				h = physio.Metres(x)
			}
			out = h.Feet()
			if to == UnitM {
				out = h.Metres()
			}
		case kindDiff:
			p := pressureOf(x, from)
			out, places = p.Psi(), 2
			if to == UnitBar {
				out = p.Bar()
			}
		case kindGas:
			p := physio.MmHg(x)
			if from == UnitKPa {
				p = physio.Kilopascals(x)
			}
			out = p.MmHg()
			if to == UnitKPa {
				out, places = p.Kilopascals(), 1
			}
		}
		d, ok := physio.Round(out, places, physio.RoundNearest)
		if !ok {
			continue
		}
		a.text[f.ID], a.unit[f.ID] = d.String(), to
	}
}

func (a *altitude) edit(id, text string) {
	a.text[id] = text
	if id == FieldAltPaO2 {
		a.pao2Note = ""
	}
	for _, f := range altFields {
		if f.ID == id {
			a.unit[id] = a.displayUnit(f)
			if a.optional(f) && strings.TrimSpace(text) == "" {
				delete(a.messages, id)
			} else if _, msg := f.Rules[a.unit[id]].Check(text); msg != "" {
				a.messages[id] = msg
			} else {
				delete(a.messages, id)
			}
		}
	}
}

// inputs checks every field and returns the physio inputs, or false when
// any field is invalid (no figure is then shown).
func (a *altitude) inputs() (altitudeInputs, bool) {
	vals := map[string]float64{}
	ok := true
	for _, f := range altFields {
		if a.optional(f) && strings.TrimSpace(a.text[f.ID]) == "" {
			delete(a.messages, f.ID)
			continue
		}
		v, msg := f.Rules[a.unit[f.ID]].Check(a.text[f.ID])
		if msg != "" {
			a.messages[f.ID] = msg
			ok = false
			continue
		}
		vals[f.ID] = v.InexactFloat64()
	}
	if !ok {
		return altitudeInputs{}, false
	}
	alt := func(id string) physio.Altitude {
		if a.unit[id] == UnitM {
			return physio.Metres(vals[id])
		}
		return physio.Feet(vals[id])
	}
	gas := func(id string) physio.Pressure {
		if a.unit[id] == UnitKPa {
			return physio.Kilopascals(vals[id])
		}
		return physio.MmHg(vals[id])
	}
	in := altitudeInputs{
		Origin: alt(FieldAltOrigin), Destination: alt(FieldAltDest), Cruise: alt(FieldAltCruise), CabinLimit: alt(FieldAltCabinLimit),
		Differential: pressureOf(vals[FieldAltDiff], a.unit[FieldAltDiff]),
		FiO2:         physio.FractionOf(vals[FieldAltFiO2]),
		PaCO2:        gas(FieldAltPaCO2), PaO2: gas(FieldAltPaO2),
		RQ: vals[FieldAltRQ], TemperatureC: vals[FieldAltTemp], AtDestination: a.atDestination,
		CuffMl: vals[FieldAltCuffMl], PneumothoraxMl: vals[FieldAltPtxMl],
		CuffGauge: physio.CmH2O(vals[FieldAltCuffP]),
	}
	if _, given := vals[FieldAltCabinStat]; given {
		h := alt(FieldAltCabinStat)
		in.Stated = &h
	}
	return in, true
}

// optional reports whether field f may be left empty now: the stated cabin
// altitude always, the cruise altitude when a cabin altitude is stated.
func (a *altitude) optional(f altField) bool {
	if f.Optional {
		return true
	}
	return f.ID == FieldAltCruise && strings.TrimSpace(a.text[FieldAltCabinStat]) != ""
}

// Shown values, each rounded on its safe side.

func (a *altitude) altText(h physio.Altitude, r physio.Rounding) string {
	v := h.Feet()
	if a.settings.AltitudeUnit == UnitM {
		v = h.Metres()
	}
	d, ok := physio.Round(v, 0, r)
	if !ok {
		return "—"
	}
	return d.String()
}

func (a *altitude) gasValue(p physio.Pressure) float64 {
	if a.settings.GasUnit == UnitKPa {
		return p.Kilopascals()
	}
	return p.MmHg()
}

func (a *altitude) gasText(p physio.Pressure, r physio.Rounding) string {
	places := int32(0)
	if a.settings.GasUnit == UnitKPa {
		places = 1
	}
	d, ok := physio.Round(a.gasValue(p), places, r)
	if !ok {
		return "—"
	}
	return d.String()
}

func rounded(x float64, places int32, r physio.Rounding) string {
	d, ok := physio.Round(x, places, r)
	if !ok {
		return "—"
	}
	return d.String()
}

func (a *altitude) field(id string) app.UI {
	for _, f := range altFields {
		if f.ID == id {
			return numberField(f.ID, f.Label, a.displayUnit(f), a.text[f.ID], a.messages[f.ID],
				func(ctx app.Context, v string) { a.edit(f.ID, v) })
		}
	}
	return app.Text("")
}

func (a *altitude) Render() app.UI {
	if !a.rendered {
		a.rendered = true
		a.preload()
	}
	in, ok := a.inputs()
	var res altitudeResult
	msg := "Correct the marked fields to see the figures."
	if ok {
		res, msg = computeAltitude(in)
	}
	au, gu := a.settings.AltitudeUnit, a.settings.GasUnit
	var source string
	switch {
	case a.routeFrom && a.patientFrom:
		source = "Route and patient from the Brief; changes here are not saved to it."
	case a.routeFrom:
		source = "Route from the Brief; the patient values are an example until the Brief's patient is complete. Changes here are not saved to the Brief."
	case a.patientFrom:
		source = "Patient from the Brief; the route values are an example until the Brief's route is complete. Changes here are not saved to the Brief."
	default:
		source = "Start values are an example; the Brief fills the route and the patient once they are complete there."
	}
	cabinLabel := "Cabin altitude"
	if res.CabinStated {
		cabinLabel = "Cabin altitude (stated by the pilot)"
	}
	ground := "origin"
	if a.atDestination {
		ground = "destination"
	}
	results := func(body ...app.UI) app.UI {
		if msg != "" {
			return app.P().Class("alv-empty alv-alt-msg").Text(msg)
		}
		return app.Div().Class("alv-figures").Body(body...)
	}
	return app.Section().Class("alv-screen alv-altitude").Aria("labelledby", "altitude-title").Body(
		app.H1().ID("altitude-title").Text("Altitude"),
		newCaution(""),
		app.P().Class("alv-lead").Text(source),
		app.Div().Class("alv-grid").Body(
			app.Div().Class("alv-card").Body(
				app.H2().Class("alv-card-title").Text("Route and aircraft"),
				app.Div().Class("alv-form-row").Body(a.field(FieldAltOrigin), a.field(FieldAltDest)),
				app.Div().Class("alv-form-row").Body(a.field(FieldAltCruise), a.field(FieldAltDiff)),
				a.field(FieldAltCabinStat),
				app.P().Class("alv-note").Text("A cabin altitude the pilot states replaces the computed one; the cruise altitude may then be left empty."),
			),
			app.Div().Class("alv-card").Aria("live", "polite").Body(
				app.H2().Class("alv-card-title").Text("Cabin"),
				results(
					figure("alt-cabin", cabinLabel, a.altText(res.Cabin, physio.RoundUp), au),
					figure("alt-highest", "Highest altitude on the route ("+res.HighestPlace+")", a.altText(res.Highest, physio.RoundUp), au),
				),
				app.If(msg == "" && res.Cabin > physio.CabinAltitudeLimit, func() app.UI {
					return app.P().Class("alv-warn").ID("alt-cabin-warn").Text("The cabin is above 8000 ft, the ceiling of normal operation (14 CFR 25.841(a)).")
				}),
				how("How",
					app.P().Text("Cabin pressure = standard-atmosphere pressure at cruise + the maximum differential; cabin altitude = the standard-atmosphere altitude of that pressure (U.S. Standard Atmosphere 1976), never below the origin field; a differential of 0 is an unpressurised cabin. Rounded up."),
					app.P().Text("A cabin altitude the pilot states is the better figure: enter it above or on the Brief, and it is used as it is."),
				),
				app.H3().Text("Highest cruise altitude for a cabin limit"),
				a.field(FieldAltCabinLimit),
				results(figure("alt-max-cruise", "Highest cruise altitude", a.altText(res.MaxCruise, physio.RoundDown), au)),
				app.If(msg == "" && res.MaxCruiseCeiling, func() app.UI {
					return app.P().Class("alv-note").Text("This differential holds the limit up to the top of the standard atmosphere model (20 000 m): the aircraft's own ceiling limits the cruise.")
				}),
				how("How", app.P().Text("Highest cruise = the standard-atmosphere altitude of (pressure at the cabin limit − the maximum differential). Rounded down.")),
			),
		),
		app.Div().Class("alv-grid").Body(
			app.Div().Class("alv-card").Body(
				app.H2().Class("alv-card-title").Text("Patient"),
				a.field(FieldAltFiO2),
				app.Div().Class("alv-form-row").Body(a.field(FieldAltPaCO2), a.field(FieldAltPaO2)),
				app.If(a.pao2Note != "", func() app.UI { return app.P().Class("alv-note").ID("alt-pao2-note").Text(a.pao2Note) }),
				segmented("alt-measured", "Ground values measured at", ground, []choice{{"origin", "Origin"}, {"destination", "Destination"}},
					func(ctx app.Context, v string) { a.atDestination = v == "destination" }),
				app.Div().Class("alv-form-row").Body(a.field(FieldAltRQ), a.field(FieldAltTemp)),
			),
			app.Div().Class("alv-card").Aria("live", "polite").Body(
				app.H2().Class("alv-card-title").Text("At the cabin altitude, same FiO2"),
				results(
					figure("alt-pao2-alv", "Alveolar PO2 (PAO2)", a.gasText(res.PAO2Cabin, physio.RoundDown), gu),
					figure("alt-pao2-art", "Expected PaO2", a.gasText(res.PaO2Cabin, physio.RoundDown), gu),
					figure("alt-spo2", "Expected SpO2", rounded(res.SpO2Cabin.Percent(), 0, physio.RoundDown), "%"),
				),
				how("How",
					app.P().Text("PAO2 = FiO2·(PB − PH2O) − PaCO2/R (simplified alveolar gas equation), with PH2O the conventional 47 mmHg at 37 °C or the saturation vapour pressure at another body temperature, and R the respiratory quotient. Expected PaO2 = the ground a/A ratio (PaO2 ÷ PAO2 at the "+ground+") × PAO2 (constant a/A ratio method). SpO2 from PaO2 by the Severinghaus equation (J Appl Physiol 1979). All rounded down; the same method as the Brief's plan."),
				),
			),
		),
		a.renderPlots(res, msg),
		a.renderTrapped(res, msg),
	)
}

func (a *altitude) renderPlots(res altitudeResult, msg string) app.UI {
	card := app.Div().Class("alv-card")
	title := app.H2().Class("alv-card-title").Text("Oxygen against altitude")
	if msg != "" || len(res.Curve) == 0 {
		return card.Body(title, app.P().Class("alv-empty").Text("The plots appear when every field is valid."))
	}
	au, gu := a.settings.AltitudeUnit, a.settings.GasUnit
	x := func(h physio.Altitude) float64 {
		if au == UnitM {
			return h.Metres()
		}
		return h.Feet()
	}
	in, _ := a.inputs()
	var pA, pa, sat []plotPoint
	yMax := 0.0
	for _, s := range res.Curve {
		pA = append(pA, plotPoint{x(s.At), a.gasValue(s.PAO2)})
		pa = append(pa, plotPoint{x(s.At), a.gasValue(s.PaO2)})
		sat = append(sat, plotPoint{x(s.At), s.SpO2.Percent()})
		if v := a.gasValue(s.PAO2); v > yMax {
			yMax = v
		}
	}
	marks := []plotVMark{
		{X: x(in.Origin), Label: "Origin " + a.altText(in.Origin, physio.RoundNearest)},
		{X: x(res.Cabin), Label: "Cabin " + a.altText(res.Cabin, physio.RoundUp)},
		{X: x(in.Destination), Label: "Destination " + a.altText(in.Destination, physio.RoundNearest)},
	}
	xAxis := plotAxis{Label: "Altitude", Unit: au, Min: x(res.CurveMin), Max: x(res.CurveMx)}
	gasPlot := plotSpec{
		ID:    "alt-gas-plot",
		Title: "Alveolar and expected arterial PO2 against altitude",
		Desc: fmt.Sprintf("At FiO2 %s: PAO2 %s %s and expected PaO2 %s %s at the cabin altitude of %s %s. Origin, cabin and destination are marked.",
			strings.TrimSpace(a.text[FieldAltFiO2]), a.gasText(res.PAO2Cabin, physio.RoundDown), gu, a.gasText(res.PaO2Cabin, physio.RoundDown), gu,
			a.altText(res.Cabin, physio.RoundUp), au),
		X:      xAxis,
		Y:      plotAxis{Label: "PO2", Unit: gu, Min: 0, Max: yMax},
		Narrow: true,
		Lines:  []plotLine{{Name: "Alveolar PO2 (PAO2)", Class: "alv-plot-line-1", Points: pA}, {Name: "Expected arterial PaO2", Class: "alv-plot-line-2", Points: pa}},
		VMarks: marks,
	}
	spo2Plot := plotSpec{
		ID:     "alt-spo2-plot",
		Title:  "Expected SpO2 against altitude",
		Desc:   fmt.Sprintf("Expected SpO2 %s %% at the cabin altitude; the SpO2 target in Settings is %s %%.", rounded(res.SpO2Cabin.Percent(), 0, physio.RoundDown), a.settings.SpO2Target),
		X:      xAxis,
		Y:      plotAxis{Label: "Expected SpO2", Unit: "%", Min: 50, Max: 100},
		Narrow: true,
		Lines:  []plotLine{{Name: "Expected SpO2", Class: "alv-plot-line-2", Points: sat}},
		VMarks: marks,
	}
	if t, msg := ruleSpO2Target.Check(a.settings.SpO2Target); msg == "" {
		spo2Plot.HMarks = []plotHMark{{Y: t.InexactFloat64(), Label: "Target " + t.String() + " %"}}
	}
	return card.Body(title,
		app.Div().Class("alv-plots alv-plots-pair").Body(plotFigure(gasPlot), plotFigure(spo2Plot)),
		app.P().Class("alv-note").Text("Each point is computed by the same functions as the figures above, at the FiO2 breathed on the ground."),
	)
}

func (a *altitude) renderTrapped(res altitudeResult, msg string) app.UI {
	limit := rounded(physio.TubeCuffPerfusionLimit.CmH2O(), 0, physio.RoundNearest)
	body := []app.UI{
		app.H2().Class("alv-card-title").Text("Trapped gas, origin to highest altitude"),
		app.Div().Class("alv-form-row").Body(a.field(FieldAltCuffMl), a.field(FieldAltPtxMl), a.field(FieldAltCuffP)),
	}
	if msg != "" {
		body = append(body, app.P().Class("alv-empty alv-alt-msg").Text(msg))
	} else {
		body = append(body,
			app.Div().Class("alv-figures").Aria("live", "polite").Body(
				figure("alt-ratio", "Expansion of a free pocket of gas", "×"+rounded(res.Ratio, 2, physio.RoundUp), ""),
				figure("alt-cuff-vol", "Cuff air, if free to expand", rounded(res.CuffMl, 1, physio.RoundUp), "mL"),
				figure("alt-ptx-vol", "Pneumothorax", rounded(res.PtxMl, 0, physio.RoundUp), "mL"),
				figure("alt-cuff-rise", "Cuff pressure, if it cannot stretch", rounded(res.CuffPressure.CmH2O(), 0, physio.RoundUp), "cmH2O"),
			),
			app.If(res.CuffAboveLimit, func() app.UI {
				return app.P().Class("alv-warn").ID("alt-cuff-warn").Text("Above the " + limit + " cmH2O limit: tracheal mucosal perfusion is compromised (Mann 2007). Check the cuff with a manometer after the climb and in flight.")
			}),
			how("How",
				app.P().Text("Boyle's law: V2/V1 = P1/P2, from the origin's pressure to the highest altitude's (origin, cabin or destination). A cuff that cannot stretch keeps its gas at the same absolute pressure, so the whole fall in ambient pressure adds to its gauge pressure: an upper bound. Volumes and pressures rounded up."),
			),
		)
	}
	body = append(body, app.P().Class("alv-note").Text(physio.TrappedGasCaution))
	return app.Div().Class("alv-card").Body(body...)
}
