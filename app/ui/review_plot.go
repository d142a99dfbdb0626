package ui

import (
	"fmt"
	"math"
	"strings"

	"alvea/app/logbook"
	"alvea/physio"
)

// Plot data of the Review screen, laid out from the audit's Timeline and
// Distributions for the shared plot component (plot.go). Nothing here is
// computed for the patient: the values are the audit's, placed on axes.

// rvTimelineSpan returns the last minute worth drawing: the end of the last
// planned leg, the last event or the last observation, at least 10.
func rvTimelineSpan(tl *logbook.Timeline) float64 {
	end := 10.0
	for _, l := range tl.PlannedLegs {
		end = math.Max(end, l.EndMinute.InexactFloat64())
	}
	for _, e := range tl.Events {
		end = math.Max(end, e.Minute.InexactFloat64())
	}
	for _, series := range [][]logbook.TimePoint{tl.SpO2Percent, tl.FiO2, tl.FlowLpm, tl.CabinAltitudeFt} {
		for _, p := range series {
			end = math.Max(end, p.Minute.InexactFloat64())
		}
	}
	return end
}

// rvLegBands marks the planned legs, labelled with their number and
// altitude in the display unit (short: a leg of a few minutes is narrow;
// the legs table names them).
func rvLegBands(tl *logbook.Timeline, altUnit string) []plotBand {
	bands := make([]plotBand, 0, len(tl.PlannedLegs))
	for _, l := range tl.PlannedLegs {
		bands = append(bands, plotBand{
			X0: l.StartMinute.InexactFloat64(), X1: l.EndMinute.InexactFloat64(),
			Label: fmt.Sprintf("leg %d · %s", l.Index+1, rvAltitude(l.AltitudeFt, altUnit)),
		})
	}
	return bands
}

// rvEventMarks marks the recorded events; an event that recorded a cabin
// altitude carries it in its label.
func rvEventMarks(tl *logbook.Timeline, altUnit string) []plotVMark {
	cabin := map[string]physio.Number{}
	for _, p := range tl.CabinAltitudeFt {
		cabin[p.Record] = p.Value
	}
	marks := make([]plotVMark, 0, len(tl.Events))
	for _, e := range tl.Events {
		label := e.Type
		if e.Text != "" {
			label += " " + e.Text
		}
		if alt, ok := cabin[e.Record]; ok {
			label += " · cabin " + rvAltitude(alt, altUnit)
		}
		marks = append(marks, plotVMark{X: e.Minute.InexactFloat64(), Label: label})
	}
	return marks
}

// rvHeldSteps draws readings as the audit counts them: each value holds
// until the next reading (sample and hold), so the time under a line is
// the time the audit counts.
func rvHeldSteps(points []logbook.TimePoint) []plotPoint {
	out := make([]plotPoint, 0, 2*len(points))
	for i, p := range points {
		x, y := p.Minute.InexactFloat64(), p.Value.InexactFloat64()
		if i > 0 {
			out = append(out, plotPoint{X: x, Y: out[len(out)-1].Y})
		}
		out = append(out, plotPoint{X: x, Y: y})
	}
	return out
}

func rvReadingPoints(points []logbook.TimePoint) []plotPoint {
	out := make([]plotPoint, 0, len(points))
	for _, p := range points {
		out = append(out, plotPoint{X: p.Minute.InexactFloat64(), Y: p.Value.InexactFloat64()})
	}
	return out
}

func rvPointsText(points []logbook.TimePoint, unit string) string {
	parts := make([]string, 0, len(points))
	for _, p := range points {
		parts = append(parts, fmt.Sprintf("minute %s: %s%s (%s)", p.Minute, p.Value, unit, p.Record))
	}
	return strings.Join(parts, "; ")
}

