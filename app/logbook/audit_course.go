package logbook

import (
	"time"

	"alvea/physio"
)

// PatientCourse is the patient's oxygenation through the transport, from
// the observations.
type PatientCourse struct {
	TargetPercent physio.Number `json:"spo2_target_percent"`
	TargetSource  string        `json:"spo2_target_source"`
	SpO2Readings  int           `json:"spo2_readings"`
	// LowestSpO2 in percent, rounded down; LowestRecord the first reading
	// at that value.
	LowestSpO2   Amount `json:"lowest_spo2_percent"`
	LowestRecord string `json:"lowest_record,omitempty"`
	// MinutesBelowTarget: step-wise (sample and hold), rounded up; see the
	// package audit notes. LongestBelowMinutes is the longest single run.
	MinutesBelowTarget  Amount `json:"minutes_below_target"`
	LongestBelowMinutes Amount `json:"longest_below_minutes"`
	LongestBelowRecord  string `json:"longest_below_record,omitempty"`
	// ObservedMinutes: from the first to the last SpO2 reading (rounded
	// down); LongestGapMinutes: the longest time between two consecutive
	// SpO2 readings (rounded up), so sparse data shows.
	ObservedMinutes   Amount        `json:"observed_minutes"`
	LongestGapMinutes Amount        `json:"longest_gap_minutes"`
	SetupChanges      []SetupChange `json:"setup_changes"`
}

// SetupChange is a change of FiO2, device or oxygen flow as observed: the
// first observation giving any of them is the initial set-up. Nil or empty
// fields did not change (or were not given).
type SetupChange struct {
	Minute     physio.Number  `json:"minute"`
	Record     string         `json:"record"`
	Initial    bool           `json:"initial"`
	FiO2       *physio.Number `json:"fio2,omitempty"`
	FiO2Before *physio.Number `json:"fio2_before,omitempty"`
	Device     string         `json:"device,omitempty"`
	DeviceFrom string         `json:"device_before,omitempty"`
	FlowLpm    *physio.Number `json:"flow_lpm,omitempty"`
	FlowBefore *physio.Number `json:"flow_lpm_before,omitempty"`
}

// Timeline is the data of the Review plot: series on the transport's
// minute scale (minute 0 = the open entry), the planned legs as spans, the
// recorded events and cabin altitudes as marks.
type Timeline struct {
	Start           time.Time     `json:"start"`
	TargetPercent   physio.Number `json:"spo2_target_percent"`
	SpO2Percent     []TimePoint   `json:"spo2_percent"`
	FiO2            []TimePoint   `json:"fio2"`
	FlowLpm         []TimePoint   `json:"flow_lpm"`
	CabinAltitudeFt []TimePoint   `json:"cabin_altitude_ft"`
	PlannedLegs     []LegSpan     `json:"planned_legs"`
	Events          []TimeMark    `json:"events"`
}

// TimePoint is one value at a transport minute (nearest 0.1 min).
type TimePoint struct {
	Minute physio.Number `json:"minute"`
	Value  physio.Number `json:"value"`
	Record string        `json:"record"`
}

// TimeMark is one event on the timeline.
type TimeMark struct {
	Minute physio.Number `json:"minute"`
	Type   string        `json:"type"`
	Text   string        `json:"text,omitempty"` // other events' text, or the cylinder now in use
	Record string        `json:"record"`
}

type spo2Reading struct {
	at      time.Time
	percent float64
	seq     uint64
}

// course fills a.Course and raises SPO2_BELOW_TARGET.
func (c *auditContext) course() {
	pc := &c.a.Course
	pc.SetupChanges = []SetupChange{}
	switch {
	case c.opts.SpO2TargetPercent != 0:
		pc.TargetPercent = number(c.opts.SpO2TargetPercent, 1, physio.RoundNearest)
		pc.TargetSource = "audit option"
	case c.plan != nil && c.plan.result != nil:
		pc.TargetPercent = c.plan.result.SpO2TargetPercent
		pc.TargetSource = "Brief " + RecordName(c.plan.seq)
	default:
		pc.TargetPercent = number(DefaultSpO2TargetPercent, 1, physio.RoundNearest)
		pc.TargetSource = "default (BTS 2017 lower end of 94–98 %)"
	}
	target := pc.TargetPercent.InexactFloat64()

	var rs []spo2Reading
	for _, o := range c.t.Observations {
		if o.Value.SpO2 != nil {
			// Drop binary noise (0.93 × 100 = 93.00000000000001) before comparing.
			p, _ := roundSafe(o.Value.SpO2.Percent(), 3, physio.RoundNearest)
			rs = append(rs, spo2Reading{o.At, p.InexactFloat64(), o.Seq})
		}
	}
	pc.SpO2Readings = len(rs)
	if len(rs) == 0 {
		why := "no SpO2 observations"
		pc.LowestSpO2 = notComputable("%", "%s", why)
		pc.MinutesBelowTarget = notComputable("min", "%s", why)
		pc.LongestBelowMinutes = notComputable("min", "%s", why)
		pc.ObservedMinutes = notComputable("min", "%s", why)
		pc.LongestGapMinutes = notComputable("min", "%s", why)
	} else {
		low := rs[0]
		for _, r := range rs[1:] {
			if r.percent < low.percent {
				low = r
			}
		}
		pc.LowestSpO2 = measured(low.percent, "%", 1, physio.RoundDown)
		pc.LowestRecord = RecordName(low.seq)
		below, longest, longestSeq, gap := belowTarget(rs, target)
		pc.MinutesBelowTarget = measured(below.Minutes(), "min", 1, physio.RoundUp)
		pc.LongestBelowMinutes = measured(longest.Minutes(), "min", 1, physio.RoundUp)
		if longestSeq != 0 {
			pc.LongestBelowRecord = RecordName(longestSeq)
		}
		pc.ObservedMinutes = measured(rs[len(rs)-1].at.Sub(rs[0].at).Minutes(), "min", 1, physio.RoundDown)
		if len(rs) == 1 {
			pc.MinutesBelowTarget = notComputable("min", "one SpO2 observation (two are needed for a duration)")
			pc.LongestBelowMinutes = pc.MinutesBelowTarget
			pc.LongestGapMinutes = pc.MinutesBelowTarget
		} else {
			pc.LongestGapMinutes = measured(gap.Minutes(), "min", 1, physio.RoundUp)
			if longest > c.opts.SpO2BelowLimit {
				c.deviate(DevSpO2BelowTarget, longestSeq, "SpO2 below %s %% for %s (limit %s)", pc.TargetPercent, pc.LongestBelowMinutes, minutesText(c.opts.SpO2BelowLimit))
			}
		}
	}
	c.setupChanges()
}

