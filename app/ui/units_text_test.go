package ui

import (
	"regexp"
	"strings"
	"testing"
)

// Conversion factors, exact by definition: 1 ft = 0.3048 m (the
// international foot of 1959; NIST SP 811, Appendix B.8) and
// 1 mmHg = 133.322 387 415 Pa (the conventional millimetre of mercury,
// NIST SP 811, Appendix B.8). Each expected value below is the product
// rounded to the nearest metre or 0.1 kPa, worked by hand beside it.
func TestWarningsInDisplayUnits(t *testing.T) {
	metric := Settings{AltitudeUnit: UnitM, GasUnit: UnitKPa}
	feetMetric := Settings{AltitudeUnit: UnitM, GasUnit: UnitMmHg}
	imperial := Settings{AltitudeUnit: UnitFeet, GasUnit: UnitMmHg}
	cases := []struct {
		settings Settings
		in, want string
	}{
		// 8500 × 0.3048 = 2590.8 → 2591; 8000 × 0.3048 = 2438.4 → 2438.
		{metric, "cabin altitude 8500 ft is above the 8000 ft limit of normal operation (14 CFR 25.841(a))",
			"cabin altitude 2591 m (8500 ft) is above the 2438 m (8000 ft) limit of normal operation (14 CFR 25.841(a))"},
		// 62.3 × 0.133322387415 = 8.306 → 8.3.
		{metric, "PaO2 62.3 mmHg estimated from SpO2 91 % on the standard curve",
			"PaO2 8.3 kPa (62.3 mmHg) estimated from SpO2 91 % on the standard curve"},
		// 6000 × 0.3048 = 1828.8 → 1829.
		{metric, "leg 2 (cabin, 6000 ft): at FiO2 0.21 no oxygen reaches the alveoli",
			"leg 2 (cabin, 1829 m (6000 ft)): at FiO2 0.21 no oxygen reaches the alveoli"},
		// −500 × 0.3048 = −152.4 → −152.
		{metric, "the origin field at -500 ft is low", "the origin field at -152 m (-500 ft) is low"},
		// Gas pressures stay in mmHg when that is the display unit.
		{feetMetric, "SpO2 99 % and PaO2 80 mmHg at 9000 ft", "SpO2 99 % and PaO2 80 mmHg at 2743 m (9000 ft)"},
		// Feet and mmHg shown: the sentence is physio's own.
		{imperial, "cabin altitude 8500 ft is above the 8000 ft limit", "cabin altitude 8500 ft is above the 8000 ft limit"},
		// Not quantities: a number inside a word or a rule's number, a
		// unit that is not a whole word, a number with no unit.
		{metric, "A320 ft fleet; 25.841 ft2; 3 ftx; 12 L needed", "A320 ft fleet; 25.841 ft2; 3 ftx; 12 L needed"},
		{metric, "", ""},
	}
	for _, c := range cases {
		s := &briefState{settings: c.settings}
		if got := s.inUnits(c.in); got != c.want {
			t.Errorf("%s/%s %q:\n got %q\nwant %q", c.settings.AltitudeUnit, c.settings.GasUnit, c.in, got, c.want)
		}
	}
}

// Any sentence: no panic, nothing removed (the conversion only inserts a
// converted value in front of physio's, which goes in brackets), and no
// NaN or Inf written.
func FuzzWarningsInDisplayUnits(f *testing.F) {
	for _, s := range []string{"cabin altitude 8500 ft is above 8000 ft", "PaO2 62.3 mmHg", "-1.5 ft", "ft", "1.", "-", "9999999999999999999999 ft", "1e400 ft"} {
		f.Add(s)
	}
	s := &briefState{settings: Settings{AltitudeUnit: UnitM, GasUnit: UnitKPa}}
	f.Fuzz(func(t *testing.T, msg string) {
		got := s.inUnits(msg)
		if got == msg {
			return
		}
		if !strings.Contains(got, " m (") && !strings.Contains(got, " kPa (") {
			t.Errorf("inUnits(%q) = %q: changed without a conversion", msg, got)
		}
		for _, bad := range []string{"NaN", "Inf"} {
			if strings.Count(got, bad) != strings.Count(msg, bad) {
				t.Errorf("inUnits(%q) = %q writes %s", msg, got, bad)
			}
		}
		// Taking the inserted values out gives the sentence back.
		if back := insertedValue.ReplaceAllString(got, "$1"); back != msg {
			t.Errorf("inUnits(%q) = %q: without the inserted values %q", msg, got, back)
		}
	})
}

// insertedValue matches what inUnits puts in front of a quantity.
var insertedValue = regexp.MustCompile(`-?\d+(?:\.\d+)? (?:m|kPa) \((-?\d+(?:\.\d+)? (?:ft|mmHg))\)`)
