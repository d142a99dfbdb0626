package logbook

import (
	"encoding/json"
	"strings"
	"testing"
	"time"

	"alvea/physio"
)

// Audit arithmetic against hand-worked cases. The transports are scenarios
// of our own; each expected value names its basis beside it.

// auditBuilder appends entries with consecutive record numbers, timed in
// minutes from a fixed start, for Fold.
type auditBuilder struct {
	id      TransportID
	start   time.Time
	seq     uint64
	entries []*Entry
}

func newAuditBuilder() *auditBuilder {
	return &auditBuilder{id: "T20310314-0000000", start: time.Date(2031, 3, 14, 9, 0, 0, 0, time.UTC)}
}

func (b *auditBuilder) add(minute float64, e *Entry) uint64 {
	b.seq++
	e.Seq, e.Transport, e.At = b.seq, b.id, b.start.Add(physio.Minutes(minute))
	if e.Kind == 0 {
		e.Kind = e.payloadKind()
	}
	b.entries = append(b.entries, e)
	return b.seq
}

func (b *auditBuilder) gauge(minute float64, label string, p physio.Pressure) uint64 {
	return b.add(minute, &Entry{Gauge: &GaugeReading{Cylinder: label, Pressure: p}})
}

func (b *auditBuilder) event(minute float64, t EventType) uint64 {
	return b.add(minute, &Entry{Event: &Event{Type: t}})
}

func (b *auditBuilder) spo2(minute, percent float64) uint64 {
	return b.add(minute, &Entry{Observe: &Observation{SpO2: ptr(physio.Percent(percent))}})
}

func (b *auditBuilder) audit(opts AuditOptions) TransportAudit {
	t := Fold(b.entries)
	return AuditTransport(t, opts)
}

// handResult is a plan result written by hand (not by the engine), so the
// expected values below depend only on the audit arithmetic: calculated
// need 600 L, needed with reserve 2 400 L (so the policy reserve is
// 1 800 L), residual 200 psi, SpO2 target 94 %, one planned change at
// minute 50.
const handResult = `{
  "engine_version": "hand",
  "oxygen_calculated_l": 600, "oxygen_needed_l": 2400, "oxygen_usable_l": 1700,
  "spo2_target_percent": 94, "residual_psi": 200, "residual_bar": 13.8,
  "legs": [
    {"index": 0, "label": "climb and cruise", "where": "cabin", "start_minute": 0, "minutes": 60, "altitude_ft": 6000, "device": "nasal_cannula", "oxygen_lpm": 5, "oxygen_l": 300},
    {"index": 1, "label": "road", "where": "destination", "start_minute": 60, "minutes": 60, "altitude_ft": 100, "device": "nasal_cannula", "oxygen_lpm": 5, "oxygen_l": 300}
  ],
  "cylinders": [
    {"order": 1, "supply": 0, "copy": 1, "name": "E #1", "usable_l": 504, "start_minute": 0, "change_minute": 50, "change_leg": 0},
    {"order": 2, "supply": 1, "copy": 1, "name": "10 L", "usable_l": 1862, "start_minute": 50, "change_minute": null, "change_leg": null}
  ]
}`

func openWith(b *auditBuilder, cylinders ...CylinderSpec) {
	b.add(0, &Entry{Open: &Opening{
		Vehicle: "rotor, unpressurised", Crew: []string{"QX"},
		Origin: Place{Name: "Fell Station"}, Destination: Place{Name: "Estuary Hospital"},
		Brief:     &Brief{Plan: json.RawMessage(`{"version":1}`), Result: json.RawMessage(handResult), EngineVersion: "hand"},
		Cylinders: cylinders,
	}})
}

func amountIs(t *testing.T, name string, a Amount, want string) {
	t.Helper()
	if a.Value == nil {
		t.Errorf("%s: not computable (%s), want %s", name, a.NotComputable, want)
		return
	}
	if a.Value.String() != want {
		t.Errorf("%s = %s, want %s", name, a.Value, want)
	}
}

func codes(a TransportAudit) []string {
	var out []string
	for _, d := range a.Deviations {
		out = append(out, d.Code+"@"+d.Record)
	}
	return out
}

