package physio

import "fmt"

// minFiO2Max is the smallest "highest available FiO2" MaxAltitudeForFiO2
// accepts: a divisor, so zero is refused; 0.01 is below any real gas supply.
const minFiO2Max = 0.01

func checkInspiredPressures(pbFrom, ph2o Pressure) error {
	if err := checkRange("water vapour pressure", ph2o.MmHg(), 0, maxWaterVapourMmHg, "mmHg"); err != nil {
		return err
	}
	return checkRange("barometric pressure (from)", pbFrom.MmHg(), ph2o.MmHg(), maxBarometricMmHg, "mmHg")
}

// FiO2ToMatch returns the inspired oxygen fraction that gives, at barometric
// pressure pbTo, the same inspired (humidified) oxygen tension that fio2From
// gives at pbFrom.
//
// Equation (constant inspired PO2; common practice in aeromedical transport):
//
//	FiO2_to = FiO2_from·(PB_from − PH2O)/(PB_to − PH2O)
//
// Valid range: fio2From 0–1; ph2o 0–100 mmHg; pbFrom ph2o–4 560 mmHg;
// pbTo 0–4 560 mmHg; otherwise a *RangeError (pressures in mmHg).
//
// Special cases:
//   - A result above 1.0 is returned as computed together with an
//     *ImpossibleError: the ground state cannot be matched at pbTo.
//     MaxAltitudeForFiO2 gives the highest altitude at which it can.
//   - pbTo at or below ph2o (inspired gas all water vapour) returns 0 and an
//     *ImpossibleError.
//
// Unrounded. Shown to a person, round up (RoundUp): FiO2 needed.
func FiO2ToMatch(fio2From Fraction, pbFrom, pbTo, ph2o Pressure) (Fraction, error) {
	if err := checkRange("FiO2 (from)", float64(fio2From), 0, 1, ""); err != nil {
		return 0, err
	}
	if err := checkInspiredPressures(pbFrom, ph2o); err != nil {
		return 0, err
	}
	if err := checkRange("barometric pressure (to)", pbTo.MmHg(), 0, maxBarometricMmHg, "mmHg"); err != nil {
		return 0, err
	}
	if pbTo <= ph2o {
		return 0, &ImpossibleError{What: "FiO2 needed",
			Reason: fmt.Sprintf("barometric pressure %.1f mmHg is not above water vapour pressure %.1f mmHg", pbTo.MmHg(), ph2o.MmHg())}
	}
	need := Fraction(float64(fio2From) * float64(pbFrom-ph2o) / float64(pbTo-ph2o))
	if need > 1 {
		return need, &ImpossibleError{What: "FiO2 needed",
			Reason: fmt.Sprintf("%.3f is above 1.0", float64(need))}
	}
	return need, nil
}

// MaxAltitudeForFiO2 returns the highest standard-atmosphere altitude, in
// metres (geopotential), at which an FiO2 of fio2Max still gives the inspired
// oxygen tension that fio2From gives at pbFrom.
//
// Equation (FiO2ToMatch solved for the pressure, then AltitudeAtPressure):
//
//	PB = PH2O + FiO2_from·(PB_from − PH2O)/FiO2_max;  H = H(PB)
//
// Valid range: fio2From 0–1; fio2Max 0.01–1; ph2o 0–100 mmHg; pbFrom
// ph2o–4 560 mmHg; otherwise a *RangeError.
//
// Special cases:
//   - If PB lies below the pressure at MaxModelAltitude, fio2Max matches
//     even above the model's ceiling: the result is MaxModelAltitude with a
//     *RangeError naming that pressure.
//   - If PB lies above the pressure at MinModelAltitude, fio2Max cannot
//     match anywhere in the model: the result is MinModelAltitude with an
//     *ImpossibleError.
//
// Unrounded. Shown to a person, round down (RoundDown): a lower altitude
// limit is the cautious reading.
func MaxAltitudeForFiO2(fio2From Fraction, pbFrom Pressure, fio2Max Fraction, ph2o Pressure) (Altitude, error) {
	if err := checkRange("FiO2 (from)", float64(fio2From), 0, 1, ""); err != nil {
		return 0, err
	}
	if err := checkRange("highest FiO2 available", float64(fio2Max), minFiO2Max, 1, ""); err != nil {
		return 0, err
	}
	if err := checkInspiredPressures(pbFrom, ph2o); err != nil {
		return 0, err
	}
	pb := float64(ph2o) + float64(fio2From)*float64(pbFrom-ph2o)/float64(fio2Max)
	switch {
	case pb < pressureAtMaxAltitude:
		return MaxModelAltitude, &RangeError{
			Quantity: fmt.Sprintf("barometric pressure at the highest altitude (model ceiling %g m)", float64(MaxModelAltitude)),
			Value:    pb, Min: pressureAtMaxAltitude, Max: pressureAtMinAltitude, Unit: "Pa"}
	case pb > pressureAtMinAltitude:
		return MinModelAltitude, &ImpossibleError{What: "altitude for this FiO2",
			Reason: fmt.Sprintf("FiO2 %.2f would need %.1f mmHg, more than the standard atmosphere at %g m", float64(fio2Max), pb/pascalsPerMmHg, float64(MinModelAltitude))}
	}
	return Altitude(altitudeAt(pb)), nil
}
