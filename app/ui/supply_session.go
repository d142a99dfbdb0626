package ui

import (
	"fmt"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/physio"
)

// SupplyKey is the go-app state (persisted in localStorage) holding the
// Supply screen's session: the cylinders on board when no Brief draft gives
// them, the cylinder in use and the gauge readings of the transport. The
// readings are also saved to the transport open in the encrypted Logbook
// when there is one (supply_logbook.go); this copy keeps the countdown
// going with the logbook locked. It holds gauge pressures, flows, times and
// the logbook's record numbers only: nothing about the patient.
const SupplyKey = "alvea.supply"

const supplySchema = 1

// readingMerge is how close two readings of the same cylinder must be to be
// one: a crew correcting a figure just typed does not want a second point.
const readingMerge = time.Minute

// SupplyCylinder is one cylinder on board. Kind is a CGA letter size (D, E,
// M, G, H) or the name of a cylinder from the Settings catalogue (counted by
// its water capacity). Gauge is its reading when the transport began, as
// typed, in GaugeUnit.
type SupplyCylinder struct {
	Kind          string `json:"kind"`
	WaterCapacity string `json:"waterCapacity,omitempty"` // litres, for a catalogue cylinder
	Gauge         string `json:"gauge"`
	GaugeUnit     string `json:"gaugeUnit"`
}

// SupplyReading is one gauge reading during the transport.
//
// It has two times. AtUnixMilli is when it was typed on this tablet (the
// device clock): it names the reading (logReading finds it by it to mark
// its logbook record) and decides what a correction is (readingMerge).
// ReadUnixMilli is when the gauge was read, when the crew gave it (Read
// at, a clock time resolved by lbEntryTime); 0 means it was read as it
// was typed. A session stored before readings had a read time has none,
// and each of its readings counts from when it was typed, as it did.
type SupplyReading struct {
	AtUnixMilli   int64  `json:"at"`
	ReadUnixMilli int64  `json:"read,omitempty"`
	Cylinder      int    `json:"cylinder"` // index in the cylinder list
	Gauge         string `json:"gauge"`
	GaugeUnit     string `json:"gaugeUnit"`
	Flow          string `json:"flow"` // L/min

	Log      *SupplyLogMark `json:"log,omitempty"`      // saved to the Logbook as this record
	Corrects *SupplyLogMark `json:"corrects,omitempty"` // replaces a reading saved as this record
}

// At returns when the gauge was read: the time given for it, or else when
// it was typed. The countdown counts from it and the logbook entry of the
// reading carries it.
func (r SupplyReading) At() time.Time {
	if r.ReadUnixMilli != 0 {
		return time.UnixMilli(r.ReadUnixMilli)
	}
	return time.UnixMilli(r.AtUnixMilli)
}

// Typed returns when the reading was typed on this tablet.
func (r SupplyReading) Typed() time.Time { return time.UnixMilli(r.AtUnixMilli) }

// ReadGiven reports whether the crew gave the time the gauge was read.
func (r SupplyReading) ReadGiven() bool { return r.ReadUnixMilli != 0 }

// SupplySession is what the Supply screen keeps across reloads.
type SupplySession struct {
	Schema    int              `json:"schema"`
	Cylinders []SupplyCylinder `json:"cylinders"`
	InUse     int              `json:"inUse"`
	Readings  []SupplyReading  `json:"readings"`
}

// defaultSupplySession starts with one E cylinder at 2000 psi, a common
// full reading (demo values of our own; the crew replaces them).
func defaultSupplySession() SupplySession {
	return SupplySession{
		Schema:    supplySchema,
		Cylinders: []SupplyCylinder{{Kind: string(physio.SizeE), Gauge: "2000", GaugeUnit: UnitPsi}},
	}
}

func (s SupplySession) clone() SupplySession {
	s.Cylinders = append([]SupplyCylinder(nil), s.Cylinders...)
	s.Readings = append([]SupplyReading(nil), s.Readings...)
	return s
}

