package ui

import (
	"errors"
	"fmt"
	"strings"

	"github.com/shopspring/decimal"

	"alvea/physio"
)

// briefModel is the Brief's fields read into a plan document, the message
// beside each field that needs fixing, and — only when every field is
// valid — the plan physio computed from it. It holds no formula: the
// numbers come from physio.ComputePlan.
type briefModel struct {
	doc    *physio.PlanDocument
	msgs   map[string]string // field id → what to fix
	order  []string          // field ids with a message, in form order
	labels map[string]string // field id → where it is, for the fix list
	paths  map[string]string // plan document path → field id
	other  []string          // problems physio found that no field owns
	result *physio.PlanResult
}

// ok reports a computed plan (every field valid and physio accepted it).
func (m *briefModel) ok() bool { return m.result != nil }

func (m *briefModel) fail(id, where, msg string) {
	if _, dup := m.msgs[id]; dup {
		return
	}
	m.msgs[id] = msg
	if where != "" {
		m.labels[id] = where
	}
	m.order = append(m.order, id)
}

// read reads one entry, records its message, and returns a pointer to the
// value in the document's unit (nil when empty or invalid).
func (m *briefModel) read(id, where, path string, spec fieldSpec, e Entry, disp string, required bool) *float64 {
	m.paths[path] = id
	m.labels[id] = where
	r := readEntryMemo(spec, e, disp, required)
	if r.Msg != "" {
		m.fail(id, where, r.Msg)
		return nil
	}
	if !r.Present {
		return nil
	}
	v := r.Value
	return &v
}

// Field ids of the Brief (legs and supply lines add their index).
const (
	fidOrigin      = "b-rt-origin"
	fidDestination = "b-rt-destination"
	fidCabinMode   = "b-rt-mode"
	fidCruise      = "b-rt-cruise"
	fidDiff        = "b-rt-diff"
	fidCabin       = "b-rt-cabin"
	fidPtFiO2      = "b-pt-fio2"
	fidPaO2        = "b-pt-pao2"
	fidSpO2        = "b-pt-spo2"
	fidPaCO2       = "b-pt-paco2"
	fidRQ          = "b-pt-rq"
	fidTemp        = "b-pt-temp"
	fidHb          = "b-pt-hb"
	fidAge         = "b-pt-age"
	fidResidual    = "b-pol-residual"
	fidFactor      = "b-pol-factor"
	fidResMinutes  = "b-pol-minutes"
	fidSpO2Target  = "b-pol-spo2"
	fidLegsList    = "b-leg-list"
)

func legID(i int, what string) string    { return indexedID2("b-leg", i, "-", what) }
func supplyID(i int, what string) string { return indexedID2("b-sup", i, "-", what) }

// builtInSizes are the CGA letter sizes offered in the Brief.
var builtInSizes = []physio.CylinderSize{physio.SizeD, physio.SizeE, physio.SizeM, physio.SizeG, physio.SizeH}

