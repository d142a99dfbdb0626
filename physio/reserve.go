package physio

import "time"

// ReservePolicy is the margin a plan keeps on top of the calculated oxygen
// need. It is always explicit: the plan states the policy it used.
type ReservePolicy struct {
	Residual     Pressure      // safe residual left in each cylinder (gauge), 0–70 bar (1 015 psi)
	Factor       float64       // multiplier on the calculated need (1 = none), 1–3
	AddedMinutes time.Duration // extra time at the flow passed to Required, 0–240 min
}

// DefaultReservePolicy keeps 200 psi in each cylinder and carries 1.5 times
// the calculated need, with no added minutes. Common practice (×1.5 or ×2
// the need, or +30 min, are all taught); local protocol decides, so the
// policy is settable and always shown with the plan.
var DefaultReservePolicy = ReservePolicy{Residual: Psi(200), Factor: 1.5, AddedMinutes: 0}

// Plausible policy ranges.
//
// The residual's top is 70 bar (1 015.26 psi): the plan document accepts a
// residual of up to 1 000 psi or up to 70 bar, and the policy must take
// the larger of the two, or a residual the document accepts fails here.
//
// The need's top, 10⁸ L, lies above the largest need a valid plan document
// can give (50 legs of 2 880 min at 140 L/min, the highest flow its ranges
// allow, is 2.0·10⁷ L): such a plan is short of oxygen, not an error.
const (
	reserveMaxResidualBar = 70.0
	reserveMinFactor      = 1.0
	reserveMaxFactor      = 3.0
	reserveMaxAddedMin    = 240.0
	reserveMaxNeedLitres  = 1e8
	reserveMaxFlow        = 200.0
)

// reserveMaxResidualPsi is reserveMaxResidualBar in psi, the unit the
// residual's range error is given in.
var reserveMaxResidualPsi = Bar(reserveMaxResidualBar).Psi()

// Validate checks the policy's ranges: residual 0–70 bar (0–1 015.26 psi),
// factor 1–3, added minutes 0–240. Outside: a *RangeError naming the field.
func (p ReservePolicy) Validate() error {
	if err := checkRange("reserve residual", p.Residual.Psi(), 0, reserveMaxResidualPsi, "psi"); err != nil {
		return err
	}
	if err := checkRange("reserve factor", p.Factor, reserveMinFactor, reserveMaxFactor, ""); err != nil {
		return err
	}
	return checkRange("reserve added time", p.AddedMinutes.Minutes(), 0, reserveMaxAddedMin, "min")
}

// Required returns the oxygen in litres to carry for a calculated need:
//
//	required = need · Factor + AddedMinutes · flow
//
// where flow is the oxygen flow the added minutes are counted at: the
// last leg's, or the highest leg's as ComputePlan uses (the cautious
// choice: a delay may come on any leg). The residual is not added
// here: it is kept out of each cylinder's usable litres (Cylinder.Usable).
// need 0–100 000 000 L, flow 0–200 L/min, and a valid policy; otherwise a
// *RangeError. Unrounded: oxygen needed, round UP.
func (p ReservePolicy) Required(need Volume, flow Flow) (Volume, error) {
	if err := p.Validate(); err != nil {
		return 0, err
	}
	if err := checkRange("oxygen need", need.Litres(), 0, reserveMaxNeedLitres, "L"); err != nil {
		return 0, err
	}
	if err := checkRange("final oxygen flow", flow.LitresPerMinute(), 0, reserveMaxFlow, "L/min"); err != nil {
		return 0, err
	}
	return Litres(need.Litres()*p.Factor + p.AddedMinutes.Minutes()*flow.LitresPerMinute()), nil
}
