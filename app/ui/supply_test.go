package ui

import (
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// mountSupply mounts a Supply screen with a stopped clock at 09:00 local
// and no ticker.
func mountSupply(t *testing.T) (*supply, *ctxProbe, app.TestEngine, *time.Time) {
	t.Helper()
	now := time.Date(2030, 5, 6, 9, 0, 0, 0, time.Local)
	s := &supply{tick: 0}
	s.now = func() time.Time { return now }
	s.load(DefaultSettings(), defaultSupplySession())
	p, e := mount(t, s)
	return s, p, e, &now
}

// rendered mounts a fresh render of c (its state as it is now) and
// returns the HTML.
func rendered(t *testing.T, c app.Composer) string {
	t.Helper()
	p, _ := mount(t, c.Render())
	return app.HTMLString(p)
}

// htmlText returns the text of the element with id in html ("" if none).
func htmlText(html, id string) string {
	i := strings.Index(html, `id="`+id+`"`)
	if i < 0 {
		return ""
	}
	rest := html[i:]
	start := strings.Index(rest, ">")
	end := strings.Index(rest, "<")
	if start < 0 || end < start {
		return ""
	}
	return strings.TrimSpace(rest[start+1 : end])
}

// An E cylinder at 2000 psi with a 200 psi residual at 10 L/min lasts
// 50.4 min (REFERENCES §7 [calc]: (2000 − 200) × 0.28 / 10): 50 whole
// minutes, the change due at 09:50 for a reading at 09:00. With the 30 min
// reserve of the default settings (300 L at 10 L/min) and 504 L on board,
// the reserve is reached after 20.4 min: 09:20.
func TestSupplyCountdown(t *testing.T) {
	s, p, _, now := mountSupply(t)
	html := rendered(t, s)
	if htmlText(html, "supply-minutes") != "" {
		t.Fatal("a countdown is shown before any reading")
	}
	s.edit(p.ctx, FieldSupplyGauge, "2000")
	s.edit(p.ctx, FieldSupplyFlow, "10")
	html = rendered(t, s)
	checks := map[string]string{
		"supply-minutes":         "50",
		"supply-minutes-reading": "50",
		"supply-change-at":       "09:50",
		"supply-reserve-at":      "09:20",
		"supply-usable":          "504", // 1800 psi × 0.28 L/psi
		"supply-total":           "504",
	}
	for id, want := range checks {
		if got := htmlText(html, id); got != want {
			t.Errorf("%s = %q, want %q", id, got, want)
		}
	}
	if !strings.Contains(html, `id="supply-plot"`) || !strings.Contains(html, "Reserve 300 L") {
		t.Error("the plot with the reserve line is missing")
	}
	for _, bad := range []string{"NaN", "Inf"} {
		if strings.Contains(html, bad) {
			t.Errorf("the screen shows %q", bad)
		}
	}

	// 20 minutes on, the clock ticks: 30.4 min left, shown as 30.
	s.shown = now.Add(20 * time.Minute)
	if got := htmlText(rendered(t, s), "supply-minutes"); got != "30" {
		t.Errorf("after 20 min, minutes left = %q, want 30", got)
	}

	// A second reading 20 minutes later, 1000 psi at 8 L/min:
	// (1000 − 200) × 0.28 / 8 = 28 min → change at 09:48.
	*now = now.Add(20 * time.Minute)
	s.edit(p.ctx, FieldSupplyGauge, "1000")
	s.edit(p.ctx, FieldSupplyFlow, "8")
	html = rendered(t, s)
	if got := htmlText(html, "supply-minutes"); got != "28" {
		t.Errorf("second reading: minutes = %q, want 28", got)
	}
	if got := htmlText(html, "supply-change-at"); got != "09:48" {
		t.Errorf("second reading: change at %q, want 09:48", got)
	}
	if n := len(s.session.Readings); n != 2 {
		t.Errorf("%d readings kept, want 2", n)
	}
}

// A gauge above the cylinder's range shows its message with the range and
// unit, and no figure is shown.
func TestSupplyBadValue(t *testing.T) {
	s, p, _, _ := mountSupply(t)
	s.edit(p.ctx, FieldSupplyGauge, "2000")
	s.edit(p.ctx, FieldSupplyFlow, "10")
	s.edit(p.ctx, FieldSupplyGauge, "3500")
	html := rendered(t, s)
	msg := htmlText(html, FieldSupplyGauge+"-msg")
	if !strings.Contains(msg, "Gauge reading") || !strings.Contains(msg, "between 0 and 3000 psi") {
		t.Errorf("message = %q", msg)
	}
	if htmlText(html, "supply-minutes") != "" || htmlText(html, "supply-change-at") != "" {
		t.Error("a figure is shown while a field is invalid")
	}
	s.edit(p.ctx, FieldSupplyFlow, "0")
	if msg := htmlText(rendered(t, s), FieldSupplyFlow+"-msg"); !strings.Contains(msg, "between 0.1 and 70 L/min") {
		t.Errorf("flow message = %q", msg)
	}
}

// A correction within a minute replaces the reading; a later one is kept
// as a new point.
func TestSupplyReadingsMerge(t *testing.T) {
	var s SupplySession
	at := time.Date(2030, 1, 1, 10, 0, 0, 0, time.UTC)
	s.record(SupplyReading{AtUnixMilli: at.UnixMilli(), Gauge: "2000"})
	s.record(SupplyReading{AtUnixMilli: at.Add(20 * time.Second).UnixMilli(), Gauge: "1900"})
	if len(s.Readings) != 1 || s.Readings[0].Gauge != "1900" {
		t.Fatalf("correction: %+v", s.Readings)
	}
	s.record(SupplyReading{AtUnixMilli: at.Add(5 * time.Minute).UnixMilli(), Gauge: "1700"})
	s.record(SupplyReading{AtUnixMilli: at.Add(5*time.Minute + time.Second).UnixMilli(), Cylinder: 1, Gauge: "2000"})
	if len(s.Readings) != 3 {
		t.Fatalf("want 3 readings, got %+v", s.Readings)
	}
}

// In bar, a stored psi reading is shown converted and rounded down (less
// oxygen is the safe side): 2000 psi = 137.895 bar (GNU units: `units -t
// '2000 psi' bar` → 137.89515) → 137.8. The countdown keeps the exact
// stored reading.
func TestSupplyUnits(t *testing.T) {
	s, p, _, _ := mountSupply(t)
	s.edit(p.ctx, FieldSupplyGauge, "2000")
	s.edit(p.ctx, FieldSupplyFlow, "10")
	st := s.settings
	st.PressureUnit = UnitBar
	s.settings = st
	s.unitsChanged()
	if s.gaugeText != "137.8" {
		t.Errorf("gauge in bar = %q, want 137.8", s.gaugeText)
	}
	if got := htmlText(rendered(t, s), "supply-minutes"); got != "50" {
		t.Errorf("minutes after a unit change = %q, want 50", got)
	}
	// A bar reading on an E cylinder: range 0 to 206.8 bar (3000 psi =
	// 206.843 bar, GNU units, rounded down).
	s.edit(p.ctx, FieldSupplyGauge, "250")
	if msg := htmlText(rendered(t, s), FieldSupplyGauge+"-msg"); !strings.Contains(msg, "between 0 and 206.8 bar") {
		t.Errorf("bar message = %q", msg)
	}
}
