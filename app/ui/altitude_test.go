package ui

import (
	"strconv"
	"strings"
	"testing"
)

func mountAltitude(t *testing.T) *altitude {
	t.Helper()
	a := newAltitude()
	mount(t, a)
	return a
}

func shownNumber(t *testing.T, html, id string) float64 {
	t.Helper()
	s := strings.TrimPrefix(htmlText(html, id), "×")
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("%s shows %q, not a number", id, s)
	}
	return v
}

// At 50 000 ft about 9.25 psi holds an 8 000 ft cabin (McGraw-Hill
// Illustrated Dictionary of Aviation 2005; REFERENCES §2 [calc] 9.234 psi).
// Both directions are checked within the rounding of 9.234.
func TestAltitudeCabinBothWays(t *testing.T) {
	a := mountAltitude(t)
	a.edit(FieldAltCruise, "50000")
	a.edit(FieldAltDiff, "9.234")
	html := rendered(t, a)
	if v := shownNumber(t, html, "alt-cabin"); v < 7990 || v > 8010 {
		t.Errorf("cabin = %v ft, want about 8000", v)
	}
	if v := shownNumber(t, html, "alt-max-cruise"); v < 49950 || v > 50050 {
		t.Errorf("highest cruise for an 8000 ft cabin = %v ft, want about 50000", v)
	}
}

// An unpressurised 8 000 ft cabin from sea level on air, PaCO2 40:
// PAO2 58.7 mmHg (REFERENCES §3 [calc]) shown rounded down as 58; a free
// pocket of gas grows ×1.346 (REFERENCES §10 [calc]), shown rounded up as
// ×1.35; a 10 mL cuff → 13.46 mL → 13.5; a rigid cuff set at 25 cmH2O rises
// by (760 − 564.51) mmHg = 265.8 cmH2O (REFERENCES §1 [calc], 1 cmH2O =
// 98.0665 Pa) to 290.8 → 291 cmH2O, above the 30 cmH2O limit (Mann 2007).
func TestAltitudeOxygenAndTrappedGas(t *testing.T) {
	a := mountAltitude(t)
	a.edit(FieldAltCruise, "8000")
	a.edit(FieldAltDiff, "0")
	html := rendered(t, a)
	want := map[string]string{
		"alt-cabin":    "8000",
		"alt-pao2-alv": "58",
		"alt-ratio":    "×1.35",
		"alt-cuff-vol": "13.5",
		// 500 mL × 101325/75262 Pa (REFERENCES §1: 8000 ft = 75.262 kPa) = 673.1 → 674
		"alt-ptx-vol":   "674",
		"alt-cuff-rise": "291",
	}
	for id, w := range want {
		if got := htmlText(html, id); got != w {
			t.Errorf("%s = %q, want %q", id, got, w)
		}
	}
	if !strings.Contains(html, `id="alt-cuff-warn"`) {
		t.Error("no warning for a cuff above 30 cmH2O")
	}
	for _, id := range []string{"alt-gas-plot", "alt-spo2-plot"} {
		if !strings.Contains(html, `id="`+id+`"`) {
			t.Errorf("plot %s missing", id)
		}
	}
	for _, mark := range []string{">Origin 0<", ">Cabin 8000<", ">Destination 0<"} {
		if !strings.Contains(html, mark) {
			t.Errorf("plot mark %q missing", mark)
		}
	}
}

// A cruise altitude above the model's domain shows its message with the
// range and unit, and no figure.
func TestAltitudeBadValue(t *testing.T) {
	a := mountAltitude(t)
	a.edit(FieldAltCruise, "70000")
	html := rendered(t, a)
	msg := htmlText(html, FieldAltCruise+"-msg")
	if !strings.Contains(msg, "Cruise altitude") || !strings.Contains(msg, "between -2000 and 65000 ft") {
		t.Errorf("message = %q", msg)
	}
	for _, id := range []string{"alt-cabin", "alt-max-cruise", "alt-pao2-alv", "alt-ratio"} {
		if htmlText(html, id) != "" {
			t.Errorf("%s shown while a field is invalid", id)
		}
	}
	if strings.Contains(html, "alt-gas-plot") {
		t.Error("plot drawn while a field is invalid")
	}
}

// In metres: 8 000 ft = 2 438.4 m exactly (1 ft = 0.3048 m), the cabin
// rounded up to 2439 m; inputs are converted to the nearest metre.
func TestAltitudeUnits(t *testing.T) {
	a := mountAltitude(t)
	a.edit(FieldAltCruise, "8000")
	a.edit(FieldAltDiff, "0")
	st := a.settings
	st.AltitudeUnit, st.GasUnit = UnitM, UnitKPa
	a.settings = st
	a.showUnits()
	html := rendered(t, a)
	if a.text[FieldAltCruise] != "2438" {
		t.Errorf("cruise shown as %q m, want 2438", a.text[FieldAltCruise])
	}
	if got := htmlText(html, "alt-cabin"); got != "2438" && got != "2439" {
		t.Errorf("cabin = %q m, want 2438 or 2439 (2438 m typed back, rounded up)", got)
	}
	// 58.7 mmHg = 7.83 kPa (1 mmHg = 133.322 Pa) → 7.8 rounded down.
	if got := htmlText(html, "alt-pao2-alv"); got != "7.8" {
		t.Errorf("PAO2 = %q kPa, want 7.8", got)
	}
	if a.text[FieldAltPaCO2] != "5.3" {
		t.Errorf("PaCO2 shown as %q kPa, want 5.3 (40 mmHg)", a.text[FieldAltPaCO2])
	}
}
