package logbook

import (
	"fmt"
	"time"

	"github.com/shopspring/decimal"

	"alvea/physio"
)

// OxygenAudit is planned against used oxygen for one transport.
type OxygenAudit struct {
	// From the first Brief: the calculated need (no reserve), the need with
	// the policy reserve, and the usable oxygen on board as planned.
	PlannedL            Amount    `json:"planned_l"`
	PlannedWithReserveL Amount    `json:"planned_with_reserve_l"`
	PlannedUsableL      Amount    `json:"planned_usable_l"`
	PlannedLegs         []LegSpan `json:"planned_legs"`
	// FinalPlannedL is the calculated need of the last Brief, when the plan
	// was amended (not computable otherwise: "plan not amended").
	FinalPlannedL     Amount          `json:"final_planned_l"`
	FinalBriefRecord  string          `json:"final_brief_record,omitempty"`
	ResidualPressure  Amount          `json:"residual"` // the policy's safe residual, in the unit the policy gave
	ResidualSource    string          `json:"residual_source"`
	PlannedChanges    []PlannedChange `json:"planned_changes"`
	Cylinders         []CylinderAudit `json:"cylinders"`
	UsedL             Amount          `json:"used_l"`
	Ratio             Amount          `json:"used_to_planned_ratio"`
	Arrival           *time.Time      `json:"arrival"`
	ArrivalEvent      string          `json:"arrival_event,omitempty"`
	ArrivalRecord     string          `json:"arrival_record,omitempty"`
	ReserveAtArrivalL Amount          `json:"reserve_at_arrival_l"`
	ReserveRequiredL  Amount          `json:"reserve_required_l"`
	ReserveMultiple   Amount          `json:"reserve_multiple"` // at arrival ÷ required
}

// LegSpan is a planned leg on the transport's minute scale.
type LegSpan struct {
	Index       int           `json:"index"`
	Label       string        `json:"label,omitempty"`
	Where       string        `json:"where"`
	StartMinute physio.Number `json:"start_minute"`
	EndMinute   physio.Number `json:"end_minute"`
	AltitudeFt  physio.Number `json:"altitude_ft"`
	Device      string        `json:"device"`
	OxygenLpm   physio.Number `json:"oxygen_lpm"`
	OxygenL     physio.Number `json:"oxygen_l"`
}

// PlannedChange is a cylinder change the plan foresaw, and the one
// recorded in its place (matched by order: the n-th planned change with the
// n-th cylinder-change event).
type PlannedChange struct {
	From          string         `json:"from"` // the plan's cylinder name
	PlannedMinute physio.Number  `json:"planned_minute"`
	ActualMinute  *physio.Number `json:"actual_minute"`
	ActualRecord  string         `json:"actual_record,omitempty"`
	Late          bool           `json:"late"`
}

// CylinderAudit is one cylinder's gauge history and the oxygen it gave.
// Gauge pressures are in psi for CGA letter sizes, bar otherwise.
type CylinderAudit struct {
	Label      string `json:"label"`
	Definition string `json:"definition"`
	Method     string `json:"method,omitempty"`
	Readings   int    `json:"readings"`
	First      Amount `json:"first_gauge"`
	Last       Amount `json:"last_gauge"`
	// UsedL: fall in contents over consecutive readings, rounded up.
	UsedL Amount `json:"used_l"`
	Rises int    `json:"rises"`
	// AtArrival: the gauge at arrival and the oxygen above the residual then.
	AtArrival        Amount `json:"gauge_at_arrival"`
	UsableAtArrivalL Amount `json:"usable_at_arrival_l"`
}

func gaugeUnit(spec *CylinderSpec) string {
	if spec != nil && spec.Size != "" {
		return "psi"
	}
	return "bar"
}

func gaugeAmount(p physio.Pressure, unit string) Amount {
	if unit == "psi" {
		return measured(p.Psi(), "psi", 0, physio.RoundNearest)
	}
	return measured(p.Bar(), "bar", 1, physio.RoundNearest)
}

func definition(spec *CylinderSpec) string {
	if spec == nil {
		return "not defined"
	}
	switch {
	case spec.Size != "":
		f, err := physio.CylinderFactor(physio.CylinderSize(spec.Size))
		if err != nil {
			return "CGA " + spec.Size + " (unknown size)"
		}
		return fmt.Sprintf("CGA %s, factor %g L/psi", spec.Size, f)
	case spec.WaterCapacity != 0:
		return fmt.Sprintf("water capacity %g L", spec.WaterCapacity.Litres())
	}
	return fmt.Sprintf("label %g L at %g bar", spec.NominalContents.Litres(), spec.NominalPressure.Bar())
}

