package ui

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/shopspring/decimal"

	"alvea/physio"
)

// Reading the Brief's fields: each text is read through physio's parsers
// (a bare number takes the unit shown beside the field; a number with its
// own unit keeps it), converted to the unit of the plan document's key by
// physio's constructors and accessors, and checked against the range the
// plan document accepts. The sentence a person reads is written here.

// qtyKind is what a field holds, which decides its display unit and parser.
type qtyKind int

const (
	qAltitude qtyKind = iota // shown ft|m (Settings), document ft
	qDiff                    // shown psi|bar (Settings), document psi
	qGauge                   // shown psi|bar (Settings), document psi or bar as typed
	qGas                     // shown mmHg|kPa (Settings), document mmHg
	qFlow                    // L/min
	qFraction                // FiO2: a fraction 0–1, or a percentage with %
	qPercent                 // SpO2: %
	qMinutes                 // min, or a duration with units ("1 h 30 min")
	qTempC                   // °C
	qPlain                   // a plain number in Unit (g/dL, years, ×, cylinders)
)

// fieldSpec is one field's meaning and the range the plan document accepts,
// in the document's unit (MinBar/MaxBar for a gauge typed in bar).
type fieldSpec struct {
	Label          string
	Kind           qtyKind
	Min, Max       float64
	MinBar, MaxBar float64 // qGauge only
	Unit           string  // qPlain: the unit shown; "" for a bare ratio
	Whole          bool
}

// The ranges mirror physio's plan document limits (physio/plan_validate.go);
// TestBriefLimitsMatchPhysio checks every one against physio's own
// validation at both ends, so a change there fails a test here.
var (
	specOrigin      = fieldSpec{Label: "Origin field elevation", Kind: qAltitude, Min: -2000, Max: 18000}
	specDestination = fieldSpec{Label: "Destination field elevation", Kind: qAltitude, Min: -2000, Max: 18000}
	specCruise      = fieldSpec{Label: "Cruise altitude", Kind: qAltitude, Min: -2000, Max: 51000}
	specCabin       = fieldSpec{Label: "Cabin altitude (stated)", Kind: qAltitude, Min: -2000, Max: 25000}
	specDiff        = fieldSpec{Label: "Maximum pressure differential", Kind: qDiff, Min: 0, Max: 11}
	specMinutes     = fieldSpec{Label: "Duration", Kind: qMinutes, Min: 1, Max: 2880}
	specLegFiO2     = fieldSpec{Label: "FiO2 set", Kind: qFraction, Min: 0.21, Max: 1}
	specBlendFlow   = fieldSpec{Label: "Total flow", Kind: qFlow, Min: 1, Max: 120}
	specMinuteVol   = fieldSpec{Label: "Minute volume", Kind: qFlow, Min: 1, Max: 40}
	specBias        = fieldSpec{Label: "Bias flow", Kind: qFlow, Min: 0, Max: 30}
	specLeak        = fieldSpec{Label: "Leak", Kind: qFlow, Min: 0, Max: 40}
	specDriveGas    = fieldSpec{Label: "Drive gas", Kind: qFlow, Min: 0, Max: 30}
	specPtFiO2      = fieldSpec{Label: "FiO2 when measured", Kind: qFraction, Min: 0.21, Max: 1}
	specPaO2        = fieldSpec{Label: "PaO2", Kind: qGas, Min: 20, Max: 700}
	specSpO2        = fieldSpec{Label: "SpO2", Kind: qPercent, Min: 50, Max: 100}
	specPaCO2       = fieldSpec{Label: "PaCO2", Kind: qGas, Min: 15, Max: 100}
	specRQ          = fieldSpec{Label: "Respiratory quotient", Kind: qPlain, Min: 0.7, Max: 1}
	specTemp        = fieldSpec{Label: "Temperature", Kind: qTempC, Min: 25, Max: 45}
	specHb          = fieldSpec{Label: "Haemoglobin", Kind: qPlain, Min: 3, Max: 25, Unit: "g/dL"}
	specAge         = fieldSpec{Label: "Age", Kind: qPlain, Min: 0, Max: 120, Unit: "years"}
	specWaterCap    = fieldSpec{Label: "Water capacity", Kind: qPlain, Min: 0.5, Max: 50, Unit: "L"}
	specCount       = fieldSpec{Label: "Number of cylinders", Kind: qPlain, Min: 1, Max: 20, Unit: "cyl.", Whole: true}
	specResidual    = fieldSpec{Label: "Safe residual", Kind: qGauge, Min: 0, Max: 1000, MinBar: 0, MaxBar: 70}
	specFactor      = fieldSpec{Label: "Reserve factor", Kind: qPlain, Min: 1, Max: 3, Unit: "×"}
	specResMinutes  = fieldSpec{Label: "Added reserve time", Kind: qMinutes, Min: 0, Max: 240}
	specSpO2Target  = fieldSpec{Label: "SpO2 target", Kind: qPercent, Min: 80, Max: 100}
)

