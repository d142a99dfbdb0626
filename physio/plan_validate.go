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

// planDeviceFlowLimits is each device's flow_lpm range (DeviceFlowRange),
// made once here rather than per leg: validation runs on every keystroke
// in the Brief. A device without a range of its own takes limitBlendLpm.
var planDeviceFlowLimits = func() map[Device]planLimit {
	m := map[Device]planLimit{}
	for _, d := range []struct {
		device Device
		what   string
	}{
		{NasalCannula, "the oxygen flow for "}, {SimpleMask, "the oxygen flow for "}, {NonRebreather, "the oxygen flow for "},
		{Blender, "the total flow for "}, {HighFlow, "the total flow for "},
	} {
		m[d.device] = limitBlendLpm
		if lo, hi, ok := DeviceFlowRange(d.device); ok {
			m[d.device] = planLimit{float64(lo), float64(hi), "L/min", d.what + string(d.device)}
		}
	}
	return m
}()

const (
	maxPlanLegs   = 50
	maxPlanSupply = 20
)

var planDevices = []Device{NasalCannula, SimpleMask, NonRebreather, Venturi, Blender, HighFlow, Ventilator, RoomAir}

// planPath is the path of a document value ("legs[2].oxygen.flow_lpm"),
// kept in parts and joined only when a message names it: validating a
// valid document (ComputePlan does on every keystroke in the Brief) then
// builds no path text at all.
type planPath struct {
	list  string // "legs" or "supply"; the whole path when index < 0
	index int
	sub   string // ".oxygen", or ""
	key   string // ".flow_lpm", or ""
}

// planAt is the path of a top-level value, written in full.
func planAt(path string) planPath { return planPath{list: path, index: -1} }

// planItem is the path of one element of a list: "legs[2]".
func planItem(list string, i int) planPath { return planPath{list: list, index: i} }

// in is the path of the object at sub within p: legs[2] in ".oxygen".
func (p planPath) in(sub string) planPath { p.sub = sub; return p }

// at is the path of key within p: legs[2].oxygen at ".flow_lpm".
func (p planPath) at(key string) planPath { p.key = key; return p }

func (p planPath) String() string {
	if p.index < 0 {
		return p.list + p.sub + p.key
	}
	return p.list + "[" + strconv.Itoa(p.index) + "]" + p.sub + p.key
}

type planValidator struct {
	errs PlanErrors
	skip map[string]bool   // paths the walker already reported
	raw  map[string]string // number text as written, where float64 could not hold it
}

