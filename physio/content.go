package physio

// DefaultHufner is the oxygen-binding capacity of haemoglobin used when none
// is chosen: 1.34 mL O2 per g Hb (common practice; 1.36 and 1.39, the
// theoretical maximum, are also used). Pass another value to
// OxygenContent to change it.
const DefaultHufner = 1.34

// OxygenSolubility is the solubility of oxygen in plasma at 37 °C, in mL O2
// per dL blood per mmHg (common practice).
const OxygenSolubility = 0.003

// Accepted ranges of the content formulas.
const (
	minHufner, maxHufner = 1.30, 1.40 // mL/g: the values in use span 1.306–1.39
	maxHbGPerDL          = 25.0       // g/dL, above any polycythaemia
	maxCardiacOutput     = 40.0       // L/min, above an elite athlete's peak
	maxContentMLPerDL    = 50.0       // mL/dL, above 25 g/dL·1.40 + 0.003·3 000
)

// OxygenContent returns the arterial oxygen content CaO2, in mL O2 per dL of
// blood.
//
// Equation (common practice):
//
//	CaO2 = Hüfner·Hb·SaO2 + 0.003·PaO2
//
// with Hb in g/dL, SaO2 as a fraction, PaO2 in mmHg and Hüfner in mL/g
// (DefaultHufner 1.34).
//
// Valid range: hbGPerDL 0–25 g/dL; sao2 0–1; pao2 0–3 000 mmHg; hufner
// 1.30–1.40 mL/g; otherwise a *RangeError. Hb given in g/L must be divided
// by 10 first.
//
// Unrounded. Shown to a person, round down (RoundDown): the oxygen carried.
func OxygenContent(hbGPerDL float64, sao2 Fraction, pao2 Pressure, hufner float64) (float64, error) {
	if err := checkRange("haemoglobin", hbGPerDL, 0, maxHbGPerDL, "g/dL"); err != nil {
		return 0, err
	}
	if err := checkRange("SaO2", float64(sao2), 0, 1, ""); err != nil {
		return 0, err
	}
	if err := checkPartial("PaO2", pao2); err != nil {
		return 0, err
	}
	if err := checkRange("Hüfner constant", hufner, minHufner, maxHufner, "mL/g"); err != nil {
		return 0, err
	}
	return hufner*hbGPerDL*float64(sao2) + OxygenSolubility*pao2.MmHg(), nil
}

// OxygenDelivery returns the systemic oxygen delivery DO2, in mL O2 per
// minute.
//
// Equation (common practice): DO2 = CO·CaO2·10, with CO in L/min and CaO2
// in mL/dL (10 dL per L).
//
// Valid range: cardiacOutput 0–40 L/min; contentMLPerDL 0–50 mL/dL;
// otherwise a *RangeError.
//
// Unrounded. Shown to a person, round down (RoundDown).
func OxygenDelivery(cardiacOutput Flow, contentMLPerDL float64) (float64, error) {
	if err := checkRange("cardiac output", float64(cardiacOutput), 0, maxCardiacOutput, "L/min"); err != nil {
		return 0, err
	}
	if err := checkRange("oxygen content", contentMLPerDL, 0, maxContentMLPerDL, "mL/dL"); err != nil {
		return 0, err
	}
	return float64(cardiacOutput) * contentMLPerDL * 10, nil
}