// flowSpec returns the flow field of a device: the oxygen flow of a
// low-flow device or a Venturi valve (physio.DeviceFlowRange), the total
// flow of a blender or high-flow.
func flowSpec(d physio.Device) fieldSpec {
	label := "Oxygen flow"
	if d == physio.Blender || d == physio.HighFlow {
		label = "Total flow"
	}
	if lo, hi, ok := physio.DeviceFlowRange(d); ok {
		return fieldSpec{Label: label, Kind: qFlow, Min: float64(lo), Max: float64(hi)}
	}
	s := specBlendFlow
	s.Label = label
	return s
}

// gaugeSpec returns the gauge field of a cylinder: 0 up to the cylinder's
// highest plausible pressure, rounded down (as physio's plan validation).
func gaugeSpec(cyl physio.Cylinder) fieldSpec {
	max := cyl.MaxPressure()
	return fieldSpec{Label: "Gauge reading", Kind: qGauge, Min: 0, Max: math.Floor(max.Psi()), MinBar: 0, MaxBar: math.Floor(max.Bar())}
}

// displayUnit returns the unit a field of kind k is shown in.
func displayUnit(k qtyKind, st Settings, spec fieldSpec) string {
	switch k {
	case qAltitude:
		return st.AltitudeUnit
	case qDiff, qGauge:
		return st.PressureUnit
	case qGas:
		return st.GasUnit
	case qFlow:
		return "L/min"
	case qFraction:
		return "0–1 or %"
	case qPercent:
		return "%"
	case qMinutes:
		return "min"
	case qTempC:
		return "°C"
	}
	return spec.Unit
}

// reading is a field read into the plan document's unit.
type reading struct {
	Value   float64
	Unit    string // the document unit: ft, psi, bar, mmHg, L/min, min, °C, % or the plain unit
	Present bool   // something was typed
	Msg     string // what to fix, "" when valid
}

// OK reports a valid value.
func (r reading) OK() bool { return r.Present && r.Msg == "" }

// bareDecimal reads a plain decimal number (no unit, no exponent).
func bareDecimal(text string) (decimal.Decimal, bool) {
	if text == "" || strings.ContainsAny(text, "eE_") {
		return decimal.Decimal{}, false
	}
	d, err := decimal.NewFromString(text)
	return d, err == nil
}

