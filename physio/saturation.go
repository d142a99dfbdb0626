package physio

import "math"

// Severinghaus JW, J Appl Physiol 1979;46:599–602, eq. 1 constants (PO2 in
// mmHg).
const (
	sevA = 23400.0
	sevB = 150.0
)

// maxSaturation is Saturation at the largest accepted PO2 (3 000 mmHg), the
// top of PO2AtSaturation's domain.
var maxSaturation = severinghaus(maxPartialMmHg)

func severinghaus(p float64) float64 {
	if p == 0 {
		return 0
	}
	return 1 / (sevA/(p*p*p+sevB*p) + 1)
}

// Saturation returns the oxyhaemoglobin saturation, a fraction 0–1, at
// oxygen tension po2, on the standard dissociation curve (37 °C, pH 7.40,
// PCO2 40 mmHg, normal adult haemoglobin; P50 about 26.8 mmHg).
//
// Equation (Severinghaus JW, J Appl Physiol 1979;46:599–602, eq. 1), PO2
// in mmHg:
//
//	S = 1/(23 400/(PO2³ + 150·PO2) + 1)
//
// Valid range: po2 0–3 000 mmHg; otherwise a *RangeError in mmHg. The
// curve shifts with temperature, pH, PCO2 and 2,3-DPG; this is the
// standard curve only. Pulse oximeters read up to a few percent off it.
//
// Special cases: po2 0 gives 0.
//
// Unrounded. Shown to a person as an expected SpO2, round down (RoundDown).
func Saturation(po2 Pressure) (Fraction, error) {
	if err := checkPartial("PO2", po2); err != nil {
		return 0, err
	}
	return Fraction(severinghaus(po2.MmHg())), nil
}

// PO2AtSaturation returns the oxygen tension, in pascals, at which the
// standard dissociation curve reaches saturation s: the exact inverse of
// Saturation (Severinghaus 1979 eq. 2 is only an approximate inverse).
//
// Method: eq. 1 rearranged is the cubic PO2³ + 150·PO2 − K = 0 with
// K = 23 400·S/(1 − S), which has exactly one real root. It is taken from
// Cardano's formula in the cancellation-free form
//
//	A = ∛(K/2 + √(K²/4 + 125 000)),  B = 50/A,  PO2 = K/(A² + 50 + B²)
//
// (PO2 = A − B, rewritten since A³ − B³ = K), then polished with one Newton
// step.
//
// Valid range: s 0 to Saturation(3 000 mmHg) (0.99999913…); otherwise a
// *RangeError (s 1 would need an infinite PO2).
//
// Special cases: s 0 gives 0.
//
// Unrounded. Shown as the PO2 needed to reach a target saturation, round up
// (RoundUp).
func PO2AtSaturation(s Fraction) (Pressure, error) {
	if err := checkRange("saturation", float64(s), 0, maxSaturation, ""); err != nil {
		return 0, err
	}
	if s == 0 {
		return 0, nil
	}
	k := sevA * float64(s) / (1 - float64(s))
	a := math.Cbrt(k/2 + math.Sqrt(k*k/4+sevB*sevB*sevB/27))
	b := sevB / 3 / a
	p := k / (a*a + sevB/3 + b*b)
	p -= (p*p*p + sevB*p - k) / (3*p*p + sevB) // Newton step
	return MmHg(math.Min(p, maxPartialMmHg)), nil
}
