package physio

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"
)

// Unit factors below are the exact definitions in REFERENCES.md "Units"
// (psi from the avoirdupois pound and inch; mmHg conventional).
func TestParseQuantities(t *testing.T) {
	tests := []struct {
		in   string
		f    func(string) (float64, error)
		want float64 // canonical unit
	}{
		// The examples of issue 2, §2 item 1.
		{"2000 psi", pp, 2000 * 6894.757293168},
		{"137 bar", pp, 137e5},
		{"75.3 kPa", pp, 75300},
		{"40 mmHg", pp, 40 * 133.322387415},
		{"8000 ft", pa, 2438.4},
		{"2438 m", pa, 2438},
		// Spelling, case and spacing variants.
		{"2000psi", pp, 2000 * 6894.757293168},
		{"2000 PSI", pp, 2000 * 6894.757293168},
		{"  760 Torr ", pp, 101325},
		{"1 atm", pp, 101325},
		{"1013.25 hPa", pp, 101325},
		{"1013.25 mbar", pp, 101325},
		{"30 cmH2O", pp, 30 * 98.0665},
		{"29.92 inHg", pp, 29.92 * 3386.389},
		{"13.7 MPa", pp, 13.7e6},
		{"0 Pa", pp, 0},
		{"-2000 ft", pa, -609.6},
		{"1.5 km", pa, 1500},
		{"100 feet", pa, 30.48},
		{"100 metres", pa, 100},
		{"15 L/min", pf, 15},
		{"15 lpm", pf, 15},
		{"500 mL/min", pf, 0.5},
		{".5 l/min", pf, 0.5},
		{"680 L", pv, 680},
		{"250 mL", pv, 0.25},
		{"37 °C", pt, 310.15},
		{"37C", pt, 310.15},
		{"310.15 K", pt, 310.15},
		{"98.6 °F", pt, 310.15},
		{"-40 °F", pt, 233.15},
		{"0.4", pfr, 0.4},
		{"1", pfr, 1},
		{"0", pfr, 0},
		{"40 %", pfr, 0.4},
		{"40%", pfr, 0.4},
		{"100 %", pfr, 1},
		{"24.5 %", pfr, 0.245},
	}
	for _, tt := range tests {
		got, err := tt.f(tt.in)
		if err != nil || !gasClose(got, tt.want, 1e-15) {
			t.Errorf("parse %q = %v, %v; want %v", tt.in, got, err, tt.want)
		}
	}
}

func pp(s string) (float64, error)  { v, err := ParsePressure(s); return float64(v), err }
func pa(s string) (float64, error)  { v, err := ParseAltitude(s); return float64(v), err }
func pf(s string) (float64, error)  { v, err := ParseFlow(s); return float64(v), err }
func pv(s string) (float64, error)  { v, err := ParseVolume(s); return float64(v), err }
func pt(s string) (float64, error)  { v, err := ParseTemperature(s); return float64(v), err }
func pfr(s string) (float64, error) { v, err := ParseFraction(s); return float64(v), err }

// The decimal path has no float noise: "75.3 kPa" is exactly 75 300 Pa.
func TestParseExact(t *testing.T) {
	p, _ := ParsePressure("75.3 kPa")
	if float64(p) != 75300 {
		t.Errorf("75.3 kPa = %v Pa", float64(p))
	}
	f, _ := ParseFraction("28 %")
	if float64(f) != 0.28 {
		t.Errorf("28 %% = %v", float64(f))
	}
}

func TestParseDuration(t *testing.T) {
	tests := []struct {
		in   string
		want time.Duration
	}{
		{"45 min", 45 * time.Minute},
		{"2 h", 2 * time.Hour},
		{"1 h 30 min", 90 * time.Minute},
		{"1h30min", 90 * time.Minute},
		{"1.5 h", 90 * time.Minute},
		{"2 hours 5 minutes", 2*time.Hour + 5*time.Minute},
		{"10 min 30 s", 10*time.Minute + 30*time.Second},
		{"0 min", 0},
		{"720 h", 720 * time.Hour},
	}
	for _, tt := range tests {
		got, err := ParseDuration(tt.in)
		if err != nil || got != tt.want {
			t.Errorf("ParseDuration(%q) = %v, %v; want %v", tt.in, got, err, tt.want)
		}
	}
}

// gasWantParse asserts a *ParseError for quantity q that unwraps to target.
func gasWantParse(t *testing.T, in string, err error, q string, target error) {
	t.Helper()
	var pe *ParseError
	if !errors.As(err, &pe) {
		t.Errorf("%q: want *ParseError, got %v", in, err)
		return
	}
	if pe.Quantity != q || pe.Input != in {
		t.Errorf("%q: ParseError names %q/%q", in, pe.Quantity, pe.Input)
	}
	if !errors.Is(err, target) {
		t.Errorf("%q: error %v does not unwrap to %v", in, err, target)
	}
	if pe.Want == "" || !strings.HasPrefix(err.Error(), "physio: ") {
		t.Errorf("%q: message %q lacks the accepted units or prefix", in, err)
	}
}