func hasDeviation(a TransportAudit, code, record string) bool {
	for _, d := range a.Deviations {
		if d.Code == code && d.Record == record {
			return true
		}
	}
	return false
}

func TestAuditOxygenHandWorked(t *testing.T) {
	b := newAuditBuilder()
	openWith(b, CylinderSpec{Label: "A", Size: "E"}, CylinderSpec{Label: "B", WaterCapacity: physio.Litres(10)})
	b.event(5, EventLiftOff)
	b.gauge(0, "A", physio.Psi(2000))
	b.gauge(0, "B", physio.Bar(200))
	change := b.add(70, &Entry{Event: &Event{Type: EventCylinderChange, Cylinder: "B"}})
	b.gauge(69, "A", physio.Psi(1200))
	b.event(100, EventLanding)
	handover := b.event(110, EventHandover)
	b.gauge(115, "B", physio.Bar(150))
	b.add(120, &Entry{Close: &Closing{}})
	a := b.audit(AuditOptions{})

	// Cylinder factor method, E 0.28 L/psi (common practice):
	// (2000 − 1200) psi × 0.28 L/psi = 224 L (GNU units: 224).
	amountIs(t, "A used", a.Oxygen.Cylinders[0].UsedL, "224")
	// Water-capacity method (common practice): 10 L × (200 − 150) bar = 500 L.
	amountIs(t, "B used", a.Oxygen.Cylinders[1].UsedL, "500")
	amountIs(t, "used", a.Oxygen.UsedL, "724")
	amountIs(t, "planned", a.Oxygen.PlannedL, "600")
	// 724 / 600 = 1.2067, nearest to 2 places.
	amountIs(t, "ratio", a.Oxygen.Ratio, "1.21")
	// Reserve above a 200 psi residual at arrival (handover, minute 110; B's
	// reading at 115 is inside the 15-minute window):
	// A (1200 − 200) psi × 0.28 = 280 L (GNU units: 280);
	// B 10 L × (150 bar − 200 psi) = 10 × (150 − 13.789515) = 1362.1049 L
	// (GNU units), down to 1362 L. Total 1642 L.
	amountIs(t, "A usable at arrival", a.Oxygen.Cylinders[0].UsableAtArrivalL, "280")
	amountIs(t, "B usable at arrival", a.Oxygen.Cylinders[1].UsableAtArrivalL, "1362")
	amountIs(t, "reserve at arrival", a.Oxygen.ReserveAtArrivalL, "1642")
	// Policy reserve: 2400 − 600 = 1800 L; 1642 < 1800 is a breach, named
	// at the handover record; multiple 1642/1800 = 0.9122, down to 0.91.
	amountIs(t, "reserve required", a.Oxygen.ReserveRequiredL, "1800")
	amountIs(t, "reserve multiple", a.Oxygen.ReserveMultiple, "0.91")
	if !hasDeviation(a, DevReserveBreached, RecordName(handover)) {
		t.Errorf("reserve breach not raised at the handover: %v", codes(a))
	}
	if !hasDeviation(a, DevOxygenAbovePlan, "") {
		t.Errorf("oxygen above plan not raised: %v", codes(a))
	}
	// Planned change at minute 50, recorded at minute 70: 20 min late, over
	// the 10-minute tolerance.
	if !hasDeviation(a, DevCylinderChangedLate, RecordName(change)) {
		t.Errorf("late change not raised: %v", codes(a))
	}
	if a.Oxygen.ArrivalEvent != "handover" {
		t.Errorf("arrival %q, want handover", a.Oxygen.ArrivalEvent)
	}
	if len(a.Oxygen.PlannedLegs) != 2 || a.Oxygen.PlannedLegs[1].EndMinute.String() != "120" {
		t.Errorf("planned legs %+v", a.Oxygen.PlannedLegs)
	}
	if hasDeviation(a, DevCylinderBelowResidual, "") || a.DeviationCount(DevCylinderBelowResidual) != 0 {
		t.Errorf("no reading is below the residual: %v", codes(a))
	}
}

