package ui

import (
	"strings"
	"testing"
)

// Digits grouped in threes by a comma are thousands in English writing
// ("8,000 ft"); much of Europe writes the decimal with a comma ("1,5"). The
// SI Brochure (BIPM, 9th edition 2019, §5.4.4) accepts both decimal
// markers and groups digits with spaces only, because a comma or point
// between groups misleads. rangeRule takes a decimal comma and refuses the
// grouped form, naming the field, the range and the unit, instead of
// reading "8,000" as 8.
func TestRangeRuleThousandsComma(t *testing.T) {
	cruise := rangeRule{Label: "Cruise altitude", Min: "-2000", Max: "65000", Unit: "ft"}
	for _, typed := range []string{"8,000", "25,000", "-1,500", " 2,000 ", "1,000,000", "+3,000"} {
		_, msg := cruise.Check(typed)
		for _, part := range []string{"Cruise altitude", "between -2000 and 65000 ft", strings.TrimSpace(typed)} {
			if !strings.Contains(msg, part) {
				t.Errorf("Check(%q) = %q, want a refusal holding %q", typed, msg, part)
			}
		}
		if got := commaDecimal(typed); got != typed {
			t.Errorf("commaDecimal(%q) = %q, want it kept as typed for Check to refuse", typed, got)
		}
	}
	// Decimal commas read as before (no thousands group of three digits).
	for typed, want := range map[string]string{"1,5": "1.5", "12,50": "12.5", "0,125": "0.125", "1234,5": "1234.5"} {
		v, msg := cruise.Check(typed)
		if msg != "" || v.String() != want {
			t.Errorf("Check(%q) = %s, %q; want %s", typed, v, msg, want)
		}
	}
}