func TestParseBadInput(t *testing.T) {
	type parser struct {
		q string
		f func(string) (float64, error)
	}
	pressure, altitude, flow := parser{"pressure", pp}, parser{"altitude", pa}, parser{"flow", pf}
	volume, temp, frac := parser{"volume", pv}, parser{"temperature", pt}, parser{"fraction", pfr}
	tests := []struct {
		p      parser
		in     string
		target error
	}{
		// Missing unit where one is required.
		{pressure, "2000", ErrUnit},
		{altitude, "8000", ErrUnit},
		{flow, "15", ErrUnit},
		{volume, "680", ErrUnit},
		{temp, "37", ErrUnit},
		{frac, "40", ErrUnit}, // 40 % or 0.40? ambiguous
		{frac, "1.5", ErrUnit},
		// Wrong kind of unit, unknown units, multiple units.
		{pressure, "8000 ft", ErrUnit},
		{altitude, "2000 psi", ErrUnit},
		{flow, "15 L", ErrUnit},
		{volume, "15 L/min", ErrUnit},
		{pressure, "40 mmHg kPa", ErrUnit},
		{pressure, "40 mmHg 3", ErrUnit},
		{pressure, "5 Mbar", ErrUnit}, // mega, not milli
		{pressure, "5 mPa", ErrUnit},
		{frac, "40 % %", ErrUnit},
		{frac, "0.4 mmHg", ErrUnit},
		{temp, "37 °K", ErrUnit},
		// Garbage, notation that reads two ways, non-numbers.
		{pressure, "", ErrSyntax},
		{pressure, "   ", ErrSyntax},
		{pressure, "psi", ErrSyntax},
		{pressure, "two thousand psi", ErrSyntax},
		{pressure, "NaN psi", ErrSyntax},
		{pressure, "Inf psi", ErrSyntax},
		{pressure, "+Inf Pa", ErrSyntax},
		{pressure, "1e3 psi", ErrSyntax},
		{pressure, "1E+3 psi", ErrSyntax},
		{pressure, "2,000 psi", ErrSyntax},
		{pressure, "0x10 psi", ErrSyntax},
		{pressure, "1.2.3 bar", ErrSyntax},
		{pressure, "1_000 psi", ErrSyntax},
		{frac, "0,4", ErrSyntax},
		{frac, ".", ErrSyntax},
		{frac, "-", ErrSyntax},
		{altitude, strings.Repeat("9", 70) + " m", ErrSyntax}, // over-long
		{altitude, "\xff m", ErrSyntax},
		// Out of range, including huge numbers.
		{pressure, "-5 psi", ErrOutOfRange},
		{pressure, "1001 bar", ErrOutOfRange},
		{pressure, "99999999999999999999999999 psi", ErrOutOfRange},
		{altitude, "70000 ft", ErrOutOfRange},
		{altitude, "-1 km", ErrOutOfRange},
		{flow, "-1 L/min", ErrOutOfRange},
		{flow, "201 L/min", ErrOutOfRange},
		{volume, "100001 L", ErrOutOfRange},
		{temp, "-300 °C", ErrOutOfRange},
		{temp, "500 K", ErrOutOfRange},
		{frac, "101 %", ErrOutOfRange},
		{frac, "-0.1", ErrOutOfRange},
		{frac, "-5 %", ErrOutOfRange},
		{frac, "400", ErrOutOfRange},
	}
	for _, tt := range tests {
		v, err := tt.p.f(tt.in)
		gasWantParse(t, tt.in, err, tt.p.q, tt.target)
		if v != 0 {
			t.Errorf("%q: value %v returned with an error", tt.in, v)
		}
	}
}

// A range error names the range in the unit the person typed.
func TestParseRangeInTypedUnit(t *testing.T) {
	_, err := ParseAltitude("70000 ft")
	var re *RangeError
	if !errors.As(err, &re) || re.Unit != "ft" || math.Abs(re.Max-20000/0.3048) > 1e-3 || re.Value != 70000 {
		t.Fatalf("got %+v", re)
	}
	if !strings.Contains(err.Error(), "70000 ft is outside") {
		t.Errorf("message %q", err)
	}
}

func TestParseDurationBadInput(t *testing.T) {
	tests := []struct {
		in     string
		target error
	}{
		{"90", ErrUnit},
		{"1 h 30", ErrUnit},
		{"30 min 1 h", ErrUnit}, // out of order
		{"1 h 2 h", ErrUnit},    // repeated
		{"5 days", ErrUnit},     // not accepted
		{"1:30", ErrUnit},       // h:mm or mm:ss?
		{"", ErrSyntax},
		{"h", ErrSyntax},
		{"NaN min", ErrSyntax},
		{"1e3 min", ErrSyntax},
		{"-5 min", ErrOutOfRange},
		{"721 h", ErrOutOfRange},
		{"9999999999999999999999 h", ErrOutOfRange},
	}
	for _, tt := range tests {
		d, err := ParseDuration(tt.in)
		gasWantParse(t, tt.in, err, "duration", tt.target)
		if d != 0 {
			t.Errorf("%q: %v returned with an error", tt.in, d)
		}
	}
}
