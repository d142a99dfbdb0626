package physio

import (
	"bytes"
	"fmt"

	"github.com/shopspring/decimal"
)

// Number is a rounded decimal that encodes as a bare JSON number (not a
// string), so that scripts read plan results as numbers. Compare with Cmp.
type Number struct{ decimal.Decimal }

// MarshalJSON writes the decimal as a JSON number.
func (n Number) MarshalJSON() ([]byte, error) { return []byte(n.Decimal.String()), nil }

// UnmarshalJSON reads a JSON number or a quoted decimal.
func (n *Number) UnmarshalJSON(b []byte) error {
	b = bytes.Trim(b, `"`)
	d, err := decimal.NewFromString(string(b))
	if err != nil {
		return fmt.Errorf("physio: plan number %q: %w", b, ErrSyntax)
	}
	n.Decimal = d
	return nil
}

// FigureInput is one input a figure was computed from, as used (after
// defaults), in the unit named.
type FigureInput struct {
	Name  string  `json:"name"`
	Value float64 `json:"value"` // to 4 decimal places, nearest
	Unit  string  `json:"unit,omitempty"`
}

// Figure explains one number of a plan result: its rounded value and unit,
// the formula by its usual name, the inputs it used, the published source
// (or "common practice") and the rounding direction ("up", "down",
// "nearest"), so that a screen can show "how" beside the number.
type Figure struct {
	Value    Number        `json:"value"`
	Unit     string        `json:"unit"`
	Formula  string        `json:"formula"`
	Inputs   []FigureInput `json:"inputs,omitempty"`
	Source   string        `json:"source"`
	Rounding string        `json:"rounding"`
}

// Plan statuses, the first line of a brief.
const (
	StatusGo      = "go"      // nothing found against the plan
	StatusCaution = "caution" // go, with warnings to read
	StatusNoGo    = "no_go"   // the plan as written does not hold the patient or is short of oxygen
)

// Warning severities.
const (
	SeverityNoGo    = "no_go"
	SeverityCaution = "caution"
	SeverityInfo    = "info"
)

// Warning codes. They are stable: scripts and the UI may key on them.
const (
	WarnSupplyShort        = "SUPPLY_SHORT"              // no_go: usable oxygen below the need with reserve
	WarnFiO2Unreachable    = "FIO2_UNREACHABLE"          // no_go: even FiO2 1.0 cannot hold the ground state on a leg
	WarnSetUpBelowNeed     = "SETUP_BELOW_NEED"          // no_go: the leg's set-up may deliver less FiO2 than needed
	WarnNoAlveolarOxygen   = "NO_ALVEOLAR_OXYGEN"        // no_go: PAO2 would be below zero on a leg
	WarnSpO2BelowTarget    = "SPO2_BELOW_TARGET"         // caution: expected SpO2 below the policy's target
	WarnCabinAbove8000Ft   = "CABIN_ABOVE_8000FT"        // caution: cabin above 8 000 ft (14 CFR 25.841(a))
	WarnFieldAbove8000Ft   = "FIELD_ABOVE_8000FT"        // caution: a ground leg above 8 000 ft
	WarnFieldAboveLegs     = "FIELD_ABOVE_LEGS"          // caution: a field with no leg of its own lies above every leg
	WarnCabinBelowFields   = "CABIN_BELOW_FIELDS"        // caution: the flight's cabin altitude lies below both fields
	WarnOutsideValidity    = "OUTSIDE_VALIDITY"          // caution: an input outside a method's validity
	WarnSpO2PaO2Disagree   = "SPO2_PAO2_DISAGREE"        // caution: the SpO2 and PaO2 given disagree on the standard curve
	WarnCylinderAtResidual = "CYLINDER_AT_RESIDUAL"      // caution: a cylinder already at or below the safe residual
	WarnPaO2FromSpO2       = "PAO2_FROM_SPO2"            // info: PaO2 estimated from SpO2
	WarnVentilatorEstimate = "VENTILATOR_ESTIMATE"       // info: ventilator oxygen use is an estimate; the device's figure wins
	WarnChangeInFlight     = "CYLINDER_CHANGE_IN_FLIGHT" // info: a cylinder change falls in a cabin leg
)

