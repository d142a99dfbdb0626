package physio

import (
	"fmt"
	"math"
)

// DefaultRQ is the respiratory quotient (CO2 produced / O2 consumed) used
// when none is known: 0.8, common practice for a mixed diet at rest.
const DefaultRQ = 0.8

// ConventionalWaterVapourPressure is the 47 mmHg clinicians use for the
// water vapour of inspired gas at 37 °C (common practice). The saturation
// equation in WaterVapourPressure gives 47.12 mmHg there; see its comment.
var ConventionalWaterVapourPressure = MmHg(47)

// Accepted ranges shared by the gas formulas. Partial pressures are checked
// in mmHg, the unit clinicians know them by.
const (
	// maxPartialMmHg: above any PAO2 or PaO2 even in a hyperbaric chamber
	// breathing oxygen at 3 atm (about 2 200 mmHg).
	maxPartialMmHg = 3000.0
	// maxBarometricMmHg: 6 atm, the deepest hyperbaric treatment pressure.
	maxBarometricMmHg = 4560.0
	// maxWaterVapourMmHg: saturation pressure at 45 °C is 71.9 mmHg.
	maxWaterVapourMmHg = 100.0
	// maxPaCO2MmHg: above any survivable hypercapnia.
	maxPaCO2MmHg = 200.0
	// RQ range: 0.6 (fat and ketone oxidation, below 0.7 is already rare)
	// to 1.3 (net lipogenesis in overfeeding).
	minRQ, maxRQ = 0.6, 1.3
	// Body temperature range of WaterVapourPressure.
	minBodyCelsius, maxBodyCelsius = 25.0, 45.0
)

// Saturation vapour pressure of water, Wagner W, Pruß A, J Phys Chem Ref
// Data 1993;22:783–787, eq. 2.5 (the IAPWS 1992 supplementary release on
// saturation properties, consistent with IAPWS-95).
const (
	waterTc = 647.096  // K, critical temperature
	waterPc = 22.064e6 // Pa, critical pressure
)

var waterA = [6]float64{-7.85951783, 1.84408259, -11.7866497, 22.6807411, -15.9618719, 1.80122502}

// waterSaturationPressure is the Wagner–Pruß equation, valid from the
// triple point (273.16 K) to the critical point.
func waterSaturationPressure(t float64) float64 {
	tau := 1 - t/waterTc
	sum := waterA[0]*tau + waterA[1]*math.Pow(tau, 1.5) + waterA[2]*math.Pow(tau, 3) +
		waterA[3]*math.Pow(tau, 3.5) + waterA[4]*math.Pow(tau, 4) + waterA[5]*math.Pow(tau, 7.5)
	return waterPc * math.Exp(waterTc/t*sum)
}

// WaterVapourPressure returns the pressure, in pascals, of water vapour
// saturating inspired gas at body temperature body.
//
// Equation (Wagner W, Pruß A, J Phys Chem Ref Data 1993;22:783, the IAPWS
// saturation-pressure equation), with τ = 1 − T/Tc:
//
//	ln(P/Pc) = (Tc/T)·(a1·τ + a2·τ^1.5 + a3·τ^3 + a4·τ^3.5 + a5·τ^4 + a6·τ^7.5)
//
// Tc 647.096 K, Pc 22.064 MPa, a1…a6 −7.85951783, 1.84408259, −11.7866497,
// 22.6807411, −15.9618719, 1.80122502.
//
// At 37 °C it gives 6 282.4 Pa = 47.12 mmHg, not the conventional 47 mmHg
// of the alveolar gas equation (a rounded figure, 0.26 % lower). Callers who
// want the conventional figure use ConventionalWaterVapourPressure.
//
// Valid range: body temperature 25–45 °C; otherwise a *RangeError in °C.
//
// Unrounded. A higher PH2O lowers the computed PAO2 and raises the FiO2
// needed, so where it is shown, round up (RoundUp).
func WaterVapourPressure(body Temperature) (Pressure, error) {
	if err := checkRange("body temperature", body.Celsius(), minBodyCelsius, maxBodyCelsius, "°C"); err != nil {
		return 0, err
	}
	return Pressure(waterSaturationPressure(body.Kelvin())), nil
}

