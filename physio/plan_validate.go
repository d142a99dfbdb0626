package physio

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// planLimit is the accepted range of one document value, inclusive, in the
// unit of its key name.
type planLimit struct {
	min, max float64
	unit     string // as written after the number: "ft", "psi", "" for a fraction
	what     string // a few words for "missing" messages
}

// Ranges of the plan document. They bound what a transport can be, not
// what is normal: clinical judgement is left to the warnings.
var (
	limitFieldFt     = planLimit{-2000, 18000, "ft", "the field elevation"} // model floor −610 m; highest roads ≈ 18 000 ft
	limitCruiseFt    = planLimit{-2000, 51000, "ft", "the cruise altitude"}
	limitCabinFt     = planLimit{-2000, 25000, "ft", "the stated cabin altitude"}
	limitDiffPsi     = planLimit{0, 11, "psi", "the maximum pressure differential"} // large business jets hold about 10.7 psi (common practice)
	limitMinutes     = planLimit{1, 2880, "min", "the leg's duration"}
	limitFiO2        = planLimit{0.21, 1, "", "FiO2 as a fraction (0.4, not 40)"}
	limitPaO2        = planLimit{20, 700, "mmHg", "PaO2"}
	limitSpO2        = planLimit{50, 100, "%", "SpO2"}
	limitPaCO2       = planLimit{15, 100, "mmHg", "PaCO2"}
	limitRQ          = planLimit{0.7, 1.0, "", "the respiratory quotient"}
	limitTempC       = planLimit{25, 45, "°C", "body temperature"}
	limitHb          = planLimit{3, 25, "g/dL", "haemoglobin"}
	limitAge         = planLimit{0, 120, "years", "age"}
	limitCount       = planLimit{1, 20, "", "the number of cylinders"}
	limitWaterCapL   = planLimit{0.5, 50, "L", "the water capacity"}
	limitLabelL      = planLimit{50, 15000, "L", "the label's nominal contents"}
	limitLabelBar    = planLimit{100, 300, "bar", "the label's nominal pressure"}
	limitResidualPsi = planLimit{0, 1000, "psi", "the safe residual"}
	limitResidualBar = planLimit{0, 70, "bar", "the safe residual"}
	limitFactor      = planLimit{1, 3, "", "the reserve factor"}
	limitResMinutes  = planLimit{0, 240, "min", "the reserve minutes"}
	limitSpO2Target  = planLimit{80, 100, "%", "the SpO2 target"}
	limitBlendLpm    = planLimit{1, 120, "L/min", "the total flow"}
	limitVenturiLpm  = planLimit{1, 15, "L/min", "the oxygen flow to the valve"}
	limitMinuteVol   = planLimit{1, 40, "L/min", "the minute volume"}
	limitBiasLpm     = planLimit{0, 30, "L/min", "the bias flow"}
	limitLeakLpm     = planLimit{0, 40, "L/min", "the leak"}
	limitDriveGasLpm = planLimit{0, 30, "L/min", "the drive gas"}
)

const (
	maxPlanLegs   = 50
	maxPlanSupply = 20
)

var planDevices = []Device{NasalCannula, SimpleMask, NonRebreather, Venturi, Blender, HighFlow, Ventilator, RoomAir}

type planValidator struct {
	errs PlanErrors
	skip map[string]bool   // paths the walker already reported
	raw  map[string]string // number text as written, where float64 could not hold it
}

