package physio

import "fmt"

// Accepted ranges of the arterial formulas.
const (
	minAge, maxAge   = 0.0, 120.0 // years
	minFEV1, maxFEV1 = 0.0, 150.0 // % of predicted
)

func checkPartial(name string, p Pressure) error {
	return checkRange(name, p.MmHg(), 0, maxPartialMmHg, "mmHg")
}

// AARatio returns the arterial/alveolar oxygen tension ratio (a/A ratio),
// a dimensionless number 0–1.
//
// Equation: a/A = PaO2/PAO2.
//
// Valid range: pao2 0–3 000 mmHg; pAO2 1–3 000 mmHg (it divides);
// otherwise a *RangeError in mmHg.
//
// Special cases: a ratio above 1 (arterial above alveolar tension, which
// the physiology does not allow: a measurement or input error) is returned
// as computed with an *ImpossibleError.
//
// Unrounded. Shown to a person, round down (RoundDown): a lower ratio
// predicts a lower PaO2 at altitude.
func AARatio(pao2, pAO2 Pressure) (float64, error) {
	if err := checkPartial("PaO2", pao2); err != nil {
		return 0, err
	}
	if err := checkRange("PAO2", pAO2.MmHg(), 1, maxPartialMmHg, "mmHg"); err != nil {
		return 0, err
	}
	ratio := float64(pao2) / float64(pAO2)
	if ratio > 1 {
		return ratio, &ImpossibleError{What: "a/A ratio",
			Reason: fmt.Sprintf("PaO2 %.1f mmHg is above PAO2 %.1f mmHg", pao2.MmHg(), pAO2.MmHg())}
	}
	return ratio, nil
}

// PaO2ByAARatio returns the expected arterial oxygen tension, in pascals,
// at a new alveolar tension pAO2, assuming the a/A ratio measured on the
// ground holds.
//
// Equation (constant a/A ratio method, common practice in aeromedical
// planning; see REFERENCES §4):
//
//	PaO2 = (a/A ratio)·PAO2
//
// Valid range: ratio 0–1 (from AARatio); pAO2 0–3 000 mmHg; otherwise a
// *RangeError.
//
// Unrounded. Shown to a person, round down (RoundDown).
func PaO2ByAARatio(ratio float64, pAO2 Pressure) (Pressure, error) {
	if err := checkRange("a/A ratio", ratio, 0, 1, ""); err != nil {
		return 0, err
	}
	if err := checkPartial("PAO2", pAO2); err != nil {
		return 0, err
	}
	return Pressure(ratio * float64(pAO2)), nil
}

// AaGradient returns the alveolar–arterial oxygen gradient, in pascals.
//
// Equation: A–a gradient = PAO2 − PaO2.
//
// Valid range: pAO2 and pao2 0–3 000 mmHg; otherwise a *RangeError.
//
// Special cases: a negative gradient (PaO2 above PAO2, an input error) is
// returned as computed with an *ImpossibleError.
//
// Unrounded. Shown to a person, round up (RoundUp): a wider gradient is the
// cautious reading.
func AaGradient(pAO2, pao2 Pressure) (Pressure, error) {
	if err := checkPartial("PAO2", pAO2); err != nil {
		return 0, err
	}
	if err := checkPartial("PaO2", pao2); err != nil {
		return 0, err
	}
	g := pAO2 - pao2
	if g < 0 {
		return g, &ImpossibleError{What: "A-a gradient",
			Reason: fmt.Sprintf("PaO2 %.1f mmHg is above PAO2 %.1f mmHg", pao2.MmHg(), pAO2.MmHg())}
	}
	return g, nil
}

// ExpectedAaGradient returns the upper normal A–a gradient, in pascals, for
// a person breathing air at sea level, by age.
//
// Equation (common practice, a rule of thumb; no single source):
//
//	A–a gradient ≈ age/4 + 4 mmHg
//
// Valid range: ageYears 0–120; otherwise a *RangeError in years. The rule
// was drawn from adults breathing air; at high FiO2 the normal gradient is
// larger.
//
// Unrounded. Shown as a limit of normal, round up (RoundUp).
func ExpectedAaGradient(ageYears float64) (Pressure, error) {
	if err := checkRange("age", ageYears, minAge, maxAge, "years"); err != nil {
		return 0, err
	}
	return MmHg(ageYears/4 + 4), nil
}

// DillardPaO2 returns the predicted arterial oxygen tension, in pascals, at
// 8 000 ft (2 438 m) cabin altitude breathing air, for a patient with
// severe COPD.
//
// Equation (Dillard TA, Berg BW, Rajagopal KR, Dooley JW, Mehm WJ, Ann
// Intern Med 1989;111:362–7), PaO2 in mmHg:
//
//	PaO2(8 000 ft) = 0.453·PaO2(ground) + 0.386·FEV1 %pred + 2.44
//
// Valid range: pao2Ground 30–150 mmHg; fev1PercentPredicted 0–150 %;
// otherwise a *RangeError. The regression was drawn from patients with
// severe COPD at 8 000 ft: for other patients or cabin altitudes it is an
// extrapolation, and the constant a/A ratio method or a hypoxic challenge
// test applies.
//
// Unrounded. Shown to a person, round down (RoundDown).
func DillardPaO2(pao2Ground Pressure, fev1PercentPredicted float64) (Pressure, error) {
	if err := checkRange("PaO2 on the ground", pao2Ground.MmHg(), 30, 150, "mmHg"); err != nil {
		return 0, err
	}
	if err := checkRange("FEV1", fev1PercentPredicted, minFEV1, maxFEV1, "% predicted"); err != nil {
		return 0, err
	}
	return MmHg(0.453*pao2Ground.MmHg() + 0.386*fev1PercentPredicted + 2.44), nil
}
