package ui

import (
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
	"alvea/physio"
)

// The audit of one transport: who and where in the chain, oxygen planned
// and used, reserve at arrival, the patient course with its timeline, the
// deviations, and what could not be computed.

func (r *review) renderTransport(a *logbook.TransportAudit) app.UI {
	engine := a.EngineVersion
	if engine == "" {
		engine = "none (no Brief)"
	}
	chain := rvChainText(a, r.all.Chain)
	top := "Alvea review · transport " + string(a.ID) + " · records " + chain + " · engine " + engine + " · audit rules " + a.AuditVersion
	return app.Article().ID("rv-transport").Class("rv-transport").DataSet("transport", string(a.ID)).Aria("labelledby", "rv-transport-title").Body(
		app.Style().Text(rvPrintPageCSS(top)),
		app.Div().Class("alv-actions rv-noprint").Body(
			app.Button().ID("rv-back").Type("button").Class("alv-button").Text("← All transports").OnClick(r.back),
		),
		r.renderIdent(a, engine, chain),
		r.renderOxygen(a),
		r.renderCourse(a),
		r.renderDeviations(a),
		r.renderNotComputable(a),
		app.P().Class("alv-note rv-audit-note").Text(rvAuditNote),
	)
}

// rvAuditNote is printed with every review.
const rvAuditNote = "Audit aid only. Figures come from the crew's entries and the Brief as recorded: check them against the source records. A figure that cannot be computed says why; it is never shown as 0. Local protocol and medical direction decide."

// renderIdent is the header of a transport's review: its id, route and
// times, and where it sits in the chain (also in every printed page's
// margin, see rvPrintPageCSS).
func (r *review) renderIdent(a *logbook.TransportAudit, engine, chain string) app.UI {
	closed := "not closed"
	if a.Closed != nil {
		closed = rvStamp(*a.Closed)
	}
	brief := "none"
	if a.BriefRecord != "" {
		brief = a.BriefRecord
	}
	item := func(id, term, value string) app.UI {
		return app.Div().Class("rv-dl-item").Body(
			app.Dt().Text(term),
			app.Dd().ID(id).Text(value),
		)
	}
	return app.Header().ID("rv-ident").Class("alv-card rv-ident").Body(
		app.H2().ID("rv-transport-title").Class("alv-card-title").Body(
			app.Text("Transport "),
			app.Span().ID("rv-record-id").Class("rv-id").Text(string(a.ID)),
		),
		app.P().Class("rv-route").Text(a.Origin+" → "+a.Destination+"; "+a.Vehicle),
		app.Dl().Class("rv-dl").Body(
			item("rv-opened", "Opened", rvStamp(a.Opened)),
			item("rv-closed", "Closed", closed),
			item("rv-chain", "Chain position", chain),
			item("rv-brief", "Brief compared", brief),
			item("rv-engine", "Engine version", engine),
			item("rv-rules", "Audit rules", a.AuditVersion),
		),
	)
}

