package ui

import (
	"fmt"
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
	FieldAltCabinLimit = "alt-cabin-limit"
	FieldAltFiO2       = "alt-fio2"
	FieldAltPaCO2      = "alt-paco2"
	FieldAltPaO2       = "alt-pao2-ground"
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
// (in Unit) and its allowed range per unit.
type altField struct {
	ID, Label, Kind string
	Start, Unit     string // start value and the unit it is written in
	Rules           map[string]rangeRule
}

// Start values are a demonstration of our own (sea level to a 25 000 ft
// cruise with a 6 psi aircraft; a healthy adult breathing air) used when no
// Brief draft gives the route and patient. The 8 000 ft cabin limit is
// 14 CFR 25.841(a); the 10 mL cuff and 500 mL pneumothorax are the plan
// engine's worked examples; 25 cmH2O is a common cuff setting (common
// practice, from memory).
var altFields = []altField{
	{FieldAltOrigin, "Origin field elevation", kindAltitude, "0", UnitFeet, altitudeRules("Origin field elevation")},
	{FieldAltDest, "Destination field elevation", kindAltitude, "0", UnitFeet, altitudeRules("Destination field elevation")},
	{FieldAltCruise, "Cruise altitude", kindAltitude, "25000", UnitFeet, altitudeRules("Cruise altitude")},
	{FieldAltDiff, "Maximum pressure differential (0: unpressurised)", kindDiff, "6", UnitPsi, map[string]rangeRule{
		UnitPsi: {Label: "Pressure differential", Min: "0", Max: "15", Unit: UnitPsi},
		UnitBar: {Label: "Pressure differential", Min: "0", Max: "1.03", Unit: UnitBar},
	}},
	{FieldAltCabinLimit, "Cabin altitude limit", kindAltitude, "8000", UnitFeet, altitudeRules("Cabin altitude limit")},
	{FieldAltFiO2, "FiO2 breathed on the ground", kindFixed, "0.21", "fraction", map[string]rangeRule{
		"fraction": {Label: "FiO2", Min: "0.21", Max: "1", Unit: "(fraction)"},
	}},
	{FieldAltPaCO2, "PaCO2 on the ground", kindGas, "40", UnitMmHg, map[string]rangeRule{
		UnitMmHg: {Label: "PaCO2", Min: "10", Max: "150", Unit: UnitMmHg},
		UnitKPa:  {Label: "PaCO2", Min: "1.4", Max: "19.9", Unit: UnitKPa},
	}},
	{FieldAltPaO2, "PaO2 on the ground (at the origin)", kindGas, "95", UnitMmHg, map[string]rangeRule{
		UnitMmHg: {Label: "PaO2", Min: "20", Max: "600", Unit: UnitMmHg},
		UnitKPa:  {Label: "PaO2", Min: "2.7", Max: "79.9", Unit: UnitKPa},
	}},
	{FieldAltCuffMl, "Air in a tube cuff", kindFixed, "10", "mL", map[string]rangeRule{
		"mL": {Label: "Cuff volume", Min: "1", Max: "50", Unit: "mL"},
	}},
	{FieldAltPtxMl, "Pneumothorax volume", kindFixed, "500", "mL", map[string]rangeRule{
		"mL": {Label: "Pneumothorax volume", Min: "1", Max: "5000", Unit: "mL"},
	}},
	{FieldAltCuffP, "Cuff pressure set on the ground", kindFixed, "25", "cmH2O", map[string]rangeRule{
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

	settings Settings
	text     map[string]string // each field as typed
	unit     map[string]string // the unit each field was typed in
	messages FieldErrors
	fromPlan bool
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
	a.load(LoadSettings(ctx))
	a.adoptDraft(ctx)
	ctx.ObserveState(SettingsKey, &a.settings).OnChange(a.showUnits)
}

// adoptDraft fills the route and patient from the Brief draft's plan.
func (a *altitude) adoptDraft(ctx app.Context) {
	doc, ok := draftPlan(ctx)
	if !ok || doc == nil {
		return
	}
	set := func(id string, v *float64, unit string) {
		if v != nil {
			a.text[id], a.unit[id] = strconv.FormatFloat(*v, 'f', -1, 64), unit
		}
	}
	set(FieldAltOrigin, doc.Route.OriginElevationFt, UnitFeet)
	set(FieldAltDest, doc.Route.DestinationElevationFt, UnitFeet)
	set(FieldAltCruise, doc.Route.CruiseAltitudeFt, UnitFeet)
	if doc.Route.MaxDifferentialPsi != nil {
		set(FieldAltDiff, doc.Route.MaxDifferentialPsi, UnitPsi)
	} else {
		a.text[FieldAltDiff], a.unit[FieldAltDiff] = "0", UnitPsi
	}
	set(FieldAltFiO2, doc.Patient.FiO2, "fraction")
	set(FieldAltPaCO2, doc.Patient.PaCO2MmHg, UnitMmHg)
	set(FieldAltPaO2, doc.Patient.PaO2MmHg, UnitMmHg)
	a.fromPlan = true
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
	for _, f := range altFields {
		if f.ID == id {
			a.unit[id] = a.displayUnit(f)
			if _, msg := f.Rules[a.unit[id]].Check(text); msg != "" {
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
	return altitudeInputs{
		Origin: alt(FieldAltOrigin), Destination: alt(FieldAltDest), Cruise: alt(FieldAltCruise), CabinLimit: alt(FieldAltCabinLimit),
		Differential: pressureOf(vals[FieldAltDiff], a.unit[FieldAltDiff]),
		FiO2:         physio.FractionOf(vals[FieldAltFiO2]),
		PaCO2:        gas(FieldAltPaCO2), PaO2: gas(FieldAltPaO2),
		CuffMl: vals[FieldAltCuffMl], PneumothoraxMl: vals[FieldAltPtxMl],
		CuffGauge: physio.CmH2O(vals[FieldAltCuffP]),
	}, true
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
	in, ok := a.inputs()
	var res altitudeResult
	msg := "Correct the marked fields to see the figures."
	if ok {
		res, msg = computeAltitude(in)
	}
	au, gu := a.settings.AltitudeUnit, a.settings.GasUnit
	source := "Start values are an example; the Brief's plan fills the route and patient when there is one."
	if a.fromPlan {
		source = "Route and patient from the Brief's plan; changes here are not saved to it."
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
			),
			app.Div().Class("alv-card").Aria("live", "polite").Body(
				app.H2().Class("alv-card-title").Text("Cabin"),
				results(
					figure("alt-cabin", "Cabin altitude", a.altText(res.Cabin, physio.RoundUp), au),
					figure("alt-highest", "Highest altitude on the route ("+res.HighestPlace+")", a.altText(res.Highest, physio.RoundUp), au),
				),
				app.If(msg == "" && res.Cabin > physio.CabinAltitudeLimit, func() app.UI {
					return app.P().Class("alv-warn").ID("alt-cabin-warn").Text("The cabin is above 8000 ft, the ceiling of normal operation (14 CFR 25.841(a)).")
				}),
				how("How",
					app.P().Text("Cabin pressure = standard-atmosphere pressure at cruise + the maximum differential; cabin altitude = the standard-atmosphere altitude of that pressure (U.S. Standard Atmosphere 1976), never below the origin field; a differential of 0 is an unpressurised cabin. Rounded up."),
					app.P().Text("A cabin altitude the pilot states is the better figure: enter it on the Brief."),
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
			),
			app.Div().Class("alv-card").Aria("live", "polite").Body(
				app.H2().Class("alv-card-title").Text("At the cabin altitude, same FiO2"),
				results(
					figure("alt-pao2-alv", "Alveolar PO2 (PAO2)", a.gasText(res.PAO2Cabin, physio.RoundDown), gu),
					figure("alt-pao2-art", "Expected PaO2", a.gasText(res.PaO2Cabin, physio.RoundDown), gu),
					figure("alt-spo2", "Expected SpO2", rounded(res.SpO2Cabin.Percent(), 0, physio.RoundDown), "%"),
				),
				how("How",
					app.P().Text("PAO2 = FiO2·(PB − 47 mmHg) − PaCO2/0.8 (simplified alveolar gas equation). Expected PaO2 = the ground a/A ratio (PaO2 ÷ PAO2 at the origin) × PAO2 (constant a/A ratio method). SpO2 from PaO2 by the Severinghaus equation (J Appl Physiol 1979). All rounded down."),
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
		Lines:  []plotLine{{Name: "Alveolar PO2 (PAO2)", Class: "alv-plot-line-1", Points: pA}, {Name: "Expected arterial PaO2", Class: "alv-plot-line-2", Points: pa}},
		VMarks: marks,
	}
	spo2Plot := plotSpec{
		ID:     "alt-spo2-plot",
		Title:  "Expected SpO2 against altitude",
		Desc:   fmt.Sprintf("Expected SpO2 %s %% at the cabin altitude; the SpO2 target in Settings is %s %%.", rounded(res.SpO2Cabin.Percent(), 0, physio.RoundDown), a.settings.SpO2Target),
		X:      xAxis,
		Y:      plotAxis{Label: "Expected SpO2", Unit: "%", Min: 50, Max: 100},
		Lines:  []plotLine{{Name: "Expected SpO2", Class: "alv-plot-line-2", Points: sat}},
		VMarks: marks,
	}
	if t, msg := ruleSpO2Target.Check(a.settings.SpO2Target); msg == "" {
		spo2Plot.HMarks = []plotHMark{{Y: t.InexactFloat64(), Label: "Target " + t.String() + " %"}}
	}
	return card.Body(title,
		app.Div().Class("alv-plots").Body(plotFigure(gasPlot), plotFigure(spo2Plot)),
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
