package ui

import (
	"fmt"
	"html"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// A small SVG plot of our own: two linear axes with ticks and units, lines,
// marked points, vertical marks, horizontal reference lines and bands. It
// draws what it is given and computes nothing clinical: callers sample
// their curves by calling physio once per point.
//
// The SVG is written as markup (app.Raw) so that it is created in the SVG
// namespace by the browser's parser; colours come from CSS classes in
// web/screens.css, which use the theme variables of web/alvea.css.

// Geometry of the drawing, in SVG user units (the viewBox). CSS scales the
// whole drawing to the width of its card, and the text with it: a text of
// 14 units is 14 px only where the drawing is shown as wide as its
// viewBox. A plot shown in half a card (two side by side) uses the narrow
// viewBox, so that its text stays at least 12 px on a 1024 px wide tablet.
const (
	plotWidth       = 640.0
	plotHeight      = 340.0
	plotNarrowWidth = 440.0 // a plot in half a card (Narrow)
	plotLeft        = 72.0  // room for tick labels and the y-axis title
	plotRight       = 34.0
	plotNarrowRight = 32.0 // room for half of the last x tick label
	plotTop         = 20.0
	plotBottom      = 58.0 // room for tick labels and the x-axis title
	plotMaxTick     = 6
	plotNarrowTicks = 5
)

// Tick label formats.
const (
	axisNumber = "number" // plain decimal numbers
	axisClock  = "clock"  // minutes after ClockRef, shown as local HH:MM
)

// plotAxis is one axis: its title and unit, its data range, and how ticks
// are labelled. Min and Max are widened to whole ticks.
type plotAxis struct {
	Label    string
	Unit     string
	Min, Max float64
	Format   string    // axisNumber (default) or axisClock
	ClockRef time.Time // with axisClock: the time at value 0 (minutes)
}

// plotPoint is one data point.
type plotPoint struct{ X, Y float64 }

// plotLine is a polyline with a legend name. Class selects its colour and
// dash in web/screens.css (alv-plot-line-1, -2, -proj, ...).
type plotLine struct {
	Name    string
	Class   string
	Points  []plotPoint
	Markers bool // draw a dot at each point (recorded readings)
}

// plotVMark is a vertical line at X with a label (a place or an event).
type plotVMark struct {
	X     float64
	Label string
}

// plotHMark is a horizontal reference line at Y (a reserve, a limit).
type plotHMark struct {
	Y     float64
	Label string
}

// plotBand is a shaded span of X with a label (a leg of the transport).
type plotBand struct {
	X0, X1 float64
	Label  string
}

// plotSpec is everything a plot shows. ID prefixes the ids of the SVG's
// title and description; Title and Desc are what assistive technology reads.
type plotSpec struct {
	ID     string
	Title  string
	Desc   string
	X, Y   plotAxis
	Lines  []plotLine
	VMarks []plotVMark
	HMarks []plotHMark
	Bands  []plotBand
	// Narrow draws on the narrow viewBox (plotNarrowWidth) with fewer
	// ticks, for a plot shown in half a card: its text is then drawn
	// about as large as the page's own.
	Narrow bool
}

// geometry returns the viewBox width and the right margin, and the most
// ticks per axis.
func (p plotSpec) geometry() (width, right float64, ticks int) {
	if p.Narrow {
		return plotNarrowWidth, plotNarrowRight, plotNarrowTicks
	}
	return plotWidth, plotRight, plotMaxTick
}

// linearScale maps a data interval onto a drawing interval.
type linearScale struct {
	D0, D1 float64 // data
	R0, R1 float64 // drawing
}

// At returns the drawing coordinate of v. A degenerate data interval maps
// everything to the middle of the drawing interval.
func (s linearScale) At(v float64) float64 {
	if s.D1 == s.D0 {
		return (s.R0 + s.R1) / 2
	}
	return s.R0 + (v-s.D0)*(s.R1-s.R0)/(s.D1-s.D0)
}

// niceStep returns a step of 1, 2, 2.5 or 5 times a power of ten that cuts
// span into at most maxTicks intervals.
func niceStep(span float64, maxTicks int) float64 {
	if !(span > 0) || math.IsInf(span, 0) || maxTicks < 1 {
		return 1
	}
	raw := span / float64(maxTicks)
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if m*mag >= raw*(1-1e-9) {
			return m * mag
		}
	}
	return 10 * mag
}

// clockStep returns a step in minutes a crew reads easily on a clock axis.
func clockStep(span float64, maxTicks int) float64 {
	for _, m := range []float64{1, 2, 5, 10, 15, 20, 30, 60, 120, 180, 240, 360, 720} {
		if span/m <= float64(maxTicks) {
			return m
		}
	}
	return 1440
}