// PlanWarning is one warning of a plan result. Leg is the 0-based leg
// index when the warning belongs to one leg.
type PlanWarning struct {
	Code     string `json:"code"`
	Severity string `json:"severity"`
	Message  string `json:"message"`
	Leg      *int   `json:"leg,omitempty"`
}

// PlanAssumption is a default the engine applied because the document did
// not give the value.
type PlanAssumption struct {
	Path   string `json:"path"`
	Value  string `json:"value"`
	Reason string `json:"reason"`
}

// PlanResult is the computed plan. The plain numbers sit at stable keys;
// Explain (here and in each sub-object) holds a Figure for each number,
// keyed by the same JSON name. Absent values (no cabin leg; an
// unpressurised aircraft) are null.
type PlanResult struct {
	EngineVersion   string `json:"engine_version"`
	DocumentVersion int    `json:"document_version"`
	Title           string `json:"title,omitempty"`
	Status          string `json:"status"`
	Go              bool   `json:"go"`

	CabinAltitudeFt     *Number `json:"cabin_altitude_ft"`
	Pressurised         bool    `json:"pressurised"`
	HighestAltitudeFt   Number  `json:"highest_altitude_ft"`
	HighestLeg          int     `json:"highest_leg"`
	FiO2Needed          Number  `json:"fio2_needed"`
	FiO2Possible        bool    `json:"fio2_possible"`
	MaxCabinAltitudeFt  Number  `json:"max_cabin_altitude_ft"`
	MaxCruiseAltitudeFt *Number `json:"max_cruise_altitude_ft"`
	MaxCruiseAtCeiling  bool    `json:"max_cruise_at_model_ceiling"`

	TransportMinutes   Number  `json:"transport_minutes"`
	OxygenCalculatedL  Number  `json:"oxygen_calculated_l"`
	OxygenNeededL      Number  `json:"oxygen_needed_l"`
	OxygenUsableL      Number  `json:"oxygen_usable_l"`
	OxygenMarginL      Number  `json:"oxygen_margin_l"`
	SupplyExhaustedMin *Number `json:"supply_exhausted_minute"`
	GasExpansionRatio  Number  `json:"gas_expansion_ratio"`
	SpO2TargetPercent  Number  `json:"spo2_target_percent"`
	ReserveFactor      Number  `json:"reserve_factor"`
	ReserveMinutes     Number  `json:"reserve_minutes"`
	ResidualPsi        Number  `json:"residual_psi"`
	ResidualBar        Number  `json:"residual_bar"`

	Ground      PlanGroundResult     `json:"ground"`
	Legs        []PlanLegResult      `json:"legs"`
	Cylinders   []PlanCylinderResult `json:"cylinders"`
	TrappedGas  PlanTrappedGasResult `json:"trapped_gas"`
	Assumptions []PlanAssumption     `json:"assumptions"`
	Warnings    []PlanWarning        `json:"warnings"`
	Explain     Explanation          `json:"explain"`
	Caution     string               `json:"caution"`
}

// PlanGroundResult is the patient's ground state as the engine used it.
type PlanGroundResult struct {
	MeasuredAt         string      `json:"measured_at"`
	AltitudeFt         Number      `json:"altitude_ft"`
	PressureMmHg       Number      `json:"pressure_mmhg"`
	WaterVapourMmHg    Number      `json:"water_vapour_mmhg"`
	FiO2               Number      `json:"fio2"`
	PaCO2MmHg          Number      `json:"paco2_mmhg"`
	RQ                 Number      `json:"rq"`
	AlveolarPO2MmHg    Number      `json:"pao2_alveolar_mmhg"`
	PaO2MmHg           Number      `json:"pao2_arterial_mmhg"`
	PaO2Source         string      `json:"pao2_source"` // "measured" or "from_spo2"
	SpO2Percent        Number      `json:"spo2_percent"`
	SpO2Source         string      `json:"spo2_source"` // "measured" or "from_pao2"
	AARatio            Number      `json:"aa_ratio"`
	AaGradientMmHg     Number      `json:"aa_gradient_mmhg"`
	ExpectedAaGradient *Number     `json:"expected_aa_gradient_mmhg"`
	ContentMLPerDL     *Number     `json:"cao2_ml_dl"`
	Explain            Explanation `json:"explain"`
}

