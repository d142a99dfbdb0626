package ui

import (
	"fmt"
	"regexp"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
	"github.com/shopspring/decimal"

	"alvea/physio"
)

// SettingsKey is the go-app state (persisted in localStorage) holding the
// crew's Settings. Settings hold no patient data, so plain browser storage
// is acceptable for them.
const SettingsKey = "alvea.settings"

// settingsSchema is bumped when Settings changes shape.
const settingsSchema = 1

// Display unit choices.
const (
	UnitPsi  = "psi"
	UnitBar  = "bar"
	UnitFeet = "ft"
	UnitM    = "m"
	UnitMmHg = "mmHg"
	UnitKPa  = "kPa"

	ThemeDay   = "day"
	ThemeNight = "night"
)

// Settings are the crew's display and policy choices. Numbers are kept as
// the decimal text the crew typed, with the unit they typed it in, so a
// change of display unit never rounds a stored value.
type Settings struct {
	Schema int `json:"schema"`

	PressureUnit string `json:"pressureUnit"` // cylinder pressures: psi | bar
	AltitudeUnit string `json:"altitudeUnit"` // ft | m
	GasUnit      string `json:"gasUnit"`      // partial pressures: mmHg | kPa

	SafeResidual     string `json:"safeResidual"`     // decimal text
	SafeResidualUnit string `json:"safeResidualUnit"` // psi | bar
	ReserveFactor    string `json:"reserveFactor"`    // decimal text, ×
	ReserveMinutes   string `json:"reserveMinutes"`   // whole minutes
	SpO2Target       string `json:"spo2Target"`       // percent

	Theme     string           `json:"theme"` // day | night
	Cylinders []CustomCylinder `json:"cylinders"`

	// AutoLockMinutes is the Logbook's idle time before it locks itself,
	// whole minutes as typed. Settings saved before it existed lack it and
	// get the default (normalized).
	AutoLockMinutes string `json:"autoLockMinutes"`
}

// CustomCylinder is a cylinder the crew adds by water capacity and full
// (service) pressure. The built-in CGA letter sizes come from physio.
type CustomCylinder struct {
	Name          string `json:"name"`
	WaterCapacity string `json:"waterCapacity"` // litres, decimal text
	FullPressure  string `json:"fullPressure"`  // decimal text, in PressureUnit
	PressureUnit  string `json:"pressureUnit"`  // psi | bar
}

// DefaultSettings returns the settings a new device starts with. The policy
// values are common practice (from memory, not a cited standard); the crew
// sets their service's own values.
func DefaultSettings() Settings {
	return Settings{
		Schema:           settingsSchema,
		PressureUnit:     UnitPsi,
		AltitudeUnit:     UnitFeet,
		GasUnit:          UnitMmHg,
		SafeResidual:     "200", // common practice: 200 psi left in a cylinder
		SafeResidualUnit: UnitPsi,
		ReserveFactor:    "1.5", // common practice: plan 1.5× the expected use
		ReserveMinutes:   "30",  // common practice: 30 minutes added for delays
		SpO2Target:       "94",  // common practice: 94 % lower target for most adults
		Theme:            ThemeDay,
		AutoLockMinutes:  "5", // issue 5: auto-lock after 5 minutes idle by default
	}
}

