package physio

import (
	"errors"
	"math"
	"testing"
)

func TestVentilatorOxygen(t *testing.T) {
	// Formulas of REFERENCES §9 [practice]; values [calc] from them, in
	// scenarios of our own.
	tests := []struct {
		name                           string
		drive                          Drive
		ve, bias, leak, driveGas, fio2 float64
		want                           float64
	}{
		// (8 + 2 + 0)·(0.5 − 0.21)/0.79 = 3.6709 L/min
		{"blending, bias", DriveBlending, 8, 2, 0, 0, 0.5, 10 * 0.29 / 0.79},
		// (6 + 0 + 3)·(1 − 0.21)/0.79 + 1 = 10 L/min
		{"blending, leak, drive gas, FiO2 1", DriveBlending, 6, 0, 3, 1, 1, 10},
		// room air from a turbine uses no oxygen
		{"blending at 0.21", DriveBlending, 8, 5, 5, 0, 0.21, 0},
		// published O2-driven form, V̇E·FiO2 + drive gas: 8·0.6 + 1 = 5.8
		{"oxygen-driven", DriveOxygen, 8, 0, 0, 1, 0.6, 5.8},
		// bias and leak count at FiO2 too: (8 + 2 + 1)·0.6 + 1 = 7.6
		{"oxygen-driven, bias and leak", DriveOxygen, 8, 2, 1, 1, 0.6, 7.6},
	}
	for _, tc := range tests {
		got, err := VentilatorOxygen(tc.drive, LitresPerMinute(tc.ve), LitresPerMinute(tc.bias),
			LitresPerMinute(tc.leak), LitresPerMinute(tc.driveGas), Fraction(tc.fio2))
		if err != nil || !supplyClose(got.LitresPerMinute(), tc.want, 1e-12) {
			t.Errorf("%s: VentilatorOxygen = %v, %v; want %v L/min", tc.name, got, err, tc.want)
		}
	}
	// An oxygen-driven ventilator never uses less oxygen than a blending
	// one at the same settings (it counts all gas, not the oxygen share).
	for _, f := range []float64{0.21, 0.3, 0.5, 0.8, 1} {
		b, _ := VentilatorOxygen(DriveBlending, 8, 1, 1, 0, Fraction(f))
		o, _ := VentilatorOxygen(DriveOxygen, 8, 1, 1, 0, Fraction(f))
		if o < b-1e-12 {
			t.Errorf("FiO2 %v: oxygen-driven %v < blending %v", f, o, b)
		}
	}
}

func TestVentilatorOxygenBadInput(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	call := func(ve, bias, leak, dg, f float64) error {
		_, err := VentilatorOxygen(DriveBlending, LitresPerMinute(ve), LitresPerMinute(bias),
			LitresPerMinute(leak), LitresPerMinute(dg), Fraction(f))
		return err
	}
	for _, v := range []float64{0, -8, 0.05, 61, 1e300, inf, nan} {
		supplyWantRange(t, call(v, 0, 0, 0, 0.5), "minute volume", "L/min")
	}
	for _, v := range []float64{-1, 31, inf, nan} {
		supplyWantRange(t, call(8, v, 0, 0, 0.5), "bias flow", "L/min")
	}
	for _, v := range []float64{-1, 61, nan} {
		supplyWantRange(t, call(8, 0, v, 0, 0.5), "leak", "L/min")
	}
	for _, v := range []float64{-0.5, 61, inf} {
		supplyWantRange(t, call(8, 0, 0, v, 0.5), "drive gas", "L/min")
	}
	for _, v := range []float64{0.2, 0, -1, 1.01, 50, nan} {
		supplyWantRange(t, call(8, 0, 0, 0, v), "FiO2", "")
	}
	for _, d := range []Drive{"", "turbine", "OXYGEN"} {
		_, err := VentilatorOxygen(d, 8, 0, 0, 0, 0.5)
		var pe *ParseError
		if !errors.As(err, &pe) || !errors.Is(err, ErrSyntax) || pe.Quantity != "ventilator drive" {
			t.Errorf("VentilatorOxygen(drive %q) = %v, want *ParseError for ventilator drive", d, err)
		}
	}
}