// loadSupplySession returns the stored session, or a new one when there is
// none or it is damaged.
func loadSupplySession(ctx app.Context) SupplySession {
	s := defaultSupplySession()
	ctx.GetState(SupplyKey, &s)
	return s.checked()
}

// supplySessionFrom reads the session as loadSupplySession does, from ls
// without a Context (preload.go); false when it cannot be read this way.
func supplySessionFrom(ls storageGetter) (SupplySession, bool) {
	s := defaultSupplySession()
	if !stateFrom(ls, SupplyKey, &s) {
		return SupplySession{}, false
	}
	return s.checked(), true
}

// checked returns s, or a new session when s is of another schema or has
// no cylinder, with the cylinder in use within the list.
func (s SupplySession) checked() SupplySession {
	if s.Schema != supplySchema || len(s.Cylinders) == 0 {
		s = defaultSupplySession()
	}
	if s.InUse < 0 || s.InUse >= len(s.Cylinders) {
		s.InUse = 0
	}
	return s.clone()
}

func saveSupplySession(ctx app.Context, s SupplySession) {
	s.Schema = supplySchema
	ctx.SetState(SupplyKey, s.clone()).Persist()
}

// lastReading returns the latest reading, if any.
func (s SupplySession) lastReading() (SupplyReading, bool) {
	if len(s.Readings) == 0 {
		return SupplyReading{}, false
	}
	return s.Readings[len(s.Readings)-1], true
}

// merges reports whether a reading of cylinder typed at typed replaces the
// last reading as a correction: same cylinder, typed less than
// readingMerge after it (typing times: a correction is a second go at
// what was just typed, whatever time was given for the gauge).
func (s SupplySession) merges(cylinder int, typed time.Time) bool {
	last, ok := s.lastReading()
	return ok && last.Cylinder == cylinder && typed.Sub(last.Typed()) < readingMerge
}

// previousOf returns the latest-read reading of cylinder before the last
// reading when skipLast (the one a correction replaces), or among all
// readings; false when there is none.
func (s SupplySession) previousOf(cylinder int, skipLast bool) (SupplyReading, bool) {
	rs := s.Readings
	if skipLast && len(rs) > 0 {
		rs = rs[:len(rs)-1]
	}
	var prev SupplyReading
	found := false
	for _, r := range rs {
		if r.Cylinder == cylinder && (!found || !r.At().Before(prev.At())) {
			prev, found = r, true
		}
	}
	return prev, found
}

// retimeLast gives the last reading the earlier time read: its gauge was
// read before it was typed, and the crew says so after the correction
// window. A reading already saved to the Logbook is then to be corrected
// there, as a correction within the window is (record).
func (s *SupplySession) retimeLast(read time.Time) {
	n := len(s.Readings)
	if n == 0 {
		return
	}
	r := s.Readings[n-1]
	r.ReadUnixMilli = read.UnixMilli()
	if r.Log != nil {
		r.Corrects, r.Log = r.Log, nil
	}
	s.Readings[n-1] = r
}

// record adds r, or replaces the last reading when it merges (a
// correction). A correction of a reading saved to the Logbook remembers
// that record, so that saving it corrects the record instead of adding a
// second reading.
func (s *SupplySession) record(r SupplyReading) {
	if n := len(s.Readings); n > 0 {
		last := s.Readings[n-1]
		if s.merges(r.Cylinder, r.Typed()) {
			r.Log, r.Corrects = nil, last.Corrects
			if last.Log != nil {
				r.Corrects = last.Log
			}
			if last.Gauge == r.Gauge && last.GaugeUnit == r.GaugeUnit && last.Flow == r.Flow && last.ReadUnixMilli == r.ReadUnixMilli {
				r.Log, r.Corrects, r.AtUnixMilli = last.Log, last.Corrects, last.AtUnixMilli // nothing changed
			}
			s.Readings[n-1] = r
			return
		}
	}
	s.Readings = append(s.Readings, r)
}