// checkAlveolarInputs validates the shared inputs of the alveolar gas
// equations.
func checkAlveolarInputs(fio2 Fraction, pb, ph2o, paco2 Pressure, rq float64) error {
	if err := checkRange("FiO2", float64(fio2), 0, 1, ""); err != nil {
		return err
	}
	if err := checkRange("barometric pressure", pb.MmHg(), 0, maxBarometricMmHg, "mmHg"); err != nil {
		return err
	}
	if err := checkRange("water vapour pressure", ph2o.MmHg(), 0, maxWaterVapourMmHg, "mmHg"); err != nil {
		return err
	}
	if err := checkRange("PaCO2", paco2.MmHg(), 0, maxPaCO2MmHg, "mmHg"); err != nil {
		return err
	}
	return checkRange("respiratory quotient", rq, minRQ, maxRQ, "")
}

func negativeAlveolar(pao2 float64) error {
	return &ImpossibleError{What: "alveolar PO2",
		Reason: fmt.Sprintf("%.1f mmHg is below zero: no oxygen reaches the alveoli at this FiO2 and pressure", pao2/pascalsPerMmHg)}
}

// AlveolarPO2 returns the alveolar oxygen partial pressure PAO2, in pascals,
// by the simplified alveolar gas equation.
//
// Equation (alveolar gas equation, simplified form; as given in Egan's
// Fundamentals of Respiratory Care):
//
//	PAO2 = FiO2·(PB − PH2O) − PaCO2/R
//
// pb is the barometric (cabin) pressure, ph2o the water vapour pressure
// (WaterVapourPressure, or 47 mmHg by convention), paco2 the arterial CO2
// tension, rq the respiratory quotient (DefaultRQ, 0.8).
//
// Valid range: fio2 0–1; pb 0–4 560 mmHg; ph2o 0–100 mmHg; paco2
// 0–200 mmHg; rq 0.6–1.3; otherwise a *RangeError (pressures in mmHg).
//
// Special cases: a result below zero returns 0 and an *ImpossibleError (no
// oxygen reaches the alveoli). The simplified form neglects the small
// inspired-expired volume difference; AlveolarPO2Full includes it. The two
// agree when R is 1; with R 0.8 and PaCO2 40 mmHg the simplified form is
// about 2 mmHg lower on air and 10 mmHg lower on oxygen (the cautious side).
//
// Unrounded. Shown to a person, round down (RoundDown): a lower PAO2 is the
// cautious reading.
func AlveolarPO2(fio2 Fraction, pb, ph2o, paco2 Pressure, rq float64) (Pressure, error) {
	if err := checkAlveolarInputs(fio2, pb, ph2o, paco2, rq); err != nil {
		return 0, err
	}
	pao2 := float64(fio2)*float64(pb-ph2o) - float64(paco2)/rq
	if pao2 < 0 {
		return 0, negativeAlveolar(pao2)
	}
	return Pressure(pao2), nil
}

// AlveolarPO2Full returns the alveolar oxygen partial pressure PAO2, in
// pascals, by the full alveolar gas equation, which corrects for the
// difference between inspired and expired volumes when R ≠ 1.
//
// Equation (Fenn WO, Rahn H, Otis AB, Am J Physiol 1946;146:637; the
// "full" form as given in Egan's Fundamentals of Respiratory Care):
//
//	PAO2 = FiO2·(PB − PH2O) − PaCO2·(1 − FiO2·(1 − R))/R
//
// Valid range and special cases: as AlveolarPO2. At FiO2 1.0 it reduces to
// PB − PH2O − PaCO2.
//
// Unrounded. Shown to a person, round down (RoundDown).
func AlveolarPO2Full(fio2 Fraction, pb, ph2o, paco2 Pressure, rq float64) (Pressure, error) {
	if err := checkAlveolarInputs(fio2, pb, ph2o, paco2, rq); err != nil {
		return 0, err
	}
	f := float64(fio2)
	pao2 := f*float64(pb-ph2o) - float64(paco2)*(1-f*(1-rq))/rq
	if pao2 < 0 {
		return 0, negativeAlveolar(pao2)
	}
	return Pressure(pao2), nil
}
