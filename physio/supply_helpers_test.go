package physio

import (
	"errors"
	"math"
	"os/exec"
	"strconv"
	"strings"
	"testing"
)

// Helpers for the supply tests (cylinders, devices, ventilators, reserves,
// trapped gas). Prefixed "supply" so they never collide with other test
// files of the package.

// supplyUnits evaluates expr with GNU units (Debian package "units", an
// external oracle installed by the Makefile) and returns it in unit. A
// missing tool fails the test: it never skips.
func supplyUnits(t *testing.T, expr, unit string) float64 {
	t.Helper()
	out, err := exec.Command("units", "-t", expr, unit).CombinedOutput()
	if err != nil {
		t.Fatalf("GNU units %q → %q: %v: %s (install Debian package units)", expr, unit, err, out)
	}
	v, err := strconv.ParseFloat(strings.TrimSpace(string(out)), 64)
	if err != nil {
		t.Fatalf("GNU units %q → %q printed %q", expr, unit, out)
	}
	return v
}

// supplyClose reports whether got is within a relative tolerance of want
// (absolute when want is 0).
func supplyClose(got, want, rel float64) bool {
	if math.IsNaN(got) || math.IsInf(got, 0) {
		return false
	}
	if want == 0 {
		return math.Abs(got) <= rel
	}
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// supplyWantRange checks that err is a *RangeError for quantity (a
// substring) carrying a unit and a non-empty range, unwrapping to
// ErrOutOfRange.
func supplyWantRange(t *testing.T, err error, quantity, unit string) {
	t.Helper()
	var re *RangeError
	if !errors.As(err, &re) {
		t.Fatalf("error %v (%T), want *RangeError for %q", err, err, quantity)
	}
	if !errors.Is(err, ErrOutOfRange) {
		t.Errorf("error %v does not unwrap to ErrOutOfRange", err)
	}
	if !strings.Contains(re.Quantity, quantity) {
		t.Errorf("RangeError quantity %q, want it to name %q", re.Quantity, quantity)
	}
	if re.Unit != unit {
		t.Errorf("RangeError unit %q, want %q (%v)", re.Unit, unit, err)
	}
	if !(re.Min < re.Max) {
		t.Errorf("RangeError range %v–%v is empty (%v)", re.Min, re.Max, err)
	}
	if !strings.Contains(err.Error(), quantity) {
		t.Errorf("message %q does not name %q", err.Error(), quantity)
	}
}

// supplyFinite fails unless every value is a finite number.
func supplyFinite(t *testing.T, what string, vs ...float64) {
	t.Helper()
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("%s returned %v", what, v)
		}
	}
}
