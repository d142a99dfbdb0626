package physio

import (
	"fmt"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"

	"github.com/shopspring/decimal"
)

// Parsing reads text a person typed ("2000 psi", "8000 ft", "40 %") into a
// typed quantity. The number is read with decimal, so "75.3 kPa" becomes
// exactly 75 300 Pa before the single conversion to float64.
//
// The number is a plain decimal: an optional sign, digits, an optional
// decimal point. Refused, because a person could mean two different things
// or because they are no number at all: exponents ("1e3"), thousands
// separators and decimal commas ("2,000", "0,4" — the two read differently
// across locales), NaN and Inf, hex, and more than maxInputLen bytes.
// Spaces between number and unit are optional. A unit is required wherever
// a bare number would be ambiguous, which is everywhere except a fraction
// written 0–1.

// maxInputLen bounds the text accepted, so a pasted page or a number with
// thousands of digits is refused before any arithmetic.
const maxInputLen = 64

// unitDef is one accepted spelling of a unit: the canonical value of one of
// it is factor (then offset is added: only temperatures have one).
type unitDef struct {
	symbol string          // how the unit is shown back in errors
	factor decimal.Decimal // canonical units per one of this unit
	offset decimal.Decimal // added after scaling (°C, °F to K)
}

func ud(symbol, factor string) unitDef {
	return unitDef{symbol: symbol, factor: decimal.RequireFromString(factor)}
}

// unitTable maps a unit spelling to its definition. Lookup is by exact
// spelling first, then by lower case; spellings that are only safe in one
// case (MPa versus mPa, Mbar versus mbar) are listed in caseSensitive and
// never matched by lower case.
type unitTable struct {
	quantity  string
	want      string             // shown in ParseError.Want
	canonical string             // canonical unit symbol, for range errors
	byName    map[string]unitDef // keys in lower case
	exact     map[string]unitDef // case-sensitive spellings
	min, max  float64            // accepted range, canonical unit
}

func (t *unitTable) lookup(u string) (unitDef, bool) {
	if d, ok := t.exact[u]; ok {
		return d, true
	}
	// A leading capital M means mega, never milli: "Mbar" is not "mbar".
	if l := strings.ToLower(u); strings.HasPrefix(u, "M") && (l == "mbar" || l == "mpa") {
		return unitDef{}, false
	}
	d, ok := t.byName[strings.ToLower(u)]
	return d, ok
}