// fmtPlanNum writes a number of the document as it is read: in full
// ("18001", "0.005"), or with an exponent when that would run past 15
// digits ("1e+308", "1e-09"), so a refused 1e308 does not fill the screen
// with 309 digits.
func fmtPlanNum(v float64) string {
	if a := math.Abs(v); a != 0 && (a >= 1e15 || a < 1e-6) {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

func (l planLimit) unitSuffix() string {
	if l.unit == "" {
		return ""
	}
	return " " + l.unit
}

func (v *planValidator) fail(at planPath, sentinel error, format string, args ...any) {
	path := at.String()
	if v.skip[path] {
		return
	}
	v.errs = append(v.errs, &FieldError{Path: path, Message: fmt.Sprintf(format, args...), Err: sentinel})
}

func (v *planValidator) missing(at planPath, l planLimit) {
	v.fail(at, ErrSyntax, "missing; want %s, %s to %s%s", l.what, fmtPlanNum(l.min), fmtPlanNum(l.max), l.unitSuffix())
}

// num checks an optional value against its range; required values that are
// absent are reported. It returns whether the value is present and valid.
func (v *planValidator) num(at planPath, p *float64, l planLimit, required bool) bool {
	if p == nil {
		if required {
			v.missing(at, l)
		}
		return false
	}
	x := *p
	switch {
	case math.IsNaN(x):
		v.fail(at, ErrOutOfRange, "not a finite number; want %s to %s%s", fmtPlanNum(l.min), fmtPlanNum(l.max), l.unitSuffix())
	case x > l.max:
		hint := ""
		if l == limitFiO2 && x > 1 && x <= 100 {
			hint = " (a fraction: write 0.4 for 40 %)"
		}
		v.fail(at, ErrOutOfRange, "%s is above the %s%s limit%s", v.shown(at, x), fmtPlanNum(l.max), l.unitSuffix(), hint)
	case x < l.min:
		v.fail(at, ErrOutOfRange, "%s is below the %s%s minimum", v.shown(at, x), fmtPlanNum(l.min), l.unitSuffix())
	default:
		return true
	}
	return false
}

// shown is a value as a message writes it: the text as written where
// float64 could not hold it, else the number.
func (v *planValidator) shown(at planPath, x float64) string {
	if t, ok := v.raw[at.String()]; ok {
		return t
	}
	return fmtPlanNum(x)
}

// notUsed refuses a value the device does not use; the message reads "not
// used with <device><note>; remove it".
func (v *planValidator) notUsed(at planPath, p *float64, device Device, note string) {
	if p != nil {
		v.fail(at, ErrSyntax, "not used with %s%s; remove it", string(device), note)
	}
}

func (v *planValidator) document(d *PlanDocument) {
	switch {
	case d.Version == 0:
		v.fail(planAt("version"), ErrSyntax, "missing; want %d", PlanDocumentVersion)
	case d.Version != PlanDocumentVersion:
		v.fail(planAt("version"), ErrUnit, "%d is not supported; this engine reads version %d", d.Version, PlanDocumentVersion)
	}

	r := d.Route
	v.num(planAt("route.origin_elevation_ft"), r.OriginElevationFt, limitFieldFt, true)
	v.num(planAt("route.destination_elevation_ft"), r.DestinationElevationFt, limitFieldFt, true)
	cruiseOK := v.num(planAt("route.cruise_altitude_ft"), r.CruiseAltitudeFt, limitCruiseFt, false)
	v.num(planAt("route.max_differential_psi"), r.MaxDifferentialPsi, limitDiffPsi, false)
	cabinOK := v.num(planAt("route.cabin_altitude_ft"), r.CabinAltitudeFt, limitCabinFt, false)
	if cruiseOK && cabinOK && *r.CabinAltitudeFt > *r.CruiseAltitudeFt {
		v.fail(planAt("route.cabin_altitude_ft"), ErrOutOfRange, "%s is above the cruise altitude of %s ft; a cabin cannot be higher than the aircraft",
			fmtPlanNum(*r.CabinAltitudeFt), fmtPlanNum(*r.CruiseAltitudeFt))
	}

	if len(d.Legs) == 0 && !v.skip["legs"] {
		v.fail(planAt("legs"), ErrSyntax, "no legs; want 1 to %d", maxPlanLegs)
	}
	if len(d.Legs) > maxPlanLegs {
		v.fail(planAt("legs"), ErrOutOfRange, "%d legs is above the %d leg limit", len(d.Legs), maxPlanLegs)
	}
	hasCabin := false
	for i := range d.Legs {
		v.leg(planItem("legs", i), &d.Legs[i])
		if d.Legs[i].Where == WhereCabin {
			hasCabin = true
		}
	}
	if hasCabin && r.CruiseAltitudeFt == nil && r.CabinAltitudeFt == nil {
		v.fail(planAt("route.cruise_altitude_ft"), ErrSyntax, "missing; a cabin leg needs the cruise altitude, %s to %s ft (or route.cabin_altitude_ft)",
			fmtPlanNum(limitCruiseFt.min), fmtPlanNum(limitCruiseFt.max))
	}

	v.patient(&d.Patient)

	if len(d.Supply) > maxPlanSupply {
		v.fail(planAt("supply"), ErrOutOfRange, "%d lines is above the %d line limit", len(d.Supply), maxPlanSupply)
	}
	for i := range d.Supply {
		v.supply(planItem("supply", i), &d.Supply[i])
	}
	if d.Policy != nil {
		v.policy(d.Policy)
	}
}

func (v *planValidator) leg(p planPath, l *PlanLeg) {
	switch l.Where {
	case WhereOrigin, WhereCabin, WhereDestination:
	case "":
		v.fail(p.at(".where"), ErrSyntax, "missing; want origin, cabin or destination")
	default:
		v.fail(p.at(".where"), ErrSyntax, "%q is not one of origin, cabin, destination", l.Where)
	}
	v.num(p.at(".minutes"), l.Minutes, limitMinutes, true)
	if l.Oxygen == nil {
		v.fail(p.at(".oxygen"), ErrSyntax, "missing; want the set-up used on this leg, e.g. {\"device\": \"room_air\"}")
		return
	}
	v.oxygen(p.in(".oxygen"), l.Oxygen)
}

func (v *planValidator) oxygen(p planPath, o *PlanOxygen) {
	known := false
	for _, d := range planDevices {
		if o.Device == d {
			known = true
		}
	}
	if !known {
		if o.Device == "" {
			v.fail(p.at(".device"), ErrSyntax, "missing; want one of %s", planDeviceList())
		} else {
			v.fail(p.at(".device"), ErrSyntax, "%q is not one of %s", string(o.Device), planDeviceList())
		}
		return
	}
	dev := o.Device
	ventOnly := func() {
		v.notUsed(p.at(".minute_volume_lpm"), o.MinuteVolumeLpm, dev, "")
		v.notUsed(p.at(".bias_flow_lpm"), o.BiasFlowLpm, dev, "")
		v.notUsed(p.at(".leak_lpm"), o.LeakLpm, dev, "")
		v.notUsed(p.at(".drive_gas_lpm"), o.DriveGasLpm, dev, "")
		if o.Drive != "" {
			v.fail(p.at(".drive"), ErrSyntax, "not used with %s; remove it", string(dev))
		}
	}
	switch o.Device {
	case RoomAir:
		v.notUsed(p.at(".flow_lpm"), o.FlowLpm, dev, "")
		v.notUsed(p.at(".fio2"), o.FiO2, dev, " (FiO2 is 0.21)")
		ventOnly()
	case NasalCannula, SimpleMask, NonRebreather:
		l := planDeviceFlowLimits[o.Device]
		v.num(p.at(".flow_lpm"), o.FlowLpm, l, true)
		v.notUsed(p.at(".fio2"), o.FiO2, dev, " (its FiO2 follows from flow_lpm)")
		ventOnly()
	case Venturi:
		l := limitVenturiLpm
		if lo, hi, ok := DeviceFlowRange(Venturi); ok {
			l = planLimit{float64(lo), float64(hi), "L/min", "the oxygen flow to the Venturi valve"}
		}
		flowOK := v.num(p.at(".flow_lpm"), o.FlowLpm, l, true)
		if v.num(p.at(".fio2"), o.FiO2, limitFiO2, true) {
			match := false
			for _, s := range VenturiSettings {
				if math.Abs(s.Value()-*o.FiO2) < 1e-9 {
					match = true
				}
			}
			if !match {
				names := make([]string, len(VenturiSettings))
				for i, s := range VenturiSettings {
					names[i] = fmtPlanNum(s.Value())
				}
				v.fail(p.at(".fio2"), ErrOutOfRange, "%s is not a Venturi valve setting; want one of %s", fmtPlanNum(*o.FiO2), strings.Join(names, ", "))
			} else if min, err := VenturiMinimumFlow(Fraction(*o.FiO2)); err == nil && flowOK && *o.FlowLpm < float64(min) {
				v.fail(p.at(".flow_lpm"), ErrOutOfRange, "%s is below the %s L/min minimum of the %s Venturi setting",
					fmtPlanNum(*o.FlowLpm), fmtPlanNum(float64(min)), fmtPlanNum(*o.FiO2))
			}
		}
		ventOnly()
	case Blender, HighFlow:
		l := planDeviceFlowLimits[o.Device]
		v.num(p.at(".flow_lpm"), o.FlowLpm, l, true)
		v.num(p.at(".fio2"), o.FiO2, limitFiO2, true)
		ventOnly()
	case Ventilator:
		v.notUsed(p.at(".flow_lpm"), o.FlowLpm, dev, " (give minute_volume_lpm, bias_flow_lpm, leak_lpm, drive_gas_lpm)")
		v.num(p.at(".minute_volume_lpm"), o.MinuteVolumeLpm, limitMinuteVol, true)
		v.num(p.at(".fio2"), o.FiO2, limitFiO2, true)
		v.num(p.at(".bias_flow_lpm"), o.BiasFlowLpm, limitBiasLpm, false)
		v.num(p.at(".leak_lpm"), o.LeakLpm, limitLeakLpm, false)
		v.num(p.at(".drive_gas_lpm"), o.DriveGasLpm, limitDriveGasLpm, false)
		switch o.Drive {
		case DriveBlending, DriveOxygen:
		case "":
			v.fail(p.at(".drive"), ErrSyntax, "missing; want blending or oxygen (how the ventilator makes its FiO2)")
		default:
			v.fail(p.at(".drive"), ErrSyntax, "%q is not one of blending, oxygen", string(o.Drive))
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
	v.num(planAt("patient.fio2"), pt.FiO2, limitFiO2, true)
	hasPaO2 := v.num(planAt("patient.pao2_mmhg"), pt.PaO2MmHg, limitPaO2, false)
	hasSpO2 := v.num(planAt("patient.spo2_percent"), pt.SpO2Percent, limitSpO2, false)
	if pt.PaO2MmHg == nil && pt.SpO2Percent == nil && !hasPaO2 && !hasSpO2 {
		v.fail(planAt("patient.pao2_mmhg"), ErrSyntax, "missing; give pao2_mmhg (20 to 700 mmHg) or spo2_percent (50 to 100 %%), or both")
	}
	v.num(planAt("patient.paco2_mmhg"), pt.PaCO2MmHg, limitPaCO2, false)
	v.num(planAt("patient.rq"), pt.RQ, limitRQ, false)
	v.num(planAt("patient.temperature_c"), pt.TemperatureC, limitTempC, false)
	v.num(planAt("patient.hb_g_dl"), pt.HbGPerDL, limitHb, false)
	v.num(planAt("patient.age_years"), pt.AgeYears, limitAge, false)
	switch pt.MeasuredAt {
	case "", WhereOrigin, WhereDestination:
	default:
		v.fail(planAt("patient.measured_at"), ErrSyntax, "%q is not one of origin, destination", pt.MeasuredAt)
	}
}

func (v *planValidator) supply(p planPath, s *PlanSupply) {
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
		v.fail(p.at(".size"), ErrSyntax, "%s", msg)
		return
	}
	var cyl Cylinder
	var err error
	switch {
	case s.Size != "":
		if _, ferr := CylinderFactor(s.Size); ferr != nil {
			v.fail(p.at(".size"), ErrUnit, "%q is not one of D, E, M, G, H", string(s.Size))
			return
		}
		cyl, err = FactorCylinder(s.Size)
	case s.WaterCapacityL != nil:
		if !v.num(p.at(".water_capacity_l"), s.WaterCapacityL, limitWaterCapL, true) {
			return
		}
		cyl, err = WaterCapacityCylinder(Litres(*s.WaterCapacityL))
	default:
		okC := v.num(p.at(".label_contents_l"), s.LabelContentsL, limitLabelL, true)
		okP := v.num(p.at(".label_pressure_bar"), s.LabelPressureBar, limitLabelBar, true)
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
		v.fail(p.at(".pressure_bar"), ErrSyntax, "both pressure_psi and pressure_bar given; give the gauge reading once")
	case s.PressurePsi != nil:
		v.num(p.at(".pressure_psi"), s.PressurePsi, planLimit{0, math.Floor(max.Psi()), "psi", "the gauge reading"}, true)
	case s.PressureBar != nil:
		v.num(p.at(".pressure_bar"), s.PressureBar, planLimit{0, math.Floor(max.Bar()), "bar", "the gauge reading"}, true)
	default:
		unit := ".pressure_bar"
		if s.Size != "" {
			unit = ".pressure_psi"
		}
		v.fail(p.at(unit), ErrSyntax, "missing; want the gauge reading (pressure_psi or pressure_bar)")
	}
	if s.Count != nil {
		c := float64(*s.Count)
		v.num(p.at(".count"), &c, limitCount, true)
	}
}

func (v *planValidator) policy(pol *PlanPolicy) {
	if pol.ResidualPsi != nil && pol.ResidualBar != nil {
		v.fail(planAt("policy.residual_bar"), ErrSyntax, "both residual_psi and residual_bar given; give the residual once")
	}
	v.num(planAt("policy.residual_psi"), pol.ResidualPsi, limitResidualPsi, false)
	v.num(planAt("policy.residual_bar"), pol.ResidualBar, limitResidualBar, false)
	v.num(planAt("policy.reserve_factor"), pol.ReserveFactor, limitFactor, false)
	v.num(planAt("policy.reserve_minutes"), pol.ReserveMinutes, limitResMinutes, false)
	v.num(planAt("policy.spo2_target_percent"), pol.SpO2TargetPercent, limitSpO2Target, false)
}
