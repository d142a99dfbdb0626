package physio

// TubeCuffPerfusionLimit is the tracheal tube cuff pressure above which
// tracheal mucosal perfusion is compromised, about 30 cmH2O (Mann C et al.,
// Emerg Med J 2007;24:165–7, citing the tracheal mucosal perfusion
// studies). Air-filled cuffs rise sharply on ascent: check and adjust cuff
// pressure with a manometer, or fill the cuff with saline, per local
// protocol.
const TubeCuffPerfusionLimit Pressure = 30 * pascalsPerCmH2O

// Valid absolute pressures for trapped-gas calculations: from high-altitude
// flight (about 5.5 kPa at 20 km) to hyperbaric treatment (6 atm ≈ 608 kPa).
const (
	boyleMinKPa       = 1.0
	boyleMaxKPa       = 1000.0
	boyleMaxVolumeL   = 100.0
	boyleMaxInsideKPa = 1000.0
)

func boyleCheck(quantity string, p Pressure) error {
	return checkRange(quantity, p.Kilopascals(), boyleMinKPa, boyleMaxKPa, "kPa")
}

// ExpansionRatio returns how much a free (compliant) pocket of trapped gas
// grows when the ambient pressure goes from `from` to `to`, by Boyle's law
// at constant temperature:
//
//	V2/V1 = P1/P2
//
// Both pressures absolute, 1–1 000 kPa; outside: a *RangeError. Example:
// sea level to an 8 000 ft cabin gives ×1.346. A ratio above 1 is
// expansion. Unrounded: round UP.
func ExpansionRatio(from, to Pressure) (float64, error) {
	if err := boyleCheck("starting pressure", from); err != nil {
		return 0, err
	}
	if err := boyleCheck("final pressure", to); err != nil {
		return 0, err
	}
	return float64(from) / float64(to), nil
}

// ExpandedVolume returns the volume v of trapped gas (0–100 L) takes after
// the ambient pressure goes from `from` to `to` (absolute, 1–1 000 kPa):
// V2 = V1 · P1/P2 (Boyle). Outside: a *RangeError. Unrounded: round UP.
func ExpandedVolume(v Volume, from, to Pressure) (Volume, error) {
	if err := checkRange("trapped gas volume", v.Litres(), 0, boyleMaxVolumeL, "L"); err != nil {
		return 0, err
	}
	ratio, err := ExpansionRatio(from, to)
	if err != nil {
		return 0, err
	}
	return Volume(float64(v) * ratio), nil
}

// RigidSpaceOverpressure returns the pressure above ambient inside a sealed
// space that cannot expand (a rigid container, or the upper bound for a
// cuff, balloon or splint that can stretch only a little), after the
// ambient pressure goes from `from` to `to`:
//
//	overpressure = (from + insideGauge) − to
//
// The gas keeps its absolute pressure (Boyle with V fixed), so the whole
// fall in ambient appears as overpressure. A compliant space rises less;
// this is the upper bound. Compare a tube cuff with TubeCuffPerfusionLimit.
//
// from, to absolute, 1–1 000 kPa; insideGauge is the gauge pressure inside
// at `from`, −from (a vacuum) to 1 000 kPa. Outside: a *RangeError.
// Unrounded: round UP. A negative result means the space is below ambient
// (after a descent).
func RigidSpaceOverpressure(insideGauge, from, to Pressure) (Pressure, error) {
	if err := boyleCheck("starting pressure", from); err != nil {
		return 0, err
	}
	if err := boyleCheck("final pressure", to); err != nil {
		return 0, err
	}
	if err := checkRange("pressure inside (gauge)", insideGauge.Kilopascals(), -from.Kilopascals(), boyleMaxInsideKPa, "kPa"); err != nil {
		return 0, err
	}
	return from + insideGauge - to, nil
}
