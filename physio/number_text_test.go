package physio

import (
	"math"
	"testing"

	"github.com/shopspring/decimal"
)

// The fast text of a Number must be decimal's own text, byte for byte:
// decimal.Decimal.String is the reference (the plan's JSON and every
// screen showed it before).
func TestNumberTextMatchesDecimal(t *testing.T) {
	cases := []decimal.Decimal{
		decimal.Zero, decimal.New(0, -3), decimal.New(0, 4), decimal.New(5, 0), decimal.New(-5, 0),
		decimal.New(5, -1), decimal.New(-5, -1), decimal.New(10, -1), decimal.New(-10, -1),
		decimal.New(1200, -2), decimal.New(1205, -3), decimal.New(7, -5), decimal.New(-7, -5),
		decimal.New(12, 3), decimal.New(-12, 3), decimal.New(math.MaxInt64, -4), decimal.New(math.MinInt64, -4),
		decimal.New(math.MinInt64, 0), decimal.New(999999999999999999, -18), decimal.New(1, -18), decimal.New(1, 18),
		decimal.RequireFromString("123456789012345678901234567890.5"), decimal.New(3, -40), decimal.New(3, 40),
	}
	for _, d := range cases {
		if got, want := (Number{d}).String(), d.String(); got != want {
			t.Errorf("Number(%s).String() = %q, decimal gives %q", want, got, want)
		}
		if got, want := string((Number{d}).AppendText([]byte("x"))), "x"+d.String(); got != want {
			t.Errorf("AppendText gives %q, decimal gives %q", got, want)
		}
	}
}

func FuzzNumberText(f *testing.F) {
	f.Add(int64(1205), int32(-3))
	f.Add(int64(-5), int32(-1))
	f.Add(int64(0), int32(2))
	f.Add(int64(math.MinInt64), int32(-19))
	f.Fuzz(func(t *testing.T, c int64, exp int32) {
		if exp > 60 || exp < -60 {
			return // decimal's own text of a huge exponent is its business, and slow
		}
		d := decimal.New(c, exp)
		if got, want := (Number{d}).String(), d.String(); got != want {
			t.Errorf("Number(%d e%d).String() = %q, decimal gives %q", c, exp, got, want)
		}
	})
}