var (
	// Pressure factors from constants.go's definitions, written as exact
	// decimals. Range: 0 to 1000 bar, well above any medical cylinder.
	pressureUnits = &unitTable{
		quantity:  "pressure",
		want:      "Pa, kPa, MPa, hPa, mmHg, Torr, psi, bar, mbar, cmH2O, inHg, atm",
		canonical: "Pa",
		byName: map[string]unitDef{
			"pa":    ud("Pa", "1"),
			"kpa":   ud("kPa", "1000"),
			"hpa":   ud("hPa", "100"),
			"mmhg":  ud("mmHg", "133.322387415"),
			"torr":  ud("Torr", "133.322368421052631578947"), // 101325/760 exactly, to 24 places
			"psi":   ud("psi", "6894.757293168"),
			"bar":   ud("bar", "100000"),
			"mbar":  ud("mbar", "100"),
			"cmh2o": ud("cmH2O", "98.0665"),
			"inhg":  ud("inHg", "3386.389"),
			"atm":   ud("atm", "101325"),
		},
		exact: map[string]unitDef{"MPa": ud("MPa", "1000000")},
		min:   0, max: 1e8,
	}
	altitudeUnits = &unitTable{
		quantity:  "altitude",
		want:      "m, ft",
		canonical: "m",
		byName: map[string]unitDef{
			"m": ud("m", "1"), "metre": ud("m", "1"), "metres": ud("m", "1"),
			"meter": ud("m", "1"), "meters": ud("m", "1"), "km": ud("km", "1000"),
			"ft": ud("ft", "0.3048"), "feet": ud("ft", "0.3048"), "foot": ud("ft", "0.3048"),
		},
		min: float64(MinModelAltitude), max: float64(MaxModelAltitude),
	}
	// Flow range 0–200 L/min covers high-flow cannulae and ventilators.
	flowUnits = &unitTable{
		quantity:  "flow",
		want:      "L/min, lpm, mL/min",
		canonical: "L/min",
		byName: map[string]unitDef{
			"l/min": ud("L/min", "1"), "lpm": ud("L/min", "1"),
			"ml/min": ud("mL/min", "0.001"),
		},
		min: 0, max: 200,
	}
	// Volume range 0–100 000 L covers any cylinder bank carried.
	volumeUnits = &unitTable{
		quantity:  "volume",
		want:      "L, mL",
		canonical: "L",
		byName: map[string]unitDef{
			"l": ud("L", "1"), "litre": ud("L", "1"), "litres": ud("L", "1"),
			"liter": ud("L", "1"), "liters": ud("L", "1"), "ml": ud("mL", "0.001"),
		},
		min: 0, max: 1e5,
	}
	// Temperature range −100 °C to +100 °C (173.15–373.15 K) covers cylinders
	// in any climate and bodies.
	temperatureUnits = &unitTable{
		quantity:  "temperature",
		want:      "°C, °F, K",
		canonical: "K",
		byName: map[string]unitDef{
			"k":  ud("K", "1"),
			"°c": {symbol: "°C", factor: decimal.NewFromInt(1), offset: decimal.RequireFromString("273.15")},
			"c":  {symbol: "°C", factor: decimal.NewFromInt(1), offset: decimal.RequireFromString("273.15")},
			"°f": {symbol: "°F", factor: decimal.NewFromInt(5).Div(decimal.NewFromInt(9)),
				offset: decimal.RequireFromString("255.372222222222222222222")}, // 273.15 − 32·5/9
			"f": {symbol: "°F", factor: decimal.NewFromInt(5).Div(decimal.NewFromInt(9)),
				offset: decimal.RequireFromString("255.372222222222222222222")},
		},
		min: 173.15, max: 373.15,
	}
)

// splitNumber reads the leading plain decimal of s and returns it with the
// rest of the text (spaces trimmed). ok is false if s does not start with a
// plain decimal.
func splitNumber(s string) (num decimal.Decimal, rest string, ok bool) {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits, dot := 0, false
	for i < len(s) {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			digits++
		case c == '.' && !dot:
			dot = true
		default:
			goto done
		}
		i++
	}
done:
	if digits == 0 {
		return decimal.Zero, s, false
	}
	numText := s[:i]
	if strings.HasSuffix(numText, ".") {
		numText += "0"
	}
	// The next character must not continue a number in some other
	// notation: "1e3", "2,000", "0,4", "1.2.3", "0x10".
	rest = s[i:]
	if rest != "" {
		c := rest[0]
		exponent := (c == 'e' || c == 'E') && len(rest) > 1 &&
			(rest[1] == '+' || rest[1] == '-' || rest[1] >= '0' && rest[1] <= '9')
		if c == ',' || c == '.' || c == '_' || c == 'x' || c == 'X' || exponent {
			return decimal.Zero, s, false
		}
	}
	d, err := decimal.NewFromString(numText)
	if err != nil {
		return decimal.Zero, s, false
	}
	return d, strings.TrimFunc(rest, unicode.IsSpace), true
}

// cleanInput trims spaces and refuses empty or over-long text.
func cleanInput(s string) (string, error) {
	if len(s) > maxInputLen {
		return "", fmt.Errorf("%w: longer than %d characters", ErrSyntax, maxInputLen)
	}
	if !utf8.ValidString(s) {
		return "", fmt.Errorf("%w: not valid UTF-8 text", ErrSyntax)
	}
	t := strings.TrimFunc(s, unicode.IsSpace)
	if t == "" {
		return "", fmt.Errorf("%w: empty", ErrSyntax)
	}
	return t, nil
}