// Allowed ranges, each in the unit named. Pressure ranges in bar are the psi
// range converted and rounded inward, so every value shown as allowed is.
var (
	ruleResidualPsi   = rangeRule{Label: "Safe residual", Min: "0", Max: "1000", Unit: UnitPsi}
	ruleResidualBar   = rangeRule{Label: "Safe residual", Min: "0", Max: "68.9", Unit: UnitBar}
	ruleReserveFactor = rangeRule{Label: "Reserve factor", Min: "1", Max: "3", Unit: "×"}
	ruleReserveMin    = rangeRule{Label: "Added reserve time", Min: "0", Max: "240", Unit: "min", Whole: true}
	ruleSpO2Target    = rangeRule{Label: "SpO2 target", Min: "85", Max: "100", Unit: "%"}
	// The Logbook's auto-lock: at least a minute (shorter would lock a crew
	// out between two entries), at most an hour (longer leaves an unlocked
	// log on an unattended tablet). Our choice of bounds.
	ruleAutoLock = rangeRule{Label: "Auto-lock", Min: "1", Max: "60", Unit: "min", Whole: true}
	// Cylinder ranges follow physio's plausible ranges for water-capacity
	// cylinders (0.1–100 L, filled to at most 300 bar ≈ 4351 psi).
	ruleWaterCapacity = rangeRule{Label: "Water capacity", Min: "0.1", Max: "100", Unit: "L"}
	ruleFullPsi       = rangeRule{Label: "Full pressure", Min: "1450", Max: "4350", Unit: UnitPsi}
	ruleFullBar       = rangeRule{Label: "Full pressure", Min: "100", Max: "300", Unit: UnitBar}
)

const maxCylinderName = 24

func residualRule(unit string) rangeRule {
	if unit == UnitBar {
		return ruleResidualBar
	}
	return ruleResidualPsi
}

func fullPressureRule(unit string) rangeRule {
	if unit == UnitBar {
		return ruleFullBar
	}
	return ruleFullPsi
}

// rangeRule checks decimal text against an inclusive range and writes the
// sentence a person reads when it fails.
type rangeRule struct {
	Label    string
	Min, Max string // decimal text
	Unit     string
	Whole    bool // whole numbers only
}

// Range returns "between MIN and MAX UNIT".
func (r rangeRule) Range() string {
	return fmt.Sprintf("between %s and %s %s", r.Min, r.Max, r.Unit)
}

// Check parses text as a decimal (a comma is accepted as the decimal mark)
// and returns it, or a message naming the field, the allowed range and the
// unit. Values are never clamped. A comma between groups of three digits
// ("8,000") is refused: English writes thousands so, and reading it as a
// decimal mark would take 8000 ft for 8 ft without a word.
func (r rangeRule) Check(text string) (decimal.Decimal, string) {
	if thousandsComma(text) {
		return decimal.Decimal{}, fmt.Sprintf("%s: %q could be read as thousands or with a decimal comma. Type it without the thousands comma: a number %s.", r.Label, text, r.Range())
	}
	t := strings.TrimSpace(commaDecimal(text))
	if t == "" {
		return decimal.Decimal{}, fmt.Sprintf("%s is required: enter a number %s.", r.Label, r.Range())
	}
	v, err := decimal.NewFromString(t)
	if err != nil || strings.ContainsAny(t, "eE") {
		return decimal.Decimal{}, fmt.Sprintf("%s: %q is not a number. Enter a number %s.", r.Label, text, r.Range())
	}
	if r.Whole && !v.IsInteger() {
		return decimal.Decimal{}, fmt.Sprintf("%s must be a whole number %s.", r.Label, r.Range())
	}
	if v.Cmp(decimal.RequireFromString(r.Min)) < 0 || v.Cmp(decimal.RequireFromString(r.Max)) > 0 {
		return decimal.Decimal{}, fmt.Sprintf("%s must be %s (you entered %s %s).", r.Label, r.Range(), t, r.Unit)
	}
	return v, ""
}

// thousandsGroups matches a whole number whose digits are grouped in
// threes by commas ("2,000", "-1,500", "1,000,000").
var thousandsGroups = regexp.MustCompile(`^[+-]?[1-9][0-9]{0,2}(,[0-9]{3})+$`)

// thousandsComma reports whether text reads as digits grouped by commas,
// which a decimal comma would misread (the SI Brochure, 9th ed. §5.4.4,
// groups digits with spaces only for this reason).
func thousandsComma(text string) bool {
	return thousandsGroups.MatchString(strings.TrimSpace(text))
}