func (r *review) renderOxygen(a *logbook.TransportAudit) app.UI {
	o := &a.Oxygen
	u := r.units
	legs := make([]app.UI, 0, len(o.PlannedLegs))
	for _, l := range o.PlannedLegs {
		name := l.Label
		if name == "" {
			name = l.Where
		}
		legs = append(legs, app.Tr().DataSet("leg", l.Index+1).Body(
			app.Th().Scope("row").Text(rvItoa(l.Index+1)+" "+name),
			app.Td().Text(l.Where),
			app.Td().Class("alv-num-cell").Text(l.StartMinute.String()+"–"+l.EndMinute.String()),
			app.Td().Class("alv-num-cell").Text(rvAltitude(l.AltitudeFt, u.AltitudeUnit)),
			app.Td().Text(rvDevice(l.Device)),
			app.Td().Class("alv-num-cell").Text(l.OxygenLpm.String()),
			app.Td().Class("alv-num-cell").DataSet("col", "planned").Text(l.OxygenL.String()),
		))
	}
	cyls := make([]app.UI, 0, len(o.Cylinders))
	for _, c := range o.Cylinders {
		cyls = append(cyls, app.Tr().DataSet("cylinder", c.Label).Body(
			app.Th().Scope("row").Text(c.Label),
			app.Td().Text(c.Definition),
			app.Td().Class("alv-num-cell").Text(rvItoa(c.Readings)),
			app.Td().Class("alv-num-cell").Text(rvGauge(c.First, u.PressureUnit)),
			app.Td().Class("alv-num-cell").Text(rvGauge(c.Last, u.PressureUnit)),
			app.Td().Class("alv-num-cell").DataSet("col", "used").Body(rvAmount("", c.UsedL)),
			app.Td().Class("alv-num-cell").Text(rvGauge(c.AtArrival, u.PressureUnit)),
			app.Td().Class("alv-num-cell").DataSet("col", "above").Body(rvAmount("", c.UsableAtArrivalL)),
		))
	}
	arrival := "No arrival recorded (handover, arrive or landing)."
	if o.Arrival != nil {
		arrival = "Arrival: " + o.ArrivalEvent + " at " + rvStamp(*o.Arrival) + " (" + o.ArrivalRecord + ")."
	}
	changes := make([]app.UI, 0, len(o.PlannedChanges))
	for _, c := range o.PlannedChanges {
		actual := "none recorded"
		if c.ActualMinute != nil {
			actual = "recorded at minute " + c.ActualMinute.String() + " (" + c.ActualRecord + ")"
		}
		li := app.Li().Text("Change from " + c.From + " planned at minute " + c.PlannedMinute.String() + ": " + actual)
		if c.Late {
			li = app.Li().Body(
				app.Text("Change from "+c.From+" planned at minute "+c.PlannedMinute.String()+": "+actual+" — "),
				app.Strong().Text("late"),
			)
		}
		changes = append(changes, li)
	}
	return app.Div().Class("rv-oxygen").Body(
		app.Section().ID("rv-planned-card").Class("alv-card rv-card").Aria("labelledby", "rv-planned-title").Body(
			app.H3().ID("rv-planned-title").Class("alv-card-title").Text("Oxygen planned (Brief)"),
			app.Div().Class("alv-figures").Body(
				rvFigure("rv-planned", "Calculated need", o.PlannedL, "no reserve; rounded up"),
				rvFigure("rv-planned-reserve", "Needed with reserve", o.PlannedWithReserveL, "rounded up"),
				rvFigure("rv-planned-usable", "Usable on board as planned", o.PlannedUsableL, "rounded down"),
				app.If(o.FinalBriefRecord != "", func() app.UI {
					return rvFigure("rv-final-planned", "Amended plan ("+o.FinalBriefRecord+")", o.FinalPlannedL, "calculated need")
				}),
			),
			app.If(len(legs) > 0, func() app.UI {
				return app.Div().Class("rv-table-wrap").Body(
					app.Table().ID("rv-legs").Class("alv-table rv-table").Body(
						app.Caption().Text("Legs of the plan, litres planned per leg"),
						app.THead().Body(app.Tr().Body(
							app.Th().Scope("col").Text("Leg"),
							app.Th().Scope("col").Text("Where"),
							app.Th().Scope("col").Text("Minutes"),
							app.Th().Scope("col").Text("Altitude"),
							app.Th().Scope("col").Text("Device"),
							app.Th().Scope("col").Text("O2 L/min"),
							app.Th().Scope("col").Text("O2 planned L"),
						)),
						app.TBody().Body(legs...),
					),
				)
			}),
			app.P().ID("rv-residual").Text("Safe residual "+rvResidual(o.ResidualPressure, u.PressureUnit)+" ("+o.ResidualSource+")."),
			app.If(len(changes) > 0, func() app.UI {
				return app.Ul().ID("rv-changes").Class("rv-list").Body(changes...)
			}),
		),
		app.Section().ID("rv-used-card").Class("alv-card rv-card").Aria("labelledby", "rv-used-title").Body(
			app.H3().ID("rv-used-title").Class("alv-card-title").Text("Oxygen used (gauge readings)"),
			app.Div().Class("alv-figures").Body(
				rvFigure("rv-used", "Used, all cylinders", o.UsedL, "rounded up"),
				rvFigure("rv-ratio", "Used ÷ planned", o.Ratio, "1 = as planned"),
				rvFigure("rv-reserve", "Reserve at arrival", o.ReserveAtArrivalL, "above the residual; rounded down"),
				rvFigure("rv-reserve-required", "Policy reserve", o.ReserveRequiredL, "with reserve − calculated need"),
				rvFigure("rv-multiple", "Reserve ÷ policy", o.ReserveMultiple, "below 1 = breached"),
			),
			app.P().ID("rv-arrival").Text(arrival),
			app.If(len(cyls) > 0, func() app.UI {
				return app.Div().Class("rv-table-wrap").Body(
					app.Table().ID("rv-cylinders").Class("alv-table rv-table").Body(
						app.Caption().Text("Litres used per cylinder"),
						app.THead().Body(app.Tr().Body(
							app.Th().Scope("col").Text("Cylinder"),
							app.Th().Scope("col").Text("Counted by"),
							app.Th().Scope("col").Text("Readings"),
							app.Th().Scope("col").Text("First gauge"),
							app.Th().Scope("col").Text("Last gauge"),
							app.Th().Scope("col").Text("Used"),
							app.Th().Scope("col").Text("Gauge at arrival"),
							app.Th().Scope("col").Text("Above residual at arrival"),
						)),
						app.TBody().Body(cyls...),
					),
				)
			}).Else(func() app.UI {
				return app.P().Class("alv-empty").Text("No cylinder defined and no gauge reading.")
			}),
		),
	)
}