// belowTarget counts time below target step-wise: reading i holds from its
// time to reading i+1; the last reading holds for no time. It returns the
// total, the longest run (first reading of the run) and the longest gap
// between consecutive readings.
func belowTarget(rs []spo2Reading, target float64) (total, longest time.Duration, longestSeq uint64, gap time.Duration) {
	var run time.Duration
	var runSeq uint64
	for i := 0; i+1 < len(rs); i++ {
		span := rs[i+1].at.Sub(rs[i].at)
		gap = max(gap, span)
		if rs[i].percent < target {
			if run == 0 {
				runSeq = rs[i].seq
			}
			run += span
			total += span
			if run > longest {
				longest, longestSeq = run, runSeq
			}
			continue
		}
		run = 0
	}
	return total, longest, longestSeq, gap
}

// setupChanges lists the initial set-up and every change of FiO2, device
// or flow between observations.
func (c *auditContext) setupChanges() {
	pc := &c.a.Course
	var fio2, flow *physio.Number
	device := ""
	started := false
	for _, o := range c.t.Observations {
		v := o.Value
		if v.FiO2 == nil && v.Device == "" && v.Flow == nil {
			continue
		}
		ch := SetupChange{Minute: number(c.minute(o.At), 1, physio.RoundNearest), Record: RecordName(o.Seq), Initial: !started}
		changed := !started
		if v.FiO2 != nil {
			n := number(v.FiO2.Value(), 2, physio.RoundNearest)
			if fio2 == nil || n.Cmp(fio2.Decimal) != 0 {
				ch.FiO2, ch.FiO2Before, changed = &n, fio2, true
				fio2 = &n
			}
		}
		if v.Device != "" && v.Device != device {
			ch.Device, ch.DeviceFrom, changed = v.Device, device, true
			device = v.Device
		}
		if v.Flow != nil {
			n := number(v.Flow.LitresPerMinute(), 1, physio.RoundNearest)
			if flow == nil || n.Cmp(flow.Decimal) != 0 {
				ch.FlowLpm, ch.FlowBefore, changed = &n, flow, true
				flow = &n
			}
		}
		started = true
		if changed {
			pc.SetupChanges = append(pc.SetupChanges, ch)
		}
	}
}

// timeline fills a.Timeline from the observations, events and the Brief.
func (c *auditContext) timeline() {
	tl := &c.a.Timeline
	tl.Start, tl.TargetPercent = c.start, c.a.Course.TargetPercent
	tl.SpO2Percent, tl.FiO2, tl.FlowLpm, tl.CabinAltitudeFt = []TimePoint{}, []TimePoint{}, []TimePoint{}, []TimePoint{}
	tl.PlannedLegs, tl.Events = c.a.Oxygen.PlannedLegs, []TimeMark{}
	at := func(t time.Time) physio.Number { return number(c.minute(t), 1, physio.RoundNearest) }
	for _, o := range c.t.Observations {
		v, rec := o.Value, RecordName(o.Seq)
		if v.SpO2 != nil {
			tl.SpO2Percent = append(tl.SpO2Percent, TimePoint{at(o.At), number(v.SpO2.Percent(), 1, physio.RoundNearest), rec})
		}
		if v.FiO2 != nil {
			tl.FiO2 = append(tl.FiO2, TimePoint{at(o.At), number(v.FiO2.Value(), 2, physio.RoundNearest), rec})
		}
		if v.Flow != nil {
			tl.FlowLpm = append(tl.FlowLpm, TimePoint{at(o.At), number(v.Flow.LitresPerMinute(), 1, physio.RoundNearest), rec})
		}
	}
	for _, e := range c.t.Events {
		m := TimeMark{Minute: at(e.At), Type: string(e.Value.Type), Text: e.Value.Text, Record: RecordName(e.Seq)}
		if e.Value.Type == EventCylinderChange {
			m.Text = e.Value.Cylinder
		}
		tl.Events = append(tl.Events, m)
		if e.Value.CabinAltitude != nil {
			// Up: cabin altitude is reported on the safe side.
			tl.CabinAltitudeFt = append(tl.CabinAltitudeFt, TimePoint{at(e.At), number(e.Value.CabinAltitude.Feet(), 0, physio.RoundUp), m.Record})
		}
	}
}