// buildBrief reads the draft under the settings and, when every field is
// valid, computes the plan.
func buildBrief(d BriefDraft, st Settings) *briefModel {
	// Sized for a usual transport (three legs, two cylinder lines), so the
	// maps do not grow on every keystroke.
	m := &briefModel{msgs: map[string]string{}, labels: make(map[string]string, 48), paths: make(map[string]string, 64)}
	doc := &physio.PlanDocument{Version: physio.PlanDocumentVersion}
	m.doc = doc
	alt, pu, gas := st.AltitudeUnit, st.PressureUnit, st.GasUnit

	// Route and aircraft.
	r := d.Route
	doc.Route.OriginElevationFt = m.read(fidOrigin, "Route", "route.origin_elevation_ft", specOrigin, r.Origin, alt, true)
	doc.Route.DestinationElevationFt = m.read(fidDestination, "Route", "route.destination_elevation_ft", specDestination, r.Destination, alt, true)
	m.paths["route.cabin_altitude_ft"] = fidCabin
	m.paths["route.cruise_altitude_ft"] = fidCruise
	m.paths["route.max_differential_psi"] = fidDiff
	switch r.Cabin {
	case CabinUnpressurised:
		doc.Route.CruiseAltitudeFt = m.read(fidCruise, "Route", "route.cruise_altitude_ft", specCruise, r.Cruise, alt, true)
	case CabinPressurised:
		doc.Route.CruiseAltitudeFt = m.read(fidCruise, "Route", "route.cruise_altitude_ft", specCruise, r.Cruise, alt, true)
		doc.Route.MaxDifferentialPsi = m.read(fidDiff, "Route", "route.max_differential_psi", specDiff, r.Differential, pu, true)
	case CabinStated:
		doc.Route.CruiseAltitudeFt = m.read(fidCruise, "Route", "route.cruise_altitude_ft", specCruise, r.Cruise, alt, false)
		doc.Route.CabinAltitudeFt = m.read(fidCabin, "Route", "route.cabin_altitude_ft", specCabin, r.CabinAltitude, alt, true)
	default:
		m.fail(fidCabinMode, "Route", "Aircraft: choose unpressurised, pressurised, or a cabin altitude stated by the pilot.")
	}

	// Legs.
	if len(d.Legs) == 0 {
		m.fail(fidLegsList, "Legs", "Add at least one leg.")
	}
	for i, l := range d.Legs {
		where := indexedID("Leg ", i+1, "")
		path := func(what string) string { return indexedID2("legs[", i, "]", what) }
		leg := physio.PlanLeg{Where: l.Where}
		m.paths[path(".where")] = legID(i, "where")
		if l.Where != physio.WhereOrigin && l.Where != physio.WhereCabin && l.Where != physio.WhereDestination {
			m.fail(legID(i, "where"), where, fmt.Sprintf("Leg %d: choose where it is (origin, flight or destination).", i+1))
		}
		leg.Minutes = m.read(legID(i, "min"), where, path(".minutes"), specMinutes, l.Minutes, "min", true)
		ox := &physio.PlanOxygen{Device: physio.Device(l.Device)}
		leg.Oxygen = ox
		op := func(what string) string { return indexedID2("legs[", i, "].oxygen", what) }
		m.paths[op("")] = legID(i, "device")
		m.paths[op(".device")] = legID(i, "device")
		dev := physio.Device(l.Device)
		switch dev {
		case physio.RoomAir:
		case physio.NasalCannula, physio.SimpleMask, physio.NonRebreather:
			ox.FlowLpm = m.read(legID(i, "flow"), where, op(".flow_lpm"), flowSpec(dev), l.Flow, "L/min", true)
		case physio.Venturi:
			ox.FlowLpm = m.read(legID(i, "flow"), where, op(".flow_lpm"), flowSpec(dev), l.Flow, "L/min", true)
			m.paths[op(".fio2")] = legID(i, "fio2")
			if strings.TrimSpace(l.FiO2.T) == "" {
				m.fail(legID(i, "fio2"), where, fmt.Sprintf("Leg %d: choose the Venturi valve setting.", i+1))
			} else {
				ox.FiO2 = m.read(legID(i, "fio2"), where, op(".fio2"), specLegFiO2, l.FiO2, "", true)
			}
		case physio.Blender, physio.HighFlow:
			ox.FlowLpm = m.read(legID(i, "flow"), where, op(".flow_lpm"), flowSpec(dev), l.Flow, "L/min", true)
			ox.FiO2 = m.read(legID(i, "fio2"), where, op(".fio2"), specLegFiO2, l.FiO2, "", true)
		case physio.Ventilator:
			ox.MinuteVolumeLpm = m.read(legID(i, "mv"), where, op(".minute_volume_lpm"), specMinuteVol, l.MinuteVolume, "L/min", true)
			ox.FiO2 = m.read(legID(i, "fio2"), where, op(".fio2"), specLegFiO2, l.FiO2, "", true)
			ox.BiasFlowLpm = m.read(legID(i, "bias"), where, op(".bias_flow_lpm"), specBias, l.BiasFlow, "L/min", false)
			ox.LeakLpm = m.read(legID(i, "leak"), where, op(".leak_lpm"), specLeak, l.Leak, "L/min", false)
			ox.DriveGasLpm = m.read(legID(i, "drivegas"), where, op(".drive_gas_lpm"), specDriveGas, l.DriveGas, "L/min", false)
			m.paths[op(".drive")] = legID(i, "drive")
			switch physio.Drive(l.Drive) {
			case physio.DriveBlending, physio.DriveOxygen:
				ox.Drive = physio.Drive(l.Drive)
			default:
				m.fail(legID(i, "drive"), where, fmt.Sprintf("Leg %d: choose how the ventilator makes its FiO2 (blending air, or driven by oxygen).", i+1))
			}
		default:
			m.fail(legID(i, "device"), where, fmt.Sprintf("Leg %d: choose the oxygen set-up (room air if none).", i+1))
		}
		doc.Legs = append(doc.Legs, leg)
	}

	// Patient.
	pt := d.Patient
	pa := &doc.Patient
	pa.FiO2 = m.read(fidPtFiO2, "Patient", "patient.fio2", specPtFiO2, pt.FiO2, "", true)
	pa.PaO2MmHg = m.read(fidPaO2, "Patient", "patient.pao2_mmhg", specPaO2, pt.PaO2, gas, false)
	pa.SpO2Percent = m.read(fidSpO2, "Patient", "patient.spo2_percent", specSpO2, pt.SpO2, "%", false)
	if strings.TrimSpace(pt.PaO2.T) == "" && strings.TrimSpace(pt.SpO2.T) == "" {
		m.fail(fidPaO2, "Patient", fmt.Sprintf("Give PaO2 (%s) or SpO2 (%s), or both.", rangeText(specPaO2, gas), rangeText(specSpO2, "%")))
	}
	pa.PaCO2MmHg = m.read(fidPaCO2, "Patient", "patient.paco2_mmhg", specPaCO2, pt.PaCO2, gas, false)
	pa.RQ = m.read(fidRQ, "Patient", "patient.rq", specRQ, pt.RQ, "", false)
	pa.TemperatureC = m.read(fidTemp, "Patient", "patient.temperature_c", specTemp, pt.Temperature, "°C", false)
	pa.HbGPerDL = m.read(fidHb, "Patient", "patient.hb_g_dl", specHb, pt.Hb, "g/dL", false)
	pa.AgeYears = m.read(fidAge, "Patient", "patient.age_years", specAge, pt.Age, "years", false)
	pa.MeasuredAt = pt.MeasuredAt
	if pa.MeasuredAt == "" {
		pa.MeasuredAt = physio.WhereOrigin
	}

	// Cylinders on board.
	doc.Supply = []physio.PlanSupply{}
	for i, s := range d.Supply {
		where := indexedID("Cylinders, line ", i+1, "")
		path := func(what string) string { return indexedID2("supply[", i, "]", what) }
		m.paths[path("")] = supplyID(i, "kind")
		m.paths[path(".size")] = supplyID(i, "kind")
		line := physio.PlanSupply{}
		var cyl physio.Cylinder
		var cylErr error
		switch {
		case isBuiltInSize(s.Kind):
			line.Size = physio.CylinderSize(s.Kind)
			cyl, cylErr = physio.FactorCylinder(line.Size)
		case s.Kind == SupplyWaterCapacity:
			line.WaterCapacityL = m.read(supplyID(i, "wc"), where, path(".water_capacity_l"), specWaterCap, s.WaterCapacity, "L", true)
			if line.WaterCapacityL == nil {
				cylErr = errors.New("no water capacity")
			} else {
				cyl, cylErr = physio.WaterCapacityCylinder(physio.Litres(*line.WaterCapacityL))
			}
		case strings.HasPrefix(s.Kind, catalogueKind):
			name := strings.TrimPrefix(s.Kind, catalogueKind)
			c, found := catalogueCylinder(st, name)
			if !found {
				m.fail(supplyID(i, "kind"), where, fmt.Sprintf("Cylinders, line %d: %q is no longer in the Settings catalogue; choose another cylinder.", i+1, name))
				cylErr = errors.New("not in catalogue")
				break
			}
			wc, err := decimal.NewFromString(c.WaterCapacity)
			if err != nil {
				m.fail(supplyID(i, "kind"), where, fmt.Sprintf("Cylinders, line %d: the catalogue's water capacity of %q cannot be read; check it in Settings.", i+1, name))
				cylErr = err
				break
			}
			v := wc.InexactFloat64()
			line.WaterCapacityL = &v
			line.Name = c.Name
			m.paths[path(".water_capacity_l")] = supplyID(i, "kind")
			cyl, cylErr = physio.WaterCapacityCylinder(physio.Litres(v))
		default:
			m.fail(supplyID(i, "kind"), where, fmt.Sprintf("Cylinders, line %d: choose the cylinder.", i+1))
			cylErr = errors.New("no kind")
		}
		gid := supplyID(i, "pressure")
		m.paths[path(".pressure_psi")] = gid
		m.paths[path(".pressure_bar")] = gid
		if cylErr == nil {
			spec := gaugeSpec(cyl)
			r := readEntryMemo(spec, s.Pressure, pu, true)
			if r.Msg != "" {
				m.fail(gid, where, r.Msg)
			} else {
				v := r.Value
				if r.Unit == UnitBar {
					line.PressureBar = &v
				} else {
					line.PressurePsi = &v
				}
			}
		}
		if c := m.read(supplyID(i, "count"), where, path(".count"), specCount, s.Count, "cyl.", true); c != nil {
			n := int(*c)
			line.Count = &n
		}
		doc.Supply = append(doc.Supply, line)
	}

	// Reserve policy: Settings, or this transport's own.
	pol := &physio.PlanPolicy{}
	doc.Policy = pol
	m.paths["policy.residual_psi"] = fidResidual
	m.paths["policy.residual_bar"] = fidResidual
	m.paths["policy.reserve_factor"] = fidFactor
	m.paths["policy.reserve_minutes"] = fidResMinutes
	m.paths["policy.spo2_target_percent"] = fidSpO2Target
	if d.Policy.Override {
		r := readEntryMemo(specResidual, d.Policy.Residual, pu, true)
		if r.Msg != "" {
			m.fail(fidResidual, "Reserve policy", r.Msg)
		} else {
			v := r.Value
			if r.Unit == UnitBar {
				pol.ResidualBar = &v
			} else {
				pol.ResidualPsi = &v
			}
		}
		pol.ReserveFactor = m.read(fidFactor, "Reserve policy", "policy.reserve_factor", specFactor, d.Policy.Factor, "×", true)
		pol.ReserveMinutes = m.read(fidResMinutes, "Reserve policy", "policy.reserve_minutes", specResMinutes, d.Policy.Minutes, "min", true)
		pol.SpO2TargetPercent = m.read(fidSpO2Target, "Reserve policy", "policy.spo2_target_percent", specSpO2Target, d.Policy.SpO2Target, "%", true)
	} else {
		settingsPolicy(st, pol)
	}

	if len(m.msgs) > 0 {
		return m
	}
	res, err := physio.ComputePlan(doc)
	if err != nil {
		m.planErrors(err, st)
		return m
	}
	m.result = res
	return m
}