// readEntry reads e as a field of spec, shown in unit disp.
func readEntry(spec fieldSpec, e Entry, disp string, required bool) reading {
	text := strings.TrimSpace(e.T)
	if text == "" {
		if required {
			return reading{Msg: fmt.Sprintf("%s is required: enter %s.", spec.Label, rangeText(spec, disp))}
		}
		return reading{}
	}
	unit := e.U
	if unit == "" {
		unit = disp
	}
	r := reading{Present: true}
	bare, isBare := bareDecimal(text)
	bf := bare.InexactFloat64()
	var err error
	switch spec.Kind {
	case qAltitude:
		r.Unit = "ft"
		switch {
		case isBare && unit == UnitFeet:
			r.Value = bf
		case isBare:
			r.Value = physio.Metres(bf).Feet()
		default:
			var a physio.Altitude
			a, err = physio.ParseAltitude(text)
			r.Value = a.Feet()
		}
	case qDiff:
		r.Unit = UnitPsi
		switch {
		case isBare && unit == UnitPsi:
			r.Value = bf
		case isBare:
			r.Value = physio.Bar(bf).Psi()
		default:
			var p physio.Pressure
			p, err = physio.ParsePressure(text)
			r.Value = p.Psi()
		}
	case qGauge:
		switch {
		case isBare && (unit == UnitPsi || unit == UnitBar):
			r.Value, r.Unit = bf, unit
		default:
			var p physio.Pressure
			p, err = physio.ParsePressure(text)
			if disp == UnitBar {
				r.Value, r.Unit = p.Bar(), UnitBar
			} else {
				r.Value, r.Unit = p.Psi(), UnitPsi
			}
		}
	case qGas:
		r.Unit = UnitMmHg
		switch {
		case isBare && unit == UnitMmHg:
			r.Value = bf
		case isBare:
			r.Value = physio.Kilopascals(bf).MmHg()
		default:
			var p physio.Pressure
			p, err = physio.ParsePressure(text)
			r.Value = p.MmHg()
		}
	case qFlow:
		r.Unit = "L/min"
		if isBare {
			r.Value = bf
		} else {
			var f physio.Flow
			f, err = physio.ParseFlow(text)
			r.Value = f.LitresPerMinute()
		}
	case qFraction:
		r.Unit = ""
		if isBare && bf <= 1 {
			r.Value = bf
		} else if p, ok := bareDecimal(strings.TrimSpace(strings.TrimSuffix(text, "%"))); ok && strings.HasSuffix(text, "%") {
			r.Value = p.Div(decimal.NewFromInt(100)).InexactFloat64()
		} else {
			var f physio.Fraction
			f, err = physio.ParseFraction(text)
			r.Value = f.Value()
		}
	case qPercent:
		r.Unit = "%"
		if p, ok := bareDecimal(strings.TrimSpace(strings.TrimSuffix(text, "%"))); ok {
			r.Value = p.InexactFloat64()
		} else {
			_, err = physio.ParseFraction(text)
			if err == nil {
				err = physio.ErrSyntax
			}
		}
	case qMinutes:
		r.Unit = "min"
		if isBare {
			r.Value = bf
		} else {
			d, perr := physio.ParseDuration(text)
			err = perr
			r.Value = d.Minutes()
		}
	case qTempC:
		r.Unit = "°C"
		if isBare {
			r.Value = bf
		} else {
			var t physio.Temperature
			t, err = physio.ParseTemperature(text)
			r.Value = t.Celsius()
		}
	default: // qPlain
		r.Unit = spec.Unit
		t := text
		if spec.Unit != "" {
			t = strings.TrimSpace(strings.TrimSuffix(t, spec.Unit))
		}
		if p, ok := bareDecimal(t); ok {
			r.Value = p.InexactFloat64()
		} else {
			err = physio.ErrSyntax
		}
	}
	typed := text
	if isBare && shownUnit(spec, unit) != "" {
		typed += " " + shownUnit(spec, unit)
	}
	if err != nil {
		var re *physio.RangeError
		switch {
		case errors.As(err, &re):
			r.Msg = fmt.Sprintf("%s must be %s (you entered %s).", spec.Label, rangeText(spec, disp), typed)
		case errors.Is(err, physio.ErrUnit):
			r.Msg = fmt.Sprintf("%s: %q has no unit Alvea reads here. Enter %s%s.", spec.Label, text, rangeText(spec, disp), unitHint(spec))
		default:
			r.Msg = fmt.Sprintf("%s: %q is not a number. Enter %s%s.", spec.Label, text, rangeText(spec, disp), unitHint(spec))
		}
		return r
	}
	if math.IsNaN(r.Value) || math.IsInf(r.Value, 0) {
		r.Msg = fmt.Sprintf("%s: %q is not a number. Enter %s.", spec.Label, text, rangeText(spec, disp))
		return r
	}
	lo, hi := spec.Min, spec.Max
	if r.Unit == UnitBar && spec.Kind == qGauge {
		lo, hi = spec.MinBar, spec.MaxBar
	}
	// A value converted from another unit may carry binary noise in its
	// last bits; it must not flip a value typed exactly at a limit.
	const noise = 1e-9
	if r.Value < lo-noise*math.Max(1, math.Abs(lo)) || r.Value > hi+noise*math.Max(1, math.Abs(hi)) {
		r.Msg = fmt.Sprintf("%s must be %s (you entered %s).", spec.Label, rangeText(spec, disp), typed)
		return r
	}
	r.Value = math.Min(math.Max(r.Value, lo), hi) // only the noise above is removed
	if spec.Whole && r.Value != math.Trunc(r.Value) {
		r.Msg = fmt.Sprintf("%s must be a whole number, %s.", spec.Label, rangeText(spec, disp))
	}
	return r
}

// shownUnit is the unit written after a bare number typed under unit.
func shownUnit(spec fieldSpec, unit string) string {
	switch spec.Kind {
	case qFraction:
		return ""
	case qPlain:
		return spec.Unit
	}
	return unit
}