func TestAuditChangeOnTimeAndReserveKept(t *testing.T) {
	b := newAuditBuilder()
	openWith(b, CylinderSpec{Label: "A", Size: "E"})
	b.event(2, EventDepart)
	b.gauge(0, "A", physio.Psi(2000))
	// Minute 58: 8 min after the planned 50, inside the 10-minute tolerance.
	b.add(58, &Entry{Event: &Event{Type: EventCylinderChange, Cylinder: "A"}})
	b.event(60, EventArrive)
	b.gauge(60, "A", physio.Psi(1900))
	b.add(61, &Entry{Close: &Closing{}})
	a := b.audit(AuditOptions{})
	if a.DeviationCount(DevCylinderChangedLate) != 0 {
		t.Errorf("change within tolerance flagged: %v", codes(a))
	}
	// 100 psi × 0.28 L/psi = 28 L used (factor method, common practice).
	amountIs(t, "used", a.Oxygen.UsedL, "28")
	// 28 / 600 = 0.0467 → 0.05 (nearest).
	amountIs(t, "ratio", a.Oxygen.Ratio, "0.05")
	// (1900 − 200) × 0.28 = 476 L < 1800 L: breach at the arrive event.
	amountIs(t, "reserve", a.Oxygen.ReserveAtArrivalL, "476")
	if a.DeviationCount(DevReserveBreached) != 1 || a.DeviationCount(DevOxygenAbovePlan) != 0 {
		t.Errorf("deviations %v", codes(a))
	}
	// A narrower tolerance makes the same change late.
	a = b.audit(AuditOptions{ChangeLateTolerance: 5 * time.Minute})
	if a.DeviationCount(DevCylinderChangedLate) != 1 {
		t.Errorf("5-minute tolerance: %v", codes(a))
	}
}

func TestAuditMissingDataIsNotZero(t *testing.T) {
	b := newAuditBuilder()
	openWith(b, CylinderSpec{Label: "A", Size: "E"}, CylinderSpec{Label: "B", WaterCapacity: physio.Litres(10)}, CylinderSpec{Label: "C", Size: "D"})
	b.gauge(0, "A", physio.Psi(2000))
	b.gauge(30, "A", physio.Psi(1500))
	b.gauge(0, "C", physio.Psi(1800))
	a := b.audit(AuditOptions{})
	amountIs(t, "A used", a.Oxygen.Cylinders[0].UsedL, "140") // 500 psi × 0.28 L/psi
	for _, c := range []struct {
		name string
		a    Amount
		want string
	}{
		{"B used", a.Oxygen.Cylinders[1].UsedL, "no readings for cylinder B"},
		{"C used", a.Oxygen.Cylinders[2].UsedL, "one reading for cylinder C (two are needed)"},
		{"total used", a.Oxygen.UsedL, "no readings for cylinder B; one reading for cylinder C (two are needed)"},
		{"ratio", a.Oxygen.Ratio, "used oxygen not computable"},
		{"reserve", a.Oxygen.ReserveAtArrivalL, "no arrival recorded (handover, arrive or landing)"},
		{"lowest SpO2", a.Course.LowestSpO2, "no SpO2 observations"},
	} {
		if c.a.Known() || c.a.NotComputable != c.want {
			t.Errorf("%s = %v, want not computable: %s", c.name, c.a, c.want)
		}
	}
	if !strings.Contains(a.Oxygen.UsedL.String(), "not computable: no readings for cylinder B") {
		t.Errorf("String() = %q", a.Oxygen.UsedL.String())
	}
	if a.DeviationCount(DevNotClosed) != 1 {
		t.Errorf("not closed: %v", codes(a))
	}
	// Planned change at minute 50, last event at minute 30: not yet due.
	if a.DeviationCount(DevCylinderChangedLate) != 0 {
		t.Errorf("change not yet due flagged: %v", codes(a))
	}
	if len(a.NotComputable()) == 0 {
		t.Error("NotComputable lists nothing")
	}
}