// commaDecimal turns a decimal comma into a point; text with commas between
// thousands is left as typed, for Check to refuse.
func commaDecimal(text string) string {
	if thousandsComma(text) {
		return text
	}
	return strings.ReplaceAll(text, ",", ".")
}

// FieldErrors maps a field id to the message shown beside it.
type FieldErrors map[string]string

// Field ids used by the Settings screen (and by its tests).
const (
	FieldSafeResidual   = "set-residual"
	FieldReserveFactor  = "set-factor"
	FieldReserveMinutes = "set-minutes"
	FieldSpO2Target     = "set-spo2"
	FieldAutoLock       = "set-autolock"
	FieldCylName        = "set-cyl-name"
	FieldCylWater       = "set-cyl-water"
	FieldCylPressure    = "set-cyl-pressure"
)

// Validate checks every field and returns the messages, empty when valid.
func (s Settings) Validate() FieldErrors {
	errs := FieldErrors{}
	if s.PressureUnit != UnitPsi && s.PressureUnit != UnitBar {
		errs["pressureUnit"] = "Pressure unit must be psi or bar."
	}
	if s.AltitudeUnit != UnitFeet && s.AltitudeUnit != UnitM {
		errs["altitudeUnit"] = "Altitude unit must be ft or m."
	}
	if s.GasUnit != UnitMmHg && s.GasUnit != UnitKPa {
		errs["gasUnit"] = "Partial pressure unit must be mmHg or kPa."
	}
	if s.Theme != ThemeDay && s.Theme != ThemeNight {
		errs["theme"] = "Theme must be day or night."
	}
	if s.SafeResidualUnit != UnitPsi && s.SafeResidualUnit != UnitBar {
		errs[FieldSafeResidual] = "Safe residual unit must be psi or bar."
	} else if _, msg := residualRule(s.SafeResidualUnit).Check(s.SafeResidual); msg != "" {
		errs[FieldSafeResidual] = msg
	}
	if _, msg := ruleReserveFactor.Check(s.ReserveFactor); msg != "" {
		errs[FieldReserveFactor] = msg
	}
	if _, msg := ruleReserveMin.Check(s.ReserveMinutes); msg != "" {
		errs[FieldReserveMinutes] = msg
	}
	if _, msg := ruleSpO2Target.Check(s.SpO2Target); msg != "" {
		errs[FieldSpO2Target] = msg
	}
	if _, msg := ruleAutoLock.Check(s.AutoLockMinutes); msg != "" {
		errs[FieldAutoLock] = msg
	}
	for i, c := range s.Cylinders {
		if e := c.Validate(); len(e) > 0 {
			for _, msg := range e {
				errs[fmt.Sprintf("cylinder-%d", i)] = msg
				break
			}
		}
	}
	return errs
}

// Validate checks a custom cylinder; keys are the add-form field ids.
func (c CustomCylinder) Validate() FieldErrors {
	errs := FieldErrors{}
	name := strings.TrimSpace(c.Name)
	switch {
	case name == "":
		errs[FieldCylName] = fmt.Sprintf("Cylinder name is required (1 to %d characters).", maxCylinderName)
	case utf8.RuneCountInString(name) > maxCylinderName:
		errs[FieldCylName] = fmt.Sprintf("Cylinder name must be 1 to %d characters.", maxCylinderName)
	}
	if _, msg := ruleWaterCapacity.Check(c.WaterCapacity); msg != "" {
		errs[FieldCylWater] = msg
	}
	if c.PressureUnit != UnitPsi && c.PressureUnit != UnitBar {
		errs[FieldCylPressure] = "Full pressure unit must be psi or bar."
	} else if _, msg := fullPressureRule(c.PressureUnit).Check(c.FullPressure); msg != "" {
		errs[FieldCylPressure] = msg
	}
	return errs
}