// parseIn reads "number unit" with a unit from table and returns the value
// in the canonical unit, range-checked.
func parseIn(s string, t *unitTable) (float64, error) {
	fail := func(err error) (float64, error) {
		return 0, &ParseError{Quantity: t.quantity, Input: s, Want: t.want, Err: err}
	}
	text, err := cleanInput(s)
	if err != nil {
		return fail(err)
	}
	num, unitText, ok := splitNumber(text)
	if !ok {
		return fail(fmt.Errorf("%w: not a plain decimal number", ErrSyntax))
	}
	if unitText == "" {
		return fail(fmt.Errorf("%w: a unit is required", ErrUnit))
	}
	def, ok := t.lookup(unitText)
	if !ok {
		return fail(fmt.Errorf("%w: unknown %s unit %q", ErrUnit, t.quantity, unitText))
	}
	canon := num.Mul(def.factor).Add(def.offset)
	v := canon.InexactFloat64()
	if v < t.min || v > t.max || v != v {
		// Report the range in the unit the person typed.
		toTyped := func(c float64) float64 {
			return decimal.NewFromFloat(c).Sub(def.offset).DivRound(def.factor, 6).InexactFloat64()
		}
		return fail(&RangeError{Quantity: t.quantity, Value: num.InexactFloat64(),
			Min: toTyped(t.min), Max: toTyped(t.max), Unit: def.symbol})
	}
	return v, nil
}

// ParsePressure reads a pressure with its unit: Pa, kPa, MPa, hPa, mmHg,
// Torr, psi, bar, mbar, cmH2O, inHg or atm (case-insensitive, except that a
// capital M means mega: "MPa" is accepted, "Mbar" refused). Accepted range
// 0 to 1000 bar. Examples: "2000 psi", "137 bar", "75.3 kPa", "40 mmHg".
// Errors are *ParseError wrapping ErrSyntax, ErrUnit or a *RangeError.
func ParsePressure(s string) (Pressure, error) {
	v, err := parseIn(s, pressureUnits)
	return Pressure(v), err
}

// ParseAltitude reads an altitude with its unit: m (metre, meter), km, or ft
// (feet, foot). Accepted range: the standard atmosphere model's,
// MinModelAltitude to MaxModelAltitude (−610 m to 20 000 m).
// Examples: "8000 ft", "2438 m".
func ParseAltitude(s string) (Altitude, error) {
	v, err := parseIn(s, altitudeUnits)
	return Altitude(v), err
}

// ParseFlow reads a gas flow with its unit: L/min, lpm or mL/min. Accepted
// range 0–200 L/min. Example: "15 L/min".
func ParseFlow(s string) (Flow, error) {
	v, err := parseIn(s, flowUnits)
	return Flow(v), err
}

// ParseVolume reads a gas volume with its unit: L (litre, liter) or mL.
// Accepted range 0–100 000 L. Example: "680 L".
func ParseVolume(s string) (Volume, error) {
	v, err := parseIn(s, volumeUnits)
	return Volume(v), err
}

// ParseTemperature reads a temperature with its unit: °C (or C), °F (or F),
// or K. Accepted range −100 °C to +100 °C. Example: "37 °C".
func ParseTemperature(s string) (Temperature, error) {
	v, err := parseIn(s, temperatureUnits)
	return Temperature(v), err
}

// ParseFraction reads a fraction such as an FiO2 or a saturation: either a
// bare number from 0 to 1 ("0.4") or a percentage from 0 to 100 with a %
// sign ("40 %", "40%"). A bare number above 1 ("40") is refused as
// ambiguous (40 % or 0.40?) with ErrUnit.
func ParseFraction(s string) (Fraction, error) {
	const want = "a number 0–1, or a percentage with %"
	fail := func(err error) (Fraction, error) {
		return 0, &ParseError{Quantity: "fraction", Input: s, Want: want, Err: err}
	}
	text, err := cleanInput(s)
	if err != nil {
		return fail(err)
	}
	num, unitText, ok := splitNumber(text)
	if !ok {
		return fail(fmt.Errorf("%w: not a plain decimal number", ErrSyntax))
	}
	switch unitText {
	case "":
		if num.Sign() < 0 || num.Cmp(decimal.NewFromInt(1)) > 0 {
			if num.Cmp(decimal.NewFromInt(1)) > 0 && num.Cmp(decimal.NewFromInt(100)) <= 0 {
				return fail(fmt.Errorf("%w: a bare number above 1 is ambiguous; write %s %% or a fraction 0–1", ErrUnit, num.String()))
			}
			return fail(&RangeError{Quantity: "fraction", Value: num.InexactFloat64(), Min: 0, Max: 1})
		}
		return Fraction(num.InexactFloat64()), nil
	case "%":
		if num.Sign() < 0 || num.Cmp(decimal.NewFromInt(100)) > 0 {
			return fail(&RangeError{Quantity: "fraction", Value: num.InexactFloat64(), Min: 0, Max: 100, Unit: "%"})
		}
		return Fraction(num.Div(decimal.NewFromInt(100)).InexactFloat64()), nil
	}
	return fail(fmt.Errorf("%w: unknown fraction unit %q", ErrUnit, unitText))
}

