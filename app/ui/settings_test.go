package ui

import (
	"reflect"
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// Range checks: each message names the field, the allowed range and the
// unit. The ranges are Alvea's own (see settings.go); the values at the
// edges are inclusive.
func TestSettingsValidate(t *testing.T) {
	cases := []struct {
		name  string
		edit  func(*Settings)
		field string // "" when valid
		want  string // part of the message
	}{
		{"defaults", func(*Settings) {}, "", ""},
		{"residual at max psi", func(s *Settings) { s.SafeResidual = "1000" }, "", ""},
		{"residual over max psi", func(s *Settings) { s.SafeResidual = "1000.1" }, FieldSafeResidual, "between 0 and 1000 psi"},
		{"residual negative", func(s *Settings) { s.SafeResidual = "-1" }, FieldSafeResidual, "between 0 and 1000 psi"},
		{"residual at max bar", func(s *Settings) { s.SafeResidual, s.SafeResidualUnit = "68.9", UnitBar }, "", ""},
		{"residual over max bar", func(s *Settings) { s.SafeResidual, s.SafeResidualUnit = "69", UnitBar }, FieldSafeResidual, "between 0 and 68.9 bar"},
		{"residual empty", func(s *Settings) { s.SafeResidual = " " }, FieldSafeResidual, "Safe residual is required"},
		{"residual not a number", func(s *Settings) { s.SafeResidual = "two hundred" }, FieldSafeResidual, "is not a number"},
		{"residual exponent", func(s *Settings) { s.SafeResidual = "2e2" }, FieldSafeResidual, "is not a number"},
		{"residual unit unknown", func(s *Settings) { s.SafeResidualUnit = "kPa" }, FieldSafeResidual, "psi or bar"},
		{"factor comma decimal", func(s *Settings) { s.ReserveFactor = "1,5" }, "", ""},
		{"factor under 1", func(s *Settings) { s.ReserveFactor = "0.9" }, FieldReserveFactor, "between 1 and 3 ×"},
		{"minutes fractional", func(s *Settings) { s.ReserveMinutes = "30.5" }, FieldReserveMinutes, "whole number between 0 and 240 min"},
		{"minutes over", func(s *Settings) { s.ReserveMinutes = "241" }, FieldReserveMinutes, "between 0 and 240 min"},
		{"spo2 under", func(s *Settings) { s.SpO2Target = "84" }, FieldSpO2Target, "between 85 and 100 %"},
		{"spo2 100", func(s *Settings) { s.SpO2Target = "100" }, "", ""},
		{"theme unknown", func(s *Settings) { s.Theme = "dusk" }, "theme", "day or night"},
		{"auto-lock 1 min", func(s *Settings) { s.AutoLockMinutes = "1" }, "", ""},
		{"auto-lock 60 min", func(s *Settings) { s.AutoLockMinutes = "60" }, "", ""},
		{"auto-lock 0", func(s *Settings) { s.AutoLockMinutes = "0" }, FieldAutoLock, "Auto-lock must be between 1 and 60 min"},
		{"auto-lock 61", func(s *Settings) { s.AutoLockMinutes = "61" }, FieldAutoLock, "between 1 and 60 min"},
		{"auto-lock fractional", func(s *Settings) { s.AutoLockMinutes = "2.5" }, FieldAutoLock, "whole number between 1 and 60 min"},
		{"auto-lock empty", func(s *Settings) { s.AutoLockMinutes = "" }, FieldAutoLock, "Auto-lock is required"},
		{"auto-lock text", func(s *Settings) { s.AutoLockMinutes = "five" }, FieldAutoLock, "is not a number"},
		{"pressure unit unknown", func(s *Settings) { s.PressureUnit = "atm" }, "pressureUnit", "psi or bar"},
		{"bad cylinder", func(s *Settings) {
			s.Cylinders = []CustomCylinder{{Name: "X", WaterCapacity: "0", FullPressure: "200", PressureUnit: UnitBar}}
		}, "cylinder-0", "between 0.1 and 100 L"},
	}
	for _, c := range cases {
		s := DefaultSettings()
		c.edit(&s)
		errs := s.Validate()
		if c.field == "" {
			if len(errs) != 0 {
				t.Errorf("%s: unexpected errors %v", c.name, errs)
			}
			continue
		}
		msg, ok := errs[c.field]
		if !ok {
			t.Errorf("%s: no error on %s (errors %v)", c.name, c.field, errs)
			continue
		}
		if !strings.Contains(msg, c.want) {
			t.Errorf("%s: message %q does not contain %q", c.name, msg, c.want)
		}
		if len(errs) != 1 {
			t.Errorf("%s: %d errors, want 1: %v", c.name, len(errs), errs)
		}
	}
}

func TestCustomCylinderValidate(t *testing.T) {
	ok := CustomCylinder{Name: "Clinic 10 L", WaterCapacity: "10", FullPressure: "200", PressureUnit: UnitBar}
	if errs := ok.Validate(); len(errs) != 0 {
		t.Fatalf("valid cylinder refused: %v", errs)
	}
	cases := []struct {
		edit  func(*CustomCylinder)
		field string
		want  string
	}{
		{func(c *CustomCylinder) { c.Name = "" }, FieldCylName, "1 to 24 characters"},
		{func(c *CustomCylinder) { c.Name = strings.Repeat("x", 25) }, FieldCylName, "1 to 24 characters"},
		{func(c *CustomCylinder) { c.WaterCapacity = "100.5" }, FieldCylWater, "between 0.1 and 100 L"},
		{func(c *CustomCylinder) { c.FullPressure = "301" }, FieldCylPressure, "between 100 and 300 bar"},
		{func(c *CustomCylinder) { c.FullPressure, c.PressureUnit = "5000", UnitPsi }, FieldCylPressure, "between 1450 and 4350 psi"},
	}
	for _, c := range cases {
		cyl := ok
		c.edit(&cyl)
		msg := cyl.Validate()[c.field]
		if !strings.Contains(msg, c.want) {
			t.Errorf("%+v: %s message %q does not contain %q", cyl, c.field, msg, c.want)
		}
	}
}

// A residual typed in one unit and shown in the other is converted and
// rounded up (the safe side). Reference conversions by GNU units 3.x:
// `units -t '200 psi' bar` = 13.789514 → 13.8 bar;
// `units -t '13.8 bar' psi` = 200.15199 → 201 psi;
// `units -t '14 bar' psi` = 203.05279 → 204 psi.
func TestSafeResidualShown(t *testing.T) {
	cases := []struct {
		value, unit, display, want string
	}{
		{"200", UnitPsi, UnitPsi, "200"},
		{"200", UnitPsi, UnitBar, "13.8"},
		{"13.8", UnitBar, UnitPsi, "201"},
		{"14", UnitBar, UnitPsi, "204"},
		{"14", UnitBar, UnitBar, "14"},
	}
	for _, c := range cases {
		s := DefaultSettings()
		s.SafeResidual, s.SafeResidualUnit, s.PressureUnit = c.value, c.unit, c.display
		if got := s.SafeResidualShown(); got != c.want {
			t.Errorf("%s %s shown in %s = %q, want %q", c.value, c.unit, c.display, got, c.want)
		}
	}
}

// Stored settings from a damaged or older copy never reach a screen as is:
// each invalid field falls back to its default, valid ones are kept.
func TestSettingsNormalized(t *testing.T) {
	s := DefaultSettings()
	s.Schema = 0
	s.PressureUnit = UnitBar
	s.ReserveFactor = "NaN"
	s.Theme = ""
	s.Cylinders = []CustomCylinder{
		{Name: "Good", WaterCapacity: "2", FullPressure: "200", PressureUnit: UnitBar},
		{Name: "", WaterCapacity: "2", FullPressure: "200", PressureUnit: UnitBar},
	}
	got, changed := s.normalized()
	if !changed {
		t.Fatal("normalized reported no change")
	}
	d := DefaultSettings()
	if got.PressureUnit != UnitBar || got.ReserveFactor != d.ReserveFactor || got.Theme != d.Theme || got.Schema != settingsSchema {
		t.Errorf("normalized = %+v", got)
	}
	if len(got.Cylinders) != 1 || got.Cylinders[0].Name != "Good" {
		t.Errorf("cylinders = %+v, want only Good", got.Cylinders)
	}
	if errs := got.Validate(); len(errs) != 0 {
		t.Errorf("normalized settings still invalid: %v", errs)
	}
}

// Settings saved before the auto-lock field existed get the default idle
// time of issue 5 (5 minutes); a valid value is applied as typed.
func TestSettingsAutoLock(t *testing.T) {
	old := DefaultSettings()
	old.AutoLockMinutes = ""
	got, changed := old.normalized()
	if !changed || got.AutoLockMinutes != "5" || got.AutoLock() != 5*time.Minute {
		t.Errorf("older settings: %q → %v", got.AutoLockMinutes, got.AutoLock())
	}
	s := DefaultSettings()
	s.AutoLockMinutes = "12"
	if s.AutoLock() != 12*time.Minute {
		t.Errorf("AutoLock = %v, want 12m", s.AutoLock())
	}
	s.AutoLockMinutes = "0"
	if s.AutoLock() != 5*time.Minute {
		t.Errorf("an invalid value gives %v, want the 5 min default", s.AutoLock())
	}
}

// The Brief reads the settings before its first render without a Context
// (preload.go), from go-app's persisted form of the state: the two readings
// agree, for the defaults and for saved settings.
func TestSettingsReadBeforeFirstRender(t *testing.T) {
	p, e := mount(t, app.Div())
	ctx := p.ctx
	if got, ok := settingsFrom(ctx.LocalStorage()); !ok || !reflect.DeepEqual(got, LoadSettings(ctx)) {
		t.Errorf("nothing saved: read %+v (ok %v), LoadSettings %+v", got, ok, LoadSettings(ctx))
	}
	s := DefaultSettings()
	s.AltitudeUnit, s.GasUnit, s.Theme, s.SafeResidual = UnitM, UnitKPa, "night", "300"
	if err := SaveSettings(ctx, s); err != nil {
		t.Fatal(err)
	}
	e.ConsumeAll()
	got, ok := settingsFrom(ctx.LocalStorage())
	if want := LoadSettings(ctx); !ok || !reflect.DeepEqual(got, want) {
		t.Errorf("saved: read %+v (ok %v), LoadSettings %+v", got, ok, want)
	}
	if got.AltitudeUnit != UnitM || got.Theme != "night" || got.SafeResidual != "300" {
		t.Errorf("read %+v, want the saved metres, night and 300", got)
	}
}