// normalized returns s with every invalid field replaced by its default, and
// whether anything was replaced (a stored value from an older or damaged
// copy is never used as is).
func (s Settings) normalized() (Settings, bool) {
	d := DefaultSettings()
	errs := s.Validate()
	if len(errs) == 0 && s.Schema == settingsSchema {
		return s, false
	}
	out := s
	out.Schema = settingsSchema
	fix := func(key string, apply func()) {
		if _, bad := errs[key]; bad {
			apply()
		}
	}
	fix("pressureUnit", func() { out.PressureUnit = d.PressureUnit })
	fix("altitudeUnit", func() { out.AltitudeUnit = d.AltitudeUnit })
	fix("gasUnit", func() { out.GasUnit = d.GasUnit })
	fix("theme", func() { out.Theme = d.Theme })
	fix(FieldSafeResidual, func() { out.SafeResidual, out.SafeResidualUnit = d.SafeResidual, d.SafeResidualUnit })
	fix(FieldReserveFactor, func() { out.ReserveFactor = d.ReserveFactor })
	fix(FieldReserveMinutes, func() { out.ReserveMinutes = d.ReserveMinutes })
	fix(FieldSpO2Target, func() { out.SpO2Target = d.SpO2Target })
	fix(FieldAutoLock, func() { out.AutoLockMinutes = d.AutoLockMinutes })
	out.Cylinders = nil
	for _, c := range s.Cylinders {
		if len(c.Validate()) == 0 {
			out.Cylinders = append(out.Cylinders, c)
		}
	}
	return out, true
}

// clone copies s so that a stored state never shares its slice.
func (s Settings) clone() Settings {
	s.Cylinders = append([]CustomCylinder(nil), s.Cylinders...)
	return s
}

// SafeResidualPressure returns the safe residual as a pressure.
func (s Settings) SafeResidualPressure() (physio.Pressure, error) {
	v, msg := residualRule(s.SafeResidualUnit).Check(s.SafeResidual)
	if msg != "" {
		return 0, fmt.Errorf("ui: %s", msg)
	}
	f := v.InexactFloat64()
	if s.SafeResidualUnit == UnitBar {
		return physio.Bar(f), nil
	}
	return physio.Psi(f), nil
}

// SafeResidualShown returns the safe residual as text in the display
// pressure unit. A value typed in the other unit is converted and rounded
// up (a higher residual is the safe side): psi to 1 psi, bar to 0.1 bar.
func (s Settings) SafeResidualShown() string {
	if s.SafeResidualUnit == s.PressureUnit {
		return s.SafeResidual
	}
	p, err := s.SafeResidualPressure()
	if err != nil {
		return s.SafeResidual
	}
	if s.PressureUnit == UnitBar {
		return decimal.NewFromFloat(p.Bar()).RoundCeil(1).String()
	}
	return decimal.NewFromFloat(p.Psi()).RoundCeil(0).String()
}

// AutoLock returns the Logbook's idle time before it locks itself (the
// default when the field is invalid; Validate reports that).
func (s Settings) AutoLock() time.Duration {
	v, msg := ruleAutoLock.Check(s.AutoLockMinutes)
	if msg != "" {
		v, _ = ruleAutoLock.Check(DefaultSettings().AutoLockMinutes)
	}
	return time.Duration(v.IntPart()) * time.Minute
}

// LoadSettings returns the stored settings, or the defaults for any field
// that is missing or invalid.
func LoadSettings(ctx app.Context) Settings {
	s := DefaultSettings()
	ctx.GetState(SettingsKey, &s)
	s, _ = s.normalized()
	return s.clone()
}

// SaveSettings stores s (persisted across reloads and restarts) and notifies
// every component observing SettingsKey. Only valid settings are saved.
func SaveSettings(ctx app.Context, s Settings) error {
	if errs := s.Validate(); len(errs) > 0 {
		for _, msg := range errs {
			return fmt.Errorf("ui: settings not saved: %s", msg)
		}
	}
	s.Schema = settingsSchema
	ctx.SetState(SettingsKey, s.clone()).Persist()
	return nil
}