// oxygen fills a.Oxygen and raises the oxygen deviations.
func (c *auditContext) oxygen() {
	o := &c.a.Oxygen
	o.PlannedLegs, o.PlannedChanges, o.Cylinders = []LegSpan{}, []PlannedChange{}, []CylinderAudit{}
	plan := c.plan
	var res *physio.PlanResult
	why := "no Brief snapshot"
	if plan != nil {
		res, why = plan.result, plan.err
	}
	if res != nil {
		o.PlannedL = exact(res.OxygenCalculatedL.Decimal, "L", physio.RoundUp)
		o.PlannedWithReserveL = exact(res.OxygenNeededL.Decimal, "L", physio.RoundUp)
		o.PlannedUsableL = exact(res.OxygenUsableL.Decimal, "L", physio.RoundDown)
		for _, l := range res.Legs {
			o.PlannedLegs = append(o.PlannedLegs, LegSpan{
				Index: l.Index, Label: l.Label, Where: l.Where, StartMinute: l.StartMinute,
				EndMinute:  physio.Number{Decimal: l.StartMinute.Add(l.Minutes.Decimal)},
				AltitudeFt: l.AltitudeFt, Device: string(l.Device), OxygenLpm: l.OxygenLpm, OxygenL: l.OxygenL,
			})
		}
		o.ReserveRequiredL = exact(res.OxygenNeededL.Sub(res.OxygenCalculatedL.Decimal), "L", physio.RoundUp)
	} else {
		o.PlannedL = notComputable("L", "%s", why)
		o.PlannedWithReserveL = o.PlannedL
		o.PlannedUsableL = o.PlannedL
		o.ReserveRequiredL = notComputable("L", "%s", why)
	}
	residual := c.residual(res, why)
	switch {
	case c.final == nil:
		o.FinalPlannedL = notComputable("L", "plan not amended")
	case c.final.result == nil:
		o.FinalPlannedL = notComputable("L", "%s", c.final.err)
		o.FinalBriefRecord = RecordName(c.final.seq)
	default:
		o.FinalPlannedL = exact(c.final.result.OxygenCalculatedL.Decimal, "L", physio.RoundUp)
		o.FinalBriefRecord = RecordName(c.final.seq)
	}
	if !c.arrival.IsZero() {
		at := c.arrival
		o.Arrival, o.ArrivalEvent, o.ArrivalRecord = &at, c.arrivalEvent, RecordName(c.arrivalSeq)
	}

	c.cylinders(residual)
	c.totals(res)
	if res != nil {
		c.changes(res)
	}
}

// cylinders audits each cylinder: used oxygen (rounded up), rises, the
// reading at arrival and the oxygen above the residual then (rounded down).
func (c *auditContext) cylinders(residual physio.Pressure) {
	o := &c.a.Oxygen
	uses := c.t.CylinderUse()
	for _, u := range uses {
		unit := gaugeUnit(u.Spec)
		ca := CylinderAudit{Label: u.Label, Definition: definition(u.Spec), Method: u.Method, Readings: len(u.Readings), Rises: u.Rises}
		if n := len(u.Readings); n > 0 {
			ca.First = gaugeAmount(u.Readings[0].Value.Pressure, unit)
			ca.Last = gaugeAmount(u.Readings[n-1].Value.Pressure, unit)
		} else {
			ca.First = notComputable(unit, "no readings for cylinder %s", u.Label)
			ca.Last = ca.First
		}
		switch {
		case u.Err != nil:
			ca.UsedL = notComputable("L", "cylinder %s: %v", u.Label, u.Err)
		case len(u.Readings) == 0:
			ca.UsedL = notComputable("L", "no readings for cylinder %s", u.Label)
		case len(u.Readings) == 1:
			ca.UsedL = notComputable("L", "one reading for cylinder %s (two are needed)", u.Label)
		default:
			ca.UsedL = measured(u.Used.Litres(), "L", 0, physio.RoundUp)
		}
		// Rises and readings below the residual, named by record.
		for j, r := range u.Readings {
			if j > 0 && r.Value.Pressure > u.Readings[j-1].Value.Pressure {
				c.deviate(DevGaugeRose, r.Seq, "cylinder %s rose from %s to %s", u.Label,
					gaugeAmount(u.Readings[j-1].Value.Pressure, unit), gaugeAmount(r.Value.Pressure, unit))
			}
			if r.Value.Pressure < residual {
				c.deviate(DevCylinderBelowResidual, r.Seq, "cylinder %s read %s, below the residual %s", u.Label,
					gaugeAmount(r.Value.Pressure, unit), gaugeAmount(residual, unit))
			}
		}
		ca.AtArrival, ca.UsableAtArrivalL = c.atArrival(u, residual, unit)
		o.Cylinders = append(o.Cylinders, ca)
	}
}

