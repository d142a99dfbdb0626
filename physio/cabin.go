package physio

import "strconv"

// CabinAltitudeLimit is the highest cabin altitude of normal operation for
// transport-category aircraft, 8 000 ft (14 CFR 25.841(a)).
var CabinAltitudeLimit = Feet(8000)

// MaxPressureDifferential is the largest cabin pressure differential
// accepted, 15 psi: above any aircraft's structural limit (business jets
// reach about 10.7 psi), so a larger value is a typing error.
var MaxPressureDifferential = Psi(15)

func checkDifferential(dp Pressure) error {
	return checkRange("pressure differential", dp.Psi(), 0, MaxPressureDifferential.Psi(), "psi")
}

// CabinAltitude returns the cabin altitude, in metres (geopotential), of an
// aircraft cruising at cruise with its cabin held at most maxDifferential
// above ambient pressure.
//
// Equation (pressure balance on the standard atmosphere):
//
//	P_cabin = P(cruise) + ΔP;  cabin = H(P_cabin), but not below floor
//
// where P and H are PressureAtAltitude and AltitudeAtPressure. maxDifferential
// gives the lowest cabin the aircraft can hold; a cabin altitude the crew
// states overrides this estimate (the caller decides that).
//
// Valid range: cruise and floor MinModelAltitude to MaxModelAltitude;
// maxDifferential 0 to MaxPressureDifferential (15 psi); otherwise a
// *RangeError (altitudes in m, differential in psi).
//
// Special cases:
//   - maxDifferential 0 is an unpressurised cabin: the cabin is at cruise
//     and floor is ignored.
//   - floor is the altitude the pressurisation holds the cabin at (usually
//     the departure or destination field): the cabin is never below it.
//   - A cabin is never above the aircraft: if cruise is below floor, the
//     cabin is at cruise (its pressure cannot drop below ambient).
//
// Unrounded. Shown to a person, round up (RoundUp): a higher cabin is the
// cautious reading.
func CabinAltitude(cruise Altitude, maxDifferential Pressure, floor Altitude) (Altitude, error) {
	lo, hi := float64(MinModelAltitude), float64(MaxModelAltitude)
	if err := checkRange("cruise altitude", float64(cruise), lo, hi, "m"); err != nil {
		return 0, err
	}
	if err := checkDifferential(maxDifferential); err != nil {
		return 0, err
	}
	if err := checkRange("cabin floor altitude", float64(floor), lo, hi, "m"); err != nil {
		return 0, err
	}
	if maxDifferential == 0 {
		return cruise, nil
	}
	if cruise <= floor {
		return cruise, nil
	}
	cabinPressure := pressureAt(float64(cruise)) + float64(maxDifferential)
	if cabinPressure >= pressureAt(float64(floor)) {
		return floor, nil
	}
	return Altitude(altitudeAt(cabinPressure)), nil
}

// maxCruiseCeilingQuantity names the quantity of MaxCruiseAltitude's
// error at the model ceiling. Made once: a plan for an aircraft that can
// hold the cabin up to the ceiling meets it on every computation.
var maxCruiseCeilingQuantity = "ambient pressure at the highest cruise altitude (model ceiling " +
	strconv.FormatFloat(float64(MaxModelAltitude), 'g', -1, 64) + " m)"

// MaxCruiseAltitude returns the highest cruise altitude, in metres
// (geopotential), at which an aircraft holding at most maxDifferential keeps
// its cabin at or below cabinLimit.
//
// Equation (the inverse of CabinAltitude):
//
//	H_cruise = H(P(cabinLimit) − ΔP)
//
// Valid range: cabinLimit MinModelAltitude to MaxModelAltitude (m);
// maxDifferential 0 to 15 psi; otherwise a *RangeError.
//
// Special cases:
//   - maxDifferential 0: the cruise limit is cabinLimit itself.
//   - If the differential holds cabinLimit even above the model's ceiling
//     (P(cabinLimit) − ΔP below the pressure at 20 000 m, or not positive),
//     the result is MaxModelAltitude together with a *RangeError naming that
//     ambient pressure: the aircraft is limited by something else.
//
// Unrounded. Shown to a person, round down (RoundDown): a lower cruise
// altitude is the cautious reading.
func MaxCruiseAltitude(cabinLimit Altitude, maxDifferential Pressure) (Altitude, error) {
	if err := checkRange("cabin altitude limit", float64(cabinLimit), float64(MinModelAltitude), float64(MaxModelAltitude), "m"); err != nil {
		return 0, err
	}
	if err := checkDifferential(maxDifferential); err != nil {
		return 0, err
	}
	ambient := pressureAt(float64(cabinLimit)) - float64(maxDifferential)
	if ambient < pressureAtMaxAltitude {
		return MaxModelAltitude, &RangeError{
			Quantity: maxCruiseCeilingQuantity,
			Value:    ambient, Min: pressureAtMaxAltitude, Max: pressureAtMinAltitude, Unit: "Pa"}
	}
	return Altitude(altitudeAt(ambient)), nil
}
