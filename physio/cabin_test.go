package physio

import (
	"errors"
	"math"
	"testing"
)

func TestCabinAltitudeLimit(t *testing.T) {
	// 14 CFR 25.841(a) [pub]: 8 000 ft; 1 ft = 0.3048 m exactly.
	if CabinAltitudeLimit.Metres() != 2438.4 {
		t.Errorf("CabinAltitudeLimit = %v m, want 2438.4 m", CabinAltitudeLimit.Metres())
	}
}

func TestCabinDifferentialReference(t *testing.T) {
	// McGraw-Hill Illustrated Dictionary of Aviation (2005) [pub]: at 50 000 ft
	// about 9.25 psi holds an 8 000 ft cabin; REFERENCES.md §2 [calc] 9.234 psi
	// (given to 4 digits: half a unit of the last is 5.4e-5).
	cruise, limit := Feet(50000), Feet(8000)
	pc, _ := PressureAtAltitude(limit)
	pa, _ := PressureAtAltitude(cruise)
	dp := (pc - pa).Psi()
	if !gasClose(dp, 9.234, 6e-5) {
		t.Errorf("differential for 8000 ft at 50000 ft = %.5f psi, want 9.234 [calc]", dp)
	}
	if !gasClose(dp, 9.25, tolPub) {
		t.Errorf("differential = %.4f psi, want about 9.25 psi [pub]", dp)
	}
	// The two directions agree with that figure.
	got, err := MaxCruiseAltitude(limit, Psi(9.234))
	if err != nil || math.Abs(got.Feet()-50000) > 10 { // 0.0005 psi ≈ 6 ft at 50 000 ft
		t.Errorf("MaxCruiseAltitude(8000 ft, 9.234 psi) = %.1f ft, %v; want 50000 ft", got.Feet(), err)
	}
	cabin, err := CabinAltitude(cruise, Psi(9.25), 0)
	if err != nil || !gasClose(cabin.Feet(), 8000, tolPub) || cabin.Feet() > 8000 {
		t.Errorf("CabinAltitude(50000 ft, 9.25 psi) = %.1f ft, %v; want just under 8000 ft", cabin.Feet(), err)
	}
}

func TestCabinAltitudeCases(t *testing.T) {
	tests := []struct {
		name          string
		cruise, floor Altitude
		dp            Pressure
		want          Altitude
	}{
		// Unpressurised: the cabin is at cruise, the floor does not apply.
		{"unpressurised", Feet(10000), 0, 0, Feet(10000)},
		{"unpressurised above floor", Feet(3000), Feet(5000), 0, Feet(3000)},
		// 8 psi at 10 000 ft would put the cabin below sea level: held at the floor.
		{"held at floor", Feet(10000), 0, Psi(8), 0},
		{"held at high field", Feet(25000), Feet(6000), Psi(8), Feet(6000)},
		// The cabin is never above the aircraft.
		{"cruise below floor", Metres(1000), Metres(2000), Psi(5), Metres(1000)},
	}
	for _, tt := range tests {
		got, err := CabinAltitude(tt.cruise, tt.dp, tt.floor)
		if err != nil || math.Abs(float64(got-tt.want)) > 1e-9 {
			t.Errorf("%s: CabinAltitude = %v m, %v; want %v m", tt.name, float64(got), err, float64(tt.want))
		}
	}
}

func TestCabinInverse(t *testing.T) {
	for _, limitFt := range []float64{0, 5000, 6000, 8000} {
		for _, psi := range []float64{0, 2, 5.5, 8.6, 9.4} {
			hi, err := MaxCruiseAltitude(Feet(limitFt), Psi(psi))
			if err != nil {
				t.Fatalf("MaxCruiseAltitude(%v ft, %v psi): %v", limitFt, psi, err)
			}
			cabin, err := CabinAltitude(hi, Psi(psi), MinModelAltitude)
			if err != nil || math.Abs(cabin.Feet()-limitFt) > 1e-6 {
				t.Errorf("cabin at MaxCruise(%v ft, %v psi) = %.6f ft, %v", limitFt, psi, cabin.Feet(), err)
			}
			// Monotonic: a higher cruise than the limit gives a higher cabin.
			above, _ := CabinAltitude(hi+100, Psi(psi), MinModelAltitude)
			if hi+100 <= MaxModelAltitude && !(above > cabin) {
				t.Errorf("cabin does not rise with cruise at %v ft, %v psi", limitFt, psi)
			}
		}
	}
}

func TestMaxCruiseAboveCeiling(t *testing.T) {
	// 15 psi holds sea level up to well past 20 km: the model's ceiling.
	got, err := MaxCruiseAltitude(0, Psi(15))
	if got != MaxModelAltitude {
		t.Errorf("MaxCruiseAltitude above ceiling = %v, want MaxModelAltitude", float64(got))
	}
	var re *RangeError
	if !errors.As(err, &re) || re.Unit != "Pa" {
		t.Errorf("want a *RangeError in Pa, got %v", err)
	}
}

func TestCabinBadInput(t *testing.T) {
	nan := math.NaN()
	_, err := CabinAltitude(Feet(70000), Psi(8), 0)
	gasWantRange(t, err, "cruise altitude")
	_, err = CabinAltitude(Altitude(nan), Psi(8), 0)
	gasWantRange(t, err, "cruise altitude")
	_, err = CabinAltitude(Feet(30000), Psi(-1), 0)
	gasWantRange(t, err, "pressure differential")
	_, err = CabinAltitude(Feet(30000), Psi(16), 0)
	gasWantRange(t, err, "pressure differential")
	_, err = CabinAltitude(Feet(30000), Pressure(math.Inf(1)), 0)
	gasWantRange(t, err, "pressure differential")
	_, err = CabinAltitude(Feet(30000), Psi(8), Metres(-1000))
	gasWantRange(t, err, "cabin floor altitude")
	_, err = MaxCruiseAltitude(Feet(-3000), Psi(8))
	gasWantRange(t, err, "cabin altitude limit")
	_, err = MaxCruiseAltitude(Feet(8000), Psi(1e9))
	gasWantRange(t, err, "pressure differential")
	_, err = MaxCruiseAltitude(Feet(8000), Pressure(nan))
	gasWantRange(t, err, "pressure differential")
}
