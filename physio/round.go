package physio

import (
	"math"

	"github.com/shopspring/decimal"
)

// Rounding names the direction an output is rounded in. Alvea rounds every
// number that reaches a person on the safe side: durations and usable oxygen
// down, oxygen needed, FiO2 needed and cabin altitude up.
type Rounding int

const (
	// RoundDown rounds toward −∞ (floor): minutes left, usable litres.
	RoundDown Rounding = iota + 1
	// RoundUp rounds toward +∞ (ceiling): litres needed, FiO2 needed,
	// cabin altitude, expansion ratio.
	RoundUp
	// RoundNearest rounds half away from zero, for values with no unsafe
	// side (for example a displayed pressure that no decision rests on).
	RoundNearest
)

func (r Rounding) String() string {
	switch r {
	case RoundDown:
		return "down"
	case RoundUp:
		return "up"
	case RoundNearest:
		return "nearest"
	}
	return "unknown"
}

// Round returns x rounded to places decimal places in direction r, as a
// decimal. x must be finite; NaN and ±Inf return zero and ok false, so that
// a caller never shows a non-number.
//
// The conversion goes through the shortest decimal representation of x, so
// 0.289 stays 0.289 and is not pushed up by binary noise.
func Round(x float64, places int32, r Rounding) (d decimal.Decimal, ok bool) {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return decimal.Zero, false
	}
	v := decimal.NewFromFloat(x)
	switch r {
	case RoundDown:
		return v.RoundFloor(places), true
	case RoundUp:
		return v.RoundCeil(places), true
	default:
		return v.Round(places), true
	}
}