func (r *review) renderCourse(a *logbook.TransportAudit) app.UI {
	pc := &a.Course
	u := r.units
	setup := make([]app.UI, 0, len(pc.SetupChanges))
	for _, c := range pc.SetupChanges {
		what := "change"
		if c.Initial {
			what = "initial"
		}
		fio2, device, flow := "—", "—", "—"
		if c.FiO2 != nil {
			fio2 = rvChangedFrom(c.FiO2Before) + c.FiO2.String()
		}
		if c.Device != "" {
			device = c.Device
			if c.DeviceFrom != "" {
				device = c.DeviceFrom + " → " + c.Device
			}
		}
		if c.FlowLpm != nil {
			flow = rvChangedFrom(c.FlowBefore) + c.FlowLpm.String() + " L/min"
		}
		setup = append(setup, app.Tr().Body(
			app.Td().Class("alv-num-cell").Text(c.Minute.String()),
			app.Td().Text(what+" ("+c.Record+")"),
			app.Td().Class("alv-num-cell").Text(fio2),
			app.Td().Text(device),
			app.Td().Class("alv-num-cell").Text(flow),
		))
	}
	lowNote := ""
	if pc.LowestRecord != "" {
		lowNote = "first at " + pc.LowestRecord + "; rounded down"
	}
	longNote := ""
	if pc.LongestBelowRecord != "" {
		longNote = "from " + pc.LongestBelowRecord
	}
	hasFiO2 := len(a.Timeline.FiO2) > 0
	return app.Section().ID("rv-course").Class("alv-card rv-card").Aria("labelledby", "rv-course-title").Body(
		app.H3().ID("rv-course-title").Class("alv-card-title").Text("Patient course"),
		app.P().ID("rv-target").Text("SpO2 target "+pc.TargetPercent.String()+" % ("+pc.TargetSource+"); "+rvPlural(pc.SpO2Readings, "SpO2 reading")+"."),
		app.Div().Class("alv-figures").Body(
			rvFigure("rv-lowest", "Lowest SpO2", pc.LowestSpO2, lowNote),
			rvFigure("rv-below", "Minutes below target", pc.MinutesBelowTarget, "each reading held until the next; rounded up"),
			rvFigure("rv-longest", "Longest run below", pc.LongestBelowMinutes, longNote),
			rvFigure("rv-observed", "Observed over", pc.ObservedMinutes, "first to last SpO2 reading"),
			rvFigure("rv-gap", "Longest gap between readings", pc.LongestGapMinutes, ""),
		),
		app.If(len(a.Timeline.SpO2Percent) > 0, func() app.UI {
			return plotFigure(rvSpO2Plot(a, u.AltitudeUnit))
		}).Else(func() app.UI {
			return app.P().Class("alv-empty").Text("No SpO2 observation: no course to plot.")
		}),
		app.If(len(setup) > 0, func() app.UI {
			return app.Div().Class("rv-table-wrap").Body(
				app.Table().ID("rv-setup").Class("alv-table rv-table").Body(
					app.Caption().Text("FiO2, device and flow: the initial set-up and each change"),
					app.THead().Body(app.Tr().Body(
						app.Th().Scope("col").Text("Minute"),
						app.Th().Scope("col").Text("Record"),
						app.Th().Scope("col").Text("FiO2"),
						app.Th().Scope("col").Text("Device"),
						app.Th().Scope("col").Text("Flow"),
					)),
					app.TBody().Body(setup...),
				),
			)
		}),
		app.If(hasFiO2, func() app.UI { return plotFigure(rvFiO2Plot(a, u.AltitudeUnit)) }),
	)
}