// atArrival returns a cylinder's last reading up to the arrival window and
// the oxygen above the residual at that reading (rounded down).
func (c *auditContext) atArrival(u CylinderUse, residual physio.Pressure, unit string) (Amount, Amount) {
	if c.arrival.IsZero() {
		na := notComputable(unit, "no arrival recorded (handover, arrive or landing)")
		return na, notComputable("L", "%s", na.NotComputable)
	}
	limit := c.arrival.Add(c.opts.ArrivalReadingWindow)
	var at *Timed[GaugeReading]
	for i := range u.Readings {
		if !u.Readings[i].At.After(limit) {
			at = &u.Readings[i]
		}
	}
	if at == nil {
		na := notComputable(unit, "no reading for cylinder %s at or before arrival (+%s)", u.Label, minutesText(c.opts.ArrivalReadingWindow))
		return na, notComputable("L", "%s", na.NotComputable)
	}
	gauge := gaugeAmount(at.Value.Pressure, unit)
	if u.Spec == nil {
		return gauge, notComputable("L", "cylinder %s has readings but no definition", u.Label)
	}
	cyl, err := u.Spec.Physio()
	if err != nil {
		return gauge, notComputable("L", "cylinder %s: %v", u.Label, err)
	}
	usable, err := cyl.Usable(at.Value.Pressure, residual)
	if err != nil {
		return gauge, notComputable("L", "cylinder %s: %v", u.Label, err)
	}
	return gauge, measured(usable.Litres(), "L", 0, physio.RoundDown)
}

func minutesText(d time.Duration) string {
	return number(d.Minutes(), 1, physio.RoundNearest).String() + " min"
}

// totals sums used oxygen and the reserve at arrival over every cylinder,
// and compares them with the plan. A total needs every part: one cylinder
// not computable makes the total not computable, naming it.
func (c *auditContext) totals(res *physio.PlanResult) {
	o := &c.a.Oxygen
	used, reserve := decimal.Zero, decimal.Zero
	var usedWhy, reserveWhy []string
	for _, ca := range o.Cylinders {
		if d, ok := ca.UsedL.Decimal(); ok {
			used = used.Add(d)
		} else {
			usedWhy = append(usedWhy, ca.UsedL.NotComputable)
		}
		if d, ok := ca.UsableAtArrivalL.Decimal(); ok {
			reserve = reserve.Add(d)
		} else {
			reserveWhy = append(reserveWhy, ca.UsableAtArrivalL.NotComputable)
		}
	}
	if len(o.Cylinders) == 0 {
		usedWhy = []string{"no cylinders defined and no gauge readings"}
		reserveWhy = usedWhy
	}
	if len(usedWhy) > 0 {
		o.UsedL = notComputable("L", "%s", joinReasons(usedWhy))
	} else {
		o.UsedL = exact(used, "L", physio.RoundUp)
	}
	switch {
	case c.arrival.IsZero():
		o.ReserveAtArrivalL = notComputable("L", "no arrival recorded (handover, arrive or landing)")
	case len(reserveWhy) > 0:
		o.ReserveAtArrivalL = notComputable("L", "%s", joinReasons(reserveWhy))
	default:
		o.ReserveAtArrivalL = exact(reserve, "L", physio.RoundDown)
	}

	planned, pok := o.PlannedL.Decimal()
	switch {
	case !o.UsedL.Known():
		o.Ratio = notComputable("", "used oxygen not computable")
	case !pok:
		o.Ratio = notComputable("", "%s", o.PlannedL.NotComputable)
	case planned.Sign() <= 0:
		o.Ratio = notComputable("", "the plan needs 0 L (room air), so there is no ratio")
	default:
		// Nearest: the ratio is read against 1.0 either way.
		o.Ratio = exact(used.DivRound(planned, 8).Round(2), "", physio.RoundNearest)
		if used.Cmp(planned) > 0 {
			c.deviate(DevOxygenAbovePlan, 0, "used %s L, the plan's calculated need %s L (ratio %s)", used, planned, o.Ratio.Value)
		}
	}

	required, rok := o.ReserveRequiredL.Decimal()
	left, lok := o.ReserveAtArrivalL.Decimal()
	switch {
	case !rok:
		o.ReserveMultiple = notComputable("", "%s", o.ReserveRequiredL.NotComputable)
	case !lok:
		o.ReserveMultiple = notComputable("", "%s", o.ReserveAtArrivalL.NotComputable)
	case required.Sign() <= 0:
		o.ReserveMultiple = notComputable("", "the policy requires no reserve (factor 1, no added minutes)")
	default:
		// Down: a smaller multiple is the safe side when judging a reserve.
		o.ReserveMultiple = exact(left.DivRound(required, 8).RoundFloor(2), "", physio.RoundDown)
	}
	if rok && lok && left.Cmp(required) < 0 {
		c.deviate(DevReserveBreached, c.arrivalSeq, "%s L above the residual at %s, policy reserve %s L", left, c.arrivalEvent, required)
	}
}