// niceTicks widens [min, max] to whole steps and returns the ticks, the
// widened bounds and the step. An empty or invalid range becomes [min−1,
// min+1] (or [0, 1]) so the plot never divides by zero or draws NaN.
func niceTicks(min, max float64, maxTicks int, clock bool) (ticks []float64, lo, hi, step float64) {
	if math.IsNaN(min) || math.IsInf(min, 0) {
		min = 0
	}
	if math.IsNaN(max) || math.IsInf(max, 0) {
		max = min + 1
	}
	if max < min {
		min, max = max, min
	}
	if max == min {
		min, max = min-1, max+1
	}
	if clock {
		step = clockStep(max-min, maxTicks)
	} else {
		step = niceStep(max-min, maxTicks)
	}
	lo = math.Floor(min/step+1e-9) * step
	hi = math.Ceil(max/step-1e-9) * step
	n := int(math.Round((hi - lo) / step))
	for i := 0; i <= n; i++ {
		v := lo + float64(i)*step
		if math.Abs(v) < step*1e-9 {
			v = 0 // no "-0"
		}
		ticks = append(ticks, v)
	}
	return ticks, lo, hi, step
}

// tickLabel writes a tick value: whole numbers without decimals, others
// with as many decimals as the step needs; clock ticks as HH:MM local.
func (a plotAxis) tickLabel(v, step float64) string {
	if a.Format == axisClock {
		return a.ClockRef.Add(time.Duration(math.Round(v)) * time.Minute).Local().Format("15:04")
	}
	decimals := 0
	for s := step; decimals < 4 && math.Abs(s-math.Round(s)) > 1e-9; s *= 10 {
		decimals++
	}
	return strconv.FormatFloat(v, 'f', decimals, 64)
}