// Gauge and flow rules. The gauge range is the cylinder's own (physio's
// MaxPressure), rounded down into the display unit so that every value
// shown as allowed is. The flow range covers low-flow devices up to the
// 70 L/min of a high-flow flowmeter (common practice, from memory).
var ruleFlow = rangeRule{Label: "Flow", Min: "0.1", Max: "70", Unit: "L/min"}

func gaugeRule(c physio.Cylinder, unit string) rangeRule {
	max := c.MaxPressure()
	var top string
	if unit == UnitBar {
		d, _ := physio.Round(max.Bar(), 1, physio.RoundDown)
		top = d.String()
	} else {
		d, _ := physio.Round(max.Psi(), 0, physio.RoundDown)
		top = d.String()
	}
	return rangeRule{Label: "Gauge reading", Min: "0", Max: top, Unit: unit}
}

// pressureOf builds a pressure from a checked value in psi or bar.
func pressureOf(v float64, unit string) physio.Pressure {
	if unit == UnitBar {
		return physio.Bar(v)
	}
	return physio.Psi(v)
}

// shownPressure writes text typed in unit `from` in the display unit `to`.
// A converted gauge is rounded down (less oxygen is the safe side): psi to
// 1 psi, bar to 0.1 bar. Invalid text is returned as it is.
func shownPressure(text, from, to string) string {
	if from == to || from == "" {
		return text
	}
	v, msg := rangeRule{Label: "Pressure", Min: "0", Max: "100000", Unit: from}.Check(text)
	if msg != "" {
		return text
	}
	p := pressureOf(v.InexactFloat64(), from)
	if to == UnitBar {
		d, ok := physio.Round(p.Bar(), 1, physio.RoundDown)
		if !ok {
			return text
		}
		return d.String()
	}
	d, ok := physio.Round(p.Psi(), 0, physio.RoundDown)
	if !ok {
		return text
	}
	return d.String()
}

// physioCylinder returns the physio cylinder for c.
func (c SupplyCylinder) physioCylinder() (physio.Cylinder, error) {
	if wc := strings.TrimSpace(c.WaterCapacity); wc != "" {
		v, msg := ruleWaterCapacity.Check(wc)
		if msg != "" {
			return physio.Cylinder{}, fmt.Errorf("ui: %s", msg)
		}
		return physio.WaterCapacityCylinder(physio.Litres(v.InexactFloat64()))
	}
	return physio.FactorCylinder(physio.CylinderSize(c.Kind))
}

// usable returns the usable litres of c at the gauge text (in unit) above
// the residual, via physio, or the message for the crew.
func usableAt(c SupplyCylinder, gauge, unit string, residual physio.Pressure) (physio.Volume, string) {
	cyl, err := c.physioCylinder()
	if err != nil {
		return 0, fmt.Sprintf("Cylinder %s is not in the catalogue.", c.Kind)
	}
	v, msg := gaugeRule(cyl, unit).Check(gauge)
	if msg != "" {
		return 0, msg
	}
	vol, err := cyl.Usable(pressureOf(v.InexactFloat64(), unit), residual)
	if err != nil {
		return 0, fmt.Sprintf("Gauge reading of cylinder %s: %v.", c.Kind, err)
	}
	return vol, ""
}

// countdown is what the Supply screen shows for one reading. Every figure
// comes from physio; the clock times are the reading time plus a physio
// endurance, truncated to the minute (earlier is the safe side).
type countdown struct {
	ReadingAt     time.Time
	Flow          physio.Flow
	InUseUsable   physio.Volume // cylinder in use, above the residual
	TotalUsable   physio.Volume // in use + cylinders not yet opened
	Reserve       physio.Volume // the policy's added minutes at this flow
	InUseLasts    time.Duration // until the cylinder in use reaches the residual
	ToReserve     time.Duration // until the oxygen on board falls to the reserve
	ToEmpty       time.Duration // until every cylinder is at the residual
	ReserveReach  bool          // already at or below the reserve
	ReserveAddMin time.Duration
}

// MinutesAtReading is the whole minutes left on the cylinder in use when it
// was read (rounded down).
func (c countdown) MinutesAtReading() int64 { return int64(c.InUseLasts / time.Minute) }