// PlanOption is a set-up that would deliver a leg's needed FiO2: an option
// for the crew, not an order.
type PlanOption struct {
	Device    Device `json:"device"`
	OxygenLpm Number `json:"oxygen_lpm"`
	TotalLpm  Number `json:"total_lpm"`
	FiO2Low   Number `json:"fio2_low"`
	FiO2High  Number `json:"fio2_high"`
	Label     string `json:"label"`
}

// PlanLegResult is one leg computed. pao2_mmhg is the alveolar PO2 (PAO2)
// at the leg's set-up; pao2_expected_mmhg the arterial PaO2 expected by the
// constant a/A ratio.
type PlanLegResult struct {
	Index               int          `json:"index"`
	Label               string       `json:"label,omitempty"`
	Where               string       `json:"where"`
	StartMinute         Number       `json:"start_minute"`
	Minutes             Number       `json:"minutes"`
	Device              Device       `json:"device"`
	AltitudeFt          Number       `json:"altitude_ft"`
	PressureMmHg        Number       `json:"pressure_mmhg"`
	FiO2DeliveredLow    Number       `json:"fio2_delivered_low"`
	FiO2DeliveredHigh   Number       `json:"fio2_delivered_high"`
	PAO2MmHg            Number       `json:"pao2_mmhg"`
	PaO2ExpectedMmHg    Number       `json:"pao2_expected_mmhg"`
	SpO2ExpectedPercent Number       `json:"spo2_expected_percent"`
	ContentMLPerDL      *Number      `json:"cao2_expected_ml_dl"`
	FiO2Needed          Number       `json:"fio2_needed"`
	FiO2Possible        bool         `json:"fio2_possible"`
	Delivers            bool         `json:"delivers"`
	OxygenLpm           Number       `json:"oxygen_lpm"`
	OxygenL             Number       `json:"oxygen_l"`
	Options             []PlanOption `json:"options"`
	Explain             Explanation  `json:"explain"`
}

// PlanCylinderResult is one cylinder in the order of use (the order of the
// supply list, each line's count in turn, each used down to the residual
// before the next is opened).
type PlanCylinderResult struct {
	Order        int         `json:"order"`
	Supply       int         `json:"supply"`
	Copy         int         `json:"copy"`
	Name         string      `json:"name"`
	UsableL      Number      `json:"usable_l"`
	StartMinute  *Number     `json:"start_minute"`
	ChangeMinute *Number     `json:"change_minute"`
	ChangeLeg    *int        `json:"change_leg"`
	Explain      Explanation `json:"explain"`
}

// PlanTrappedGasResult is Boyle's-law expansion from the origin to the
// highest altitude, with two worked examples.
type PlanTrappedGasResult struct {
	FromAltitudeFt         Number      `json:"from_altitude_ft"`
	ToAltitudeFt           Number      `json:"to_altitude_ft"`
	Ratio                  Number      `json:"ratio"`
	CuffMl                 Number      `json:"cuff_ml"`
	CuffAtAltitudeMl       Number      `json:"cuff_at_altitude_ml"`
	PneumothoraxMl         Number      `json:"pneumothorax_ml"`
	PneumothoraxAltitudeMl Number      `json:"pneumothorax_at_altitude_ml"`
	RigidOverpressureCmH2O Number      `json:"rigid_overpressure_cmh2o"`
	Caution                string      `json:"caution"`
	Explain                Explanation `json:"explain"`
}