// finite reports whether every value is a usable number.
func finite(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// f1 writes a drawing coordinate with one decimal.
func f1(v float64) string { return strconv.FormatFloat(v, 'f', 1, 64) }

// SVG returns the plot as SVG markup. Points that are not finite are
// skipped, never drawn.
func (p plotSpec) SVG() string {
	width, rightMargin, maxTicks := p.geometry()
	xTicks, xLo, xHi, xStep := niceTicks(p.X.Min, p.X.Max, maxTicks, p.X.Format == axisClock)
	yTicks, yLo, yHi, yStep := niceTicks(p.Y.Min, p.Y.Max, maxTicks, false)
	left, right := plotLeft, width-rightMargin
	top, bottom := plotTop, plotHeight-plotBottom
	xs := linearScale{D0: xLo, D1: xHi, R0: left, R1: right}
	ys := linearScale{D0: yLo, D1: yHi, R0: bottom, R1: top}
	inX := func(v float64) bool { return finite(v) && v >= xLo && v <= xHi }
	inY := func(v float64) bool { return finite(v) && v >= yLo && v <= yHi }
	esc := html.EscapeString

	var b strings.Builder
	titleID, descID := p.ID+"-title", p.ID+"-desc"
	fmt.Fprintf(&b, `<svg xmlns="http://www.w3.org/2000/svg" class="alv-plot-svg" id="%s" viewBox="0 0 %s %s" role="img" aria-labelledby="%s %s" preserveAspectRatio="xMidYMid meet">`,
		esc(p.ID), f1(width), f1(plotHeight), titleID, descID)
	fmt.Fprintf(&b, `<title id="%s">%s</title><desc id="%s">%s</desc>`, titleID, esc(p.Title), descID, esc(p.Desc))

	// Bands under everything else.
	for i, band := range p.Bands {
		if !finite(band.X0, band.X1) {
			continue
		}
		x0, x1 := math.Max(band.X0, xLo), math.Min(band.X1, xHi)
		if x1 <= x0 {
			continue
		}
		fmt.Fprintf(&b, `<rect class="alv-plot-band alv-plot-band-%d" x="%s" y="%s" width="%s" height="%s"/>`,
			i%2, f1(xs.At(x0)), f1(top), f1(xs.At(x1)-xs.At(x0)), f1(bottom-top))
		fmt.Fprintf(&b, `<text class="alv-plot-band-label" x="%s" y="%s">%s</text>`,
			f1(xs.At(x0)+4), f1(top+14), esc(band.Label))
	}

	// Grid and ticks.
	b.WriteString(`<g class="alv-plot-grid">`)
	for _, t := range yTicks {
		y := ys.At(t)
		fmt.Fprintf(&b, `<line x1="%s" y1="%s" x2="%s" y2="%s"/>`, f1(left), f1(y), f1(right), f1(y))
	}
	for _, t := range xTicks {
		x := xs.At(t)
		fmt.Fprintf(&b, `<line x1="%s" y1="%s" x2="%s" y2="%s"/>`, f1(x), f1(top), f1(x), f1(bottom))
	}
	b.WriteString(`</g><g class="alv-plot-ticks">`)
	for _, t := range yTicks {
		fmt.Fprintf(&b, `<text class="alv-plot-ytick" x="%s" y="%s" text-anchor="end">%s</text>`,
			f1(left-8), f1(ys.At(t)+5), esc(p.Y.tickLabel(t, yStep)))
	}
	for _, t := range xTicks {
		fmt.Fprintf(&b, `<text class="alv-plot-xtick" x="%s" y="%s" text-anchor="middle">%s</text>`,
			f1(xs.At(t)), f1(bottom+20), esc(p.X.tickLabel(t, xStep)))
	}
	b.WriteString(`</g>`)
	fmt.Fprintf(&b, `<path class="alv-plot-axis" d="M%s %sV%sH%s"/>`, f1(left), f1(top), f1(bottom), f1(right))
	fmt.Fprintf(&b, `<text class="alv-plot-title" x="%s" y="%s" text-anchor="middle">%s</text>`,
		f1((left+right)/2), f1(plotHeight-8), esc(axisTitle(p.X)))
	fmt.Fprintf(&b, `<text class="alv-plot-title" x="%s" y="%s" text-anchor="middle" transform="rotate(-90 %s %s)">%s</text>`,
		f1(18), f1((top+bottom)/2), f1(18), f1((top+bottom)/2), esc(axisTitle(p.Y)))

	// Reference lines.
	for _, h := range p.HMarks {
		if !inY(h.Y) {
			continue
		}
		y := ys.At(h.Y)
		fmt.Fprintf(&b, `<line class="alv-plot-hmark" x1="%s" y1="%s" x2="%s" y2="%s"/>`, f1(left), f1(y), f1(right), f1(y))
		fmt.Fprintf(&b, `<text class="alv-plot-mark-label" x="%s" y="%s" text-anchor="end">%s</text>`, f1(right-4), f1(y-6), esc(h.Label))
	}
	for i, v := range p.VMarks {
		if !inX(v.X) {
			continue
		}
		x := xs.At(v.X)
		fmt.Fprintf(&b, `<line class="alv-plot-vmark" x1="%s" y1="%s" x2="%s" y2="%s"/>`, f1(x), f1(top), f1(x), f1(bottom))
		// Stagger the labels so that marks close together stay readable.
		anchor := "start"
		lx := x + 4
		if x > (left+right)/2 {
			anchor, lx = "end", x-4
		}
		fmt.Fprintf(&b, `<text class="alv-plot-mark-label" x="%s" y="%s" text-anchor="%s">%s</text>`,
			f1(lx), f1(top+32+float64(i%3)*18), anchor, esc(v.Label))
	}

	// Lines and their markers.
	for i, l := range p.Lines {
		class := l.Class
		if class == "" {
			class = fmt.Sprintf("alv-plot-line-%d", i+1)
		}
		var d strings.Builder
		pen := false
		for _, pt := range l.Points {
			if !inX(pt.X) || !inY(pt.Y) {
				pen = false
				continue
			}
			cmd := "L"
			if !pen {
				cmd = "M"
			}
			fmt.Fprintf(&d, "%s%s %s", cmd, f1(xs.At(pt.X)), f1(ys.At(pt.Y)))
			pen = true
		}
		if d.Len() > 0 {
			fmt.Fprintf(&b, `<path class="alv-plot-line %s" d="%s"><title>%s</title></path>`, class, d.String(), esc(l.Name))
		}
		if l.Markers {
			for _, pt := range l.Points {
				if inX(pt.X) && inY(pt.Y) {
					fmt.Fprintf(&b, `<circle class="alv-plot-point %s" cx="%s" cy="%s" r="5"/>`, class, f1(xs.At(pt.X)), f1(ys.At(pt.Y)))
				}
			}
		}
	}
	b.WriteString(`</svg>`)
	return b.String()
}

// axisTitle is "Label (unit)".
func axisTitle(a plotAxis) string {
	if a.Unit == "" {
		return a.Label
	}
	return a.Label + " (" + a.Unit + ")"
}

// plotFigure renders the plot in a <figure> with a visible legend (line
// names with their swatches) as the caption, so nothing is told by colour
// alone.
func plotFigure(p plotSpec) app.UI {
	legend := make([]app.UI, 0, len(p.Lines)+len(p.HMarks))
	for i, l := range p.Lines {
		class := l.Class
		if class == "" {
			class = fmt.Sprintf("alv-plot-line-%d", i+1)
		}
		legend = append(legend, app.Li().Body(
			app.Span().Class("alv-swatch "+class).Aria("hidden", true),
			app.Text(l.Name),
		))
	}
	for _, h := range p.HMarks {
		legend = append(legend, app.Li().Body(
			app.Span().Class("alv-swatch alv-plot-hmark").Aria("hidden", true),
			app.Text(h.Label),
		))
	}
	return app.Figure().Class("alv-plot").ID(p.ID+"-figure").Body(
		app.Raw(p.SVG()),
		app.FigCaption().Body(
			app.Ul().Class("alv-legend").Body(legend...),
		),
	)
}
