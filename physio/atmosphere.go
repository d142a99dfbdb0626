package physio

import "math"

// Constants of the U.S. Standard Atmosphere, 1976 (NOAA-S/T 76-1562,
// NASA-TM-X-74335), identical to the ICAO standard atmosphere (Doc 7488/3)
// up to 32 km. R* is the 1976 value, not the later CODATA one: the model's
// tables are defined with it. They are kept here rather than in
// constants.go because they belong to this one model.
const (
	stdP0   = 101325.0                        // Pa, sea-level pressure
	stdT0   = 288.15                          // K, sea-level temperature
	stdL    = 0.0065                          // K/m, troposphere lapse rate
	stdG0   = 9.80665                         // m/s², standard gravity
	stdM0   = 0.0289644                       // kg/mol, mean molar mass of air
	stdR    = 8.31432                         // J/(mol·K), gas constant as used in 1976
	stdH11  = 11000.0                         // m, tropopause (geopotential)
	stdT11  = 216.65                          // K, temperature of the 11–20 km layer
	stdExpo = stdG0 * stdM0 / (stdR * stdL)   // 5.255876…
	stdK11  = stdG0 * stdM0 / (stdR * stdT11) // 1/m, isothermal decay rate
)

// stdP11 is the pressure at the tropopause from the troposphere formula
// (22 632.06 Pa), so the two layers join without a step.
var stdP11 = stdP0 * math.Pow(1-stdL*stdH11/stdT0, stdExpo)

// The standard-atmosphere model's domain, geopotential altitude.
//
// The issue asks for 0–20 km; the bottom is widened to −610 m (−2 000 ft)
// because airfields below sea level exist (the Dead Sea region, Death
// Valley, parts of the Netherlands), and the 1976 troposphere formula holds
// there unchanged (the standard defines it from −5 km). 20 km is the top of
// the isothermal layer; above it the 1976 model has a new lapse rate that
// Alvea does not implement.
const (
	MinModelAltitude Altitude = -610
	MaxModelAltitude Altitude = 20000
)

// SeaLevelPressure is the standard atmosphere's pressure at 0 m, 101 325 Pa
// (760 mmHg).
var SeaLevelPressure = Pascals(stdP0)

// model pressures at the domain's ends, the inverse's domain.
var (
	pressureAtMinAltitude = pressureAt(float64(MinModelAltitude)) // ≈ 108 871 Pa
	pressureAtMaxAltitude = pressureAt(float64(MaxModelAltitude)) // ≈ 5 474.9 Pa
)

func pressureAt(h float64) float64 {
	if h <= stdH11 {
		return stdP0 * math.Pow(1-stdL*h/stdT0, stdExpo)
	}
	return stdP11 * math.Exp(-stdK11*(h-stdH11))
}

// PressureAtAltitude returns the standard-atmosphere static pressure, in
// pascals, at geopotential altitude h.
//
// Equations (U.S. Standard Atmosphere 1976, geopotential form):
//
//	troposphere, H ≤ 11 000 m:   P = P0·(1 − L·H/T0)^(g0·M0/(R*·L))
//	11 000 m < H ≤ 20 000 m:     P = P11·exp(−g0·M0·(H − 11 000)/(R*·T11))
//
// with P0 101 325 Pa, T0 288.15 K, L 0.0065 K/m, g0 9.80665 m/s²,
// M0 0.0289644 kg/mol, R* 8.31432 J/(mol·K), T11 216.65 K and P11 the
// troposphere value at 11 000 m (22 632.06 Pa).
//
// Valid range: MinModelAltitude (−610 m) to MaxModelAltitude (20 000 m);
// outside it, or NaN, a *RangeError in m. The model is a standard day:
// real pressure at a place differs with the weather by several percent.
//
// Unrounded. Shown as an ambient pressure it has no unsafe side
// (RoundNearest); where it feeds a decision, round the altitude instead.
func PressureAtAltitude(h Altitude) (Pressure, error) {
	if err := checkRange("altitude", float64(h), float64(MinModelAltitude), float64(MaxModelAltitude), "m"); err != nil {
		return 0, err
	}
	return Pressure(pressureAt(float64(h))), nil
}

// AltitudeAtPressure returns the geopotential altitude, in metres, at which
// the standard atmosphere has static pressure p: the exact inverse of
// PressureAtAltitude.
//
// Equations (U.S. Standard Atmosphere 1976, solved for H):
//
//	P ≥ P11:  H = (T0/L)·(1 − (P/P0)^(R*·L/(g0·M0)))
//	P < P11:  H = 11 000 + (R*·T11/(g0·M0))·ln(P11/P)
//
// Valid range: the pressures of the model's domain, about 5 474.9 Pa
// (20 000 m) to 108 871 Pa (−610 m); outside it a *RangeError in Pa.
// A result that floating-point error puts a hair outside the domain is
// returned as the domain's end.
//
// Unrounded. As a cabin altitude, round up (RoundUp): a higher cabin is the
// cautious reading.
func AltitudeAtPressure(p Pressure) (Altitude, error) {
	if err := checkRange("pressure", float64(p), pressureAtMaxAltitude, pressureAtMinAltitude, "Pa"); err != nil {
		return 0, err
	}
	return Altitude(altitudeAt(float64(p))), nil
}

// altitudeAt inverts pressureAt for p inside the model's pressure range.
func altitudeAt(p float64) float64 {
	var h float64
	if p >= stdP11 {
		h = stdT0 / stdL * (1 - math.Pow(p/stdP0, 1/stdExpo))
	} else {
		h = stdH11 + math.Log(stdP11/p)/stdK11
	}
	return math.Max(float64(MinModelAltitude), math.Min(float64(MaxModelAltitude), h))
}