func fmtPlanNum(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

func (l planLimit) unitSuffix() string {
	if l.unit == "" {
		return ""
	}
	return " " + l.unit
}

func (v *planValidator) fail(path string, sentinel error, format string, args ...any) {
	if v.skip[path] {
		return
	}
	v.errs = append(v.errs, &FieldError{Path: path, Message: fmt.Sprintf(format, args...), Err: sentinel})
}

func (v *planValidator) missing(path string, l planLimit) {
	v.fail(path, ErrSyntax, "missing; want %s, %s to %s%s", l.what, fmtPlanNum(l.min), fmtPlanNum(l.max), l.unitSuffix())
}

// num checks an optional value against its range; required values that are
// absent are reported. It returns whether the value is present and valid.
func (v *planValidator) num(path string, p *float64, l planLimit, required bool) bool {
	if p == nil {
		if required {
			v.missing(path, l)
		}
		return false
	}
	x := *p
	shown := fmtPlanNum(x)
	if t, ok := v.raw[path]; ok {
		shown = t
	}
	switch {
	case math.IsNaN(x):
		v.fail(path, ErrOutOfRange, "not a finite number; want %s to %s%s", fmtPlanNum(l.min), fmtPlanNum(l.max), l.unitSuffix())
	case x > l.max:
		hint := ""
		if l == limitFiO2 && x > 1 && x <= 100 {
			hint = " (a fraction: write 0.4 for 40 %)"
		}
		v.fail(path, ErrOutOfRange, "%s is above the %s%s limit%s", shown, fmtPlanNum(l.max), l.unitSuffix(), hint)
	case x < l.min:
		v.fail(path, ErrOutOfRange, "%s is below the %s%s minimum", shown, fmtPlanNum(l.min), l.unitSuffix())
	default:
		return true
	}
	return false
}

func (v *planValidator) notUsed(path string, p *float64, why string) {
	if p != nil {
		v.fail(path, ErrSyntax, "not used %s; remove it", why)
	}
}

func (v *planValidator) document(d *PlanDocument) {
	switch {
	case d.Version == 0:
		v.fail("version", ErrSyntax, "missing; want %d", PlanDocumentVersion)
	case d.Version != PlanDocumentVersion:
		v.fail("version", ErrUnit, "%d is not supported; this engine reads version %d", d.Version, PlanDocumentVersion)
	}

	r := d.Route
	v.num("route.origin_elevation_ft", r.OriginElevationFt, limitFieldFt, true)
	v.num("route.destination_elevation_ft", r.DestinationElevationFt, limitFieldFt, true)
	cruiseOK := v.num("route.cruise_altitude_ft", r.CruiseAltitudeFt, limitCruiseFt, false)
	v.num("route.max_differential_psi", r.MaxDifferentialPsi, limitDiffPsi, false)
	cabinOK := v.num("route.cabin_altitude_ft", r.CabinAltitudeFt, limitCabinFt, false)
	if cruiseOK && cabinOK && *r.CabinAltitudeFt > *r.CruiseAltitudeFt {
		v.fail("route.cabin_altitude_ft", ErrOutOfRange, "%s is above the cruise altitude of %s ft; a cabin cannot be higher than the aircraft",
			fmtPlanNum(*r.CabinAltitudeFt), fmtPlanNum(*r.CruiseAltitudeFt))
	}

	if len(d.Legs) == 0 && !v.skip["legs"] {
		v.fail("legs", ErrSyntax, "no legs; want 1 to %d", maxPlanLegs)
	}
	if len(d.Legs) > maxPlanLegs {
		v.fail("legs", ErrOutOfRange, "%d legs is above the %d leg limit", len(d.Legs), maxPlanLegs)
	}
	hasCabin := false
	for i := range d.Legs {
		v.leg(fmt.Sprintf("legs[%d]", i), &d.Legs[i])
		if d.Legs[i].Where == WhereCabin {
			hasCabin = true
		}
	}
	if hasCabin && r.CruiseAltitudeFt == nil && r.CabinAltitudeFt == nil {
		v.fail("route.cruise_altitude_ft", ErrSyntax, "missing; a cabin leg needs the cruise altitude, %s to %s ft (or route.cabin_altitude_ft)",
			fmtPlanNum(limitCruiseFt.min), fmtPlanNum(limitCruiseFt.max))
	}

	v.patient(&d.Patient)

	if len(d.Supply) > maxPlanSupply {
		v.fail("supply", ErrOutOfRange, "%d lines is above the %d line limit", len(d.Supply), maxPlanSupply)
	}
	for i := range d.Supply {
		v.supply(fmt.Sprintf("supply[%d]", i), &d.Supply[i])
	}
	if d.Policy != nil {
		v.policy(d.Policy)
	}
}

func (v *planValidator) leg(p string, l *PlanLeg) {
	switch l.Where {
	case WhereOrigin, WhereCabin, WhereDestination:
	case "":
		v.fail(p+".where", ErrSyntax, "missing; want origin, cabin or destination")
	default:
		v.fail(p+".where", ErrSyntax, "%q is not one of origin, cabin, destination", l.Where)
	}
	v.num(p+".minutes", l.Minutes, limitMinutes, true)
	if l.Oxygen == nil {
		v.fail(p+".oxygen", ErrSyntax, "missing; want the set-up used on this leg, e.g. {\"device\": \"room_air\"}")
		return
	}
	v.oxygen(p+".oxygen", l.Oxygen)
}

func (v *planValidator) oxygen(p string, o *PlanOxygen) {
	known := false
	for _, d := range planDevices {
		if o.Device == d {
			known = true
		}
	}
	if !known {
		if o.Device == "" {
			v.fail(p+".device", ErrSyntax, "missing; want one of %s", planDeviceList())
		} else {
			v.fail(p+".device", ErrSyntax, "%q is not one of %s", string(o.Device), planDeviceList())
		}
		return
	}
	why := "with " + string(o.Device)
	ventOnly := func() {
		v.notUsed(p+".minute_volume_lpm", o.MinuteVolumeLpm, why)
		v.notUsed(p+".bias_flow_lpm", o.BiasFlowLpm, why)
		v.notUsed(p+".leak_lpm", o.LeakLpm, why)
		v.notUsed(p+".drive_gas_lpm", o.DriveGasLpm, why)
		if o.Drive != "" {
			v.fail(p+".drive", ErrSyntax, "not used %s; remove it", why)
		}
	}
	switch o.Device {
	case RoomAir:
		v.notUsed(p+".flow_lpm", o.FlowLpm, why)
		v.notUsed(p+".fio2", o.FiO2, why+" (FiO2 is 0.21)")
		ventOnly()
	case NasalCannula, SimpleMask, NonRebreather:
		lo, hi, ok := DeviceFlowRange(o.Device)
		l := planLimit{float64(lo), float64(hi), "L/min", "the oxygen flow for " + string(o.Device)}
		if !ok {
			l = limitBlendLpm
		}
		v.num(p+".flow_lpm", o.FlowLpm, l, true)
		v.notUsed(p+".fio2", o.FiO2, why+" (its FiO2 follows from flow_lpm)")
		ventOnly()
	case Venturi:
		l := limitVenturiLpm
		if lo, hi, ok := DeviceFlowRange(Venturi); ok {
			l = planLimit{float64(lo), float64(hi), "L/min", "the oxygen flow to the Venturi valve"}
		}
		flowOK := v.num(p+".flow_lpm", o.FlowLpm, l, true)
		if v.num(p+".fio2", o.FiO2, limitFiO2, true) {
			match := false
			var names []string
			for _, s := range VenturiSettings {
				names = append(names, fmtPlanNum(s.Value()))
				if math.Abs(s.Value()-*o.FiO2) < 1e-9 {
					match = true
				}
			}
			if !match {
				v.fail(p+".fio2", ErrOutOfRange, "%s is not a Venturi valve setting; want one of %s", fmtPlanNum(*o.FiO2), strings.Join(names, ", "))
			} else if min, err := VenturiMinimumFlow(Fraction(*o.FiO2)); err == nil && flowOK && *o.FlowLpm < float64(min) {
				v.fail(p+".flow_lpm", ErrOutOfRange, "%s is below the %s L/min minimum of the %s Venturi setting",
					fmtPlanNum(*o.FlowLpm), fmtPlanNum(float64(min)), fmtPlanNum(*o.FiO2))
			}
		}
		ventOnly()
	case Blender, HighFlow:
		l := limitBlendLpm
		if lo, hi, ok := DeviceFlowRange(o.Device); ok {
			l = planLimit{float64(lo), float64(hi), "L/min", "the total flow for " + string(o.Device)}
		}
		v.num(p+".flow_lpm", o.FlowLpm, l, true)
		v.num(p+".fio2", o.FiO2, limitFiO2, true)
		ventOnly()
	case Ventilator:
		v.notUsed(p+".flow_lpm", o.FlowLpm, why+" (give minute_volume_lpm, bias_flow_lpm, leak_lpm, drive_gas_lpm)")
		v.num(p+".minute_volume_lpm", o.MinuteVolumeLpm, limitMinuteVol, true)
		v.num(p+".fio2", o.FiO2, limitFiO2, true)
		v.num(p+".bias_flow_lpm", o.BiasFlowLpm, limitBiasLpm, false)
		v.num(p+".leak_lpm", o.LeakLpm, limitLeakLpm, false)
		v.num(p+".drive_gas_lpm", o.DriveGasLpm, limitDriveGasLpm, false)
		switch o.Drive {
		case DriveBlending, DriveOxygen:
		case "":
			v.fail(p+".drive", ErrSyntax, "missing; want blending or oxygen (how the ventilator makes its FiO2)")
		default:
			v.fail(p+".drive", ErrSyntax, "%q is not one of blending, oxygen", string(o.Drive))
		}
	}
}

func planDeviceList() string {
	names := make([]string, len(planDevices))
	for i, d := range planDevices {
		names[i] = string(d)
	}
	return strings.Join(names, ", ")
}

func (v *planValidator) patient(pt *PlanPatient) {
	v.num("patient.fio2", pt.FiO2, limitFiO2, true)
	hasPaO2 := v.num("patient.pao2_mmhg", pt.PaO2MmHg, limitPaO2, false)
	hasSpO2 := v.num("patient.spo2_percent", pt.SpO2Percent, limitSpO2, false)
	if pt.PaO2MmHg == nil && pt.SpO2Percent == nil && !hasPaO2 && !hasSpO2 {
		v.fail("patient.pao2_mmhg", ErrSyntax, "missing; give pao2_mmhg (20 to 700 mmHg) or spo2_percent (50 to 100 %%), or both")
	}
	v.num("patient.paco2_mmhg", pt.PaCO2MmHg, limitPaCO2, false)
	v.num("patient.rq", pt.RQ, limitRQ, false)
	v.num("patient.temperature_c", pt.TemperatureC, limitTempC, false)
	v.num("patient.hb_g_dl", pt.HbGPerDL, limitHb, false)
	v.num("patient.age_years", pt.AgeYears, limitAge, false)
	switch pt.MeasuredAt {
	case "", WhereOrigin, WhereDestination:
	default:
		v.fail("patient.measured_at", ErrSyntax, "%q is not one of origin, destination", pt.MeasuredAt)
	}
}

func (v *planValidator) supply(p string, s *PlanSupply) {
	kinds := 0
	if s.Size != "" {
		kinds++
	}
	if s.WaterCapacityL != nil {
		kinds++
	}
	if s.LabelContentsL != nil || s.LabelPressureBar != nil {
		kinds++
	}
	if kinds != 1 {
		msg := "missing; want one of size (D, E, M, G, H), water_capacity_l, or label_contents_l with label_pressure_bar"
		if kinds > 1 {
			msg = "more than one cylinder kind; give only one of size, water_capacity_l, label_contents_l"
		}
		v.fail(p+".size", ErrSyntax, "%s", msg)
		return
	}
	var cyl Cylinder
	var err error
	switch {
	case s.Size != "":
		if _, ferr := CylinderFactor(s.Size); ferr != nil {
			v.fail(p+".size", ErrUnit, "%q is not one of D, E, M, G, H", string(s.Size))
			return
		}
		cyl, err = FactorCylinder(s.Size)
	case s.WaterCapacityL != nil:
		if !v.num(p+".water_capacity_l", s.WaterCapacityL, limitWaterCapL, true) {
			return
		}
		cyl, err = WaterCapacityCylinder(Litres(*s.WaterCapacityL))
	default:
		okC := v.num(p+".label_contents_l", s.LabelContentsL, limitLabelL, true)
		okP := v.num(p+".label_pressure_bar", s.LabelPressureBar, limitLabelBar, true)
		if !okC || !okP {
			return
		}
		cyl, err = LabelledCylinder(Litres(*s.LabelContentsL), Bar(*s.LabelPressureBar))
	}
	if err != nil {
		v.fail(p, ErrOutOfRange, "%s", trimPrefix(err))
		return
	}
	max := cyl.MaxPressure()
	switch {
	case s.PressurePsi != nil && s.PressureBar != nil:
		v.fail(p+".pressure_bar", ErrSyntax, "both pressure_psi and pressure_bar given; give the gauge reading once")
	case s.PressurePsi != nil:
		v.num(p+".pressure_psi", s.PressurePsi, planLimit{0, math.Floor(max.Psi()), "psi", "the gauge reading"}, true)
	case s.PressureBar != nil:
		v.num(p+".pressure_bar", s.PressureBar, planLimit{0, math.Floor(max.Bar()), "bar", "the gauge reading"}, true)
	default:
		unit := "pressure_bar"
		if s.Size != "" {
			unit = "pressure_psi"
		}
		v.fail(p+"."+unit, ErrSyntax, "missing; want the gauge reading (pressure_psi or pressure_bar)")
	}
	if s.Count != nil {
		c := float64(*s.Count)
		v.num(p+".count", &c, limitCount, true)
	}
}

func (v *planValidator) policy(pol *PlanPolicy) {
	if pol.ResidualPsi != nil && pol.ResidualBar != nil {
		v.fail("policy.residual_bar", ErrSyntax, "both residual_psi and residual_bar given; give the residual once")
	}
	v.num("policy.residual_psi", pol.ResidualPsi, limitResidualPsi, false)
	v.num("policy.residual_bar", pol.ResidualBar, limitResidualBar, false)
	v.num("policy.reserve_factor", pol.ReserveFactor, limitFactor, false)
	v.num("policy.reserve_minutes", pol.ReserveMinutes, limitResMinutes, false)
	v.num("policy.spo2_target_percent", pol.SpO2TargetPercent, limitSpO2Target, false)
}
