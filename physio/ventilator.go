package physio

// Drive is how a ventilator makes its gas mix.
type Drive string

// Ventilator drives.
const (
	// DriveBlending: the ventilator blends or entrains air (a turbine or a
	// blender), so only the oxygen share of its gas comes from the supply.
	DriveBlending Drive = "blending"
	// DriveOxygen: the ventilator is driven by oxygen, so all delivered gas
	// at the set FiO2 and the drive gas are counted as oxygen.
	DriveOxygen Drive = "oxygen"
)

// Plausible ranges for ventilator inputs, L/min.
const (
	ventilatorMinMinuteVolume = 0.1 // neonates
	ventilatorMaxMinuteVolume = 60.0
	ventilatorMaxBias         = 30.0
	ventilatorMaxLeak         = 60.0
	ventilatorMaxDriveGas     = 60.0
)

// VentilatorOxygen returns the oxygen a ventilator draws from the supply in
// L/min:
//
//	blending/entraining:  (V̇E + bias + leak) · (FiO2 − 0.21) / 0.79 + drive gas
//	oxygen-driven:        (V̇E + bias + leak) · FiO2 + drive gas
//
// Method: common practice (mass balance of oxygen). The published
// oxygen-driven form is V̇E · FiO2 + drive gas; bias and leak are added to it
// here because they leave the circuit as gas at the set FiO2 and leaving
// out a flow the crew stated would understate use (with bias and leak 0 it
// is the published form). The ventilator's own consumption figure wins
// over this estimate: use it when the manufacturer gives one.
//
// minuteVolume 0.1–60 L/min; bias 0–30; leak 0–60; driveGas 0–60 L/min
// (the gas a pneumatic ventilator consumes to run, 0 for electric ones);
// fio2 0.21–1.0. Outside: a *RangeError; an unknown drive: a *ParseError.
// Unrounded: oxygen used, round UP.
func VentilatorOxygen(drive Drive, minuteVolume, bias, leak, driveGas Flow, fio2 Fraction) (Flow, error) {
	if drive != DriveBlending && drive != DriveOxygen {
		return 0, &ParseError{Quantity: "ventilator drive", Input: string(drive), Want: "blending, oxygen", Err: ErrSyntax}
	}
	checks := []struct {
		quantity string
		value    float64
		min, max float64
	}{
		{"minute volume", minuteVolume.LitresPerMinute(), ventilatorMinMinuteVolume, ventilatorMaxMinuteVolume},
		{"bias flow", bias.LitresPerMinute(), 0, ventilatorMaxBias},
		{"leak", leak.LitresPerMinute(), 0, ventilatorMaxLeak},
		{"drive gas", driveGas.LitresPerMinute(), 0, ventilatorMaxDriveGas},
	}
	for _, c := range checks {
		if err := checkRange(c.quantity, c.value, c.min, c.max, "L/min"); err != nil {
			return 0, err
		}
	}
	if err := checkRange("FiO2", float64(fio2), deviceAirO2, 1, ""); err != nil {
		return 0, err
	}
	delivered := minuteVolume.LitresPerMinute() + bias.LitresPerMinute() + leak.LitresPerMinute()
	var share float64
	if drive == DriveBlending {
		share = deviceOxygenShare(fio2)
	} else {
		share = float64(fio2)
	}
	return Flow(delivered*share + driveGas.LitresPerMinute()), nil
}
