package physio

import (
	"errors"
	"fmt"
	"math"
	"os/exec"
	"strconv"
	"strings"
	"testing"
)

// gasClose reports whether got is within tol (relative) of want; for want 0
// tol is absolute.
func gasClose(got, want, tol float64) bool {
	if math.IsNaN(got) || math.IsInf(got, 0) {
		return false
	}
	if want == 0 {
		return math.Abs(got) <= tol
	}
	return math.Abs(got-want) <= tol*math.Abs(want)
}

// Tolerances by the tag of the check value (REFERENCES.md, header).
const (
	tolPub  = 0.005 // rounded published tables: ±0.5 %
	tolCalc = 1e-4  // [calc] values computed from the formula in double precision
)

// gasWantRange asserts err is a *RangeError for quantity q with a unit.
func gasWantRange(t *testing.T, err error, q string) {
	t.Helper()
	var re *RangeError
	if !errors.As(err, &re) || !errors.Is(err, ErrOutOfRange) {
		t.Fatalf("want *RangeError for %s, got %v", q, err)
	}
	if !strings.Contains(re.Quantity, q) {
		t.Errorf("RangeError names %q, want it to name %q", re.Quantity, q)
	}
	if math.IsNaN(re.Min) || math.IsNaN(re.Max) || re.Min > re.Max {
		t.Errorf("RangeError range %v–%v is not a range", re.Min, re.Max)
	}
	if !strings.Contains(re.Error(), "outside") {
		t.Errorf("message %q does not state the allowed range", re.Error())
	}
}

func TestPressureAtAltitudeReference(t *testing.T) {
	tests := []struct {
		h    Altitude
		want Pressure
		tol  float64
		src  string
	}{
		// REFERENCES.md §1 [calc], from the US Standard Atmosphere 1976 formula.
		{Metres(0), Pascals(101325.0), tolCalc, "USSA 1976 [calc]"},
		{Metres(1000), Pascals(89874.6), tolCalc, "USSA 1976 [calc]"},
		{Metres(3000), Pascals(70108.5), tolCalc, "USSA 1976 [calc]"},
		{Metres(11000), Pascals(22632.1), tolCalc, "USSA 1976 [calc]"},
		{Feet(5000), MmHg(632.36), tolCalc, "USSA 1976 [calc]"},
		{Feet(8000), MmHg(564.51), tolCalc, "USSA 1976 [calc]"},
		{Feet(8000), Kilopascals(75.262), tolCalc, "USSA 1976 [calc]"},
		{Feet(10000), MmHg(522.66), tolCalc, "USSA 1976 [calc]"},
		{Feet(18000), MmHg(379.53), tolCalc, "USSA 1976 [calc]"},
		// U.S. Standard Atmosphere 1976 Table I, 20 000 m geopotential:
		// 5.4749E+03 Pa [memory: table value recalled, not re-read].
		{Metres(20000), Pascals(5474.9), tolPub, "USSA 1976 Table I [memory]"},
		// Samuels MP, Arch Dis Child 2004;89:448–455, Table 1 [pub], rounded mmHg.
		{Metres(1000), MmHg(674), tolPub, "Samuels 2004 Table 1 [pub]"},
		{Metres(3000), MmHg(526), tolPub, "Samuels 2004 Table 1 [pub]"},
		{Metres(5000), MmHg(405), tolPub, "Samuels 2004 Table 1 [pub]"},
		{Metres(8000), MmHg(267), tolPub, "Samuels 2004 Table 1 [pub]"},
	}
	for _, tt := range tests {
		got, err := PressureAtAltitude(tt.h)
		if err != nil {
			t.Fatalf("PressureAtAltitude(%v m): %v", float64(tt.h), err)
		}
		if !gasClose(float64(got), float64(tt.want), tt.tol) {
			t.Errorf("PressureAtAltitude(%.1f m) = %.2f Pa, want %.2f Pa ±%g (%s)",
				float64(tt.h), float64(got), float64(tt.want), tt.tol, tt.src)
		}
		back, err := AltitudeAtPressure(tt.want)
		if err != nil {
			t.Fatalf("AltitudeAtPressure(%v Pa): %v", float64(tt.want), err)
		}
		// Inverse: the altitude of the published pressure lies within the
		// altitude span the pressure tolerance allows (dP/dH ≈ −P/8 km).
		if math.Abs(float64(back-tt.h)) > tt.tol*9000+0.5 {
			t.Errorf("AltitudeAtPressure(%.2f Pa) = %.1f m, want about %.1f m (%s)",
				float64(tt.want), float64(back), float64(tt.h), tt.src)
		}
	}
}