func (r *review) renderDeviations(a *logbook.TransportAudit) app.UI {
	items := make([]app.UI, 0, len(a.Deviations))
	for _, d := range a.Deviations {
		rec := d.Record
		if rec == "" {
			rec = "whole transport"
		}
		items = append(items, app.Li().Class("rv-dev").DataSet("code", d.Code).Body(
			app.Div().Class("rv-dev-head").Body(
				app.Span().Class("rv-code").Text(d.Code),
				app.Span().Class("rv-dev-label").Text(rvDeviationLabel(d.Code)),
				app.Span().Class("rv-dev-rec").Text(rec),
			),
			app.P().Class("rv-dev-detail").Text(d.Detail),
			app.P().Class("alv-note rv-dev-explain").Text(rvDeviationTexts[d.Code].Explain),
		))
	}
	for _, p := range a.Problems {
		items = append(items, app.Li().Class("rv-dev").Body(app.P().Class("alv-error").Text("Unreadable: "+p)))
	}
	return app.Section().ID("rv-deviations").Class("alv-card rv-card").Aria("labelledby", "rv-dev-title").Body(
		app.H3().ID("rv-dev-title").Class("alv-card-title").Text("Deviations ("+rvItoa(len(a.Deviations))+")"),
		app.If(len(items) > 0, func() app.UI { return app.Ul().Class("rv-devs").Body(items...) }).
			Else(func() app.UI { return app.P().Class("alv-empty").Text("No deviation found.") }),
	)
}

func (r *review) renderNotComputable(a *logbook.TransportAudit) app.UI {
	why := a.NotComputable()
	if len(why) == 0 {
		return app.Text("")
	}
	items := make([]app.UI, 0, len(why))
	for _, w := range why {
		items = append(items, app.Li().Text(w))
	}
	return app.Section().ID("rv-nc-card").Class("alv-card rv-card").Aria("labelledby", "rv-nc-title").Body(
		app.H3().ID("rv-nc-title").Class("alv-card-title").Text("Not computable"),
		app.P().Text("These figures could not be computed from what was recorded, for these reasons:"),
		app.Ul().ID("rv-nc").Class("rv-list").Body(items...),
	)
}

// rvChangedFrom writes "0.32 → " before a new value, or nothing for the first.
func rvChangedFrom(n *physio.Number) string {
	if n == nil {
		return ""
	}
	return n.String() + " → "
}

// rvRoute writes origin → destination.
func rvRoute(a *logbook.TransportAudit) string {
	return strings.TrimSpace(a.Origin + " → " + a.Destination)
}
