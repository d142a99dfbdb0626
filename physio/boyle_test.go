package physio

import (
	"math"
	"testing"
)

func TestExpansionRatio(t *testing.T) {
	// REFERENCES §10 [calc]: sea level → 8 000 ft cabin ×1.346 (given to
	// 3 decimals), with the 1976 atmosphere's 101 325 Pa and 75 262 Pa.
	got, err := ExpansionRatio(Pascals(101325), Pascals(75262))
	if err != nil || !supplyClose(got, 1.346, 5e-4) {
		t.Errorf("ExpansionRatio(sea level, 8000 ft) = %v, %v; want 1.346", got, err)
	}
	// GNU units as the oracle, to more digits (pressures from its own
	// stdatmPH standard atmosphere).
	want := supplyUnits(t, "stdatmPH(0 ft) / stdatmPH(8000 ft)", "1")
	if !supplyClose(got, want, 1e-4) {
		t.Errorf("ExpansionRatio = %v, GNU units stdatmPH ratio %v", got, want)
	}
	// Through this package's own atmosphere.
	p8000, err := PressureAtAltitude(Feet(8000))
	if err != nil {
		t.Fatal(err)
	}
	r, err := ExpansionRatio(SeaLevelPressure, p8000)
	if err != nil || !supplyClose(r, want, 1e-5) {
		t.Errorf("ExpansionRatio via PressureAtAltitude = %v, %v; GNU units %v", r, err, want)
	}
	// Descent compresses; no change is ×1.
	if r, _ := ExpansionRatio(Pascals(75262), Pascals(101325)); !(r < 1) {
		t.Errorf("descent ratio %v, want < 1", r)
	}
	if r, _ := ExpansionRatio(Kilopascals(80), Kilopascals(80)); r != 1 {
		t.Errorf("same pressure ratio %v, want 1", r)
	}
}

func TestExpandedVolume(t *testing.T) {
	// A 500 mL pocket, sea level → 8 000 ft: 500·101325/75262 = 673.1 mL [calc].
	got, err := ExpandedVolume(Millilitres(500), Pascals(101325), Pascals(75262))
	if err != nil || !supplyClose(got.Millilitres(), 500*101325.0/75262, 1e-12) {
		t.Errorf("ExpandedVolume = %v mL, %v; want 673.1", got.Millilitres(), err)
	}
	// Oracle: GNU units applies Boyle with its own mmHg definition.
	want := supplyUnits(t, "1 liter * 760 mmHg / 564.51 mmHg", "ml")
	got, _ = ExpandedVolume(Litres(1), MmHg(760), MmHg(564.51))
	if !supplyClose(got.Millilitres(), want, 1e-6) {
		t.Errorf("ExpandedVolume 1 L 760→564.51 mmHg = %v mL; GNU units %v", got.Millilitres(), want)
	}
}

func TestRigidSpaceOverpressure(t *testing.T) {
	// A sealed rigid space keeps its absolute pressure; the fall in ambient
	// appears as overpressure. A cuff at 25 cmH2O at sea level taken to an
	// 8 000 ft cabin: oracle GNU units for (101 325 Pa + 25 cmH2O − 75 262 Pa).
	got, err := RigidSpaceOverpressure(CmH2O(25), Pascals(101325), Pascals(75262))
	if err != nil {
		t.Fatal(err)
	}
	want := supplyUnits(t, "101325 Pa + 25 cm H2O - 75262 Pa", "cm H2O")
	if !supplyClose(got.CmH2O(), want, 1e-7) { // units prints 8 significant digits
		t.Errorf("RigidSpaceOverpressure = %v cmH2O, GNU units %v", got.CmH2O(), want)
	}
	// Far above the ≈30 cmH2O perfusion limit (Mann C et al., Emerg Med J
	// 2007;24:165–7 [pub]).
	if got <= TubeCuffPerfusionLimit {
		t.Errorf("upper bound %v cmH2O should exceed the cuff limit", got.CmH2O())
	}
	if !supplyClose(TubeCuffPerfusionLimit.CmH2O(), 30, 1e-12) {
		t.Errorf("TubeCuffPerfusionLimit = %v cmH2O, want 30 (Mann 2007)", TubeCuffPerfusionLimit.CmH2O())
	}
	// No altitude change: the inside gauge is unchanged.
	same, _ := RigidSpaceOverpressure(CmH2O(25), Kilopascals(90), Kilopascals(90))
	if !supplyClose(same.CmH2O(), 25, 1e-12) {
		t.Errorf("no change gave %v cmH2O, want 25", same.CmH2O())
	}
}

func TestBoyleBadInput(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	bad := []Pressure{0, Pascals(-101325), Pascals(500), Kilopascals(1001), Pressure(1e300), Pressure(inf), Pressure(nan)}
	for _, p := range bad {
		_, err := ExpansionRatio(p, Pascals(75262))
		supplyWantRange(t, err, "starting pressure", "kPa")
		_, err = ExpansionRatio(Pascals(101325), p)
		supplyWantRange(t, err, "final pressure", "kPa")
		_, err = ExpandedVolume(Litres(1), p, Pascals(75262))
		supplyWantRange(t, err, "starting pressure", "kPa")
		_, err = RigidSpaceOverpressure(0, Pascals(101325), p)
		supplyWantRange(t, err, "final pressure", "kPa")
	}
	for _, v := range []float64{-1, 101, inf, nan} {
		_, err := ExpandedVolume(Litres(v), Pascals(101325), Pascals(75262))
		supplyWantRange(t, err, "trapped gas volume", "L")
	}
	for _, g := range []Pressure{Kilopascals(-102), Kilopascals(1001), Pressure(inf), Pressure(nan)} {
		_, err := RigidSpaceOverpressure(g, Pascals(101325), Pascals(75262))
		supplyWantRange(t, err, "pressure inside (gauge)", "kPa")
	}
}
