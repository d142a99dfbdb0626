package physio

import (
	"strconv"

	"github.com/shopspring/decimal"
)

// String writes the number as decimal.Decimal.String does, without its
// big.Int conversion for the numbers a plan holds (at most 18 digits): a
// keystroke in the Brief writes out a hundred of them, and the big.Int
// path costs four allocations each in wasm. Any other number, and any
// change of decimal's package-wide formatting options, takes decimal's
// own path (TestNumberTextMatchesDecimal holds the two equal).
func (n Number) String() string {
	var buf [32]byte
	if b, ok := appendNumber(buf[:0], n.Decimal); ok {
		return string(b)
	}
	return n.Decimal.String()
}

// AppendText appends the number's text (as String) to b.
func (n Number) AppendText(b []byte) []byte {
	if out, ok := appendNumber(b, n.Decimal); ok {
		return out
	}
	return append(b, n.Decimal.String()...)
}

// appendNumber appends d's text when its coefficient fits in an int64 and
// decimal's formatting options are its defaults; ok is false otherwise
// (b unchanged).
func appendNumber(b []byte, d decimal.Decimal) ([]byte, bool) {
	exp := d.Exponent()
	if !decimal.TrimTrailingZeros || decimal.UseScientificNotation || d.NumDigits() > 18 || exp > 18 || exp < -18 {
		return b, false
	}
	c := d.CoefficientInt64()
	if c == 0 {
		return append(b, '0'), true
	}
	if exp >= 0 {
		b = strconv.AppendInt(b, c, 10)
		for i := int32(0); i < exp; i++ {
			b = append(b, '0')
		}
		return b, true
	}
	var dig [20]byte
	digits := strconv.AppendUint(dig[:0], absUint(c), 10)
	if c < 0 {
		b = append(b, '-')
	}
	places := int(-exp)
	whole, frac := []byte("0"), digits
	zeros := 0
	if len(digits) > places {
		whole, frac = digits[:len(digits)-places], digits[len(digits)-places:]
	} else {
		zeros = places - len(digits)
	}
	for len(frac) > 0 && frac[len(frac)-1] == '0' {
		frac = frac[:len(frac)-1]
	}
	b = append(b, whole...)
	if len(frac) == 0 {
		return b, true
	}
	b = append(b, '.')
	for i := 0; i < zeros; i++ {
		b = append(b, '0')
	}
	return append(b, frac...), true
}

func absUint(c int64) uint64 {
	if c < 0 {
		return uint64(-(c + 1)) + 1
	}
	return uint64(c)
}