// maxParsedDuration bounds ParseDuration: 30 days, longer than any
// transport, far below time.Duration's limit.
const maxParsedDuration = 30 * 24 * time.Hour

// ParseDuration reads a duration written with units: hours (h, hr, hour,
// hours), minutes (min, mins, minute, minutes) and seconds (s, sec), in
// that order, each at most once: "45 min", "2 h", "1 h 30 min", "1.5 h",
// "1h30min". A bare number ("90") is refused as ambiguous, as are "1:30"
// (h:mm or mm:ss?), negative values and anything above 30 days. The result
// is truncated to the nanosecond.
func ParseDuration(s string) (time.Duration, error) {
	const want = "h, min, s"
	fail := func(err error) (time.Duration, error) {
		return 0, &ParseError{Quantity: "duration", Input: s, Want: want, Err: err}
	}
	text, err := cleanInput(s)
	if err != nil {
		return fail(err)
	}
	units := []struct {
		names []string
		per   decimal.Decimal // nanoseconds per unit
	}{
		{[]string{"hours", "hour", "hrs", "hr", "h"}, decimal.NewFromInt(int64(time.Hour))},
		{[]string{"minutes", "minute", "mins", "min"}, decimal.NewFromInt(int64(time.Minute))},
		{[]string{"seconds", "second", "secs", "sec", "s"}, decimal.NewFromInt(int64(time.Second))},
	}
	total := decimal.Zero
	next := 0 // index of the smallest unit still allowed
	for text != "" {
		num, rest, ok := splitNumber(text)
		if !ok {
			return fail(fmt.Errorf("%w: not a plain decimal number", ErrSyntax))
		}
		if num.Sign() < 0 {
			return fail(&RangeError{Quantity: "duration", Value: num.InexactFloat64(), Min: 0,
				Max: maxParsedDuration.Hours(), Unit: "h"})
		}
		if rest == "" {
			return fail(fmt.Errorf("%w: a unit is required (h, min or s)", ErrUnit))
		}
		// The unit runs up to the next digit or space.
		end := strings.IndexFunc(rest, func(r rune) bool { return unicode.IsSpace(r) || unicode.IsDigit(r) })
		if end < 0 {
			end = len(rest)
		}
		word := strings.ToLower(rest[:end])
		found := -1
		for i := next; i < len(units) && found < 0; i++ {
			for _, n := range units[i].names {
				if word == n {
					found = i
					break
				}
			}
		}
		if found < 0 {
			return fail(fmt.Errorf("%w: unknown, repeated or out-of-order duration unit %q", ErrUnit, rest[:end]))
		}
		total = total.Add(num.Mul(units[found].per))
		next = found + 1
		text = strings.TrimFunc(rest[end:], unicode.IsSpace)
	}
	if total.Cmp(decimal.NewFromInt(int64(maxParsedDuration))) > 0 {
		return fail(&RangeError{Quantity: "duration", Value: total.Div(decimal.NewFromInt(int64(time.Hour))).InexactFloat64(),
			Min: 0, Max: maxParsedDuration.Hours(), Unit: "h"})
	}
	return time.Duration(total.Truncate(0).IntPart()), nil
}