// rvSpO2Plot is the patient course: SpO2 readings held until the next, the
// target, the planned legs and the events.
func rvSpO2Plot(a *logbook.TransportAudit, altUnit string) plotSpec {
	tl := &a.Timeline
	target := tl.TargetPercent.InexactFloat64()
	lo := target
	for _, p := range tl.SpO2Percent {
		lo = math.Min(lo, p.Value.InexactFloat64())
	}
	return plotSpec{
		ID:    "rv-plot-spo2",
		Title: "SpO2 through the transport",
		Desc: fmt.Sprintf("SpO2 readings against the target of %s %%, on minutes from the opening of the transport, with the planned legs and the recorded events. Readings: %s.",
			tl.TargetPercent, rvPointsText(tl.SpO2Percent, " %")),
		X:      plotAxis{Label: "Minutes from opening", Unit: "min", Min: 0, Max: rvTimelineSpan(tl)},
		Y:      plotAxis{Label: "SpO2", Unit: "%", Min: math.Floor(lo) - 2, Max: 100},
		Bands:  rvLegBands(tl, altUnit),
		VMarks: rvEventMarks(tl, altUnit),
		HMarks: []plotHMark{{Y: target, Label: "target " + tl.TargetPercent.String() + " %"}},
		Lines: []plotLine{
			{Name: "SpO2, each reading held until the next", Class: "alv-plot-line-1", Points: rvHeldSteps(tl.SpO2Percent)},
			{Name: "SpO2 readings", Class: "alv-plot-line-1 rv-dots", Points: rvReadingPoints(tl.SpO2Percent), Markers: true},
		},
	}
}

// rvFiO2Plot is the FiO2 set-up through the transport (held until changed),
// with the planned legs and the events.
func rvFiO2Plot(a *logbook.TransportAudit, altUnit string) plotSpec {
	tl := &a.Timeline
	hi := 0.5
	for _, p := range tl.FiO2 {
		hi = math.Max(hi, p.Value.InexactFloat64())
	}
	return plotSpec{
		ID:     "rv-plot-fio2",
		Title:  "FiO2 through the transport",
		Desc:   "FiO2 as observed, each value held until the next, on minutes from the opening of the transport. Values: " + rvPointsText(tl.FiO2, "") + ".",
		X:      plotAxis{Label: "Minutes from opening", Unit: "min", Min: 0, Max: rvTimelineSpan(tl)},
		Y:      plotAxis{Label: "FiO2", Unit: "fraction", Min: 0.2, Max: math.Min(1, hi+0.1)},
		Bands:  rvLegBands(tl, altUnit),
		VMarks: rvEventMarks(tl, altUnit),
		Lines: []plotLine{
			{Name: "FiO2, held until changed", Class: "alv-plot-line-2", Points: rvHeldSteps(tl.FiO2)},
			{Name: "FiO2 observations", Class: "alv-plot-line-2 rv-dots", Points: rvReadingPoints(tl.FiO2), Markers: true},
		},
	}
}

// rvDistributionPlot places each transport's value (oldest first, by its
// row number in the table) against the reference line at 1.
func rvDistributionPlot(id, title, yLabel, refLabel string, d logbook.Distribution, rows []logbook.TransportAudit) plotSpec {
	row := map[logbook.TransportID]int{}
	for i := range rows {
		row[rows[i].ID] = i + 1
	}
	pts := make([]plotPoint, 0, len(d.Values))
	hi := 1.5
	var desc []string
	for _, v := range d.Values {
		y := v.Value.InexactFloat64()
		pts = append(pts, plotPoint{X: float64(row[v.ID]), Y: y})
		hi = math.Max(hi, y)
		desc = append(desc, fmt.Sprintf("row %d (%s): %s", row[v.ID], v.ID, v.Value))
	}
	// Whole-number ticks: a multiple of the plot's tick count as the span.
	xMax := float64(plotMaxTick) * math.Ceil(float64(len(rows)+1)/plotMaxTick)
	text := "no computable value"
	if len(desc) > 0 {
		text = strings.Join(desc, "; ")
	}
	return plotSpec{
		ID:     id,
		Title:  title,
		Desc:   fmt.Sprintf("%s per transport, by row of the table (%d not computable): %s.", yLabel, d.NotComputable, text),
		X:      plotAxis{Label: "Transport (row # of the table)", Min: 0, Max: xMax},
		Y:      plotAxis{Label: yLabel, Min: 0, Max: hi},
		HMarks: []plotHMark{{Y: 1, Label: refLabel}},
		Narrow: true, // one of a pair (renderDistributions)
		Lines:  []plotLine{{Name: "one transport", Class: "alv-plot-line-1 rv-dots", Points: pts, Markers: true}},
	}
}