func TestStandardAtmosphereConstants(t *testing.T) {
	// REFERENCES.md §1: exponent 5.255876 and P11 22 632.06 Pa [calc].
	if !gasClose(stdExpo, 5.255876, 1e-6) {
		t.Errorf("exponent g0·M0/(R*·L) = %v, want 5.255876", stdExpo)
	}
	if !gasClose(stdP11, 22632.06, 1e-6) {
		t.Errorf("P11 = %v Pa, want 22632.06", stdP11)
	}
	// The two layers join with no step at 11 000 m.
	below, _ := PressureAtAltitude(Metres(11000))
	above, _ := PressureAtAltitude(Metres(11000.000001))
	if !(above < below) || !gasClose(float64(above), float64(below), 1e-9) {
		t.Errorf("step at the tropopause: %v then %v", below, above)
	}
}

// TestStandardAtmosphereAgainstUnits compares both directions with GNU
// units' stdatmPH (the 1976 troposphere, geopotential), an oracle outside
// the project, over −600 m to 11 000 m. The test fails if units is missing:
// `make test` installs it.
//
// Tolerance: units derives the molar mass of air from the 1976 composition
// table (exponent 5.2558807) where the standard states M0 = 28.9644 kg/kmol
// (exponent 5.2558760); that moves P by at most 1.4e-6 relative below
// 11 km, and H by under 2 cm. The tolerances are set just above that.
func TestStandardAtmosphereAgainstUnits(t *testing.T) {
	bin, err := exec.LookPath("units")
	if err != nil {
		t.Fatalf("GNU units is required for this oracle test (Debian package units): %v", err)
	}
	var alts []float64
	for h := -600.0; h <= 11000; h += 200 {
		alts = append(alts, h)
	}
	alts = append(alts, 2438.4, 10999) // 8 000 ft; units' inverse range stops at 22 877 Pa
	var in strings.Builder
	for _, h := range alts {
		fmt.Fprintf(&in, "stdatmPH(%g m)\nPa\n", h)
	}
	for _, h := range alts {
		if h > 10900 { // outside units' inverse range
			continue
		}
		p, _ := PressureAtAltitude(Metres(h))
		fmt.Fprintf(&in, "~stdatmPH(%.6f Pa)\nm\n", float64(p))
	}
	cmd := exec.Command(bin, "-d", "12", "-t")
	cmd.Stdin = strings.NewReader(in.String())
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("units: %v", err)
	}
	lines := strings.Fields(string(out))
	var values []float64
	for _, l := range lines {
		v, err := strconv.ParseFloat(l, 64)
		if err != nil {
			t.Fatalf("units printed %q, not a number; output:\n%s", l, out)
		}
		values = append(values, v)
	}
	checked := 0
	for i, h := range alts {
		got, _ := PressureAtAltitude(Metres(h))
		if !gasClose(float64(got), values[i], 2e-6) {
			t.Errorf("P(%g m) = %.6f Pa, units says %.6f Pa", h, float64(got), values[i])
		}
		checked++
	}
	j := len(alts)
	for _, h := range alts {
		if h > 10900 {
			continue
		}
		// units prints 12 significant digits; 1 mm is far inside that.
		if math.Abs(values[j]-h) > 0.02 {
			t.Errorf("H(P(%g m)) by units = %.6f m", h, values[j])
		}
		p, _ := PressureAtAltitude(Metres(h))
		back, _ := AltitudeAtPressure(p)
		if math.Abs(float64(back)-values[j]) > 0.02 {
			t.Errorf("AltitudeAtPressure(%.6f Pa) = %.6f m, units says %.6f m", float64(p), float64(back), values[j])
		}
		j++
		checked++
	}
	if j != len(values) || checked < 100 {
		t.Fatalf("compared %d values, units returned %d", checked, len(values))
	}
}

func TestAltitudeRoundTrip(t *testing.T) {
	for h := -610.0; h <= 20000; h += 37.5 {
		p, err := PressureAtAltitude(Metres(h))
		if err != nil {
			t.Fatal(err)
		}
		back, err := AltitudeAtPressure(p)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(float64(back)-h) > 1e-6 {
			t.Errorf("H(P(%g m)) = %.9f m", h, float64(back))
		}
	}
	// The domain's ends map onto the inverse's domain ends.
	for _, h := range []Altitude{MinModelAltitude, MaxModelAltitude} {
		p, _ := PressureAtAltitude(h)
		back, err := AltitudeAtPressure(p)
		if err != nil || math.Abs(float64(back-h)) > 1e-6 {
			t.Errorf("H(P(%v m)) = %v, %v", float64(h), float64(back), err)
		}
	}
}

func TestAtmosphereBadInput(t *testing.T) {
	for _, h := range []Altitude{-611, -1e6, 20000.001, 1e300, Altitude(math.NaN()), Altitude(math.Inf(1)), Altitude(math.Inf(-1))} {
		p, err := PressureAtAltitude(h)
		gasWantRange(t, err, "altitude")
		if p != 0 {
			t.Errorf("PressureAtAltitude(%v) returned %v with an error", float64(h), p)
		}
	}
	for _, p := range []Pressure{0, -1, 5474, 108872, Atmospheres(2), Pressure(math.NaN()), Pressure(math.Inf(1))} {
		_, err := AltitudeAtPressure(p)
		gasWantRange(t, err, "pressure")
	}
}