func unitHint(spec fieldSpec) string {
	switch spec.Kind {
	case qAltitude:
		return " (or with a unit: ft, m)"
	case qDiff, qGauge, qGas:
		return " (or with a unit: psi, bar, kPa, mmHg)"
	case qMinutes:
		return " (or a duration: 1 h 30 min)"
	case qTempC:
		return " (or with a unit: °C, °F)"
	}
	return ""
}

// rangeText says "a number between MIN and MAX UNIT" in the display unit,
// the limits converted and rounded inward so that every value shown as
// allowed is.
func rangeText(spec fieldSpec, disp string) string {
	lo, hi, unit := spec.Min, spec.Max, disp
	switch spec.Kind {
	case qAltitude:
		if disp == UnitM {
			lo, hi = inward(physio.Feet(lo).Metres(), physio.Feet(hi).Metres(), 0)
		}
	case qDiff:
		if disp == UnitBar {
			lo, hi = inward(physio.Psi(lo).Bar(), physio.Psi(hi).Bar(), 2)
		}
	case qGauge:
		if disp == UnitBar {
			lo, hi = spec.MinBar, spec.MaxBar
		}
	case qGas:
		if disp == UnitKPa {
			lo, hi = inward(physio.MmHg(lo).Kilopascals(), physio.MmHg(hi).Kilopascals(), 1)
		}
	case qFraction:
		return fmt.Sprintf("a fraction between %s and %s (or %s to %s %%)", fmtNum(lo), fmtNum(hi), fmtNum(lo*100), fmtNum(hi*100))
	case qPlain:
		// An abbreviation's full stop ("cyl.") would double the
		// sentence's own.
		unit = strings.TrimSuffix(spec.Unit, ".")
	}
	if unit == "" {
		return fmt.Sprintf("a number between %s and %s", fmtNum(lo), fmtNum(hi))
	}
	return fmt.Sprintf("a number between %s and %s %s", fmtNum(lo), fmtNum(hi), unit)
}

// inward rounds a range to places decimals toward its inside.
func inward(lo, hi float64, places int32) (float64, float64) {
	l, _ := physio.Round(lo, places, physio.RoundUp)
	h, _ := physio.Round(hi, places, physio.RoundDown)
	return l.InexactFloat64(), h.InexactFloat64()
}

func fmtNum(v float64) string {
	if v == 0 {
		return "0"
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// shownText is what a field displays for e: the text as typed when it was
// typed under the display unit (or carries its own unit); otherwise the
// number converted to the display unit (the stored entry is unchanged, so
// switching back shows the original). note says what was typed then.
func shownText(spec fieldSpec, e Entry, disp string) (text, note string) {
	t := strings.TrimSpace(e.T)
	if e.U == "" || e.U == disp || t == "" {
		return e.T, ""
	}
	bare, ok := bareDecimal(t)
	if !ok {
		return e.T, ""
	}
	v := bare.InexactFloat64()
	var out float64
	var places int32
	switch {
	case spec.Kind == qAltitude && e.U == UnitFeet && disp == UnitM:
		out, places = physio.Feet(v).Metres(), 1
	case spec.Kind == qAltitude && e.U == UnitM && disp == UnitFeet:
		out, places = physio.Metres(v).Feet(), 0
	case (spec.Kind == qDiff || spec.Kind == qGauge) && e.U == UnitPsi && disp == UnitBar:
		out, places = physio.Psi(v).Bar(), 1
		if spec.Kind == qDiff {
			places = 3
		}
	case (spec.Kind == qDiff || spec.Kind == qGauge) && e.U == UnitBar && disp == UnitPsi:
		out, places = physio.Bar(v).Psi(), 0
		if spec.Kind == qDiff {
			places = 2
		}
	case spec.Kind == qGas && e.U == UnitMmHg && disp == UnitKPa:
		out, places = physio.MmHg(v).Kilopascals(), 2
	case spec.Kind == qGas && e.U == UnitKPa && disp == UnitMmHg:
		out, places = physio.Kilopascals(v).MmHg(), 1
	default:
		return e.T, ""
	}
	d, ok := physio.Round(out, places, physio.RoundNearest)
	if !ok {
		return e.T, ""
	}
	return d.String(), fmt.Sprintf("typed as %s %s; the plan uses that value", t, e.U)
}
