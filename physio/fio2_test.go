package physio

import (
	"errors"
	"math"
	"testing"
)

func TestFiO2ToMatchReference(t *testing.T) {
	p8000, _ := PressureAtAltitude(Feet(8000))
	// REFERENCES.md §4 [calc], given to 3 decimals: sea level → 8 000 ft.
	for _, tt := range []struct{ from, want float64 }{{0.21, 0.289}, {0.40, 0.551}} {
		got, err := FiO2ToMatch(Fraction(tt.from), SeaLevelPressure, p8000, MmHg(47))
		if err != nil || math.Abs(float64(got)-tt.want) > 0.0005 {
			t.Errorf("FiO2ToMatch(%v) = %.5f, %v; want %v [calc]", tt.from, float64(got), err, tt.want)
		}
		// Shown rounded up to 2 places, never below the exact need.
		d, ok := Round(float64(got), 2, RoundUp)
		if !ok || d.InexactFloat64() < float64(got) {
			t.Errorf("rounded FiO2 %v is below the need %v", d, float64(got))
		}
	}
	// Same pressure both ends: unchanged.
	got, err := FiO2ToMatch(0.3, SeaLevelPressure, SeaLevelPressure, MmHg(47))
	if err != nil || math.Abs(float64(got)-0.3) > 1e-15 {
		t.Errorf("FiO2ToMatch at the same pressure = %v, %v", float64(got), err)
	}
}

func TestFiO2ToMatchImpossible(t *testing.T) {
	p8000, _ := PressureAtAltitude(Feet(8000))
	// 0.9 at sea level needs 0.9·713/517.5 ≈ 1.24 at 8 000 ft [calc].
	got, err := FiO2ToMatch(0.9, SeaLevelPressure, p8000, MmHg(47))
	var ie *ImpossibleError
	if !errors.As(err, &ie) || !gasClose(float64(got), 0.9*(SeaLevelPressure.MmHg()-47)/(p8000.MmHg()-47), 1e-9) {
		t.Errorf("FiO2ToMatch(0.9 → 8000 ft) = %v, %v; want ≈1.24 and *ImpossibleError", float64(got), err)
	}
	// Barometric pressure at or below water vapour: nothing to breathe.
	got, err = FiO2ToMatch(0.21, SeaLevelPressure, MmHg(40), MmHg(47))
	if !errors.Is(err, ErrImpossible) || got != 0 {
		t.Errorf("FiO2ToMatch to 40 mmHg = %v, %v", float64(got), err)
	}
}

func TestMaxAltitudeForFiO2(t *testing.T) {
	ph2o := MmHg(47)
	for _, from := range []Fraction{0.21, 0.3, 0.4, 0.6} {
		for _, max := range []Fraction{0.6, 0.8, 1} {
			if max < from {
				continue
			}
			h, err := MaxAltitudeForFiO2(from, SeaLevelPressure, max, ph2o)
			if err != nil {
				t.Fatalf("MaxAltitudeForFiO2(%v, %v): %v", from, max, err)
			}
			// At that altitude the FiO2 needed is exactly max (inverse check).
			p, _ := PressureAtAltitude(h)
			need, err := FiO2ToMatch(from, SeaLevelPressure, p, ph2o)
			if !gasClose(float64(need), float64(max), 1e-9) {
				t.Errorf("FiO2 needed at MaxAltitudeForFiO2(%v, %v) = %v, %v", from, max, float64(need), err)
			}
		}
	}
	// [calc] air at sea level on oxygen: PB = 47 + 0.21·(760 − 47) = 196.73 mmHg.
	h, _ := MaxAltitudeForFiO2(0.21, MmHg(760), 1, ph2o)
	want, _ := AltitudeAtPressure(MmHg(196.73))
	if math.Abs(float64(h-want)) > 1e-6 {
		t.Errorf("MaxAltitudeForFiO2(0.21, 760 mmHg, 1.0) = %v m, want %v m", float64(h), float64(want))
	}
}

func TestMaxAltitudeForFiO2Limits(t *testing.T) {
	// Matches even above the model ceiling: 0.01 of 760 mmHg dry gas.
	h, err := MaxAltitudeForFiO2(0.01, MmHg(760), 1, 0)
	var re *RangeError
	if h != MaxModelAltitude || !errors.As(err, &re) {
		t.Errorf("above ceiling: %v, %v", float64(h), err)
	}
	// Oxygen at 2 atm cannot be matched anywhere in the model.
	h, err = MaxAltitudeForFiO2(1, Atmospheres(2), 1, MmHg(47))
	if h != MinModelAltitude || !errors.Is(err, ErrImpossible) {
		t.Errorf("below floor: %v, %v", float64(h), err)
	}
}

func TestFiO2BadInput(t *testing.T) {
	nan := math.NaN()
	sl, ph := SeaLevelPressure, MmHg(47)
	_, err := FiO2ToMatch(1.5, sl, sl, ph)
	gasWantRange(t, err, "FiO2 (from)")
	_, err = FiO2ToMatch(Fraction(nan), sl, sl, ph)
	gasWantRange(t, err, "FiO2 (from)")
	_, err = FiO2ToMatch(0.21, MmHg(30), sl, ph)
	gasWantRange(t, err, "barometric pressure (from)")
	_, err = FiO2ToMatch(0.21, sl, -sl, ph)
	gasWantRange(t, err, "barometric pressure (to)")
	_, err = FiO2ToMatch(0.21, sl, Pressure(math.Inf(1)), ph)
	gasWantRange(t, err, "barometric pressure (to)")
	_, err = FiO2ToMatch(0.21, sl, sl, MmHg(-5))
	gasWantRange(t, err, "water vapour pressure")
	_, err = MaxAltitudeForFiO2(0.21, sl, 0, ph)
	gasWantRange(t, err, "highest FiO2 available")
	_, err = MaxAltitudeForFiO2(0.21, sl, 100, ph)
	gasWantRange(t, err, "highest FiO2 available")
	_, err = MaxAltitudeForFiO2(-0.21, sl, 1, ph)
	gasWantRange(t, err, "FiO2 (from)")
	_, err = MaxAltitudeForFiO2(0.21, Pressure(nan), 1, ph)
	gasWantRange(t, err, "barometric pressure (from)")
}
