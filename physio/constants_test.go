package physio

import (
	"math"
	"os/exec"
	"strconv"
	"strings"
	"testing"
)

// The unit factors of constants.go and of the text parser against GNU units'
// own definitions (an oracle outside the project; REFERENCES "Units" gives
// the same exact values). inHg is defined by units from mercury's density
// (3386.38864 Pa); Alvea keeps the published 3386.389, within 1.1e-7.
func TestUnitFactorsAgainstUnits(t *testing.T) {
	tests := []struct {
		expr, to string
		got      float64
		rel      float64
	}{
		{"psi", "Pa", pascalsPerPsi, 1e-13},
		{"bar", "Pa", pascalsPerBar, 0},
		{"atm", "Pa", pascalsPerAtm, 0},
		{"mmHg", "Pa", pascalsPerMmHg, 1e-13},
		{"cm H2O", "Pa", pascalsPerCmH2O, 1e-13},
		{"inHg", "Pa", pascalsPerInHg, 2e-7},
		{"ft", "m", metresPerFoot, 0},
		{"torr", "Pa", pressureUnits.byName["torr"].factor.InexactFloat64(), 1e-13},
		{"psi", "Pa", pressureUnits.byName["psi"].factor.InexactFloat64(), 1e-13},
		{"mmHg", "Pa", pressureUnits.byName["mmhg"].factor.InexactFloat64(), 1e-13},
		{"inHg", "Pa", pressureUnits.byName["inhg"].factor.InexactFloat64(), 2e-7},
		{"ft", "m", altitudeUnits.byName["ft"].factor.InexactFloat64(), 0},
	}
	for _, tc := range tests {
		want := unitsValue(t, tc.expr, tc.to)
		if !supplyClose(tc.got, want, tc.rel) {
			t.Errorf("1 %s = %v %s here, GNU units says %v", tc.expr, tc.got, tc.to, want)
		}
	}
}

// unitsValue asks GNU units for a conversion to 15 significant digits.
func unitsValue(t *testing.T, expr, to string) float64 {
	t.Helper()
	out, err := exec.Command("units", "-t", "-d", "15", expr, to).CombinedOutput()
	if err != nil {
		t.Fatalf("GNU units %q → %q: %v: %s (install Debian package units)", expr, to, err, out)
	}
	v, err := strconv.ParseFloat(strings.TrimSpace(string(out)), 64)
	if err != nil {
		t.Fatalf("GNU units %q → %q printed %q", expr, to, out)
	}
	return v
}

// The 1976 standard atmosphere's constants, as the standard states them
// (U.S. Standard Atmosphere 1976, NOAA-S/T 76-1562; REFERENCES §1): R* is
// the 1976 value 8.31432, not CODATA's 8.314462618.
func TestStandardAtmosphere1976Constants(t *testing.T) {
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"P0 Pa", stdP0, 101325}, {"T0 K", stdT0, 288.15}, {"L K/m", stdL, 0.0065},
		{"g0 m/s²", stdG0, 9.80665}, {"M0 kg/mol", stdM0, 0.0289644}, {"R* J/(mol·K)", stdR, 8.31432},
		{"H11 m", stdH11, 11000}, {"T11 K", stdT11, 216.65},
	} {
		if c.got != c.want {
			t.Errorf("%s = %v, want %v", c.name, c.got, c.want)
		}
	}
	// Exponent g0·M0/(R*·L) = 5.255876 (REFERENCES §1, 7 figures) [calc].
	if math.Abs(stdExpo-5.255876) > 5e-7 {
		t.Errorf("exponent = %.9f, want 5.255876", stdExpo)
	}
}

// The isothermal layer, 11–20 km, which GNU units' stdatmPH does not cover:
// P = P11·exp(−g0·M0·(H − 11 000)/(R*·T11)) [calc, REFERENCES §1 formula in
// double precision outside the project]: 15 000 m → 12 044.57 Pa; U.S.
// Standard Atmosphere 1976 Table I lists 1.2045E+04 Pa there [memory].
func TestIsothermalLayer(t *testing.T) {
	p, err := PressureAtAltitude(Metres(15000))
	if err != nil || !gasClose(float64(p), 12044.57, 1e-6) {
		t.Errorf("P(15 000 m) = %v Pa, %v; want 12 044.57 [calc]", float64(p), err)
	}
	if !gasClose(float64(p), 12045, tolPub) {
		t.Errorf("P(15 000 m) = %v Pa; Table I 12 045 Pa [memory]", float64(p))
	}
	h, err := AltitudeAtPressure(Pascals(12044.57))
	if err != nil || math.Abs(float64(h)-15000) > 0.01 {
		t.Errorf("H(12 044.57 Pa) = %v m, %v; want 15 000 m", float64(h), err)
	}
}