// MinutesLeft is the whole minutes left at now (rounded down, never below 0).
func (c countdown) MinutesLeft(now time.Time) int64 {
	left := c.InUseLasts - now.Sub(c.ReadingAt)
	if left <= 0 {
		return 0
	}
	return int64(left / time.Minute)
}

// ChangeAt is the clock time the cylinder in use reaches the residual,
// truncated to the minute.
func (c countdown) ChangeAt() time.Time { return c.ReadingAt.Add(c.InUseLasts).Truncate(time.Minute) }

// ReserveAt is the clock time the oxygen on board falls to the reserve.
func (c countdown) ReserveAt() time.Time { return c.ReadingAt.Add(c.ToReserve).Truncate(time.Minute) }

// EmptyAt is the clock time every cylinder is at the residual.
func (c countdown) EmptyAt() time.Time { return c.ReadingAt.Add(c.ToEmpty).Truncate(time.Minute) }

// supplyInputs are what a countdown is computed from.
type supplyInputs struct {
	Cylinders []SupplyCylinder
	Reading   SupplyReading
	Residual  physio.Pressure
	AddedMin  time.Duration // the reserve policy's added minutes
}

// totalUsable is the oxygen on board at a reading: the cylinder in use at
// its reading, cylinders after it in the list at their starting gauge, and
// cylinders before it spent (used down to the residual, in list order).
func totalUsable(in supplyInputs) (inUse, total physio.Volume, msg string) {
	r := in.Reading
	if r.Cylinder < 0 || r.Cylinder >= len(in.Cylinders) {
		return 0, 0, "Choose the cylinder in use."
	}
	inUse, msg = usableAt(in.Cylinders[r.Cylinder], r.Gauge, r.GaugeUnit, in.Residual)
	if msg != "" {
		return 0, 0, msg
	}
	total = inUse
	for i := r.Cylinder + 1; i < len(in.Cylinders); i++ {
		c := in.Cylinders[i]
		v, m := usableAt(c, c.Gauge, c.GaugeUnit, in.Residual)
		if m != "" {
			return 0, 0, fmt.Sprintf("Cylinder %d: %s", i+1, m)
		}
		total += v
	}
	return inUse, total, ""
}

// computeCountdown checks the inputs and computes the countdown, or returns
// the message for the crew (never a partial or non-finite figure).
func computeCountdown(in supplyInputs) (countdown, string) {
	flowV, msg := ruleFlow.Check(in.Reading.Flow)
	if msg != "" {
		return countdown{}, msg
	}
	flow := physio.LitresPerMinute(flowV.InexactFloat64())
	inUse, total, msg := totalUsable(in)
	if msg != "" {
		return countdown{}, msg
	}
	c := countdown{ReadingAt: in.Reading.At(), Flow: flow, InUseUsable: inUse, TotalUsable: total, ReserveAddMin: in.AddedMin}
	var err error
	if c.InUseLasts, err = physio.Endurance(inUse, flow); err != nil {
		return countdown{}, fmt.Sprintf("Minutes left: %v.", err)
	}
	if c.ToEmpty, err = physio.Endurance(total, flow); err != nil {
		return countdown{}, fmt.Sprintf("Minutes left: %v.", err)
	}
	// The reserve is the policy's added time at the current flow (the
	// factor applies to a planned need, which the Brief carries).
	policy := physio.ReservePolicy{Residual: in.Residual, Factor: 1, AddedMinutes: in.AddedMin}
	if c.Reserve, err = policy.Required(0, flow); err != nil {
		return countdown{}, fmt.Sprintf("Reserve: %v.", err)
	}
	if total > c.Reserve {
		if c.ToReserve, err = physio.Endurance(total-c.Reserve, flow); err != nil {
			return countdown{}, fmt.Sprintf("Reserve: %v.", err)
		}
	} else {
		c.ReserveReach = true
	}
	return c, ""
}

// hhmm writes a time as local HH:MM.
func hhmm(t time.Time) string { return t.Local().Format("15:04") }