func TestAuditNoBrief(t *testing.T) {
	b := newAuditBuilder()
	b.add(0, &Entry{Open: &Opening{Vehicle: "road", Cylinders: []CylinderSpec{{Label: "A", Size: "E"}}}})
	b.gauge(0, "A", physio.Psi(2000))
	b.gauge(30, "A", physio.Psi(150))
	b.event(30, EventArrive)
	a := b.audit(AuditOptions{})
	if a.DeviationCount(DevNoBrief) != 1 || a.Oxygen.PlannedL.Known() || a.Oxygen.Ratio.Known() {
		t.Errorf("no Brief: %v planned %v", codes(a), a.Oxygen.PlannedL)
	}
	// Without a Brief the residual is the common-practice 200 psi, so the
	// 150 psi reading is below it, and the target is the 94 % default.
	if a.DeviationCount(DevCylinderBelowResidual) != 1 || a.Course.TargetPercent.String() != "94" {
		t.Errorf("residual/target defaults: %v, target %s", codes(a), a.Course.TargetPercent)
	}
	// Gauge 150 psi is at or below the residual: Usable is exactly 0, which
	// is a real zero (a reading), not a missing value.
	amountIs(t, "reserve", a.Oxygen.ReserveAtArrivalL, "0")
}

func TestAuditGaugeRose(t *testing.T) {
	b := newAuditBuilder()
	openWith(b, CylinderSpec{Label: "A", Size: "E"})
	b.gauge(0, "A", physio.Psi(2000))
	b.gauge(10, "A", physio.Psi(1800))
	rose := b.gauge(20, "A", physio.Psi(1900))
	b.gauge(30, "A", physio.Psi(1700))
	a := b.audit(AuditOptions{})
	// Falls only: (2000−1800) + (1900−1700) = 400 psi × 0.28 = 112 L.
	amountIs(t, "used", a.Oxygen.UsedL, "112")
	if !hasDeviation(a, DevGaugeRose, RecordName(rose)) {
		t.Errorf("rise not named at %s: %v", RecordName(rose), codes(a))
	}
}

func TestAuditSpO2BelowTarget(t *testing.T) {
	b := newAuditBuilder()
	openWith(b)
	b.spo2(0, 96)
	first := b.spo2(10, 92)
	b.spo2(16, 90)
	b.spo2(25, 95)
	b.spo2(30, 93)
	b.spo2(32, 96)
	a := b.audit(AuditOptions{})
	c := a.Course
	// Target 94 % from the Brief. Step-wise (sample and hold):
	// 92 holds 10→16 (6 min), 90 holds 16→25 (9 min): one run of 15 min;
	// 93 holds 30→32 (2 min). Total 17 min; longest 15 min.
	amountIs(t, "minutes below", c.MinutesBelowTarget, "17")
	amountIs(t, "longest run", c.LongestBelowMinutes, "15")
	amountIs(t, "lowest", c.LowestSpO2, "90")
	amountIs(t, "longest gap", c.LongestGapMinutes, "10")
	amountIs(t, "observed", c.ObservedMinutes, "32")
	if c.LongestBelowRecord != RecordName(first) || !hasDeviation(a, DevSpO2BelowTarget, RecordName(first)) {
		t.Errorf("run start %s, deviations %v", c.LongestBelowRecord, codes(a))
	}
	// With a 15-minute limit the 15-minute run is not longer than the limit.
	a = b.audit(AuditOptions{SpO2BelowLimit: 15 * time.Minute})
	if a.DeviationCount(DevSpO2BelowTarget) != 0 {
		t.Errorf("run equal to the limit flagged: %v", codes(a))
	}
	// A target of 90 %: nothing is below it (90 is not below 90).
	a = b.audit(AuditOptions{SpO2TargetPercent: 90})
	amountIs(t, "below 90", a.Course.MinutesBelowTarget, "0")
	if a.Course.TargetSource != "audit option" {
		t.Errorf("target source %q", a.Course.TargetSource)
	}
}

func TestAuditSpO2OneReading(t *testing.T) {
	b := newAuditBuilder()
	openWith(b)
	b.spo2(5, 88)
	a := b.audit(AuditOptions{})
	amountIs(t, "lowest", a.Course.LowestSpO2, "88")
	if a.Course.MinutesBelowTarget.Known() {
		t.Errorf("one reading gave a duration: %v", a.Course.MinutesBelowTarget)
	}
}