// planErrors puts each of physio's problems beside its field, or in the
// list of problems with no field.
func (m *briefModel) planErrors(err error, settings Settings) {
	var pe physio.PlanErrors
	if !errors.As(err, &pe) {
		m.other = append(m.other, "The plan could not be computed: "+inDisplayUnits(settings, strings.TrimPrefix(err.Error(), "physio: "))+".")
		return
	}
	for _, fe := range pe {
		id, ok := m.paths[fe.Path]
		if !ok {
			m.other = append(m.other, fe.Path+": "+inDisplayUnits(settings, fe.Message)+".")
			continue
		}
		m.fail(id, "", sentence(inDisplayUnits(settings, fe.Message)))
	}
	if len(m.order) == 0 && len(m.other) == 0 {
		m.other = append(m.other, "The plan could not be computed.")
	}
}

// sentence capitalises a physio message and ends it with a full stop.
func sentence(s string) string {
	if s == "" {
		return s
	}
	s = strings.ToUpper(s[:1]) + s[1:]
	if !strings.HasSuffix(s, ".") {
		s += "."
	}
	return s
}

func isBuiltInSize(kind string) bool {
	for _, s := range builtInSizes {
		if string(s) == kind {
			return true
		}
	}
	return false
}

func catalogueCylinder(st Settings, name string) (CustomCylinder, bool) {
	for _, c := range st.Cylinders {
		if c.Name == name {
			return c, true
		}
	}
	return CustomCylinder{}, false
}

// settingsPolicy fills pol from the Settings (already validated there).
func settingsPolicy(st Settings, pol *physio.PlanPolicy) {
	num := func(text string) *float64 {
		d, err := decimal.NewFromString(strings.TrimSpace(text))
		if err != nil {
			return nil
		}
		v := d.InexactFloat64()
		return &v
	}
	if st.SafeResidualUnit == UnitBar {
		pol.ResidualBar = num(st.SafeResidual)
	} else {
		pol.ResidualPsi = num(st.SafeResidual)
	}
	pol.ReserveFactor = num(st.ReserveFactor)
	pol.ReserveMinutes = num(st.ReserveMinutes)
	pol.SpO2TargetPercent = num(st.SpO2Target)
}
