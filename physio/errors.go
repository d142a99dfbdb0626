package physio

import (
	"errors"
	"fmt"
	"strconv"
)

// Sentinel errors a caller can test with errors.Is. The detail types below
// wrap them; user-facing sentences are written in the UI layer, not here.
var (
	// ErrOutOfRange: a value lies outside the range a method accepts.
	ErrOutOfRange = errors.New("physio: value out of range")
	// ErrSyntax: text could not be read as a number with a unit.
	ErrSyntax = errors.New("physio: invalid syntax")
	// ErrUnit: the unit is missing where one is required, unknown, or of the
	// wrong kind for the quantity.
	ErrUnit = errors.New("physio: missing or wrong unit")
	// ErrImpossible: the physics has no answer (for example an FiO2 above 1.0
	// would be needed).
	ErrImpossible = errors.New("physio: not achievable")
)

// RangeError reports a value outside the valid range of a method, in the unit
// the caller knows it by. It unwraps to ErrOutOfRange.
type RangeError struct {
	Quantity string  // what the value is, e.g. "altitude", "PaCO2"
	Value    float64 // the value given, in Unit
	Min, Max float64 // the allowed range, inclusive, in Unit
	Unit     string  // e.g. "m", "mmHg", "L/min"; "" for a plain fraction
}

func (e *RangeError) Error() string {
	unit := ""
	if e.Unit != "" {
		unit = " " + e.Unit
	}
	return fmt.Sprintf("physio: %s %s%s is outside %s to %s%s",
		e.Quantity, fmtNum(e.Value), unit, fmtNum(e.Min), fmtNum(e.Max), unit)
}

func (e *RangeError) Unwrap() error { return ErrOutOfRange }

// ParseError reports text that could not be read as a quantity. It unwraps
// to ErrSyntax or ErrUnit (or a *RangeError when the number was read but is
// out of range).
type ParseError struct {
	Quantity string // what was being read, e.g. "pressure"
	Input    string // the text given
	Want     string // the units accepted, e.g. "psi, bar, kPa, mmHg"
	Err      error
}

func (e *ParseError) Error() string {
	msg := fmt.Sprintf("physio: %s %q: %v", e.Quantity, e.Input, trimPrefix(e.Err))
	if e.Want != "" {
		msg += " (units: " + e.Want + ")"
	}
	return msg
}

func (e *ParseError) Unwrap() error { return e.Err }

// ImpossibleError reports a result the physics cannot deliver, with the
// nearest achievable limit when there is one. It unwraps to ErrImpossible.
type ImpossibleError struct {
	What   string // e.g. "FiO2 needed"
	Reason string // e.g. "1.12 is above 1.0"
}

func (e *ImpossibleError) Error() string {
	return fmt.Sprintf("physio: %s not achievable: %s", e.What, e.Reason)
}

func (e *ImpossibleError) Unwrap() error { return ErrImpossible }

// checkRange returns a *RangeError unless min <= v <= max. NaN and Inf are
// always out of range.
func checkRange(quantity string, v, min, max float64, unit string) error {
	if v != v || v < min || v > max { // v != v: NaN
		return &RangeError{Quantity: quantity, Value: v, Min: min, Max: max, Unit: unit}
	}
	return nil
}

func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

func trimPrefix(err error) string {
	s := err.Error()
	const p = "physio: "
	if len(s) > len(p) && s[:len(p)] == p {
		return s[len(p):]
	}
	return s
}
