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

// Respiratory and heart rate on the Logbook are plain decimals, as every
// other field: Go's strconv.ParseFloat (its documentation lists the forms)
// also reads exponents ("1e1"), hexadecimal floats ("0x1p6" = 64),
// underscores in prefixed numbers and "Inf"/"NaN", which saved a heart
// rate of 64 /min from "0x1p6" with no word.
func TestLogbookRatesPlainDecimal(t *testing.T) {
	for _, typed := range []string{"1e1", "0x1p6", "0x_1p6", "Inf", "+Inf", "infinity", "NaN", "1E2"} {
		for _, f := range []lbObsForm{{rr: typed}, {hr: typed}} {
			o, err := lbReadObservation(f, UnitMmHg)
			if err == nil {
				t.Errorf("rates %+v read as %v/%v, want a refusal", f, o.RespRate, o.HeartRate)
				continue
			}
			if !strings.Contains(err.Error(), typed) || !strings.Contains(err.Error(), "Allowed: 0 to ") || !strings.Contains(err.Error(), " /min.") {
				t.Errorf("rates %+v: message %q lacks the text typed, the range or the unit", f, err)
			}
		}
	}
	o, err := lbReadObservation(lbObsForm{rr: "16", hr: "72.5"}, UnitMmHg)
	if err != nil || o.RespRate == nil || *o.RespRate != 16 || o.HeartRate == nil || *o.HeartRate != 72.5 {
		t.Fatalf("plain rates 16 and 72.5: %+v, %v", o, err)
	}
}