// changes matches the plan's cylinder changes with the recorded
// cylinder-change events, by order, and flags late or missing ones.
func (c *auditContext) changes(res *physio.PlanResult) {
	o := &c.a.Oxygen
	var events []Timed[Event]
	for _, e := range c.t.Events {
		if e.Value.Type == EventCylinderChange {
			events = append(events, e)
		}
	}
	end := c.start
	if !c.arrival.IsZero() {
		end = c.arrival
	}
	for _, e := range c.t.Events {
		if e.At.After(end) {
			end = e.At
		}
	}
	tol := c.opts.ChangeLateTolerance.Minutes()
	n := 0
	for _, cyl := range res.Cylinders {
		if cyl.ChangeMinute == nil {
			continue
		}
		pc := PlannedChange{From: cyl.Name, PlannedMinute: *cyl.ChangeMinute}
		planned := cyl.ChangeMinute.InexactFloat64()
		if n < len(events) {
			e := events[n]
			m := number(c.minute(e.At), 1, physio.RoundNearest)
			pc.ActualMinute, pc.ActualRecord = &m, RecordName(e.Seq)
			if c.minute(e.At) > planned+tol {
				pc.Late = true
				c.deviate(DevCylinderChangedLate, e.Seq, "change from %s at minute %s, planned at minute %s (tolerance %s)", cyl.Name, m, pc.PlannedMinute, minutesText(c.opts.ChangeLateTolerance))
			}
		} else if c.minute(end) > planned+tol {
			pc.Late = true
			c.deviate(DevCylinderChangedLate, 0, "no cylinder change recorded for %s, planned at minute %s; the transport's last event is at minute %s", cyl.Name, pc.PlannedMinute, number(c.minute(end), 0, physio.RoundNearest))
		}
		n++
		o.PlannedChanges = append(o.PlannedChanges, pc)
	}
}

// residual returns the policy's safe residual pressure. It is read from
// the Brief's plan document as the crew gave it (psi or bar, exact), so
// that a residual of 14 bar is not shifted by the result's rounded psi
// figure; absent there, the engine's default (physio.DefaultReservePolicy).
// A plan document that does not parse falls back to the result's psi
// figure, and no Brief to the common-practice 200 psi.
func (c *auditContext) residual(res *physio.PlanResult, why string) physio.Pressure {
	o := &c.a.Oxygen
	if res == nil {
		o.ResidualPressure = measured(physio.DefaultResidualPsi.Psi(), "psi", 0, physio.RoundNearest)
		o.ResidualSource = "default (common practice): " + why
		return physio.DefaultResidualPsi
	}
	rec := RecordName(c.plan.seq)
	doc, err := physio.ParsePlan(c.plan.brief.Plan)
	if err != nil {
		o.ResidualPressure = exact(res.ResidualPsi.Decimal, "psi", physio.RoundNearest)
		o.ResidualSource = "Brief " + rec + " result"
		return physio.Psi(res.ResidualPsi.InexactFloat64())
	}
	o.ResidualSource = "Brief " + rec + " policy"
	switch p := doc.Policy; {
	case p != nil && p.ResidualBar != nil:
		o.ResidualPressure = measured(*p.ResidualBar, "bar", 2, physio.RoundNearest)
		return physio.Bar(*p.ResidualBar)
	case p != nil && p.ResidualPsi != nil:
		o.ResidualPressure = measured(*p.ResidualPsi, "psi", 1, physio.RoundNearest)
		return physio.Psi(*p.ResidualPsi)
	}
	r := physio.DefaultReservePolicy.Residual
	o.ResidualPressure = measured(r.Psi(), "psi", 1, physio.RoundNearest)
	o.ResidualSource = "Brief " + rec + " (engine default)"
	return r
}
