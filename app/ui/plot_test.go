package ui

import (
	"math"
	"strings"
	"testing"
	"time"
)

// Tick steps follow the 1–2–2.5–5 × 10^k rule (a common practice of chart
// axes); each row states the widened bounds a person would draw by hand.
func TestNiceTicks(t *testing.T) {
	tests := []struct {
		min, max       float64
		wantLo, wantHi float64
		wantStep       float64
		wantN          int
	}{
		{0, 100, 0, 100, 20, 6},
		{0, 8000, 0, 8000, 2000, 5},
		{3, 97, 0, 100, 20, 6},
		{0, 1, 0, 1, 0.2, 6},
		{-610, 3048, -1000, 4000, 1000, 6}, // 3658/6 ≈ 610 is above 500: steps of 1000
		{40, 100, 40, 100, 10, 7},
		{0, 2100, 0, 2500, 500, 6},
		{5, 5, 4, 6, 0.5, 5}, // an empty range is opened around its value
	}
	for _, tt := range tests {
		ticks, lo, hi, step := niceTicks(tt.min, tt.max, plotMaxTick, false)
		if math.Abs(step-tt.wantStep) > 1e-12 {
			t.Errorf("niceTicks(%g, %g) step = %g, want %g", tt.min, tt.max, step, tt.wantStep)
			continue
		}
		if lo != tt.wantLo || hi != tt.wantHi {
			t.Errorf("niceTicks(%g, %g) bounds = [%g, %g], want [%g, %g]", tt.min, tt.max, lo, hi, tt.wantLo, tt.wantHi)
		}
		if len(ticks) != tt.wantN {
			t.Errorf("niceTicks(%g, %g) gave %d ticks %v, want %d", tt.min, tt.max, len(ticks), ticks, tt.wantN)
		}
		if len(ticks) > plotMaxTick+1 {
			t.Errorf("niceTicks(%g, %g) gave %d ticks, more than %d", tt.min, tt.max, len(ticks), plotMaxTick+1)
		}
		if len(ticks) > 0 && (ticks[0] > tt.min || ticks[len(ticks)-1] < tt.max) {
			t.Errorf("niceTicks(%g, %g) ticks %v do not cover the data", tt.min, tt.max, ticks)
		}
	}
}

func TestNiceTicksBadInput(t *testing.T) {
	for _, in := range [][2]float64{{math.NaN(), 10}, {0, math.Inf(1)}, {math.Inf(-1), math.NaN()}, {10, 0}} {
		ticks, lo, hi, step := niceTicks(in[0], in[1], plotMaxTick, false)
		if !finite(lo, hi, step) || !(hi > lo) || len(ticks) < 2 {
			t.Errorf("niceTicks(%v) = %v [%g, %g] step %g: want a finite, non-empty range", in, ticks, lo, hi, step)
		}
		for _, v := range ticks {
			if !finite(v) {
				t.Errorf("niceTicks(%v) has a non-finite tick", in)
			}
		}
	}
}

// Clock axes step in minutes a clock face shows: 5, 10, 15, 30, 60 …
func TestClockTicks(t *testing.T) {
	tests := []struct {
		span float64
		step float64
	}{
		{25, 5}, {50, 10}, {80, 15}, {170, 30}, {300, 60}, {3, 1},
	}
	for _, tt := range tests {
		_, _, _, step := niceTicks(0, tt.span, plotMaxTick, true)
		if step != tt.step {
			t.Errorf("clock span %g min: step %g, want %g", tt.span, step, tt.step)
		}
	}
	ref := time.Date(2030, 1, 2, 9, 40, 0, 0, time.Local)
	a := plotAxis{Format: axisClock, ClockRef: ref}
	if got := a.tickLabel(30, 15); got != "10:10" {
		t.Errorf("clock tick 30 min after 09:40 = %q, want 10:10", got)
	}
}

func TestTickLabel(t *testing.T) {
	a := plotAxis{}
	tests := []struct {
		v, step float64
		want    string
	}{
		{2000, 500, "2000"}, {0.4, 0.2, "0.4"}, {2.5, 2.5, "2.5"}, {0, 0.25, "0.00"}, {-1000, 1000, "-1000"},
	}
	for _, tt := range tests {
		if got := a.tickLabel(tt.v, tt.step); got != tt.want {
			t.Errorf("tickLabel(%g, step %g) = %q, want %q", tt.v, tt.step, got, tt.want)
		}
	}
}

func TestLinearScale(t *testing.T) {
	s := linearScale{D0: 0, D1: 100, R0: 300, R1: 20} // y grows upward
	if got := s.At(0); got != 300 {
		t.Errorf("At(0) = %g, want 300", got)
	}
	if got := s.At(100); got != 20 {
		t.Errorf("At(100) = %g, want 20", got)
	}
	if got := s.At(25); got != 230 {
		t.Errorf("At(25) = %g, want 230", got)
	}
	if got := (linearScale{D0: 5, D1: 5, R0: 0, R1: 10}).At(5); got != 5 {
		t.Errorf("degenerate scale At = %g, want the middle 5", got)
	}
}

func TestPlotSVG(t *testing.T) {
	p := plotSpec{
		ID:     "test-plot",
		Title:  "Oxygen <remaining>",
		Desc:   "A & B",
		X:      plotAxis{Label: "Altitude", Unit: "ft", Min: 0, Max: 8000},
		Y:      plotAxis{Label: "PAO2", Unit: "mmHg", Min: 40, Max: 100},
		Lines:  []plotLine{{Name: "PAO2", Points: []plotPoint{{0, 99.7}, {4000, 80}, {math.NaN(), 70}, {8000, 58.7}, {9000, math.Inf(1)}}, Markers: true}},
		VMarks: []plotVMark{{X: 8000, Label: "Cabin"}, {X: 50000, Label: "Off the axis"}},
		HMarks: []plotHMark{{Y: 60, Label: "Limit"}},
		Bands:  []plotBand{{X0: 1000, X1: 3000, Label: "Leg 1"}},
	}
	svg := p.SVG()
	for _, want := range []string{
		`role="img"`, `aria-labelledby="test-plot-title test-plot-desc"`,
		`<title id="test-plot-title">Oxygen &lt;remaining&gt;</title>`,
		`<desc id="test-plot-desc">A &amp; B</desc>`,
		"Altitude (ft)", "PAO2 (mmHg)", ">8000<", ">Cabin<", ">Limit<", ">Leg 1<",
	} {
		if !strings.Contains(svg, want) {
			t.Errorf("SVG lacks %q", want)
		}
	}
	for _, bad := range []string{"NaN", "Inf", "Off the axis"} {
		if strings.Contains(svg, bad) {
			t.Errorf("SVG contains %q", bad)
		}
	}
	// The NaN point breaks the line in two (M … L …, M …).
	_, rest, _ := strings.Cut(svg, `class="alv-plot-line alv-plot-line-1" d="`)
	d, _, _ := strings.Cut(rest, `"`)
	if strings.Count(d, "M") != 2 || strings.Count(d, "L") != 1 {
		t.Errorf("line path %q: want two pieces (M L, M)", d)
	}
	if strings.Count(svg, "<circle") != 3 {
		t.Errorf("want 3 markers (finite points only), got %d", strings.Count(svg, "<circle"))
	}
}