func TestAuditAmendedAfterClose(t *testing.T) {
	b := newAuditBuilder()
	openWith(b, CylinderSpec{Label: "A", Size: "E"})
	b.gauge(0, "A", physio.Psi(2000))
	reading := b.gauge(60, "A", physio.Psi(1200))
	b.event(60, EventArrive)
	b.add(65, &Entry{Close: &Closing{Outcome: "handed over"}})
	amend := b.add(60, &Entry{Kind: KindAmend, Amends: reading, Reason: "gauge misread", Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Psi(1300)}})
	note := b.add(200, &Entry{Note: &Note{Text: "late note"}})
	a := b.audit(AuditOptions{})
	if !hasDeviation(a, DevAmendedAfterClose, RecordName(amend)) || !hasDeviation(a, DevEntryAfterClose, RecordName(note)) {
		t.Errorf("after-close deviations %v", codes(a))
	}
	// The correction is applied: (2000 − 1300) psi × 0.28 = 196 L.
	amountIs(t, "used", a.Oxygen.UsedL, "196")
}

func TestAuditPlanAmendedInFlight(t *testing.T) {
	b := newAuditBuilder()
	openWith(b)
	brief := &Brief{Plan: json.RawMessage(`{"version":1}`), Result: json.RawMessage(handResult), EngineVersion: "hand"}
	ground := b.add(3, &Entry{Brief: brief})
	b.event(5, EventLiftOff)
	air := b.add(20, &Entry{Brief: brief})
	b.event(40, EventLanding)
	after := b.add(50, &Entry{Brief: brief})
	a := b.audit(AuditOptions{})
	if !hasDeviation(a, DevPlanAmendedInFlight, RecordName(air)) || a.DeviationCount(DevPlanAmendedInFlight) != 1 {
		t.Errorf("in-flight Brief %s only (not %s, %s): %v", RecordName(air), RecordName(ground), RecordName(after), codes(a))
	}
	amountIs(t, "final planned", a.Oxygen.FinalPlannedL, "600")
	if a.Oxygen.FinalBriefRecord != RecordName(after) {
		t.Errorf("final Brief %s", a.Oxygen.FinalBriefRecord)
	}
}

func TestAuditSetupChangesAndTimeline(t *testing.T) {
	b := newAuditBuilder()
	openWith(b)
	b.add(0, &Entry{Observe: &Observation{SpO2: ptr(physio.Percent(95)), FiO2: ptr(physio.FractionOf(0.28)), Device: "nasal cannula", Flow: ptr(physio.LitresPerMinute(2))}})
	b.add(10, &Entry{Observe: &Observation{SpO2: ptr(physio.Percent(94)), FiO2: ptr(physio.FractionOf(0.28))}})
	up := b.add(20, &Entry{Observe: &Observation{FiO2: ptr(physio.FractionOf(0.4)), Device: "simple mask", Flow: ptr(physio.LitresPerMinute(6))}})
	b.add(30, &Entry{Event: &Event{Type: EventTopOfClimb, CabinAltitude: ptr(physio.Feet(8000))}})
	a := b.audit(AuditOptions{})
	ch := a.Course.SetupChanges
	if len(ch) != 2 || !ch[0].Initial || ch[1].Record != RecordName(up) || ch[1].FiO2.String() != "0.4" || ch[1].FiO2Before.String() != "0.28" || ch[1].DeviceFrom != "nasal cannula" || ch[1].FlowLpm.String() != "6" {
		t.Errorf("set-up changes %+v", ch)
	}
	tl := a.Timeline
	if len(tl.SpO2Percent) != 2 || len(tl.FiO2) != 3 || len(tl.Events) != 1 || len(tl.CabinAltitudeFt) != 1 || tl.CabinAltitudeFt[0].Value.String() != "8000" || tl.Events[0].Minute.String() != "30" {
		t.Errorf("timeline %+v", tl)
	}
}

func TestAuditOptionsValidate(t *testing.T) {
	if err := (AuditOptions{SpO2TargetPercent: 101}).Validate(); err == nil || !strings.Contains(err.Error(), "spo2_target_percent") {
		t.Errorf("target 101: %v", err)
	}
	if err := (AuditOptions{SpO2BelowLimit: -time.Minute}).Validate(); err == nil {
		t.Error("negative limit accepted")
	}
	if err := (AuditFilter{Flags: []string{"NOPE"}}).Validate(); err == nil || !strings.Contains(err.Error(), "RESERVE_BREACHED") {
		t.Errorf("unknown flag: %v", err)
	}
}
